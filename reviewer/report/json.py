"""The review as JSON, in a documented, versioned shape (see :data:`SCHEMA_ID`)."""

from __future__ import annotations

import json
import math
from dataclasses import asdict
from typing import Any

from reviewer.review import CAUTION, Review

FORMAT = "bridge-reviewer/review"
VERSION = 1


def _clean(x: Any) -> Any:
    if isinstance(x, float) and (math.isnan(x) or math.isinf(x)):
        return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
    if isinstance(x, dict):
        return {k: _clean(v) for k, v in x.items()}
    if isinstance(x, (list, tuple)):
        return [_clean(v) for v in x]
    return x


def to_data(r: Review) -> dict[str, Any]:
    d = r.design.design
    findings = []
    for f in r.findings:
        item = asdict(f)
        item["key"] = f.key
        item["corner"] = [{"field": p, "at": end} for p, end in f.corner]
        findings.append(item)
    sheet = [
        {"name": q.name, "unit": q.unit, "label": q.label, "typ": q.typ, "min": q.lo, "max": q.hi,
         "origin": q.origin, "note": q.note}
        for q in sorted(r.sheet.quantities.values(), key=lambda q: q.name)
    ]
    return _clean({
        "format": FORMAT,
        "version": VERSION,
        "design": {"file": r.path, "title": d.title, "revision": d.revision, "author": d.author,
                   "date": d.date},
        "beyond_extra_low_voltage": r.beyond_elv,
        "caution": CAUTION if r.beyond_elv else None,
        "summary": r.counts(),
        "findings": findings,
        "sheet": sheet,
        "missing": [{"name": m.name, "needs": list(m.needs)} for m in r.sheet.missing.values()
                    if not m.name.startswith("design.")],
    })


def render(reviews: list[Review]) -> str:
    data = [to_data(r) for r in reviews]
    return json.dumps(data[0] if len(data) == 1 else data, indent=2, ensure_ascii=False) + "\n"
