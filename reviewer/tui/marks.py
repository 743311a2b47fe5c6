"""How the walkthrough marks things: a word and a symbol for each, colour only as an extra.

The symbols and colours are those of every view (:data:`reviewer.report.common.MARK`), so the
walkthrough and the text report agree. Everything here reads without colour (``NO_COLOR``, a
monochrome terminal, a screen reader): the symbol and the word carry the meaning, and under
``NO_COLOR`` the styles are monochrome ones (hazard bold reverse, risk bold, advice plain,
passed dim).
"""

from __future__ import annotations

from reviewer.report.common import DECISION_SYMBOL, MARK, no_color, style

WORD = {
    "hazard": "HAZARD", "risk": "RISK", "advice": "ADVICE", "open": "OPEN", "needs_data": "DATA",
    "pass": "PASS", "answered": "ANSWER", "not_applicable": "N/A", "conflict": "CLASH",
}

DECISION_WORDS = {
    None: "undecided",
    "undecided": "undecided",
    "will_change": "will change the design",
    "accepted": "accepted as it stands",
    "not_applicable": "does not apply",
    "reconfirm": "re-confirm: the numbers moved since this decision",
    "resolved": "resolved: no longer fails",
    "orphan": "kept: its finding no longer exists",
}

LONG_WORD = {"open": "OPEN QUESTION", "needs_data": "NEEDS DATA", "answered": "ANSWERED",
             "conflict": "ANSWER CONTRADICTS THE DESIGN"}
"""The words in full where there is room (details, status line)."""

ANSWER_WORD = {"yes": "yes", "no": "no", "not_applicable": "does not apply"}

KIND_KEYS = {"c": "will_change", "a": "accepted", "x": "not_applicable", "u": "undecided"}
"""Keys of the decision dialog."""


def outcome_key(outcome: str, severity: str) -> str:
    return severity if outcome == "fail" else outcome


def outcome_mark(outcome: str, severity: str) -> tuple[str, str, str]:
    """(symbol, word, style) for a finding's outcome (a failing one by its severity)."""
    key = outcome_key(outcome, severity)
    return MARK[key][0], WORD[key], style(key)


def key_mark(key: str) -> tuple[str, str, str]:
    return MARK[key][0], WORD[key], style(key)


def decision_mark(kind: str | None, state: str | None) -> tuple[str, str]:
    """(list mark, words) for a decision, its state overriding where it matters."""
    k = state if state in ("reconfirm", "resolved", "orphan") else kind
    if k not in DECISION_WORDS:
        k = None
    return DECISION_SYMBOL[k], DECISION_WORDS[k]


def reverse(style_text: str) -> str:
    """A style for a banner of this meaning: reversed in colour; as is without colour (already
    reversed for a hazard, and a reversed dim would be unreadable)."""
    if no_color():
        return style_text or "bold"
    return style_text + " reverse"
