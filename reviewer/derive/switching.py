"""Switching times by the gate-charge method, dead time, shoot-through, dv/dt turn-on, pulses.

Paralleled devices driven from one stage: their input capacitance and gate charges add, their
internal gate resistances (and their own series gate resistors, when each has one) appear in
parallel.
"""

from __future__ import annotations

import math

from reviewer.derive.gate import levels
from reviewer.physics import gate as gp
from reviewer.physics import switching as sp
from reviewer.physics import thermal as tp
from reviewer.context import SIDES, Ctx, NeedsData, declare
from reviewer.units import render

OTHER = {"high": "low", "low": "high"}
SPWM = ("spwm_bipolar", "spwm_unipolar", "spwm_level_shifted")

_PER_SWITCH = ("v_drive", "v_off", "v_plateau", "td_on", "rise_time", "td_off", "fall_time",
               "tail", "turn_on_time", "turn_off_time", "pull_only", "off_seconds_per_ohm",
               "off_charge", "off_r_fixed", "hold_resistance")

QUANTITIES = declare(
    ("switching.{side}.v_drive", "V", "Gate-source on level used for the switching times (highest bus)"),
    ("switching.{side}.v_off", "V", "Gate-source off level (enhancement direction)"),
    ("switching.{side}.v_plateau", "V", "Miller plateau, given or V_th + I_D/g_fs at the peak load current"),
    ("switching.{side}.td_on", "s", "Turn-on delay t_d(on)"),
    ("switching.{side}.rise_time", "s", "Drain-voltage transition at turn-on along the plateau, t_r"),
    ("switching.{side}.td_off", "s", "Turn-off delay t_d(off)"),
    ("switching.{side}.fall_time", "s", "Drain-voltage transition at turn-off along the plateau, t_f"),
    ("switching.{side}.tail", "s", "Current fall at turn-off, gate from plateau to threshold"),
    ("switching.{side}.turn_on_time", "s", "t_d(on) + t_r"),
    ("switching.{side}.turn_off_time", "s", "t_d(off) + t_f + current-fall tail: until the channel is off"),
    ("switching.{side}.pull_only", "", "The pull resistor is the only turn-off path", "flag"),
    ("switching.{side}.off_seconds_per_ohm", "s/Ω", "Turn-off time per ohm of gate-loop resistance"),
    ("switching.{side}.off_charge", "C", "Gate charge removed to turn the switch off"),
    ("switching.{side}.off_r_fixed", "Ω", "Turn-off loop resistance other than the pull or gate resistor"),
    ("switching.{side}.hold_resistance", "Ω", "Resistance holding the gate off"),
    ("switching.{side}.dvdt", "V/s", "Drain slew rate when the other switch of the leg turns on"),
    ("switching.{side}.induced_vgs", "V", "Off-state gate-source voltage during that slew, "
     "off level plus the C_gd-coupled rise"),
    ("timing.{side}.dead_time", "s", "Dead time before this switch turns on"),
    ("timing.{side}.outgoing_turn_off", "s", "Turn-off time of the other switch, before this one turns on"),
    ("timing.{side}.incoming_delay", "s", "This switch's turn-on delay"),
    ("timing.{side}.needed", "s", "Outgoing turn-off minus incoming delay: the bare dead time needed"),
    ("timing.{side}.overlap", "s", "Time both switches conduct when this one turns on"),
    ("timing.{side}.outgoing_pull_only", "", "The outgoing switch turns off through its pull resistor alone", "flag"),
    ("timing.{side}.outgoing_seconds_per_ohm", "s/Ω", "Outgoing switch's turn-off time per ohm"),
    ("timing.{side}.outgoing_r_fixed", "Ω", "Outgoing switch's fixed turn-off loop resistance"),
    ("timing.{side}.outgoing_charge", "C", "Outgoing switch's turn-off gate charge"),
    ("timing.{side}.outgoing_path", "", "How the outgoing switch's gate is turned off", "text"),
    ("timing.{side}.outgoing_pull_voltage", "V", "Voltage across the outgoing switch's pull resistor"),
    ("timing.dead_time_fraction", "%", "2 · t_dead · f_sw: body-diode share and output error"),
    ("timing.min_pulse", "s", "Shortest pulse that is made: the controller's minimum or a full switching cycle"),
    ("timing.narrow_pulse_fraction", "%", "Share of the output cycle asking for shorter pulses"),
)


