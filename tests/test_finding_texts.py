"""No meaningless text: every finding text of every bundled example and of the variant designs
is scanned for symbols where a sentence belongs (∞, inf, nan, —), negative values of quantities
that cannot be negative, zero ratings ("0 A") and numbers beyond physical bounds."""

from __future__ import annotations

import re

import pytest

from tests.variants import EXAMPLE_NAMES, VARIANT_NAMES, example_review, variant_review

PREFIX = r"[pnµumkMGT]?"
NUMBER = r"(?P<num>[−-]?\d+(?:\.\d+)?(?:e[+-]?\d+)?)"
POSITIVE_UNITS = ("Ω", "F", "H", "s", "Hz", "W", "A", "C", "m²", "K/W", "V/s")
"""Units of quantities that a text never shows negative: resistances, capacitances, inductances,
times, frequencies, powers, currents given as ratings or magnitudes, areas, thermal resistances."""

BAD_SYMBOLS = re.compile(r"∞|\binf\b|\bnan\b|—|\bNone\b|not computed for this design|no finite figure")
"""Symbols where a sentence belongs, and the engine's last-resort words for an absent or
unbounded figure (a rule's text must say what that means instead)."""
NEGATIVE = re.compile(rf"(?<![\w.])[−-]\d+(?:\.\d+)?\s?{PREFIX}(?:{'|'.join(map(re.escape, POSITIVE_UNITS))})(?![\w/²])")
ZERO_RATING = re.compile(rf"(?<![\w.−-])0\s?{PREFIX}(?:A|F|H|Ω|K/W)(?![\w/²])")
"""A zero current, capacitance, inductance, resistance or thermal resistance: never a rating or a
size a designer can fit (a zero loss, 0 W, or a zero off level, 0 V, are physical)."""
HUGE = re.compile(rf"(?<![\w.]){NUMBER}\s?(?P<prefix>[PEZY]|e\d+)\s?(?P<unit>V|A|W|F|H|Hz|s|Ω)\b")
TOO_BIG = {
    "°C": 2000.0,   # no part of a bridge survives this: a figure above it is an artefact
    "%": 10000.0,
}


def _texts(review):
    for f in review.findings:
        for what, text in (("title", f.title), ("heading", f.heading), ("why", f.why),
                           ("mitigation", f.mitigation), ("question", f.question)):
            if text:
                yield f.key, what, text


def problems(review) -> list[str]:
    out = []
    for key, what, text in _texts(review):
        for name, pattern in (("symbol", BAD_SYMBOLS), ("negative", NEGATIVE),
                              ("zero rating", ZERO_RATING), ("huge", HUGE)):
            for m in pattern.finditer(text):
                out.append(f"{key} {what}: {name} {m.group(0)!r} in: {text}")
        for m in re.finditer(rf"{NUMBER}\s?(°C|%)", text):
            value = float(m.group("num").replace("−", "-"))
            if abs(value) > TOO_BIG[m.group(2)]:
                out.append(f"{key} {what}: beyond physical bounds {m.group(0)!r} in: {text}")
    return out


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_example_texts_mean_something(name):
    found = problems(example_review(name))
    assert not found, "\n".join(found)


@pytest.mark.parametrize("name", VARIANT_NAMES)
def test_variant_texts_mean_something(name):
    found = problems(variant_review(name))
    assert not found, "\n".join(found)


def test_there_are_enough_variants():
    assert len(VARIANT_NAMES) >= 30


@pytest.mark.parametrize("text", [
    "the filter peaks at ∞ × at no load", "a modulation index of — keeps it",
    "a sink-to-ambient resistance of at most −1.7 K/W", "protected by (0 A; 0 A means",
    "raise the lowest bus to 160 PV", "reaches 1e+05 °C", "an index of nan",
])
def test_the_scan_catches_the_known_cases(text):
    from reviewer.findings import Finding

    class R:
        findings = [Finding("x.y", "", "x", "t", "risk", "fail", mitigation=text)]

    assert problems(R())
