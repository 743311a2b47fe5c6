"""Grounding: ground bounce and switching overshoot, L · di/dt, with hand calculations from
Faraday's law for a lumped inductance (Johnson & Graham 1993, ch. 5) and a numpy check."""

from __future__ import annotations

import numpy as np
import pytest

from reviewer.physics import grounding as g


def test_ground_bounce_hand_calculation():
    # 10 nH shared by logic and power returns, 20 A switched in 50 ns:
    # di/dt = 20 / 50e-9 = 4e8 A/s; V = 10e-9 · 4e8 = 4.0 V.
    assert g.current_slope(20.0, 50e-9) == pytest.approx(4e8)
    assert g.ground_bounce(10e-9, 20.0, 50e-9) == pytest.approx(4.0)
    # an instantaneous edge has no finite slope: unbounded, never a division error
    assert g.current_slope(20.0, 0.0) == float("inf")
    assert list(g.current_slope(np.array([20.0, 20.0]), np.array([0.0, 50e-9]))) == [float("inf"), 4e8]


def test_overshoot_hand_calculation():
    # 20 nH commutation loop, 30 A turned off in 20 ns: 20e-9 · 30 / 20e-9 = 30 V.
    assert g.switching_overshoot(20e-9, 30.0, 20e-9) == pytest.approx(30.0)


def test_inductive_voltage_against_a_numerical_derivative():
    # numpy.gradient of a current ramp through 15 nH.
    t = np.linspace(0, 100e-9, 1001)
    i = np.clip(t / 40e-9, 0, 1) * 12.0
    v = 15e-9 * np.gradient(i, t)
    assert float(v[200]) == pytest.approx(g.inductive_voltage(15e-9, g.current_slope(12.0, 40e-9)))


def test_layout_targets_solve_the_inequality():
    # Keep bounce within a 0.4 V noise margin at 20 A in 50 ns: L ≤ 0.4 · 50e-9 / 20 = 1 nH.
    l_max = g.max_inductance(0.4, 20.0, 50e-9)
    assert l_max == pytest.approx(1e-9)
    assert g.ground_bounce(l_max, 20.0, 50e-9) == pytest.approx(0.4)
    # Or slow the edge: with 20 nH and 30 A, 10 V of overshoot needs t ≥ 60 ns.
    t_min = g.min_transition_time(10.0, 20e-9, 30.0)
    assert t_min == pytest.approx(60e-9)
    assert g.switching_overshoot(20e-9, 30.0, t_min) == pytest.approx(10.0)


def test_avalanche_energy_unclamped_inductive_form():
    from reviewer.physics import grounding as g
    # ½·L·I²·V_BR/(V_BR − V_bus): 10 nH, 20 A, 40 V rating, 14.8 V bus, peak 60 V
    e = g.avalanche_energy(10e-9, 20.0, 40.0, 14.8, 60.0)
    assert e == pytest.approx(0.5 * 10e-9 * 400 * 40 / (40 - 14.8))
    # no avalanche below the rating; a bus at the rating cannot be blocked at all
    assert g.avalanche_energy(10e-9, 20.0, 40.0, 14.8, 39.0) == 0.0
    assert g.avalanche_energy(10e-9, 20.0, 40.0, 40.0, 60.0) == float("inf")
