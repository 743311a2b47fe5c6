"""Layout constraints for the board designer: trace widths per current path and spacing between
net classes (IPC-2221), creepage and clearance across the barrier (from the isolation module)."""

from __future__ import annotations

import math

from reviewer.physics import spacing
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("layout.bus.current", "A", "Continuous current in the bus path (input current)"),
    ("layout.bus.trace_width", "m", "Minimum trace width of the bus path (IPC-2221 fit, estimate)"),
    ("layout.output.current", "A", "Continuous current in the bridge output path, rms"),
    ("layout.output.trace_width", "m", "Minimum trace width of the output path (IPC-2221 fit, estimate)"),
    ("layout.bus.spacing", "m", "Spacing between bus and ground nets (IPC-2221 Table 6-1)"),
    ("layout.output.voltage", "V", "Peak voltage on the output nets"),
    ("layout.output.spacing", "m", "Spacing between output nets (IPC-2221 Table 6-1)"),
    ("layout.barrier.creepage", "m", "Creepage across the isolation barrier (IEC 60664-1)"),
    ("layout.barrier.clearance", "m", "Clearance across the isolation barrier (IEC 60664-1)"),
)


def derive(ctx: Ctx) -> None:
    rise, oz, layer = ctx.v("layout.temp_rise"), ctx.v("layout.copper_oz"), ctx.v("layout.layer")
    note = f"{oz:g} oz copper, {layer} layer, {rise:g} °C rise: an estimate, IPC-2152 gives better data"
    with ctx.section("layout.bus.current", "layout.bus.trace_width"):
        i_in = ctx.q("op.input_current")
        ctx.publish("layout.bus.current", i_in)
        ctx.publish("layout.bus.trace_width", spacing.trace_width(i_in, rise, oz, layer), note)
    with ctx.section("layout.output.current", "layout.output.trace_width"):
        i_out = ctx.q("op.load_current_rms")
        ctx.publish("layout.output.current", i_out)
        ctx.publish("layout.output.trace_width", spacing.trace_width(i_out, rise, oz, layer), note)

    column = spacing.ipc2221_column(layer, bool(ctx.v("isolation.coating")),
                                    ctx.v("isolation.altitude") or 0.0)
    peak = ctx.q("band.bus_peak")
    ctx.publish("layout.bus.spacing", spacing.ipc2221_spacing(peak, column),
                f"column {column} at the bus peak")
    out_peak = max(peak, ctx.q("op.output_rms") * math.sqrt(2))
    ctx.publish("layout.output.voltage", out_peak,
                "the larger of the bus peak (bridge-side nets) and the output peak (load side)")
    ctx.publish("layout.output.spacing", spacing.ipc2221_spacing(out_peak, column),
                f"column {column}")
    for src, dst in (("isolation.creepage_needed", "layout.barrier.creepage"),
                     ("isolation.clearance_needed", "layout.barrier.clearance")):
        if ctx.has(src):
            ctx.publish(dst, ctx.q(src))
