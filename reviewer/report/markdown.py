"""The review as Markdown (CommonMark with GitHub-style tables): reads well rendered and plain.

Sections, in order: title block, caution (beyond extra-low voltage), summary by area and
severity, pictures (when written beside the report), every failing finding with its numbers and
decision, the rest of the review record (resolved, orphaned and other decisions), open questions,
answered questions, checks that need data, passed checks, layout constraints, proposed changes,
and the calculation sheet as an appendix. A pure function of the :class:`Review` objects.
"""

from __future__ import annotations

from reviewer.clock import today as _today

from reviewer.findings import SEVERITIES
from reviewer.report import common
from reviewer.review import AID_NOTE, CAUTION, Review
from reviewer.spread import spread_rows, yield_cell

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
    when = review_date or _today()
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
    from reviewer.report.placeholders import sentence, unchanged

    left = unchanged(r.path)
    if left:
        out += [f"> **Placeholders.** {sentence(left)}", ""]
    if r.beyond_elv:  # one caution: it says the review is an aid, not an approval, as well
        out += [f"> **CAUTION: beyond extra-low voltage.** {CAUTION}", ""]
    else:
        out += [f"> {AID_NOTE}", ""]
    out += _summary(r)
    out += _conflicts(r)
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
        y = any(f.spread is not None for f in passed)  # a Yield column when samples were drawn
        out += ["## Passed checks", "", "| Check | Title | Computed | Limit | Margin |"
                + (" Yield |" if y else ""), "|---|---|---|---|---|" + ("---|" if y else "")]
        out += [f"| `{f.key}` | {_cell(common.title(f))} | {_cell(common.computed(f) or 'holds')} | "
                f"{_cell(common.limit(f))} | {_cell(common.margin(f))} |"
                + (f" {yield_cell(f)} |" if y else "") for f in passed]
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
    cols = [*SEVERITIES, "needs_data", "open", "answered", "pass"]
    areas = sorted({f.area for f in r.findings})
    table: dict[str, dict[str, int]] = {a: dict.fromkeys(cols, 0) for a in areas}
    for f in r.findings:
        key = f.severity if f.outcome == "fail" else f.outcome
        if key in cols:
            table[f.area][key] += 1
    heads = ["Hazard", "Risk", "Advice", "Needs data", "Open", "Answered", "Passed"]
    out = ["## Summary", "", "Failing findings by area and severity, with the checks that could "
           "not run, the open and the answered questions, and the checks that passed.", "",
           "| Area | " + " | ".join(heads) + " |", "|---|" + "---:|" * len(heads)]
    for a in areas:
        if not any(table[a].values()):  # an area with nothing in any column says nothing
            continue
        out.append(f"| {common.area_name(a)} | " + " | ".join(str(table[a][c]) for c in cols)
                   + " |")
    total = {c: sum(table[a][c] for a in areas) for c in cols}
    out.append("| **all** | " + " | ".join(f"**{total[c]}**" for c in cols) + " |")
    out.append("")
    fails = r.failures
    buckets = dict.fromkeys(("settled", "reconfirm", "will_change", "undecided"), 0)
    for f in fails:
        buckets[_bucket(r, f)] += 1
    if fails:  # every failing finding is in exactly one bucket: they add up
        out += [f"Of {_n(len(fails), 'failing finding')}: {buckets['settled']} settled by a "
                f"current decision, {buckets['will_change']} to be changed in the design, "
                f"{buckets['reconfirm']} awaiting re-confirmation, {buckets['undecided']} "
                "without a decision.", ""]
    else:
        out += ["No check fails.", ""]
    return out


def _conflicts(r: Review) -> list[str]:
    from reviewer.report.conflicts import conflicts

    found = conflicts(r)
    if not found:
        return []
    out = ["## Answers the design file contradicts", "",
           "These checklist answers disagree with the design file itself; until the design or "
           "the answer changes, they are not taken as passes.", ""]
    out += [f"- **≠ `{c.question}`** answered *{c.answer}*, but the design file has "
            f"`{c.field}` = {_cell(c.value)}: {c.message}." for c in found]
    out.append("")
    return out


