"""Figures in words and digits that tell a value from its limit."""

import math

from reviewer.shown import ABSENT, UNBOUNDED, distinct, figure
from reviewer.units import render


def test_absent_and_unbounded_figures_are_words():
    assert figure(None, "V") == ABSENT
    assert figure(math.inf, "K/W") == UNBOUNDED
    assert figure(math.nan, "A") == ABSENT
    assert figure(4700.0, "Ω") == "4.7 kΩ"


def test_a_value_just_over_its_limit_reads_differently():
    # 5.4515 A against 5.45 A: three figures show both as "5.45 A"
    assert render(5.4515, "A") == render(5.45, "A")
    a, b = distinct(5.4515, 5.45, "A")
    assert a != b and a == "5.452 A" and b == "5.45 A"
    assert distinct(60.2, 50.0, "V") == ("60.2 V", "50 V")


def test_an_area_is_shown_in_square_millimetres():
    # 12 AWG is 3.31 mm² (ASTM B258: d = 0.127 mm · 92^((36 − 12)/39) = 2.053 mm)
    d = 0.127e-3 * 92 ** ((36 - 12) / 39)
    assert render(math.pi * d * d / 4, "m²") == "3.31 mm²"
