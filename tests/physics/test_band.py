"""Voltage bands against IEC 61140:2016 / IEC 60050-826: extra-low voltage is at most 50 V a.c.
r.m.s. or 120 V ripple-free d.c. (ripple-free: at most 10 % r.m.s. ripple)."""

import math

import pytest

from reviewer.physics import band


def test_band_limits_from_the_standard():
    assert band.ELV_AC_RMS == 50.0          # IEC 61140, a.c. band I upper limit
    assert band.ELV_DC_RIPPLE_FREE == 120.0  # IEC 61140, ripple-free d.c.
    assert band.ELV_DC_PEAK_120V == 140.0    # IEC 61140, nominal 120 V ripple-free peak


@pytest.mark.parametrize("ripple, limit", [(0.0, 120.0), (0.10, 120.0),
                                           (0.1001, 50 * math.sqrt(2)), (0.48, 50 * math.sqrt(2))])
def test_dc_limit_at_the_ripple_free_threshold(ripple, limit):
    # 10 % is the ripple-free boundary (IEC 61140); beyond it the a.c. peak is used (common practice)
    assert band.dc_band_limit(ripple) == pytest.approx(limit)


def test_peak_with_sinusoidal_ripple():
    # a sine of r.m.s. value r·V has a peak of √2·r·V on top of the mean (definition of r.m.s.)
    assert band.dc_peak(100.0, 0.1) == pytest.approx(100 * (1 + 0.1 * math.sqrt(2)))


@pytest.mark.parametrize("bus, out, beyond", [
    (120.0, None, False), (120.01, None, True), (24.0, 50.0, False), (24.0, 50.01, True),
])
def test_beyond_elv_at_each_threshold(bus, out, beyond):
    assert band.beyond_elv(bus, 120.0, out) is beyond


def test_new_band_functions_take_arrays():
    import numpy as np

    # the 10 % ripple-free boundary (IEC 61140), elementwise
    np.testing.assert_allclose(band.dc_band_limit(np.array([0.05, 0.10, 0.11])),
                               [120.0, 120.0, 50 * math.sqrt(2)])
    # V_max + √2·rms + pp/2 (definition of rms for a sinusoid)
    np.testing.assert_allclose(band.bus_peak(np.array([10.0, 20.0]), 1.0, 2.0),
                               [10 + math.sqrt(2) + 1, 20 + math.sqrt(2) + 1])
    # a 12 V lead-acid pack: 12 · 2.47 / 2.0 = 14.82 V (cell voltages from memory)
    assert band.chemistry_v_max(12.0, 2.47, 2.0) == pytest.approx(14.82)
    np.testing.assert_allclose(band.ripple_fraction(np.array([1.0, 2.0]), 10.0), [0.1, 0.2])
