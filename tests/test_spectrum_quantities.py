"""The spectrum at the load as quantities: harmonics one by one, carrier groups, 40th-order THD.

Reference values: a two-level square wave of ±V has odd harmonics of peak 4V/(nπ) and no even
ones (Fourier series of a square wave); its THD over the harmonics to the 40th is
√(Σ_{n odd, 3..39} 1/n²). Two-level natural-sampled sine PWM (Holmes & Lipo, Pulse Width
Modulation for Power Converters, 2003, ch. 3): the component at m·ω_c + n·ω₀ has peak
(4V/π)·(1/m)·J_n(mπM/2)·sin((m+n)π/2), computed with scipy.special.jv."""

from __future__ import annotations

import math

import pytest
from scipy.special import jv

from tests.bridge_base import bridge
from tests.conftest import finding, review_text

V = 12.0
SQUARE = (("modulation", "kind", '"square"'), ("modulation", "index", None),
          ("modulation", "carrier", None), ("timing", "dead_time", '"0 s"'),
          ("source", "v_max", '"12 V"'))


def test_square_wave_harmonics_one_by_one():
    r = review_text(bridge(*SQUARE))
    for n in range(1, 16):
        assert r.sheet.value(f"spectrum.h{n}.frequency") == pytest.approx(50.0 * n)
        expected = 4 * V / (n * math.pi) / math.sqrt(2) if n % 2 else 0.0
        assert r.sheet.value(f"spectrum.h{n}.amplitude") == pytest.approx(expected, rel=1e-4,
                                                                           abs=1e-6)
        assert r.sheet.value(f"spectrum.h{n}.relative") == pytest.approx(
            1 / n if n % 2 else 0.0, rel=1e-4, abs=1e-7)


THD40 = math.sqrt(sum(1 / n**2 for n in range(3, 40, 2)))


@pytest.mark.parametrize("target,outcome", [(THD40 * 1.0001, "pass"), (THD40 * 0.999, "fail")])
def test_thd_to_the_40th_where_the_target_counts_40_orders(target, outcome):
    r = review_text(bridge(*SQUARE, ("output", "thd_orders", '"40"'),
                           ("output", "thd_target", f"{target}")))
    f = finding(r, "waveform.thd")
    assert f.value == pytest.approx(THD40, rel=1e-4)
    assert f.outcome == outcome
    # counting every component instead: the full 48.3 % (√(π²/8 − 1))
    full = review_text(bridge(*SQUARE, ("output", "thd_target", f"{target}")))
    assert finding(full, "waveform.thd").value == pytest.approx(math.sqrt(math.pi**2 / 8 - 1),
                                                                 rel=1e-3)


def test_two_level_pwm_carrier_groups_against_the_double_fourier_series():
    r = review_text(bridge(("timing", "dead_time", '"0 s"'), ("source", "v_max", '"12 V"')))
    m_index = 0.9
    for m in (1, 2, 3):
        comps = [(4 * V / math.pi) / m * jv(n, m * math.pi * m_index / 2)
                 * math.sin((m + n) * math.pi / 2) for n in range(-40, 41)]
        rms = math.sqrt(sum(c * c for c in comps) / 2)
        assert r.sheet.value(f"spectrum.group{m}.amplitude") == pytest.approx(rms, rel=1e-3)
        # the largest sideband: ±n of the largest |J_n| (J_−n = (−1)ⁿ·J_n, the same magnitude)
        big = abs(max(range(-40, 41), key=lambda n: abs(comps[n + 40])))
        f = r.sheet.value(f"spectrum.group{m}.frequency")
        assert min(abs(f - (m * 20e3 + big * 50.0)), abs(f - (m * 20e3 - big * 50.0))) < 1.0
    # the fundamental is M·V (Holmes & Lipo): 0.9 · 12 / √2 rms
    assert r.sheet.value("spectrum.h1.amplitude") == pytest.approx(0.9 * 12 / math.sqrt(2), rel=1e-3)
