"""Wording and number formatting shared by every view."""

from __future__ import annotations

from reviewer.findings import BASES, Finding
from reviewer.units import render

LABEL = {
    "hazard": "HAZARD",
    "risk": "RISK",
    "advice": "ADVICE",
    "pass": "PASS",
    "needs_data": "NEEDS DATA",
    "open": "OPEN QUESTION",
    "answered": "ANSWERED",
    "not_applicable": "N/A",
}


def label(f: Finding) -> str:
    return LABEL[f.severity if f.outcome == "fail" else f.outcome]


def num(value: float | None, unit: str) -> str:
    return "—" if value is None else render(value, unit)


def computed(f: Finding) -> str:
    """'28.8 V (typical 24 V)' — the worst-corner value, with the typical one when it differs."""
    if f.value is None:
        return ""
    text = num(f.value, f.unit)
    if f.value_typ is not None and num(f.value_typ, f.unit) != text:
        text += f" (typical {num(f.value_typ, f.unit)})"
    return text


def limit(f: Finding) -> str:
    return "" if f.limit is None else f"{f.relation} {num(f.limit, f.unit)}"


def margin(f: Finding) -> str:
    if f.margin is None:
        return ""
    text = num(f.margin, f.unit)
    rel = f.relative_margin
    if rel is not None and abs(rel) < 1e6:
        text += f" ({rel * 100:+.0f} %)"
    return text


def corner(f: Finding) -> str:
    if not f.corner:
        return "typical values"
    return ", ".join(f"{path} at {end}" for path, end in f.corner)


def basis(f: Finding) -> str:
    return BASES.get(f.basis, f.basis)


def pass_text(f: Finding) -> str:
    if f.pass_value is None:
        return ""
    text = num(f.pass_value, f.pass_unit)
    return f"{text} for {f.pass_field}" if f.pass_field else text


def needs(f: Finding) -> str:
    return ", ".join(f.needs)
