"""Numbers with units inside expressions, and what :func:`reviewer.expr.infer` concludes.

Check values: SI prefixes and the degree from the SI Brochure, 9th edition (BIPM 2019),
Table 7 (k = 1e3, m = 1e-3, µ = 1e-6, n = 1e-9) and Table 8 (1° = π/180 rad); a square
millimetre is (1e-3 m)² = 1e-6 m² (the prefix applies to the unit before it is squared, SI
Brochure section 3).
"""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.expr import (NODIM, ExprError, Type, compile_expr, infer, parse_quantity,
                           type_of_unit, unit_name)


@pytest.mark.parametrize("text, value, unit", [
    ("48 V", 48.0, "V"),
    ("2.2k", 2200.0, ""),
    ("2.2 kΩ", 2200.0, "Ω"),
    ("80 %", 0.8, "%"),
    ("125 °C", 125.0, "°C"),
    ("100 nF", 100e-9, "F"),
    ("250 ns", 250e-9, "s"),
    ("20 kHz", 20e3, "Hz"),
    ("4 mm²", 4e-6, "m²"),
    ("30 °", math.pi / 6, "rad"),
    ("2 K/W", 2.0, "K/W"),
])
def test_parse_quantity(text, value, unit):
    got, got_unit = parse_quantity(text)
    assert got == pytest.approx(value, rel=1e-12) and got_unit == unit


@pytest.mark.parametrize("text, env, expected", [
    ("x > 48 V", {"x": 50.0}, True),
    ("x * 80 %", {"x": 10.0}, 8.0),
    ("x + 2.2k", {"x": 1.0}, 2201.0),
    ("x % 3", {"x": 7.0}, 1.0),          # modulo when an operand follows the %
    ("x / 1 ms", {"x": 1.0}, 1000.0),
    ("'48 V' == 'x'", {}, False),         # text inside quotes is left alone
])
def test_units_in_expressions(text, env, expected):
    assert compile_expr(text).evaluate(env) == pytest.approx(expected)


def t(**kinds):
    return lambda n: kinds.get(n.replace(".", "_"))


V = type_of_unit("V")
A = type_of_unit("A")


@pytest.mark.parametrize("text, want", [
    ("bus * 2", "V"),
    ("bus / cur", "Ω"),
    ("bus * cur", "W"),
    ("sqrt(bus * bus)", "V"),
    ("bus ** 2 / bus", "V"),
    ("max(bus, 2 V)", "V"),
    ("bus if flag else 3 V", "V"),
    ("80 % * bus", "V"),
    ("bus / bus", "no unit"),
])
def test_dimension_propagation(text, want):
    got = infer(compile_expr(text), t(bus=V, cur=A, flag=Type("flag")))
    assert unit_name(got.dim) == want


@pytest.mark.parametrize("text, words", [
    ("bus + cur", "is in V but"),
    ("bus > 2 A", "comparing"),
    ("max(bus, cur)", "different units"),
    ("log(bus)", "takes a number without a unit"),
    ("flag * 2", "flag (true/false) and cannot be used in arithmetic"),
    ("name + 1", "a text and cannot be used in arithmetic"),
    ("bus == 'p'", "compares a number"),
    ("bus < name", "only numbers can be compared"),
    ("bus and flag", "not a condition"),
    ("1 V if bus else 2 V", "not a condition"),
    ("bus if flag else name", "branches give a number"),
    ("pol == 'x'", "is one of 'n', 'p'"),
    ("bus ** cur", "an exponent has no unit"),
])
def test_kind_and_dimension_errors(text, words):
    types = t(bus=V, cur=A, flag=Type("flag"), name=Type("text"),
              pol=Type("text", choices=frozenset({"n", "p"})))
    with pytest.raises(ExprError, match=words.replace("(", r"\(").replace(")", r"\)")):
        infer(compile_expr(text), types)


def test_bare_numbers_fit_any_dimension():
    # A bare number is in the SI unit of what it meets: bus + 2 is volts, tempco × ΔT adds to a
    # threshold voltage (tempco in V/K written as a bare -0.005).
    types = t(bus=V, temp=type_of_unit("°C"), tempco=Type("number", NODIM, loose=True))
    assert unit_name(infer(compile_expr("bus + 2"), types).dim) == "V"
    infer(compile_expr("bus + tempco * (temp - 25)"), types)


def test_runtime_refuses_flags_and_texts_in_arithmetic():
    with pytest.raises(ExprError, match="flag"):
        compile_expr("f * 2").evaluate({"f": np.array([True, False])})
    with pytest.raises(ExprError, match="text"):
        compile_expr("s * 2").evaluate({"s": "p"})
