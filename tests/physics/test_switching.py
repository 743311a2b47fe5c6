"""Switching times, dead time, shoot-through, dv/dt turn-on and minimum pulses.

Hand calculations follow the gate-charge method of Mohan, Undeland & Robbins, Power
Electronics, 3rd ed., §22-4; the RC and current-limited gate charging is also integrated with
scipy.integrate.solve_ivp; dead-time and pulse-width relations follow Holmes & Lipo, Pulse
Width Modulation for Power Converters (2003), and are checked against a time-domain carrier
comparison built with numpy.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from reviewer.physics import switching as sw

CISS, QGD = 2e-9, 10e-9      # illustrative gate: 2 nF input capacitance, 10 nC Miller charge
VDR, VTH, VPL = 12.0, 3.0, 5.0


def test_rc_crossing_time_against_the_step_response():
    # v(t) = V_to + (V_from − V_to)·e^(−t/RC) must equal V_cross at the returned time.
    for v0, v1, vx in [(0.0, 12.0, 3.0), (12.0, 0.0, 5.0), (12.0, -5.0, 0.0)]:
        t = sw.rc_crossing_time(100.0, 1e-9, v0, v1, vx)
        assert v1 + (v0 - v1) * math.exp(-t / 100e-9) == pytest.approx(vx)
    # Starting at the crossing: no time; never reached: infinite.
    assert sw.rc_crossing_time(100.0, 1e-9, 3.0, 12.0, 3.0) == 0.0
    assert sw.rc_crossing_time(100.0, 1e-9, 0.0, 12.0, 12.0) == math.inf
    assert sw.rc_crossing_time(100.0, 1e-9, 0.0, 2.0, 3.0) == math.inf


def test_gate_charge_method_by_hand():
    # R_on = R_off = 2 Ω driver + 5 Ω series + 3 Ω internal = 10 Ω; R·C_iss = 20 ns.
    r = sw.gate_loop_resistance(2.0, 5.0, 3.0)
    assert r == 10.0
    # t_d(on) = 20 ns · ln(12/(12 − 3)) = 20 ns · 0.287682 = 5.7536 ns
    assert sw.turn_on_delay(r, CISS, VDR, VTH) == pytest.approx(20e-9 * math.log(12 / 9))
    assert sw.turn_on_delay(r, CISS, VDR, VTH) == pytest.approx(5.7536e-9, rel=1e-4)
    # t_r = Q_gd·R/(V_dr − V_pl) = 10 nC · 10 Ω / 7 V = 14.286 ns
    assert sw.rise_time(QGD, r, VDR, VPL) == pytest.approx(14.2857e-9, rel=1e-4)
    # t_d(off) = 20 ns · ln(12/5) = 20 ns · 0.875469 = 17.509 ns
    assert sw.turn_off_delay(r, CISS, VDR, VPL) == pytest.approx(17.5094e-9, rel=1e-4)
    # t_f = Q_gd·R/V_pl = 10 nC · 10 Ω / 5 V = 20 ns
    assert sw.fall_time(QGD, r, VPL) == pytest.approx(20e-9)
    # tail = 20 ns · ln(5/3) = 10.217 ns
    assert sw.current_fall_tail(r, CISS, VPL, VTH) == pytest.approx(10.2165e-9, rel=1e-4)
    # Negative off bias −5 V: t_d(on) = 20 ns · ln(17/9), t_f = 10 nC·10 Ω/10 V = 10 ns.
    assert sw.turn_on_delay(r, CISS, VDR, VTH, v_off=-5.0) == pytest.approx(20e-9 * math.log(17 / 9))
    assert sw.fall_time(QGD, r, VPL, v_off=-5.0) == pytest.approx(10e-9)


def test_drive_below_plateau_never_completes():
    assert sw.rise_time(QGD, 10.0, 4.0, VPL) == math.inf
    assert sw.turn_on_delay(10.0, CISS, 2.5, VTH) == math.inf


@pytest.mark.parametrize("v_drive", [2.5, VTH])
def test_drive_at_or_below_threshold_never_starts_the_current_rise(v_drive):
    # the gate never reaches V_th, so the drain current never starts to rise: every turn-on
    # interval is unbounded, the current rise included (not the zero of a node "already past"
    # the plateau, which an inductance would turn into an infinite di/dt)
    t = sw.switching_times(CISS, QGD, v_drive, VTH, VPL, r_on=10.0, r_off=10.0)
    assert t.td_on == math.inf and t.t_ri == math.inf and t.tr == math.inf
    # arrays: the same per element, the point that does reach the threshold unchanged
    a = sw.switching_times(CISS, QGD, np.array([v_drive, VDR]), VTH, VPL, r_on=10.0, r_off=10.0)
    assert a.t_ri[0] == math.inf
    assert a.t_ri[1] == pytest.approx(sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=10.0,
                                                         r_off=10.0).t_ri, rel=1e-12)


def test_turn_on_delay_against_ode():
    # C dv/dt = (V_dr − v)/R integrated by scipy; event at v = V_th.
    r = 10.0

    def f(t, v):
        return [(VDR - v[0]) / (r * CISS)]

    ev = lambda t, v: v[0] - VTH  # noqa: E731
    ev.terminal = True
    sol = solve_ivp(f, (0, 1e-6), [0.0], events=ev, rtol=1e-10, atol=1e-12)
    assert sw.turn_on_delay(r, CISS, VDR, VTH) == pytest.approx(sol.t_events[0][0], rel=1e-6)


def test_current_limited_forms_by_hand():
    # t = Q/I: C_iss·V_th/I = 2 nF·3 V/0.5 A = 12 ns; Q_gd/I = 10 nC/0.5 A = 20 ns;
    # C_iss·(V_dr − V_pl)/I = 2 nF·7 V/0.5 A = 28 ns; tail 2 nF·2 V/0.5 A = 8 ns.
    assert sw.turn_on_delay_current(CISS, VTH, 0.5) == pytest.approx(12e-9)
    assert sw.plateau_time_current(QGD, 0.5) == pytest.approx(20e-9)
    assert sw.turn_off_delay_current(CISS, VDR, VPL, 0.5) == pytest.approx(28e-9)
    assert sw.current_fall_tail_current(CISS, VPL, VTH, 0.5) == pytest.approx(8e-9)


def test_stage_with_resistance_and_current_limit_is_exact_piecewise():
    t = sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=10.0, r_off=10.0,
                           i_source=0.1, i_sink=2.0)
    # Turn-on: 0.1 A · 10 Ω = 1 V < 12 V − 3 V headroom: the limit holds all the way to V_th:
    # 2 nF·3 V/0.1 A = 60 ns; plateau Q_gd/min(0.1 A, 7 V/10 Ω) = 10 nC/0.1 A = 100 ns.
    assert t.td_on == pytest.approx(60e-9)
    assert t.tr == pytest.approx(100e-9)
    # Turn-off: 2 A · 10 Ω = 20 V > 12 V: never current-limited, the pure RC forms hold.
    assert t.td_off == pytest.approx(17.5094e-9, rel=1e-4)
    assert t.tf == pytest.approx(20e-9)
    assert t.turn_off == pytest.approx(t.td_off + t.tf)
    assert t.turn_off_to_cutoff == pytest.approx(t.td_off + t.tf + t.tail)
    with pytest.raises(ValueError):
        sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=10.0)


def test_stage_time_matches_solve_ivp_where_the_limit_lets_go():
    # True charging current min(I_lim, (V − v)/R): linear until V − v = I·R = 7.5 V (v = 4.5 V),
    # RC after. Crossing 3 V (all linear) and 8 V (linear then RC).
    r, i_lim = 50.0, 0.15

    def f(t, v):
        return [min(i_lim, (VDR - v[0]) / r) / CISS]

    for vx in (VTH, 8.0):
        ev = lambda t, v, vx=vx: v[0] - vx  # noqa: E731
        ev.terminal = True
        sol = solve_ivp(f, (0, 1e-5), [0.0], events=ev, rtol=1e-10, atol=1e-12, max_step=1e-10)
        assert sw.stage_time(CISS, 0.0, VDR, vx, r, i_lim) == pytest.approx(sol.t_events[0][0], rel=1e-3)
    # by hand: 2 nF · 4.5 V / 0.15 A = 60 ns, then 100 ns · ln(7.5/4) = 62.86 ns
    assert sw.stage_time(CISS, 0.0, VDR, 8.0, r, i_lim) == pytest.approx(60e-9 + 100e-9 * math.log(7.5 / 4), rel=1e-9)
    # array input, one element per corner
    out = sw.stage_time(CISS, 0.0, VDR, np.array([VTH, 8.0, 12.0]), r, i_lim)
    assert out.shape == (3,) and out[2] == math.inf


def test_pull_resistor_turn_off_takes_tens_of_microseconds():
    # 10 kΩ × 2 nF = 20 µs. t_d(off) = 20 µs·ln(12/5) = 17.51 µs; t_f = 10 nC·10 kΩ/5 V = 20 µs.
    t = sw.pull_resistor_turn_off(10e3, CISS, QGD, VDR, VPL)
    assert t == pytest.approx(17.5094e-6 + 20e-6, rel=1e-4)
    assert 10e-6 < t < 100e-6
    # With the tail to V_th: + 20 µs·ln(5/3) = 10.22 µs.
    t2 = sw.pull_resistor_turn_off(10e3, CISS, QGD, VDR, VPL, vth=VTH)
    assert t2 == pytest.approx(t + 10.2165e-6, rel=1e-4)


def test_dead_time_and_shoot_through_by_hand():
    t_off = sw.pull_resistor_turn_off(10e3, CISS, QGD, VDR, VPL)    # 37.509 µs
    td_on = sw.turn_on_delay(10.0, CISS, VDR, VTH)                  # 5.754 ns
    # Needed: 1.5·(37.509 µs − 5.754 ns) = 56.255 µs (margin +50 %: common practice).
    assert sw.dead_time_required(t_off, td_on, 0.5) == pytest.approx(1.5 * (t_off - td_on))
    # Zero dead time: both conduct for 37.509 µs − 5.754 ns.
    assert sw.shoot_through_overlap(0.0, t_off, td_on) == pytest.approx(t_off - td_on)
    # Threshold: dead time exactly t_off − t_d(on): no overlap; 1 ns less: 1 ns of overlap.
    assert sw.shoot_through_overlap(t_off - td_on, t_off, td_on) == pytest.approx(0.0, abs=1e-18)
    assert sw.shoot_through_overlap(t_off - td_on - 1e-9, t_off, td_on) == pytest.approx(1e-9, rel=1e-3)
    # A fast incoming delay longer than the turn-off: nothing needed.
    assert sw.dead_time_required(10e-9, 20e-9) == 0.0
    # Upper bound of the cross-conduction current: 24 V/(10 mΩ + 15 mΩ) = 960 A.
    assert sw.shoot_through_peak_current(24.0, 0.010, 0.015) == pytest.approx(960.0)


def test_solve_for_the_turn_off_path_that_fits_the_dead_time():
    t_dead, td_on = 500e-9, 20e-9
    # Allowed turn-off: 500 ns/1.5 + 20 ns = 353.33 ns.
    # k = C_iss·ln(12/5) + Q_gd/5 = 2 nF·0.875469 + 2 nF = 3.75094 ns/Ω → R = 94.20 Ω.
    r = sw.largest_turn_off_resistance(t_dead, td_on, CISS, QGD, VDR, VPL)
    assert r == pytest.approx((500e-9 / 1.5 + 20e-9) / (2e-9 * math.log(12 / 5) + 2e-9))
    assert r == pytest.approx(94.197, rel=1e-4)
    t_off = sw.turn_off_delay(r, CISS, VDR, VPL) + sw.fall_time(QGD, r, VPL)
    assert sw.dead_time_required(t_off, td_on) == pytest.approx(t_dead)
    # Sink current: Q_off = 2 nF·7 V + 10 nC = 24 nC; 24 nC / 353.33 ns = 67.92 mA.
    i = sw.smallest_sink_current(t_dead, td_on, CISS, QGD, VDR, VPL)
    assert i == pytest.approx(24e-9 / (500e-9 / 1.5 + 20e-9))
    t_off_i = sw.turn_off_delay_current(CISS, VDR, VPL, i) + sw.plateau_time_current(QGD, i)
    assert sw.dead_time_required(t_off_i, td_on) == pytest.approx(t_dead)
    # With the tail counted the answers tighten, and still round-trip.
    r2 = sw.largest_turn_off_resistance(t_dead, td_on, CISS, QGD, VDR, VPL, vth=VTH)
    t2 = sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=10.0, r_off=r2).turn_off_to_cutoff
    assert r2 < r and sw.dead_time_required(t2, td_on) == pytest.approx(t_dead)


def test_dvdt_induced_gate_voltage_against_ode():
    cgd, cgs, vbus = 100e-12, 1.9e-9, 24.0
    dvdt = sw.node_slew_rate(vbus, 20e-9)                   # 24 V / 20 ns = 1.2 V/ns
    assert dvdt == pytest.approx(1.2e9)
    for r in (1.0, 10.0, 100.0, 10e3):
        # (C_gs + C_gd)·dv_g/dt = C_gd·dv/dt − v_g/R over the ramp V_bus/(dv/dt).
        sol = solve_ivp(lambda t, v: [(cgd * dvdt - v[0] / r) / (cgs + cgd)],
                        (0, vbus / dvdt), [0.0], rtol=1e-10, atol=1e-14)
        v = sw.induced_gate_voltage(cgd, cgs, r, dvdt, vbus)
        assert v == pytest.approx(sol.y[0][-1], rel=1e-6)
        assert v <= sw.induced_gate_voltage_bound(cgd, cgs, r, dvdt, vbus) * (1 + 1e-12)
    # Stiff hold: C_gd·dv/dt·R = 100 pF · 1.2 V/ns · 1 Ω = 0.12 V, nearly reached.
    assert sw.induced_gate_voltage(cgd, cgs, 1.0, dvdt, vbus) == pytest.approx(0.12, rel=1e-3)
    # Open gate: capacitive divider C_gd/(C_gd + C_gs)·V_bus = 0.1/2.0·24 = 1.2 V.
    assert sw.induced_gate_voltage(cgd, cgs, math.inf, dvdt, vbus) == pytest.approx(1.2)
    assert sw.induced_gate_voltage_bound(cgd, cgs, 1e9, dvdt, vbus) == pytest.approx(1.2)


def test_dead_time_fraction():
    # 2·t_dead·f_sw = 2 · 500 ns · 20 kHz = 2 % (Holmes & Lipo §3.6).
    assert sw.dead_time_fraction(500e-9, 20e3) == pytest.approx(0.02)


def _spwm_cycle(m, fc, f0, n_per_carrier=2000):
    t = np.arange(int(fc / f0) * n_per_carrier) / (fc * n_per_carrier)
    phase = (t * fc) % 1.0
    carrier = 4 * np.abs(phase - 0.5) - 1          # triangle, −1..1
    ref = m * np.sin(2 * np.pi * f0 * t)
    return t, carrier, ref


def _runs(x):
    """(start index, length) of runs of True in x."""
    d = np.diff(np.concatenate(([0], x.astype(int), [0])))
    starts, ends = np.flatnonzero(d == 1), np.flatnonzero(d == -1)
    return starts, ends - starts


def test_unipolar_output_pulse_width_against_carrier_comparison():
    m, fc, f0 = 0.9, 20e3, 50.0
    t, carrier, ref = _spwm_cycle(m, fc, f0)
    dt = t[1] - t[0]
    a = ref > carrier
    b = -ref > carrier
    pos = a & ~b
    starts, lengths = _runs(pos)
    centres = (starts + lengths / 2) * dt
    width = lengths * dt
    expected = m * np.abs(np.sin(2 * np.pi * f0 * centres)) / (2 * fc)
    keep = width > 20 * dt
    np.testing.assert_allclose(width[keep], expected[keep], atol=3 * dt)


def test_narrow_pulse_fractions_against_sampling():
    theta = np.linspace(0, 2 * np.pi, 2_000_001)[:-1]
    # Unipolar: output pulse M·|sin θ|/(2 f_c) below 1 µs at M = 0.9, 20 kHz:
    # x = 2·1 µs·20 kHz/0.9 = 0.0444, fraction (2/π)·asin(0.0444) = 2.83 %.
    m, fc, tmin = 0.9, 20e3, 1e-6
    frac = sw.narrow_pulse_fraction_unipolar(m, fc, tmin)
    assert frac == pytest.approx(2 / np.pi * np.arcsin(2 * tmin * fc / m))
    assert frac == pytest.approx(np.mean(m * np.abs(np.sin(theta)) / (2 * fc) < tmin), abs=1e-5)
    # Leg pulses: on-time (1 + M sin θ)/(2 f_c) or off-time below 2 µs at M = 0.95.
    m, tmin = 0.95, 2e-6
    d = (1 + m * np.sin(theta)) / 2
    sampled = np.mean((d / fc < tmin) | ((1 - d) / fc < tmin))
    assert sw.narrow_pulse_fraction_leg(m, fc, tmin) == pytest.approx(sampled, abs=1e-5)


def test_narrow_pulse_thresholds():
    fc, m = 20e3, 0.9
    # Leg: shortest demanded pulse is (1 − M)/(2 f_c) = 2.5 µs; at exactly that, nothing is cut.
    assert sw.narrow_pulse_fraction_leg(m, fc, (1 - m) / (2 * fc)) == pytest.approx(0.0, abs=1e-12)
    assert sw.narrow_pulse_fraction_leg(m, fc, 1.01 * (1 - m) / (2 * fc)) > 0.0
    # Unipolar: the widest output pulse is M/(2 f_c) = 22.5 µs; a minimum that long cuts them all.
    assert sw.narrow_pulse_fraction_unipolar(m, fc, m / (2 * fc)) == 1.0
    assert sw.narrow_pulse_fraction_unipolar(m, fc, 0.0) == 0.0


# ------------------------------------------------------------- the four inductive intervals

def _gate_network(c_lo, c_hi, qgd, v_off, v_pl, v_dr, r, i_lim, turn_on):
    """Integrate the gate charge q of the textbook gate model with scipy: below the plateau
    v = V_off + q/C_lo, along it v = V_pl while Q_gd moves, above it v = V_pl + (q − q_b)/C_hi;
    the stage delivers min(I_lim, ΔV/R). Returns the times at which the gate reaches V_th and
    the plateau's two ends (turn-on) or the plateau's two ends and V_th (turn-off)."""
    q_a = c_lo * (v_pl - v_off)
    q_b = q_a + qgd
    q_top = q_b + c_hi * (v_dr - v_pl)

    def v_of(q):
        if q < q_a:
            return v_off + q / c_lo
        if q < q_b:
            return v_pl
        return v_pl + (q - q_b) / c_hi

    def f(t, y):
        v = v_of(y[0])
        i = (v_dr - v) / r if turn_on else (v - v_off) / r
        return [(1 if turn_on else -1) * min(i_lim, i)]

    def at(level, last=False):
        e = lambda t, y: y[0] - level  # noqa: E731
        e.terminal = last
        return e

    q_th = c_lo * (VTH - v_off)
    marks = [q_th, q_a, q_b] if turn_on else [q_b, q_a, q_th]
    y0 = 0.0 if turn_on else q_top
    sol = solve_ivp(f, (0, 2e-6), [y0], events=[at(m, k == 2) for k, m in enumerate(marks)],
                    rtol=1e-10, atol=1e-15, max_step=1e-10)
    return [ev[0] for ev in sol.t_events]


@pytest.mark.parametrize("r, i_lim, v_off", [(10.0, math.inf, 0.0), (10.0, 0.4, 0.0),
                                             (25.0, 0.3, -4.0), (4.0, 1.0, 0.0)])
def test_four_intervals_against_solve_ivp_on_the_gate_network(r, i_lim, v_off):
    # Gate RC network with a constant plateau, C_iss 2 nF below and 3 nF above the plateau
    # (charge-data form), Q_gd 10 nC, V_th 3 V, V_pl 5 V, 0/−4 → 12 V: each interval within 1 %.
    c_hi = 3e-9
    lim = None if math.isinf(i_lim) else i_lim
    t = sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=r, r_off=r, i_source=lim, i_sink=lim,
                           v_off=v_off, c_above=c_hi)
    on = _gate_network(CISS, c_hi, QGD, v_off, VPL, VDR, r, i_lim, True)
    off = _gate_network(CISS, c_hi, QGD, v_off, VPL, VDR, r, i_lim, False)
    assert t.td_on == pytest.approx(on[0], rel=0.01)
    assert t.t_ri == pytest.approx(on[1] - on[0], rel=0.01)
    assert t.tr == pytest.approx(on[2] - on[1], rel=0.01)          # t_fv
    assert t.td_off == pytest.approx(off[0], rel=0.01)
    assert t.tf == pytest.approx(off[1] - off[0], rel=0.01)        # t_rv
    assert t.tail == pytest.approx(off[2] - off[1], rel=0.01)      # t_fi


def test_four_intervals_by_the_textbook_formulas():
    # The inductive-switching sequence of Mohan, Undeland & Robbins, Power Electronics, 3rd ed.,
    # Wiley 2003, ch. 22 (MOSFET switching characteristics; section number from memory; the
    # same four-interval analysis is in Rashid (ed.), Power Electronics Handbook, ch. 6 "The
    # Power MOSFET", equivalent circuits t0..t4, from memory). No printed worked example was at
    # hand to copy numbers from, so the figures below are a hand calculation with the book's
    # interval formulas for R_G = 10 Ω, C_iss = 2 nF, Q_gd = 10 nC, V_GG = 12 V, V_th = 3 V,
    # V_pl = 5 V:
    #   t_d(on) = 20 ns · ln(12/9)  = 5.7536 ns     t_ri = 20 ns · ln(9/7) = 5.0263 ns
    #   t_fv    = 10 nC·10 Ω / 7 V  = 14.286 ns     t_d(off) = 20 ns · ln(12/5) = 17.509 ns
    #   t_rv    = 10 nC·10 Ω / 5 V  = 20 ns         t_fi = 20 ns · ln(5/3) = 10.217 ns
    t = sw.switching_times(CISS, QGD, VDR, VTH, VPL, r_on=10.0, r_off=10.0)
    got = (t.td_on, t.t_ri, t.tr, t.td_off, t.tf, t.tail)
    want = (5.7536e-9, 5.0263e-9, 14.286e-9, 17.509e-9, 20e-9, 10.217e-9)
    for g, w in zip(got, want):
        assert g == pytest.approx(w, rel=1e-4)
    assert sw.current_rise_time(10.0, CISS, VDR, VTH, VPL) == pytest.approx(5.0263e-9, rel=1e-4)
    # the switching-loss overlap is the sum of the four voltage-and-current intervals
    assert t.overlap_sum == pytest.approx(5.0263e-9 + 14.286e-9 + 20e-9 + 10.217e-9, rel=1e-4)


def test_current_edge_bounded_by_common_source_inductance():
    # |di/dt| = V_head/(L_s + R·C/g_fs): 10 A, 2 V head, 5 nH, 10 Ω, 2 nF, 50 S:
    # t = 10 A·(5 nH + 0.4 nH)/2 V = 27 ns (hand calculation)
    assert sw.current_edge_time(10.0, 2.0, 5e-9, 10.0, CISS, 50.0) == pytest.approx(27e-9)
    # L_s = 0: the linearised gate-charge t_fi, R·C·(V_pl − V_th)/(V_pl − V_off), here with
    # I = g_fs·(V_pl − V_th) = 50 S · 2 V = 100 A: 20 ns · 2/5 = 8 ns, close to 20 ns·ln(5/3)
    assert sw.current_edge_time(100.0, 5.0, 0.0, 10.0, CISS, 50.0) == pytest.approx(8e-9)
    assert sw.current_edge_time(10.0, 0.0, 5e-9, 10.0, CISS, 50.0) == math.inf


def test_charge_capacitances():
    # Q_gs 12 nC to a 4 V plateau: 3 nF below; (40 − 12 − 10) nC over 10 − 4 V: 3 nF above
    lo, hi = sw.charge_capacitances(2.5e-9, 40e-9, 12e-9, 10e-9, 4.0, 10.0)
    assert lo == pytest.approx(3e-9) and hi == pytest.approx(3e-9)
    # missing data: C_iss both ways
    assert sw.charge_capacitances(2.5e-9) == (2.5e-9, 2.5e-9)


def test_effective_dead_time_budget():
    # 500 ns − 20 ns − 15 ns − 10 ns = 455 ns; never below zero; arrays element by element
    assert sw.effective_dead_time(500e-9, 20e-9, 15e-9, 10e-9) == pytest.approx(455e-9)
    assert sw.effective_dead_time(20e-9, 30e-9) == 0.0
    np.testing.assert_allclose(sw.effective_dead_time(np.array([100e-9, 5e-9]), 10e-9), [90e-9, 0.0])


def test_new_physics_accepts_arrays_element_by_element():
    # one element per corner: each array result equals the scalar results
    from reviewer.physics import bootstrap as bs
    from reviewer.physics import gate as gp
    from reviewer.physics import grounding as gr
    from reviewer.physics import thermal as th
    r = np.array([5.0, 10.0, 20.0])
    cases = [
        (lambda x: sw.plateau_time(QGD, 7.0, x, 0.5), r),
        (lambda x: sw.current_edge_time(10.0, 2.0, 5e-9, x, CISS, 50.0), r),
        (lambda x: sw.current_rise_time(x, CISS, VDR, VTH, VPL), r),
        (lambda x: sw.charge_capacitances(CISS, 40e-9, 12e-9, 10e-9, x / 4, 10.0)[1], r),
        (lambda x: th.stepped_edge_current(10.0, x / 40, 0.3), r),
        (lambda x: th.pulse_temperature_swing(x, 1.5, 5e-3, 10e-3, 20e-3), r),
        (lambda x: gp.vth_hot_estimate(x / 5, 175.0), r),
        (lambda x: bs.refresh_charge(1e-6, x, 2.5e-6, 1.3), r),
        (lambda x: gr.avalanche_energy(10e-9, x, 40.0, 14.8, 60.0), r),
    ]
    for f, xs in cases:
        out = np.asarray(f(xs))
        assert out.shape == xs.shape
        np.testing.assert_allclose(out, [f(float(x)) for x in xs])
