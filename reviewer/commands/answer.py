"""reviewer answer: record the answer to a checklist question in the review record."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.record import ANSWERS


def register(sub) -> None:
    a = sub.add_parser(
        "answer", help="answer a checklist question (yes, no, not_applicable)",
        description="Record the answer to a checklist question in NAME.review.toml beside the "
                    "design; it overrides the design's [checklist] entry. 'not_applicable' "
                    "needs a --note saying why.")
    a.add_argument("design", type=Path, metavar="DESIGN")
    a.add_argument("question", metavar="QUESTION-ID")
    a.add_argument("answer", choices=ANSWERS)
    a.add_argument("--note", default="", help="a note (required for not_applicable)")
    a.add_argument("--reviewer", "--by", dest="by", default=None,
                   help="name written with the answer (default: your user name)")
    from reviewer.commands._common import add_rule_options

    add_rule_options(a)


def run(args: argparse.Namespace) -> int:
    import sys

    from reviewer import record as rec
    from reviewer.commands._record import load_review, save, unknown
    from reviewer.errors import InputError, Problem

    review = load_review(args.design, args)
    questions = sorted({f.rule_id for f in review.findings if f.question})
    if args.question not in questions:
        raise unknown(args.design, "question", args.question, questions)
    by = args.by if args.by is not None else rec.reviewer_name()
    try:
        record = rec.answer(review.record, args.question, args.answer, args.note, by)
    except rec.DecisionError as e:
        raise InputError([Problem(str(args.design), None, args.question, str(e))]) from None
    path = save(review, args.design, record)
    print(f"{path}: {args.question}: {args.answer}", file=sys.stderr)
    from reviewer.report.conflicts import answer_conflicts

    for c in answer_conflicts(review.sheet, args.question, args.answer):
        print(f"warning: {args.question}: {c.text()}; the answer is recorded, and every report "
              "shows the contradiction until the design or the answer changes", file=sys.stderr)
    return 0
