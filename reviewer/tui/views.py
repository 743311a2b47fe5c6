"""Text the walkthrough shows: pure functions from the walk's state to Rich ``Text``.

No Textual here, so the wording can be tested without a screen. Every mark has a word beside its
symbol and colour (see :mod:`reviewer.tui.marks`).
"""

from __future__ import annotations

from rich.text import Text

from reviewer.errors import Problem
from reviewer.report import common
from reviewer.tui.marks import (ANSWER_WORD, LONG_WORD, decision_mark, key_mark, outcome_key,
                                 outcome_mark, reverse)
from reviewer.spread import spread_rows
from reviewer.tui.session import Item, Walk


def finding_title(f) -> str:
    """The heading of a finding in every view of the walkthrough (one place to change)."""
    return common.title(f)


def short_name(item: Item) -> str:
    """'vgs-rating high': the rule id without its area, and the subject."""
    f = item.finding
    rid = f.rule_id.removeprefix(f.area + ".")
    return f"{rid} {f.subject}".strip()


def fit_name(name: str, room: int) -> str:
    """``name`` in ``room`` columns, shortened in the middle (both ends tell rules apart)."""
    if len(name) <= room:
        return name
    if room < 5:
        return name[:room]
    head = (room - 1 + 1) // 2
    tail = room - 1 - head
    return name[:head] + "…" + (name[-tail:] if tail else "")


def fit_item(item: Item, room: int) -> str:
    """The entry's name in ``room`` columns: the rule's name shortened in its middle, the
    subject (high / low) kept whole."""
    f = item.finding
    full = short_name(item)
    if len(full) <= room or not f.subject or len(f.subject) + 6 > room:
        return fit_name(full, room)
    rid = f.rule_id.removeprefix(f.area + ".")
    return fit_name(rid, room - len(f.subject) - 1) + " " + f.subject


def item_mark_key(walk: Walk, item: Item) -> str:
    """The meaning a list entry is marked with (an answered question the design contradicts
    is marked as a contradiction, never as answered)."""
    f = item.finding
    if item.is_question and walk.conflicts_of(item):
        return "conflict"
    return outcome_key(f.outcome, f.severity)


def item_prompt(walk: Walk, item: Item, width: int = 40, two_lines: bool = False) -> Text:
    """One entry of the findings list: mark, word, name, decision mark; a what-if line if moved.

    A name too long for the row is shortened in the middle, or (``two_lines``) given in full on
    a second line, so that no two entries read alike."""
    f = item.finding
    sym, word, style = key_mark(item_mark_key(walk, item))
    if item.is_question:
        ans = walk.answer_of(item)
        tail = "[ ]" if ans is None else ("[≠]" if walk.conflicts_of(item) else "[✎]")
    elif f.outcome == "fail" or (item.filed is not None and item.filed.outcome == "fail"):
        d = walk.decision(item.key)
        tail = decision_mark(d.kind if d else None, walk.decision_state(item))[0]
    else:
        tail = "   "
    name_w = max(8, width - 13)
    full = short_name(item)
    name = full if two_lines else fit_item(item, name_w)
    t = Text()
    t.append(f"{sym} {word:<6}", style=style)
    t.append(" ")
    if two_lines and len(full) > name_w:
        t.append(f"{'':<{name_w}} {tail}", style="bold" if tail == "[ ]" else "")
        t.append(f"\n  {full}")
    else:
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


def area_title(area: str) -> str:
    """The area as a reader names it."""
    return common.area_name(area)


