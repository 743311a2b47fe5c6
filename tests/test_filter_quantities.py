"""The filter quantities a rule reads, against scipy.signal.freqs and hand calculations.

The published gains |H| at the output frequency, the corner and the first carrier group of the
loaded filter are checked against scipy.signal.freqs of
H(s) = R(sC·ESR + 1) / (s²LC(R + ESR) + s(L + r_L·C(R + ESR) + R·C·ESR) + r_L + R)
(series r_L + sL into (ESR + 1/(sC)) ∥ R) within 0.1 %. The default losses are an inductor Q of
50 and a capacitor Q of 200 at the corner (common practice), stated on the sheet."""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy import signal

from reviewer.review import review_file
from tests.bridge_base import bridge
from tests.conftest import example, finding, review_text

# BASE: 40 W at 8 V → R = 1.6 Ω; bipolar PWM at 20 kHz, first carrier group at 20 kHz
FILTER = [("filter", "inductance", '"100 µH"'), ("filter", "capacitance", '"10 µF"'),
          ("filter", "inductor_isat", '"20 A"'), ("source", "v_max", '"12 V"')]


def freqs(L, C, dcr, esr, r, f):
    b = [r * C * esr, r]
    a = [L * C * (r + esr), L + dcr * C * (r + esr) + r * C * esr, dcr + r]
    _, h = signal.freqs(b, a, worN=2 * np.pi * np.asarray(f, dtype=float))
    return np.abs(h)


@pytest.mark.parametrize("dcr,esr", [("20 mΩ", "5 mΩ"), (None, None)])
def test_filter_gains_against_scipy_freqs(dcr, esr):
    edits = list(FILTER)
    if dcr is not None:
        edits += [("filter", "inductor_dcr", f'"{dcr}"'), ("filter", "capacitor_esr", f'"{esr}"')]
    r = review_text(bridge(*edits))
    L, C, R = 100e-6, 10e-6, 8.0**2 / 40
    z0 = math.sqrt(L / C)  # 3.162 Ω
    r_l = 0.02 if dcr else z0 / 50
    r_c = 0.005 if esr else z0 / 200
    assert r.sheet.value("filter.inductor_dcr") == pytest.approx(r_l)
    assert r.sheet.value("filter.capacitor_esr") == pytest.approx(r_c)
    f_c = 1 / (2 * math.pi * math.sqrt(L * C))
    assert r.sheet.value("filter.corner") == pytest.approx(f_c)
    ref = freqs(L, C, r_l, r_c, R, [50.0, f_c, 20e3])
    got = [r.sheet.value(n) for n in ("filter.gain_at_output", "filter.gain_at_corner",
                                      "filter.gain_at_carrier")]
    np.testing.assert_allclose(got, ref, rtol=1e-3)
    if dcr is None:
        assert "give filter.inductor_dcr" in r.sheet.get("filter.gain_at_output").note


def test_undamped_filter_peaking_is_finite_and_says_so():
    """A lossless LC unloaded has infinite gain at its corner; with the stated Q of 50 (and 200
    for the capacitor) the unloaded peak is about 1/(1/50 + 1/200) = 40."""
    r = review_text(bridge(*FILTER))
    g = r.sheet.get("filter.peak_gain_no_load")
    assert math.isfinite(g.typ) and g.typ == pytest.approx(40.0, rel=5e-3)
    assert "give filter.inductor_dcr" in g.note


def test_inductor_saturation_checked_unloaded_as_well():
    """Open loop, the unloaded case can exceed the loaded one when a harmonic sits near the
    corner; the rule reads the larger of the two."""
    r = review_text(bridge(*FILTER))
    loaded = r.sheet.value("filter.inductor_peak_loaded")
    unloaded = r.sheet.value("filter.inductor_peak_no_load")
    assert r.sheet.value("filter.inductor_peak") == pytest.approx(max(loaded, unloaded))
    f = finding(r, "waveform.inductor-saturation")
    assert f.value == pytest.approx(max(loaded, unloaded))


@pytest.mark.parametrize("factor,outcome", [(1.0, "pass"), (0.999, "fail")])
def test_filter_capacitor_ripple_rating(factor, outcome):
    base = review_text(bridge(*FILTER)).sheet.value("filter.capacitor_current_max")
    rating = base * factor
    r = review_text(bridge(*FILTER, ("filter", "capacitor_ripple_rating", f'"{rating} A"')))
    f = finding(r, "waveform.capacitor-ripple")
    assert f.value == pytest.approx(base)
    assert f.outcome == outcome


def test_examples_publish_the_filter_gains():
    r = review_file(example("careful_12v_sine"))
    for n in ("filter.gain_at_output", "filter.gain_at_corner", "filter.gain_at_carrier"):
        assert r.sheet.get(n) is not None
