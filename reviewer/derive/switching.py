"""Switching times by the gate-charge method, dead time, shoot-through, dv/dt turn-on, pulses.

Paralleled devices driven from one stage: their input capacitance and gate charges add, their
internal gate resistances (and their own series gate resistors, when each has one) appear in
parallel.

Two sets of times are computed where the internal gate resistance is not given: the slow one
(3 Ω assumed) for turn-off, dead time and losses, the fast one (0 Ω) for edge speeds (current
edges, dv/dt), each the conservative end for the checks that use it. Turn-off for the dead time
is taken at the current that makes it longest: at low current the plateau nears V_th and both
the delay and the plateau interval grow.
"""

from __future__ import annotations

from functools import lru_cache

import numpy as np

from reviewer.derive.gate import levels
from reviewer.physics import gate as gp
from reviewer.physics import pattern
from reviewer.physics import switching as sp
from reviewer.physics import thermal as tp
from reviewer.physics.arrays import is_array, out
from reviewer.context import SIDES, Ctx, NeedsData, declare
from reviewer.units import render

VECTOR = True
"""Evaluated over arrays (one element per point) by :meth:`reviewer.quantities.Runner.batch`."""

OTHER = {"high": "low", "low": "high"}
SPWM = ("spwm_bipolar", "spwm_unipolar", "spwm_level_shifted")

_PER_SWITCH = ("v_drive", "v_off", "v_plateau", "td_on", "current_rise_gc", "rise_time", "td_off",
               "fall_time", "tail", "turn_on_time", "turn_off_time", "pull_only",
               "off_seconds_per_ohm", "off_charge", "off_r_fixed", "hold_resistance",
               "rg_internal_used")

RG_INTERNAL_SLOW = 3.0
"""Internal gate resistance assumed for turn-off and dead-time figures when none is given [Ω]:
towards the high end of small power MOSFETs (common practice; parts range about 0.5–5 Ω)."""

RG_INTERNAL_FAST = 0.0
"""Internal gate resistance assumed for edge speeds when none is given [Ω]: the fastest case."""

