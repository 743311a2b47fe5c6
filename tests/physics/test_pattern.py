"""The switching pattern's figures against a direct numerical evaluation of its gate signals.

The gate signals of :func:`pattern.gate_signals` are sampled with numpy on a fine time grid and
the on-times, off-times, conduction shares and switched currents measured from the samples;
the pattern's closed forms and local-average integrals must agree with those measurements.
Hand-worked cases name their arithmetic.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from reviewer.physics import pattern as P
from reviewer.physics import thermal as th
from reviewer.physics import waveform as wf

F0 = 50.0


def _sampled(g: P.GateSignals, n: int = 2_000_000):
    t = (np.arange(n) + 0.5) / n * g.period
    return t, {k: v.state(t) for k, v in g.switches.items()}


def _runs(on: np.ndarray, dt: float) -> tuple[float, float]:
    """Longest on-run and shortest off-run of a sampled periodic 0/1 signal [s]."""
    on = on.astype(bool)
    falls = np.flatnonzero(np.roll(on, 1) & ~on)
    k = int(falls[0]) if falls.size else 0
    x = np.roll(on, -k)                     # starts where an off run starts
    edges = np.flatnonzero(np.diff(x.astype(int))) + 1
    pieces = np.split(x, edges)
    ons = [p.size for p in pieces if p[0]]
    offs = [p.size for p in pieces if not p[0]]
    return max(ons, default=0) * dt, min(offs, default=0) * dt


# --------------------------------------------------------------------------------------------
# Gate signals: timing
# --------------------------------------------------------------------------------------------

@pytest.mark.parametrize("kind", P.PWM_KINDS)
def test_gate_runs_match_sampled_signals(kind):
    g = P.gate_signals(kind, F0, index=0.85, carrier=20e3, dead_time_high=0.8e-6,
                       dead_time_low=0.5e-6)
    t, s = _sampled(g)
    dt = t[1] - t[0]
    for name in P.SWITCHES:
        on, off = _runs(s[name], dt)
        assert g.longest_on(name) == pytest.approx(on, abs=2 * dt)
        assert g.shortest_off(name) == pytest.approx(off, abs=2 * dt)
    # the two switches of a leg are never on together (dead time inserted), and both are off
    # for exactly the dead times: per carrier period 0.8 + 0.5 µs
    for leg in ("ab" if kind != "spwm_level_shifted" else ""):
        both = s[f"{leg}_high"] * s[f"{leg}_low"]
        assert not both.any()
        idle = 1.0 - s[f"{leg}_high"] - s[f"{leg}_low"]
        switching = g.switches[f"{leg}_high"].start.size
        assert idle.sum() * dt == pytest.approx(switching * 1.3e-6, rel=1e-3)


@pytest.mark.parametrize("kind, m", [("spwm_bipolar", 0.9), ("spwm_unipolar", 0.6),
                                     ("spwm_level_shifted", 0.9)])
def test_longest_on_and_refresh_bound_the_synthesised_gates(kind, m):
    fc = 20e3
    g = P.gate_signals(kind, F0, index=m, carrier=fc)
    bound = P.longest_on_time(kind, F0, index=m, f_carrier=fc)
    exact = max(g.longest_on("a_high"), g.longest_on("b_high"))
    # a bound over every carrier phase; the synthesised window comes within the reference's
    # change over a carrier period: (1 − cos(2π·50/20 k))·M/(2 f_c) ≈ 1e-4 relative
    assert exact <= bound * (1 + 1e-12)
    assert exact == pytest.approx(bound, rel=2e-3)
    refresh = P.shortest_refresh_time(kind, F0, index=m, f_carrier=fc)
    low = min(g.switches["a_low"].on_times().min(), g.switches["b_low"].on_times().min())
    assert low >= refresh * (1 - 1e-12)
    assert low == pytest.approx(refresh, rel=2e-2)


def test_level_shifted_on_time_by_hand():
    # Leg A's duty is M sin θ (Holmes & Lipo 2003, ch. 5): at M = 0.9, 20 kHz the longest
    # high-side pulse is 0.9/20 kHz = 45 µs (not (1 + 0.9)/2/20 kHz = 47.5 µs as two-level), the
    # shortest low-side one (1 − 0.9)/20 kHz = 5 µs.
    assert P.longest_on_time("spwm_level_shifted", F0, index=0.9, f_carrier=20e3) == \
        pytest.approx(45e-6)
    assert P.shortest_refresh_time("spwm_level_shifted", F0, index=0.9, f_carrier=20e3) == \
        pytest.approx(5e-6)


@pytest.mark.parametrize("zero", P.ZERO_STATES)
def test_stepped_on_times_by_hand_and_from_the_gates(zero):
    a, dead = math.radians(30), 2e-6
    # Square at 50 Hz: half a period, 10 ms; refresh 10 ms − 2 µs.
    assert P.longest_on_time("square", F0) == pytest.approx(10e-3)
    assert P.shortest_refresh_time("square", F0, dead) == pytest.approx(10e-3 - dead)
    # Quasi-square, α = 30°: zero state on the low sides → high on (180 − 60)/360 · 20 ms =
    # 6.667 ms, low on (180 + 60)/360 · 20 ms = 13.333 ms; phase-shifted legs → 10 ms each.
    t_on = P.longest_on_time("quasi_square", F0, a, zero_state=zero)
    t_ref = P.shortest_refresh_time("quasi_square", F0, dead, a, zero_state=zero)
    hand_on = 20e-3 / 3 if zero == "low_sides" else 10e-3
    hand_ref = 40e-3 / 3 if zero == "low_sides" else 10e-3
    assert t_on == pytest.approx(hand_on)
    assert t_ref == pytest.approx(hand_ref - dead)
    g = P.gate_signals("quasi_square", F0, notch=a, zero_state=zero, dead_time_low=dead)
    for leg in "ab":
        assert g.longest_on(f"{leg}_high") == pytest.approx(t_on, rel=1e-12)
        assert g.shortest_on(f"{leg}_low") == pytest.approx(t_ref, rel=1e-12)


def test_zero_states_give_the_same_bridge_voltage():
    a = math.radians(23)
    s1 = wf.synthesise("quasi_square", 24.0, F0, notch=a, zero_state="low_sides")
    s2 = wf.synthesise("quasi_square", 24.0, F0, notch=a, zero_state="phase_shifted")
    assert np.allclose(s1.amp, s2.amp, atol=1e-9)
    # fundamental of quasi-square: (4/π)·V·cos α (Mohan, Undeland & Robbins 2003, ch. 8)
    assert abs(s1.fundamental) == pytest.approx(4 / math.pi * 24.0 * math.cos(a), rel=1e-6)
    # with dead time too: leg A falling at π − α (zero state on the low sides) and leg B rising
    # there (phase-shifted) are delayed under the same current sign
    d1 = wf.synthesise("quasi_square", 24.0, F0, notch=a, zero_state="low_sides",
                       dead_time_high=50e-6, dead_time_low=50e-6, current_lag=0.1)
    d2 = wf.synthesise("quasi_square", 24.0, F0, notch=a, zero_state="phase_shifted",
                       dead_time_high=50e-6, dead_time_low=50e-6, current_lag=0.1)
    assert np.allclose(d1.amp, d2.amp, atol=1e-9)
    assert abs(d1.fundamental) < abs(s1.fundamental)


# --------------------------------------------------------------------------------------------
# Currents per switch
# --------------------------------------------------------------------------------------------

CASES = [("spwm_bipolar", 0.8, 0.35, "low_sides"), ("spwm_unipolar", 0.8, 0.35, "low_sides"),
         ("spwm_level_shifted", 0.8, 0.35, "low_sides"), ("spwm_level_shifted", 1.0, 0.0, "low_sides"),
         ("spwm_bipolar", 1.15, 0.2, "low_sides"), ("square", 1.0, 0.6, "low_sides"),
         ("quasi_square", 1.0, 0.6, "low_sides"), ("quasi_square", 1.0, 0.6, "phase_shifted")]


@pytest.mark.parametrize("kind, m, phi, zero", CASES)
def test_conduction_against_sampled_gates(kind, m, phi, zero):
    a = math.radians(25)
    g = P.gate_signals(kind, F0, index=m, carrier=20e3, notch=a, zero_state=zero)
    t, s = _sampled(g)
    i = np.cos(2 * math.pi * F0 * t - phi)          # leg A's current, out of the leg
    cur = {"a_high": i, "a_low": -i, "b_high": -i, "b_low": i}
    c = P.conduction(kind, 1.0, phi, index=m, notch=a, zero_state=zero)
    shares = P.on_share(kind, index=m, notch=a, zero_state=zero)
    for name in P.SWITCHES:
        rms = math.sqrt(np.mean(s[name] * cur[name] ** 2))
        mean = np.mean(s[name] * cur[name])
        assert c.rms[name] == pytest.approx(rms, abs=2e-3)
        assert c.mean[name] == pytest.approx(mean, abs=2e-3)
        assert shares[name] == pytest.approx(np.mean(s[name]), abs=2e-3)


def test_level_shifted_low_sides_carry_more_by_hand():
    # M = 1, φ = 0: high side of A on for sin θ of the positive half cycle only,
    # I²_rms = (1/2π)∫₀^π sin³θ dθ = (1/2π)(4/3) → 0.4607·I_pk; low side the rest of the mean
    # square ½: √(½ − 2/(3π)) = 0.5365·I_pk. Two-level gives I_pk/2 to both.
    c = th.switch_currents("spwm_level_shifted", 10.0, 0.0, index=1.0)
    assert c.high_rms == pytest.approx(10 * math.sqrt(2 / (3 * math.pi)), rel=1e-9)
    assert c.low_rms == pytest.approx(10 * math.sqrt(0.5 - 2 / (3 * math.pi)), rel=1e-9)
    b = th.switch_currents("spwm_bipolar", 10.0, 0.0, index=1.0)
    assert b.high_rms == pytest.approx(5.0) and b.low_rms == pytest.approx(5.0)


def _switched_from_gates(g: P.GateSignals, phi: float, side: str) -> tuple[float, float]:
    """Hard-switched edges measured on the gate signals: share of carrier periods and mean
    current per carrier period (turn-on and turn-off averaged), the larger leg."""
    w0 = 2 * math.pi * F0
    periods = round(g.carrier * g.period)
    best = (0.0, 0.0)
    for leg, sign in (("a", 1.0), ("b", -1.0)):
        iv = g.switches[f"{leg}_{side}"]
        way = 1.0 if side == "high" else -1.0      # the current this device hard-switches
        edges = np.concatenate([iv.start, iv.end])
        i_edge = way * sign * np.cos(w0 * edges - phi)
        hard = i_edge > 0
        frac = np.count_nonzero(hard) / (2 * periods)
        mean = np.sum(np.where(hard, i_edge, 0.0)) / (2 * periods)
        best = max(best, (frac, mean), key=lambda x: x[1])
    return best


@pytest.mark.parametrize("kind", P.PWM_KINDS)
@pytest.mark.parametrize("phi", [0.0, 0.5, 1.1])
def test_switched_current_per_device_against_gate_edges(kind, phi):
    m = 0.8
    g = P.gate_signals(kind, F0, index=m, carrier=20e3)
    for side in ("high", "low"):
        frac, mean = _switched_from_gates(g, phi, side)
        h = P.hard_switching(kind, 1.0, phi, index=m, side=side)
        assert h.current == pytest.approx(mean, rel=0.01, abs=1e-4)
        assert h.fraction == pytest.approx(frac, abs=0.01)
    if kind == "spwm_level_shifted":
        # hand: I_pk(1 ± cos φ)/(2π): at φ = 0.5, 0.2988 (high) and 0.0195 (low) per ampere
        assert P.hard_switching(kind, 1.0, phi, index=m, side="high").current == \
            pytest.approx((1 + math.cos(phi)) / (2 * math.pi), rel=1e-9)
        assert P.hard_switching(kind, 1.0, phi, index=m, side="low").current == \
            pytest.approx((1 - math.cos(phi)) / (2 * math.pi), rel=1e-9, abs=1e-15)
    else:
        assert P.hard_switching(kind, 1.0, phi, index=m).current == pytest.approx(1 / math.pi)


def test_narrow_pulse_fraction_against_gate_pulses():
    fc, t_min = 20e3, 1.2e-6
    for kind, m in (("spwm_bipolar", 0.97), ("spwm_unipolar", 0.97), ("spwm_level_shifted", 0.9)):
        g = P.gate_signals(kind, F0, index=m, carrier=fc)
        periods = round(fc * g.period)
        tc = g.period / periods
        short = np.zeros(periods, dtype=bool)
        for leg in "ab":
            iv = g.switches[f"{leg}_high"]
            for lo, length in ((iv.start, iv.end - iv.start),
                               (iv.end, P.gaps(iv.start, iv.end, g.period))):
                k = np.floor(np.mod(lo, g.period) / tc).astype(int) % periods
                short[k[length < t_min]] = True
        assert P.narrow_pulse_fraction(kind, m, fc, t_min) == pytest.approx(
            short.mean(), abs=3 / periods * 4)
    # hand, two-level legs: 1 − (2/π)·asin((1 − 2·1.2 µs·20 kHz)/0.97) = 1 − (2/π)·asin(0.98144)
    # = 0.1228
    assert P.narrow_pulse_fraction("spwm_bipolar", 0.97, fc, t_min) == pytest.approx(
        1 - 2 / math.pi * math.asin((1 - 2 * t_min * fc) / 0.97), rel=1e-12)


# --------------------------------------------------------------------------------------------
# The design field, read by the derive modules
# --------------------------------------------------------------------------------------------

EXAMPLE = Path(__file__).resolve().parents[2] / "example_designs" / "nchannel_bootstrap_quasi.toml"


def _sheet(zero: str | None):
    from reviewer.design import parse_design
    from reviewer.quantities import compute

    text = EXAMPLE.read_text(encoding="utf-8")
    if zero is not None:
        text = text.replace("[modulation]\n", f'[modulation]\nzero_state = "{zero}"\n', 1)
    return compute(parse_design(text, str(EXAMPLE)))


def test_zero_state_field_moves_bootstrap_and_currents():
    default, low, shifted = _sheet(None), _sheet("low_sides"), _sheet("phase_shifted")
    a = math.radians(23)
    # 50 Hz, α = 23°: low sides hold the zero state → (180 − 46)/360 · 20 ms = 7.444 ms;
    # phase-shifted legs → half the period, 10 ms
    assert default.value("bootstrap.t_on_max") == pytest.approx(
        (math.pi - 2 * a) / (2 * math.pi * F0))
    assert low.value("bootstrap.t_on_max") == pytest.approx(default.value("bootstrap.t_on_max"))
    assert shifted.value("bootstrap.t_on_max") == pytest.approx(10e-3)
    # the high side conducts longer with phase-shifted legs, the low side less
    assert shifted.value("thermal.high.device_rms") > low.value("thermal.high.device_rms")
    assert shifted.value("thermal.low.device_rms") < low.value("thermal.low.device_rms")


def test_level_shifted_switching_loss_splits_per_device():
    from reviewer.design import parse_design
    from reviewer.quantities import compute
    from tests.bridge_base import bridge

    s = compute(parse_design(bridge(("modulation", "kind", '"spwm_level_shifted"'))))
    phi = s.value("thermal.load_angle")
    hi, lo = s.value("thermal.high.device_switched"), s.value("thermal.low.device_switched")
    # I_pk(1 + cos φ)/(2π) against I_pk(1 − cos φ)/(2π)
    assert hi * (1 - math.cos(phi)) == pytest.approx(lo * (1 + math.cos(phi)), abs=1e-9)
    assert hi > lo
    assert s.value("thermal.high.switching_loss") > s.value("thermal.low.switching_loss")
    # the dead times of the high side's hard edges load the low side's diode, and the other way
    assert s.value("thermal.low.diode_loss") * lo == pytest.approx(
        s.value("thermal.high.diode_loss") * hi, rel=1e-9, abs=1e-15)
    assert s.value("thermal.low.diode_loss") > s.value("thermal.high.diode_loss")
