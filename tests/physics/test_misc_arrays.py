"""The array-aware physics and helpers of the operating, band, bus, protection, isolation,
layout and grounding modules: on an array they give, element by element, what the scalar calls
give (1e-12 relative), branches included, and a float for float inputs.

The scalar calls are the reference; their own values are checked against outside sources in the
per-module tests (tests/physics/test_<module>.py). Here numpy's and Python's own arithmetic are
the oracle: ``math.hypot`` for :func:`hypot`, Python's ``or`` for :func:`or_default`."""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.physics.arrays import hypot, or_default


def same_as_scalars(fn, *columns, **kw):
    """``fn`` on arrays equals the list of scalar calls, and a scalar call gives a float."""
    arrays = [np.asarray(c, dtype=float) if isinstance(c, (list, tuple)) else c for c in columns]
    got = fn(*arrays, **kw)
    n = max(len(c) for c in columns if isinstance(c, (list, tuple)))
    want = []
    for i in range(n):
        args = [float(c[i]) if isinstance(c, (list, tuple)) else c for c in columns]
        one = fn(*args, **kw)
        assert isinstance(one, float) and not isinstance(one, np.floating), type(one)
        want.append(one)
    got = np.asarray(got, dtype=float)
    assert got.shape == (n,)
    for g, w in zip(got, want):
        if math.isinf(w):
            assert g == w
        else:
            assert g == pytest.approx(w, rel=1e-12, abs=0.0)
    return want


def test_or_default_takes_the_default_where_python_or_would():
    xs = [0.0, 2.5, 0.0, 1e-9]
    assert same_as_scalars(lambda x: or_default(x, 1.0), xs) == [x or 1.0 for x in xs]
    assert or_default(None, 1.0) == 1.0
    assert or_default(3.0, 1.0) == 3.0


def test_hypot_equals_math_hypot():
    a, b = [3.0, 1e200, 0.0, 5e-3], [4.0, 1e200, 2.0, 12e-3]
    got = same_as_scalars(hypot, a, b)
    assert got[0] == 5.0  # the 3-4-5 triangle
    assert got[1] == math.hypot(1e200, 1e200)  # no overflow
    # one array, one scalar
    assert np.allclose(hypot(np.array([3.0, 6.0]), 4.0), [5.0, math.hypot(6.0, 4.0)], rtol=1e-12)


# protection: table lookups per element ------------------------------------------------------
from reviewer.physics import protection, wire  # noqa: E402

AWG = wire.awg_area
# areas across the table: below 18 AWG, 18, 16 (the 240.4(D) small sizes), 14 just inside the
# 1 % tolerance and just outside it, listed sizes, between sizes (mm²), 4/0 and above
AREAS = [0.5e-6, AWG(18), AWG(16), AWG(14) * 0.995, AWG(14) * 0.985, AWG(12), 4e-6, AWG(10),
         10e-6, AWG(2), AWG(-3), 150e-6]
TEMPS = [55.0, 60.0, 67.5, 75.0, 81.0, 90.0, 99.0, 60.0, 74.99, 90.0, 105.0, 75.0]


def _nan_for_none(fn):
    def scalar_or_nan(*args):
        got = fn(*args)
        if isinstance(got, np.ndarray):
            return got
        return math.nan if got is None else got
    return scalar_or_nan


def _equal_with_nan(got, want):
    got = np.asarray(got, dtype=float)
    assert got.shape == (len(want),)
    for g, w in zip(got, want):
        if w is None:
            assert math.isnan(g)
        else:
            assert g == pytest.approx(w, rel=1e-12, abs=0.0)


@pytest.mark.parametrize("fn", [protection.wire_ampacity, protection.wire_max_protection])
def test_wire_lookups_per_element_equal_the_scalar_lookups(fn):
    # NEC Table 310.16 read per element: an array gives each scalar lookup, NaN where the scalar
    # gives None (below 14 AWG, insulation below 60 °C)
    want = [fn(a, t) for a, t in zip(AREAS, TEMPS)]
    assert None in want and len({w for w in want if w is not None}) > 4  # branches covered
    _equal_with_nan(fn(np.array(AREAS), np.array(TEMPS)), want)
    _equal_with_nan(fn(np.array(AREAS), 75.0), [fn(a, 75.0) for a in AREAS])


