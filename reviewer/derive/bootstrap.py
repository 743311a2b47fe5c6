"""Bootstrap supply of an N-channel high side: the charge one on-time takes, the capacitance it
needs and the gate voltage left at the end of the longest on-time the modulation asks for."""

from __future__ import annotations

import math

from reviewer.physics import bootstrap as bp
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("bootstrap.t_on_max", "s", "Longest continuous high-side on-time the modulation asks for"),
    ("bootstrap.vgs_needed", "V", "Gate-source voltage the high side needs while on"),
    ("bootstrap.droop_allowed", "V", "Droop allowed: V_cc − V_f − V_GS,needed"),
    ("bootstrap.charge", "C", "Charge taken from the capacitor in the longest on-time"),
    ("bootstrap.c_min", "F", "Smallest bootstrap capacitance, Q_total / ΔV"),
    ("bootstrap.c_practice", "F", "Ten times the minimum (common practice)"),
    ("bootstrap.gate_end", "V", "High-side gate-source voltage at the end of the longest on-time"),
    ("bootstrap.refresh_time", "s", "Shortest low-side on-time per switching period (recharge time)"),
    ("bootstrap.cycle_charge", "C", "Charge drawn from the capacitor per switching period"),
    ("bootstrap.refresh_charge", "C", "Charge the shortest refresh returns with the capacitor at "
     "its allowed droop"),
    ("bootstrap.refresh_resistance_max", "Ω", "Largest charging-path resistance whose shortest "
     "refresh still returns the charge drawn"),
    ("bootstrap.first_pulse_vgs", "V", "High-side gate-source voltage at the first pulse after "
     "start-up, after one low-side on-time from an empty capacitor"),
    ("bootstrap.diode_reverse", "V", "Reverse voltage the bootstrap diode must be rated for, "
     "V_bus,max + V_cc (the switch node's overshoot included where known)"),
)

NAMES = [d.pattern for d in QUANTITIES]

ZERO_NOTES = {
    "low_sides": "quasi-square with the zero state on the low sides: each high side is on for "
                 "the active interval only",
    "phase_shifted": "quasi-square with phase-shifted legs: each high side is on for half a "
                     "period",
}


