"""reviewer decide: record a decision on a finding in the review record beside the design."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.record import KINDS


def register(sub) -> None:
    d = sub.add_parser(
        "decide", help="record a decision on a finding (accepted, will_change, ...)",
        description="Record a decision on one finding in NAME.review.toml beside the design. "
                    "KEY is the finding key as shown by the reports (rule id and [subject]); a "
                    "bare rule id is enough when the rule has one subject. 'accepted' and "
                    "'not_applicable' need a --note saying why.")
    d.add_argument("design", type=Path, metavar="DESIGN")
    d.add_argument("key", metavar="KEY")
    group = d.add_mutually_exclusive_group(required=True)
    group.add_argument("--as", dest="kind", choices=KINDS, help="the decision")
    group.add_argument("--drop", action="store_true",
                       help="remove the decision on KEY from the record (e.g. an orphan)")
    d.add_argument("--note", default="", help="the reason (required for accepted, not_applicable)")
    d.add_argument("--by", default=None, help="reviewer name (default: the user name)")
    from reviewer.commands._common import add_rule_options

    add_rule_options(d)


def run(args: argparse.Namespace) -> int:
    import sys

    from reviewer import record as rec
    from reviewer.commands._record import finding_for, load_review, save, unknown
    from reviewer.errors import InputError, Problem
    from reviewer.report.common import decision

    review = load_review(args.design, args)
    record = review.record
    if args.drop:
        if args.key not in record.decisions:
            raise unknown(args.design, "decision", args.key, sorted(record.decisions))
        path = save(review, args.design, rec.forget(record, args.key))
        print(f"{path}: decision on {args.key} removed", file=sys.stderr)
        return 0
    f = finding_for(review, args.design, args.key)
    by = args.by if args.by is not None else rec.reviewer_name()
    try:
        record = rec.decide(record, f, args.kind, args.note, by)
    except rec.DecisionError as e:
        raise InputError([Problem(str(args.design), None, f.key, str(e))]) from None
    path = save(review, args.design, record)
    print(f"{path}: {f.key}: {decision(record.decisions[f.key])}", file=sys.stderr)
    if f.outcome != "fail":
        print(f"note: {f.key} does not fail now ({f.outcome}); the decision is kept all the same",
              file=sys.stderr)
    return 0
