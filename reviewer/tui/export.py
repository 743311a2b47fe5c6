"""The Markdown report as the walkthrough shows it: the project's Markdown view, plus what-if notes.

The report itself is :func:`reviewer.report.markdown.render`. When the review was computed with
proposed changes applied and that view does not already list them, a short section saying so is
put under the title, so that a report never shows a what-if result as if it were the design file.
"""

from __future__ import annotations

from reviewer.review import Review


def proposals_section(current: Review, filed: Review | None) -> str:
    """Markdown naming every proposal and which findings it changes, or '' when there are none."""
    props = current.record.proposals
    if not props:
        return ""
    out = ["## Proposed changes (what-if, not in the design file)", "",
           "The findings in this report are computed with these changes applied; the design "
           "file itself is unchanged.", "", "| Field | Proposed value | Note |", "|---|---|---|"]
    for p in sorted(props.values(), key=lambda p: p.field):
        note = p.note.replace("|", "\\|")
        out.append(f"| `{p.field}` | {p.value} | {note} |")
    out.append("")
    if filed is not None and filed is not current:
        before = {f.key: f.outcome for f in filed.findings}
        moved = [(f.key, before.get(f.key, "absent"), f.outcome) for f in current.findings
                 if before.get(f.key) != f.outcome]
        if moved:
            out += ["| Check | As filed | With the changes |", "|---|---|---|"]
            out += [f"| `{k}` | {a} | {b} |" for k, a, b in moved]
            out.append("")
    return "\n".join(out)


def markdown_report(current: Review, filed: Review | None = None) -> str:
    """The Markdown report of ``current``, with a what-if section when it needs one."""
    from reviewer.report import markdown

    text = markdown.render([current])
    extra = proposals_section(current, filed)
    if not extra or ("propos" in text.lower()
                      and all(k in text for k in current.record.proposals)):
        return text
    head, sep, rest = text.partition("\n## ")
    if not sep:
        return text.rstrip("\n") + "\n\n" + extra
    return head.rstrip("\n") + "\n\n" + extra + "\n## " + rest
