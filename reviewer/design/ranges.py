"""Physical ranges of the design's numbers: what a field may hold before any physics runs.

Two layers:

- every quantity field has a range from its unit (:data:`BY_UNIT`: a resistance is never
  negative, a frequency or a capacitance is positive, a temperature lies above absolute zero, a
  percentage is a fraction from 0 to 1), applied by the field validator in
  :mod:`reviewer.design.fields`, so a field added to the model gets it without a line here;
- a few fields have a narrower range (:data:`BY_PATH`: a modulation index, a power factor, an
  output frequency) and a few limits depend on two fields (:func:`dependent`: dead time within
  the switching period, the carrier within what the spectrum engine handles in bounded time and
  memory); :func:`check` applies both to a validated design and returns located problems.

Upper bounds are far above any low-voltage bridge: they only keep a mistyped exponent (``1e300``)
from overflowing the arithmetic into infinities. The value is checked at every corner (min, typ
and max of a toleranced value).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from functools import lru_cache
from typing import Any, Iterator

ABSOLUTE_ZERO_C = -273.15
"""Absolute zero [°C] (SI Brochure, 9th ed., 2019, §2.3.1: 0 K = −273.15 °C)."""

MAX_CARRIER_RATIO = 2000
"""Largest carrier over output frequency the spectrum engine is asked to synthesise (100 kHz at
50 Hz, 120 kHz at 60 Hz): its time and memory grow with the number of carrier periods per output
period. Measured on the 2-core development machine: a review of the careful example takes about
as long at a ratio of 2000 as at its own 400, and 2.5 to 3 times as long at 5000."""

MIN_CARRIER_RATIO = 5
"""Smallest carrier over output frequency for sine PWM (the spectrum engine's own floor)."""


@dataclass(frozen=True)
class Range:
    """An interval of allowed values [in the field's SI unit]; ``None`` is unbounded."""

    lo: float | None = None
    hi: float | None = None
    lo_open: bool = False
    hi_open: bool = False
    unit: str = ""
    note: str = ""

    def allows(self, v: float) -> bool:
        if not math.isfinite(v):
            return False
        if self.lo is not None and (v <= self.lo if self.lo_open else v < self.lo):
            return False
        if self.hi is not None and (v >= self.hi if self.hi_open else v > self.hi):
            return False
        return True

    def text(self) -> str:
        """The range in words: ``"above 0 Hz and at most 10 MHz"``."""
        parts = []
        if self.lo is not None:
            parts.append(("above " if self.lo_open else "at least ") + show(self.lo, self.unit))
        if self.hi is not None:
            parts.append(("below " if self.hi_open else "at most ") + show(self.hi, self.unit))
        text = " and ".join(parts) or "any finite number"
        return f"{text} ({self.note})" if self.note else text


def show(v: float, unit: str) -> str:
    """A number for an error message, in engineering notation with its unit."""
    from reviewer.units import render

    if isinstance(v, float) and math.isnan(v):
        return "NaN (not a number)"
    if unit in ("", "%"):
        return f"{v:.6g}" if unit == "" else f"{v:.6g} ({v * 100:.4g} %)"
    return render(v, unit, prec=6 if unit == "°C" else 4)


def _r(unit: str, lo: float | None = None, hi: float | None = None, *, lo_open: bool = False,
       hi_open: bool = False, note: str = "") -> Range:
    return Range(lo, hi, lo_open, hi_open, unit, note)


BY_UNIT: dict[str, Range] = {
    "V": _r("V", -1e6, 1e6),
    "A": _r("A", 0.0, 1e7),
    "Ω": _r("Ω", 0.0, 1e15),
    "F": _r("F", 1e-18, 1e4),
    "H": _r("H", 0.0, 1e4),  # 0 H only where BY_PATH allows it (a Kelvin source)
    "s": _r("s", 0.0, 1e4),
    "Hz": _r("Hz", 0.0, 1e10, lo_open=True),
    "W": _r("W", 0.0, 1e9),
    "C": _r("C", 0.0, 1e3),
    "S": _r("S", 0.0, 1e6),
    "m": _r("m", 0.0, 1e5),
    "m²": _r("m²", 0.0, 1.0, lo_open=True),
    "°C": _r("°C", ABSOLUTE_ZERO_C, 5000.0, lo_open=True, note="above absolute zero"),
    "K/W": _r("K/W", 0.0, 1e6, lo_open=True),
    "W/K": _r("W/K", 0.0, 1e9, lo_open=True),
    "V/s": _r("V/s", 0.0, 1e15),
    "A/s": _r("A/s", 0.0, 1e15),
    "rad": _r("rad", 0.0, 2 * math.pi),
    "A²s": _r("A²s", 0.0, 1e12, lo_open=True),
    "T": _r("T", 0.0, 100.0, lo_open=True),
    "": _r("", -1e9, 1e9),
    "%": _r("%", 0.0, 1.0, note="a fraction from 0 to 100 %"),
}
"""The range every quantity field of a unit gets unless :data:`BY_PATH` narrows it."""


def for_unit(unit: str) -> Range:
    return BY_UNIT.get(unit, Range(unit=unit))


BY_PATH: dict[str, Range] = {
    "source.v_nom": _r("V", 0.0, 1e6, lo_open=True),
    "source.v_min": _r("V", 0.0, 1e6, lo_open=True),
    "source.v_max": _r("V", 0.0, 1e6, lo_open=True),
    "source.i_short": _r("A", 0.0, 1e7, lo_open=True),
    "source.r_internal": _r("Ω", 0.0, 1e6, lo_open=True),
    "output.frequency": _r("Hz", 0.1, 1e5, note="an inverter's output frequency"),
    "output.v_rms": _r("V", 0.0, 1e6, lo_open=True),
    "output.v_tolerance": _r("%", 0.0, 1.0, lo_open=True, hi_open=True),
    "output.thd_target": _r("%", 0.0, 1.0, lo_open=True),
    "output.transformer_ratio": _r("", 0.0, 1e4, lo_open=True),
    "load.power": _r("W", 0.0, 1e9, lo_open=True),
    "load.resistance": _r("Ω", 0.0, 1e15, lo_open=True),
    "load.power_factor": _r("", 0.0, 1.0, lo_open=True, note="cos φ"),
    "load.efficiency": _r("%", 0.0, 1.0, lo_open=True),
    "modulation.index": _r("", 0.0, 3.0, lo_open=True,
                           note="the spectrum engine's range; above 1 is overmodulation"),
    "modulation.carrier": _r("Hz", 0.0, 1e7, lo_open=True),
    "modulation.notch_angle": _r("rad", 0.0, math.pi / 2, hi_open=True,
                                 note="a half-angle below 90°"),
    "switch.*.vds_rating": _r("V", 0.0, 1e6, lo_open=True),
    "switch.*.vgs_max": _r("V", 0.0, 1e4, lo_open=True),
    "switch.*.vth": _r("V", 0.0, 1e4, lo_open=True),
    "switch.*.rds_on": _r("Ω", 0.0, 1e6, lo_open=True),
    "switch.*.rds_on_vgs": _r("V", 0.0, 1e4, lo_open=True),
    "switch.*.rds_hot_factor": _r("", 0.0, 100.0, lo_open=True),
    "switch.*.tj_max": _r("°C", ABSOLUTE_ZERO_C, 1000.0, lo_open=True, note="above absolute zero"),
    "switch.*.gfs": _r("S", 0.0, 1e6, lo_open=True),
    # a Kelvin-source connection shares no inductance between gate loop and power path: 0 H
    "switch.*.common_source_inductance": _r("H", 0.0, 1e-3),
    "filter.inductance": _r("H", 0.0, 1e4, lo_open=True),
    "grounding.loop_inductance": _r("H", 0.0, 1e-3, lo_open=True),
    "grounding.common_inductance": _r("H", 0.0, 1e-3, lo_open=True),
    "switch.*.v_plateau": _r("V", 0.0, 1e4, lo_open=True),
    "drive.*.zener": _r("V", 0.0, 1e4, lo_open=True),
    "bootstrap.supply": _r("V", 0.0, 1e4, lo_open=True),
    "capacitors.esr": _r("Ω", 0.0, 1e6, lo_open=True, note="an ESR of 0 would hide the "
                         "capacitors' heating"),
    "fuse.rating": _r("A", 0.0, 1e7, lo_open=True),
    "wiring.length": _r("m", 0.0, 1e5, lo_open=True),
    "isolation.altitude": _r("m", 0.0, 2e4),
}
"""Narrower ranges by dotted field path (``*`` matches one table name, e.g. ``high``)."""


@lru_cache(maxsize=1024)
def narrowed(path: str) -> bool:
    """Whether the field at dotted ``path`` has a range of its own in :data:`BY_PATH`."""
    return any(path == p or _matches(p, path) for p in BY_PATH)


@lru_cache(maxsize=1024)
def for_path(path: str, unit: str) -> Range:
    """The range of the field at dotted ``path`` in ``unit``."""
    if path in BY_PATH:
        return BY_PATH[path]
    parts = path.split(".")
    for i in range(len(parts)):
        wild = ".".join(parts[:i] + ["*"] + parts[i + 1:])
        if wild in BY_PATH:
            return BY_PATH[wild]
    return for_unit(unit)


def corners(span: Any) -> list[float]:
    """The distinct values of a toleranced value: min, typ, max."""
    return list(dict.fromkeys((span.lo, span.typ, span.hi)))


def out_of_range(value: Any, rng: Range) -> str | None:
    """The message for a span (or number) outside ``rng``, or None when it lies within."""
    values = corners(value) if hasattr(value, "typ") else [float(value)]
    bad = [v for v in values if not rng.allows(v)]
    if not bad:
        return None
    which = ""
    if len(values) > 1:
        names = {value.lo: "min", value.hi: "max", value.typ: "typ"}
        which = f" (its {names.get(bad[0], 'value')})"
    return f"{show(bad[0], rng.unit)}{which} is out of range: allowed {rng.text()}"


def _spans(model: Any, prefix: tuple[str, ...] = ()) -> Iterator[tuple[tuple[str, ...], Any]]:
    """Every quantity value in a validated model, with its path."""
    from pydantic import BaseModel

    from reviewer.units import Span

    if not isinstance(model, BaseModel):
        return
    for name in type(model).model_fields:
        value = getattr(model, name)
        path = prefix + (name,)
        if isinstance(value, Span):
            yield path, value
        elif isinstance(value, BaseModel):
            yield from _spans(value, path)


def check(design: Any) -> list[tuple[tuple[str, ...], str]]:
    """Every range and dependent limit the validated ``design`` breaks: ``[(path, message)]``."""
    out: list[tuple[tuple[str, ...], str]] = []
    for path, span in _spans(design):
        dotted = ".".join(path)
        if not narrowed(dotted):
            continue  # the unit's range was applied by the field validator
        message = out_of_range(span, for_path(dotted, ""))
        if message:
            out.append((path, message))
    if not out:
        out.extend(dependent(design))
    return out


def _matches(pattern: str, dotted: str) -> bool:
    a, b = pattern.split("."), dotted.split(".")
    return len(a) == len(b) and all(x == "*" or x == y for x, y in zip(a, b))


def dependent(design: Any) -> list[tuple[tuple[str, ...], str]]:
    """Limits that join two fields: the source's min ≤ nominal ≤ max, the dead times within one
    switching period, the carrier within what the spectrum engine handles, the shortest pulse
    within a carrier period.

    References
    ----------
    N. Mohan, T. M. Undeland and W. P. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003, ch. 8
    (blanking time: each leg waits the dead time before every turn-on, twice per switching
    period, so both dead times together must be shorter than the period for either switch to
    conduct at all).
    """
    out: list[tuple[tuple[str, ...], str]] = []
    src = design.source
    if src.v_min is not None and src.v_min.lo > src.v_nom.hi:
        out.append((("source", "v_min"), f"{show(src.v_min.lo, 'V')} is above the nominal "
                    f"voltage {show(src.v_nom.hi, 'V')}: expected v_min ≤ v_nom"))
    if src.v_max is not None and src.v_max.hi < src.v_nom.lo:
        out.append((("source", "v_max"), f"{show(src.v_max.hi, 'V')} is below the nominal "
                    f"voltage {show(src.v_nom.lo, 'V')}: expected v_max ≥ v_nom"))
    mod, f0 = design.modulation, design.output.frequency
    pwm = mod.kind.startswith("spwm")
    period, what = 1.0 / f0.hi, "the output period"
    if pwm and mod.carrier is not None:
        lo_ratio, hi_ratio = mod.carrier.lo / f0.hi, mod.carrier.hi / f0.lo
        if lo_ratio < MIN_CARRIER_RATIO:
            out.append((("modulation", "carrier"),
                        f"{show(mod.carrier.lo, 'Hz')} is less than {MIN_CARRIER_RATIO} times the "
                        f"output frequency {show(f0.hi, 'Hz')}: sine PWM needs a carrier at least "
                        f"{show(MIN_CARRIER_RATIO * f0.hi, 'Hz')}"))
        elif hi_ratio > MAX_CARRIER_RATIO:
            out.append((("modulation", "carrier"),
                        f"{show(mod.carrier.hi, 'Hz')} is more than {MAX_CARRIER_RATIO} times the "
                        f"output frequency {show(f0.lo, 'Hz')}, beyond what the spectrum engine "
                        f"synthesises in bounded time: allowed at most "
                        f"{show(MAX_CARRIER_RATIO * f0.lo, 'Hz')}"))
        elif mod.index is not None:
            gain = 2.0 if mod.kind == "spwm_level_shifted" else 1.0
            top = 0.9 * 2 * lo_ratio / (math.pi * gain)
            if mod.index.hi >= top:
                out.append((("modulation", "index"),
                            f"{show(mod.index.hi, '')} is too large for a carrier only "
                            f"{lo_ratio:.3g} times the output frequency: allowed below {top:.3g}"))
        period, what = 1.0 / mod.carrier.hi, "the carrier period"
        if mod.min_pulse is not None and mod.min_pulse.hi >= period:
            out.append((("modulation", "min_pulse"),
                        f"{show(mod.min_pulse.hi, 's')} is not shorter than {what} "
                        f"{show(period, 's')}"))
    t = design.timing
    high = t.dead_time_high if t.dead_time_high is not None else t.dead_time
    low = t.dead_time_low if t.dead_time_low is not None else t.dead_time
    total = (high.hi if high is not None else 0.0) + (low.hi if low is not None else 0.0)
    if total >= period:
        field = "dead_time" if t.dead_time is not None else (
            "dead_time_high" if t.dead_time_high is not None else "dead_time_low")
        out.append((("timing", field),
                    f"the dead times before the high and the low side's turn-on add up to "
                    f"{show(total, 's')}, not shorter than {what} {show(period, 's')}: neither "
                    f"switch would ever conduct"))
    return out
