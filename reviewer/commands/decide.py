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
    d.add_argument("--reviewer", "--by", dest="by", default=None,
                   help="name written with the decision (default: your user name)")
    d.add_argument("--accepted-by", default="", metavar="WHO",
                   help="who accepts the finding as it stands (name and role); needed to "
                        "accept a hazard")
    from reviewer.commands._common import add_rule_options

    add_rule_options(d)


def bracketed(review, key: str) -> str:
    """``timing.dead-time-margin.high`` for ``timing.dead-time-margin[high]``: keys without
    brackets, for shells that glob them. The key as given when it names a finding already."""
    from reviewer.aliases import current_key

    key = current_key(key)
    if "[" in key or review.finding(key) is not None or "." not in key:
        return key
    head, _, subject = key.rpartition(".")
    return f"{head}[{subject}]" if review.finding(f"{head}[{subject}]") is not None else key


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
    f = finding_for(review, args.design, bracketed(review, args.key))
    by = args.by if args.by is not None else rec.reviewer_name()
    try:
        record = rec.decide(record, f, args.kind, args.note, by)
    except rec.DecisionError as e:
        raise InputError([Problem(str(args.design), None, f.key, str(e))]) from None
    if args.kind == "accepted" and f.severity == "hazard" and not args.accepted_by.strip():
        # who accepts a hazard is always kept: the reviewer, unless someone else is named
        args.accepted_by = by or "the reviewer (unnamed)"
        print(f"note: {f.key} is a hazard: recorded as accepted by {args.accepted_by}; give "
              "--accepted-by 'NAME, ROLE' to name the person who accepts it", file=sys.stderr)
    if args.kind == "accepted" and args.accepted_by.strip():
        from dataclasses import replace

        d = replace(record.decisions[f.key], accepted_by=args.accepted_by.strip())
        record = replace(record, decisions={**record.decisions, f.key: d})
    path = save(review, args.design, record)
    print(f"{path}: {f.key}: {decision(record.decisions[f.key])}", file=sys.stderr)
    if f.outcome != "fail":
        print(f"note: {f.key} does not fail now ({f.outcome}); the decision is kept all the same",
              file=sys.stderr)
    return 0
