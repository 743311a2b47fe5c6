"""Losses, thermal chains, junction temperature and per-switch currents.

Loss formulas: Mohan, Undeland & Robbins, Power Electronics, 3rd ed. (§2-3, §22-4, §29-2),
worked by hand below. The electro-thermal fixed point is checked against
scipy.optimize.brentq on the same equation; currents per switch against a numpy time-domain
integration of the switching patterns (Holmes & Lipo 2003, ch. 3, for the patterns).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq, minimize_scalar

from reviewer.physics import thermal as th

R25, K, THOT = 0.020, 1.7, 125.0       # illustrative: 20 mΩ at 25 °C, ×1.7 at 125 °C


def test_rds_models_by_hand():
    # Exponential: R·k^((T − 25)/100): at 125 °C 1.7·R, at 75 °C √1.7·R = 1.30384·R.
    assert th.rds_on_at(125.0, R25, 25.0, K, THOT) == pytest.approx(0.034)
    assert th.rds_on_at(75.0, R25, 25.0, K, THOT) == pytest.approx(R25 * math.sqrt(1.7))
    assert th.rds_on_at(25.0, R25, 25.0, K, THOT) == pytest.approx(R25)
    # Linear: R·(1 + 0.7·(T − 25)/100): at 75 °C 1.35·R.
    assert th.rds_on_at(75.0, R25, 25.0, K, THOT, "linear") == pytest.approx(R25 * 1.35)
    with pytest.raises(ValueError):
        th.rds_on_at(75.0, R25, 25.0, K, THOT, "cubic")


def test_rds_slope_against_numerical_derivative():
    t = np.linspace(0, 200, 20001)
    for model in ("exponential", "linear"):
        r = th.rds_on_at(t, R25, 25.0, K, THOT, model)
        np.testing.assert_allclose(th.rds_on_slope(t[1:-1], R25, 25.0, K, THOT, model),
                                   np.gradient(r, t)[1:-1], rtol=1e-6)


def test_rds_from_curve_points_matches_numpy_interp_inside():
    temps, facs = [-50.0, 25.0, 100.0, 150.0], [0.7, 1.0, 1.5, 1.9]
    x = np.array([-20.0, 25.0, 60.0, 140.0])
    np.testing.assert_allclose(th.rds_on_from_points(x, 0.01, temps, facs),
                               0.01 * np.interp(x, temps, facs))
    # Beyond the last point the end slope (0.4 per 50 °C) continues: 1.9 + 0.4 = 2.3 at 200 °C.
    assert th.rds_on_from_points(200.0, 0.01, temps, facs) == pytest.approx(0.023)


def test_losses_by_hand():
    # Conduction: 10² A² · 10 mΩ = 1 W.
    assert th.conduction_loss(10.0, 0.010) == pytest.approx(1.0)
    # Switching: ½·24 V·10 A·(20 ns + 20 ns)·20 kHz = 0.096 W (MU&R eq. 2-6).
    assert th.switching_loss(24.0, 10.0, 20e-9, 20e-9, 20e3) == pytest.approx(0.096)
    # C_oss: ½·1 nF·24²·20 kHz = 5.76 mW.
    assert th.coss_loss(1e-9, 24.0, 20e3) == pytest.approx(5.76e-3)
    # Body diode: 0.8 V·10 A·2·500 ns·20 kHz = 0.16 W.
    assert th.body_diode_loss(0.8, 10.0, 500e-9, 20e3) == pytest.approx(0.16)
    # Gate: 50 nC·12 V·20 kHz = 12 mW; the 5 Ω resistor in a 10 Ω loop takes half.
    p = th.gate_drive_loss(50e-9, 12.0, 20e3)
    assert p == pytest.approx(12e-3)
    assert th.gate_loss_share(p, 5.0, 10.0) == pytest.approx(6e-3)


def test_thermal_chain():
    # θ_jc + θ_cs + θ_sa = 0.5 + 0.2 + 2.0 = 2.7 K/W; without a sink, θ_ja.
    assert th.thermal_resistance(0.5, 0.2, 2.0) == pytest.approx(2.7)
    assert th.thermal_resistance(0.5, None, 2.0) == pytest.approx(2.5)
    assert th.thermal_resistance(rth_ja=62.0) == 62.0
    with pytest.raises(ValueError):
        th.thermal_resistance(rth_jc=0.5)
    # T_a + P·θ = 40 + 10 W·2.7 K/W = 67 °C.
    assert th.junction_temperature(40.0, 10.0, 2.7) == pytest.approx(67.0)


def _f(t, ta, rth, i, model="exponential", p_other=0.0):
    return t - ta - rth * (i * i * th.rds_on_at(t, R25, 25.0, K, THOT, model) + p_other)


def _t_star(rth, i):
    # Peak of f for the exponential model: f' = 1 − θ·I²·b·R(T) = 0 with b = ln k/100,
    # so R(T*) = 1/(θ I² b) and T* = 25 + ln(R(T*)/R25)/b.
    b = math.log(K) / (THOT - 25.0)
    return 25.0 + math.log(1.0 / (rth * i * i * b * R25)) / b


def test_fixed_point_against_brentq_exponential():
    ta, rth, i = 40.0, 40.0, 5.0
    sol = th.solve_junction_temperature(ta, rth, i, R25, 25.0, K, THOT, p_other=0.3)
    assert sol.converged
    ref = brentq(lambda t: _f(t, ta, rth, i, p_other=0.3), ta, _t_star(rth, i), xtol=1e-12)
    assert sol.t_j == pytest.approx(ref, abs=1e-4)
    assert sol.rds_on == pytest.approx(th.rds_on_at(ref, R25, 25.0, K, THOT), rel=1e-6)
    assert sol.power == pytest.approx((ref - ta) / rth, rel=1e-5)


def test_fixed_point_linear_model_closed_form():
    # T = T_a + θ·I²·R25·(1 + β(T − 25)), β = 0.7/100: solve the linear equation by hand:
    # T = (T_a + θI²R25(1 − 25β)) / (1 − θI²R25β).
    ta, rth, i = 40.0, 40.0, 5.0
    beta = 0.7 / 100
    a = rth * i * i * R25
    exact = (ta + a * (1 - 25 * beta)) / (1 - a * beta)
    sol = th.solve_junction_temperature(ta, rth, i, R25, 25.0, K, THOT, model="linear")
    assert sol.converged and sol.t_j == pytest.approx(exact, abs=1e-4)


def test_thermal_runaway_is_a_result_not_an_exception():
    ta, rth, i = 40.0, 60.0, 10.0
    # scipy confirms f(T) = T − T_a − θ·P(T) never reaches zero: its maximum is negative.
    best = minimize_scalar(lambda t: -_f(t, ta, rth, i), bounds=(ta, 1000.0), method="bounded")
    assert -best.fun < 0
    sol = th.solve_junction_temperature(ta, rth, i, R25, 25.0, K, THOT)
    assert not sol.converged
    assert sol.t_j is None and "thermal runaway" in sol.message


def test_runaway_threshold_at_the_peak_of_h():
    ta, i = 40.0, 10.0
    theta_c = th.largest_total_resistance(1000.0, ta, i, R25, 25.0, K, THOT)
    # At the tangency f(T*) = 0 for the exponential model with θ_c (checked with scipy).
    best = minimize_scalar(lambda t: -_f(t, ta, theta_c, i), bounds=(ta, 1000.0), method="bounded")
    assert -best.fun == pytest.approx(0.0, abs=1e-4)
    assert th.solve_junction_temperature(ta, 0.99 * theta_c, i, R25, 25.0, K, THOT).converged
    assert not th.solve_junction_temperature(ta, 1.01 * theta_c, i, R25, 25.0, K, THOT).converged


def test_largest_sink_resistance_round_trip():
    ta, i, tlim, jc, cs = 40.0, 10.0, 125.0, 1.0, 0.5
    sa = th.largest_sink_to_ambient(tlim, ta, jc, cs, i, R25, 25.0, K, THOT, p_other=0.5)
    # At that heatsink the junction sits exactly at the limit:
    # θ = (T_lim − T_a)/P(T_lim) = 85/(100·0.034 + 0.5) = 85/3.9 = 21.795 K/W.
    assert sa + jc + cs == pytest.approx(85.0 / 3.9)
    sol = th.solve_junction_temperature(ta, sa + jc + cs, i, R25, 25.0, K, THOT, p_other=0.5)
    assert sol.converged and sol.t_j == pytest.approx(tlim, abs=1e-3)
    # Threshold: a 1 % larger heatsink resistance overshoots the limit.
    worse = th.solve_junction_temperature(ta, 1.01 * (sa + jc + cs), i, R25, 25.0, K, THOT,
                                          p_other=0.5)
    assert not worse.converged or worse.t_j > tlim
    # No heatsink can do it: negative answer.
    assert th.largest_sink_to_ambient(tlim, ta, 30.0, 0.5, i, R25, 25.0, K, THOT) < 0


def test_paralleled_device_current():
    # 30 A over 3 devices with a 20 % sharing allowance (common practice): 10·1.2 = 12 A.
    assert th.device_current(30.0, 3) == pytest.approx(12.0)
    assert th.device_current(30.0, 1) == pytest.approx(30.0)


def _pattern_currents(on, i):
    """Time-domain RMS and mean of a switch current: the switch carries i while on."""
    return math.sqrt(np.mean(on * i * i)), np.mean(on * i)


@pytest.mark.parametrize("phi", [0.0, math.radians(30), math.radians(-60)])
def test_switch_currents_against_time_domain(phi):
    n = 400_000
    theta = (np.arange(n) + 0.5) / n * 2 * math.pi
    ipk = 10.0
    i = ipk * np.sin(theta - phi)
    # Square: HA on for 0 ≤ θ < π, carrying i.
    ha = theta < math.pi
    rms, avg = _pattern_currents(ha, i)
    c = th.switch_currents("square", ipk, phi)
    assert c.high_rms == pytest.approx(rms, rel=1e-4) == pytest.approx(ipk / 2, rel=1e-4)
    assert c.high_avg == pytest.approx(abs(avg), abs=1e-4)
    # Quasi-square, α = 25°, zero interval on both low sides: HA on α..π − α.
    a = math.radians(25)
    ha = (theta >= a) & (theta < math.pi - a)
    la = ~ha
    c = th.switch_currents("quasi_square", ipk, phi, notch_angle=a)
    assert c.high_rms == pytest.approx(_pattern_currents(ha, i)[0], rel=1e-4)
    assert c.low_rms == pytest.approx(_pattern_currents(la, -i)[0], rel=1e-4)
    assert c.high_avg == pytest.approx(abs(_pattern_currents(ha, i)[1]), abs=1e-4)
    assert c.low_avg == pytest.approx(abs(_pattern_currents(la, -i)[1]), abs=1e-4)
    # Alternating zero state (phase-shifted legs): HA on α..π + α, HB on π − α..2π − α.
    ha = (theta >= a) & (theta < math.pi + a)
    hb = (theta >= math.pi - a) & (theta < 2 * math.pi - a)
    c = th.switch_currents("quasi_square", ipk, phi, notch_angle=a, zero_state="alternating")
    assert c.high_rms == pytest.approx(_pattern_currents(ha, i)[0], rel=1e-4)
    worst = max(abs(_pattern_currents(ha, i)[1]), abs(_pattern_currents(hb, -i)[1]))
    assert c.high_avg == pytest.approx(worst, abs=1e-4)


@pytest.mark.parametrize("kind", ["spwm_bipolar", "spwm_unipolar"])
def test_spwm_switch_currents_against_carrier_comparison(kind):
    m, ratio, phi, ipk = 0.8, 400, math.radians(20), 10.0
    n = ratio * 1000
    x = (np.arange(n) + 0.5) / n
    theta = 2 * math.pi * x
    carrier = 4 * np.abs((x * ratio) % 1.0 - 0.5) - 1
    i = ipk * np.sin(theta - phi)
    ha = m * np.sin(theta) > carrier
    c = th.switch_currents(kind, ipk, phi, index=m)
    rms, avg = _pattern_currents(ha, i)
    assert c.high_rms == pytest.approx(rms, rel=2e-3)
    # I_avg = I·M·cos φ/4 = 10·0.8·0.9397/4 = 1.879 A.
    assert c.high_avg == pytest.approx(avg, abs=5e-3)
    assert c.high_avg == pytest.approx(ipk * m * math.cos(phi) / 4)


def test_switched_current_and_frequency():
    # Per device, mean of max(sin, 0) over a cycle is 1/π: 10 A peak → 3.183 A.
    assert th.switched_current("spwm_bipolar", 10.0) == pytest.approx(10 / math.pi)
    # Square wave into a resistor: V/R = (π/4)·I_1 (fundamental 4/π of the square), not 0 A.
    assert th.switched_current("square", 10.0, 0.0) == pytest.approx(10 * math.pi / 4)
    assert th.switch_frequency("square", 50.0, None) == 50.0
    assert th.switch_frequency("spwm_unipolar", 50.0, 20e3) == 20e3
    with pytest.raises(ValueError):
        th.switch_frequency("spwm_bipolar", 50.0, None)


@pytest.mark.parametrize("phi", [0.0, 0.4, 1.0])
def test_square_edge_current_against_time_domain(phi):
    # ±1 V square into R = 1 Ω, L = tan φ/ω: integrate di/dt = (v − R·i)/L over many periods with
    # numpy (exact step of the first-order response per sample) and read i at the edge.
    w = 2 * math.pi * 50.0
    r, l_ = 1.0, math.tan(phi) / w
    i1 = 4 / math.pi / math.hypot(r, w * l_)          # fundamental peak of the current
    if phi == 0.0:
        edge = 1.0
    else:
        n = 20000
        dt = 1 / 50.0 / n
        k = math.exp(-r * dt / l_)
        i = 0.0
        for _ in range(6):
            for j in range(n):
                v = 1.0 if j < n // 2 else -1.0
                i = v / r + (i - v / r) * k
        edge = abs(i)                                  # at the end of the negative half
    assert th.square_edge_current(i1, phi) == pytest.approx(edge, rel=1e-3)


def test_sine_pwm_switching_loss_per_device_against_numpy_edge_average():
    # Synthesise one output period of bipolar sine PWM (400 carriers), find every edge of the
    # high switch by carrier comparison, take the load current there and count the loss only at
    # hard edges (current out of the leg: positive), E = ½·V·i·Σt per edge; the mean over the
    # period must be ½·V·(I_pk/π)·Σt·f_c within 1 % (per-device switched current I_pk/π).
    f0, fc, m, i_pk, v, t_sum = 50.0, 20e3, 0.9, 10.0, 24.0, 100e-9
    n = 2_000_000
    t = (np.arange(n) + 0.5) / (n * f0)
    phi = 0.5
    ref = m * np.sin(2 * np.pi * f0 * t)
    carrier = 2 * np.abs(2 * ((t * fc) % 1.0) - 1) - 1
    on = ref > carrier
    edges = np.flatnonzero(np.diff(on.astype(int)) != 0)
    i_edge = i_pk * np.sin(2 * np.pi * f0 * t[edges] - phi)
    energy = 0.5 * v * np.maximum(i_edge, 0.0) * t_sum
    p_numeric = energy.sum() * f0 / 2                  # each edge counted as one of the pair
    p_formula = float(th.switching_loss(v, th.switched_current("spwm_bipolar", i_pk, phi),
                                        t_sum, 0.0, fc))
    assert p_formula == pytest.approx(p_numeric, rel=0.01)


@pytest.mark.parametrize("tau", [1e-3, 5e-3, 50e-3])
def test_pulse_temperature_swing_against_time_stepping(tau):
    # dT/dt = (P(t)·R − T)/τ stepped exactly per sample with numpy-free recursion over 40
    # periods of a 10 ms pulse every 20 ms (50 Hz square); peak minus mean of the last period.
    p, r, t_on, period = 10.0, 1.5, 10e-3, 20e-3
    n = 4000
    dt = period / n
    k = math.exp(-dt / tau)
    temp, trace = 0.0, []
    for _ in range(40):
        trace = []
        for j in range(n):
            drive = p * r if j < n // 2 else 0.0
            temp = drive + (temp - drive) * k
            trace.append(temp)
    swing = max(trace) - float(np.mean(trace))
    assert th.pulse_temperature_swing(p, r, tau, t_on, period) == pytest.approx(swing, rel=2e-3, abs=1e-3)
    # limits: τ ≪ t_on → P·R·(1 − D); never negative
    assert th.pulse_temperature_swing(p, r, 1e-6, t_on, period) == pytest.approx(p * r * 0.5, rel=1e-6)


@pytest.mark.parametrize("phi, alpha", [(0.0, 0.4), (0.5, 0.4), (1.0, 0.2), (0.7, 0.0)])
def test_stepped_edge_current_against_time_domain(phi, alpha):
    # quasi-square ±1 V with zero intervals 2α into R = 1 Ω, L = tan φ/ω, stepped exactly per
    # sample for several periods: the current at the end of the +V interval.
    w = 2 * math.pi * 50.0
    r, l_ = 1.0, math.tan(phi) / w
    i1 = 4 / math.pi * math.cos(alpha) / math.hypot(r, w * l_)
    if phi == 0.0:
        edge = 1.0
    else:
        n = 20000
        dt = 1 / 50.0 / n
        k = math.exp(-r * dt / l_)
        i = 0.0
        theta = (np.arange(n) + 1) * 2 * math.pi / n
        v = np.where((theta > alpha) & (theta <= math.pi - alpha), 1.0,
                     np.where((theta > math.pi + alpha) & (theta <= 2 * math.pi - alpha), -1.0, 0.0))
        end = int(round((math.pi - alpha) / (2 * math.pi) * n)) - 1
        for _ in range(6):
            for j in range(n):
                i = v[j] / r + (i - v[j] / r) * k
                if j == end:
                    edge = i
    assert th.stepped_edge_current(i1, phi, alpha) == pytest.approx(edge, rel=2e-3)


def test_recovery_current_and_loss_by_hand():
    # triangular recovery: Q_rr = ½·I_rr·t_rr → I_rr = 2·30 nC/40 ns = 1.5 A
    assert th.recovery_peak_current(30e-9, 40e-9) == pytest.approx(1.5)
    # Q_rr·V·f·share: 30 nC · 48 V · 20 kHz · ½ = 14.4 mW
    assert th.recovery_loss(30e-9, 48.0, 20e3, 0.5) == pytest.approx(14.4e-3)
