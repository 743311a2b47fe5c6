"""Physical ranges of the design fields (reviewer/design/ranges.py).

Reference values: absolute zero is −273.15 °C (SI Brochure, 9th ed., 2019, §2.3.1); a
fraction given as a percentage lies in [0, 100 %] (its definition); the carrier bounds are the
spectrum engine's own floor (5× the output, reviewer/physics/waveform.py) and the project's
measured time bound.
"""

from __future__ import annotations

import math
import typing

import pytest
from pydantic import BaseModel

from reviewer.design import ranges
from reviewer.design.fields import UnitTag, _validator
from reviewer.design.model import Design
from reviewer.units import UNITS


def _quantity_fields(model: type[BaseModel], prefix: tuple[str, ...] = ()):
    """Every quantity field of the model (with a UnitTag), by dotted path with ``*`` for the
    two switch positions and drive stages."""
    for name, info in model.model_fields.items():
        path = prefix + (name,)
        tags = [m for m in info.metadata if isinstance(m, UnitTag)]
        for arg in (info.annotation, *typing.get_args(info.annotation)):
            tags += [m for m in getattr(arg, "__metadata__", ()) if isinstance(m, UnitTag)]
        if tags:
            yield ".".join(path), tags[0].unit
            continue
        for arg in (info.annotation, *typing.get_args(info.annotation)):
            if isinstance(arg, type) and issubclass(arg, BaseModel):
                yield from _quantity_fields(arg, path)


FIELDS = dict(_quantity_fields(Design))


def test_every_quantity_field_has_a_range_from_its_unit():
    """A field added to the model gets a range without a line here: its unit has one."""
    assert len(FIELDS) > 100
    missing = {path: unit for path, unit in FIELDS.items() if unit not in ranges.BY_UNIT}
    assert missing == {}


def test_every_narrowed_path_names_a_field_of_the_model_in_its_unit():
    for pattern, rng in ranges.BY_PATH.items():
        matches = [(p, u) for p, u in FIELDS.items() if ranges._matches(pattern, p)]
        assert matches, f"{pattern} names no field of the design model"
        for path, unit in matches:
            assert rng.unit == unit or {rng.unit, unit} <= {"", "%"}, (pattern, path, unit)
            wide = ranges.for_unit(unit)
            # a narrowed range lies within the unit's own (which the field validator applies)
            for end in (rng.lo, rng.hi):
                if end is not None:
                    assert wide.allows(end) or end in (wide.lo, wide.hi), (pattern, end)


@pytest.mark.parametrize("unit", sorted(UNITS))
@pytest.mark.parametrize("value", [math.nan, math.inf, -math.inf, "nan", "inf", "1e999",
                                   {"min": 1, "typ": 2, "max": math.nan}])
def test_no_unit_accepts_a_value_that_is_not_finite(unit, value):
    with pytest.raises(ValueError, match="finite|found 1 / 2 / nan"):
        _validator(unit)(value)


def test_absolute_zero():
    check = _validator("°C")
    assert check("-273.14 °C").typ == pytest.approx(-273.14)
    for below in ("-273.15 °C", "-300 °C", -1000):
        with pytest.raises(ValueError, match="absolute zero"):
            check(below)


@pytest.mark.parametrize("unit, bad, good", [
    ("Ω", "-1 Ω", "0 Ω"), ("F", "0 F", "1 pF"), ("H", "-1 nH", "1 nH"), ("Hz", "0 Hz", "1 Hz"),
    ("s", "-1 ns", "0 s"), ("%", "101 %", "100 %"), ("%", "-1 %", "0 %"), ("K/W", "0", "0.1"),
    ("A", "-1 A", "0 A"), ("W", "-1 W", "0 W"),
])
def test_signs_by_unit(unit, bad, good):
    check = _validator(unit)
    check(good)
    with pytest.raises(ValueError, match="out of range"):
        check(bad)


def test_disordered_tolerance_is_refused():
    with pytest.raises(ValueError, match="min ≤ typ ≤ max"):
        _validator("V")("12 V ± -5%")


def test_dead_time_against_the_period():
    """Both dead times before a turn-on, twice per switching period: their sum must be below
    the period (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., ch. 8, blanking time)."""
    from reviewer.design import parse_design
    from reviewer.errors import InputError
    from tests.conftest import example

    text = example("careful_12v_sine").read_text(encoding="utf-8")  # 20 kHz carrier: 50 µs
    for dead, ok in (("24 µs", True), ("25 µs", False)):
        t = text.replace('dead_time = "', f'dead_time = "{dead}" #', 1)
        if ok:
            parse_design(t, "d.toml")
        else:
            with pytest.raises(InputError, match="not shorter than the carrier period 50 µs"):
                parse_design(t, "d.toml")
