"""reviewer check: review designs and print the findings."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands._common import (LEVELS, add_rule_options, emit, rulebook, use_color,
                                       writable)


def register(sub) -> None:
    c = sub.add_parser("check", help="review designs and print the findings")
    c.add_argument("designs", nargs="+", type=Path, metavar="DESIGN")
    c.add_argument("--format", choices=("text", "markdown", "json", "sarif"), default="text")
    c.add_argument("--output", "-o", type=Path,
                   help="write the report to this file (Markdown: pictures are written beside it)")
    c.add_argument("--base", type=Path, metavar="DIR",
                   help="SARIF: the folder file URIs are relative to (default: the working folder)")
    c.add_argument("--no-pictures", action="store_true",
                   help="Markdown to a file: do not write the SVG pictures beside it")
    c.add_argument("--fail-on", choices=LEVELS, default=None,
                   help="exit 1 when a finding at or above this severity fails and no current "
                        "accepted or not_applicable decision settles it")
    add_rule_options(c)
    c.add_argument("--no-passed", action="store_true", help="leave passed checks out (text)")
    c.add_argument("--color", choices=("auto", "always", "never"), default="auto")


def run(args: argparse.Namespace) -> int:
    """Review every design given; every one that loads is reported, even when others do not.

    A review record or a rule file among the files (as a shell pattern like ``*.toml`` picks
    up) is skipped with one note. The exit status is 2 when any file failed to load (its
    problems are printed after the report), else 1 or 0 by ``--fail-on``.
    """
    import sys

    from reviewer import record as rec
    from reviewer.design import load_design
    from reviewer.design.loader import WrongKind
    from reviewer.errors import InputError, Problem
    from reviewer.review import review_design

    if args.output is not None:
        writable(args.output, "report")
    reviews, problems, skipped, books = [], [], [], {}
    for path in args.designs:
        try:  # the design first: a bad one is refused before any rule is read
            design = load_design(path)
            book = rulebook(args, path, books)
            record = rec.load(rec.record_path(path), Path(path).name)
            reviews.append(review_design(design, str(path), book, record))
        except WrongKind as e:
            if e.want == "design":  # the file given is no design: skip it
                skipped.append((path, e))
            else:  # a rule file or a record that is something else: an error
                problems.extend(e.problems)
        except InputError as e:
            problems.extend(e.problems)
    problems = list(dict.fromkeys(problems))  # a bad rule file: said once, not per design
    if not reviews:
        problems.extend(Problem(str(p), e.problems[0].line, "", f"{e.problems[0].message}: "
                                "nothing to review") for p, e in skipped)
        raise InputError(problems)
    for _, e in skipped:
        print(f"note: {e.note}: skipped", file=sys.stderr)
    status = _report(args, reviews)
    if problems:
        raise InputError(problems)
    return status


def _report(args: argparse.Namespace, reviews: list) -> int:
    if args.format == "json":
        from reviewer.report import json as view

        text = view.render(reviews)
    elif args.format == "sarif":
        from reviewer.report import sarif as view

        text = view.render(reviews, base=args.base)
    elif args.format == "markdown":
        from reviewer.report import markdown as view

        pictures = {}
        if args.output is not None and not args.no_pictures:
            pictures = _pictures(reviews, args.output)
        text = view.render(reviews, pictures=pictures)
    else:
        from reviewer.report import text as view

        text = view.render(reviews, color=use_color(args.color) and args.output is None,
                           show_passed=not args.no_passed)
    emit(text, args.output)
    if args.fail_on and any(r.unsettled(args.fail_on) for r in reviews):
        return 1
    return 0


def _pictures(reviews, output: Path) -> dict:
    """Write each review's pictures beside ``output``; {review path: [(caption, link)]}."""
    import sys

    from reviewer.report import pictures

    out = {}
    for r in reviews:
        stem = output.stem if len(reviews) == 1 else f"{output.stem}.{Path(r.path).stem}"
        try:
            made = pictures.write_pictures(r, output.parent, stem)
        except pictures.PicturesUnavailable as e:
            print(f"note: pictures left out: {e}", file=sys.stderr)
            return {}
        for _, name in made:
            print(f"wrote {output.parent / name}", file=sys.stderr)
        out[r.path] = made
    return out
