"""reviewer check: review designs and print the findings."""

from __future__ import annotations

import argparse
import sys
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
    c.add_argument("--samples", type=int, default=0, metavar="N",
                   help="also judge every check over N Monte Carlo samples of the tolerances "
                        "and report its yield")
    c.add_argument("--seed", type=int, default=None, metavar="S",
                   help="seed of the samples (default: a fixed seed, so runs repeat exactly)")


def run(args: argparse.Namespace) -> int:
    """Review every design given; every one that loads is reported, even when others do not.

    A review record or a rule file among the files (as a shell pattern like ``*.toml`` picks
    up) is skipped with one note. The exit status is 2 when any file failed to load (its
    problems are printed after the report), else 1 or 0 by ``--fail-on``.
    """
    from reviewer import record as rec
    from reviewer.design import load_design
    from reviewer.design.loader import WrongKind
    from reviewer.errors import InputError, Problem
    from reviewer.progress import progress
    from reviewer.review import review_design
    from reviewer.sampling import DEFAULT_SEED, with_yield

    if args.output is not None:
        writable(args.output, "report")
    reviews, problems, skipped, books = [], [], [], {}
    seed = DEFAULT_SEED if args.seed is None else args.seed
    with progress("reviewing", len(args.designs)) as step:
        for path in args.designs:
            try:  # the design first: a bad one is refused before any rule is read
                design = load_design(path)
                book = rulebook(args, path, books)
                record = rec.load(rec.record_path(path), Path(path).name)
                r = review_design(design, str(path), book, record)
                if args.samples > 0:
                    with progress(f"sampling {Path(path).name}", args.samples) as tick:
                        r = with_yield(r, book, args.samples, seed, tick)
                reviews.append(r)
            except WrongKind as e:
                if e.want == "design":  # the file given is no design: skip it
                    skipped.append((path, e))
                else:  # a rule file or a record that is something else: an error
                    problems.extend(e.problems)
            except InputError as e:
                problems.extend(e.problems)
            step()
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

        if args.output is not None:  # the one writer, shared with the walkthrough's export
            view.write(reviews, args.output, with_pictures=not args.no_pictures,
                       tell=lambda message: print(message, file=sys.stderr))
            return 1 if args.fail_on and _fails(reviews, args.fail_on) else 0
        text = view.render(reviews)
    else:
        from reviewer.report import text as view

        text = view.render(reviews, color=use_color(args.color) and args.output is None,
                           show_passed=not args.no_passed)
    emit(text, args.output)
    if args.fail_on and _fails(reviews, args.fail_on):
        return 1
    return 0


def _fails(reviews, level: str) -> bool:
    """Something at or above ``level`` fails: an unsettled finding, or an answer the design file
    contradicts (never taken as a pass)."""
    from reviewer.findings import SEVERITIES
    from reviewer.report.conflicts import conflicts

    worst = SEVERITIES.index(level)
    for r in reviews:
        if r.unsettled(level):
            return True
        for c in conflicts(r):
            f = next((x for x in r.findings if x.rule_id == c.question), None)
            if f is not None and SEVERITIES.index(f.severity) <= worst:
                return True
    return False