def _n_eff(ctx: Ctx, side: str) -> tuple[int, bool]:
    n = int(ctx.v(f"switch.{side}.count"))
    return n, bool(ctx.v(f"switch.{side}.own_gate_resistor")) and n > 1


def plateau(ctx: Ctx, side: str, vth: float) -> float:
    given = ctx.v(f"switch.{side}.v_plateau")
    if given is not None:
        return given
    gfs = ctx.need(f"switch.{side}.gfs")
    n, _ = _n_eff(ctx, side)
    i_d = float(tp.device_current(ctx.q("op.load_current_peak"), n))
    return gp.miller_plateau(vth, i_d, gfs)


def _switch(ctx: Ctx, side: str, v_max: float) -> dict:
    sw, dr = f"switch.{side}", f"drive.{side}"
    ciss, qgd, vth = ctx.need(f"{sw}.ciss", f"{sw}.qgd", f"{sw}.vth")
    n, own = _n_eff(ctx, side)
    ciss, qgd = ciss * n, qgd * n
    r_int = ctx.v(f"{sw}.rg_internal") / n
    rg = ctx.v(f"{dr}.r_gate") / (n if own else 1)
    rg_off = ctx.v(f"{dr}.r_gate_off")
    rg_off = rg if rg_off is None else rg_off / (n if own else 1)
    v_on, v_off = levels(ctx, side, v_max)
    vp = plateau(ctx, side, vth)
    r_src, r_snk = ctx.v(f"{dr}.r_source"), ctx.v(f"{dr}.r_sink")
    i_src, i_snk = ctx.v(f"{dr}.source_current"), ctx.v(f"{dr}.sink_current")
    pull = ctx.v(f"{dr}.pull_resistor") if ctx.v(f"{dr}.pull_to") != "none" else None

    if r_src is None and i_src is None:
        raise NeedsData(f"{dr}.source_current", f"{dr}.r_source")
    r_on = r_src + rg + r_int if r_src is not None else (rg + r_int if rg + r_int > 0 else None)
    pull_only = r_snk is None and i_snk is None
    if pull_only:
        if pull is None:
            raise NeedsData(f"{dr}.sink_current", f"{dr}.r_sink", f"{dr}.pull_resistor")
        r_off, r_fixed, i_off = pull + r_int, r_int, None
    else:
        r_fixed = (r_snk or 0.0) + r_int
        r_off = r_snk + rg_off + r_int if r_snk is not None else (
            rg_off + r_int if rg_off + r_int > 0 else None)
        i_off = i_snk
    t = sp.switching_times(ciss, qgd, v_on, vth, vp, r_on=r_on, r_off=r_off, i_source=i_src,
                           i_sink=i_off, v_off=v_off)
    if r_off is not None:
        hold = r_off
    else:
        # a current-rated stage holds the gate through about V_drive / I_peak (estimate)
        hold = rg_off + r_int + abs(v_on - v_off) / i_snk
    return {
        "v_drive": v_on, "v_off": v_off, "v_plateau": vp, "td_on": t.td_on, "rise_time": t.tr,
        "td_off": t.td_off, "fall_time": t.tf, "tail": t.tail, "turn_on_time": t.turn_on,
        "turn_off_time": t.turn_off_to_cutoff, "pull_only": pull_only,
        "off_seconds_per_ohm": sp.turn_off_seconds_per_ohm(ciss, qgd, v_on, vp, vth, v_off),
        "off_charge": ciss * max(v_on - vp, 0.0) + qgd + ciss * max(vp - vth, 0.0),
        "off_r_fixed": r_fixed, "hold_resistance": hold,
        "_cgd": ctx.v(f"{sw}.crss"), "_ciss1": ctx.v(f"{sw}.ciss"), "_n": n,
    }


def _dead_time(ctx: Ctx, side: str) -> tuple[float, str]:
    if ctx.v("drive.shared_signal"):
        return 0.0, "one signal and its inverse feed the leg: no dead time beyond the inverter's delay"
    t = ctx.v(f"timing.dead_time_{side}")
    if t is None:
        t = ctx.need("timing.dead_time")
    return t, ""