def derive(ctx: Ctx) -> None:
    if ctx.v("drive.high.kind") != "bootstrap_driver":
        return
    with ctx.section(*NAMES):
        if ctx.v("switch.high.polarity") != "n":
            return
        cap, vcc = ctx.need("bootstrap.capacitor", "bootstrap.supply")
        vf = ctx.v("bootstrap.diode_vf")
        kind = ctx.v("modulation.kind")
        zero = ctx.v("modulation.zero_state")
        t_on = bp.longest_on_time(kind, ctx.need("output.frequency"),
                                  notch_angle=ctx.v("modulation.notch_angle") or 0.0,
                                  index=ctx.v("modulation.index"),
                                  f_carrier=ctx.v("modulation.carrier"), zero_state=zero)
        ctx.publish("bootstrap.t_on_max", t_on, ZERO_NOTES[zero] if kind == "quasi_square" else "")

        spec = ctx.v("switch.high.rds_on_vgs")
        if spec is None:
            spec = 2 * ctx.need("switch.high.vth")
            why = "R_DS(on) drive level not given: twice V_th,max"
        else:
            why = "the V_GS R_DS(on) is specified at"
        uvlo = ctx.v("drive.high.uvlo")
        needed = max(spec, uvlo) if uvlo is not None else spec
        if uvlo is not None and uvlo > spec:
            why = "the driver's undervoltage lockout"
        ctx.publish("bootstrap.vgs_needed", needed, why)
        dv = bp.allowed_droop(vcc, vf, needed)
        ctx.publish("bootstrap.droop_allowed", dv)

        qg = ctx.need("switch.high.qg") * int(ctx.v("switch.high.count"))
        i_dc = ctx.v("bootstrap.quiescent_current") + ctx.v("bootstrap.leakage_current")
        pull = ctx.v("drive.high.pull_resistor") if ctx.v("drive.high.pull_to") != "none" else None
        v_start = vcc - vf
        # a gate-source pull resistor draws from the capacitor all through the on-time; for the
        # minimum capacitance it is counted at its largest current, V_start / R (conservative)
        i_pull = v_start / pull if pull else 0.0
        q = bp.bootstrap_charge(qg, i_dc + i_pull, 0.0, t_on, ctx.v("bootstrap.level_shift_charge"))
        ctx.publish("bootstrap.charge", q,
                    "includes the gate pull resistor's current" if pull else "")
        c_min = bp.minimum_capacitance(q, dv)
        ctx.publish("bootstrap.c_min", c_min)
        ctx.publish("bootstrap.c_practice", bp.practice_capacitance(c_min))
        v_end = bp.gate_voltage_after(v_start - ctx.v("bootstrap.level_shift_charge") / cap, cap, qg,
                                      i_dc, t_on, pull if pull else float("inf"))
        ctx.publish("bootstrap.gate_end", v_end)

        # refresh: the shortest low-side on-time per period must put back what a period takes
        f_sw = ctx.q("op.switching_frequency")
        dead = max(ctx.q(f"timing.{s}.dead_time") for s in ("high", "low")) \
            if ctx.has("timing.high.dead_time") and ctx.has("timing.low.dead_time") else 0.0
        index = ctx.v("modulation.index")
        t_ref = bp.shortest_refresh_time(kind, ctx.need("output.frequency"), dead,
                                         notch_angle=ctx.v("modulation.notch_angle") or 0.0,
                                         index=index, f_carrier=ctx.v("modulation.carrier"), zero_state=zero)
        ctx.publish("bootstrap.refresh_time", t_ref,
                    "at the highest modulation index" if index is not None
                    else "less the dead time")
        t_period_on = min(t_on, 1.0 / f_sw)
        q_cycle = bp.bootstrap_charge(qg, i_dc + i_pull, 0.0, t_period_on,
                                      ctx.v("bootstrap.level_shift_charge"))
        ctx.publish("bootstrap.cycle_charge", q_cycle)
        r_ch = ctx.v("bootstrap.series_resistance")
        ctx.publish("bootstrap.refresh_charge", bp.refresh_charge(cap, r_ch, t_ref, max(dv, 0.0)))
        # largest R with C·ΔV·(1 − e^(−t/RC)) ≥ Q: R = t / (C·ln(1/(1 − Q/(C·ΔV))))
        x = q_cycle / (cap * dv) if dv > 0 else float("inf")
        r_max = t_ref / (cap * math.log(1.0 / (1.0 - x))) if 0 < x < 1 and t_ref > 0 else 0.0
        ctx.publish("bootstrap.refresh_resistance_max", r_max)
        # first pulse: the capacitor starts empty and charges for one low-side on-time
        t_first = bp.shortest_refresh_time(kind, ctx.need("output.frequency"), dead,
                                           notch_angle=ctx.v("modulation.notch_angle") or 0.0,
                                           index=0.0 if index is not None else None,
                                           f_carrier=ctx.v("modulation.carrier"), zero_state=zero)
        v_first = float(bp.refresh_charge(cap, r_ch, t_first, v_start)) / cap - qg / cap
        ctx.publish("bootstrap.first_pulse_vgs", v_first,
                    "one low-side on-time at the start of the first carrier period (zero "
                    "reference) charges the empty capacitor")
    with ctx.section("bootstrap.diode_reverse"):
        need = ctx.q("op.bus_max") + ctx.need("bootstrap.supply")
        if ctx.has("stress.high.vds_peak"):
            need = max(need, ctx.q("stress.high.vds_peak") + ctx.v("bootstrap.supply"))
        ctx.publish("bootstrap.diode_reverse", need)
