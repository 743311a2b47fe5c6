"""The LC output filter against scipy.signal and hand calculations.

Sources named beside each check: the transfer function is compared with
scipy.signal.freqs of the same circuit written as polynomials in s; the corner, Q and the
peak of the second-order low-pass follow Erickson & Maksimović, Fundamentals of Power
Electronics, 2nd ed., 2001, ch. 8; the ripple follows the inductor volt-second balance
(same book, ch. 2); the R-L step response is the first-order exponential solution of
L di/dt + R i = v (any circuits text).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from numpy.polynomial import polynomial as P
from scipy import integrate, signal

from reviewer.physics import filter as flt
from reviewer.physics import waveform as wf

V = 12.0
F0 = 50.0


def polys(L, C, dcr=0.0, r=None, l_load=0.0, rd=None, cd=None):
    """H(s) = D_p / (D_p + Z_s·N_p) with Y_p = N_p / D_p, as coefficient lists (high first)."""
    # ascending-power polynomials: Y_p = sC + Y_d + Y_load
    num, den = [0.0, C], [1.0]  # sC / 1

    def add(n2, d2):
        nonlocal num, den
        num = P.polyadd(P.polymul(num, d2), P.polymul(n2, den))
        den = P.polymul(den, d2)

    if rd is not None:
        add([0.0, cd], [1.0, cd * rd]) if cd is not None else add([1.0], [rd])
    if r is not None:
        add([1.0], [r, l_load])
    zs = [dcr, L]
    b = den
    a = P.polyadd(den, P.polymul(zs, num))
    return b[::-1], a[::-1]


CIRCUITS = [
    dict(L=1e-3, C=10e-6, r=10.0),
    dict(L=470e-6, C=4.7e-6, dcr=0.08, r=12.0, l_load=20e-3),
    dict(L=1e-3, C=10e-6, dcr=0.05, r=50.0, rd=4.7, cd=22e-6),
    dict(L=1e-3, C=10e-6, rd=22.0),
    dict(L=2.2e-3, C=1e-6),
]


@pytest.mark.parametrize("c", CIRCUITS)
def test_transfer_against_scipy_freqs(c):
    f = np.geomspace(1.0, 1e6, 400)
    b, a = polys(**c)
    _, h_ref = signal.freqs(b, a, worN=2 * np.pi * f)
    h = flt.transfer(f, c["L"], c["C"], dcr=c.get("dcr", 0.0), load_resistance=c.get("r"),
                     load_inductance=c.get("l_load", 0.0), damping_resistance=c.get("rd"),
                     damping_capacitance=c.get("cd"))
    np.testing.assert_allclose(h, h_ref, rtol=1e-9, atol=1e-15)


def test_corner_and_q_by_hand():
    # f₀ = 1/(2π√(1 mH · 10 µF)) = 1/(2π · 1e-4) = 1591.55 Hz; Q = 10·√(10 µ/1 m) = 1.0
    assert flt.corner_frequency(1e-3, 10e-6) == pytest.approx(1591.549, rel=1e-6)
    assert flt.peaking_q(10.0, 1e-3, 10e-6) == pytest.approx(1.0)
    assert flt.peaking_q(100.0, 1e-3, 10e-6) == pytest.approx(10.0)


@pytest.mark.parametrize("r", [20.0, 100.0, 1000.0])
def test_peak_gain_of_the_loaded_filter(r):
    # Erickson & Maksimović ch. 8: |H|² = 1/((1 − x²)² + (x/Q)²); for Q > 1/√2 the maximum is
    # Q/√(1 − 1/(4Q²)) at x² = 1 − 1/(2Q²)
    L, C = 1e-3, 10e-6
    q = flt.peaking_q(r, L, C)
    g, f = flt.peak_gain(L, C, load_resistance=r)
    assert g == pytest.approx(q / math.sqrt(1 - 1 / (4 * q * q)), rel=1e-6)
    assert f == pytest.approx(flt.corner_frequency(L, C) * math.sqrt(1 - 1 / (2 * q * q)),
                              rel=1e-3)


def test_ripple_formulas_by_hand():
    # bipolar: V/(2·L·f_c) = 12 / (2 · 1 mH · 20 kHz) = 0.30 A
    assert flt.ripple_pp("spwm_bipolar", 12.0, 1e-3, 20e3, 0.8) == pytest.approx(0.30)
    # unipolar, M ≥ ½: V/(8·L·f_c) = 0.075 A; M = 0.3: 12·0.3·0.7/(2·1m·20k) = 0.063 A
    assert flt.ripple_pp("spwm_unipolar", 12.0, 1e-3, 20e3, 0.8) == pytest.approx(0.075)
    assert flt.ripple_pp("spwm_unipolar", 12.0, 1e-3, 20e3, 0.3) == pytest.approx(0.063)
    # level-shifted, M ≥ ½: V/(4·L·f_c) = 0.15 A
    assert flt.ripple_pp("spwm_level_shifted", 12.0, 1e-3, 20e3, 0.9) == pytest.approx(0.15)
    with pytest.raises(ValueError):
        flt.ripple_pp("square", 12.0, 1e-3, 20e3, 0.9)


def _max_ripple_from_spectrum(kind: str, index: float, fc: float) -> float:
    L, C = 1e-3, 100e-6  # corner 503 Hz, far below the carrier: output ripple negligible
    s = wf.synthesise(kind, V, F0, index=index, carrier=fc)
    r = flt.respond(s.freq, s.amp, L, C, load_resistance=10.0)
    hf = np.where(s.freq > fc / 2, r.i_inductor, 0)
    periods = round(fc / F0)
    it = wf.time_samples(hf, samples=periods * 128)
    per = it.reshape(periods, -1)  # one row per carrier period
    return float(np.max(per.max(axis=1) - per.min(axis=1)))


@pytest.mark.parametrize("kind,index,expect", [
    ("spwm_bipolar", 0.8, 12 / (2 * 1e-3 * 20e3)),
    ("spwm_unipolar", 0.8, 12 / (8 * 1e-3 * 20e3)),
    ("spwm_level_shifted", 0.8, 12 / (4 * 1e-3 * 20e3)),
])
def test_ripple_from_the_spectrum_matches_volt_second_balance(kind, index, expect):
    # two routes to the same figure: the FFT of the synthesised wave through the circuit, and
    # the volt-second balance V·d·(1−d)/(L·f) written out in test_ripple_formulas_by_hand
    assert _max_ripple_from_spectrum(kind, index, 20e3) == pytest.approx(expect, rel=0.02)


def test_square_wave_into_r_l_load_current_rms():
    # no filter; the exact periodic current of ±V into R-L (first-order solution):
    # i(t) = V/R·(1 − 2e^{−t/τ}/(1 + e^{−T/(2τ)})) over a half period, τ = L/R
    r, l = 2.0, 10e-3
    tau, half = l / r, 0.5 / F0
    def i(t):
        return V / r * (1 - 2 * math.exp(-t / tau) / (1 + math.exp(-half / tau)))
    ms, _ = integrate.quad(lambda t: i(t) ** 2, 0, half)
    i_rms = math.sqrt(ms / half)
    s = wf.synthesise("square", V, F0)
    resp = flt.respond(s.freq, s.amp, 0.0, 0.0, load_resistance=r, load_inductance=l)
    assert resp.i_load_rms == pytest.approx(i_rms, rel=1e-5)
    assert resp.i_inductor_rms == pytest.approx(i_rms, rel=1e-5)
    # the fundamental alone would understate it: (4V/π)/√2 / |R + jωL|
    i1 = 4 * V / math.pi / math.sqrt(2) / abs(complex(r, 2 * math.pi * F0 * l))
    assert i1 < 0.995 * i_rms
    # peak current: i(T/2) = V/R·tanh(T/(4τ)) (same solution at the half-period end)
    assert resp.i_inductor_peak == pytest.approx(V / r * math.tanh(half / (2 * tau)), rel=2e-3)


def test_fundamental_and_capacitor_voltage_through_filter_by_hand():
    # bipolar M = 0.8 into 1 mH / 10 µF / 10 Ω: V₁ at the load = M·V·|H(j2π·50)|
    L, C, r = 1e-3, 10e-6, 10.0
    w = 2 * math.pi * F0
    h = 1 / (1 + 1j * w * L * (1j * w * C + 1 / r))  # written out: 1/(1 + jωL(jωC + 1/R))
    s = wf.synthesise("spwm_bipolar", V, F0, index=0.8, carrier=20e3)
    resp = flt.respond(s.freq, s.amp, L, C, load_resistance=r)
    assert abs(resp.v_out[s.periods]) == pytest.approx(0.8 * V * abs(h), rel=1e-5)
    thd = wf.thd_band(s.freq, resp.v_out, F0)
    assert thd < 0.05
    # nearly sinusoidal: the capacitor's peak is √2·V_rms within the distortion
    assert resp.v_out_peak == pytest.approx(math.sqrt(2) * resp.v_out_rms, rel=2 * thd)
    # load current harmonics: the load sees V_out/R bin by bin
    assert resp.i_load_rms == pytest.approx(resp.v_out_rms / r, rel=1e-12)


def test_open_loop_output_by_hand():
    # 11.0 V at 12 V nominal, bus 10.5 … 14.4 V: 11·10.5/12 = 9.625 V (−12.5 %),
    # 11·14.4/12 = 13.2 V (+20 %) against an 11 V target
    lo, hi, dlo, dhi = flt.open_loop_output(11.0, 12.0, 10.5, 14.4, 11.0)
    assert (lo, hi) == (pytest.approx(9.625), pytest.approx(13.2))
    assert (dlo, dhi) == (pytest.approx(-0.125), pytest.approx(0.20))


def test_output_scales_with_the_bus():
    # the model is linear in V_bus, dead time included: check by two syntheses
    kw = dict(index=0.8, carrier=20e3, dead_time_high=1e-6, dead_time_low=1e-6)
    a = wf.synthesise("spwm_unipolar", 12.0, F0, **kw)
    b = wf.synthesise("spwm_unipolar", 14.4, F0, **kw)
    ra = flt.respond(a.freq, a.amp, 1e-3, 10e-6, load_resistance=10.0)
    rb = flt.respond(b.freq, b.amp, 1e-3, 10e-6, load_resistance=10.0)
    assert flt.open_loop_output(ra.v_out_rms, 12.0, 12.0, 14.4, 10.0)[1] == pytest.approx(
        rb.v_out_rms, rel=1e-12)


def test_index_for_rms_by_hand():
    # M = √2 · 8 / (12 · 1.05) = 0.8980
    assert flt.index_for_rms(8.0, 12.0, 1.05) == pytest.approx(0.89796, rel=1e-4)


def test_corner_for_thd_meets_target_and_matches_the_first_carrier_group():
    s = wf.synthesise("spwm_bipolar", V, F0, index=0.8, carrier=20e3)
    r = 10.0
    target = 0.03
    f_lc, L, C = flt.corner_for_thd(s.freq, s.amp, F0, target, z0=r, load_resistance=r)
    assert math.sqrt(L / C) == pytest.approx(r)
    assert flt.corner_frequency(L, C) == pytest.approx(f_lc)
    thd = wf.thd_band(s.freq, flt.transfer(s.freq, L, C, load_resistance=r) * s.amp, F0)
    assert thd == pytest.approx(target, rel=1e-3)
    # hand estimate: far above the corner |H| ≈ (f_LC/f)², so THD ≈ (f_LC/f_c)²·A₁/(M·V) with
    # A₁ the RMS sum of the first carrier group (Holmes & Lipo ch. 3), giving
    # f_LC ≈ f_c·√(target·M·V/A₁); the higher groups add a little, so the solved corner is
    # a few percent lower
    grp = (s.freq > 10e3) & (s.freq < 30e3)
    a1 = math.sqrt(float(np.sum(np.abs(s.amp[grp]) ** 2)))
    est = 20e3 * math.sqrt(target * 0.8 * V / a1)
    assert f_lc == pytest.approx(est, rel=0.1)
    assert f_lc < est


def test_carrier_for_thd_confirmed_by_a_new_synthesis():
    L, C, r = 1e-3, 10e-6, 10.0
    s = wf.synthesise("spwm_unipolar", V, F0, index=0.8, carrier=5e3)
    before = wf.thd_band(s.freq, flt.transfer(s.freq, L, C, load_resistance=r) * s.amp, F0)
    target = 0.01
    assert before > target
    fc = flt.carrier_for_thd(s.freq, s.amp, F0, 5e3, target, L, C, load_resistance=r)
    s2 = wf.synthesise("spwm_unipolar", V, F0, index=0.8, carrier=fc)
    after = wf.thd_band(s2.freq, flt.transfer(s2.freq, L, C, load_resistance=r) * s2.amp, F0)
    assert after == pytest.approx(target, rel=0.03)


def test_no_load_and_no_capacitor_cases_stay_finite():
    f = np.array([0.0, 50.0, 1e4])
    h = flt.transfer(f, 1e-3, 10e-6)
    assert np.all(np.isfinite(h)) and h[0] == 1.0
    assert np.all(flt.transfer(f, 0.0, 0.0, load_resistance=5.0) == 1.0)


def polys_esr(L, C, esr, dcr, r):
    """H(s) with a capacitor ESR: Z_p = (esr + 1/(sC)) ∥ R, so
    H = R(sC·esr + 1) / (s²LC(R + esr) + s(L + dcr·C(R + esr) + R·C·esr) + dcr + R)."""
    b = [R_ := r * C * esr, r]
    a = [L * C * (r + esr), L + dcr * C * (r + esr) + r * C * esr, dcr + r]
    del R_
    return b, a


@pytest.mark.parametrize("esr,dcr", [(0.0, 0.0), (0.05, 0.1), (0.5, 0.0)])
def test_transfer_with_capacitor_esr_against_scipy_freqs(esr, dcr):
    L, C, r = 1e-3, 10e-6, 20.0
    f = np.geomspace(10.0, 1e6, 300)
    b, a = polys_esr(L, C, esr, dcr, r)
    _, h_ref = signal.freqs(b, a, worN=2 * np.pi * f)
    h = flt.transfer(f, L, C, dcr=dcr, load_resistance=r, esr=esr)
    np.testing.assert_allclose(h, h_ref, rtol=1e-9)


def test_default_losses_are_the_stated_q_at_the_corner():
    # Q = ω₀L / r_L = 1/(ω₀ C ESR) with ω₀L = 1/(ω₀C) = √(L/C) = 10 Ω for 1 mH / 10 µF
    assert flt.default_dcr(1e-3, 10e-6) == pytest.approx(10.0 / flt.DEFAULT_INDUCTOR_Q)
    assert flt.default_esr(1e-3, 10e-6) == pytest.approx(10.0 / flt.DEFAULT_CAPACITOR_Q)
    # unloaded with those losses the peak is finite: Q_total = 10 / (0.2 + 0.05) = 40 (series
    # R-L-C at resonance, |H| ≈ Q for Q ≫ 1)
    g, _ = flt.peak_gain(1e-3, 10e-6, dcr=0.2, esr=0.05)
    assert math.isfinite(g) and g == pytest.approx(40.0, rel=2e-3)
