"""Switching times by the gate-charge method, dead time, shoot-through and dv/dt turn-on.

All voltages here are magnitudes in the enhancing direction (see
:func:`reviewer.physics.gate.enhancement`): ``v_drive`` is the on-level the gate is driven to,
``v_off`` the off-level (0 for a gate pulled to its own source, negative for a negative bias),
``vth`` the threshold and ``v_plateau`` the Miller plateau. Resistances are the whole gate loop:
drive stage output + series gate resistor + internal gate resistance
(:func:`gate_loop_resistance`).

Inductive (clamped) switching has four intervals, named apart because they matter differently
(t_d are delays, the other four move current or voltage):

- turn-on:  t_d(on) = R_on · C_in · ln((V_dr − V_off)/(V_dr − V_th))   gate to threshold
            t_ri    = R_on · C_in · ln((V_dr − V_th)/(V_dr − V_pl))    current rises
            t_fv    ≈ Q_gd · R_on / (V_dr − V_pl)                      voltage falls (plateau)
- turn-off: t_d(off) = R_off · C_in · ln((V_dr − V_off)/(V_pl − V_off)) gate to plateau
            t_rv    ≈ Q_gd · R_off / (V_pl − V_off)                    voltage rises (plateau)
            t_fi    = R_off · C_in · ln((V_pl − V_off)/(V_th − V_off))  current falls

``rise_time`` is t_fv and ``fall_time`` is t_rv (the drain-voltage transitions, named for the
gate edge they belong to); ``current_fall_tail`` is t_fi. The turn-off overshoot L·di/dt belongs
to t_fi, never to t_rv. Where the part's charge data are given, C_in below the plateau is
Q_gs/V_pl and above it (Q_g − Q_gs − Q_gd)/(V_Qg − V_pl) (:func:`charge_capacitances`): C_iss
is a small-signal figure at one drain voltage.

A stage with both an output resistance and a current limit delivers min(I_lim, ΔV/R) at every
instant; :func:`stage_time` integrates that exactly (linear while the limit holds, RC after).
The current edges are also limited by the common-source inductance L_s shared by the gate loop
and the power path (:func:`current_edge_time`).

Every function accepts floats or numpy arrays and returns a float for scalar input. A
transition that never completes (drive below threshold or plateau) takes infinite time.

References
----------
N. Mohan, T. Undeland, W. Robbins, *Power Electronics: Converters, Applications and Design*,
3rd ed., Wiley, 2003, §22-4 (MOSFET switching characteristics, gate-charge intervals).
B. J. Baliga, *Fundamentals of Power Semiconductor Devices*, Springer, 2008, §6.10 (switching
with inductive load: delay, plateau, current-fall intervals).
D. G. Holmes and T. A. Lipo, *Pulse Width Modulation for Power Converters*, IEEE Press /
Wiley, 2003, §3.6 and ch. 11 (dead time, its voltage error, minimum pulse width).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np


def _a(x) -> np.ndarray:
    return np.asarray(x, dtype=float)


def _out(x):
    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def _pick(cond, a, b):
    """``np.where(cond, a, b)``; for scalar operands a plain choice between the two values.

    The same numbers either way (a choice does no arithmetic); the plain choice spares the
    scalar runs numpy's per-call cost, many times over in :func:`stage_time`."""
    if np.ndim(cond) == 0 and np.ndim(a) == 0 and np.ndim(b) == 0:
        return a if cond else b
    return np.where(cond, a, b)


def gate_loop_resistance(r_driver, r_gate, r_internal):
    """Resistance of the gate loop: drive output + series gate resistor + internal [Ω].

    Parameters
    ----------
    r_driver : output resistance of the drive stage in this direction [Ω]
    r_gate : external series gate resistor (the turn-off path one for turn-off) [Ω]
    r_internal : device internal gate resistance [Ω]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4 (series resistances in the
    gate charging path).
    """
    return _out(_a(r_driver) + _a(r_gate) + _a(r_internal))