def test_wire_lookup_values_from_the_table():
    # NFPA 70 (NEC) 2023 Table 310.16, copper: 12 AWG 25 A at 75 °C, 30 A at 90 °C; 240.4(D)
    # limits 12 AWG to 20 A of protection
    got = protection.wire_ampacity(np.array([AWG(12), AWG(12)]), np.array([75.0, 90.0]))
    assert got.tolist() == [25.0, 30.0]
    assert protection.wire_max_protection(np.array([AWG(12)]), 90.0).tolist() == [20.0]


def test_ampacity_ambient_factor_per_element():
    ambients = [20.0, 30.0, 30.5, 36.0, 40.0, 44.0, 59.0, 70.0, 71.0, 40.0, 50.0, 65.0]
    want = [protection.ampacity_ambient_factor(a, t) for a, t in zip(ambients, TEMPS)]
    assert None in want
    _equal_with_nan(protection.ampacity_ambient_factor(np.array(ambients), np.array(TEMPS)), want)
    # NEC Table 310.15(B)(1)(1) (from memory): 0.91 at 36-40 °C in the 90 °C column
    assert protection.ampacity_ambient_factor(np.array([38.0]), 90.0).tolist() == [0.91]


def test_small_conductor_gauge_per_element():
    want = [protection.small_conductor_gauge(a) for a in AREAS]
    assert {None, "18", "16"} <= set(want)
    assert protection.small_conductor_gauge(np.array(AREAS)).tolist() == want


def test_smallest_wire_for_fuse_per_element():
    ratings = [1.0, 15.0, 15.5, 20.0, 25.0, 30.0, 31.0, 100.0, 230.0, 260.0, 261.0, 500.0]
    got_g, got_a = protection.smallest_wire_for_fuse(np.array(ratings), np.array(TEMPS))
    for r, t, g, a in zip(ratings, TEMPS, got_g, got_a):
        want = protection.smallest_wire_for_fuse(r, t)
        if want is None:
            assert g is None and math.isnan(a)
        else:
            assert (g, a) == want
    assert None in got_g.tolist() and "14" in got_g.tolist()


def test_fuse_ambient_covered_matches_the_factor_raising():
    temps = [-20.0, 25.0, 60.0, 85.0, 200.0]
    for t, c in zip(temps, protection.fuse_ambient_covered(np.array(temps))):
        try:
            protection.fuse_ambient_factor("other", t)
            raised = False
        except ValueError:
            raised = True
        assert bool(c) is (not raised)
    assert protection.fuse_ambient_covered(25.0) is True


def test_fuse_ambient_factor_and_k_per_element():
    temps = [-20.0, 25.0, 40.0, 55.0, 70.0]
    same_as_scalars(lambda t: protection.fuse_ambient_factor("automotive", t), temps)
    same_as_scalars(protection.adiabatic_k, [60.0, 89.9, 90.0, 105.0])


# the path helpers of the derive modules ------------------------------------------------------
from reviewer.context import SplitPoints  # noqa: E402
from reviewer.derive.paths import each, one_path  # noqa: E402


def test_one_path_gives_the_common_key_or_splits():
    assert one_path(3) == 3 and one_path(None) is None
    assert one_path(np.array([True, True])) is True
    assert one_path(np.array(["16", "16"], dtype=object)) == "16"
    with pytest.raises(SplitPoints) as e:
        one_path(np.array([1, 2, 1]))
    assert e.value.groups.tolist() == [1, 2, 1]


def test_each_gives_one_text_per_point():
    assert each(lambda a, b: f"{a:g}/{b}", 2.0, "x") == "2/x"
    assert each(lambda a, b: f"{a:g}/{b}", np.array([1.0, 2.5]), "x") == ["1/x", "2.5/x"]


# spacing: IEC 60664-1 and IPC-2221 lookups per element ----------------------------------------
from reviewer.physics import band, bus, grounding, spacing  # noqa: E402

SYSTEM = [10.0, 50.0, 100.0, 150.0, 151.0, 230.0, 300.0, 301.0, 600.0, 1000.0]


@pytest.mark.parametrize("category", ["I", "II", "III", "IV"])
def test_rated_impulse_per_element(category):
    same_as_scalars(lambda v: spacing.rated_impulse_voltage(v, category), SYSTEM)
    # IEC 60664-1:2007 Table F.1: 230 V line to neutral (300 V row), category II: 2500 V
    assert spacing.rated_impulse_voltage(np.array([230.0]), "II").tolist() == [2500.0]


def test_reinforced_impulse_per_element():
    same_as_scalars(spacing.reinforced_impulse, [330.0, 500.0, 800.0, 1500.0, 2500.0, 2600.0])


