"""reviewer check: review designs and print the findings."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands._common import LEVELS, emit, rule_files, use_color


def register(sub) -> None:
    c = sub.add_parser("check", help="review designs and print the findings")
    c.add_argument("designs", nargs="+", type=Path, metavar="DESIGN")
    c.add_argument("--format", choices=("text", "markdown", "json"), default="text")
    c.add_argument("--output", "-o", type=Path, help="write the report to this file")
    c.add_argument("--fail-on", choices=LEVELS, default=None,
                   help="exit 1 when a finding at or above this severity fails")
    c.add_argument("--rules", type=Path, action="append", default=[], metavar="PATH",
                   help="extra rule file or folder (may be given more than once)")
    c.add_argument("--no-passed", action="store_true", help="leave passed checks out (text)")
    c.add_argument("--color", choices=("auto", "always", "never"), default="auto")


def run(args: argparse.Namespace) -> int:
    from reviewer.errors import InputError
    from reviewer.review import review_file
    from reviewer.rulebook import load_rulebook

    book = load_rulebook(rule_files(args.rules))
    reviews, problems = [], []
    for path in args.designs:
        try:
            reviews.append(review_file(path, book=book))
        except InputError as e:
            problems.extend(e.problems)
    if problems:
        raise InputError(problems)
    if args.format == "json":
        from reviewer.report import json as view

        text = view.render(reviews)
    elif args.format == "markdown":
        from reviewer.report import markdown as view

        text = view.render(reviews)
    else:
        from reviewer.report import text as view

        text = view.render(reviews, color=use_color(args.color) and args.output is None,
                           show_passed=not args.no_passed)
    emit(text, args.output)
    if args.fail_on:
        worst = LEVELS.index(args.fail_on)
        for r in reviews:
            if any(LEVELS.index(f.severity) <= worst for f in r.failures):
                return 1
    return 0
