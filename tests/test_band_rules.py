"""The voltage band judged on what the design produces, and the one bus peak every module uses.

Sources: IEC 61140:2016 / IEC 60050-826 for the bands (50 V a.c. rms; 120 V ripple-free d.c.,
ripple-free meaning at most 10 % rms ripple). A two-level square wave is ±V_bus at every instant,
so its rms is V_bus exactly (definition of rms); the synthesis resolves it to 1 part in 10⁵. The
bus ripple by hand: I_dc = P / (η · V_min), I_2f = I_dc / √2 for a resistive load (Mohan,
Undeland & Robbins 2003, ch. 8), ΔV_rms = I_2f · |R_s ∥ Z_c| with Z_c = 1/(j·2π·2f·C), and the
peak V_max + √2 · ΔV_rms. Battery charging voltages per cell: from memory
(reviewer/tables/battery_chemistry.toml)."""

from __future__ import annotations

import math

import pytest

from reviewer.review import review_file
from tests.bridge_base import bridge
from tests.conftest import assert_fails, example, finding, review_text

SQUARE = (("modulation", "kind", '"square"'), ("modulation", "index", None),
          ("modulation", "carrier", None), ("timing", "dead_time", '"0 s"'))


def square(v_max: str, *edits):
    return bridge(("source", "v_max", f'"{v_max}"'), ("output", "v_rms", '"40 V"'), *SQUARE,
                  *edits)


@pytest.mark.parametrize("v_max,outcome", [("50 V", "pass"), ("50.01 V", "fail")])
def test_open_loop_output_class_follows_the_highest_bus(v_max, outcome):
    """Open loop, unfiltered square wave: the output rms is the bus, so a 40 V target at a
    50.01 V highest bus produces 50.01 V rms, beyond the 50 V band (IEC 61140), whatever the
    target says."""
    r = review_text(square(v_max))
    f = finding(r, "voltage-class.output-elv")
    assert f.value == pytest.approx(float(v_max.split()[0]), rel=1e-5)
    assert (f.outcome, f.severity) == (outcome, "hazard")
    assert r.beyond_elv is (outcome == "fail")
    # the isolation requirement follows the class
    assert r.sheet.value("isolation.required") == ("reinforced" if outcome == "fail" else "functional")


@pytest.mark.parametrize("tolerance,outcome", [("25 %", "pass"), ("25.1 %", "fail")])
def test_closed_loop_output_class_is_the_upper_tolerance(tolerance, outcome):
    """Closed loop: the controller may hold the output anywhere in its tolerance, so a 40 V
    target with ±25 % can give exactly 50 V (at the band's limit) and with ±25.1 % 50.04 V:
    beyond the band. (A tolerance of 0 is refused at load: no regulator holds it exactly.)"""
    text = bridge(("source", "v_max", '"80 V"'), ("output", "v_rms", '"40 V"'),
                  ("output", "v_tolerance", f'"{tolerance}"'), ("modulation", "regulated", "true"))
    f = finding(review_text(text), "voltage-class.output-elv")
    assert f.value == pytest.approx(40.0 * (1 + float(tolerance.split()[0]) / 100))
    assert f.outcome == outcome


def rectified(bulk: str | None, v_max: str = "100 V", extra=()):
    edits = [("source", "kind", '"rectified_mains"'), ("source", "v_min", '"100 V"'),
             ("source", "v_nom", '"100 V"'), ("source", "v_max", f'"{v_max}"'),
             ("output", "v_rms", '"40 V"'), ("load", "power", '"100 W"'),
             ("load", "efficiency", '"100 %"'), *SQUARE, *extra]
    if bulk is not None:
        edits.append(("capacitors", "bulk", f'"{bulk}"'))
    return bridge(*edits)


def test_rectified_bus_peak_from_the_bulk_capacitance_not_the_48_percent_default():
    """100 W from 100 V at 100 %: I_dc = 1 A, I_2f = 0.7071 A at 100 Hz into 1 mF (the rectifier
    supplies none of it): Z_c = 1.5915 Ω, ΔV_rms = 1.1254 V, peak = 100 + √2 · 1.1254 =
    101.59 V. The unfiltered-rectifier default would have given 100 · (1 + √2 · 0.48) = 167.9 V.
    The drain-source check reads the same peak."""
    r = review_text(rectified("1 mF"))
    xc = 1 / (2 * math.pi * 100 * 1e-3)
    peak = 100 + math.sqrt(2) * (1 / math.sqrt(2)) * xc
    assert r.sheet.value("band.bus_peak") == pytest.approx(peak, rel=1e-9)
    assert peak == pytest.approx(101.5915, abs=1e-4)
    assert r.sheet.value("stress.high.vds_peak") == pytest.approx(peak, rel=1e-9)
    # ripple 1.1254 / 100 = 1.1 %: ripple-free, the 120 V limit
    assert r.sheet.value("band.bus_ripple") == pytest.approx(xc / math.sqrt(2) / 100)
    assert r.sheet.value("band.bus_limit") == 120.0
    # no bulk capacitance and no ripple figure: the stated 48 % assumption, and its note
    r = review_text(rectified(None))
    assert r.sheet.value("band.bus_peak") == pytest.approx(100 * (1 + math.sqrt(2) * 0.48))
    assert "48 %" in r.sheet.get("band.bus_ripple").note


