"""The sigma in the tolerance notation (arithmetic on the text's own numbers)."""

import pytest

from reviewer.units import Span, UnitError, parse_span


def test_sigma_after_a_percentage_tolerance():
    s = parse_span("125 ns ± 20% σ 5%", "s")
    assert (s.lo, s.typ, s.hi) == pytest.approx((100e-9, 125e-9, 150e-9))
    assert s.sigma == pytest.approx(6.25e-9)          # 5 % of 125 ns


def test_sigma_spelled_out_with_a_unit():
    s = parse_span("10k ± 5% sigma 100", "Ω")
    assert s.sigma == pytest.approx(100.0) and s.hi == pytest.approx(10500.0)


def test_sigma_alone_gives_a_three_sigma_box():
    assert parse_span("12 V σ 0.2 V", "V") == Span(11.4, 12.0, 12.6, 0.2)


def test_sigma_in_the_table_form():
    s = parse_span({"min": "2 V", "typ": "3 V", "max": "4 V", "sigma": "0.3 V"}, "V")
    assert s == Span(2.0, 3.0, 4.0, 0.3)


def test_no_sigma_is_uniform():
    assert parse_span("10k ± 5%", "Ω").sigma is None


@pytest.mark.parametrize("text", ["12 V σ 0 V", "12 V σ", "12 V ± 1 % sigma x%"])
def test_bad_sigma_is_an_error(text):
    with pytest.raises(UnitError):
        parse_span(text, "V")
