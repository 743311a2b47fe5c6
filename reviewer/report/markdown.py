"""The review as Markdown (CommonMark with GitHub-style tables): reads well rendered and plain.

Sections, in order: title block, caution (beyond extra-low voltage), summary by area and
severity, pictures (when written beside the report), every failing finding with its numbers and
decision, the rest of the review record (resolved, orphaned and other decisions), open questions,
answered questions, checks that need data, passed checks, layout constraints, proposed changes,
and the calculation sheet as an appendix. A pure function of the :class:`Review` objects.
"""

from __future__ import annotations

from datetime import date as _date

from reviewer.findings import SEVERITIES
from reviewer.report import common
from reviewer.review import AID_NOTE, CAUTION, Review

Pictures = list[tuple[str, str]]
"""(caption, link relative to the report) for each picture written beside the report."""


def _cell(text: object) -> str:
    return str(text).replace("|", "\\|").replace("\n", " ")


def _n(count: int, noun: str) -> str:
    return f"{count} {noun}" + ("" if count == 1 else "s")


def _code(text: str) -> str:
    return f"`{text}`" if text else ""


def render(reviews: list[Review], review_date: str | None = None,
           pictures: dict[str, Pictures] | None = None) -> str:
    """Markdown for one or more reviews.

    Parameters
    ----------
    reviews
        The reviews, in order.
    review_date
        Date printed as the review date (ISO 8601); today when not given.
    pictures
        For each review path, the pictures written beside the report, linked from it.
    """
    when = review_date or _date.today().isoformat()
    pictures = pictures or {}
    return "\n\n---\n\n".join(_one(r, when, pictures.get(r.path, [])) for r in reviews)


def _one(r: Review, when: str, pics: Pictures) -> str:
    d = r.design.design
    out = [f"# Design review: {d.title}", ""]
    rows = [("Design file", _code(r.path)), ("Revision", d.revision), ("Author", d.author),
            ("Design date", d.date), ("Review date", when)]
    rec = r.record
    if rec.decisions or rec.answers or rec.proposals:
        rows.append(("Review record", f"{_n(len(rec.decisions), 'decision')}, "
                                      f"{_n(len(rec.answers), 'answer')}, "
                                      f"{_n(len(rec.proposals), 'proposed change')}"))
    out += ["| | |", "|---|---|"]
    out += [f"| **{k}** | {_cell(v)} |" for k, v in rows if v]
    out.append("")
    if d.notes:
        out += [f"*Designer's notes:* {d.notes}", ""]
    if r.beyond_elv:
        out += [f"> **CAUTION: beyond extra-low voltage.** {CAUTION}", ""]
    out += [f"> {AID_NOTE}", ""]
    out += _summary(r)
    if pics:
        out += ["## Pictures", ""]
        for caption, link in pics:
            out += [f"![{caption}]({link})", "", f"*{caption}.*", ""]
    out += _findings(r)
    out += _record(r)
    out += _questions(r)
    if r.disabled:
        out += ["## Rules switched off", "", "| Rule | Title | Reason | By |", "|---|---|---|---|"]
        out += [f"| `{x.rule_id}` | {_cell(x.title)} | {_cell(x.reason)} | {_cell(x.origin)} |"
                for x in r.disabled]
        out.append("")
    if r.notices:
        out += ["## Notices on the input", "", *[f"- {_cell(n)}" for n in r.notices], ""]
    missing = r.by_outcome("needs_data")
    if missing:
        out += ["## Not checked: needs data", "",
                "These checks could not run: the design does not give a value they need.", "",
                "| Check | Title | Give |", "|---|---|---|"]
        out += [f"| `{f.key}` | {_cell(f.heading)} | {_cell(common.needs(f))} |" for f in missing]
        out.append("")
    passed = r.by_outcome("pass")
    if passed:
        out += ["## Passed checks", "", "| Check | Title | Computed | Limit | Margin |",
                "|---|---|---|---|---|"]
        out += [f"| `{f.key}` | {_cell(f.heading)} | {_cell(common.computed(f) or 'holds')} | "
                f"{_cell(common.limit(f))} | {_cell(common.margin(f))} |" for f in passed]
        out.append("")
    out += _layout(r)
    if rec.proposals:
        out += ["## Proposed changes", "", "| Field | Proposed value | Note | By |", "|---|---|---|---|"]
        out += [f"| `{p.field}` | {_cell(p.value)} | {_cell(p.note)} | {_cell(p.reviewer)} |"
                for _, p in sorted(rec.proposals.items())]
        out.append("")
    out += _sheet(r)
    out += ["", f"*{AID_NOTE}*", ""]
    return "\n".join(out)


