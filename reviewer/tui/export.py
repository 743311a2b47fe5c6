"""The Markdown report from the walkthrough: the project's Markdown view of the design as filed,
plus what the proposed changes would do.

The report itself is :func:`reviewer.report.markdown.render` of the design as filed (the same
report as ``reviewer check --format markdown``, which lists the record's proposals). When there
are proposals, a section says which findings they would change, so that a what-if result is
never shown as if it were the design file's.
"""

from __future__ import annotations

from reviewer.review import Review

HEADING = "## What the proposed changes would do (what-if)"


def whatif_section(filed: Review, current: Review | None) -> str:
    """Markdown naming every proposal and each finding whose outcome it changes, or ''."""
    props = filed.record.proposals
    if not props or current is None:
        return ""
    out = [HEADING, "",
           "Every other section of this report is of the design file as filed. With the "
           "proposed changes below applied (they are kept in the review record; the design file "
           "is unchanged), these checks would change:", "",
           "| Field | Proposed value | Note |", "|---|---|---|"]
    for p in sorted(props.values(), key=lambda p: p.field):
        out.append(f"| `{p.field}` | {p.value} | {p.note.replace('|', '/')} |")
    out.append("")
    before = {f.key: f.outcome for f in filed.findings}
    moved = [(f.key, before.get(f.key, "absent"), f.outcome) for f in current.findings
             if before.get(f.key) != f.outcome]
    if current is filed:
        out += ["The proposals do not validate against the design format, so nothing was "
                "computed with them.", ""]
    elif moved:
        out += ["| Check | As filed | With the changes |", "|---|---|---|"]
        from reviewer.report.common import outcome_word

        out += [f"| `{k}` | {outcome_word(a)} | {outcome_word(b)} |" for k, a, b in moved]
        out.append("")
    else:
        out += ["No check changes its outcome.", ""]
    return "\n".join(out)


def markdown_report(filed: Review, current: Review | None = None) -> str:
    """The Markdown report of ``filed``, with the what-if section when there are proposals."""
    from reviewer.report import markdown

    text = markdown.render([filed])
    extra = whatif_section(filed, current)
    return markdown.insert_before_appendix(text, extra) if extra else text
