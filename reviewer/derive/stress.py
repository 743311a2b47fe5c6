"""Voltage stress on each switch: drain-source peak and gate-source voltage both ways."""

from __future__ import annotations

import math
from functools import reduce

import numpy as np

from reviewer.physics import gate, grounding
from reviewer.physics import thermal as tp
from reviewer.physics.arrays import out
from reviewer.context import SIDES, Ctx, NeedsData, declare
from reviewer.derive.paths import each
from reviewer.units import render

VECTOR = True
"""Evaluated over arrays (one element per point) by :meth:`reviewer.quantities.Runner.batch`."""

QUANTITIES = declare(
    ("stress.{side}.overshoot", "V", "Drain-source overshoot at turn-off, L_loop · di/dt over the "
     "current-fall interval"),
    ("stress.{side}.vds_peak", "V", "Peak drain-source voltage: highest bus plus overshoot"),
    ("stress.{side}.avalanche_energy", "J", "Energy the part absorbs in avalanche per edge where "
     "the peak exceeds its rating, ½·L·I²·V_BR/(V_BR − V_bus)"),
    ("stress.{side}.turn_on_peak", "A", "Peak drain current at turn-on per device: load current "
     "plus the other switch's diode recovery current"),
    ("stress.node_undershoot", "V", "Switch-node excursion below the low rail when the high side "
     "turns off: diode drop plus L_loop · di/dt (magnitude)"),
    ("stress.{side}.vgs_on", "V", "Gate-source voltage when on, at the highest bus (enhancement direction)"),
    ("stress.{side}.vgs_off", "V", "Gate-source voltage when off, at the highest bus (enhancement direction, the most reverse)"),
    ("stress.{side}.vgs_peak", "V", "Largest gate-source voltage magnitude, after any zener clamp"),
)


def gate_source_range(ctx: Ctx, side: str, which: str, v_bus: float) -> tuple[float, float]:
    """Signed V_GS range of ``side``'s gate at drive level ``which`` ("on_level"/"off_level").

    Levels given from the source are taken as enhancement-direction V_GS (V_SG for P-channel);
    levels given from ground are turned into V_GS from where the source sits. A gate-source
    zener, when fitted, clamps the result.
    """
    polarity = ctx.v(f"switch.{side}.polarity")
    dr = f"drive.{side}"
    level = ctx.v(f"{dr}.{which}")
    level = v_bus if isinstance(level, str) and level == "bus" else level
    if ctx.v(f"{dr}.levels_from") == "source":
        signed = level if polarity == "n" else -level
        lo = hi = signed
    else:
        lo, hi = gate.vgs_from_gate_node(level, polarity, side, v_bus, which == "on_level")
    zener = ctx.v(f"{dr}.zener")
    if zener is not None:
        lo, hi = (gate.zener_clamped_vgs(v, zener, polarity) for v in (lo, hi))
    return lo, hi


def _avalanche_note(energy: float, v_bus: float, rating: float) -> str:
    if math.isinf(energy):
        return (f"no finite energy: the bus peak ({render(v_bus, 'V')}) is at or above the "
                f"switch's rating ({render(rating, 'V')}), so the avalanche never ends and the "
                "part is destroyed at the first turn-off")
    return "the loop's energy clamped at the rating (unclamped-inductive form)"


def derive(ctx: Ctx) -> None:
    v_max = ctx.q("band.bus_peak")  # the one bus peak (highest bus plus ripple) of derive/band.py
    for side in SIDES:
        polarity = ctx.v(f"switch.{side}.polarity")
        on = gate_source_range(ctx, side, "on_level", v_max)
        off = gate_source_range(ctx, side, "off_level", v_max)
        enh_on = [gate.enhancement(v, polarity) for v in on]
        enh_off = [gate.enhancement(v, polarity) for v in off]
        ctx.publish(f"stress.{side}.vgs_on", out(np.minimum(*enh_on)))
        ctx.publish(f"stress.{side}.vgs_off", out(np.minimum(*enh_off)))
        ctx.publish(f"stress.{side}.vgs_peak",
                    out(reduce(np.maximum, (np.abs(v) for v in (*on, *off)))))

        with ctx.section(f"stress.{side}.overshoot", f"stress.{side}.vds_peak",
                         f"stress.{side}.avalanche_energy"):
            loop = ctx.v("grounding.loop_inductance")
            if loop is None:
                ctx.publish(f"stress.{side}.vds_peak", v_max,
                            "no overshoot estimate: give grounding.loop_inductance")
            else:
                i_pk = ctx.q("op.load_current_peak")
                # the overshoot belongs to the current-fall interval (never the voltage rise)
                dv = out(grounding.switching_overshoot(loop, i_pk,
                                                       ctx.q(f"switching.{side}.current_fall")))
                peak = v_max + dv
                ctx.publish(f"stress.{side}.overshoot", dv)
                ctx.publish(f"stress.{side}.vds_peak", peak)
                rating = ctx.v(f"switch.{side}.vds_rating")
                energy = out(grounding.avalanche_energy(loop, i_pk, rating, v_max, peak))
                ctx.publish(f"stress.{side}.avalanche_energy", energy,
                            each(_avalanche_note, energy, v_max, rating))
        with ctx.section(f"stress.{side}.turn_on_peak"):
            n = int(ctx.v(f"switch.{side}.count"))
            i_dev = out(tp.device_current(ctx.q("op.load_current_peak"), n))
            other = "low" if side == "high" else "high"
            qrr, trr = ctx.v(f"switch.{other}.diode_qrr"), ctx.v(f"switch.{other}.diode_trr")
            if qrr is not None and trr is not None:
                i_rr = out(tp.recovery_peak_current(qrr, trr)) / n
                ctx.publish(f"stress.{side}.turn_on_peak", i_dev + i_rr,
                            "with the other switch's diode recovery current, 2·Q_rr/t_rr")
            else:
                raise NeedsData(f"switch.{other}.diode_qrr", f"switch.{other}.diode_trr")

    if ctx.v("drive.high.kind") == "bootstrap_driver":
        with ctx.section("stress.node_undershoot"):
            loop = ctx.need("grounding.loop_inductance")
            vf = ctx.need("switch.low.diode_vf")
            di = out(grounding.current_slope(ctx.q("op.load_current_peak"),
                                             ctx.q("switching.high.current_fall")))
            ctx.publish("stress.node_undershoot", vf + out(grounding.inductive_voltage(loop, di)),
                        "the whole commutation-loop inductance taken as between the low-side "
                        "source and the driver's ground (conservative)")
