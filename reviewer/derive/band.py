"""Voltage band of the bus and the output (IEC 61140)."""

from __future__ import annotations

from reviewer.physics import band
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("band.bus_ripple", "%", "RMS ripple of the DC bus over its mean"),
    ("band.bus_peak", "V", "Highest bus voltage including ripple"),
    ("band.bus_limit", "V", "Extra-low-voltage limit for this bus (IEC 61140)"),
    ("band.output_limit", "V", "Extra-low-voltage limit for an AC output, RMS (IEC 61140)"),
    ("band.beyond_elv", "", "Bus or output beyond extra-low voltage", "flag"),
)


def derive(ctx: Ctx) -> None:
    ripple = ctx.v("source.ripple")
    if ripple is None:
        ripple = 0.0 if ctx.v("source.kind") in ("battery", "bench_supply") else 0.48
        note = ("source.ripple not given: none assumed for a battery or bench supply"
                if ripple == 0 else "source.ripple not given: full-wave rectified, 48 % assumed")
    else:
        note = ""
    ctx.publish("band.bus_ripple", ripple, note)
    peak = band.dc_peak(ctx.q("op.bus_max"), ripple)
    limit = band.dc_band_limit(ripple)
    ctx.publish("band.bus_peak", peak)
    ctx.publish("band.bus_limit", limit)
    ctx.publish("band.output_limit", band.ELV_AC_RMS)
    ctx.publish("band.beyond_elv", band.beyond_elv(peak, limit, ctx.q("op.output_rms")))
