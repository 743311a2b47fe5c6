"""Two reviews of a design side by side: what appeared, disappeared, changed outcome or moved.

Findings are matched by key (rule id and subject), as decisions are. A number has moved when it
changed by more than the record's re-confirmation tolerance (:data:`reviewer.record.RECONFIRM_TOLERANCE`),
so that ``reviewer diff`` shows exactly what would send a decision back for re-confirmation.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer import record as rec
from reviewer.findings import SEVERITIES, Finding
from reviewer.report import common
from reviewer.review import Review

KINDS = ("appeared", "disappeared", "outcome", "moved")
HEADINGS = {
    "appeared": "New failures",
    "disappeared": "No longer failing",
    "outcome": "Changed outcome",
    "moved": "Numbers moved",
}


@dataclass(frozen=True)
class Change:
    key: str
    kind: str  # one of KINDS
    old: Finding | None
    new: Finding | None


@dataclass(frozen=True)
class FieldChange:
    path: str
    unit: str
    old: object
    new: object


def compare(old: Review, new: Review) -> tuple[list[Change], list[FieldChange]]:
    """The findings that differ between ``old`` and ``new``, and the design fields that changed."""
    a = {f.key: f for f in old.findings}
    b = {f.key: f for f in new.findings}
    order = {s: i for i, s in enumerate(SEVERITIES)}
    changes = []
    for key in sorted(a.keys() | b.keys()):
        fa, fb = a.get(key), b.get(key)
        fails_a = fa is not None and fa.outcome == "fail"
        fails_b = fb is not None and fb.outcome == "fail"
        if fails_b and not fails_a:
            kind = "appeared"
        elif fails_a and not fails_b:
            kind = "disappeared"
        elif (fa.outcome if fa else None) != (fb.outcome if fb else None):
            kind = "outcome"
        elif fa is not None and fb is not None and (rec.moved(fa.value, fb.value)
                                                    or rec.moved(fa.limit, fb.limit)):
            kind = "moved"
        else:
            continue
        changes.append(Change(key, kind, fa, fb))
    changes.sort(key=lambda c: (KINDS.index(c.kind),
                                order[(c.new or c.old).severity], c.key))
    fields = []
    qa = {n: q for n, q in old.sheet.quantities.items() if q.origin == "design"}
    qb = {n: q for n, q in new.sheet.quantities.items() if q.origin == "design"}
    for name in sorted(qa.keys() | qb.keys()):
        x, y = qa.get(name), qb.get(name)
        vx = None if x is None else (x.lo, x.typ, x.hi)
        vy = None if y is None else (y.lo, y.typ, y.hi)
        if vx != vy:
            fields.append(FieldChange(name.removeprefix("design."), (x or y).unit,
                                      _span(x), _span(y)))
    return changes, fields


def _span(q) -> str:
    if q is None:
        return "not given"
    if q.kind != "number":
        return str(q.typ)
    text = common.num(q.typ, q.unit)
    if q.toleranced:
        text += f" [{common.num(q.lo, q.unit)} … {common.num(q.hi, q.unit)}]"
    return text


def side(f: Finding | None) -> str:
    """One side of a comparison: 'fail 25 V ≤ 20 V, margin -5 V (-25 %)'."""
    if f is None:
        return "absent"
    text = common.label(f) if f.outcome == "fail" else f.outcome
    if f.value is not None:
        text += f" {common.num(f.value, f.unit)}"
        if f.limit is not None:
            text += f" {common.limit(f)}"
        if f.margin is not None:
            text += f", margin {common.margin(f)}"
    return text


def render_text(old: Review, new: Review) -> str:
    changes, fields = compare(old, new)
    out = [f"old: {old.path}  ({_ident(old)})", f"new: {new.path}  ({_ident(new)})", ""]
    if not changes and not fields:
        return "\n".join(out + ["No differences in findings or design fields.", ""])
    for kind in KINDS:
        rows = [c for c in changes if c.kind == kind]
        if not rows:
            continue
        out.append(f"{HEADINGS[kind]} ({len(rows)}):")
        for c in rows:
            out += [f"  {c.key}  {(c.new or c.old).title}",
                    f"      old  {side(c.old)}", f"      new  {side(c.new)}"]
        out.append("")
    if fields:
        out.append(f"Design fields changed ({len(fields)}):")
        width = max(len(x.path) for x in fields)
        out += [f"  {x.path:<{width}}  {x.old}  ->  {x.new}" for x in fields]
        out.append("")
    return "\n".join(out)


def render_markdown(old: Review, new: Review) -> str:
    changes, fields = compare(old, new)
    cell = lambda s: str(s).replace("|", "\\|")  # noqa: E731
    out = [f"# Review differences: {new.design.design.title}", "",
           f"- **Old:** `{old.path}` ({_ident(old)})", f"- **New:** `{new.path}` ({_ident(new)})", ""]
    if not changes and not fields:
        return "\n".join(out + ["No differences in findings or design fields.", ""])
    for kind in KINDS:
        rows = [c for c in changes if c.kind == kind]
        if rows:
            out += [f"## {HEADINGS[kind]}", "", "| Finding | Old | New |", "|---|---|---|"]
            out += [f"| `{c.key}` {cell((c.new or c.old).title)} | {cell(side(c.old))} | "
                    f"{cell(side(c.new))} |" for c in rows]
            out.append("")
    if fields:
        out += ["## Design fields changed", "", "| Field | Old | New |", "|---|---|---|"]
        out += [f"| `{x.path}` | {cell(x.old)} | {cell(x.new)} |" for x in fields]
        out.append("")
    return "\n".join(out)


def to_data(old: Review, new: Review) -> dict:
    from reviewer.report.json import _clean

    changes, fields = compare(old, new)

    def one(f: Finding | None):
        if f is None:
            return None
        return {"outcome": f.outcome, "severity": f.severity, "value": f.value,
                "limit": f.limit, "margin": f.margin, "unit": f.unit}

    return _clean({
        "format": "bridge-reviewer/diff", "version": 1,
        "old": {"file": old.path, "revision": old.design.design.revision},
        "new": {"file": new.path, "revision": new.design.design.revision},
        "changes": [{"key": c.key, "kind": c.kind, "title": (c.new or c.old).title,
                     "old": one(c.old), "new": one(c.new)} for c in changes],
        "fields": [{"path": x.path, "old": x.old, "new": x.new} for x in fields],
    })


def _ident(r: Review) -> str:
    d = r.design.design
    return f"rev {d.revision}" if d.revision else "no revision given"
