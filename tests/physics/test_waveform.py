"""Bridge output waveforms against closed forms and the double Fourier series.

Sources named beside each check:
* square wave: Fourier series b_n = 4V/(nπ), n odd (Mohan, Undeland & Robbins, Power
  Electronics, 3rd ed., 2003, ch. 8, square-wave operation); THD = √(π²/8 − 1) from
  Σ_{n odd} 1/n² = π²/8.
* quasi-square (voltage cancellation, notch half-angle α): b_n = (4V/(nπ))·cos(nα), n odd;
  V_rms = V·√(1 − 2α/π) (Mohan, Undeland & Robbins 2003, ch. 8 "output control by voltage
  cancellation"; the same series in Holmes & Lipo 2003 ch. 2).
* sine-triangle PWM sidebands: D. G. Holmes and T. A. Lipo, Pulse Width Modulation for Power
  Converters, 2003, ch. 3 (naturally sampled two-level and three-level full bridge), computed
  here with scipy.special.jv; level-shifted carriers by Holmes & Lipo's double-Fourier
  integral over the unit cell (ch. 3 method, ch. 5 level-shifted PWM) done with scipy.integrate.
* over-modulation: the describing function of a saturation (J.-J. E. Slotine and W. Li,
  Applied Nonlinear Control, 1991, §5.3), applied to the local average of the PWM.
* dead time: the average error 2·t_d·f_c·V_bus opposing the current (Mohan, Undeland &
  Robbins 2003, §8-6, section number from memory), whose fundamental is (4/π) times it.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import integrate
from scipy.special import jv

from reviewer.physics import waveform as wf

V = 12.0
F0 = 50.0


def bin_at(spec: wf.Spectrum, order: float) -> complex:
    k = round(order * spec.periods)
    assert spec.freq[k] == pytest.approx(order * spec.f0)
    return complex(spec.amp[k])


# --- square and quasi-square ----------------------------------------------------------------

def test_square_wave_fundamental_and_thd():
    s = wf.synthesise("square", V, F0)
    # Mohan et al. 2003 ch. 8: fundamental peak 4V/π
    assert abs(s.fundamental) == pytest.approx(4 * V / math.pi, rel=1e-7)
    # Σ_{n odd ≥ 3} (1/n)² = π²/8 − 1 → THD = √(π²/8 − 1) = 48.34 %
    assert s.thd == pytest.approx(math.sqrt(math.pi ** 2 / 8 - 1), rel=1e-6)
    assert s.thd == pytest.approx(0.4834, abs=1e-4)
    assert s.v_rms == pytest.approx(V)
    # individual harmonics 4V/(nπ) for odd n, zero for even n
    for n in range(2, 60):
        expect = 4 * V / (n * math.pi) if n % 2 else 0.0
        assert abs(bin_at(s, n)) == pytest.approx(expect, abs=1e-6 * V)


def test_square_wave_thd_to_the_40th_order():
    s = wf.synthesise("square", V, F0)
    # EN 50160 counts harmonics to the 40th: √(Σ_{n=3,5..39} 1/n²)
    expect = math.sqrt(sum(1 / n ** 2 for n in range(3, 40, 2)))
    assert wf.thd_band(s.freq, s.amp, F0, max_order=40) == pytest.approx(expect, rel=1e-6)
    # the whole resolved band (to order 32 767) misses only the tail Σ_{n>32767} 1/n² ≈ 1.5e-5
    assert wf.thd_band(s.freq, s.amp, F0) == pytest.approx(s.thd, rel=1e-4)


def qs_closed_form_thd(alpha: float) -> float:
    # Mohan et al. 2003 ch. 8: V_rms² = V²(1 − 2α/π); V₁ = (4V/π)cos α / √2
    rms2 = 1 - 2 * alpha / math.pi
    v1sq = 8 / math.pi ** 2 * math.cos(alpha) ** 2
    return math.sqrt(rms2 / v1sq - 1)


@pytest.mark.parametrize("deg", [0.0, 10.0, 18.0, 23.22, 30.0, 36.0, 45.0, 60.0])
def test_quasi_square_against_closed_form(deg):
    a = math.radians(deg)
    s = wf.synthesise("quasi_square", V, F0, notch=a)
    assert abs(s.fundamental) == pytest.approx(4 * V / math.pi * math.cos(a), rel=1e-6)
    assert s.v_rms == pytest.approx(V * math.sqrt(1 - 2 * a / math.pi), rel=1e-12)
    assert s.thd == pytest.approx(qs_closed_form_thd(a), rel=1e-5)
    for n in (3, 5, 7, 9, 11, 13):
        assert abs(bin_at(s, n)) == pytest.approx(abs(4 * V / (n * math.pi) * math.cos(n * a)),
                                                  abs=1e-6 * V)


def test_quasi_square_minimum_and_thirty_degrees():
    # closed form minimised numerically: 28.96 % at 23.22° (DOMAIN §3.9 exact figures)
    grid = np.radians(np.linspace(15, 30, 15001))
    vals = [qs_closed_form_thd(a) for a in grid]
    i = int(np.argmin(vals))
    assert math.degrees(grid[i]) == pytest.approx(23.22, abs=0.01)
    s = wf.synthesise("quasi_square", V, F0, notch=math.radians(23.22))
    assert s.thd == pytest.approx(0.2896, abs=5e-5)
    s30 = wf.synthesise("quasi_square", V, F0, notch=math.radians(30))
    assert s30.thd == pytest.approx(0.3108, abs=5e-5)
    # cos(3·30°) = 0: the third harmonic vanishes
    assert abs(bin_at(s30, 3)) < 1e-9 * V


# --- sine-triangle PWM ----------------------------------------------------------------------

R = 101  # carrier ratio: sideband groups m·101 ± n never overlap for |n| < 50


@pytest.mark.parametrize("m_index", [0.5, 0.8, 1.0])
def test_two_level_sidebands_against_double_fourier_series(m_index):
    s = wf.synthesise("spwm_bipolar", V, F0, index=m_index, carrier=R * F0)
    assert abs(s.fundamental) == pytest.approx(m_index * V, rel=1e-5)
    for m in range(1, 5):
        for n in range(-9, 10):
            # Holmes & Lipo 2003 ch. 3: (4V/π)(1/m) J_n(mπM/2) sin((m+n)π/2)
            expect = abs(4 * V / math.pi / m * jv(n, m * math.pi * m_index / 2)
                         * math.sin((m + n) * math.pi / 2))
            assert abs(bin_at(s, m * R + n)) == pytest.approx(expect, abs=1e-5 * V), (m, n)
    # natural sampling: no baseband harmonics
    for n in range(2, 40):
        assert abs(bin_at(s, n)) < 2e-5 * V


@pytest.mark.parametrize("m_index", [0.5, 0.8, 1.0])
def test_three_level_sidebands_against_double_fourier_series(m_index):
    s = wf.synthesise("spwm_unipolar", V, F0, index=m_index, carrier=R * F0)
    assert abs(s.fundamental) == pytest.approx(m_index * V, rel=1e-5)
    for m in range(1, 4):
        for n in range(-6, 8):
            # Holmes & Lipo 2003 ch. 3: (4V/π)(1/(2m)) J_{2n−1}(mπM) cos((m+n−1)π)
            expect = abs(4 * V / math.pi / (2 * m) * jv(2 * n - 1, m * math.pi * m_index))
            assert abs(bin_at(s, 2 * m * R + 2 * n - 1)) == pytest.approx(
                expect, abs=1e-5 * V), (m, n)
    # odd carrier groups cancel between the legs
    for n in range(-10, 11):
        assert abs(bin_at(s, R + n)) < 2e-5 * V
        assert abs(bin_at(s, 3 * R + n)) < 2e-5 * V


def level_shifted_pd_coefficient(m: int, n: int, m_index: float) -> float:
    """Holmes & Lipo's double Fourier integral (ch. 3) over the unit cell of PD carriers.

    x = ω_c t, carrier c(x) = 1 − 2|x|/π on [−π, π]; y = ω₀t, r = M cos y. Upper carrier
    (c+1)/2: leg A on where r > (c+1)/2 ⇔ |x| > π(1 − r) (r > 0). Lower carrier (c−1)/2:
    leg B on where r < (c−1)/2 ⇔ |x| < −πr (r < 0). The x integral is closed-form:
    ∫_{|x|>a} e^{jmx} dx = −2 sin(ma)/m; ∫_{|x|<b} e^{jmx} dx = 2 sin(mb)/m.
    C_mn = (1/2π²)∫∫ f e^{j(mx+ny)} dx dy; f is even in x and y, so C_mn is real and the
    component is C_mn·cos(mx + ny).
    """
    def g(y: float) -> float:
        r = m_index * math.cos(y)
        if r > 0:
            return -2 * math.sin(m * math.pi * (1 - min(r, 1))) / m
        return -(2 * math.sin(m * math.pi * min(-r, 1)) / m)

    # g is smooth on each side of the zero crossing; QUADPACK's cosine-weighted rule (QAWO)
    # keeps the oscillatory integral accurate for large n
    val = sum(integrate.quad(g, lo, hi, weight="cos", wvar=n, limit=200)[0]
              for lo, hi in ((0.0, math.pi / 2), (math.pi / 2, math.pi)))
    return val / math.pi ** 2


@pytest.mark.parametrize("m_index", [0.4, 0.9])
def test_level_shifted_pd_against_unit_cell_integral(m_index):
    s = wf.synthesise("spwm_level_shifted", V, F0, index=m_index, carrier=R * F0)
    assert abs(s.fundamental) == pytest.approx(m_index * V, rel=1e-5)
    # the zero-crossing kink makes the PD coefficients fall only as ~1/n², so far sidebands of
    # other groups land on the same order h: sum C_{m,n} over every m·R + n = ±h (m ≤ 9)
    for m in range(1, 4):
        for n in range(-6, 7):
            h = m * R + n
            expect = V * abs(sum(level_shifted_pd_coefficient(mm, h - mm * R, m_index)
                                 + level_shifted_pd_coefficient(mm, -h - mm * R, m_index)
                                 for mm in range(1, 10)))
            assert abs(bin_at(s, h)) == pytest.approx(expect, abs=1e-5 * V), (m, n)


def test_level_shifted_pod_at_twice_the_carrier_is_unipolar():
    # |c(t)| of a ±1 triangle is a 0…1 triangle at twice its frequency with the same peak
    # at t = 0, so unipolar PWM = phase-opposition level-shifted carriers at 2·f_c (identity
    # shown in the derivation of Holmes & Lipo 2003 ch. 5 for three-level legs).
    u = wf.synthesise("spwm_unipolar", V, F0, index=0.83, carrier=60 * F0)
    p = wf.synthesise("spwm_level_shifted", V, F0, index=0.83, carrier=120 * F0,
                      disposition="pod", samples=len(u.freq) * 2)
    np.testing.assert_allclose(np.abs(p.amp), np.abs(u.amp), atol=1e-9 * V)
    assert p.v_rms == pytest.approx(u.v_rms, rel=1e-12)


@pytest.mark.parametrize("kind", wf.PWM_KINDS)
@pytest.mark.parametrize("m_index", [0.1, 0.3, 0.6, 0.95, 1.0])
def test_fundamental_is_m_times_v(kind, m_index):
    # Holmes & Lipo 2003 ch. 3: naturally sampled, M ≤ 1: fundamental = M·V_bus
    s = wf.synthesise(kind, V, F0, index=m_index, carrier=400 * F0)
    assert abs(s.fundamental) == pytest.approx(m_index * V, rel=1e-5)


def test_carrier_not_a_multiple_of_the_output():
    # 100.5 = 201/2: two output periods (201 carrier periods) make the common window
    s = wf.synthesise("spwm_bipolar", V, F0, index=0.7, carrier=100.5 * F0)
    assert s.periods == 2 and s.carrier == pytest.approx(100.5 * F0)
    assert abs(s.fundamental) == pytest.approx(0.7 * V, rel=1e-5)
    for m, n in [(1, 0), (1, 2), (2, 1), (2, -3), (3, 0)]:
        expect = abs(4 * V / math.pi / m * jv(n, m * math.pi * 0.7 / 2))
        assert abs(bin_at(s, m * 100.5 + n)) == pytest.approx(expect, abs=1e-5 * V)
    # an awkward ratio is approximated by p/q with q ≤ 8: the carrier moves by < f0/q²
    s2 = wf.synthesise("spwm_unipolar", V, 49.7, index=0.7, carrier=20_000.0)
    assert s2.periods <= 8
    assert abs(s2.carrier - 20_000.0) < 49.7 / s2.periods ** 2
    assert abs(s2.fundamental) == pytest.approx(0.7 * V, rel=1e-4)


def test_overmodulation_follows_the_saturation_describing_function():
    # local average = V·sat(M cos θ); its fundamental (Slotine & Li 1991 §5.3):
    # (4V/π)[sin θ₁ + M(π/4 − θ₁/2 − sin 2θ₁/4)], θ₁ = arccos(1/M)
    for m_index in (1.2, 1.5, 2.5):
        t1 = math.acos(1 / m_index)
        expect = 4 * V / math.pi * (math.sin(t1) + m_index * (math.pi / 4 - t1 / 2
                                                               - math.sin(2 * t1) / 4))
        s = wf.synthesise("spwm_bipolar", V, F0, index=m_index, carrier=400 * F0)
        assert abs(s.fundamental) == pytest.approx(expect, rel=2e-4)
    # far over-modulated it becomes a square wave: 4V/π
    s = wf.synthesise("spwm_bipolar", V, F0, index=100.0, carrier=400 * F0)
    assert abs(s.fundamental) == pytest.approx(4 * V / math.pi, rel=1e-3)


# --- dead time and pulses -------------------------------------------------------------------

@pytest.mark.parametrize("kind", ["spwm_bipolar", "spwm_unipolar"])
@pytest.mark.parametrize("lag", [0.0, 0.6])
def test_dead_time_error_opposes_the_current(kind, lag):
    fc, td, m_index = 20_000.0, 1e-6, 0.8
    s = wf.synthesise(kind, V, F0, index=m_index, carrier=fc, dead_time_high=td,
                      dead_time_low=td, current_lag=lag)
    # hand calculation: error = −2·t_d·f_c·V·sign(i) (0.48 V here); its fundamental is 4/π of
    # that, in phase with the current cos(ω₀t − φ): V₁ = M·V − (4/π)·2·t_d·f_c·V·e^{−jφ}
    err = 4 / math.pi * 2 * td * fc * V
    expect = m_index * V - err * complex(math.cos(lag), -math.sin(lag))
    assert abs(s.fundamental - expect) < 0.01 * err
    # without dead time the fundamental is M·V
    s0 = wf.synthesise(kind, V, F0, index=m_index, carrier=fc, current_lag=lag)
    assert abs(s0.fundamental - m_index * V) < 1e-4


def test_dead_time_with_only_one_edge_delayed():
    # resistive current, dead time only before high-side turn-on: leg A loses t_d when i > 0,
    # leg B (current −i) loses nothing then but gains nothing either; when i < 0 the roles
    # swap: the error is t_d·f_c·V per carrier period (half the symmetric case).
    fc, td = 20_000.0, 1e-6
    s = wf.synthesise("spwm_bipolar", V, F0, index=0.8, carrier=fc, dead_time_high=td)
    err = 4 / math.pi * td * fc * V
    assert abs(s.fundamental - (0.8 * V - err)) < 0.01 * err


def test_short_pulse_fraction_by_hand():
    # bipolar leg: off-gap = T_c(1 − M cos θ)/2, on-pulse = T_c(1 + M cos θ)/2. With M = 1 the
    # off-gap is shorter than t_min where cos θ > 1 − 2 t_min f_c, i.e. over a fraction
    # arccos(1 − 2 t_min f_c)/π of the carrier periods, and likewise the on-pulse near the
    # negative peak; each carrier period has one of each per leg, so the fraction of all
    # pulses is arccos(0.92)/π = 0.1282 for t_min = 2 µs, f_c = 20 kHz.
    s = wf.synthesise("spwm_bipolar", V, F0, index=1.0, carrier=20_000.0)
    expect = math.acos(1 - 2 * 2e-6 * 20_000.0) / math.pi
    assert wf.short_pulse_fraction(s, 2e-6) == pytest.approx(expect, abs=2 / 400)
    assert wf.short_pulse_fraction(s, 0.0) == 0.0


def test_min_pulse_dropping_pushes_towards_the_square_wave():
    # Dropping pulses shorter than t_min = 2 µs (M = 1, f_c = 20 kHz): near the positive peak
    # leg A's off-gaps T_c(1 − cos θ)/2 are filled and leg B's equal on-pulses dropped, so
    # the local average rises by V(1 − cos θ) for |θ| < θ₁ = arccos(1 − 2 t_min f_c), and
    # symmetrically at the negative peak. Fundamental of that error (hand integration):
    # ΔV₁ = (4V/π)·[sin θ₁ − θ₁/2 − sin(2θ₁)/4] = 0.157 V.
    s = wf.synthesise("spwm_bipolar", V, F0, index=1.0, carrier=20_000.0, min_pulse=2e-6)
    s0 = wf.synthesise("spwm_bipolar", V, F0, index=1.0, carrier=20_000.0)
    t1 = math.acos(1 - 2 * 2e-6 * 20_000.0)
    expect = 4 * V / math.pi * (math.sin(t1) - t1 / 2 - math.sin(2 * t1) / 4)
    assert abs(s.fundamental) - abs(s0.fundamental) == pytest.approx(expect, rel=0.03)


def test_time_samples_rebuild_the_square_wave():
    s = wf.synthesise("square", V, F0)
    x = wf.time_samples(s.amp)
    n = x.size
    # away from the edges at ±T/4 the band-limited wave sits at ±V (Gibbs ripple at edges)
    t = np.arange(n) / n
    mask = (np.abs(t - 0.25) > 0.01) & (np.abs(t - 0.75) > 0.01)
    expect = np.where((t < 0.25) | (t > 0.75), V, -V)
    np.testing.assert_allclose(x[mask], expect[mask], atol=0.01 * V)


def test_largest_harmonics_of_two_level_pwm():
    s = wf.synthesise("spwm_bipolar", V, F0, index=0.8, carrier=R * F0)
    top = wf.largest_harmonics(s.freq, s.amp, F0, count=3)
    # Holmes & Lipo: (m, n) = (1, 0) J₀(0.4π), then (2, ±1) J₁(0.8π)/2
    assert top[0].order == pytest.approx(R)
    assert top[0].amplitude == pytest.approx(4 * V / math.pi * abs(jv(0, 0.4 * math.pi)), rel=1e-4)
    assert {round(h.order) for h in top[1:]} == {2 * R - 1, 2 * R + 1}
    assert top[1].relative == pytest.approx(4 / math.pi * abs(jv(1, 0.8 * math.pi)) / 2 / 0.8,
                                            rel=1e-3)


def test_index_for_fundamental():
    # no dead time: the linear law M = V₁/(gain·V) (Holmes & Lipo ch. 3)
    m = wf.index_for_fundamental(0.6 * V, "spwm_bipolar", V, F0, carrier=20_000.0)
    assert m == pytest.approx(0.6, rel=1e-5)
    # with dead time the index rises by the error's fundamental (hand: (4/π)·2 t_d f_c)
    m2 = wf.index_for_fundamental(0.6 * V, "spwm_bipolar", V, F0, carrier=20_000.0,
                                  dead_time_high=1e-6, dead_time_low=1e-6)
    assert m2 == pytest.approx(0.6 + 4 / math.pi * 2 * 1e-6 * 20_000.0, rel=2e-3)
    # beyond the square wave's 4V/π nothing reaches it
    assert wf.index_for_fundamental(1.3 * V, "spwm_bipolar", V, F0, carrier=20_000.0) == math.inf


def test_fundamental_of_edges_closed_forms():
    from reviewer.physics.pattern import bridge_events

    # square wave: fundamental 4/π per volt (Mohan, Undeland & Robbins 2003, ch. 8)
    a1 = wf.fundamental_of(bridge_events("square", F0))
    assert a1 == pytest.approx(4 / math.pi, rel=1e-12)
    # quasi-square: (4/π)·cos α
    a1 = wf.fundamental_of(bridge_events("quasi_square", F0, notch=0.5))
    assert a1 == pytest.approx(4 / math.pi * math.cos(0.5), rel=1e-12)
    # sine PWM in the linear range: exactly M (Holmes & Lipo 2003, ch. 3)
    for kind in ("spwm_bipolar", "spwm_unipolar"):
        a1 = wf.fundamental_of(bridge_events(kind, F0, index=0.7, carrier=20 * F0 + 7))
        assert a1 == pytest.approx(0.7, rel=1e-9)


@pytest.mark.parametrize("kind, opts", [
    ("spwm_bipolar", dict(index=0.9, carrier=16_000.0)),
    ("spwm_unipolar", dict(index=1.2, carrier=20_000.0)),
    ("spwm_level_shifted", dict(index=0.8, carrier=10_000.0)),
    ("quasi_square", dict(notch=0.4)),
])
def test_fundamental_of_edges_equals_the_synthesised_bin(kind, opts):
    from reviewer.physics.pattern import bridge_events

    opts = dict(opts, dead_time_high=500e-9, dead_time_low=700e-9, current_lag=0.4)
    spec = wf.synthesise(kind, 1.0, F0, **opts)
    a1 = wf.fundamental_of(bridge_events(kind, F0, **opts))
    assert abs(a1 - spec.fundamental) < 1e-10


def test_indices_for_several_buses_equal_one_solve_each():
    opts = dict(carrier=20_000.0, dead_time_high=1e-6, dead_time_low=1.5e-6, current_lag=0.3)
    buses = (10.0, 12.0, 12.0, 15.0, 4.0)
    got = wf.indices_for_fundamental(0.6 * V, "spwm_unipolar", buses, F0, gain=0.97, **opts)
    for bus, m in zip(buses, got):
        alone = wf.index_for_fundamental(0.6 * V, "spwm_unipolar", bus, F0, gain=0.97, **opts)
        if math.isinf(alone):
            assert math.isinf(m)  # 7.2 V from a 4 V bus: beyond the square wave's 4/π · 4 V
            continue
        assert m == pytest.approx(alone, rel=1e-5)
        spec = wf.synthesise("spwm_unipolar", bus, F0, index=m, **opts)
        assert 0.97 * abs(spec.fundamental) == pytest.approx(0.6 * V, rel=1e-6)
    assert math.isinf(got[-1])


def test_index_on_a_step_of_the_fundamental_is_the_smallest_that_reaches_it():
    # Near the linear range's end, pulses no longer than the dead time vanish one by one, so
    # the fundamental against the index climbs in small steps; a target on a step has no exact
    # index, and the answer must be the smallest index that reaches it, not wherever the
    # iteration stopped.
    from reviewer.physics.pattern import bridge_events

    opts = dict(carrier=20_000.0, dead_time_high=500e-9, dead_time_low=500e-9,
                current_lag=0.17)

    def g(m: float) -> float:
        return abs(wf.fundamental_of(bridge_events("spwm_unipolar", F0, index=m, **opts)))

    ms = np.linspace(1.0, 1.03, 3001)
    gs = np.array([g(m) for m in ms])
    k = int(np.argmax(np.diff(gs)))
    assert gs[k + 1] - gs[k] > 1e-5  # a step, far beyond the solver's tolerance
    target = 0.5 * (gs[k] + gs[k + 1])
    m = wf.index_for_fundamental(target * V, "spwm_unipolar", V, F0, **opts)
    assert g(m) >= target * (1 - 1e-6)
    assert g(m - 2e-6 * m) < target
    assert ms[k] <= m <= ms[k + 1]


def test_rejects_bad_input():
    with pytest.raises(ValueError):
        wf.synthesise("spwm_bipolar", V, F0, index=0.8)
    with pytest.raises(ValueError):
        wf.synthesise("quasi_square", V, F0, notch=2.0)
    with pytest.raises(ValueError):
        wf.synthesise("spwm_bipolar", V, F0, index=0.8, carrier=3 * F0)
    with pytest.raises(ValueError):
        wf.synthesise("triangle", V, F0)  # type: ignore[arg-type]
