"""The engine: every compiled rule against the calculation sheet, at its worst corner -> findings.

Each rule is judged on its own margin over the runs :mod:`reviewer.worstcase` chooses for it
(every vertex of the toleranced inputs it depends on, or a search); its finding takes every
number from one run, the worst. Knows nothing of files or views. A limit holds when its
margin is not below zero (a relative slack of 1e-9 absorbs floating-point noise, so a value
exactly at its limit passes).
"""

from __future__ import annotations

from dataclasses import replace
from typing import Any

from reviewer.findings import Finding
from reviewer.margins import SLACK, Margins, margins, rule_names
from reviewer.quantities import Run, Sheet
from reviewer.rulebook.loader import Compiled, Rulebook, placeholders
from reviewer.sensitivity import METHOD, swings, wanted
from reviewer.shown import distinct, figure
from reviewer.worstcase import runs_for, search_all

__all__ = ["SLACK", "evaluate", "judge", "finding_at", "runs_of", "render_text", "corner_text"]


def evaluate(book: Rulebook, sheet: Sheet, answers: dict[str, Any] | None = None) -> list[Finding]:
    """Judge every rule; ``answers`` maps checklist question ids to ("yes"|"no"|"not_applicable", note)."""
    answers = answers or {}
    searched: dict[int, tuple[list[Run], str]] = {}
    if sheet.runner is not None:  # every rule's worst-case search side by side, batch by batch
        wanted = [c for c in book.compiled if c.rule.kind != "question" and _applies_known(c, sheet)]
        searched = {id(c): got for c, got in zip(wanted, search_all(wanted, sheet.runner))}
    return [judge(c, sheet, answers, searched=searched.get(id(c))) for c in book.compiled]


def _applies_known(c: Compiled, sheet: Sheet) -> bool:
    """Whether the rule gets as far as its worst-case search (its ``applies`` can be judged)."""
    return c.applies is None or not _needs(sheet, c.applies.names - set(c.params))


def _base(c: Compiled, outcome: str, **kw: Any) -> Finding:
    r = c.rule
    return Finding(
        rule_id=r.id, subject=c.subject, area=r.area, title=c.title, severity=r.severity,
        outcome=outcome, why=" ".join(c.why.split()), reference=r.reference, basis=r.basis,
        unit=c.unit, relation=r.relation, fields=c.fields, origin=r.origin,
        question=" ".join((r.ask or "").split()), assumptions=tuple(r.assumptions),
        fail_title=c.fail_title, **kw,
    )


def _sheet_runs(sheet: Sheet) -> list[Run]:
    """The runs of a sheet built without a runner, rebuilt from its quantities' values."""
    runs = []
    for i, label in enumerate(sheet.corners):
        values: dict[str, Any] = {}
        out: dict[str, Any] = {}
        for name, q in sheet.quantities.items():
            x = q.runs[i] if i < len(q.runs) else None
            if q.origin == "design" and name.startswith("design."):
                values[name[7:]] = x
            elif x is not None:
                out[name] = x
        runs.append(Run(label, values, out, {}, {}, ()))
    return runs


def runs_of(c: Compiled, sheet: Sheet) -> tuple[list[Run], str]:
    """The runs rule ``c`` is judged on (see :mod:`reviewer.worstcase`) and how they were chosen."""
    if sheet.runner is None:
        return _sheet_runs(sheet), "worst of the sheet's corner runs"
    return runs_for(c, sheet.runner)


def _needs(sheet: Sheet, names: frozenset[str]) -> list[str]:
    needs: list[str] = []
    for n in sorted(names):
        if n not in sheet.quantities:
            miss = sheet.missing.get(n)
            needs.extend(miss.needs if miss else (n,))
    return needs