def rc_crossing_time(r, c, v_from, v_to, v_cross):
    """Time for an RC node heading from ``v_from`` to ``v_to`` to cross ``v_cross`` [s].

    t = R·C·ln((V_to − V_from) / (V_to − V_cross)); zero when the node starts at or past
    ``v_cross``, infinite when ``v_cross`` is not short of ``v_to`` (never reached).

    Parameters
    ----------
    r : resistance [Ω]
    c : capacitance [F]
    v_from, v_to, v_cross : start, final and crossing voltages [V]

    References
    ----------
    First-order step response v(t) = V_to + (V_from − V_to)·e^(−t/RC); Horowitz & Hill,
    *The Art of Electronics*, 3rd ed., §1.4.2.
    """
    r, c, v0, v1, vx = (_a(x) for x in (r, c, v_from, v_to, v_cross))
    span = v1 - v0
    rest = v1 - vx
    with np.errstate(divide="ignore", invalid="ignore"):
        ratio = _pick(span * rest > 0, span / rest, np.nan)
        t = r * c * np.log(ratio)
    started_past = ((span != 0) & ((vx - v0) * np.sign(span) <= 0)) | (vx == v0)
    never = (~started_past) & ((rest * np.sign(span) <= 0) | (span == 0))
    t = _pick(started_past, 0.0, _pick(never, np.inf, t))
    return _out(t)


def turn_on_delay(r_on, ciss, v_drive, vth, v_off=0.0):
    """Turn-on delay t_d(on) = R_on · C_iss · ln((V_dr − V_off)/(V_dr − V_th)) [s].

    With ``v_off`` = 0 this is the textbook R_on·C_iss·ln(V_dr/(V_dr − V_th)).

    Parameters
    ----------
    r_on : gate loop resistance while turning on [Ω]
    ciss : input capacitance C_iss [F]
    v_drive : on-level magnitude [V]
    vth : threshold magnitude [V]
    v_off : off-level the gate starts from [V]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    return rc_crossing_time(r_on, ciss, v_off, v_drive, vth)


def rise_time(qgd, r_on, v_drive, v_plateau):
    """Drain-voltage fall at turn-on along the plateau, t_r ≈ Q_gd · R_on / (V_dr − V_pl) [s].

    Parameters
    ----------
    qgd : gate-drain charge [C]
    r_on : gate loop resistance while turning on [Ω]
    v_drive : on-level magnitude [V]
    v_plateau : Miller plateau [V]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    q, r, vd, vp = (_a(x) for x in (qgd, r_on, v_drive, v_plateau))
    head = vd - vp
    with np.errstate(divide="ignore"):
        return _out(_pick(head > 0, q * r / _pick(head > 0, head, 1.0), np.inf))


def turn_off_delay(r_off, ciss, v_drive, v_plateau, v_off=0.0):
    """Turn-off delay t_d(off) = R_off · C_iss · ln((V_dr − V_off)/(V_pl − V_off)) [s].

    With ``v_off`` = 0 this is the textbook R_off·C_iss·ln(V_dr/V_pl).

    Parameters
    ----------
    r_off : gate loop resistance while turning off [Ω]
    ciss : input capacitance [F]
    v_drive : on-level the gate starts from [V]
    v_plateau : Miller plateau [V]
    v_off : off-level the gate heads for [V]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    return rc_crossing_time(r_off, ciss, v_drive, v_off, v_plateau)


def fall_time(qgd, r_off, v_plateau, v_off=0.0):
    """Drain-voltage rise at turn-off along the plateau, t_f ≈ Q_gd · R_off / (V_pl − V_off) [s].

    Parameters
    ----------
    qgd : gate-drain charge [C]
    r_off : gate loop resistance while turning off [Ω]
    v_plateau : Miller plateau [V]
    v_off : off-level [V]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    q, r, vp, vo = (_a(x) for x in (qgd, r_off, v_plateau, v_off))
    head = vp - vo
    with np.errstate(divide="ignore"):
        return _out(_pick(head > 0, q * r / _pick(head > 0, head, 1.0), np.inf))


def current_fall_tail(r_off, ciss, v_plateau, vth, v_off=0.0):
    """Current fall at turn-off while the gate goes from the plateau to V_th [s].

    tail = R_off · C_iss · ln((V_pl − V_off)/(V_th − V_off)). The switch still carries current
    until its gate is below threshold, so a shoot-through check counts this tail too.

    References
    ----------
    Baliga, *Fundamentals of Power Semiconductor Devices*, 2008, §6.10 (turn-off: current
    decreases as the gate discharges from the plateau to the threshold).
    """
    return rc_crossing_time(r_off, ciss, v_plateau, v_off, vth)


