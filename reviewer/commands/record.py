"""reviewer record: list the state of a design's review record.

Every failing finding with its decision and the decision's state, then the decisions on
findings that do not fail now (resolved by a revision, orphaned, or on a passing check), the
checklist answers and the proposed changes.
"""

from __future__ import annotations

import argparse
from pathlib import Path


def register(sub) -> None:
    r = sub.add_parser("record", help="list the decisions and answers of a design's review record")
    r.add_argument("design", type=Path, metavar="DESIGN")
    r.add_argument("--format", choices=("text", "json"), default="text")
    from reviewer.commands._common import add_rule_options

    add_rule_options(r)


def run(args: argparse.Namespace) -> int:
    import sys

    from reviewer import record as rec
    from reviewer.commands._record import load_review

    review = load_review(args.design, args)
    if args.format == "json":
        import json

        from reviewer.report.json import to_data

        data = to_data(review)
        out = {"design": data["design"], "record_file": str(rec.record_path(args.design)),
               "failing": [{"key": f["key"], "severity": f["severity"], "settled": f["settled"],
                            "decision": f["decision"]}
                           for f in data["findings"] if f["outcome"] == "fail"],
               **data["record"]}
        sys.stdout.write(json.dumps(out, indent=2, ensure_ascii=False) + "\n")
        return 0
    sys.stdout.write(text(review, rec.record_path(args.design)))
    return 0


def text(review, path: Path) -> str:
    from reviewer.report import common

    lines = [f"{path}" + ("" if path.exists() else " (no record yet)"), ""]
    fails = review.failures
    lines.append(f"Failing findings ({len(fails)}):")
    for f in fails:
        d = review.decision(f.key)
        st = review.state(f.key)
        mark = "settled" if review.settled(f) else "fails"
        lines.append(f"  {common.label(f):<7} {f.key}  [{mark}]")
        lines.append(f"          {common.decision(d, st) if d else 'no decision'}")
        if st == "reconfirm":
            lines.append(f"          decided on {common.decided_on(d)}; now {common.now_on(f)}")
    failing = {f.key for f in fails}
    rest = [row for row in common.record_rows(review) if row[0] not in failing]
    if rest:
        lines += ["", "Other decisions:"]
        for key, d, f, st in rest:
            now = common.now_on(f) if f is not None else "no such finding (kept)"
            lines.append(f"  {key}: {common.decision(d, st)}")
            lines.append(f"          decided on {common.decided_on(d)}; now {now}")
    if review.record.answers:
        lines += ["", "Answers:"]
        for qid, a in sorted(review.record.answers.items()):
            who = f" ({a.reviewer}, {a.at[:10]})" if a.reviewer else ""
            lines.append(f"  {qid}: {a.answer}{': ' + a.note if a.note else ''}{who}")
    from reviewer.report.conflicts import conflicts

    clash = conflicts(review)
    if clash:
        lines += ["", "Answers the design file contradicts (not taken as passes):"]
        lines += [f"  ≠ {c.question}: {c.text()}" for c in clash]
    open_q = review.by_outcome("open")
    if open_q:
        lines += ["", "Open questions:"]
        lines += [f"  {f.rule_id}: {f.question}" for f in open_q]
    if review.record.proposals:
        lines += ["", "Proposed changes:"]
        for fp, p in sorted(review.record.proposals.items()):
            lines.append(f"  {fp} = {p.value}{': ' + p.note if p.note else ''}")
    return "\n".join(lines) + "\n"
