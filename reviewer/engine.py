"""The engine: every compiled rule against the calculation sheet, at its worst corner -> findings.

Knows nothing of files or views. A limit holds when its margin is not below zero (a relative
slack of 1e-9 absorbs floating-point noise, so a value exactly at its limit passes).
"""

from __future__ import annotations

from typing import Any

from reviewer.findings import Finding
from reviewer.quantities import Sheet
from reviewer.rulebook.loader import Compiled, Rulebook, placeholders
from reviewer.shown import distinct, figure

SLACK = 1e-9


def evaluate(book: Rulebook, sheet: Sheet, answers: dict[str, Any] | None = None) -> list[Finding]:
    """Judge every rule; ``answers`` maps checklist question ids to ("yes"|"no"|"not_applicable", note)."""
    answers = answers or {}
    return [judge(c, sheet, answers) for c in book.compiled]


def _base(c: Compiled, outcome: str, **kw: Any) -> Finding:
    r = c.rule
    return Finding(
        rule_id=r.id, subject=c.subject, area=r.area, title=c.title, severity=r.severity,
        outcome=outcome, why=" ".join(c.why.split()), reference=r.reference, basis=r.basis,
        unit=c.unit, relation=r.relation, fields=c.fields, origin=r.origin,
        question=" ".join((r.ask or "").split()), assumptions=tuple(r.assumptions),
        fail_title=c.fail_title, **kw,
    )


class _Env:
    """Values a rule reads, as arrays over the sheet's runs; absent names are collected."""

    def __init__(self, sheet: Sheet, params: dict[str, float]):
        self.sheet = sheet
        self.values: dict[str, Any] = dict(params)
        self.needs: list[str] = []

    def load(self, names: frozenset[str]) -> bool:
        import numpy as np

        ok = True
        for n in names:
            if n in self.values:
                continue
            q = self.sheet.quantities.get(n)
            if q is None:
                miss = self.sheet.missing.get(n)
                self.needs.extend(miss.needs if miss else (n,))
                ok = False
            elif q.kind == "text":
                self.values[n] = q.typ
            elif q.kind == "flag":
                self.values[n] = np.array(q.runs, dtype=bool)
            else:
                self.values[n] = np.array(q.runs, dtype=float)
        return ok


def judge(c: Compiled, sheet: Sheet, answers: dict[str, Any]) -> Finding:
    import numpy as np

    rule = c.rule
    if rule.kind == "question":
        return _question(c, answers)
    env = _Env(sheet, c.params)
    n = sheet.run_count
    if c.applies is not None:
        if not env.load(c.applies.names):
            return _base(c, "needs_data", needs=tuple(dict.fromkeys(env.needs)))
        if not bool(np.broadcast_to(c.applies.evaluate(env.values), (n,))[0]):
            return _base(c, "not_applicable")
    exprs = [e for e in (c.value, c.limit, c.fails_when, c.pass_value) if e is not None]
    mit_exprs = _mitigation_names(c)
    for e in exprs:
        env.load(e.names - {"value", "limit"})
    if env.needs:
        return _base(c, "needs_data", needs=tuple(dict.fromkeys(env.needs)))
    env.load(mit_exprs)  # names only the text uses: shown in words when absent, never blocking

    value = limit = margin = None
    if c.value is not None:
        v = np.broadcast_to(np.asarray(c.value.evaluate(env.values), dtype=float), (n,))
        lim = c.limit_const if c.limit is None else c.limit.evaluate({**env.values, "value": v})
        lim = np.broadcast_to(np.asarray(lim, dtype=float), (n,))
        m = (lim - v) if rule.at_most is not None else (v - lim)
        m = np.where(np.isnan(m), -np.inf, m)
        idx = int(np.argmin(m))
        failed = m[idx] < -SLACK * max(abs(lim[idx]), 1e-30)
        value, limit, margin = float(v[idx]), float(lim[idx]), float(m[idx])
        env.values["value"], env.values["limit"] = v, lim
        value_typ = float(v[0])
    else:
        f = np.broadcast_to(np.asarray(c.fails_when.evaluate(env.values), dtype=bool), (n,))
        hits = np.flatnonzero(f)
        failed = bool(hits.size)
        idx = int(hits[0]) if failed else 0
        value_typ = None
    scalars = {k: (val[idx] if isinstance(val, np.ndarray) and val.shape == (n,) else val)
               for k, val in env.values.items()}
    pass_value = None
    if c.pass_value is not None and failed:
        try:
            pv = c.pass_value.evaluate(scalars)
            pass_value = float(pv)
        except Exception:  # a pass value that cannot be computed here (e.g. no positive solution)
            pass_value = None
        scalars["pass_value"] = pass_value
    scalars["margin"] = margin
    scalars["subject"] = c.subject
    text = render_text(c.mitigation, scalars, c, sheet) if failed else ""
    return _base(
        c, "fail" if failed else "pass", value=value, value_typ=value_typ, limit=limit,
        margin=margin, pass_value=pass_value,
        pass_unit=rule.pass_.unit if rule.pass_ else "",
        pass_field=(rule.pass_.field.replace("{each}", c.subject) if rule.pass_ else ""),
        mitigation=text, corner=sheet.corners[idx] if idx < len(sheet.corners) else (),
    )


def _mitigation_names(c: Compiled) -> frozenset[str]:
    from reviewer.expr import compile_expr

    names: set[str] = set()
    for expr, _unit, _raw in placeholders(c.mitigation):
        try:
            names |= compile_expr(expr).names
        except ValueError:
            continue
    return frozenset(names - {"value", "limit", "pass_value", "margin", "subject"})


def render_text(text: str, scalars: dict[str, Any], c: Compiled, sheet: Sheet) -> str:
    """Fill ``{expression | unit}`` placeholders with values at the worst corner."""
    from reviewer.expr import compile_expr

    out = text
    for expr, unit, raw in placeholders(text):
        try:
            e = compile_expr(expr)
            if any(n not in scalars for n in e.names):
                shown = figure(None, "")
            else:
                result = e.evaluate(scalars)
                shown = _show(result, unit if unit is not None else _unit_of(expr, c, sheet))
                if expr in ("value", "limit") and unit is None:  # tell them apart when close
                    shown = distinct(scalars.get("value"), scalars.get("limit"),
                                     c.unit)[expr == "limit"]
        except ValueError:
            shown = figure(None, "")
        out = out.replace(raw, shown, 1)
    return " ".join(out.split())


def _unit_of(expr: str, c: Compiled, sheet: Sheet) -> str:
    if expr in ("value", "limit", "margin"):
        return c.unit
    if expr == "pass_value":
        return c.rule.pass_.unit if c.rule.pass_ else ""
    if expr in c.param_units:
        return c.param_units[expr]
    q = sheet.quantities.get(expr)
    return q.unit if q else ""


def _show(result: Any, unit: str) -> str:
    return figure(result, unit)


def _question(c: Compiled, answers: dict[str, Any]) -> Finding:
    got = answers.get(c.rule.id)
    if got is None:
        return _base(c, "open")
    answer, note = got
    outcome = {"yes": "answered", "no": "fail", "not_applicable": "not_applicable"}[answer]
    return _base(c, outcome, answer_note=note,
                 mitigation=" ".join(c.mitigation.split()) if outcome == "fail" else "")
