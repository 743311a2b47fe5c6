"""Spacing beyond the table lookups (those are in test_tables.py): the insulation a touchable
part needs, the IPC-2221 column for a layer, and the IPC-2221 trace-width estimate against
worked cases written out by hand."""

from __future__ import annotations

import math

import pytest

from reviewer.physics import band, spacing

MIL = 25.4e-6


def test_required_insulation_beyond_elv():
    # IEC 61140: class II (double or reinforced) for an unearthed touchable part, class I (basic
    # plus protective earth) for an earthed one; extra-low voltage needs neither.
    assert spacing.required_insulation(True) == "reinforced"
    assert spacing.required_insulation(True, earthed=True) == "basic"
    assert spacing.required_insulation(False) == "functional"


def test_a_12_volt_bus_with_a_230_volt_output_is_beyond_elv_and_needs_reinforced():
    # IEC 61140 bands (via reviewer.physics.band): 14.8 V ripple-free DC is within 120 V, but a
    # 230 V rms output is beyond 50 V a.c.
    peak = band.dc_peak(14.8, 0.02)
    beyond = band.beyond_elv(peak, band.dc_band_limit(0.02), 230.0)
    assert beyond
    assert spacing.required_insulation(beyond) == "reinforced"
    assert not band.beyond_elv(peak, band.dc_band_limit(0.02), 24.0)


@pytest.mark.parametrize("provided,required,ok", [
    ("reinforced", "reinforced", True), ("basic", "reinforced", False),
    ("basic", "basic", True), ("none", "basic", False), (None, "reinforced", False),
    (None, "functional", True), ("functional", "functional", True),
])
def test_insulation_sufficient(provided, required, ok):
    assert spacing.insulation_sufficient(provided, required) is ok


def test_ipc2221_column_for_a_layer():
    assert spacing.ipc2221_column("inner", False) == "B1"
    assert spacing.ipc2221_column("outer", True) == "A5"
    assert spacing.ipc2221_column("outer", False) == "B2"
    assert spacing.ipc2221_column("outer", False, altitude=4000) == "B3"


def test_trace_width_worked_case_outer_layer():
    # IPC-2221 chart fit I = k·ΔT^0.44·A^0.725, k = 0.048 (outer); 10 A, ΔT = 10 °C, 1 oz:
    #   ΔT^0.44 = 10^0.44 = 2.75423
    #   A = (10 / (0.048 · 2.75423))^(1/0.725) = 75.643^1.37931 = 390.29 mil²
    #   thickness 1.378 mil -> width = 390.29 / 1.378 = 283.23 mil = 7.194 mm
    assert 10**0.44 == pytest.approx(2.75423, rel=1e-5)
    area = (10 / (0.048 * 10**0.44)) ** (1 / 0.725)
    assert area == pytest.approx(390.29, rel=1e-4)
    w = spacing.trace_width(10.0, 10.0, 1.0, "outer")
    assert w / MIL == pytest.approx(283.23, rel=1e-4)
    assert w == pytest.approx(7.194e-3, rel=1e-3)


def test_trace_width_worked_case_inner_and_heavier_copper():
    # Inner layer, k = 0.024: the area grows by 2^(1/0.725) = 2.6012 for the same current.
    outer = spacing.trace_width(3.0, 20.0, 1.0, "outer")
    inner = spacing.trace_width(3.0, 20.0, 1.0, "inner")
    assert inner / outer == pytest.approx(2 ** (1 / 0.725), rel=1e-9)
    # 2 oz copper halves the width for the same area.
    assert spacing.trace_width(3.0, 20.0, 2.0) == pytest.approx(outer / 2)
    # 1 A, 10 °C, 1 oz outer: A = (1/0.13220)^1.37931 = 16.30 mil² -> 11.83 mil.
    assert spacing.trace_width(1.0, 10.0) / MIL == pytest.approx(11.83, rel=1e-3)


def test_trace_current_inverts_trace_width():
    for amps in (0.5, 5.0, 25.0):
        w = spacing.trace_width(amps, 15.0, 1.0, "outer")
        assert spacing.trace_current(w, 15.0, 1.0, "outer") == pytest.approx(amps)
    with pytest.raises(ValueError):
        spacing.trace_width(1.0, 10.0, 1.0, "middle")


def test_trace_width_grows_with_current_as_the_fit_says():
    # w ∝ I^(1/0.725): doubling the current multiplies the width by 2^1.37931 = 2.6012.
    ratio = spacing.trace_width(8.0, 10.0) / spacing.trace_width(4.0, 10.0)
    assert ratio == pytest.approx(math.pow(2, 1 / 0.725))


def test_ac_test_voltage_by_grade():
    import numpy as np

    # IEC 60664-1:2007 5.3.3.2.3 / 6.1.3.4 (from memory): U_n + 1200 V basic, twice reinforced
    assert spacing.ac_test_voltage(230.0) == pytest.approx(1430.0)
    assert spacing.ac_test_voltage(230.0, "reinforced") == pytest.approx(2860.0)
    np.testing.assert_allclose(spacing.ac_test_voltage(np.array([0.0, 120.0])), [1200.0, 1320.0])
