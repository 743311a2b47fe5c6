"""Engineering notation in and out. Check values are SI prefix definitions (SI Brochure, 9th ed.,
BIPM 2019, Table 7) and plain arithmetic."""

import math

import pytest

from reviewer.units import UnitError, parse_number, parse_span, parse_with_unit, render


@pytest.mark.parametrize(
    "text, unit, expected",
    [
        ("4.7k", "Ω", 4700.0),           # k = 10^3 (SI Brochure Table 7)
        ("4.7 kΩ", "Ω", 4700.0),
        ("4.7kohm", "Ω", 4700.0),
        ("4.7 kOhm", "Ω", 4700.0),
        ("1 meg", "Ω", 1e6),             # SPICE spelling of mega: never milli
        ("1Meg", "Ω", 1e6),
        ("1 M", "Ω", 1e6),               # M = 10^6
        ("1 mΩ", "Ω", 1e-3),             # m = 10^-3
        ("100 nF", "F", 100e-9),
        ("2.2uF", "F", 2.2e-6),          # "u" typed for µ
        ("2.2 µF", "F", 2.2e-6),
        ("250 ns", "s", 250e-9),
        ("50 Hz", "Hz", 50.0),
        ("20k", "Hz", 20e3),
        ("12", "V", 12.0),               # a bare number is in the SI unit
        (12, "V", 12.0),
        ("-3 V", "V", -3.0),
        ("80 %", "%", 0.8),
        ("0.8", "%", 0.8),
        ("23 °", "rad", math.radians(23)),
        ("125 °C", "°C", 125.0),
        ("2 °C/W", "K/W", 2.0),          # a kelvin step equals a degree-Celsius step
        ("1.5mm", "m", 1.5e-3),
        ("10 m", "m", 10.0),
        ("40 nC", "C", 40e-9),
    ],
)
def test_parse_forms(text, unit, expected):
    assert parse_number(text, unit) == pytest.approx(expected, rel=1e-12)


@pytest.mark.parametrize(
    "text, unit",
    [("100 nF", "Ω"), ("1 mF", "s"), ("12 A", "V"), ("abc", "V"), ("", "V"), ("4.7 kΩ", "F")],
)
def test_wrong_unit_is_an_error(text, unit):
    with pytest.raises(UnitError) as e:
        parse_number(text, unit)
    assert "expected" in str(e.value)


def test_bool_is_not_a_number():
    with pytest.raises(UnitError):
        parse_number(True, "V")


def test_tolerance_forms():
    s = parse_span("10k ± 5%", "Ω")
    assert (s.lo, s.typ, s.hi) == pytest.approx((9500, 10000, 10500))
    s = parse_span("10k +/- 5%", "Ω")
    assert s.hi == pytest.approx(10500)
    s = parse_span("12 V ± 0.5", "V")
    assert (s.lo, s.hi) == pytest.approx((11.5, 12.5))
    s = parse_span({"min": "1 V", "typ": "2 V", "max": "3.5 V"}, "V")
    assert (s.lo, s.typ, s.hi) == (1.0, 2.0, 3.5)
    s = parse_span({"min": "1 V", "max": "3 V"}, "V")
    assert s.typ == 2.0  # no typ: the midpoint
    assert parse_span("4.7k", "Ω").exact


@pytest.mark.parametrize("bad", [{"min": 3, "max": 1}, {"lo": 1}, {}])
def test_bad_tolerances(bad):
    with pytest.raises(UnitError):
        parse_span(bad, "V")


def test_parse_with_unit():
    assert parse_with_unit("80 %") == (pytest.approx(0.8), "%")
    assert parse_with_unit("2.2k") == (2200.0, "")
    assert parse_with_unit("125 °C") == (125.0, "°C")
    assert parse_with_unit("20 V") == (20.0, "V")
    with pytest.raises(UnitError):
        parse_with_unit("a * b")


def test_render():
    assert render(4700, "Ω") == "4.7 kΩ"
    assert render(1.2345e-6, "s") == "1.23 µs"
    assert render(0.8, "%") == "80 %"
    assert render(math.radians(30), "rad") == "30°"
    assert render(float("inf"), "°C") == "∞ °C"


def test_area_prefix_is_squared_and_degree_is_an_angle():
    # 1 mm² = (10^-3 m)² = 10^-6 m² (SI Brochure, 9th ed., 5.4.3: a prefix is raised with its unit)
    assert parse_with_unit("3 mm²") == (pytest.approx(3e-6), "m²")
    assert parse_with_unit("23 °") == (pytest.approx(math.radians(23)), "rad")
    assert parse_with_unit("25 °C") == (25.0, "°C")