def turn_on_delay_current(ciss, vth, i_source, v_off=0.0):
    """Current-limited turn-on delay, t = C_iss · (V_th − V_off) / I_source [s].

    References
    ----------
    I = dQ/dt with Q = C_iss·ΔV; Mohan, Undeland & Robbins, 3rd ed., §22-4.
    """
    c, vt, i, vo = (_a(x) for x in (ciss, vth, i_source, v_off))
    return _out(c * np.maximum(vt - vo, 0.0) / i)


def plateau_time_current(qgd, i):
    """Current-limited plateau (t_r at turn-on, t_f at turn-off), t = Q_gd / I [s].

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    return _out(_a(qgd) / _a(i))


def turn_off_delay_current(ciss, v_drive, v_plateau, i_sink):
    """Current-limited turn-off delay, t = C_iss · (V_dr − V_pl) / I_sink [s].

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4.
    """
    c, vd, vp, i = (_a(x) for x in (ciss, v_drive, v_plateau, i_sink))
    return _out(c * np.maximum(vd - vp, 0.0) / i)


def current_fall_tail_current(ciss, v_plateau, vth, i_sink):
    """Current-limited tail from the plateau to threshold, t = C_iss · (V_pl − V_th) / I [s]."""
    c, vp, vt, i = (_a(x) for x in (ciss, v_plateau, vth, i_sink))
    return _out(c * np.maximum(vp - vt, 0.0) / i)


def stage_time(c, v_from, v_to, v_cross, r=None, i_limit=None):
    """Time for a gate node of capacitance ``c`` to go from ``v_from`` to ``v_cross``, driven
    towards ``v_to`` by a stage with loop resistance ``r`` and current limit ``i_limit`` [s].

    The stage delivers i = min(I_lim, |V_to − v|/R) at every instant. While the headroom
    |V_to − v| exceeds I_lim·R the limit holds and v moves linearly (t = C·Δv/I_lim); from there
    the node is an RC, t = R·C·ln(headroom at the boundary / headroom at ``v_cross``). With
    ``r`` None the stage is a pure current source; with ``i_limit`` None a pure RC
    (:func:`rc_crossing_time`). Zero when the node starts at or past ``v_cross``; infinite when
    ``v_cross`` is never reached.

    Parameters
    ----------
    c : node capacitance (effective input capacitance of the interval) [F]
    v_from, v_to, v_cross : start, drive target and crossing voltages [V]
    r : whole gate-loop resistance, or None [Ω]
    i_limit : stage current limit, or None [A]

    References
    ----------
    Piecewise solution of C·dv/dt = min(I_lim, (V_to − v)/R): a current-limited ramp joined to
    the first-order step response (Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.4.2).
    """
    c, v0, v1, vx = (_a(x) for x in (c, v_from, v_to, v_cross))
    rr = _a(0.0 if r is None else r)
    ii = _a(np.inf if i_limit is None else i_limit)
    s = _pick(v1 >= v0, 1.0, -1.0)
    d0 = s * (v1 - v0)          # headroom at the start
    dx = s * (v1 - vx)          # headroom at the crossing
    db = ii * rr                # headroom below which the RC form holds
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        lin = np.maximum(d0 - np.maximum(dx, db), 0.0)
        t1 = _pick(lin > 0, c * lin / ii, 0.0)
        top = np.minimum(d0, db)
        t2 = _pick((dx < top) & (rr > 0), rr * c * np.log(top / _pick(dx > 0, dx, 1.0)), 0.0)
        t = t1 + t2
    t = _pick(dx >= d0, 0.0, _pick(dx <= 0, np.inf, t))
    return _out(t)


def plateau_time(q, v_head, r=None, i_limit=None):
    """Time to move charge ``q`` at a constant gate voltage with ``v_head`` across the loop [s].

    t = Q / min(I_lim, V_head/R) = Q · max(1/I_lim, R/V_head): the plateau intervals t_fv (turn-on,
    V_head = V_dr − V_pl) and t_rv (turn-off, V_head = V_pl − V_off). Infinite when the headroom
    is not positive.

    Parameters
    ----------
    q : gate-drain charge Q_gd [C]
    v_head : voltage driving the gate current along the plateau [V]
    r : whole gate-loop resistance, or None [Ω]
    i_limit : stage current limit, or None [A]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4 (constant gate current along
    the Miller plateau).
    """
    q, vh = _a(q), _a(v_head)
    rr = _a(0.0 if r is None else r)
    ii = _a(np.inf if i_limit is None else i_limit)
    with np.errstate(divide="ignore", invalid="ignore"):
        per = np.maximum(1.0 / ii, rr / _pick(vh > 0, vh, 1.0))
    return _out(_pick(vh > 0, q * per, np.inf))


def current_rise_time(r_on, ciss, v_drive, vth, v_plateau):
    """Current rise at turn-on, t_ri = R_on · C_in · ln((V_dr − V_th)/(V_dr − V_pl)) [s].

    The gate charges from the threshold to the plateau while the drain current rises to the
    load current (the drain voltage is still clamped at the bus).

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4; Baliga 2008 §6.10.
    """
    return rc_crossing_time(r_on, ciss, vth, v_drive, v_plateau)


def current_edge_time(i_switched, v_head, l_source, r_loop, ciss, gfs):
    """Current edge bounded by the common-source inductance, t = I·(L_s + R·C_in/g_fs)/V_head [s].

    The source inductance L_s shared by the gate loop and the power path feeds L_s·di/dt back
    against the gate: |di/dt| ≈ V_head/(L_s + R·C_in/g_fs), with V_head = V_pl − V_off at turn-off
    (V_dr − V_pl at turn-on). With L_s = 0 this is the linearised gate-charge interval.

    Parameters
    ----------
    i_switched : current the edge moves [A]
    v_head : gate headroom driving the edge [V]
    l_source : common-source inductance [H]
    r_loop : gate-loop resistance [Ω]
    ciss : input capacitance [F]
    gfs : forward transconductance [S]

    References
    ----------
    Source-inductance feedback on the gate during the current transition (from memory: power
    MOSFET switching analyses in Baliga, *Fundamentals of Power Semiconductor Devices*, 2008,
    §6.10, and in gate-drive application literature).
    """
    i, vh, ls, r, c, g = (_a(x) for x in (i_switched, v_head, l_source, r_loop, ciss, gfs))
    with np.errstate(divide="ignore", invalid="ignore"):
        t = np.abs(i) * (ls + r * c / g) / _pick(vh > 0, vh, 1.0)
    return _out(_pick(vh > 0, t, np.inf))


def charge_capacitances(ciss, qg=None, qgs=None, qgd=None, v_plateau=None, v_qg=None):
    """Effective input capacitance below and above the plateau from the gate-charge data [F].

    C_below = Q_gs / V_pl (charge from 0 V to the plateau); C_above = (Q_g − Q_gs − Q_gd) /
    (V_Qg − V_pl) (charge from the plateau's end to V_Qg, the V_GS at which Q_g is given).
    Either falls back to C_iss where its data are missing or give no positive figure.

    Returns
    -------
    (c_below, c_above) [F]

    References
    ----------
    Gate-charge curve Q_G(V_GS) in three segments; Mohan, Undeland & Robbins, 3rd ed., §22-4;
    Baliga 2008 §6.10.
    """
    c = _a(ciss)
    if qgs is None or v_plateau is None:
        below = c
    else:
        vp = _a(v_plateau)
        with np.errstate(divide="ignore", invalid="ignore"):
            below = np.where(vp > 0, _a(qgs) / np.where(vp > 0, vp, 1.0), c)
    if qg is None or qgs is None or qgd is None or v_qg is None or v_plateau is None:
        above = c
    else:
        q_top = _a(qg) - _a(qgs) - _a(qgd)
        dv = _a(v_qg) - _a(v_plateau)
        with np.errstate(divide="ignore", invalid="ignore"):
            above = np.where((q_top > 0) & (dv > 0), q_top / np.where(dv > 0, dv, 1.0), c)
    return _out(below), _out(above)


@dataclass(frozen=True)
class SwitchingTimes:
    """The intervals of one switch's turn-on and turn-off [s].

    ``tr`` is the voltage fall t_fv at turn-on, ``tf`` the voltage rise t_rv at turn-off,
    ``tail`` the current fall t_fi and ``t_ri`` the current rise (see the module text).
    """

    td_on: float
    tr: float
    td_off: float
    tf: float
    tail: float
    t_ri: float = 0.0

    @property
    def turn_on(self):
        """t_d(on) + t_ri + t_fv: until the drain voltage has fallen [s]."""
        return self.td_on + self.t_ri + self.tr

    @property
    def turn_off(self):
        """t_d(off) + t_rv: the drain-voltage part of turn-off [s]."""
        return self.td_off + self.tf

    @property
    def turn_off_to_cutoff(self):
        """t_d(off) + t_rv + t_fi: until the gate is below threshold [s]."""
        return self.td_off + self.tf + self.tail

    @property
    def overlap_sum(self):
        """t_ri + t_fv + t_rv + t_fi: the four intervals with voltage and current both present [s]."""
        return self.t_ri + self.tr + self.tf + self.tail


def switching_times(ciss, qgd, v_drive, vth, v_plateau, *, r_on=None, r_off=None,
                    i_source=None, i_sink=None, v_off=0.0, c_above=None) -> SwitchingTimes:
    """All intervals of a switch, resistive, current-limited or both.

    Each direction needs a loop resistance, a current limit or both; with both, each interval
    is the exact piecewise time of :func:`stage_time` / :func:`plateau_time`.

    Parameters
    ----------
    ciss : input capacitance below the plateau (C_iss, or Q_gs/V_pl) [F]
    qgd : gate-drain charge [C]
    v_drive : on-level magnitude [V]
    vth : threshold magnitude [V]
    v_plateau : Miller plateau [V]
    r_on, r_off : gate loop resistance turning on / off [Ω]
    i_source, i_sink : stage current limit turning on / off [A]
    v_off : off-level [V]
    c_above : input capacitance above the plateau [F]; None: ``ciss``

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4; Baliga 2008 §6.10.
    """
    if r_on is None and i_source is None:
        raise ValueError("turn-on needs a loop resistance or a source current")
    if r_off is None and i_sink is None:
        raise ValueError("turn-off needs a loop resistance or a sink current")
    td_on = stage_time(ciss, v_off, v_drive, vth, r_on, i_source)
    # a gate that never reaches the threshold never starts the current rise: no finite interval
    # (not the zero stage_time gives for a node already past its crossing)
    t_ri = _pick(np.isinf(_a(td_on)), np.inf,
                 stage_time(ciss, vth, v_drive, v_plateau, r_on, i_source))
    tr = plateau_time(qgd, _a(v_drive) - _a(v_plateau), r_on, i_source)
    td_off, tf, tail = turn_off_intervals(ciss, qgd, v_drive, vth, v_plateau, r_off=r_off,
                                          i_sink=i_sink, v_off=v_off, c_above=c_above)
    return SwitchingTimes(td_on, tr, td_off, tf, tail, t_ri)


def turn_off_intervals(ciss, qgd, v_drive, vth, v_plateau, *, r_off=None, i_sink=None,
                       v_off=0.0, c_above=None):
    """The three turn-off intervals (t_d(off), t_rv, t_fi) of a switch [s].

    The turn-off half of :func:`switching_times`, for a caller that needs only the turn-off
    (the turn-off at another plateau, say): the same formulas, the same numbers.

    Parameters
    ----------
    ciss : input capacitance below the plateau (C_iss, or Q_gs/V_pl) [F]
    qgd : gate-drain charge [C]
    v_drive : on-level the gate starts from [V]
    vth : threshold magnitude [V]
    v_plateau : Miller plateau [V]
    r_off : gate loop resistance turning off [Ω]
    i_sink : stage current limit turning off [A]
    v_off : off-level [V]
    c_above : input capacitance above the plateau [F]; None: ``ciss``

    Returns
    -------
    (td_off, tf, tail) [s]; their sum is :attr:`SwitchingTimes.turn_off_to_cutoff`.

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4; Baliga 2008 §6.10.
    """
    if r_off is None and i_sink is None:
        raise ValueError("turn-off needs a loop resistance or a sink current")
    c_hi = ciss if c_above is None else c_above
    td_off = stage_time(c_hi, v_drive, v_off, v_plateau, r_off, i_sink)
    tf = plateau_time(qgd, _a(v_plateau) - _a(v_off), r_off, i_sink)
    tail = stage_time(ciss, v_plateau, v_off, vth, r_off, i_sink)
    return td_off, tf, tail


def pull_resistor_turn_off(r_pull, ciss, qgd, v_drive, v_plateau, vth=None, r_internal=0.0):
    """Turn-off time when a gate-source pull resistor is the only discharge path [s].

    A transistor pulls the gate on and lets go; the resistor discharges the gate:
    R = R_pull + R_g(int); t = R·C_iss·ln(V_dr/V_pl) + Q_gd·R/V_pl, plus the tail
    R·C_iss·ln(V_pl/V_th) when ``vth`` is given. With 10 kΩ and 2 nF the time constant alone is
    20 µs, so the turn-off takes tens of microseconds.

    Parameters
    ----------
    r_pull : gate-source pull resistor [Ω]
    ciss : input capacitance [F]
    qgd : gate-drain charge [C]
    v_drive : on-level magnitude the gate starts from [V]
    v_plateau : Miller plateau [V]
    vth : threshold magnitude [V]; None leaves the tail out
    r_internal : internal gate resistance [Ω]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4, with R_off = the pull
    resistor.
    """
    r = _a(r_pull) + _a(r_internal)
    t = _a(turn_off_delay(r, ciss, v_drive, v_plateau)) + _a(fall_time(qgd, r, v_plateau))
    if vth is not None:
        t = t + _a(current_fall_tail(r, ciss, v_plateau, vth))
    return _out(t)


def dead_time_required(t_turn_off, td_on_other, margin=0.5):
    """Dead time needed so that the incoming switch starts conducting after the outgoing stops.

    t_dead ≥ (1 + margin) · (t_off − t_d(on),other), and never below zero. ``t_off`` is
    t_d(off) + t_f of the switch turning off (add the current-fall tail for a conservative
    figure: :attr:`SwitchingTimes.turn_off_to_cutoff`).

    Parameters
    ----------
    t_turn_off : turn-off time of the outgoing switch, worst (slowest) corner [s]
    td_on_other : turn-on delay of the incoming switch, worst (fastest) corner [s]
    margin : fractional margin [unitless]; +50 % is common practice

    References
    ----------
    Holmes & Lipo, *Pulse Width Modulation for Power Converters*, 2003, §3.6 (blanking time
    between complementary switches); margin: common practice.
    """
    t, d, m = _a(t_turn_off), _a(td_on_other), _a(margin)
    return _out((1.0 + m) * np.maximum(t - d, 0.0))


def effective_dead_time(t_set, delay_mismatch=0.0, delay_spread=0.0, resolution=0.0):
    """Dead time the gates actually see, t_set − mismatch − spread − resolution, never below 0 [s].

    The controller's edge reaches the two gates through two driver channels: a channel that is
    faster by the propagation-delay mismatch (and any further spread between the paths) takes
    that much from the dead time at one of the two edges; a controller that sets the dead time
    in steps may make it one step short.

    Parameters
    ----------
    t_set : dead time programmed [s]
    delay_mismatch : driver high/low propagation-delay mismatch (magnitude) [s]
    delay_spread : further delay spread between the two paths (magnitude) [s]
    resolution : the controller's dead-time step [s]

    References
    ----------
    Holmes & Lipo, 2003, §3.6 (the blanking interval as the gates see it); delay budget: common
    practice.
    """
    t = _a(t_set) - _a(delay_mismatch) - _a(delay_spread) - _a(resolution)
    return _out(np.maximum(t, 0.0))


def shoot_through_overlap(t_dead, t_turn_off, td_on_other):
    """Time both switches of a leg conduct at once, max(0, t_off − t_dead − t_d(on),other) [s].

    Parameters
    ----------
    t_dead : dead time programmed before the incoming switch's gate is driven [s]
    t_turn_off : turn-off time of the outgoing switch [s]
    td_on_other : turn-on delay of the incoming switch [s]

    References
    ----------
    Holmes & Lipo, 2003, §3.6: the incoming switch conducts from t_dead + t_d(on); the outgoing
    one until t_off.
    """
    return _out(np.maximum(_a(t_turn_off) - _a(t_dead) - _a(td_on_other), 0.0))


def shoot_through_peak_current(v_bus, r_on_high, r_on_low, r_extra=0.0):
    """Upper bound of the cross-conduction current, V_bus / (R_high + R_low + R_extra) [A].

    Both channels fully on and no loop inductance: the real peak is lower (one switch is in
    its linear region, inductance slows the rise), so this bounds it from above.

    References
    ----------
    Ohm's law across the two channels in series; Holmes & Lipo, 2003, §3.6.
    """
    return _out(_a(v_bus) / (_a(r_on_high) + _a(r_on_low) + _a(r_extra)))


def _allowed_turn_off(t_dead, td_on_other, margin):
    return _a(t_dead) / (1.0 + _a(margin)) + _a(td_on_other)


def turn_off_seconds_per_ohm(ciss, qgd, v_drive, v_plateau, vth=None, v_off=0.0):
    """Turn-off time per ohm of gate loop resistance (the RC forms are linear in R) [s/Ω].

    k = C_iss·ln((V_dr − V_off)/(V_pl − V_off)) + Q_gd/(V_pl − V_off)
    [+ C_iss·ln((V_pl − V_off)/(V_th − V_off)) with ``vth``].
    """
    k = _a(turn_off_delay(1.0, ciss, v_drive, v_plateau, v_off)) + _a(fall_time(qgd, 1.0, v_plateau, v_off))
    if vth is not None:
        k = k + _a(current_fall_tail(1.0, ciss, v_plateau, vth, v_off))
    return _out(k)


def largest_turn_off_resistance(t_dead, td_on_other, ciss, qgd, v_drive, v_plateau, vth=None,
                                v_off=0.0, margin=0.5):
    """Largest gate-loop resistance whose turn-off fits the dead time [Ω].

    Solves (1 + m)·(R·k − t_d(on),other) = t_dead for R, with k from
    :func:`turn_off_seconds_per_ohm`. Subtract the internal gate resistance (and the drive's
    output resistance) to get the largest pull resistor or series gate resistor.

    Parameters
    ----------
    t_dead : dead time available [s]
    td_on_other : turn-on delay of the incoming switch [s]
    ciss, qgd : outgoing switch's input capacitance [F] and gate-drain charge [C]
    v_drive, v_plateau, vth, v_off : gate levels of the outgoing switch [V]
    margin : fractional margin [unitless]

    References
    ----------
    Inversion of :func:`dead_time_required` with the RC forms of Mohan, Undeland & Robbins,
    3rd ed., §22-4.
    """
    k = _a(turn_off_seconds_per_ohm(ciss, qgd, v_drive, v_plateau, vth, v_off))
    return _out(_allowed_turn_off(t_dead, td_on_other, margin) / k)


def smallest_sink_current(t_dead, td_on_other, ciss, qgd, v_drive, v_plateau, vth=None,
                          margin=0.5):
    """Smallest current-limited sink current whose turn-off fits the dead time [A].

    Q_off = C_iss·(V_dr − V_pl) + Q_gd [+ C_iss·(V_pl − V_th)]; I = Q_off / t_allowed with
    t_allowed = t_dead/(1 + m) + t_d(on),other.

    References
    ----------
    Inversion of :func:`dead_time_required` with the Q/I forms of Mohan, Undeland & Robbins,
    3rd ed., §22-4.
    """
    c, vd, vp = _a(ciss), _a(v_drive), _a(v_plateau)
    q = c * np.maximum(vd - vp, 0.0) + _a(qgd)
    if vth is not None:
        q = q + c * np.maximum(vp - _a(vth), 0.0)
    return _out(q / _allowed_turn_off(t_dead, td_on_other, margin))


def node_slew_rate(v_bus, t_transition):
    """Switching-node slew rate dv/dt ≈ V_bus / t_transition [V/s].

    References
    ----------
    Linear-ramp approximation of the plateau interval; Mohan, Undeland & Robbins §22-4.
    """
    return _out(_a(v_bus) / _a(t_transition))


def induced_gate_voltage(cgd, cgs, r_hold, dvdt, v_bus):
    """Gate voltage a drain ramp couples onto an off switch through C_gd [V].

    A ramp of slope dv/dt lasting V_bus/(dv/dt) drives C_gd into R_hold ∥ (C_gs + C_gd); at the
    end of the ramp the gate stands at
    V = R·C_gd·dv/dt · (1 − exp(−V_bus / (dv/dt · R · (C_gs + C_gd)))).
    It tends to C_gd·dv/dt·R for a stiff hold and to C_gd/(C_gd + C_gs)·V_bus for a weak one;
    :func:`induced_gate_voltage_bound` is the smaller of those two, an upper envelope.
    C_gd grows steeply at low V_DS; using the datasheet C_rss underestimates early in the ramp.

    Parameters
    ----------
    cgd : gate-drain capacitance, ≈ C_rss [F]
    cgs : gate-source capacitance, ≈ C_iss − C_rss [F]
    r_hold : resistance holding the gate to its off level [Ω]
    dvdt : drain slew rate [V/s]
    v_bus : amplitude of the ramp [V]

    References
    ----------
    First-order response of an RC node to a ramp through a coupling capacitor (Horowitz & Hill,
    3rd ed., §1.4); Mohan, Undeland & Robbins §22-4 (dv/dt-induced turn-on).
    """
    cd, cs, r, s, v = (_a(x) for x in (cgd, cgs, r_hold, dvdt, v_bus))
    tau = r * (cs + cd)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        x = np.where(tau > 0, v / (s * tau), np.inf)
        out = r * cd * s * -np.expm1(-x)
        out = np.where(np.isinf(r), cd / (cd + cs) * v, out)
    return _out(out)


def induced_gate_voltage_bound(cgd, cgs, r_hold, dvdt, v_bus):
    """min(C_gd·dv/dt·R_hold, C_gd/(C_gd + C_gs)·V_bus): the envelope of the induced gate voltage [V].

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §22-4; capacitive divider bound.
    """
    cd, cs, r, s, v = (_a(x) for x in (cgd, cgs, r_hold, dvdt, v_bus))
    return _out(np.minimum(cd * s * r, cd / (cd + cs) * v))


def dead_time_fraction(t_dead, f_sw):
    """2 · t_dead · f_sw: share of time a leg spends in dead time [unitless].

    The same figure is (a) the share of the time a body diode carries the load current while
    the current keeps one direction (both dead intervals of a period hand the current to the
    same diode), and (b) the full-bridge output voltage error as a fraction of the bus (each of
    the two legs loses t_dead per period).

    References
    ----------
    Holmes & Lipo, *Pulse Width Modulation for Power Converters*, 2003, §3.6 (dead-time
    voltage error ΔV = t_d·f_sw·V_dc per leg, its sign set by the current).
    """
    return _out(2.0 * _a(t_dead) * _a(f_sw))


def narrow_pulse_fraction_leg(index, f_carrier, t_min):
    """Share of the output cycle where a sine-PWM leg asks for a pulse shorter than ``t_min``.

    A leg's duty is d = (1 + M·sin θ)/2; its on-time d/f_c or off-time (1 − d)/f_c is shorter
    than t_min where sin θ < y or sin θ > −y with y = (2·t_min·f_c − 1)/M. The fraction of θ
    with sin θ < y is 1/2 + arcsin(y)/π (clipped to [0, 1]); on and off together give twice
    that while t_min < half a carrier period. For a leg these narrow pulses fall near the
    peaks of the reference (duty near 0 or 1), not at the zero crossing.

    Parameters
    ----------
    index : modulation index M [unitless]
    f_carrier : carrier frequency [Hz]
    t_min : shortest pulse the controller or switch can make [s]

    References
    ----------
    Holmes & Lipo, 2003, §3.2 and ch. 11 (minimum pulse width, pulse dropping).
    """
    m, fc, tm = _a(index), _a(f_carrier), _a(t_min)
    with np.errstate(divide="ignore", invalid="ignore"):
        y = np.where(m > 0, (2.0 * tm * fc - 1.0) / np.where(m > 0, m, 1.0),
                     np.where(2.0 * tm * fc >= 1.0, np.inf, -np.inf))
    one = 0.5 + np.arcsin(np.clip(y, -1.0, 1.0)) / np.pi
    return _out(np.clip(2.0 * one, 0.0, 1.0))


def narrow_pulse_fraction_unipolar(index, f_carrier, t_min):
    """Share of the output cycle where three-level (unipolar) sine PWM asks for an output pulse
    shorter than ``t_min``.

    The two legs' duties are (1 ± M·sin θ)/2; the bridge output pulse in each half carrier
    period lasts M·|sin θ|/(2·f_c), which vanishes at the zero crossing. It is shorter than
    t_min where |sin θ| < x = 2·t_min·f_c/M: a fraction (2/π)·arcsin(x) of the cycle (1 when
    x ≥ 1).

    Parameters
    ----------
    index : modulation index M [unitless]
    f_carrier : carrier frequency [Hz]
    t_min : shortest pulse the controller or switch can make [s]

    References
    ----------
    Holmes & Lipo, 2003, §3.3 (single-phase three-level modulation) and ch. 11.
    """
    m, fc, tm = _a(index), _a(f_carrier), _a(t_min)
    with np.errstate(divide="ignore", invalid="ignore"):
        x = np.where(m > 0, 2.0 * tm * fc / np.where(m > 0, m, 1.0), np.inf)
    return _out(np.where(x >= 1.0, 1.0, 2.0 / np.pi * np.arcsin(np.clip(x, 0.0, 1.0))))
