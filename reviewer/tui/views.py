"""Text the walkthrough shows: pure functions from the walk's state to Rich ``Text``.

No Textual here, so the wording can be tested without a screen. Every mark has a word beside its
symbol and colour (see :mod:`reviewer.tui.marks`).
"""

from __future__ import annotations

from rich.text import Text

from reviewer.errors import Problem
from reviewer.report import common
from reviewer.tui.marks import ANSWER_WORD, LONG_WORD, decision_mark, outcome_mark
from reviewer.tui.session import Item, Walk


def short_name(item: Item) -> str:
    """'vgs-rating high': the rule id without its area, and the subject."""
    f = item.finding
    rid = f.rule_id.removeprefix(f.area + ".")
    return f"{rid} {f.subject}".strip()


def item_prompt(walk: Walk, item: Item, width: int = 40) -> Text:
    """One entry of the findings list: mark, word, name, decision mark; a what-if line if moved."""
    f = item.finding
    sym, word, style = outcome_mark(f.outcome, f.severity)
    if item.is_question:
        ans = walk.answer_of(item)
        tail = "[ ]" if ans is None else "[✓]"
    elif f.outcome == "fail" or (item.filed is not None and item.filed.outcome == "fail"):
        d = walk.decision(item.key)
        tail = decision_mark(d.kind if d else None, walk.decision_state(item))[0]
    else:
        tail = "   "
    name_w = max(8, width - 13)
    name = short_name(item)
    if len(name) > name_w:  # shorten the rule's name, never the subject (high / low)
        rid = f.rule_id.removeprefix(f.area + ".")
        room = name_w - len(f.subject) - 2 if f.subject else name_w - 1
        name = (rid[:max(room, 1)] + "…" + (" " + f.subject if f.subject else ""))[:name_w]
    t = Text()
    t.append(f"{sym} {word:<6} ", style=style)
    t.append(f"{name:<{name_w}}")
    t.append(f" {tail}", style="bold" if tail == "[ ]" else "")
    if item.changed and walk.record.proposals:
        if item.filed is None:
            was = "new with the what-if"
        else:
            s2, w2, _ = outcome_mark(item.filed.outcome, item.filed.severity)
            was = f"as filed: {s2} {w2}"
        t.append(f"\n    what-if ⇢ {was}", style="italic")
    return t


def area_header(area: str, items: list[Item]) -> Text:
    failing = sum(1 for i in items if i.outcome == "fail")
    t = Text()
    t.append(f"{area.upper()}", style="bold underline")
    t.append(f"  {failing} of {len(items)} failing", style="dim")
    return t


def identity(walk: Walk) -> Text:
    r = walk.snapshot.filed
    t = Text()
    if r is None:
        t.append("Design: ", style="bold")
        t.append(str(walk.path))
        return t
    d = r.design.design
    t.append(d.title, style="bold")
    if d.revision:
        t.append(f"  rev {d.revision}")
    t.append(f"  {walk.path}", style="dim")
    if d.author:
        t.append(f"  by {d.author}", style="dim")
    return t


def glance(walk: Walk, busy: bool = False) -> Text:
    """The review's state in one or two lines: counts by severity, decided, questions."""
    c = walk.tally()
    t = Text()
    if not c:
        t.append("reviewing…" if busy else "no review: the design did not load", style="bold")
        return t
    for key in ("hazard", "risk", "advice"):
        sym, word, style = outcome_mark("fail", key)
        t.append(f"{sym} {c[key]} {word.lower()}", style=style if c[key] else "dim")
        t.append("  ")
    t.append(f"decided {c['decided']}/{c['failing']}", style="bold")
    if c["reconfirm"]:
        t.append(f" ({c['reconfirm']} to re-confirm)", style="bold")
    t.append(f"  ? {c['open']} open question{'s' if c['open'] != 1 else ''}",
             style="bold magenta" if c["open"] else "dim")
    t.append(f"  ∅ {c['needs_data']} need data", style="yellow" if c["needs_data"] else "dim")
    t.append(f"  ✓ {c['passed']} passed", style="green")
    if c["proposals"]:
        t.append(f"  ⇢ WHAT-IF: {c['proposals']} proposed change"
                 f"{'s' if c['proposals'] != 1 else ''} applied", style="bold reverse")
    if c["orphans"]:
        t.append(f"  {c['orphans']} kept decision(s) without a finding", style="dim")
    if busy:
        t.append("  reviewing…", style="italic")
    return t


def caution(walk: Walk) -> Text | None:
    r = walk.snapshot.filed
    cur = walk.snapshot.current
    if not ((r is not None and r.beyond_elv) or (cur is not None and cur.beyond_elv)):
        return None
    t = Text()
    t.append("⚠ CAUTION: BEYOND EXTRA-LOW VOLTAGE: it can kill. ", style="bold")
    t.append(SHORT_CAUTION)
    return t


SHORT_CAUTION = ("This review is an aid, not an approval. Follow your local electrical codes and "
                 "have a qualified person examine the design before it is powered.")


