"""The terminal report, drawn with rich: colour where the terminal has it, plain words always."""

from __future__ import annotations

import re
from io import StringIO

from reviewer.report import common
from reviewer.review import AID_NOTE, CAUTION, Review
from reviewer.spread import spread_rows

PIPED_WIDTH = 100
"""Columns of the report when it does not go to a terminal (a file, a pipe)."""

def _style(key: str) -> str:
    """The colour of a meaning (without colour the console writes no styles at all)."""
    return common.style(key, True)


def terminal_width() -> int:
    """The terminal's width when standard output is one; :data:`PIPED_WIDTH` otherwise."""
    import shutil
    import sys

    try:
        if sys.stdout.isatty():
            return max(40, shutil.get_terminal_size((PIPED_WIDTH, 24)).columns)
    except (AttributeError, ValueError, OSError):
        pass
    return PIPED_WIDTH


def render(reviews: list[Review], color: bool | None = None, width: int | None = None,
           show_passed: bool = True) -> str:
    """The report for one or more reviews as text (with ANSI colour when ``color``).

    ``width`` in columns; by default the terminal's width, or 100 when not a terminal. The marks
    and colours are those of the walkthrough (:data:`reviewer.report.common.MARK`)."""
    from rich.console import Console

    buf = StringIO()
    console = Console(file=buf, force_terminal=bool(color), no_color=not color,
                      width=width or terminal_width(), highlight=False, soft_wrap=False,
                      markup=False)
    for i, r in enumerate(reviews):
        if i:
            console.rule()
        _one(console, r, show_passed)
    return _TRAILING.sub(r"\1", buf.getvalue())


_TRAILING = re.compile(r"[ \t]+((?:\x1b\[[0-9;]*m)*)$", re.MULTILINE)


def _one(console, r: Review, show_passed: bool) -> None:
    from rich.padding import Padding
    from rich.panel import Panel
    from rich.table import Table
    from rich.text import Text

    d = r.design.design
    head = Text(d.title, style="bold")
    if d.revision:
        head.append(f"  rev {d.revision}")
    head.append(f"\n{r.path}", style="dim")
    console.print(head)
    from reviewer.report.placeholders import sentence, unchanged

    left = unchanged(r.path)
    if left:
        console.print(Text(sentence(left), style="bold"))
    if r.beyond_elv:
        console.print(Panel(CAUTION, title="CAUTION: beyond extra-low voltage", style="bold red"))
    counts = r.counts()
    summary = Text()
    for key in ("hazard", "risk", "advice", "needs_data", "open", "pass", "answered"):
        n = counts.get(key, 0)
        summary.append(f"{common.mark(key)} {common.LABEL[key]} {n}",
                       style=_style(key) if n else "dim")
        summary.append("   ")
    console.print(summary)
    console.print()

    for f in r.failures:
        title = Text()
        title.append(f"{common.mark(f.severity)} {common.label(f):<7}", style=_style(f.severity))
        title.append(f" {f.key}", style="bold")
        title.append(f"  {common.title(f)}")
        if r.settled(f):
            title.append("  (settled by decision)", style="dim")
        console.print(title)
        grid = Table.grid(padding=(0, 2))
        grid.add_column(style="dim", no_wrap=True)
        grid.add_column(overflow="fold")
        if f.value is not None:
            grid.add_row("computed", common.computed(f))
            grid.add_row("limit", common.limit(f))
            grid.add_row("margin", common.margin(f))
            if f.corner:
                grid.add_row("worst at", common.corner(f))
        for label, sentence in spread_rows(f):  # worst-case search, yield, sensitivity
            grid.add_row(label, sentence)
        if f.question:
            grid.add_row("question", f.question)
            if f.answer_note:
                grid.add_row("answer", f"no: {f.answer_note}")
        grid.add_row("why", f.why)
        if f.mitigation:
            grid.add_row("do", f.mitigation)
        if f.pass_value is not None:
            grid.add_row("passes at", common.pass_text(f))
        for a in f.assumptions:
            grid.add_row("assumes", a)
        grid.add_row("source", f"{f.reference} [{common.basis(f)}]")
        d = r.decision(f.key)
        if d is not None:
            st = r.state(f.key)
            grid.add_row("decision", common.decision(d, st))
            if st in ("reconfirm", "resolved"):
                grid.add_row("decided on", common.decided_on(d))
                grid.add_row("now", common.now_on(f))
        else:
            grid.add_row("decision", "none recorded")
        console.print(Padding(grid, (0, 0, 1, 2), expand=False))

    _conflicts(console, r)
    _record(console, r)
    if r.disabled:
        console.print(Text("Rules switched off (not checked)", style="bold"))
        for x in r.disabled:
            console.print(Text(f"  {x.rule_id}: {x.title} — {x.reason} (by {x.origin})"))
        console.print()
    if r.notices:
        console.print(Text("Notices on the input", style="bold"))
        for n in r.notices:
            console.print(Text(f"  {n}"))
        console.print()
    missing = r.by_outcome("needs_data")
    if missing:
        console.print(Text(f"{common.mark('needs_data')} Needs data (not checked)",
                           style=_style("needs_data")))
        for f in missing:
            console.print(Text(f"  {f.key}: {f.heading} — give {common.needs(f)}"))
        console.print()
    questions = r.by_outcome("open")
    if questions:
        console.print(Text(f"{common.mark('open')} Open questions (answer with `reviewer answer` "
                           "or in the design's [checklist])", style=_style("open")))
        for f in questions:
            console.print(Text(f"  {f.rule_id}: {f.question or f.title}"))
        console.print()
    passed = r.by_outcome("pass") + r.by_outcome("answered")
    if show_passed and passed:
        console.print(Text(f"{common.mark('pass')} Passed ({len(passed)})", style=_style("pass")))
        table = Table(show_header=True, box=None, padding=(0, 2), header_style="dim")
        for col in ("check", "computed", "limit", "margin"):
            table.add_column(col, overflow="fold")
        for f in passed:
            table.add_row(f.key, common.computed(f), common.limit(f), common.margin(f))
        console.print(Padding(table, (0, 0, 0, 2), expand=False))
        console.print()
    console.print(Text(AID_NOTE, style="dim"))


def _conflicts(console, r: Review) -> None:
    from rich.text import Text

    from reviewer.report.conflicts import conflicts

    found = conflicts(r)
    if not found:
        return
    console.print(Text(f"{common.mark('conflict')} Answers the design file contradicts "
                       "(not taken as passes)", style=_style("conflict")))
    for c in found:
        console.print(Text(f"  {c.question}: {c.text()}"))
    console.print()


def _record(console, r: Review) -> None:
    """Decisions that are not on a failing finding shown above: resolved, orphaned, others."""
    from rich.text import Text

    failing = {f.key for f in r.failures}
    rows = [row for row in common.record_rows(r) if row[0] not in failing]
    if not rows:
        return
    console.print(Text("Other decisions in the record", style="bold"))
    for key, d, f, st in rows:
        console.print(Text(f"  {key}: {common.decision(d, st)}"))
        if st in ("reconfirm", "resolved"):
            console.print(Text(f"      decided on {common.decided_on(d)}; now {common.now_on(f)}",
                               style="dim"))
        elif st == "orphan":
            console.print(Text(f"      decided on {common.decided_on(d)}; kept in the record",
                               style="dim"))
    console.print()