QUANTITIES = declare(
    ("switching.{side}.v_drive", "V", "Gate-source on level used for the switching times (highest bus)"),
    ("switching.{side}.v_off", "V", "Gate-source off level (enhancement direction)"),
    ("switching.{side}.v_plateau", "V", "Miller plateau, given or V_th + I_D/g_fs at the peak load current"),
    ("switching.{side}.td_on", "s", "Turn-on delay t_d(on)"),
    ("switching.{side}.current_rise_gc", "s", "Current rise at turn-on by the gate-charge method, t_ri"),
    ("switching.{side}.rise_time", "s", "Drain-voltage fall at turn-on along the plateau, t_fv"),
    ("switching.{side}.td_off", "s", "Turn-off delay t_d(off)"),
    ("switching.{side}.fall_time", "s", "Drain-voltage rise at turn-off along the plateau, t_rv"),
    ("switching.{side}.tail", "s", "Current fall at turn-off by the gate-charge method (plateau to threshold), t_fi"),
    ("switching.{side}.turn_on_time", "s", "t_d(on) + t_ri + t_fv"),
    ("switching.{side}.turn_off_time", "s", "t_d(off) + t_rv + t_fi until the channel is off, "
     "at the load current that makes it longest"),
    ("switching.{side}.rg_internal_used", "Ω", "Internal gate resistance used for turn-off and dead time"),
    ("switching.{side}.current_fall", "s", "Current-fall interval at turn-off used for L·di/dt: "
     "datasheet t_f, or the gate-charge t_fi bounded by the common-source inductance"),
    ("switching.{side}.current_rise", "s", "Current-rise interval at turn-on used for L·di/dt"),
    ("switching.{side}.overlap_time", "s", "t_ri + t_fv + t_rv + t_fi: voltage and current both "
     "present, for the switching loss"),
    ("switching.{side}.pull_only", "", "The pull resistor is the only turn-off path", "flag"),
    ("switching.{side}.off_seconds_per_ohm", "s/Ω", "Turn-off time per ohm of gate-loop resistance"),
    ("switching.{side}.off_charge", "C", "Gate charge removed to turn the switch off"),
    ("switching.{side}.off_r_fixed", "Ω", "Turn-off loop resistance other than the pull or gate resistor"),
    ("switching.{side}.hold_resistance", "Ω", "Resistance holding the gate off"),
    ("switching.{side}.dvdt", "V/s", "Drain slew rate when the other switch of the leg turns on"),
    ("switching.{side}.induced_vgs", "V", "Off-state gate-source voltage during that slew, "
     "off level plus the C_gd-coupled rise"),
    ("timing.{side}.dead_time", "s", "Effective dead time before this switch turns on, after "
     "the driver's delay mismatch and spread and the controller's resolution"),
    ("timing.{side}.dead_time_loss", "s", "Dead time lost to driver delay mismatch, delay spread "
     "and controller resolution"),
    ("timing.{side}.shoot_through_peak", "A", "Cross-conduction current bound V_bus/(R_high + "
     "R_low) at the hot on-resistances, where the leg can cross-conduct"),
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


def _all(mask, what: str) -> bool:
    """Whether ``mask`` holds, for a float or at every point of an array call.

    A test whose outcome decides what is published (a quantity or needs data) cannot differ
    between the points of one array call: where it does, raise ValueError, which makes the
    runner evaluate this module point by point (correct, only slower)."""
    m = np.asarray(mask, dtype=bool)
    if m.all():
        return True
    if m.any():
        raise ValueError(f"{what} differs between the points: evaluate them one by one")
    return False


def _each(fn, *xs):
    """``fn`` of floats, or in an array call the list of ``fn`` at each point (for texts)."""
    if not is_array(*xs):
        return fn(*xs)
    n = max(np.size(x) for x in xs if isinstance(x, np.ndarray))
    seen: dict = {}  # points with the same inputs (the vertices of a box, say) share one text
    texts = []
    for i in range(n):
        at = tuple(float(x[i]) if isinstance(x, np.ndarray) and x.ndim else x for x in xs)
        if at not in seen:
            seen[at] = fn(*at)
        texts.append(seen[at])
    return texts


def _note(note):
    """A note from :func:`_each`: a list of texts only where every point has one (a point with
    none would publish no note there, which one array call cannot say)."""
    if not isinstance(note, list):
        return note
    if all(note):
        return note
    if any(note):
        raise ValueError("a note is given at some points only: evaluate them one by one")
    return ""


def _text(value):
    """A text value from :func:`_each`: one text, or a numpy array of them (one per point)."""
    return np.array(value) if isinstance(value, list) else value


def plateau(ctx: Ctx, side: str, vth: float) -> float:
    given = ctx.v(f"switch.{side}.v_plateau")
    if given is not None:
        return given
    gfs = ctx.need(f"switch.{side}.gfs")
    n, _ = _n_eff(ctx, side)
    i_d = out(tp.device_current(ctx.q("op.load_current_peak"), n))
    return gp.miller_plateau(vth, i_d, gfs)


def _gate(ctx: Ctx, side: str, v_max: float) -> dict:
    """What ``side``'s intervals are made from that the internal gate resistance leaves alone:
    levels, plateau, charge capacitances, the drive stage (read once for both interval sets)."""
    sw, dr = f"switch.{side}", f"drive.{side}"
    ciss1, qgd1, vth = ctx.need(f"{sw}.ciss", f"{sw}.qgd", f"{sw}.vth")
    n, own = _n_eff(ctx, side)
    qgd = qgd1 * n
    rg = ctx.v(f"{dr}.r_gate") / (n if own else 1)
    rg_off = ctx.v(f"{dr}.r_gate_off")
    rg_off = rg if rg_off is None else rg_off / (n if own else 1)
    v_on, v_off = levels(ctx, side, v_max)
    vp = plateau(ctx, side, vth)
    v_qg = ctx.v(f"{sw}.qg_vgs")
    v_qg = ctx.v(f"{sw}.rds_on_vgs") if v_qg is None else v_qg
    c_lo1, c_hi1 = sp.charge_capacitances(ciss1, ctx.v(f"{sw}.qg"), ctx.v(f"{sw}.qgs"), qgd1,
                                          vp, v_qg)
    c_lo, c_hi = c_lo1 * n, c_hi1 * n
    r_src, r_snk = ctx.v(f"{dr}.r_source"), ctx.v(f"{dr}.r_sink")
    i_src, i_snk = ctx.v(f"{dr}.source_current"), ctx.v(f"{dr}.sink_current")
    pull = ctx.v(f"{dr}.pull_resistor") if ctx.v(f"{dr}.pull_to") != "none" else None
    return {"ciss1": ciss1, "vth": vth, "n": n, "qgd": qgd, "rg": rg, "rg_off": rg_off,
            "v_on": v_on, "v_off": v_off, "vp": vp, "c_lo": c_lo, "c_hi": c_hi,
            "r_src": r_src, "r_snk": r_snk, "i_src": i_src, "i_snk": i_snk, "pull": pull,
            "cgd": ctx.v(f"{sw}.crss")}


def _times(ctx: Ctx, side: str, g: dict, r_int1: float, slow: bool = True) -> dict:
    """Every interval of ``side`` (gate ``g`` from :func:`_gate`) with internal gate
    resistance ``r_int1`` per device [Ω].

    ``slow`` False leaves out what only the slow set is used for (the turn-off at the current
    that makes it longest, its charge and time per ohm): the edge-speed set needs none of it."""
    dr = f"drive.{side}"
    ciss1, vth, n, qgd, rg, rg_off = (g[k] for k in ("ciss1", "vth", "n", "qgd", "rg", "rg_off"))
    v_on, v_off, vp, c_lo, c_hi = (g[k] for k in ("v_on", "v_off", "vp", "c_lo", "c_hi"))
    r_src, r_snk, i_src, i_snk, pull = (g[k] for k in ("r_src", "r_snk", "i_src", "i_snk", "pull"))
    r_int = r_int1 / n
    if r_src is None and i_src is None:
        raise NeedsData(f"{dr}.source_current", f"{dr}.r_source")
    # a stage given by its current limit alone has loop resistance only where R_g + R_int > 0
    r_on = r_src + rg + r_int if r_src is not None else (
        rg + r_int if _all(rg + r_int > 0, "a resistive turn-on loop") else None)
    pull_only = r_snk is None and i_snk is None
    if pull_only:
        if pull is None:
            raise NeedsData(f"{dr}.sink_current", f"{dr}.r_sink", f"{dr}.pull_resistor")
        r_off, r_fixed, i_off = pull + r_int, r_int, None
    else:
        r_fixed = (0.0 if r_snk is None else r_snk) + r_int
        r_off = r_snk + rg_off + r_int if r_snk is not None else (
            rg_off + r_int if _all(rg_off + r_int > 0, "a resistive turn-off loop") else None)
        i_off = i_snk
    kw = dict(r_on=r_on, r_off=r_off, i_source=i_src, i_sink=i_off, v_off=v_off, c_above=c_hi)
    t = sp.switching_times(c_lo, qgd, v_on, vth, vp, **kw)
    if r_off is not None:
        hold = r_off
    else:
        # a current-rated stage holds the gate through about V_drive / I_peak (estimate)
        hold = rg_off + r_int + abs(v_on - v_off) / i_snk
    found = {
        "v_drive": v_on, "v_off": v_off, "v_plateau": vp, "td_on": t.td_on,
        "current_rise_gc": t.t_ri, "rise_time": t.tr,
        "td_off": t.td_off, "fall_time": t.tf, "tail": t.tail, "turn_on_time": t.turn_on,
        "pull_only": pull_only,
        "off_r_fixed": r_fixed, "hold_resistance": hold, "rg_internal_used": r_int1,
        "_cgd": g["cgd"], "_ciss1": ciss1, "_n": n, "_vth": vth,
        "_r_on": r_on, "_r_off": r_off, "_c_lo": c_lo,
    }
    if not slow:
        return found
    # at low load current the plateau nears the threshold: longer delay and plateau interval
    off = t.turn_off_to_cutoff
    vp_low = out(np.where(vth > v_off, np.minimum(vp, vth), vp))
    if not is_array(vp_low) and vp_low == vp:
        off_low = off  # the same plateau: the same turn-off, not computed twice
    else:
        td_off, tf, tail = sp.turn_off_intervals(c_lo, qgd, v_on, vth, vp_low, r_off=r_off,
                                                 i_sink=i_off, v_off=v_off, c_above=c_hi)
        off_low = td_off + tf + tail
    slow_vp = out(np.where(off_low > off, vp_low, vp))
    found.update({
        "turn_off_time": out(np.maximum(off, off_low)),
        "off_seconds_per_ohm": sp.turn_off_seconds_per_ohm(c_lo, qgd, v_on, slow_vp, vth, v_off),
        "off_charge": out(c_lo * np.maximum(v_on - slow_vp, 0.0) + qgd
                          + c_lo * np.maximum(slow_vp - vth, 0.0)),
    })
    return found


def _switch(ctx: Ctx, side: str, v_max: float) -> tuple[dict, dict]:
    """(slow, fast) interval sets: the same unless the internal gate resistance is absent."""
    given = ctx.v(f"switch.{side}.rg_internal")
    g = _gate(ctx, side, v_max)
    if given is not None:
        t = _times(ctx, side, g, given)
        return t, t
    return (_times(ctx, side, g, RG_INTERNAL_SLOW),
            _times(ctx, side, g, RG_INTERNAL_FAST, slow=False))


def _gfs(ctx: Ctx, side: str, fast: dict, i_dev: float) -> float:
    gfs = ctx.v(f"switch.{side}.gfs")
    if gfs is not None:
        return gfs
    head = fast["v_plateau"] - fast["_vth"]
    if not _all(~((head <= 0) | (np.asarray(i_dev) <= 0)), "a plateau above threshold"):
        raise NeedsData(f"switch.{side}.gfs")
    return i_dev / head  # the given plateau sits at I/g_fs above threshold


def _current_edges(ctx: Ctx, side: str, fast: dict) -> None:
    """Publish the one definition of the current edges that stress and grounding share."""
    sw = f"switch.{side}"
    with ctx.section(f"switching.{side}.current_rise", f"switching.{side}.current_fall"):
        n = fast["_n"]
        i_dev = out(tp.device_current(ctx.q("op.load_current_peak"), n))
        l_s = ctx.v(f"{sw}.common_source_inductance")
        if l_s is None:
            ctx.publish(f"switching.{side}.current_rise", fast["current_rise_gc"],
                        "gate-charge estimate, no common-source inductance given (a lower bound)")
        else:
            g = _gfs(ctx, side, fast, i_dev)
            r_on = 0.0 if fast["_r_on"] is None else fast["_r_on"]
            t_ls = sp.current_edge_time(i_dev, fast["v_drive"] - fast["v_plateau"], l_s,
                                        r_on, fast["_c_lo"] / n, g)
            ctx.publish(f"switching.{side}.current_rise",
                        out(np.maximum(t_ls, fast["current_rise_gc"])),
                        "bounded by the common-source inductance")
        t_f = ctx.v(f"{sw}.current_fall_time")
        if t_f is not None:
            ctx.publish(f"switching.{side}.current_fall", t_f, "the part's datasheet fall time t_f")
        elif l_s is not None:
            g = _gfs(ctx, side, fast, i_dev)
            r_off = fast["_r_off"] if fast["_r_off"] is not None else fast["hold_resistance"]
            t_ls = sp.current_edge_time(i_dev, fast["v_plateau"] - fast["v_off"], l_s, r_off,
                                        fast["_c_lo"] / n, g)
            ctx.publish(f"switching.{side}.current_fall", out(np.maximum(t_ls, fast["tail"])),
                        "gate-charge current fall bounded by the common-source inductance")
        else:
            # the gate-charge tail alone is no usable bound for a fast part (it gives hundreds of
            # volts of overshoot): say what would give one instead of judging on it
            raise NeedsData(f"{sw}.current_fall_time", f"{sw}.common_source_inductance")


def _dead_time(ctx: Ctx, side: str) -> tuple[float, float, str]:
    """(effective dead time, time lost to the driver and controller, note) [s]."""
    if ctx.v("drive.shared_signal"):
        given = ctx.v("timing.dead_time") is not None or ctx.v(f"timing.dead_time_{side}") is not None
        return 0.0, 0.0, ("one signal and its inverse feed the leg: no dead time beyond the "
                          "inverter's delay" + ("; timing.dead_time has no effect here"
                                                if given else ""))
    t = ctx.v(f"timing.dead_time_{side}")
    if t is None:
        t = ctx.need("timing.dead_time")
    mism, spread, res = (ctx.v(f"timing.{k}") for k in ("delay_mismatch", "delay_spread", "resolution"))
    eff = sp.effective_dead_time(t, *(0.0 if x is None else x for x in (mism, spread, res)))
    loss = t - eff
    return eff, loss, _note(_each(_dead_time_note, t, mism, spread, res))


@lru_cache(maxsize=4096)
def _dead_time_note(t: float, mism, spread, res) -> str:
    """What the effective dead time is made of, for one point (kept: rendering is slow)."""
    parts = [w for w, x in (("driver delay mismatch", mism), ("delay spread", spread),
                            ("controller resolution", res)) if x]
    return f"set {render(t, 's')}, less {' and '.join(parts)}" if parts else ""


@lru_cache(maxsize=4096)
def _pull_path(r: float) -> str:
    """How an outgoing switch with a pull resistor ``r`` [Ω] alone turns off, for one point."""
    return f"through its {render(r, 'Ω')} pull resistor, its only turn-off path"


def derive(ctx: Ctx) -> None:
    v_max = ctx.q("op.bus_max")
    sw: dict[str, dict] = {}
    fast: dict[str, dict] = {}
    for side in SIDES:
        names = [f"switching.{side}.{k}" for k in _PER_SWITCH]
        with ctx.section(*names, f"switching.{side}.overlap_time"):
            sw[side], fast[side] = _switch(ctx, side, v_max)
            given = ctx.v(f"switch.{side}.rg_internal") is not None
            for k in _PER_SWITCH:
                note = ""
                if k == "turn_off_time" and sw[side]["pull_only"]:
                    note = "pull resistor is the only turn-off path"
                elif k in ("turn_off_time", "rg_internal_used") and not given:
                    note = (f"switch.{side}.rg_internal not given: {RG_INTERNAL_SLOW:g} Ω assumed "
                            f"here, {RG_INTERNAL_FAST:g} Ω for edge speeds")
                ctx.publish(f"switching.{side}.{k}", sw[side][k], note)
            s = sw[side]
            ctx.publish(f"switching.{side}.overlap_time",
                        s["current_rise_gc"] + s["rise_time"] + s["fall_time"] + s["tail"],
                        "gate-charge intervals at the peak load current")
        if side in fast:
            _current_edges(ctx, side, fast[side])

    deads: dict[str, float] = {}
    for side in SIDES:
        other = OTHER[side]
        with ctx.section(f"switching.{side}.dvdt", f"switching.{side}.induced_vgs"):
            if side not in sw or other not in sw:
                raise NeedsData(*ctx.missing.get(f"switching.{side if side not in sw else other}.td_on", ()))
            me = sw[side]
            cgd = ctx.need(f"switch.{side}.crss")
            # the other switch's fastest voltage fall sets the slew this switch's gate sees
            dvdt = sp.node_slew_rate(v_max, fast[other]["rise_time"])
            cgs = out(np.maximum(me["_ciss1"] - cgd, 0.0))
            n = me["_n"]
            induced = sp.induced_gate_voltage(cgd * n, cgs * n, me["hold_resistance"], dvdt, v_max)
            ctx.publish(f"switching.{side}.dvdt", dvdt)
            ctx.publish(f"switching.{side}.induced_vgs", me["v_off"] + induced)

        edge = [f"timing.{side}.{k}" for k in (
            "dead_time", "dead_time_loss", "outgoing_turn_off", "incoming_delay", "needed",
            "overlap", "outgoing_pull_only", "outgoing_seconds_per_ohm", "outgoing_r_fixed",
            "outgoing_charge")]
        with ctx.section(*edge):
            dead, loss, note = _dead_time(ctx, side)
            deads[side] = dead
            ctx.publish(f"timing.{side}.dead_time", dead, note)
            ctx.publish(f"timing.{side}.dead_time_loss", loss)
            if side not in sw or other not in sw:
                missing = ctx.missing.get(f"switching.{side}.td_on", ()) + \
                    ctx.missing.get(f"switching.{other}.td_on", ())
                raise NeedsData(*missing)
            # the incoming switch's fastest turn-on delay against the outgoing's slowest turn-off
            t_off, td_on = sw[other]["turn_off_time"], fast[side]["td_on"]
            ctx.publish(f"timing.{side}.outgoing_turn_off", t_off)
            ctx.publish(f"timing.{side}.incoming_delay", td_on)
            ctx.publish(f"timing.{side}.needed", out(np.maximum(t_off - td_on, 0.0)))
            overlap = sp.shoot_through_overlap(dead, t_off, td_on)
            ctx.publish(f"timing.{side}.overlap", overlap)
            ctx.publish(f"timing.{side}.outgoing_pull_only", sw[other]["pull_only"])
            ctx.publish(f"timing.{side}.outgoing_seconds_per_ohm", sw[other]["off_seconds_per_ohm"])
            ctx.publish(f"timing.{side}.outgoing_r_fixed", sw[other]["off_r_fixed"])
            ctx.publish(f"timing.{side}.outgoing_charge", sw[other]["off_charge"])
            pull = ctx.v(f"drive.{other}.pull_resistor")
            if sw[other]["pull_only"]:
                path = _text(_each(_pull_path, pull))
            else:
                path = "through its gate drive"
            ctx.publish(f"timing.{side}.outgoing_path", path)
            if ctx.has(f"gate.{other}.pull_voltage"):
                ctx.publish(f"timing.{side}.outgoing_pull_voltage", ctx.q(f"gate.{other}.pull_voltage"))
        with ctx.section(f"timing.{side}.shoot_through_peak"):
            r_hi = _hot_rds(ctx, "high")
            r_lo = _hot_rds(ctx, "low")
            ctx.publish(f"timing.{side}.shoot_through_peak",
                        sp.shoot_through_peak_current(v_max, r_hi, r_lo),
                        "both channels fully on at T_j,max, no loop inductance: an upper bound")

    with ctx.section("timing.dead_time_fraction"):
        # each side's dead time as above (a side whose section lacked data raises here again)
        dead = out(np.maximum(*(deads[s] if s in deads else _dead_time(ctx, s)[0] for s in SIDES)))
        ctx.publish("timing.dead_time_fraction", sp.dead_time_fraction(dead, ctx.q("op.switching_frequency")))

    kind = ctx.v("modulation.kind")
    if kind in SPWM:
        with ctx.section("timing.min_pulse", "timing.narrow_pulse_fraction"):
            m, fc = ctx.need("modulation.index", "modulation.carrier")
            given = ctx.v("modulation.min_pulse")
            given = 0.0 if given is None else given
            if not all(s in sw for s in SIDES):
                raise NeedsData(*ctx.missing.get("switching.high.td_on", ()),
                                *ctx.missing.get("switching.low.td_on", ()))
            full = out(np.maximum(*(s["turn_on_time"] + s["turn_off_time"] for s in sw.values())))
            t_min = out(np.where(np.isfinite(full), np.maximum(given, full), given))
            ctx.publish("timing.min_pulse", t_min, _note(_each(
                lambda t, g: "the controller's minimum pulse" if t == g else
                "a full turn-on and turn-off of the slower switch", t_min, given)))
            # the gate pulses of either leg, from the one switching-pattern description
            fraction = pattern.narrow_pulse_fraction(kind, m, fc, t_min)
            ctx.publish("timing.narrow_pulse_fraction", fraction,
                        "gate pulses of either leg; level-shifted legs shortest at the zero "
                        "crossing" if kind == "spwm_level_shifted"
                        else "gate pulses of either leg, shortest near the reference's peaks")


def _hot_rds(ctx: Ctx, side: str) -> float:
    """R_DS(on) of ``side``'s position at T_j,max (paralleled devices together) [Ω]."""
    sw = f"switch.{side}"
    rds = ctx.need(f"{sw}.rds_on")
    r = tp.rds_on_at(ctx.v(f"{sw}.tj_max"), rds, ctx.v(f"{sw}.rds_on_temp"),
                     ctx.v(f"{sw}.rds_hot_factor"), ctx.v(f"{sw}.rds_hot_temp"))
    return out(r) / int(ctx.v(f"{sw}.count"))
