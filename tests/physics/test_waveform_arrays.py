"""The array paths of the waveform physics against the scalar ones, element by element.

:func:`reviewer.physics.waveform.fundamentals` builds many switching patterns at once
(:mod:`reviewer.physics.edges`); each element must equal the scalar path, the closed-form
Fourier coefficient of :func:`reviewer.physics.pattern.bridge_events` (itself tested against
numpy's FFT of the synthesised waveform in test_waveform.py), to rounding. The lockstep index
solve must give what one solve per element gives, and reach its target: checked against the
fundamental bin of numpy's FFT of the synthesised waveform.
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.physics import edges
from reviewer.physics import waveform as wf
from reviewer.physics.pattern import bridge_events

F0 = 50.0


def scalar(kind, m, fc, dh, dl, lag, mp):
    return abs(wf.fundamental_of(bridge_events(kind, F0, index=m, carrier=fc, dead_time_high=dh,
                                               dead_time_low=dl, current_lag=lag,
                                               min_pulse=mp)))


@pytest.mark.parametrize("kind", ["spwm_bipolar", "spwm_unipolar", "spwm_level_shifted"])
@pytest.mark.parametrize("seed", range(4))
def test_fundamentals_equal_the_scalar_path(kind, seed):
    rng = np.random.default_rng(seed)
    fc = F0 * float(rng.choice([20.0, 97.3, 400.0]))
    gain_max = 2.0 if kind == "spwm_level_shifted" else 1.0
    top = min(3.0, 0.85 * 2 * fc / F0 / (math.pi * gain_max))
    n = 24
    # linear range, the end of it and over-modulation, each with dead times from none to
    # long enough to swallow pulses, and a minimum pulse or none
    m = np.concatenate([rng.uniform(0.0, 1.0, 8), rng.uniform(0.95, 1.1, 8),
                        rng.uniform(1.0, top, 8)])
    dh = float(rng.choice([0.0, 1e-7, 5e-7, 5e-6])) * rng.uniform(0.5, 1.5, n)
    dl = dh * rng.uniform(0.5, 1.5, n)
    lag = rng.uniform(-1.6, 1.6, n)
    mp = float(rng.choice([0.0, 1e-6]))
    got = wf.fundamentals(kind, F0, index=m, carrier=fc, dead_time_high=dh, dead_time_low=dl,
                          current_lag=lag, min_pulse=mp)
    for i in range(n):
        assert got[i] == pytest.approx(scalar(kind, m[i], fc, dh[i], dl[i], lag[i], mp),
                                       rel=1e-12, abs=1e-12)


def test_a_swallowed_pulse_is_dropped_in_the_array_path():
    # A 5 µs dead time against 1.25 µs pulses at M = 0.95, 20 kHz, the current against the
    # voltage (lag 3 rad: the narrowest pulses start late and vanish): the array path drops
    # them as the scalar path's union does, and is exact (same value as the scalar path). At
    # M = 0.5 the narrowest pulse is 12.5 µs and survives.
    m = np.array([0.5, 0.95, 0.95])
    d = np.full(3, 5e-6)
    lag = np.full(3, 3.0)
    a, b, period, q = edges.commanded("spwm_bipolar", F0, m, 20_000.0)
    _, ok = edges.leg_fundamental(a, period, q, 1.0, 0.0, d, d, lag)
    assert ok.tolist() == [True, True, True]
    got = wf.fundamentals("spwm_bipolar", F0, index=m, carrier=20_000.0, dead_time_high=d,
                          dead_time_low=d, current_lag=lag)
    for i in range(3):
        assert got[i] == pytest.approx(scalar("spwm_bipolar", m[i], 20_000.0, 5e-6, 5e-6, 3.0,
                                              0.0), rel=1e-12)
    # pulses did vanish at M = 0.95 (fewer steps than commanded edges of both legs)
    ev = bridge_events("spwm_bipolar", F0, index=0.95, carrier=20_000.0, dead_time_high=5e-6,
                       dead_time_low=5e-6, current_lag=3.0)
    assert ev.times.size < a.shape[1] + b.shape[1]


def test_a_pattern_left_without_pulses_is_left_to_the_scalar_path():
    # Level-shifted carriers at M = 0.0027 and a 3 µs minimum pulse: every commanded pulse of
    # a leg is shorter than the minimum and dropped; the array path leaves such a row to the
    # scalar path (same value either way).
    m = np.array([0.5, 0.0026760647442163332, 0.5])
    dh, dl, lag = np.full(3, 3.197e-7), np.zeros(3), np.full(3, -2.2435524343903293)
    a, b, period, q = edges.commanded("spwm_level_shifted", F0, m, 1000.0)
    _, ok_a = edges.leg_fundamental(a, period, q, 1.0, 3e-6, dh, dl, lag)
    _, ok_b = edges.leg_fundamental(b, period, q, -1.0, 3e-6, dh, dl, lag)
    assert (ok_a & ok_b).tolist() == [True, False, True]
    got = wf.fundamentals("spwm_level_shifted", F0, index=m, carrier=1000.0, dead_time_high=dh,
                          dead_time_low=dl, current_lag=lag, min_pulse=3e-6)
    for i in range(3):
        assert got[i] == pytest.approx(scalar("spwm_level_shifted", m[i], 1000.0, dh[i], dl[i],
                                              lag[i], 3e-6), rel=1e-12, abs=1e-12)


@pytest.mark.parametrize("seed", range(12))
def test_long_dead_times_are_exact_in_the_array_path(seed):
    # Dead times up to 40 µs against carriers of 1 to 20 kHz, either current direction, with
    # and without a minimum pulse: pulses vanish and intervals run together. Every row equals
    # the scalar path, and nearly every row is computed by the array path itself.
    rng = np.random.default_rng(100 + seed)
    kind = ["spwm_bipolar", "spwm_unipolar", "spwm_level_shifted"][seed % 3]
    fc = F0 * float(rng.choice([20.0, 97.3, 400.0]))
    gain_max = 2.0 if kind == "spwm_level_shifted" else 1.0
    top = min(3.0, 0.85 * 2 * fc / F0 / (math.pi * gain_max))
    n = 16
    m = rng.uniform(0.05, top, n)
    base = float(rng.choice([1e-6, 5e-6, 2e-5]))
    dh, dl = base * rng.uniform(0, 2, n), base * rng.uniform(0, 2, n)
    lag = rng.uniform(-3.2, 3.2, n)
    mp = float(rng.choice([0.0, 1e-6]))
    a, b, period, q = edges.commanded(kind, F0, m, fc)
    _, ok_a = edges.leg_fundamental(a, period, q, 1.0, mp, dh, dl, lag)
    _, ok_b = edges.leg_fundamental(b, period, q, -1.0, mp, dh, dl, lag)
    assert (ok_a & ok_b).sum() >= n - 2
    got = wf.fundamentals(kind, F0, index=m, carrier=fc, dead_time_high=dh, dead_time_low=dl,
                          current_lag=lag, min_pulse=mp)
    for i in range(n):
        assert got[i] == pytest.approx(scalar(kind, m[i], fc, dh[i], dl[i], lag[i], mp),
                                       rel=1e-12, abs=1e-12)


def test_array_edges_refuse_what_the_scalar_path_refuses():
    with pytest.raises(ValueError):
        edges.commanded("square", F0, np.array([0.5]), 20_000.0)
    with pytest.raises(ValueError):
        edges.commanded("spwm_bipolar", F0, np.array([0.5]), 3 * F0)
    with pytest.raises(ValueError):
        edges.commanded("spwm_bipolar", F0, np.array([-0.1, 0.5]), 20_000.0)
    with pytest.raises(ValueError):
        edges.commanded("spwm_bipolar", F0, np.array([3.0]), 5 * F0)


@pytest.mark.parametrize("kind", ["spwm_bipolar", "spwm_unipolar"])
def test_indices_in_lockstep_equal_one_solve_each_and_reach_the_target(kind):
    rng = np.random.default_rng(7)
    n = 12
    gain = rng.uniform(0.9, 1.05, n)
    dh = rng.uniform(0.0, 1e-6, n)
    dl = dh * rng.uniform(0.8, 1.2, n)
    lag = rng.uniform(-0.5, 0.5, n)
    want = 0.8 * 12.0  # peak at the load [V]
    buses = (rng.uniform(8.0, 11.0, n), rng.uniform(12.0, 15.0, n))
    opts = dict(carrier=20_000.0, min_pulse=1e-6)
    lo, hi = wf.indices_for_fundamental(want, kind, buses, F0, gain=gain, dead_time_high=dh,
                                        dead_time_low=dl, current_lag=lag, **opts)
    for i in range(n):
        one = wf.indices_for_fundamental(want, kind, (buses[0][i], buses[1][i]), F0,
                                         gain=gain[i], dead_time_high=dh[i],
                                         dead_time_low=dl[i], current_lag=lag[i], **opts)
        assert (lo[i], hi[i]) == pytest.approx(one, rel=1e-9)
        for bus, m in zip((buses[0][i], buses[1][i]), (lo[i], hi[i])):
            spec = wf.synthesise(kind, bus, F0, index=m, dead_time_high=dh[i],
                                 dead_time_low=dl[i], current_lag=lag[i], **opts)
            # the solve's tolerance, 1e-10; the synthesised bin agrees to about 1e-12
            assert gain[i] * abs(spec.fundamental) >= want * (1 - 1e-9)
            if m > 0:  # and a slightly smaller index falls short
                spec = wf.synthesise(kind, bus, F0, index=m * (1 - 1e-7), dead_time_high=dh[i],
                                     dead_time_low=dl[i], current_lag=lag[i], **opts)
                assert gain[i] * abs(spec.fundamental) < want


def test_the_index_solve_counts_the_minimum_pulse():
    # Near the linear range's end, dropping pulses shorter than 2 µs changes the fundamental:
    # the index found with the minimum pulse reaches the target on the pattern the controller
    # emits (with the pulses dropped), the one found without it need not.
    opts = dict(carrier=20_000.0, dead_time_high=3e-7, dead_time_low=3e-7, current_lag=0.1)
    want = 0.97 * 12.0
    m_with = wf.index_for_fundamental(want, "spwm_unipolar", 12.0, F0, min_pulse=2e-6, **opts)
    m_without = wf.index_for_fundamental(want, "spwm_unipolar", 12.0, F0, **opts)
    spec = wf.synthesise("spwm_unipolar", 12.0, F0, index=m_with, min_pulse=2e-6, **opts)
    assert abs(spec.fundamental) == pytest.approx(want, rel=1e-9)
    assert m_with != pytest.approx(m_without, rel=1e-6)