@pytest.mark.parametrize("rating,outcome", [("101.6 V", "pass"), ("101.5 V", "fail")])
def test_capacitor_voltage_checked_against_the_bus_peak(rating, outcome):
    r = review_text(rectified("1 mF", extra=[("capacitors", "voltage_rating", f'"{rating}"')]))
    assert finding(r, "bus.cap-voltage").outcome == outcome


def test_battery_ripple_is_shared_with_the_source_by_impedance():
    """12 V, 40 W at 85 % from a 12 V minimum: I_dc = 3.9216 A, I_2f = 2.7730 A at 100 Hz;
    R_s = 0.1 Ω in parallel with Z_c = −j·1.5915 Ω (1 mF): |R∥Z_c| = 0.1 · 1.5915 /
    √(0.1² + 1.5915²) = 0.099805 Ω, so ΔV_rms = 0.27676 V. Sine PWM at 20 kHz adds half the
    switching ripple I_pk·¼/(f·C) with I_pk = 40/8·√2 = 7.0711 A: 0.088388 V peak to peak."""
    text = bridge(("source", "v_max", '"12 V"'), ("source", "v_min", '"12 V"'),
                  ("source", "r_internal", '"0.1 Ω"'), ("capacitors", "bulk", '"1 mF"'))
    r = review_text(text)
    i_2f = 40 / (0.85 * 12) / math.sqrt(2)
    xc = 1 / (2 * math.pi * 100 * 1e-3)
    z = 0.1 * xc / math.hypot(0.1, xc)
    assert r.sheet.value("band.bus_ripple_2f") == pytest.approx(i_2f * z, rel=1e-9)
    sw = 40 / 8 * math.sqrt(2) * 0.25 / (20e3 * 1e-3)
    assert r.sheet.value("band.bus_ripple_switching") == pytest.approx(sw, rel=1e-9)
    assert r.sheet.value("band.bus_peak") == pytest.approx(12 + math.sqrt(2) * i_2f * z + sw / 2,
                                                           rel=1e-9)


@pytest.mark.parametrize("chemistry,v_nom,v_max", [
    ("lead_acid", "12 V", 12 * 2.47 / 2.0),     # 14.82 V (14.4-14.8 V charging, from memory)
    ("lifepo4", "25.6 V", 25.6 * 3.65 / 3.2),   # 29.2 V (3.65 V per cell, from memory)
    ("lithium_ion", "14.4 V", 14.4 * 4.2 / 3.6),  # 16.8 V (4.2 V per cell, from memory)
])
def test_highest_bus_from_the_chemistry(chemistry, v_nom, v_max):
    r = review_text(bridge(("source", "v_nom", f'"{v_nom}"'), ("source", "chemistry", f'"{chemistry}"')))
    assert r.sheet.value("op.bus_max") == pytest.approx(v_max)
    assert "from memory" in r.sheet.get("op.bus_max").note
    assert finding(r, "voltage-class.bus-max-given").outcome == "pass"


def test_highest_bus_never_silently_nominal():
    r = review_text(bridge())  # a battery, no chemistry, no v_max
    f = finding(r, "voltage-class.bus-max-given")
    assert f.outcome == "fail" and "source.v_max" in f.mitigation
    assert "give source.v_max" in r.sheet.get("op.bus_max").note
    r = review_text(bridge(("source", "v_max", '"12 V"')))
    assert finding(r, "voltage-class.bus-max-given").outcome == "pass"


@pytest.mark.parametrize("name,expected", [
    ("careful_12v_sine", set()),
    ("mains_output_transformer", {"voltage-class.output-elv"}),
    ("naive_bench_pchannel", set()),
    ("nchannel_bootstrap_quasi", set()),
])
def test_examples_band(name, expected):
    assert_fails(review_file(example(name)), expected, area="voltage-class")


@pytest.mark.parametrize("v_max,outcome", [(120 - 1 / (2 * math.pi * 100 * 1e-3) - 1e-6, "pass"),
                                           (120 - 1 / (2 * math.pi * 100 * 1e-3) + 1e-3, "fail")])
def test_bus_band_on_the_computed_peak(v_max, outcome):
    """The rectified bus above (1 A mean, 1 mF, 100 Hz): the crest adds √2 · 0.7071 · 1.5915 =
    1.5915 V to the highest mean, so the 120 V ripple-free band (IEC 61140) is crossed at a
    highest mean of 118.4085 V."""
    f = finding(review_text(rectified("1 mF", v_max=f"{v_max} V")), "voltage-class.bus-elv")
    assert f.limit == 120.0
    assert (f.outcome, f.severity) == (outcome, "hazard")