def _row(t: Text, label: str, value: str, style: str = "") -> None:
    if not value:
        return
    t.append(f"{label:<11}", style="bold")
    t.append(value + "\n", style=style)


def detail(walk: Walk, item: Item | None) -> Text:
    """Everything about the selected finding: numbers, why, what to do, source, decision."""
    t = Text()
    if item is None:
        t.append("Nothing selected.\n\n", style="bold")
        t.append("Move through the findings with ↑ ↓; press n for the next item that needs a "
                 "decision, ? for every key.")
        return t
    f = item.finding
    sym, word, style = outcome_mark(f.outcome, f.severity)
    word = LONG_WORD.get(f.outcome, word)
    t.append(f"{sym} {word}", style=style + " reverse")
    t.append(f"  {f.heading}\n", style="bold")
    t.append(f"{f.key}   area {f.area}   severity {f.severity}   {f.origin} rule\n\n", style="dim")
    if f.question:
        _row(t, "Question", f.question)
        ans = walk.answer_of(item)
        if ans is None:
            _row(t, "Answer", "open: press d to answer (yes, no, does not apply)", "bold")
        else:
            _row(t, "Answer", ANSWER_WORD.get(ans[0], ans[0]) + (f": {ans[1]}" if ans[1] else ""))
        t.append("\n")
    if f.value is not None:
        _row(t, "Computed", common.computed(f) + " at the worst corner")
        _row(t, "Limit", common.limit(f))
        _row(t, "Margin", common.margin(f), "bold" if (f.margin or 0) < 0 else "")
        _row(t, "Worst at", common.corner(f))
    if f.needs:
        _row(t, "Needs data", "give " + common.needs(f), "yellow")
    if f.assumptions:
        _row(t, "Assumes", "; ".join(f.assumptions))
    if f.why:
        if not t.plain.endswith("\n\n"):
            t.append("\n")
        t.append("Why it matters\n", style="bold underline")
        t.append(f.why + "\n")
    if f.mitigation:
        t.append("\nWhat to do\n", style="bold underline")
        t.append(f.mitigation + "\n")
    if f.pass_value is not None:
        _row(t, "Passes at", common.pass_text(f), "bold")
    t.append("\n")
    _row(t, "Source", f"{f.reference} ({common.basis(f)})" if f.reference else common.basis(f))
    if item.filed is not None and item.current is not None and item.changed:
        _row(t, "What-if", f"as filed {item.filed.outcome}, with the proposals {item.current.outcome}",
             "bold")
        if item.filed.value is not None:
            _row(t, "As filed", common.computed(item.filed))
    if not f.question:
        t.append("\n")
        d = walk.decision(item.key)
        state = walk.decision_state(item)
        mark, words = decision_mark(d.kind if d else None, state)
        failing = f.outcome == "fail" or (item.filed is not None and item.filed.outcome == "fail")
        if d is None:
            hint = "  (c will change · a accept · x does not apply)" if failing else ""
            _row(t, "Decision", f"{mark} {words}{hint}", "bold" if failing else "")
        else:
            _row(t, "Decision", f"{mark} {common.decision(d, state)}", "bold")
            if state == "reconfirm":
                _row(t, "Made on", common.decided_on(d))
                _row(t, "Now", common.now_on(item.filed or f))
    return t


def problems(items: list[Problem], title: str) -> Text:
    t = Text()
    t.append(title + "\n\n", style="bold")
    for p in items:
        where = f"{p.file}:{p.line}" if p.line else p.file
        t.append(f"✗ {where}", style="bold")
        if p.path:
            t.append(f"  {p.path}")
        t.append(f"\n    {p.message}\n")
    t.append("\nFix the file and save it: it is read again as soon as it changes (or press r). "
             "q quits.", style="italic")
    return t


def proposals(walk: Walk) -> Text:
    t = Text()
    props = walk.record.proposals
    t.append("What-if changes (kept in the record; the design file is never rewritten)\n\n",
             style="bold")
    if not props:
        t.append("None. Press w to try a change, e.g. timing.dead_time = 800 ns.\n")
    for p in sorted(props.values(), key=lambda p: p.field):
        t.append(f"⇢ {p.field} = {p.value}", style="bold")
        t.append(f"   (as filed: {walk_field_filed(walk, p.field) or 'not given'})")
        if p.note:
            t.append(f"\n    {p.note}")
        t.append("\n")
    if walk.snapshot.proposal_problems:
        t.append("\nThe proposals do not validate, so the review below is of the file as filed:\n",
                 style="bold")
        for pr in walk.snapshot.proposal_problems:
            t.append(f"✗ {pr.path}: {pr.message}\n")
    orphans = walk.review.orphans if walk.review else []
    if orphans:
        t.append("\nDecisions kept without a finding (rule renamed or removed)\n", style="bold")
        for d in orphans:
            t.append(f"[?] {d.key}: {common.decision(d)}\n")
    return t


def walk_field_filed(walk: Walk, field_path: str) -> str:
    r = walk.snapshot.filed
    q = r.sheet.get(f"design.{field_path}") if r else None
    if q is None:
        return ""
    return common.num(q.typ, q.unit) if q.kind == "number" else str(q.typ)
