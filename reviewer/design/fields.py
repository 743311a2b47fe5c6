"""Field types for the design model: quantities with a unit and an optional tolerance."""

from __future__ import annotations

import math
from typing import Annotated, Any, Literal

from pydantic import Field, PlainSerializer, PlainValidator, WithJsonSchema

from reviewer.design.ranges import Range, for_unit, out_of_range, show
from reviewer.units import UNITS, Span, UnitError, expected_text, parse_span


def _schema(unit: str) -> dict[str, Any]:
    text = {"type": "string", "description": f"engineering notation in {unit or 'a ratio'}, "
            "optionally with a tolerance: '4.7k', '10k ± 5%'"}
    number = {"type": "number", "description": f"in {unit or 'SI'}"}
    return {
        "anyOf": [
            number,
            text,
            {
                "type": "object",
                "properties": {k: {"anyOf": [number, text]} for k in ("min", "typ", "max")},
                "additionalProperties": False,
            },
        ],
        "x-unit": unit,
    }


def _validator(unit: str):
    rng = for_unit(unit)

    def validate(value: Any) -> Span:
        if isinstance(value, Span):
            span = value
        else:
            try:
                span = parse_span(value, unit)
            except UnitError as e:
                raise ValueError(str(e)) from None
            except (OverflowError, RecursionError, MemoryError):
                raise ValueError(f"expected {expected_text(unit)}, found a number too large "
                                 "to read") from None
        return checked(span, rng)

    return validate


def checked(span: Span, rng: Range) -> Span:
    """``span`` when it is finite, ordered (min ≤ typ ≤ max) and within ``rng``; a ValueError
    saying what was found and what is allowed otherwise.

    The unit's range (:data:`reviewer.design.ranges.BY_UNIT`) is applied here, so every quantity
    field gets it; fields with a narrower range are checked by :func:`reviewer.design.ranges.check`.
    """
    for name, v in (("min", span.lo), ("typ", span.typ), ("max", span.hi)):
        if not math.isfinite(v):
            what = "NaN (not a number)" if math.isnan(v) else ("infinite" if v > 0 else
                                                               "minus infinity")
            where = "" if len({repr(x) for x in (span.lo, span.typ, span.hi)}) == 1 else \
                f" (its {name})"
            raise ValueError(f"a finite number is required; found {what}{where}")
    if not span.lo <= span.typ <= span.hi:
        raise ValueError(f"expected min ≤ typ ≤ max, found {show(span.lo, rng.unit)} / "
                         f"{show(span.typ, rng.unit)} / {show(span.hi, rng.unit)} "
                         "(a negative tolerance?)")
    message = out_of_range(span, rng)
    if message:
        raise ValueError(message)
    return span


def _serialise(span: Span) -> Any:
    if span.exact:
        return span.typ
    out = {"min": span.lo, "typ": span.typ, "max": span.hi}
    if span.sigma is not None:
        out["sigma"] = span.sigma
    return out


def Q(unit: str) -> Any:  # noqa: N802 - reads as a type in the model
    """A quantity field in ``unit`` (a key of :data:`reviewer.units.UNITS`)."""
    assert unit in UNITS, unit
    return Annotated[
        Span,
        PlainValidator(_validator(unit)),
        PlainSerializer(_serialise),
        WithJsonSchema(_schema(unit)),
        Field(json_schema_extra={"x-unit": unit}),
        UnitTag(unit),
    ]


class UnitTag:
    """Marks a field's unit so that the sheet and the rules can read it from the model."""

    def __init__(self, unit: str):
        self.unit = unit

    def __repr__(self) -> str:
        return f"UnitTag({self.unit!r})"


def _level(value: Any) -> Span | str:
    if isinstance(value, str) and value.strip().lower() == "bus":
        return "bus"
    return _validator("V")(value)


Level = Annotated[
    Span | Literal["bus"],
    PlainValidator(_level),
    PlainSerializer(lambda v: v if isinstance(v, str) else _serialise(v)),
    WithJsonSchema({"anyOf": [{"const": "bus"}, _schema("V")]}),
    UnitTag("V"),
]
"""A gate-drive level: a voltage, or ``"bus"`` for the DC bus (a P-channel high side's off level)."""


def _wire(value: Any) -> Span:
    """A conductor size: ``"10 AWG"`` or ``"4 mm²"``, as cross-section area [m²].

    References
    ----------
    ASTM B258: diameter d = 0.127 mm · 92^((36 − n)/39); "0" is 0 AWG, "00" or "2/0" is −1.
    """
    from reviewer.physics.wire import awg_area, parse_awg

    if isinstance(value, str):
        text = value.strip()
        if text.upper().endswith("AWG"):
            try:
                return _exact(awg_area(parse_awg(text[:-3])))
            except ValueError as e:
                raise ValueError(str(e)) from None
        for suffix in ("mm²", "mm2", "sq mm", "mm^2"):
            if text.endswith(suffix):
                try:
                    area = float(text[: -len(suffix)]) * 1e-6
                except ValueError:
                    break
                return checked(_exact(area), for_unit("m²"))
    raise ValueError(f"expected a wire size such as '10 AWG' or '4 mm²', found {value!r}")


def _exact(v: float) -> Span:
    return Span(v, v, v)


WireSize = Annotated[
    Span,
    PlainValidator(_wire),
    PlainSerializer(_serialise),
    WithJsonSchema({"type": "string", "description": "'10 AWG' or '4 mm²'"}),
    UnitTag("m²"),
]
