"""Gate drive adequacy and defined state: on and off levels, pull resistors, pin drive."""

from __future__ import annotations

from functools import reduce

import numpy as np

from reviewer.derive.stress import gate_source_range
from reviewer.physics import gate as gp
from reviewer.physics.arrays import out
from reviewer.context import SIDES, Ctx, NeedsData, declare

VECTOR = True
"""Evaluated over arrays (one element per point) by :meth:`reviewer.quantities.Runner.batch`."""

QUANTITIES = declare(
    ("gate.{side}.vgs_on_min", "V", "On-state gate-source voltage at the lowest bus, after any "
     "zener (enhancement direction)"),
    ("gate.{side}.vgs_off", "V", "Off-state gate-source voltage, highest over the bus range "
     "(enhancement direction)"),
    ("gate.{side}.pull_ok", "", "A resistor holds the gate to its own source", "flag"),
    ("gate.{side}.pull_voltage", "V", "Largest voltage across the gate pull resistor"),
    ("gate.{side}.pull_power", "W", "Pull resistor dissipation V²/R while the gate is driven"),
    ("gate.{side}.pull_power_rating", "W", "Pull resistor power rating (given, or assumed)"),
    ("gate.{side}.pin_current", "A", "Current a controller pin drives the gate with"),
    ("gate.{side}.pin_edge_time", "s", "Gate edge time of a controller pin, Q_g / I_pin"),
    ("gate.{side}.drive_power", "W", "Gate-drive power Q_g · ΔV_gate · f_sw, all paralleled devices"),
    ("gate.{side}.vth_hot", "V", "Lowest gate threshold at T_j,max: the part's figure, or the "
     "estimate −5 mV/°C from V_th,min, never below half of it"),
)

PIN_CURRENT_DEFAULT = 20e-3
"""Current assumed for a controller pin when none is given [A]: tens of mA (common practice)."""

PULL_RATING_DEFAULT = 0.1
"""Power rating assumed for a pull resistor when none is given [W]: a 0603 chip (common practice)."""


def levels(ctx: Ctx, side: str, v_bus: float) -> tuple[float, float]:
    """(on, off) gate-source voltage of ``side`` in the enhancement direction at ``v_bus``,
    after any zener clamp: the weakest on level and the strongest (least reverse) off level."""
    polarity = ctx.v(f"switch.{side}.polarity")
    on = gate_source_range(ctx, side, "on_level", v_bus)
    off = gate_source_range(ctx, side, "off_level", v_bus)
    return (out(np.minimum(*(gp.enhancement(v, polarity) for v in on))),
            out(np.maximum(*(gp.enhancement(v, polarity) for v in off))))


def pull_tied_to_own_source(pull_to: str, side: str, polarity: str) -> bool:
    """Whether the rail a pull resistor is tied to is the switch's own source."""
    if pull_to == "source":
        return True
    if pull_to == "ground":
        return side == "low" and polarity == "n"
    if pull_to == "bus":
        return side == "high" and polarity == "p"
    return False


def derive(ctx: Ctx) -> None:
    v_min, v_max = ctx.q("op.bus_min"), ctx.q("op.bus_max")
    for side in SIDES:
        dr, sw = f"drive.{side}", f"switch.{side}"
        polarity = ctx.v(f"{sw}.polarity")
        on_lo, _ = levels(ctx, side, v_min)
        on_hi, off_hi = levels(ctx, side, v_max)
        _, off_lo = levels(ctx, side, v_min)
        ctx.publish(f"gate.{side}.vgs_on_min", out(np.minimum(on_lo, on_hi)))
        ctx.publish(f"gate.{side}.vgs_off", out(np.maximum(off_lo, off_hi)))

        pull = ctx.v(f"{dr}.pull_resistor")
        pull_to = ctx.v(f"{dr}.pull_to")
        ctx.publish(f"gate.{side}.pull_ok",
                    pull is not None and pull_tied_to_own_source(pull_to, side, polarity))
        rating = ctx.v(f"{dr}.pull_power_rating")
        ctx.publish(f"gate.{side}.pull_power_rating",
                    rating if rating is not None else PULL_RATING_DEFAULT,
                    "" if rating is not None else
                    "no drive.{side}.pull_power_rating: 0.1 W assumed (a 0603 chip resistor, "
                    "common practice)".replace("{side}", side))
        with ctx.section(f"gate.{side}.pull_voltage", f"gate.{side}.pull_power"):
            if pull is None or pull_to == "none":
                raise NeedsData(f"{dr}.pull_resistor")
            v_across = 0.0
            for on, vgs in ((True, on_hi), (False, off_hi)):
                for s in gp.source_node_voltage(polarity, side, v_max, on):
                    g = s + (vgs if polarity == "n" else -vgs)
                    rail = {"source": s, "ground": 0.0, "bus": v_max}[pull_to]
                    v_across = out(np.maximum(v_across, np.abs(g - rail)))
            ctx.publish(f"gate.{side}.pull_voltage", v_across)
            ctx.publish(f"gate.{side}.pull_power", gp.resistor_power(v_across, pull))

        with ctx.section(f"gate.{side}.vth_hot"):
            hot = ctx.v(f"{sw}.vth_hot")
            if hot is not None:
                ctx.publish(f"gate.{side}.vth_hot", hot, "the part's threshold at T_j,max")
            else:
                vth = ctx.need(f"{sw}.vth")
                est = gp.vth_hot_estimate(vth, ctx.v(f"{sw}.tj_max"))
                ctx.publish(f"gate.{side}.vth_hot", est,
                            "estimate (memory): −5 mV/°C from 25 °C, floor at half of V_th; "
                            f"give switch.{side}.vth_hot")

        n = ctx.v(f"{sw}.count")
        if ctx.v(f"{dr}.kind") == "controller_pin":
            given = [x for x in (ctx.v(f"{dr}.source_current"), ctx.v(f"{dr}.sink_current"))
                     if x is not None]
            i_pin = out(reduce(np.minimum, given)) if given else PIN_CURRENT_DEFAULT
            ctx.publish(f"gate.{side}.pin_current", i_pin,
                        "" if given else "no pin current given: 20 mA assumed (common practice)")
            with ctx.section(f"gate.{side}.pin_edge_time"):
                qg = ctx.need(f"{sw}.qg")
                ctx.publish(f"gate.{side}.pin_edge_time", gp.pin_edge_time(qg * n, i_pin))
        with ctx.section(f"gate.{side}.drive_power"):
            qg = ctx.need(f"{sw}.qg")
            f_sw = ctx.q("op.switching_frequency")
            ctx.publish(f"gate.{side}.drive_power", qg * n * abs(on_hi - off_hi) * f_sw)