def area_header(area: str, items: list[Item], walk: Walk | None = None) -> Text:
    """'CHECKLIST  9 open · 0 failing': each kind counted on its own."""
    counts: dict[str, int] = {}
    for i in items:
        key = "failing" if i.outcome == "fail" else {
            "open": "open", "needs_data": "need data", "answered": "answered",
            "pass": "passed", "not_applicable": "do not apply"}.get(i.outcome, i.outcome)
        counts[key] = counts.get(key, 0) + 1
    if walk is not None:
        clash = sum(1 for i in items if walk.conflicts_of(i))
        if clash:
            counts["contradicted"] = clash
    order = ("failing", "open", "contradicted", "need data", "answered", "passed", "do not apply")
    t = Text()
    t.append(area_title(area).upper(), style="bold underline")
    t.append("  " + " · ".join(f"{counts[k]} {k}" for k in order if counts.get(k)), style="dim")
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
    """The review's state in one or two lines: counts by severity, decided, questions.

    Every count is of one basis: the design as filed, or (when what-if changes are applied) the
    design with them, and the line says which."""
    c = walk.tally()
    t = Text()
    if not c:
        t.append("reviewing…" if busy else "no review: the design did not load", style="bold")
        return t
    if c["proposals"]:
        t.append(f"⇢ WITH {c['proposals']} WHAT-IF CHANGE{'S' if c['proposals'] != 1 else ''}:",
                 style="bold reverse")
        t.append(" ")
    for key in ("hazard", "risk", "advice"):
        sym, word, style = key_mark(key)
        t.append(f"{sym} {c[key]} {word.lower()}", style=style if c[key] else "dim")
        t.append("  ")
    t.append(f"decided {c['decided']}/{c['failing']}", style="bold")
    if c["reconfirm"]:
        t.append(f" ({c['reconfirm']} to re-confirm)", style="bold")
    sym, _, style = key_mark("open")
    t.append(f"  {sym} {c['open']} open question{'s' if c['open'] != 1 else ''}",
             style=style if c["open"] else "dim")
    if c.get("conflicts"):
        sym, _, style = key_mark("conflict")
        t.append(f"  {sym} {c['conflicts']} answer{'s' if c['conflicts'] != 1 else ''} "
                 "contradicted by the design", style=style)
    sym, _, style = key_mark("needs_data")
    t.append(f"  {sym} {c['needs_data']} need data", style=style if c["needs_data"] else "dim")
    sym, _, style = key_mark("pass")
    t.append(f"  {sym} {c['passed']} passed", style=style)
    if c["orphans"]:
        t.append(f"  {c['orphans']} kept decision(s) without a finding", style="dim")
    from reviewer.report.placeholders import unchanged

    left = unchanged(walk.path)
    if left:
        t.append(f"  ⚑ {len(left)} starter placeholder{'s' if len(left) != 1 else ''} unchanged",
                 style="bold")
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
    key = item_mark_key(walk, item)
    sym, word, style = key_mark(key)
    word = LONG_WORD.get(key, word)
    t.append(f"{sym} {word}", style=reverse(style))
    t.append(f"  {finding_title(f)}\n", style="bold")
    t.append(f"{f.key}   area {area_title(f.area)}   severity {f.severity}   {f.origin} rule\n\n",
             style="dim")
    if f.question:
        _row(t, "Question", f.question)
        ans = walk.answer_of(item)
        if ans is None:
            _row(t, "Answer", "open: press d to answer (yes, no, does not apply)", "bold")
        else:
            _row(t, "Answer", ANSWER_WORD.get(ans[0], ans[0]) + (f": {ans[1]}" if ans[1] else ""))
        for c in walk.conflicts_of(item):
            _row(t, "≠ Contra", c.text() + ". The answer is not taken as a pass: change the "
                 "design or the answer.", key_mark("conflict")[2])
        t.append("\n")
    if f.value is not None:
        _row(t, "Computed", common.computed(f) + " at the worst corner")
        _row(t, "Limit", common.limit(f))
        _row(t, "Margin", common.margin(f), "bold" if (f.margin or 0) < 0 else "")
        _row(t, "Worst at", common.corner(f))
    for label, text in extra_rows(f):
        _row(t, label, text)
    if f.needs:
        _row(t, "Needs data", "give " + common.needs(f), key_mark("needs_data")[2])
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
        _row(t, "What-if", f"as filed {common.outcome_word(item.filed.outcome)}, with the "
             f"proposals {common.outcome_word(item.current.outcome)}", "bold")
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
            if state in ("reconfirm", "resolved"):
                _row(t, "Made on", common.decided_on(d))
                _row(t, "Now", common.now_on(item.filed or f))
    return t


def extra_rows(f) -> list[tuple[str, str]]:
    """Further labelled lines a finding carries: worst-case search, yield, sensitivity."""
    return [(label.capitalize(), sentence) for label, sentence in spread_rows(f)]


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


def _said(f) -> str:
    if f is None:
        return "is not reviewed"
    if f.outcome == "fail":
        return "fails"
    return {"pass": "passes", "needs_data": "needs data", "open": "is open",
            "answered": "is answered", "not_applicable": "does not apply"}.get(f.outcome, f.outcome)


def _why_no_effect(review, field_path: str) -> str:
    """A reason the design itself gives for a change having no effect, or ''."""
    shared = review.sheet.value("design.drive.shared_signal", False)
    if shared and field_path.startswith("timing.dead_time"):
        return (" while one signal feeds both switches of the leg (drive.shared_signal = true) "
                "there is no dead time")
    return ""


def whatif_result(before, after, key: str | None, field_path: str, value: str) -> str:
    """What a what-if change did, in words: the selected finding first, then how many others
    changed outcome; says so plainly when nothing changed.

    ``before`` and ``after`` are the reviews shown before and after the change."""
    old = {f.key: f for f in before.findings} if before is not None else {}
    new = {f.key: f for f in after.findings}
    lines = [f"{field_path} = {value}:"]
    if key is not None and key in new:
        f0, f1 = old.get(key), new[key]
        name = key.replace("[", " [")
        if f0 is None or f0.outcome != f1.outcome:
            lines.append(f"{name}: {_said(f0)} → now {_said(f1)}")
        else:
            still = "still " + _said(f1)
            if f0.value is not None and f1.value is not None and f0.value != f1.value:
                lines.append(f"{name}: {still}; computed {common.num(f0.value, f0.unit)} → "
                             f"{common.num(f1.value, f1.unit)}"
                             + (f" (limit {common.limit(f1)})" if f1.limit is not None else ""))
            elif f0.limit != f1.limit and f1.limit is not None:
                lines.append(f"{name}: {still}; limit {common.num(f0.limit, f0.unit)} → "
                             f"{common.num(f1.limit, f1.unit)}")
            else:
                lines.append(f"{name}: {still} — the change has no effect on it"
                             + _why_no_effect(after, field_path))
    moved = [k for k, f in new.items() if k != key and (k not in old or old[k].outcome != f.outcome)]
    if moved:
        lines.append(f"{len(moved)} other finding{'s' if len(moved) != 1 else ''} changed "
                     "outcome: " + ", ".join(moved[:4]) + ("…" if len(moved) > 4 else ""))
    elif len(lines) == 1 or "no effect" in lines[-1]:
        lines.append("no finding changed its outcome")
    return "\n".join(lines)


def proposals(walk: Walk, last: str = "") -> Text:
    t = Text()
    if last:
        t.append("Last what-if\n", style="bold")
        t.append(last + "\n\n")
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
