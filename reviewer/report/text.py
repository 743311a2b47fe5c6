"""The terminal report, drawn with rich: colour where the terminal has it, plain words always."""

from __future__ import annotations

import re
from io import StringIO

from reviewer.report import common
from reviewer.review import AID_NOTE, CAUTION, Review

STYLE = {"hazard": "bold red", "risk": "bold yellow", "advice": "cyan", "pass": "green",
         "needs_data": "magenta", "open": "blue", "answered": "green", "not_applicable": "dim"}


def render(reviews: list[Review], color: bool | None = None, width: int | None = None,
           show_passed: bool = True) -> str:
    """The report for one or more reviews as text (with ANSI colour when ``color``)."""
    from rich.console import Console

    buf = StringIO()
    console = Console(file=buf, force_terminal=bool(color), no_color=not color,
                      width=width or 100, highlight=False, soft_wrap=False, markup=False)
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
    if r.beyond_elv:
        console.print(Panel(CAUTION, title="CAUTION: beyond extra-low voltage", style="bold red"))
    counts = r.counts()
    summary = Text()
    for key in ("hazard", "risk", "advice", "needs_data", "open", "pass"):
        n = counts.get(key, 0)
        summary.append(f"{common.LABEL[key]} {n}", style=STYLE[key] if n else "dim")
        summary.append("   ")
    console.print(summary)
    console.print()

    for f in r.failures:
        title = Text()
        title.append(f"{common.label(f):<7}", style=STYLE[f.severity])
        title.append(f" {f.key}", style="bold")
        title.append(f"  {f.heading}")
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
            if st == "reconfirm":
                grid.add_row("decided on", common.decided_on(d))
                grid.add_row("now", common.now_on(f))
        else:
            grid.add_row("decision", "none recorded")
        console.print(Padding(grid, (0, 0, 1, 2), expand=False))

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
        console.print(Text("Needs data (not checked)", style="bold magenta"))
        for f in missing:
            console.print(Text(f"  {f.key}: {f.heading} — give {common.needs(f)}"))
        console.print()
    questions = r.by_outcome("open")
    if questions:
        console.print(Text("Open questions (answer in [checklist])", style="bold blue"))
        for f in questions:
            console.print(Text(f"  {f.rule_id}: {f.question or f.title}"))
        console.print()
    passed = r.by_outcome("pass") + r.by_outcome("answered")
    if show_passed and passed:
        console.print(Text(f"Passed ({len(passed)})", style="bold green"))
        table = Table(show_header=True, box=None, padding=(0, 2), header_style="dim")
        for col in ("check", "computed", "limit", "margin"):
            table.add_column(col, overflow="fold")
        for f in passed:
            table.add_row(f.key, common.computed(f), common.limit(f), common.margin(f))
        console.print(Padding(table, (0, 0, 0, 2), expand=False))
        console.print()
    console.print(Text(AID_NOTE, style="dim"))


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
