"""reviewer walk: take the reviewer through every finding of a design in a full-screen view."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands._common import add_rule_options


def register(sub) -> None:
    w = sub.add_parser("walk", help="walk through the findings of a design, deciding each one")
    w.add_argument("design", type=Path, metavar="DESIGN")
    add_rule_options(w)
    w.add_argument("--color", choices=("auto", "always", "never"), default="auto",
                   help="colour: auto (unless NO_COLOR is set), always, or never (the "
                        "monochrome style NO_COLOR gives)")
    w.add_argument("--reviewer", "--by", dest="reviewer", default=None,
                   help="name written with each decision (default: your user name)")


def run(args: argparse.Namespace) -> int:
    from reviewer.errors import InputError, Problem

    if not args.design.is_file():  # nothing to watch: say so on the command line
        raise InputError([Problem(str(args.design), None, "", "no such design file")])
    import os

    if args.color == "never":
        os.environ["NO_COLOR"] = "1"
    elif args.color == "always":
        os.environ.pop("NO_COLOR", None)
    from reviewer.tui.app import WalkApp
    from reviewer.tui.session import Walk

    walk = Walk.open(args.design, args.rules, args.reviewer, profile=args.profile,
                     house=not args.no_house_rules)
    result = WalkApp(walk).run()
    import sys

    where = walk.record_file
    if where.exists():
        print(f"Every decision and answer is in {where}", file=sys.stderr)
    else:
        print(f"Nothing was recorded; decisions would go to {where}", file=sys.stderr)
    return result or 0
