"""The review as Markdown (CommonMark with GitHub-style tables): reads well rendered and plain."""

from __future__ import annotations

from reviewer.report import common
from reviewer.review import AID_NOTE, CAUTION, Review


def _cell(text: str) -> str:
    return text.replace("|", "\\|").replace("\n", " ")


def render(reviews: list[Review]) -> str:
    return "\n\n---\n\n".join(_one(r) for r in reviews)


def _one(r: Review) -> str:
    d = r.design.design
    out = [f"# Design review: {d.title}", ""]
    meta = [("File", f"`{r.path}`"), ("Revision", d.revision), ("Author", d.author),
            ("Date", d.date)]
    out += [f"- **{k}:** {v}" for k, v in meta if v]
    out.append("")
    if r.beyond_elv:
        out += [f"> **CAUTION: beyond extra-low voltage.** {CAUTION}", ""]
    counts = r.counts()
    out += ["## Summary", "", "| Outcome | Count |", "|---|---:|"]
    for key in ("hazard", "risk", "advice", "needs_data", "open", "pass", "answered",
                "not_applicable"):
        if counts.get(key):
            out.append(f"| {common.LABEL[key]} | {counts[key]} |")
    out.append("")
    if r.failures:
        out += ["## Findings", ""]
    for f in r.failures:
        out += [f"### {common.label(f)}: {f.title} (`{f.key}`)", ""]
        if f.value is not None:
            out += ["| Computed | Limit | Margin | Worst at |", "|---|---|---|---|",
                    f"| {_cell(common.computed(f))} | {_cell(common.limit(f))} | "
                    f"{_cell(common.margin(f))} | {_cell(common.corner(f))} |", ""]
        if f.question:
            out += [f"**Question:** {f.question}", ""]
        out += [f"**Why it matters.** {f.why}", ""]
        if f.mitigation:
            out += [f"**What to do.** {f.mitigation}", ""]
        if f.pass_value is not None:
            out += [f"**Passes at:** {common.pass_text(f)}", ""]
        out += [f"*Source: {f.reference} ({common.basis(f)}).*", ""]
    missing = r.by_outcome("needs_data")
    if missing:
        out += ["## Not checked: needs data", "", "| Check | Give |", "|---|---|"]
        out += [f"| `{f.key}` {_cell(f.title)} | {_cell(common.needs(f))} |" for f in missing]
        out.append("")
    questions = r.by_outcome("open")
    if questions:
        out += ["## Open questions", ""]
        out += [f"- `{f.rule_id}`: {f.question or f.title}" for f in questions]
        out.append("")
    passed = r.by_outcome("pass") + r.by_outcome("answered")
    if passed:
        out += ["## Passed checks", "", "| Check | Computed | Limit | Margin |", "|---|---|---|---|"]
        out += [f"| `{f.key}` {_cell(f.title)} | {_cell(common.computed(f))} | "
                f"{_cell(common.limit(f))} | {_cell(common.margin(f))} |" for f in passed]
        out.append("")
    out += ["## Appendix: calculation sheet", "", "| Quantity | Typical | Min | Max | Note |",
            "|---|---|---|---|---|"]
    for q in sorted(r.sheet.quantities.values(), key=lambda q: q.name):
        if q.origin == "design" or q.kind == "text":
            continue
        if q.kind == "flag":
            out.append(f"| `{q.name}` {_cell(q.label)} | {'yes' if q.typ else 'no'} | | | |")
            continue
        out.append(f"| `{q.name}` {_cell(q.label)} | {common.num(q.typ, q.unit)} | "
                   f"{common.num(q.lo, q.unit)} | {common.num(q.hi, q.unit)} | {_cell(q.note)} |")
    out += ["", f"*{AID_NOTE}*", ""]
    return "\n".join(out)
