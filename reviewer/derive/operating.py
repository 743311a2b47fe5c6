"""The operating point: bus range, switching frequency, load power and currents."""

from __future__ import annotations

import math

from reviewer import tables
from reviewer.physics import band
from reviewer.physics.arrays import hypot, or_default
from reviewer.context import Ctx, declare

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""

QUANTITIES = declare(
    ("op.bus_min", "V", "Lowest bus voltage in service"),
    ("op.bus_nom", "V", "Nominal bus voltage"),
    ("op.bus_max", "V", "Highest mean (DC) bus voltage"),
    ("op.bus_max_assumed", "", "source.v_max was not given: the highest bus is assumed", "flag"),
    ("op.bus_max_known", "", "The highest bus is given or follows from a named chemistry", "flag"),
    ("op.switching_frequency", "Hz", "Switching frequency of the bridge"),
    ("op.output_rms", "V", "RMS output voltage at the load (target, or the bridge's if none)"),
    ("op.load_power", "W", "Real power into the load"),
    ("op.load_current_rms", "A", "RMS load current at the bridge (fundamental)"),
    ("op.load_current_peak", "A", "Peak load current at the bridge (fundamental)"),
    ("op.input_current", "A", "DC input current at the lowest bus voltage"),
    ("op.transformer_ratio", "", "Output transformer turns ratio (load side over bridge side)"),
)

SQUARE_KINDS = ("square", "quasi_square")
CELL_CHEMISTRIES = ("lead_acid", "lithium_ion", "lifepo4", "nimh")
MAINS_TOLERANCE = 0.10
"""Highest supply voltage over nominal for rectified mains: +10 % (IEC 60038 supply voltage
tolerance, from memory)."""


def _v_max_assumed(ctx: Ctx, v_nom: float) -> tuple[float, str]:
    """The highest bus when source.v_max is not given, and the note that says how it was found."""
    chem = ctx.v("source.chemistry")
    if ctx.v("source.kind") == "battery" and chem in CELL_CHEMISTRIES:
        row = tables.load("battery_chemistry")["chemistry"][chem]
        return (band.chemistry_v_max(v_nom, row["cell_max"], row["cell_nominal_low"]),
                f"source.v_max not given: {row['cell_max']:g} V per cell charging over "
                f"{row['cell_nominal_low']:g} V nominal for {chem} (from memory); give it")
    if ctx.v("source.kind") == "rectified_mains":
        return (v_nom * (1 + MAINS_TOLERANCE),
                "source.v_max not given: nominal + 10 % (IEC 60038 supply tolerance, from "
                "memory); give it")
    return v_nom, "source.v_max not given: taken as nominal, which a charging or adjustable " \
        "source exceeds; give source.v_max"


def derive(ctx: Ctx) -> None:
    v_nom = ctx.v("source.v_nom")
    v_min = ctx.v("source.v_min")
    v_max = ctx.v("source.v_max")
    ctx.publish("op.bus_nom", v_nom)
    ctx.publish("op.bus_min", v_min if v_min is not None else v_nom,
                "" if v_min is not None else "source.v_min not given: taken as nominal")
    assumed = v_max is None
    if v_max is not None:
        ctx.publish("op.bus_max", v_max)
    else:
        v_guess, note = _v_max_assumed(ctx, v_nom)
        ctx.publish("op.bus_max", v_guess, note)
    ctx.publish("op.bus_max_assumed", assumed)
    ctx.publish("op.bus_max_known", ctx.v("source.v_max") is not None
                or ctx.v("source.chemistry") in CELL_CHEMISTRIES)
    ratio = or_default(ctx.v("output.transformer_ratio"), 1.0)
    ctx.publish("op.transformer_ratio", ratio)

    with ctx.section("op.switching_frequency"):
        if ctx.v("modulation.kind") in SQUARE_KINDS:
            ctx.publish("op.switching_frequency", ctx.need("output.frequency"))
        else:
            ctx.publish("op.switching_frequency", ctx.need("modulation.carrier"))

    target = ctx.v("output.v_rms")
    if target is not None:
        ctx.publish("op.output_rms", target)
    else:
        ctx.publish("op.output_rms", ctx.q("op.bus_max") * ratio,
                    "no output.v_rms target: the bridge's largest RMS (the bus) is assumed")

    with ctx.section("op.load_power", "op.load_current_rms", "op.load_current_peak",
                     "op.input_current"):
        v_out = ctx.q("op.output_rms")
        kind = ctx.v("load.kind")
        if kind == "resistive":
            p = ctx.v("load.power")
            if p is None:
                p = v_out**2 / ctx.need("load.resistance")
            i_load = p / v_out
        elif kind == "r_l":
            r, l_ = ctx.need("load.resistance", "load.inductance")
            z = hypot(r, 2 * math.pi * ctx.need("output.frequency") * l_)
            i_load = v_out / z
            p = i_load**2 * r
        else:
            p, pf = ctx.need("load.power", "load.power_factor")
            i_load = p / (v_out * pf)
        i_bridge = i_load * ratio
        note = "from the fundamental at the target voltage"
        ctx.publish("op.load_power", p)
        ctx.publish("op.load_current_rms", i_bridge, note)
        ctx.publish("op.load_current_peak", i_bridge * math.sqrt(2), note)
        ctx.publish("op.input_current",
                    p / (ctx.need("load.efficiency") * ctx.q("op.bus_min")),
                    "P_out / (efficiency × lowest bus voltage)")
