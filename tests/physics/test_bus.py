"""DC bus: ripple current at 2·f_out and at the switching frequency, voltage ripple, capacitor
derating and local capacitance.

Check values come from numerical experiments with numpy (sampled waveforms, FFT, sine-triangle
PWM simulated by comparison with a carrier) and from hand calculations written out with their
textbook source. Nothing here is taken from a datasheet.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.physics import bus


def _component_rms(x: np.ndarray, harmonic: int) -> float:
    """Rms of the ``harmonic``-th bin of a signal sampled over exactly one fundamental period."""
    spectrum = np.fft.rfft(x) / len(x)
    return float(abs(spectrum[harmonic]) * 2 / math.sqrt(2))


@pytest.mark.parametrize("pf", [1.0, 0.8, 0.5])
def test_ripple_at_twice_output_frequency_matches_a_sampled_power_waveform(pf):
    # numpy FFT of the bus current p(t)/V_bus for v = √2·230 sin ωt, i = √2·4 sin(ωt − φ).
    n, v_rms, i_rms, v_bus = 4096, 230.0, 4.0, 400.0
    t = np.arange(n) / n
    phi = math.acos(pf)
    p = (math.sqrt(2) * v_rms * np.sin(2 * np.pi * t)) * (math.sqrt(2) * i_rms
                                                          * np.sin(2 * np.pi * t - phi))
    i_in = p / v_bus
    i_dc = float(np.mean(i_in))
    assert i_dc == pytest.approx(v_rms * i_rms * pf / v_bus)
    assert bus.ripple_current_2f(i_dc, pf) == pytest.approx(_component_rms(i_in, 2), rel=1e-9)


def test_resistive_load_ripple_is_i_dc_over_root_two():
    # Textbook result (Mohan, Undeland & Robbins 2003, ch. 8): 10 A mean -> 7.071 A rms at 2f.
    assert bus.ripple_current_2f(10.0) == pytest.approx(10 / math.sqrt(2))


def _simulate_pwm(modulation: str, m: float, pf: float, ratio: int = 400, n: int = 400_000):
    """Natural-sampled sine-triangle PWM of a full bridge, output current an ideal sinusoid."""
    theta = 2 * np.pi * np.arange(n) / n
    carrier = 2 * np.abs(2 * ((ratio * np.arange(n) / n) % 1.0) - 1) - 1  # triangle in [-1, 1]
    ref = m * np.sin(theta)
    if modulation == "bipolar":
        s = np.where(ref > carrier, 1.0, -1.0)
    else:
        s = (ref > carrier).astype(float) - (-ref > carrier).astype(float)
    i_out = math.sqrt(2) * np.sin(theta - math.acos(pf))  # 1 A rms
    return bus.bridge_input_current(s, i_out)


@pytest.mark.parametrize("modulation", ["bipolar", "unipolar"])
@pytest.mark.parametrize("m,pf", [(0.9, 1.0), (0.6, 0.8), (1.0, 0.5)])
def test_pwm_input_current_components_match_a_simulation(modulation, m, pf):
    i_in = _simulate_pwm(modulation, m, pf)
    total = float(np.sqrt(np.mean(i_in**2)))
    i_dc = float(np.mean(i_in))
    i_2f = _component_rms(i_in, 2)
    i_sw = math.sqrt(total**2 - i_dc**2 - i_2f**2)
    assert bus.input_current_rms(1.0, m, pf, modulation) == pytest.approx(total, rel=5e-3)
    assert i_dc == pytest.approx(m * pf / math.sqrt(2), rel=5e-3)
    assert bus.ripple_current_2f(i_dc, pf) == pytest.approx(i_2f, rel=5e-3)
    assert bus.ripple_current_switching(1.0, m, pf, modulation) == pytest.approx(i_sw, rel=1e-2)


def test_unipolar_switching_ripple_is_smaller_than_bipolar():
    # Three-level PWM applies zero voltage for part of each period, so less current is chopped.
    assert bus.ripple_current_switching(10, 0.9, 1.0, "unipolar") < \
        bus.ripple_current_switching(10, 0.9, 1.0, "bipolar")
    with pytest.raises(ValueError):
        bus.input_current_rms(1, 1, 1, "square")


def test_components_add_in_power_and_arrays_work():
    assert bus.capacitor_ripple_rms(3.0, 4.0) == pytest.approx(5.0)
    out = bus.ripple_current_switching(np.array([1.0, 2.0]), 0.9, 1.0, "bipolar")
    assert out.shape == (2,) and out[1] == pytest.approx(2 * out[0])


def test_voltage_ripple_hand_calculation():
    # Impedance of a capacitor (any circuits text): 10 A rms at 100 Hz in 10 mF:
    # X_C = 1 / (2π · 100 · 0.01) = 0.159155 Ω -> ΔV = 10 · 0.159155 = 1.59155 V rms,
    # peak-to-peak 2√2 · 1.59155 = 4.5016 V.
    dv = bus.bus_voltage_ripple(10.0, 100.0, 10e-3)
    assert dv == pytest.approx(1.59155, rel=1e-5)
    assert bus.peak_to_peak(dv) == pytest.approx(4.5016, rel=1e-4)
    assert bus.capacitance_for_ripple(10.0, 100.0, dv) == pytest.approx(10e-3)


def test_voltage_ripple_with_esr_matches_complex_impedance():
    # numpy complex arithmetic: |ESR + 1/(jωC)|.
    esr, c, f = 0.05, 4.7e-3, 120.0
    z = abs(esr + 1 / (1j * 2 * np.pi * f * c))
    assert bus.bus_voltage_ripple(3.0, f, c, esr) == pytest.approx(3.0 * z)


def test_capacitor_voltage_derating():
    # Common practice 0.8 for electrolytics: a lead-acid bus at 14.8 V needs ≥ 18.5 V.
    assert bus.capacitor_voltage_needed(14.8) == pytest.approx(18.5)
    assert bus.capacitor_voltage_needed(48.0, 0.5) == pytest.approx(96.0)


def test_input_current_hand_calculation():
    # 1000 W out at 85 % from 10.5 V: 1000 / (0.85 · 10.5) = 112.04 A.
    assert bus.input_current(1000, 10.5, 0.85) == pytest.approx(112.044, rel=1e-5)


def test_local_capacitance_charge_balance():
    # Erickson & Maksimović (2001) ch. 2, capacitor charge balance: 20 A pulses at 20 kHz, D = ½,
    # 0.5 V allowed: C = 20 · 0.25 / (20e3 · 0.5) = 500 µF.
    assert bus.local_capacitance(20.0, 20e3, 0.5) == pytest.approx(500e-6)
    # Numerical check: the capacitor supplies I − I·D while the leg conducts and recharges at I·D;
    # integrate its current over one period with numpy and take the voltage excursion.
    i_peak, f_sw, d = 20.0, 20e3, 0.3
    c = bus.local_capacitance(i_peak, f_sw, 0.5, duty=d)
    n = 100_000
    t = np.arange(n) / n / f_sw
    leg = np.where(t < d / f_sw, i_peak, 0.0)
    v = np.cumsum(-(leg - leg.mean())) / (n * f_sw) / c
    assert float(v.max() - v.min()) == pytest.approx(0.5, rel=1e-3)


def test_local_voltage_step_inverts_local_capacitance():
    # Same charge balance: 500 µF carrying 20 A pulses at 20 kHz, D = ½, steps by 0.5 V.
    assert bus.local_voltage_step(20.0, 20e3, 500e-6) == pytest.approx(0.5)


def test_edge_voltage_step_hand_calculation():
    # Q = C·ΔV: 12 A drawn for 100 ns from 10 µF: ΔV = 12 · 100e-9 / 10e-6 = 0.12 V.
    assert bus.edge_voltage_step(12.0, 100e-9, 10e-6) == pytest.approx(0.12)


def test_source_share_is_a_current_divider_for_floats_and_arrays():
    """k = |Z_c / (R_s + Z_c)|, Z_c = ESR + 1/(jωC) (current divider). 1 mF at 100 Hz:
    Z_c = −j·1.59155 Ω; R_s = 1.59155 Ω gives |−j / (1 − j)| = 1/√2."""
    import numpy as np

    from reviewer.physics import bus

    xc = 1 / (2 * math.pi * 100 * 1e-3)
    assert bus.source_share(xc, 100.0, 1e-3) == pytest.approx(1 / math.sqrt(2))
    got = bus.source_share(np.array([0.0, xc, math.inf]), 100.0, 1e-3)
    np.testing.assert_allclose(got, [1.0, 1 / math.sqrt(2), 0.0])
    # the voltage across the node: I · |R ∥ Z_c| = I · xc/√2 for R = xc
    assert bus.shared_bus_ripple(2.0, xc, 100.0, 1e-3) == pytest.approx(2 * xc / math.sqrt(2))
    np.testing.assert_allclose(bus.shared_bus_ripple(2.0, np.array([0.0, math.inf]), 100.0, 1e-3),
                               [0.0, 2 * xc])
    # supply lead: components at different frequencies add in power (Parseval)
    np.testing.assert_allclose(bus.supply_lead_rms(np.array([3.0, 6.0]), np.array([4.0, 8.0])),
                               [5.0, 10.0])