def _bucket(r: Review, f) -> str:
    """The one bucket of a failing finding: settled, reconfirm, will_change or undecided."""
    if r.settled(f):
        return "settled"
    d = r.decision(f.key)
    if d is not None and r.state(f.key) == "reconfirm":
        return "reconfirm"
    if d is not None and d.kind == "will_change":
        return "will_change"
    return "undecided"


def heading(f) -> str:
    """A finding's heading, naming the side of the leg it is about ('… — high side')."""
    title = common.title(f)
    if f.subject in ("high", "low"):
        return f"{title} — {f.subject} side"
    return f"{title} ({f.subject})" if f.subject else title


def _findings(r: Review) -> list[str]:
    fails = r.failures
    if not fails:
        return []
    out = ["## Findings", ""]
    for i, f in enumerate(fails, start=1):
        out += [f"### {i}. {common.label(f)}: {heading(f)}", "",
                f"`{f.key}` · area {common.area_name(f.area)} · {f.severity}" +
                (" · settled by decision" if r.settled(f) else ""), ""]
        rows = []
        if f.value is not None:
            rows += [("Computed (worst corner)", common.computed(f)), ("Limit", common.limit(f)),
                     ("Margin", common.margin(f)), ("Worst at", common.corner(f))]
        rows += [(k.capitalize(), v) for k, v in spread_rows(f)]  # search, yield, sensitivity
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
            if st in ("reconfirm", "resolved"):
                out += ["| | Decided on | Now |", "|---|---|---|",
                        f"| value | {_cell(common.num(d.value, d.unit))} | "
                        f"{_cell(common.num(f.value, f.unit))} |",
                        f"| limit | {_cell(common.num(d.limit, d.unit))} | "
                        f"{_cell(common.num(f.limit, f.unit))} |",
                        f"| outcome | {common.outcome_word(d.outcome)} | "
                        f"{common.outcome_word(f.outcome)} |", ""]
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
            from reviewer.report.conflicts import for_question

            if for_question(r, f.rule_id):
                word += " (≠ contradicted by the design file, see above)"
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


# writing a report file -----------------------------------------------------------------------
def write_pictures(reviews: list[Review], output, tell=None) -> dict[str, Pictures]:
    """Write each review's pictures beside ``output``; {review path: [(caption, link)]}.

    ``tell(message)`` hears each file written and why pictures were left out (matplotlib
    absent)."""
    from pathlib import Path

    from reviewer.report import pictures

    tell = tell or (lambda message: None)
    output = Path(output)
    out: dict[str, Pictures] = {}
    for r in reviews:
        stem = output.stem if len(reviews) == 1 else f"{output.stem}.{Path(r.path).stem}"
        try:
            made = pictures.write_pictures(r, output.parent, stem)
        except pictures.PicturesUnavailable as e:
            tell(f"note: pictures left out: {e}")
            return {}
        for _, name in made:
            tell(f"wrote {output.parent / name}")
        out[r.path] = made
    return out


def write(reviews: list[Review], output, with_pictures: bool = True, tell=None,
          extra: str = "") -> str:
    """Write the Markdown report of ``reviews`` to ``output``, its pictures beside it: the one
    writer of ``reviewer check --format markdown -o`` and of the walkthrough's export.

    ``extra`` is Markdown inserted before the appendix (the walkthrough's what-if section).
    Returns the text written."""
    from pathlib import Path

    from reviewer.atomic import write_text

    output = Path(output)
    output.parent.mkdir(parents=True, exist_ok=True)
    pics = write_pictures(reviews, output, tell) if with_pictures else {}
    text = render(reviews, pictures=pics)
    if extra:
        text = insert_before_appendix(text, extra)
    write_text(output, text)
    if tell:
        tell(f"wrote {output}")
    return text


def insert_before_appendix(text: str, extra: str) -> str:
    for anchor in ("\n## Appendix", "\n## Proposed changes"):
        at = text.find(anchor)
        if at >= 0:
            return text[:at].rstrip("\n") + "\n\n" + extra + "\n" + text[at:]
    return text.rstrip("\n") + "\n\n" + extra