def _summary(r: Review) -> list[str]:
    cols = [*SEVERITIES, "needs_data", "open", "pass"]
    areas = sorted({f.area for f in r.findings})
    table: dict[str, dict[str, int]] = {a: dict.fromkeys(cols, 0) for a in areas}
    for f in r.findings:
        key = f.severity if f.outcome == "fail" else f.outcome
        if key in cols:
            table[f.area][key] += 1
    heads = ["Hazard", "Risk", "Advice", "Needs data", "Open", "Passed"]
    out = ["## Summary", "", "Failing findings by area and severity, with the checks that could "
           "not run, the open questions and the checks that passed.", "",
           "| Area | " + " | ".join(heads) + " |", "|---|" + "---:|" * len(heads)]
    for a in areas:
        out.append(f"| {a} | " + " | ".join(str(table[a][c]) for c in cols) + " |")
    total = {c: sum(table[a][c] for a in areas) for c in cols}
    out.append("| **all** | " + " | ".join(f"**{total[c]}**" for c in cols) + " |")
    out.append("")
    fails = r.failures
    settled = sum(1 for f in fails if r.settled(f))
    reconfirm = sum(1 for f in fails if r.state(f.key) == "reconfirm")
    undecided = sum(1 for f in fails if r.decision(f.key) is None)
    if fails:
        out += [f"Of {_n(len(fails), 'failing finding')}: {settled} settled by a current decision, "
                f"{reconfirm} awaiting re-confirmation, {undecided} without a decision.", ""]
    else:
        out += ["No check fails.", ""]
    return out


def _findings(r: Review) -> list[str]:
    fails = r.failures
    if not fails:
        return []
    out = ["## Findings", ""]
    for i, f in enumerate(fails, start=1):
        out += [f"### {i}. {common.label(f)}: {f.heading}", "",
                f"`{f.key}` · area {f.area} · {f.severity}" +
                (" · settled by decision" if r.settled(f) else ""), ""]
        rows = []
        if f.value is not None:
            rows += [("Computed (worst corner)", common.computed(f)), ("Limit", common.limit(f)),
                     ("Margin", common.margin(f)), ("Worst at", common.corner(f))]
        if f.pass_value is not None:
            rows.append(("Passes at", common.pass_text(f)))
        if f.fields:
            rows.append(("Design fields", ", ".join(f"`{x}`" for x in f.fields)))
        if rows:
            out += ["| | |", "|---|---|"] + [f"| {k} | {_cell(v)} |" for k, v in rows] + [""]
        if f.question:
            out += [f"**Question.** {f.question}", ""]
            if f.answer_note:
                out += [f"**Answered no.** {f.answer_note}", ""]
        out += [f"**Why it matters.** {f.why}", ""]
        if f.mitigation:
            out += [f"**What to do.** {f.mitigation}", ""]
        for a in f.assumptions:
            out += [f"*Assumes:* {a}", ""]
        out += [f"**Source.** {f.reference} ({common.basis(f)}).", ""]
        d = r.decision(f.key)
        if d is None:
            out += ["**Decision.** none recorded.", ""]
        else:
            st = r.state(f.key)
            out += [f"**Decision.** {common.decision(d, st)}.", ""]
            if st == "reconfirm":
                out += ["| | Decided on | Now |", "|---|---|---|",
                        f"| value | {_cell(common.num(d.value, d.unit))} | "
                        f"{_cell(common.num(f.value, f.unit))} |",
                        f"| limit | {_cell(common.num(d.limit, d.unit))} | "
                        f"{_cell(common.num(f.limit, f.unit))} |",
                        f"| outcome | {d.outcome} | {f.outcome} |", ""]
    return out