def judge(c: Compiled, sheet: Sheet, answers: dict[str, Any],
          sensitivity: bool = True, searched: tuple[list[Run], str] | None = None) -> Finding:
    """Rule ``c`` judged on ``sheet`` at its worst run; with ``sensitivity`` False, without the
    sensitivity ranking (a caller that wants the verdict and its numbers only). ``searched``:
    the runs and method of its worst-case search, made already (:func:`evaluate` runs every
    rule's search side by side); None: searched here."""
    rule = c.rule
    if rule.kind == "question":
        return _question(c, answers)
    if c.applies is not None:
        needs = _needs(sheet, c.applies.names - set(c.params))
        if needs:
            return _base(c, "needs_data", needs=tuple(dict.fromkeys(needs)))
    runs, method = searched if searched is not None else runs_of(c, sheet)
    needs = _needs(sheet, rule_names(c, applies=False))
    m = margins(c, runs, verdict=not needs)
    if not m.applies.any():
        return _base(c, "not_applicable", search=method)
    if needs:
        return _base(c, "needs_data", needs=tuple(dict.fromkeys(needs)))
    f = finding_at(c, sheet, runs, m, method)
    if sensitivity and sheet.runner is not None and wanted(f):
        f = replace(f, sensitivity=swings(c, sheet.runner), sensitivity_method=METHOD)
    return f


def finding_at(c: Compiled, sheet: Sheet, runs: list[Run], m: Margins, method: str,
               **extra: Any) -> Finding:
    """The finding of rule ``c`` at its worst run among ``runs`` (evaluated as ``m``)."""
    import numpy as np

    rule = c.rule
    judged = m.applies & m.ok
    blind = np.flatnonzero(m.applies & ~m.ok)
    uncomputed = ""
    if blind.size:
        i = int(blind[0])
        what = ", ".join(m.absent[i]) or "the value"
        uncomputed = (f"{what} cannot be computed at {corner_text(runs[i].label)}"
                      + (f" ({blind.size} of {len(runs)} runs)" if blind.size > 1 else ""))
    if not judged.any():
        needs = [x for n in m.absent[int(blind[0])] for x in _run_needs(runs[int(blind[0])], n)]
        return _base(c, "needs_data", needs=tuple(dict.fromkeys(needs)), search=method,
                     uncomputed=uncomputed, **extra)
    score = np.where(judged, m.margin, np.inf)
    low = float(np.min(score))
    ties = np.flatnonzero(score <= low + 1e-12 * max(1.0, abs(low))) if np.isfinite(low) \
        else np.flatnonzero(score == low)
    idx = min(ties, key=lambda i: (len(runs[i].label), i))  # the plainest of equal corners
    idx = int(idx)
    failed = m.failed(idx)
    if not failed and blind.size:
        i = int(blind[0])
        needs = [x for n in m.absent[i] for x in _run_needs(runs[i], n)]
        return _base(c, "needs_data", needs=tuple(dict.fromkeys(needs)), search=method,
                     uncomputed=uncomputed, **extra)
    value = limit = margin = value_typ = None
    if m.value is not None:
        value, limit, margin = float(m.value[idx]), float(m.limit[idx]), float(m.margin[idx])
        value_typ = float(m.value[0]) if judged[0] else None
    run = runs[idx]
    scalars = {k: (v[idx] if isinstance(v, np.ndarray) and v.shape == (len(runs),) else v)
               for k, v in m.env.items()}
    extra_names = _mitigation_names(c) | (c.pass_value.names if c.pass_value is not None else set())
    for name in extra_names - set(scalars) - {"value", "limit", "pass_value", "margin", "subject"}:
        x = run.get(name)
        if x is None and not any(r.get(name) is not None for r in runs[1:]):
            x = runs[0].get(name)  # a figure computed at typical values only (its note says so)
        if x is not None:
            scalars[name] = x
    pass_value = None
    if c.pass_value is not None and failed:
        try:
            pass_value = float(c.pass_value.evaluate(scalars))
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
        mitigation=text, corner=run.label, search=method, uncomputed=uncomputed, **extra,
    )


def _run_needs(run: Run, name: str) -> tuple[str, ...]:
    if name.startswith("design."):
        return (name[7:],)
    return run.missing.get(name) or (name,)


def corner_text(label: tuple[tuple[str, str], ...]) -> str:
    """A corner in words: "typical values" or "timing.dead_time at min, switch.high.vth at max"."""
    if not label:
        return "typical values"
    return ", ".join(f"{p} at {e}" for p, e in label)


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
