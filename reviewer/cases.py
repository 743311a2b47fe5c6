"""Mitigation cases: the text a failing finding shows when its usual figures would mean nothing.

A rule may give ``[[rule.cases]]`` after its ``mitigation`` (see
:class:`reviewer.rulebook.model.Case`): each holds ``when`` a condition is true at the finding's
worst corner, or when a quantity is ``absent`` (could not be computed). The first that holds
replaces the mitigation; it says what the situation means and which lever works ("no heatsink is
enough at this ambient: lower the loss").
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from reviewer.findings import Finding


def _run_of(f: Finding, sheet: Any) -> int:
    try:
        return sheet.corners.index(f.corner)
    except ValueError:
        return 0


def _holds(when: Any, c: Any, f: Finding, sheet: Any) -> bool:
    """``when`` at the finding's worst corner; False when a name it reads is absent."""
    idx = _run_of(f, sheet)
    env: dict[str, Any] = dict(c.params)
    env.update(value=f.value, limit=f.limit, margin=f.margin, subject=f.subject)
    for n in when.names:
        if n in env:
            if env[n] is None:
                return False
            continue
        q = sheet.quantities.get(n)
        if q is None:
            return False
        env[n] = q.typ if q.kind == "text" else q.runs[idx]
    try:
        return bool(when.evaluate(env))
    except Exception:  # a condition that cannot be judged here (a division by zero): not this case
        return False


def template(c: Any, f: Finding, sheet: Any) -> str:
    """The mitigation text (with placeholders) that finding ``f`` of compiled rule ``c`` shows."""
    for when, absent, text in getattr(c, "cases", ()):
        if absent is not None and absent not in sheet.quantities:
            return text
        if when is not None and _holds(when, c, f, sheet):
            return text
    return c.mitigation


def render(c: Any, f: Finding, sheet: Any, answers: dict[str, Any], text: str) -> str:
    """``text`` filled in at the finding's worst corner, as the engine fills a mitigation."""
    from reviewer.engine import judge

    return judge(replace(c, mitigation=text), sheet, answers).mitigation


def apply(findings: list[Finding], book: Any, sheet: Any, answers: dict[str, Any]) -> list[Finding]:
    """The findings, each failing one with the mitigation of the case that holds, if any."""
    compiled = {(c.rule.id, c.subject): c for c in book.compiled}
    out = []
    for f in findings:
        c = compiled.get((f.rule_id, f.subject))
        if f.outcome != "fail" or c is None or not getattr(c, "cases", ()) \
                or c.rule.kind == "question":
            out.append(f)
            continue
        text = template(c, f, sheet)
        out.append(f if text is c.mitigation else
                   replace(f, mitigation=render(c, f, sheet, answers, text)))
    return out