def _record(r: Review) -> list[str]:
    failing = {f.key for f in r.failures}
    rows = [row for row in common.record_rows(r) if row[0] not in failing]
    if not rows:
        return []
    out = ["## Other decisions in the record", "",
           "Decisions on findings that do not fail now: resolved by a revision, orphaned (the "
           "finding no longer exists; kept, never dropped) or made on a check that passes.", "",
           "| Finding | Decision | State | Decided on | Now |", "|---|---|---|---|---|"]
    for key, d, f, st in rows:
        now = common.now_on(f) if f is not None else "no such finding"
        out.append(f"| `{key}` | {_cell(common.decision(d))} | {common.STATE_LABEL.get(st, st)} | "
                   f"{_cell(common.decided_on(d))} | {_cell(now)} |")
    out.append("")
    return out


def _questions(r: Review) -> list[str]:
    out: list[str] = []
    questions = r.by_outcome("open")
    if questions:
        out += ["## Open questions", "",
                "Questions the numbers cannot settle; answer them with `reviewer answer` or in "
                "the design's `[checklist]` table.", ""]
        out += [f"- **`{f.rule_id}`** ({f.severity}): {f.question or f.title}" for f in questions]
        out.append("")
    answered = [f for f in r.findings if f.question and f.outcome in ("answered", "not_applicable")]
    if answered:
        out += ["## Answered questions", "", "| Question | Answer | Note | By |", "|---|---|---|---|"]
        for f in answered:
            a = r.record.answers.get(f.rule_id)
            who = f"{a.reviewer} on {a.at[:10]}" if a and a.reviewer else (
                "design file" if a is None else "")
            word = "yes" if f.outcome == "answered" else "not applicable"
            note = a.note if a is not None else f.answer_note
            out.append(f"| `{f.rule_id}` {_cell(f.question)} | {word} | {_cell(note)} | "
                       f"{_cell(who)} |")
        out.append("")
    return out


def _layout(r: Review) -> list[str]:
    rows = sorted((q for q in r.sheet.quantities.values() if q.name.startswith("layout.")),
                  key=lambda q: q.name)
    if not rows:
        return []
    out = ["## Layout constraints", "",
           "What the layout must respect, at the worst corner of the tolerances.", "",
           "| Constraint | Quantity | Worst corner | Typical | Note |", "|---|---|---|---|---|"]
    for q in rows:
        if q.kind == "number":
            worst, typ = common.num(q.hi, q.unit), common.num(q.typ, q.unit)
        else:
            worst, typ = str(q.typ), ""
        out.append(f"| {_cell(q.label)} | `{q.name}` | {worst} | {typ} | {_cell(q.note)} |")
    out.append("")
    return out


def _sheet(r: Review) -> list[str]:
    out = ["## Appendix: calculation sheet", "",
           "Every value computed from the design, over the tolerance corners.", "",
           "| Quantity | Meaning | Typical | Min | Max | Note |", "|---|---|---|---|---|---|"]
    for q in sorted(r.sheet.quantities.values(), key=lambda q: q.name):
        if q.origin == "design":
            continue
        if q.kind == "flag":
            out.append(f"| `{q.name}` | {_cell(q.label)} | {'yes' if q.typ else 'no'} | | | "
                       f"{_cell(q.note)} |")
        elif q.kind == "text":
            out.append(f"| `{q.name}` | {_cell(q.label)} | {_cell(q.typ)} | | | {_cell(q.note)} |")
        else:
            lo = common.num(q.lo, q.unit) if q.toleranced else ""
            hi = common.num(q.hi, q.unit) if q.toleranced else ""
            out.append(f"| `{q.name}` | {_cell(q.label)} | {common.num(q.typ, q.unit)} | {lo} | "
                       f"{hi} | {_cell(q.note)} |")
    missing = sorted((m for m in r.sheet.missing.values() if not m.name.startswith("design.")),
                     key=lambda m: m.name)
    if missing:
        out += ["", "Not computed for lack of data:", "", "| Quantity | Give |", "|---|---|"]
        out += [f"| `{m.name}` | {_cell(', '.join(m.needs))} |" for m in missing]
    return out
