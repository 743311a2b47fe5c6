"""Layout constraints for the board designer: trace widths per current path and spacing between
net classes (IPC-2221), creepage and clearance across the barrier (from the isolation module)."""

from __future__ import annotations

import math

import numpy as np

from reviewer.derive.bus import power_factor
from reviewer.derive.paths import each, one_path
from reviewer.physics import bus, spacing
from reviewer.physics.arrays import or_default, out
from reviewer.context import Ctx, declare

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""

PWM = {"spwm_bipolar": "bipolar", "spwm_unipolar": "unipolar", "spwm_level_shifted": "unipolar"}

QUANTITIES = declare(
    ("layout.bus.current", "A", "RMS current in the bus path between the local capacitors and the bridge"),
    ("layout.bus.trace_width", "m", "Minimum trace width of the bus path (IPC-2221 fit, estimate)"),
    ("layout.output.current", "A", "RMS current in the bridge output path (inductor current with ripple)"),
    ("layout.output.trace_width", "m", "Minimum trace width of the output path (IPC-2221 fit, estimate)"),
    ("layout.bus.spacing", "m", "Spacing between bus and ground nets (IPC-2221 Table 6-1)"),
    ("layout.output.voltage", "V", "Peak voltage on the output nets"),
    ("layout.output.spacing", "m", "Spacing between output nets (IPC-2221 Table 6-1)"),
    ("layout.barrier.creepage", "m", "Creepage across the isolation barrier (IEC 60664-1)"),
    ("layout.barrier.clearance", "m", "Clearance across the isolation barrier (IEC 60664-1)"),
)


def derive(ctx: Ctx) -> None:
    rise, oz, layer = ctx.v("layout.temp_rise"), ctx.v("layout.copper_oz"), ctx.v("layout.layer")
    note = each(lambda o, r: f"{o:g} oz copper, {layer} layer, {r:g} °C rise: an estimate, IPC-2152 "
                "gives better data", oz, rise)
    with ctx.section("layout.output.current", "layout.output.trace_width", "layout.bus.current",
                     "layout.bus.trace_width"):
        if ctx.has("waveform.bridge_current_rms"):
            i_out = ctx.q("waveform.bridge_current_rms")
            how = "the bridge (inductor) current from all harmonics, ripple included"
        else:
            i_out = ctx.q("op.load_current_rms")
            how = "no spectrum: the load current's fundamental"
        ctx.publish("layout.output.current", i_out, how)
        ctx.publish("layout.output.trace_width", spacing.trace_width(i_out, rise, oz, layer), note)
        kind = ctx.v("modulation.kind")
        if kind in PWM:
            i_bus = bus.input_current_rms(i_out, out(np.minimum(ctx.need("modulation.index"), 1.0)),
                                          power_factor(ctx), PWM[kind])
            bus_how = ("the chopped bridge input current of sine PWM, "
                       + ("two-level: its RMS is the output current's" if PWM[kind] == "bipolar"
                          else "three-level: √(2M/π·(1 + cos 2φ/3)) of the output current"))
        else:
            i_bus = i_out
            bus_how = ("a stepped wave: the bridge passes the output current to the bus while "
                       "it conducts (the whole cycle taken)")
        ctx.publish("layout.bus.current", i_bus, bus_how)
        ctx.publish("layout.bus.trace_width", spacing.trace_width(i_bus, rise, oz, layer), note)

    column = one_path(spacing.ipc2221_column(layer, bool(ctx.v("isolation.coating")),
                                             or_default(ctx.v("isolation.altitude"), 0.0)))
    peak = ctx.q("band.bus_peak")
    ctx.publish("layout.bus.spacing", spacing.ipc2221_spacing(peak, column),
                f"column {column} at the bus peak")
    out_peak = out(np.maximum(peak, ctx.q("band.output_max") * math.sqrt(2)))
    ctx.publish("layout.output.voltage", out_peak,
                "the larger of the bus peak (bridge-side nets) and the largest output's peak "
                "(load side)")
    ctx.publish("layout.output.spacing", spacing.ipc2221_spacing(out_peak, column),
                f"column {column}")
    for src, dst in (("isolation.creepage_needed", "layout.barrier.creepage"),
                     ("isolation.clearance_needed", "layout.barrier.clearance")):
        if ctx.has(src):
            ctx.publish(dst, ctx.q(src))
