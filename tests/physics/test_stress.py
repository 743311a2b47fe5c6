"""Device voltage stress. Check values are hand calculations from the circuit (Kirchhoff's voltage
law around gate, source and the rails) and v = L·di/dt (Mohan, Undeland, Robbins, Power
Electronics, 3rd ed., 2003)."""

import pytest

from reviewer.physics import stress


def test_p_channel_high_side_pulled_to_ground_sees_the_bus():
    # The classic trap (common practice): gate at 0 V, source at the 24 V bus -> V_SG = 24 V,
    # beyond the common 20 V gate-source limit.
    assert stress.gate_source(0.0, "ground", "high", "p", True, 24.0) == 24.0
    # off: gate pulled to the bus -> V_SG = 0
    assert stress.gate_source(24.0, "ground", "high", "p", False, 24.0) == 0.0


def test_n_channel_high_side_with_ground_referenced_drive():
    # 12 V gate node, source at the 24 V bus while on -> V_GS = 12 − 24 = −12 V: never on
    assert stress.gate_source(12.0, "ground", "high", "n", True, 24.0) == -12.0
    # off with the low side conducting, source at 0 V: a 'bus' level would be V_GS = 24 V
    assert stress.gate_source(24.0, "ground", "high", "n", False, 24.0) == 24.0


def test_source_referenced_levels_are_taken_as_given():
    assert stress.gate_source(15.0, "source", "high", "n", True, 400.0) == 15.0
    assert stress.gate_source(-3.0, "source", "low", "n", False, 400.0) == -3.0


def test_low_side_source_at_ground():
    assert stress.gate_source(12.0, "ground", "low", "n", True, 48.0) == 12.0


def test_zener_clamp():
    assert stress.clamp(24.0, 15.0) == 15.0
    assert stress.clamp(12.0, 15.0) == 12.0
    assert stress.clamp(-5.0, 15.0) == -0.7  # forward-biased zener (common practice: ~0.7 V)
    assert stress.clamp(24.0, None) == 24.0


def test_overshoot_l_di_dt():
    # 10 nH, 20 A off in 20 ns: 10e-9 · 20 / 20e-9 = 10 V (hand calculation, v = L·di/dt)
    assert stress.overshoot(10e-9, 20.0, 20e-9) == pytest.approx(10.0)
    assert stress.overshoot(10e-9, 20.0, 0.0) == float("inf")
