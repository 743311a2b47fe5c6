"""The review as JSON, in a documented, versioned shape.

The shape is described by the JSON Schema ``review.schema.json`` beside this module
(``reviewer schema --of review`` prints it). The output is always one envelope, whatever the
number of designs: ``{"format": "bridge-reviewer/review", "version": 2, "reviews": [...]}``.
``version`` changes only when a field is removed or changes meaning (fields may be added within
a version: readers ignore keys they do not know).

Each review: ``design`` (file and identity), ``beyond_extra_low_voltage`` and ``caution``,
``summary`` (failing findings by severity, other outcomes by name), ``findings`` (each with its
numbers, text, source, ``decision`` and ``settled``), ``record`` (every decision with its state,
answers, proposals; orphans included), ``sheet`` (every computed quantity) and ``missing``
(quantities not computed, with the fields that would let them be). Numbers are SI, in the
``unit`` given beside them; infinities are the strings ``"inf"`` and ``"-inf"``; a finding's
``relation`` is a word, ``"at_most"`` or ``"at_least"`` (``""`` for flags and questions).
"""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from typing import Any

from reviewer.review import CAUTION, Review

FORMAT = "bridge-reviewer/review"
VERSION = 2
RELATIONS = {"≤": "at_most", "≥": "at_least", "": ""}
"""A finding's relation in machine outputs: the word a rule file uses for the limit."""


def relation(symbol: str) -> str:
    """``"≤" -> "at_most"``, ``"≥" -> "at_least"``; words pass through."""
    return RELATIONS.get(symbol, symbol)


def schema() -> dict[str, Any]:
    """The JSON Schema (draft 2020-12) of :func:`to_data`'s output."""
    from importlib.resources import files

    return json.loads(files("reviewer.report").joinpath("review.schema.json")
                      .read_text(encoding="utf-8"))


def _clean(x: Any) -> Any:
    if isinstance(x, float) and (math.isnan(x) or math.isinf(x)):
        return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
    if isinstance(x, dict):
        return {k: _clean(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_clean(v) for v in x]
    return x


def _decision(r: Review, d: Any) -> dict[str, Any]:
    return {"key": d.key, "kind": d.kind, "reason": d.reason, "reviewer": d.reviewer, "at": d.at,
            "state": r.state(d.key),
            "decided_on": {"outcome": d.outcome or None, "value": d.value, "limit": d.limit,
                           "unit": d.unit}}


def to_data(r: Review) -> dict[str, Any]:
    d = r.design.design
    findings = []
    for f in r.findings:
        item = asdict(f)
        item["key"] = f.key
        item["relation"] = relation(f.relation)
        item["heading"] = f.heading
        item["fix"] = [{"field": p, "value": v} for p, v in f.fix]
        item["corner"] = [{"field": p, "at": end} for p, end in f.corner]
        item["needs"] = list(f.needs)
        item["fields"] = list(f.fields)
        item["assumptions"] = list(f.assumptions)
        dec = r.decision(f.key)
        item["decision"] = None if dec is None else _decision(r, dec)
        item["settled"] = f.outcome == "fail" and r.settled(f)
        findings.append(item)
    sheet = [
        {"name": q.name, "unit": q.unit, "label": q.label, "kind": q.kind, "typ": q.typ,
         "min": q.lo, "max": q.hi, "origin": q.origin, "note": q.note}
        for q in sorted(r.sheet.quantities.values(), key=lambda q: q.name)
    ]
    rec = r.record
    record = {
        "decisions": [_decision(r, x) for _, x in sorted(rec.decisions.items())],
        "orphans": [x.key for x in r.orphans],
        "answers": [{"question": a.question, "answer": a.answer, "note": a.note,
                     "reviewer": a.reviewer, "at": a.at} for _, a in sorted(rec.answers.items())],
        "proposals": [{"field": p.field, "value": p.value, "note": p.note,
                       "reviewer": p.reviewer, "at": p.at} for _, p in sorted(rec.proposals.items())],
    }
    return _clean({
        "design": {"file": r.path, "title": d.title, "revision": d.revision, "author": d.author,
                   "date": d.date},
        "beyond_extra_low_voltage": r.beyond_elv,
        "caution": CAUTION if r.beyond_elv else None,
        "summary": r.counts(),
        "findings": findings,
        "record": record,
        "disabled_rules": [{"rule": x.rule_id, "title": x.title, "reason": x.reason,
                            "origin": x.origin} for x in r.disabled],
        "notices": list(r.notices),
        "sheet": sheet,
        "missing": [{"name": m.name, "needs": list(m.needs)} for m in r.sheet.missing.values()
                    if not m.name.startswith("design.")],
    })


def envelope(reviews: list[Review]) -> dict[str, Any]:
    """The whole output: format, version and every review, in the order given."""
    return {"format": FORMAT, "version": VERSION, "reviews": [to_data(r) for r in reviews]}


def render(reviews: list[Review]) -> str:
    return json.dumps(envelope(reviews), indent=2, ensure_ascii=False) + "\n"