def derive(ctx: Ctx) -> None:
    v_max = ctx.q("op.bus_max")
    sw: dict[str, dict] = {}
    for side in SIDES:
        names = [f"switching.{side}.{k}" for k in _PER_SWITCH]
        with ctx.section(*names):
            sw[side] = _switch(ctx, side, v_max)
            for k in _PER_SWITCH:
                ctx.publish(f"switching.{side}.{k}", sw[side][k],
                            "pull resistor is the only turn-off path"
                            if k == "turn_off_time" and sw[side]["pull_only"] else "")

    for side in SIDES:
        other = OTHER[side]
        with ctx.section(f"switching.{side}.dvdt", f"switching.{side}.induced_vgs"):
            if side not in sw or other not in sw:
                raise NeedsData(*ctx.missing.get(f"switching.{side if side not in sw else other}.td_on", ()))
            me = sw[side]
            cgd = ctx.need(f"switch.{side}.crss")
            dvdt = sp.node_slew_rate(v_max, sw[other]["rise_time"])
            cgs = max(me["_ciss1"] - cgd, 0.0)
            n = me["_n"]
            induced = sp.induced_gate_voltage(cgd * n, cgs * n, me["hold_resistance"], dvdt, v_max)
            ctx.publish(f"switching.{side}.dvdt", dvdt)
            ctx.publish(f"switching.{side}.induced_vgs", me["v_off"] + induced)

        edge = [f"timing.{side}.{k}" for k in (
            "dead_time", "outgoing_turn_off", "incoming_delay", "needed", "overlap",
            "outgoing_pull_only", "outgoing_seconds_per_ohm", "outgoing_r_fixed", "outgoing_charge")]
        with ctx.section(*edge):
            dead, note = _dead_time(ctx, side)
            ctx.publish(f"timing.{side}.dead_time", dead, note)
            if side not in sw or other not in sw:
                missing = ctx.missing.get(f"switching.{side}.td_on", ()) + \
                    ctx.missing.get(f"switching.{other}.td_on", ())
                raise NeedsData(*missing)
            t_off, td_on = sw[other]["turn_off_time"], sw[side]["td_on"]
            ctx.publish(f"timing.{side}.outgoing_turn_off", t_off)
            ctx.publish(f"timing.{side}.incoming_delay", td_on)
            ctx.publish(f"timing.{side}.needed", max(t_off - td_on, 0.0))
            ctx.publish(f"timing.{side}.overlap", sp.shoot_through_overlap(dead, t_off, td_on))
            ctx.publish(f"timing.{side}.outgoing_pull_only", sw[other]["pull_only"])
            ctx.publish(f"timing.{side}.outgoing_seconds_per_ohm", sw[other]["off_seconds_per_ohm"])
            ctx.publish(f"timing.{side}.outgoing_r_fixed", sw[other]["off_r_fixed"])
            ctx.publish(f"timing.{side}.outgoing_charge", sw[other]["off_charge"])
            pull = ctx.v(f"drive.{other}.pull_resistor")
            if sw[other]["pull_only"]:
                path = f"through its {render(pull, 'Ω')} pull resistor, its only turn-off path"
            else:
                path = "through its gate drive"
            ctx.publish(f"timing.{side}.outgoing_path", path)
            if ctx.has(f"gate.{other}.pull_voltage"):
                ctx.publish(f"timing.{side}.outgoing_pull_voltage", ctx.q(f"gate.{other}.pull_voltage"))

    with ctx.section("timing.dead_time_fraction"):
        dead = max(_dead_time(ctx, s)[0] for s in SIDES)
        ctx.publish("timing.dead_time_fraction", sp.dead_time_fraction(dead, ctx.q("op.switching_frequency")))

    kind = ctx.v("modulation.kind")
    if kind in SPWM:
        with ctx.section("timing.min_pulse", "timing.narrow_pulse_fraction"):
            m, fc = ctx.need("modulation.index", "modulation.carrier")
            given = ctx.v("modulation.min_pulse") or 0.0
            if not all(s in sw for s in SIDES):
                raise NeedsData(*ctx.missing.get("switching.high.td_on", ()),
                                *ctx.missing.get("switching.low.td_on", ()))
            full = max(s["turn_on_time"] + s["turn_off_time"] for s in sw.values())
            t_min = max(given, full) if math.isfinite(full) else given
            ctx.publish("timing.min_pulse", t_min,
                        "the controller's minimum pulse" if t_min == given else
                        "a full turn-on and turn-off of the slower switch")
            fraction = (sp.narrow_pulse_fraction_leg(m, fc, t_min) if kind == "spwm_bipolar"
                        else sp.narrow_pulse_fraction_unipolar(m, fc, t_min))
            ctx.publish("timing.narrow_pulse_fraction", fraction,
                        "leg pulses (two-level)" if kind == "spwm_bipolar"
                        else "bridge output pulses (three-level), shortest at the zero crossing")
