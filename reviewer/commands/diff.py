"""reviewer diff: compare two revisions of a design, finding by finding."""

from __future__ import annotations

import argparse
from pathlib import Path


def register(sub) -> None:
    d = sub.add_parser(
        "diff", help="compare the findings of two revisions of a design",
        description="Review OLD and NEW and list the findings that appeared, disappeared, "
                    "changed outcome or whose numbers moved beyond the record's re-confirmation "
                    "tolerance, side by side, then the design fields that changed. Exit 0.")
    d.add_argument("old", type=Path, metavar="OLD.toml")
    d.add_argument("new", type=Path, metavar="NEW.toml")
    d.add_argument("--format", choices=("text", "markdown", "json"), default="text")
    d.add_argument("--output", "-o", type=Path, help="write to this file")
    from reviewer.commands._common import add_rule_options

    add_rule_options(d)


def run(args: argparse.Namespace) -> int:
    from reviewer.commands._common import emit, rulebook
    from reviewer.errors import InputError
    from reviewer.report import diff
    from reviewer.review import review_file

    reviews, problems, books = [], [], {}
    for p in (args.old, args.new):
        try:
            reviews.append(review_file(p, book=rulebook(args, p, books), use_record=False))
        except InputError as e:
            problems.extend(e.problems)
    if problems:
        raise InputError(problems)
    old, new = reviews
    if args.format == "json":
        import json

        text = json.dumps(diff.to_data(old, new), indent=2, ensure_ascii=False) + "\n"
    elif args.format == "markdown":
        text = diff.render_markdown(old, new)
    else:
        text = diff.render_text(old, new)
    emit(text, args.output)
    return 0
