"""Bootstrap charge, capacitance, droop and the high side's longest on-time.

Formulas: Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §23-4 (bootstrap supply),
worked by hand term by term; the discharge ODE against scipy.integrate.solve_ivp; on-times
against a numpy carrier comparison (Holmes & Lipo 2003, ch. 3, for the modulation).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from reviewer.physics import bootstrap as bs


def test_charge_droop_and_capacitance_term_by_term():
    qg = 60e-9          # gate charge
    iq, ileak = 100e-6, 10e-6
    t_on = 10e-3        # half a 50 Hz period
    qls = 5e-9
    # Q_total = 60 nC + (100 µA + 10 µA)·10 ms + 5 nC = 60 nC + 1100 nC + 5 nC = 1165 nC.
    q = bs.bootstrap_charge(qg, iq, ileak, t_on, qls)
    assert q == pytest.approx(1165e-9)
    # ΔV = 12 − 0.7 − 10 = 1.3 V.
    dv = bs.allowed_droop(12.0, 0.7, 10.0)
    assert dv == pytest.approx(1.3)
    # C_min = 1165 nC / 1.3 V = 896.2 nF; ten times (common practice): 8.962 µF.
    c = bs.minimum_capacitance(q, dv)
    assert c == pytest.approx(896.15e-9, rel=1e-4)
    assert bs.practice_capacitance(c) == pytest.approx(8.9615e-6, rel=1e-4)
    # With 0.5 V across the low side while charging: ΔV = 0.8 V.
    assert bs.allowed_droop(12.0, 0.7, 10.0, 0.5) == pytest.approx(0.8)


def test_no_headroom_threshold():
    # V_cc − V_f exactly equals the needed V_GS: ΔV = 0, no capacitor is enough.
    assert bs.minimum_capacitance(1e-6, bs.allowed_droop(10.7, 0.7, 10.0)) == math.inf
    assert bs.minimum_capacitance(1e-6, -0.5) == math.inf


def test_gate_voltage_at_the_minimum_capacitance_is_exactly_the_needed_voltage():
    qg, i, t_on = 60e-9, 110e-6, 10e-3
    c = bs.minimum_capacitance(bs.bootstrap_charge(qg, 100e-6, 10e-6, t_on),
                               bs.allowed_droop(12.0, 0.7, 10.0))
    assert bs.gate_voltage_after(11.3, c, qg, i, t_on) == pytest.approx(10.0)
    # Half the capacitance droops twice as far: 11.3 − 2·1.3 = 8.7 V.
    assert bs.gate_voltage_after(11.3, c / 2, qg, i, t_on) == pytest.approx(8.7)


def test_discharge_with_a_pull_resistor_against_ode():
    c, qg, i, r, t_on = 1e-6, 60e-9, 110e-6, 10e3, 10e-3
    v0 = 11.3 - qg / c
    sol = solve_ivp(lambda t, v: [-(i + v[0] / r) / c], (0, t_on), [v0], rtol=1e-10, atol=1e-12)
    assert bs.gate_voltage_after(11.3, c, qg, i, t_on, r) == pytest.approx(sol.y[0][-1], rel=1e-6)
    # A 10 kΩ gate-source resistor empties 1 µF in well under 10 ms (τ = 10 ms, plus I_q).
    assert sol.y[0][-1] < 0.5 * v0


def test_longest_on_time_by_modulation():
    # Square 50 Hz: half a period, 10 ms.
    assert bs.longest_on_time("square", 50.0) == pytest.approx(10e-3)
    # Quasi-square α = 30°: (180° − 60°)/360° · 20 ms = 6.667 ms.
    assert bs.longest_on_time("quasi_square", 50.0, math.radians(30)) == pytest.approx(20e-3 / 3)
    # Sine PWM M = 0.9 at 20 kHz: (1 + 0.9)/2 · 50 µs = 47.5 µs.
    assert bs.longest_on_time("spwm_bipolar", 50.0, index=0.9, f_carrier=20e3) == pytest.approx(47.5e-6)
    # Threshold M = 1: exactly one carrier period from both branches.
    assert bs.longest_on_time("spwm_unipolar", 50.0, index=1.0, f_carrier=20e3) == pytest.approx(50e-6)
    # Just above M = 1 the bound allows a merged pulse either side of the peak: two periods.
    over = bs.longest_on_time("spwm_unipolar", 50.0, index=1.0 + 1e-9, f_carrier=20e3)
    assert over == pytest.approx(100e-6, rel=1e-2)
    # M = 1.2: on while sin θ ≥ 1/1.2: (π − 2·asin(0.8333))/(2π)·20 ms = 3.727 ms, + 2·50 µs.
    t = bs.longest_on_time("spwm_bipolar", 50.0, index=1.2, f_carrier=20e3)
    assert t == pytest.approx((math.pi - 2 * math.asin(1 / 1.2)) / (2 * math.pi) / 50 + 100e-6)
    assert t == pytest.approx(3.827e-3, rel=1e-3)
    with pytest.raises(ValueError):
        bs.longest_on_time("spwm_bipolar", 50.0)


def _longest_run(x, dt):
    d = np.diff(np.concatenate(([0], x.astype(int), [0])))
    return (np.flatnonzero(d == -1) - np.flatnonzero(d == 1)).max() * dt


@pytest.mark.parametrize("m", [0.6, 0.9, 1.3])
def test_spwm_on_time_against_carrier_comparison(m):
    fc, f0, n_c = 20e3, 50.0, 1000
    n = int(fc / f0) * n_c
    t = (np.arange(n) + 0.5) / (fc * n_c)
    carrier = 4 * np.abs((t * fc) % 1.0 - 0.5) - 1
    high = m * np.sin(2 * np.pi * f0 * t) > carrier
    sim = _longest_run(high, 1 / (fc * n_c))
    model = bs.longest_on_time("spwm_bipolar", f0, index=m, f_carrier=fc)
    if m <= 1:
        # Natural sampling stretches the widest pulse a little; within a tenth of a period.
        assert sim == pytest.approx(model, abs=0.1 / fc)
    else:
        # Overmodulation: at least the core interval, at most the bound.
        core = (math.pi - 2 * math.asin(1 / m)) / (2 * math.pi * f0)
        assert core <= sim <= model


def test_refresh_charge_and_shortest_refresh_by_hand_and_on_arrays():
    from reviewer.physics import bootstrap as b
    # C·D·(1 − e^(−t/RC)): 1 µF, 1.3 V deficit, 2.5 µs through 1 Ω → 1.3 µC·(1 − e^(−2.5))
    assert b.refresh_charge(1e-6, 1.0, 2.5e-6, 1.3) == pytest.approx(1.3e-6 * (1 - math.exp(-2.5)))
    assert b.refresh_charge(1e-6, 1.0, 0.0, 1.3) == 0.0
    # (1 − M)/(2 f_c): 0.9 at 20 kHz → 2.5 µs; over-modulation → 0; square: half period − dead
    out = b.shortest_refresh_time("spwm_unipolar", 50.0, index=np.array([0.9, 1.0, 1.2]), f_carrier=20e3)
    np.testing.assert_allclose(out, [2.5e-6, 0.0, 0.0])
    assert b.shortest_refresh_time("square", 50.0, t_dead=1e-6) == pytest.approx(10e-3 - 1e-6)


def test_gate_voltage_never_below_an_empty_capacitor():
    # charge balance (above) would give 11.3 − 20 nC/10 nF − 1 mA·10 ms/10 nF < 0; a capacitor
    # holds no negative charge: the gate is left with 0 V (physical fact)
    assert bs.gate_voltage_after(11.3, 10e-9, 20e-9, 1e-3, 10e-3) == 0.0
    assert bs.gate_voltage_after(11.3, 10e-9, 20e-9, 1e-3, 10e-3, 10e3) == 0.0