@pytest.mark.parametrize("insulation", ["basic", "reinforced"])
@pytest.mark.parametrize("pd", [1, 2, 3])
def test_clearance_per_element(insulation, pd):
    alt = [0.0, 1000.0, 2000.0, 2500.0, 3000.0, 4000.0, 0.0, 5000.0, 2000.0, 0.0]
    same_as_scalars(lambda v, a: spacing.clearance_required(v, "II", pd, insulation, a),
                    SYSTEM, alt)


@pytest.mark.parametrize("group", ["I", "II", "IIIa", "IIIb"])
@pytest.mark.parametrize("pd,printed", [(1, True), (1, False), (2, True), (2, False), (3, False)])
def test_creepage_per_element(group, pd, printed):
    working = [5.0, 10.0, 12.5, 50.0, 63.0, 100.0, 250.0, 320.0, 400.0, 630.0]
    for grade in ("basic", "reinforced"):
        same_as_scalars(lambda v: spacing.creepage_required(v, pd, group, printed, grade),
                        working)


def test_lookups_above_the_table_raise_for_arrays_as_for_scalars():
    with pytest.raises(ValueError):
        spacing.creepage_required(1e9, 2, "I")
    with pytest.raises(ValueError):
        spacing.creepage_required(np.array([100.0, 1e9]), 2, "I")
    with pytest.raises(ValueError):
        spacing.rated_impulse_voltage(np.array([100.0, 1e9]), "II")


@pytest.mark.parametrize("column", ["B1", "B2", "B3", "B4", "A5", "A6", "A7"])
def test_ipc2221_spacing_per_element(column):
    # band edges (inclusive upper bounds), inside bands and above 500 V (the per-volt rule)
    volts = [0.0, 15.0, 15.1, 30.0, 49.9, 100.0, 170.0, 300.5, 500.0, 500.1, 1200.0]
    same_as_scalars(lambda v: spacing.ipc2221_spacing(v, column), volts)


def test_ipc2221_column_and_creepage_needed_per_element():
    alts = np.array([0.0, 3050.0, 3051.0])
    assert spacing.ipc2221_column("outer", False, alts).tolist() == [
        spacing.ipc2221_column("outer", False, float(a)) for a in alts]
    assert spacing.ipc2221_column("inner", False, alts) == "B1"
    same_as_scalars(spacing.creepage_needed, [1e-3, 2e-3, 3e-3], [2e-3, 2e-3, 1e-3])
    same_as_scalars(lambda v: spacing.ac_test_voltage(v, "reinforced"), [50.0, 230.0])


# band, bus, grounding: formulas and their branches ------------------------------------------

def test_band_per_element():
    same_as_scalars(band.dc_band_limit, [0.0, 0.05, 0.10, 0.1000001, 0.5])
    same_as_scalars(band.dc_peak, [12.0, 48.0, 120.0], [0.0, 0.1, 0.3])
    same_as_scalars(band.bus_peak, [12.0, 48.0, 120.0], [0.0, 0.1, 0.3], [0.0, 1.0, 2.0])
    same_as_scalars(band.chemistry_v_max, [12.0, 24.0], 2.45, 2.0)


def test_bus_per_element():
    i, pf = [1.0, 5.0, 12.0], [1.0, 0.8, 0.3]
    same_as_scalars(bus.ripple_current_2f, i, pf)
    for mod in ("bipolar", "unipolar"):
        same_as_scalars(lambda a, m, p: bus.ripple_current_switching(a, m, p, mod), i,
                        [0.5, 0.9, 1.0], pf)
        same_as_scalars(lambda a, m, p: bus.input_current_rms(a, m, p, mod), i,
                        [0.5, 0.9, 1.0], pf)
    # a finite source shares the ripple, an infinite one (a rectifier) leaves it to the
    # capacitors, zero takes it all
    rs = [0.0, 0.05, math.inf]
    same_as_scalars(bus.source_share, rs, 100.0, [1e-3, 2e-3, 3e-3], 0.01)
    same_as_scalars(bus.shared_bus_ripple, i, rs, 100.0, [1e-3, 2e-3, 3e-3], 0.01)
    same_as_scalars(bus.supply_lead_rms, i, [0.1, 2.0, 0.0])
    same_as_scalars(bus.edge_voltage_step, i, [20e-9, 50e-9, 1e-6], 1e-6)


def test_grounding_per_element():
    same_as_scalars(grounding.ground_bounce, [1e-9, 5e-9], [10.0, 20.0], [20e-9, 50e-9])
    same_as_scalars(grounding.max_inductance, [0.4, 0.8], [10.0, 20.0], [20e-9, 50e-9])
