"""Wording and number formatting shared by every view."""

from __future__ import annotations

from reviewer.findings import BASES, Finding
from reviewer.shown import distinct, figure
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


AREA_NAME = {"band": "voltage class", "voltage-class": "voltage class"}
"""Areas as a reader names them, where the rule files' short name is not a word of the trade."""


def area_name(area: str) -> str:
    return AREA_NAME.get(area, area)


def label(f: Finding) -> str:
    return LABEL[f.severity if f.outcome == "fail" else f.outcome]


# marks: one symbol, one colour and one monochrome style per meaning, for every view ---------------
MARK = {
    # meaning: (symbol, colour style, style without colour)
    "hazard": ("▲", "bold red", "bold reverse"),
    "risk": ("◆", "bold dark_orange", "bold"),
    "advice": ("●", "cyan", ""),
    "open": ("?", "bold medium_purple1", "bold underline"),
    "needs_data": ("∅", "yellow", "italic"),
    "pass": ("✓", "green", "dim"),
    "answered": ("✎", "steel_blue1", "dim"),
    "not_applicable": ("–", "dim", "dim"),
    "conflict": ("≠", "bold reverse red", "bold reverse"),
}
"""Failing findings by severity, then the other outcomes; "conflict" marks an answer that the
design file contradicts. The symbol and the word carry the meaning; colour is an extra."""

DECISION_SYMBOL = {
    None: "[ ]", "undecided": "[ ]", "will_change": "[→]", "accepted": "[A]",
    "not_applicable": "[–]", "reconfirm": "[!]", "resolved": "[=]", "orphan": "[×]",
}
"""The mark of a decision (kind, or the state that overrides it) in lists."""


def no_color() -> bool:
    """True when the environment asks for no colour (``NO_COLOR`` set, any value)."""
    import os

    return "NO_COLOR" in os.environ


def mark_key(f: Finding) -> str:
    return f.severity if f.outcome == "fail" else f.outcome


def style(key: str, color: bool | None = None) -> str:
    """The style of a meaning: its colour, or its monochrome style without colour."""
    sym, colour, mono = MARK[key]
    use = (not no_color()) if color is None else color
    return colour if use else mono


def mark(key: str) -> str:
    return MARK[key][0]


def title(f: Finding) -> str:
    """The heading a view gives a finding: the problem for a failing or open finding, the
    condition that holds for a passed one (:attr:`Finding.heading`)."""
    return f.heading


OUTCOME_WORD = {"fail": "fail", "pass": "pass", "needs_data": "needs data", "open": "open",
                "answered": "answered", "not_applicable": "does not apply", "absent": "absent"}
"""A finding's outcome as a reader says it."""


def outcome_word(outcome: str) -> str:
    return OUTCOME_WORD.get(outcome, outcome.replace("_", " "))


def num(value: float | None, unit: str) -> str:
    """A figure in a report cell: words where it is absent or not finite (never a symbol)."""
    return figure(value, unit)


def computed(f: Finding) -> str:
    """'28.8 V (typical 24 V)' — the worst-corner value, with the typical one when it differs."""
    if f.value is None:
        return ""
    text = distinct(f.value, f.limit, f.unit)[0] if f.limit is not None else num(f.value, f.unit)
    if f.value_typ is not None and num(f.value_typ, f.unit) != text:
        text += f" (typical {num(f.value_typ, f.unit)})"
    return text


def limit(f: Finding) -> str:
    return "" if f.limit is None else f"{f.relation} {distinct(f.value, f.limit, f.unit)[1]}"


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
        return "no toleranced input moves this"
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


# decisions --------------------------------------------------------------------------------------
KIND_LABEL = {
    "undecided": "undecided",
    "will_change": "will change the design",
    "accepted": "accepted",
    "not_applicable": "not applicable",
}
STATE_LABEL = {
    "current": "current",
    "reconfirm": "awaiting re-confirmation: the numbers have moved",
    "resolved": "resolved by the revision",
    "orphan": "orphan: no such finding any more",
}


def decision(d, state: str | None = None) -> str:
    """'accepted (ana, 2026-12-01): reason [current]': one line for a decision."""
    text = KIND_LABEL.get(d.kind, d.kind)
    by = getattr(d, "accepted_by", "")
    if by == d.reviewer:  # the reviewer accepts it: '(ana, date)' already says who
        by = ""
    if by:
        text += f" by {by}"
    who = ", ".join(x for x in (d.reviewer, d.at[:10]) if x)
    if who:
        text += f" (recorded by {who})" if by else f" ({who})"
    if d.reason:
        text += f": {d.reason}"
    if state:
        text += f" [{STATE_LABEL.get(state, state)}]"
    return text


def _numbers(value: float | None, limit: float | None, unit: str, outcome: str) -> str:
    """'24 V, limit 20 V (fail)': a value, its limit and the outcome, as the record keeps them."""
    parts = []
    if value is not None:
        parts.append(num(value, unit))
    if limit is not None:
        parts.append(f"limit {num(limit, unit)}")
    text = ", ".join(parts)
    if outcome:
        text += f" ({outcome_word(outcome)})" if text else outcome_word(outcome)
    return text


def decided_on(d) -> str:
    """The numbers a decision was made on: '24 V, limit 20 V (fail)'."""
    return _numbers(d.value, d.limit, d.unit, d.outcome)


def now_on(f) -> str:
    """The same numbers for the current finding, for side-by-side display."""
    return _numbers(f.value, f.limit, f.unit, f.outcome)


def record_rows(r) -> list[tuple[str, object, object, str]]:
    """Every decision of the review's record with its finding and state, ordered by state."""
    order = {"reconfirm": 0, "current": 1, "resolved": 2, "orphan": 3}
    rows = [(k, d, r.finding(k), r.state(k)) for k, d in sorted(r.record.decisions.items())]
    return sorted(rows, key=lambda row: (order.get(row[3], 9), row[0]))
