"""Engineering notation at the edges: parse a field's text into SI numbers, render numbers back.

Parsing and display use quantiphy (a well-kept library made for engineering notation); this
module only adds what a design file needs on top of it: the unit a field expects, the spellings
a designer types for it ("ohm", "Ω", "R"), tolerances ("10k ± 5%", ``{min, typ, max}``) and the
classic traps ("1 meg" is mega, never milli; a wrong unit is an error, never a guess).
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass

from quantiphy import Quantity

Quantity.set_prefs(map_sf=Quantity.map_sf_to_greek, prec=2, spacer=" ")


@dataclass(frozen=True)
class Unit:
    """A unit a field may expect: its SI symbol, the spellings accepted and their scale to SI."""

    symbol: str
    name: str
    spellings: dict[str, float]


def _u(symbol: str, name: str, *others: str, **scaled: float) -> Unit:
    spellings = {symbol: 1.0, **{o: 1.0 for o in others}}
    spellings.update({k.replace("_", " "): v for k, v in scaled.items()})
    return Unit(symbol, name, spellings)


UNITS: dict[str, Unit] = {
    u.symbol: u
    for u in [
        _u("V", "volt", "v", "volt", "volts", "Vdc", "VDC", "Vrms", "Vac", "VAC"),
        _u("A", "ampere", "amp", "amps", "Arms", "Adc"),
        _u("Ω", "ohm", "ohm", "ohms", "Ohm", "Ohms", "R", "Ω"),
        _u("F", "farad"),
        _u("H", "henry"),
        _u("s", "second", "sec"),
        _u("Hz", "hertz", "hz"),
        _u("W", "watt"),
        _u("C", "coulomb"),
        _u("S", "siemens", "A/V", "mho"),
        _u("m", "metre"),
        _u("m²", "square metre", "m2", **{"mm²": 1e-6, "mm2": 1e-6, "mm^2": 1e-6, "cm²": 1e-4}),
        _u("°C", "degree Celsius", "C°", "degC", "celsius"),
        _u("K/W", "kelvin per watt", "°C/W", "C/W", "degC/W"),
        _u("W/K", "watt per kelvin", "W/°C"),
        _u("V/s", "volt per second"),
        _u("A/s", "ampere per second"),
        _u("A²s", "ampere squared second", "A2s", "A^2s", "A²·s", "A2·s"),
        _u("T", "tesla", **{"mT": 1e-3}),
        _u("rad", "radian", **{"°": math.pi / 180, "deg": math.pi / 180}),
        _u("", "ratio", **{"%": 0.01, "ppm": 1e-6}),
        _u("%", "ratio shown as a percentage", **{"%": 0.01}),
    ]
}

_MEG = re.compile(r"(?<=[\d.\s])meg", re.IGNORECASE)
_TOL = re.compile(r"^(?P<typ>.+?)\s*(?:±|\+/-|\+-)\s*(?P<tol>[\d.eE+-]+)\s*(?P<pct>%)?\s*$")


class UnitError(ValueError):
    """A text that is not a quantity of the expected unit; the message says what was expected."""


def expected_text(unit: str) -> str:
    """How to name the expected unit in an error message."""
    u = UNITS[unit]
    if unit in ("", "%"):
        return "a plain number or a percentage (e.g. 0.8 or 80 %)"
    example = EXAMPLES.get(unit, f"1 {unit}")
    return f"a value in {u.name}s ({unit}), e.g. '{example}', or a bare number in {unit}"


EXAMPLES = {"V": "12 V", "A": "10 A", "Ω": "4.7 kΩ", "F": "100 nF", "H": "22 µH", "s": "250 ns",
            "Hz": "20 kHz", "W": "50 W", "C": "40 nC", "S": "50 S", "m": "2.5 mm", "m²": "4 mm²",
            "°C": "125 °C", "K/W": "1.5 K/W", "rad": "23 °"}


def parse_number(text: str | float | int, unit: str) -> float:
    """Parse one number with an optional SI prefix and unit into the SI value of ``unit``.

    Parameters
    ----------
    text : str or float
        What the designer wrote: ``"4.7 kΩ"``, ``"4.7k"``, ``"100nF"``, ``"1 meg"``, ``12``.
    unit : str
        The unit the field expects, a key of :data:`UNITS` (``""`` for a ratio).

    Returns
    -------
    float
        The value in the SI unit [``unit``].
    """
    if isinstance(text, bool):
        raise UnitError(f"expected {expected_text(unit)}, found a true/false value")
    if isinstance(text, (int, float)):
        return float(text)
    if not isinstance(text, str):
        raise UnitError(f"expected {expected_text(unit)}, found {type(text).__name__}")
    raw = text.strip()
    if not raw:
        raise UnitError(f"expected {expected_text(unit)}, found an empty text")
    cleaned = _MEG.sub("M", raw)
    spellings = UNITS[unit].spellings
    # A unit written alone after the number ("80 %", "23 °"): match the spelling exactly first,
    # so that quantiphy never reads a unit as an SI prefix.
    for spelling in sorted(spellings, key=len, reverse=True):
        if spelling and cleaned.endswith(spelling):
            head = cleaned[: -len(spelling)].strip()
            value = _parse_plain(head, raw, unit)
            if value is not None:
                return value * spellings[spelling]
    try:
        q = Quantity(cleaned)
    except Exception:  # quantiphy raises its own ValueError subclasses; any failure is bad input
        raise UnitError(f"expected {expected_text(unit)}, found {raw!r}") from None
    found = q.units.strip()
    if found and found not in spellings:
        raise UnitError(
            f"the unit {found!r} does not fit this field; expected {expected_text(unit)}, "
            f"found {raw!r}"
        )
    return float(q.real) * spellings.get(found, 1.0)


def _parse_plain(head: str, raw: str, unit: str) -> float | None:
    """A number with an optional prefix and no unit, or None when ``head`` is not one."""
    if not head:
        return None
    try:
        q = Quantity(head)
    except Exception:  # not a number: the caller tries the next reading
        return None
    if q.units.strip():
        return None
    return float(q.real)


def parse_with_unit(text: str | float | int) -> tuple[float, str]:
    """Parse a number written with any known unit: ``"80 %" -> (0.8, "%")``, ``"2.2k" -> (2200, "")``.

    Used where no field says which unit to expect (rule parameters and limits). Raises
    :class:`UnitError` when the text is no number or its unit is unknown.
    """
    if isinstance(text, (int, float)) and not isinstance(text, bool):
        return float(text), ""
    if not isinstance(text, str):
        raise UnitError(f"expected a number with a unit, found {text!r}")
    if text.strip().endswith("%"):
        return parse_number(text, "%"), "%"
    ordered = sorted(((sp, u) for u, unit in UNITS.items() for sp in unit.spellings if sp),
                     key=lambda x: len(x[0]), reverse=True)
    for spelling, unit in ordered:
        if text.strip().endswith(spelling):
            try:
                return parse_number(text, unit), unit
            except UnitError:
                continue
    return parse_number(text, ""), ""


def same_dimension(a: str, b: str) -> bool:
    """Whether two unit symbols measure the same thing (a ratio and a percentage do)."""
    return a == b or {a, b} <= {"", "%"}


@dataclass(frozen=True)
class Span:
    """A toleranced quantity in SI units: ``lo ≤ typ ≤ hi``; equal when exact.

    ``sigma`` [unit of the value], when given, is the standard deviation of a normal spread
    about ``typ``, cut off at ``lo`` and ``hi``, for yield estimates; without it a sample is
    uniform between ``lo`` and ``hi``. The worst case never depends on it."""

    lo: float
    typ: float
    hi: float
    sigma: float | None = None

    @property
    def exact(self) -> bool:
        return self.lo == self.typ == self.hi


_SIGMA = re.compile(r"\s*(?:σ|sigma)\s*=?\s*", re.IGNORECASE)
SIGMA_BOX = 3.0
"""A spread given by its sigma alone ("12 V σ 0.2 V") has the tolerance box typ ± 3 σ."""


def _sigma(text: str, typ: float, unit: str, whole: object) -> float:
    t = text.strip()
    if not t:
        raise UnitError(f"{whole!r}: a sigma needs a value after it, e.g. 'σ 5 %' or 'σ 2 ns'")
    if t.endswith("%"):
        try:
            sigma = abs(typ) * float(t[:-1]) / 100
        except ValueError:
            raise UnitError(f"the sigma in {whole!r} is not a number") from None
    else:
        sigma = parse_number(t, unit)
    if not sigma > 0:
        raise UnitError(f"the sigma in {whole!r} must be above zero")
    return sigma


def parse_span(value: object, unit: str) -> Span:
    """Parse a field: a number, a text with unit, ``"typ ± tol[%]"`` or ``{min, typ, max}``.

    A normal spread for yield estimates is written after the tolerance, ``"125 ns ± 20 % σ 5 %"``
    (``sigma`` may be spelled out; the sigma in % of typical or in the field's unit), or as
    the key ``sigma`` of the table form. Given alone (``"12 V σ 0.2 V"``), the tolerance box is
    typ ± 3 σ (:data:`SIGMA_BOX`)."""
    if isinstance(value, dict):
        unknown = set(value) - {"min", "typ", "max", "sigma"}
        if unknown:
            raise UnitError(
                "a toleranced value takes the keys min, typ, max and sigma; "
                f"found {sorted(unknown)}"
            )
        sigma_text = value.get("sigma")
        value = {k: v for k, v in value.items() if k != "sigma"}
        if sigma_text is not None:
            if not value:
                raise UnitError("a toleranced value needs at least one of min, typ or max")
            span = parse_span(value, unit)
            sigma = _sigma(str(sigma_text) if not isinstance(sigma_text, str) else sigma_text,
                           span.typ, unit, sigma_text)
            if span.exact:
                return Span(span.typ - SIGMA_BOX * sigma, span.typ, span.typ + SIGMA_BOX * sigma,
                            sigma)
            return Span(span.lo, span.typ, span.hi, sigma)
        parts = {k: parse_number(v, unit) for k, v in value.items()}
        if not parts:
            raise UnitError("a toleranced value needs at least one of min, typ or max")
        typ = parts.get("typ")
        if typ is None:
            lo_hi = [parts[k] for k in ("min", "max") if k in parts]
            typ = sum(lo_hi) / len(lo_hi)
        lo, hi = parts.get("min", typ), parts.get("max", typ)
        if not lo <= typ <= hi:
            raise UnitError(f"expected min ≤ typ ≤ max, found {lo:g} / {typ:g} / {hi:g}")
        return Span(lo, typ, hi)
    if isinstance(value, str) and _SIGMA.search(value):
        head, tail = _SIGMA.split(value.strip(), maxsplit=1)
        span = parse_span(head, unit)
        sigma = _sigma(tail, span.typ, unit, value)
        if span.exact:
            return Span(span.typ - SIGMA_BOX * sigma, span.typ, span.typ + SIGMA_BOX * sigma, sigma)
        return Span(span.lo, span.typ, span.hi, sigma)
    if isinstance(value, str):
        m = _TOL.match(value.strip())
        if m:
            typ = parse_number(m["typ"], unit)
            try:
                tol = float(m["tol"])
            except ValueError:
                raise UnitError(f"the tolerance in {value!r} is not a number") from None
            delta = abs(typ) * tol / 100 if m["pct"] else tol
            return Span(typ - delta, typ, typ + delta)
    v = parse_number(value, unit)  # type: ignore[arg-type]
    return Span(v, v, v)


def render(value: float, unit: str, prec: int = 3) -> str:
    """Engineering notation for display: ``render(4700, "Ω") == "4.7 kΩ"``."""
    if value is None or (isinstance(value, float) and math.isnan(value)):
        return "—"
    if isinstance(value, float) and math.isinf(value):
        return ("∞" if value > 0 else "−∞") + (f" {unit}" if unit else "")
    if unit == "%":
        return f"{value * 100:.{prec}g} %"
    if unit == "":
        return f"{value:.{prec}g}"
    if unit == "rad":
        return f"{math.degrees(value):.{prec}g}°"
    if unit in ("°C", "K/W", "W/K"):
        return f"{value:.{prec}g} {unit}"
    if unit == "m²":  # an SI prefix scales the metre, not the area: 3.31e-6 m² is 3.31 mm²
        return f"{value * 1e6:.{prec}g} mm²"
    return Quantity(value, unit).render(prec=prec - 1)
