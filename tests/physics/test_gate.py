"""Gate-source voltages, clamps, dividers and pull resistors, checked by hand calculation.

Sources named beside each value: Kirchhoff's voltage law, the divider and zener-regulator
relations (Horowitz & Hill, The Art of Electronics, 3rd ed., §1.2), Joule's law, I = dQ/dt.
"""

from __future__ import annotations

import numpy as np
import pytest

from reviewer.physics import gate


def test_enhancement_sign_by_polarity():
    # P-channel devices are the complement of N-channel ones (Horowitz & Hill §3.5.1).
    assert gate.enhancement(10.0, "n") == 10.0
    assert gate.enhancement(-10.0, "p") == 10.0
    assert gate.enhancement(3.0, "p") == -3.0
    with pytest.raises(ValueError):
        gate.enhancement(1.0, "x")


def test_p_channel_high_side_gate_pulled_to_ground_sees_the_bus():
    # KVL: source at the bus (24 V), gate at 0 V: V_GS = 0 − 24 = −24 V, in both states.
    assert gate.vgs_from_gate_node(0.0, "p", "high", 24.0, conducting=True) == (-24.0, -24.0)
    assert gate.vgs_from_gate_node(24.0, "p", "high", 24.0, conducting=False) == (0.0, 0.0)


def test_n_channel_high_side_source_follows_the_node():
    # On: source at the bus (24 V); a bootstrapped gate at 36 V gives V_GS = 36 − 24 = 12 V.
    assert gate.vgs_from_gate_node(36.0, "n", "high", 24.0, conducting=True) == (12.0, 12.0)
    # Off with gate at 0 V: the node may sit anywhere in 0..24 V, so V_GS is −24..0 V.
    assert gate.vgs_from_gate_node(0.0, "n", "high", 24.0, conducting=False) == (-24.0, 0.0)
    # Low-side N: source on ground, V_GS = V_gate.
    assert gate.vgs_from_gate_node(12.0, "n", "low", 24.0, conducting=True) == (12.0, 12.0)


def test_vectorised_over_bus_corners():
    lo, hi = gate.vgs_from_gate_node(0.0, "p", "high", np.array([10.5, 14.8]), conducting=True)
    np.testing.assert_allclose(lo, [-10.5, -14.8])


def test_zener_clamp_both_polarities_and_threshold():
    # Zener cathode at the gate of an N switch: V_GS ≤ V_z, ≥ −V_f (Horowitz & Hill §3.5.4).
    assert gate.zener_clamped_vgs(24.0, 15.0, "n") == 15.0
    assert gate.zener_clamped_vgs(-5.0, 15.0, "n") == pytest.approx(-0.7)
    # Exactly at the zener voltage: unchanged (threshold case).
    assert gate.zener_clamped_vgs(15.0, 15.0, "n") == 15.0
    assert gate.zener_clamped_vgs(14.9, 15.0, "n") == 14.9
    # P channel: cathode at the source, V_GS ≥ −V_z.
    assert gate.zener_clamped_vgs(-24.0, 15.0, "p") == -15.0
    assert gate.zener_clamped_vgs(2.0, 15.0, "p") == pytest.approx(0.7)
    # Back-to-back: ±(V_z + V_f) = ±15.7 V.
    assert gate.zener_clamped_vgs(-24.0, 15.0, "n", bidirectional=True) == pytest.approx(-15.7)


def test_divider():
    # V·R_p/(R_s + R_p) = 24·10k/(10k + 10k) = 12 V (Horowitz & Hill §1.2.3).
    assert gate.divided_vgs(24.0, 10e3, 10e3) == pytest.approx(12.0)
    # Solve for R_s: 10k·(24/12 − 1) = 10 kΩ; 10k·(36/12 − 1) = 20 kΩ.
    assert gate.divider_series_resistor(24.0, 12.0, 10e3) == pytest.approx(10e3)
    r = gate.divider_series_resistor(36.0, 12.0, 10e3)
    assert r == pytest.approx(20e3)
    assert gate.divided_vgs(36.0, r, 10e3) == pytest.approx(12.0)
    # Applied already below the target: no series resistor.
    assert gate.divider_series_resistor(10.0, 12.0, 10e3) == 0.0


def test_divider_window_over_a_bus_range():
    # Bus 10.5..14.8 V, need 10 V on, limit 16 V: k ∈ [10/10.5, min(16/14.8, 1)] = [0.952, 1].
    lo, hi = gate.divider_ratio_window(10.5, 14.8, 10.0, 16.0)
    assert lo == pytest.approx(10 / 10.5)
    assert hi == 1.0
    # Bus 20..60 V: k ∈ [10/20, 16/60] = [0.5, 0.267]: empty, a divider cannot serve.
    lo, hi = gate.divider_ratio_window(20.0, 60.0, 10.0, 16.0)
    assert lo == pytest.approx(0.5) and hi == pytest.approx(16 / 60) and lo > hi


def test_zener_current_and_series_resistor():
    # (24 − 15)/1k − 15/10k = 9 mA − 1.5 mA = 7.5 mA (zener regulator, H&H §1.2.6).
    assert gate.zener_current(24.0, 15.0, 1e3, 10e3) == pytest.approx(7.5e-3)
    # Threshold: 16.5 V through 1k into 10k divides to exactly 15 V: no zener current.
    assert gate.divided_vgs(16.5, 1e3, 10e3) == pytest.approx(15.0)
    assert gate.zener_current(16.5, 15.0, 1e3, 10e3) == pytest.approx(0.0, abs=1e-15)
    assert gate.zener_current(12.0, 15.0, 1e3, 10e3) == 0.0
    # 48 V, 15 V zener, 0.5 W: I_z,max = 0.5/15 = 33.33 mA, plus 15/10k = 1.5 mA in the
    # pull resistor: R_s ≥ (48 − 15)/34.833 mA = 947.4 Ω.
    r = gate.zener_series_resistor_min(48.0, 15.0, 0.5, 10e3)
    assert r == pytest.approx(33.0 / (0.5 / 15 + 1.5e-3))
    assert r == pytest.approx(947.37, rel=1e-4)
    assert 15.0 * gate.zener_current(48.0, 15.0, r, 10e3) == pytest.approx(0.5)


def test_miller_plateau_pull_power_pin_edge_and_vth_drift():
    # V_th + I_D/g_fs = 3 + 10/20 = 3.5 V (Mohan, Undeland & Robbins §22-4).
    assert gate.miller_plateau(3.0, 10.0, 20.0) == pytest.approx(3.5)
    # V²/R = 24²/10k = 57.6 mW (Joule's law).
    assert gate.resistor_power(24.0, 10e3) == pytest.approx(57.6e-3)
    # Q_g/I_pin = 30 nC / 20 mA = 1.5 µs (I = dQ/dt).
    assert gate.pin_edge_time(30e-9, 20e-3) == pytest.approx(1.5e-6)
    # 2.0 V + (−5 mV/°C)·(125 − 25) = 1.5 V (linear drift; the coefficient is an input).
    assert gate.vth_at_temperature(2.0, 125.0, 25.0, -5e-3) == pytest.approx(1.5)
