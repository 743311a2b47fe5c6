"""How the walkthrough marks things: a word and a symbol for each, colour only as an extra.

Everything here reads without colour (``NO_COLOR``, a monochrome terminal, a screen reader):
the symbol and the word carry the meaning; the style names are Textual/Rich colours on top.
"""

from __future__ import annotations

OUTCOME_MARK = {
    # key: (symbol, word, style)
    "hazard": ("▲", "HAZARD", "bold red"),
    "risk": ("◆", "RISK", "bold dark_orange"),
    "advice": ("●", "ADVICE", "cyan"),
    "open": ("?", "OPEN", "bold magenta"),
    "needs_data": ("∅", "DATA", "yellow"),
    "pass": ("✓", "PASS", "green"),
    "answered": ("✓", "ANSWERED", "green"),
    "not_applicable": ("–", "N/A", "dim"),
}

DECISION_MARK = {
    # decision kind or state: (short mark for the list, words for the detail)
    None: ("[ ]", "undecided"),
    "undecided": ("[ ]", "undecided"),
    "will_change": ("[→]", "will change the design"),
    "accepted": ("[✓]", "accepted as it stands"),
    "not_applicable": ("[–]", "does not apply"),
    "reconfirm": ("[!]", "re-confirm: the numbers moved since this decision"),
    "resolved": ("[=]", "resolved: no longer fails"),
    "orphan": ("[?]", "kept: its finding no longer exists"),
}

LONG_WORD = {"open": "OPEN QUESTION", "needs_data": "NEEDS DATA"}
"""The words in full where there is room (details, status line)."""

ANSWER_WORD = {"yes": "yes", "no": "no", "not_applicable": "does not apply"}

KIND_KEYS = {"c": "will_change", "a": "accepted", "x": "not_applicable", "u": "undecided"}
"""Keys of the decision dialog."""


def outcome_key(outcome: str, severity: str) -> str:
    return severity if outcome == "fail" else outcome


def outcome_mark(outcome: str, severity: str) -> tuple[str, str, str]:
    """(symbol, word, style) for a finding's outcome (a failing one by its severity)."""
    return OUTCOME_MARK[outcome_key(outcome, severity)]


def decision_mark(kind: str | None, state: str | None) -> tuple[str, str]:
    """(list mark, words) for a decision, its state overriding where it matters."""
    if state in ("reconfirm", "resolved", "orphan"):
        return DECISION_MARK[state]
    return DECISION_MARK.get(kind, DECISION_MARK[None])
