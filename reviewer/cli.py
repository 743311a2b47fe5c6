"""The command line: parses arguments, calls the review, picks a view. Exit 0, 1 or 2.

0: done, nothing at or above ``--fail-on``; 1: findings at or above it; 2: bad input (every
problem printed with file, line and field, never a traceback).
"""

from __future__ import annotations

import argparse
import os
import sys
from pathlib import Path

from reviewer import __version__

LEVELS = ("hazard", "risk", "advice")


def _parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(
        prog="reviewer",
        description="Review an H-bridge or inverter design described in a TOML file.",
    )
    p.add_argument("--version", action="version", version=f"reviewer {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")

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

    s = sub.add_parser("sheet", help="print the calculation sheet of a design")
    s.add_argument("design", type=Path, metavar="DESIGN")
    s.add_argument("--format", choices=("text", "json"), default="text")

    sub.add_parser("schema", help="print the JSON Schema of the design file format")

    n = sub.add_parser("new", help="write a starter design file to fill in")
    n.add_argument("file", type=Path, metavar="FILE")

    sub.add_parser("examples", help="list the bundled example designs")
    return p


def main(argv: list[str] | None = None) -> int:
    args = _parser().parse_args(argv)
    if args.command is None:
        _parser().print_help()
        return 0
    from reviewer.errors import InputError

    try:
        return COMMANDS[args.command](args)
    except InputError as e:
        for problem in e.problems:
            print(f"error: {problem}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        return 0


def _rule_files(paths: list[Path]) -> list[Path]:
    from reviewer.errors import InputError, Problem

    out: list[Path] = []
    for p in paths:
        if p.is_dir():
            out.extend(sorted(p.glob("*.toml")))
        elif p.is_file():
            out.append(p)
        else:
            raise InputError([Problem(str(p), None, "", "no such rule file or folder")])
    return out


def _color(choice: str) -> bool:
    if choice != "auto":
        return choice == "always"
    return sys.stdout.isatty() and "NO_COLOR" not in os.environ


def _emit(text: str, output: Path | None) -> None:
    if output is None:
        sys.stdout.write(text)
    else:
        from reviewer.atomic import write_text

        write_text(output, text)
        print(f"wrote {output}", file=sys.stderr)


def cmd_check(args: argparse.Namespace) -> int:
    from reviewer.errors import InputError
    from reviewer.review import review_file
    from reviewer.rulebook import load_rulebook

    book = load_rulebook(_rule_files(args.rules))
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

        text = view.render(reviews, color=_color(args.color) and args.output is None,
                           show_passed=not args.no_passed)
    _emit(text, args.output)
    if args.fail_on:
        worst = LEVELS.index(args.fail_on)
        for r in reviews:
            if any(LEVELS.index(f.severity) <= worst for f in r.failures):
                return 1
    return 0


def cmd_sheet(args: argparse.Namespace) -> int:
    from reviewer.review import review_file

    r = review_file(args.design)
    if args.format == "json":
        import json

        from reviewer.report.json import to_data

        print(json.dumps(to_data(r)["sheet"], indent=2, ensure_ascii=False))
        return 0
    from reviewer.report.common import num

    rows = sorted(r.sheet.quantities.values(), key=lambda q: q.name)
    width = max(len(q.name) for q in rows)
    for q in rows:
        if q.kind == "number":
            span = "" if not q.toleranced else f"   [{num(q.lo, q.unit)} … {num(q.hi, q.unit)}]"
            value = num(q.typ, q.unit) + span
        else:
            value = str(q.typ)
        note = f"   ({q.note})" if q.note else ""
        print(f"{q.name:<{width}}  {value}{note}")
    for m in sorted(r.sheet.missing.values(), key=lambda m: m.name):
        if not m.name.startswith("design."):
            print(f"{m.name:<{width}}  not computed: give {', '.join(m.needs)}")
    return 0


def cmd_schema(args: argparse.Namespace) -> int:
    import json

    from reviewer.design.schema import design_schema

    print(json.dumps(design_schema(), indent=2, ensure_ascii=False))
    return 0


def cmd_new(args: argparse.Namespace) -> int:
    from reviewer.errors import InputError, Problem

    target: Path = args.file
    if target.exists():
        raise InputError([Problem(str(target), None, "", "already exists; not overwritten")])
    from importlib.resources import files

    from reviewer.atomic import write_text

    write_text(target, files("reviewer").joinpath("starter.toml").read_text(encoding="utf-8"))
    print(f"wrote {target}: fill it in, then run: reviewer check {target}", file=sys.stderr)
    return 0


def cmd_examples(args: argparse.Namespace) -> int:
    from reviewer.paths import examples_dir

    for p in sorted(examples_dir().glob("*.toml")):
        print(p)
    return 0


COMMANDS = {
    "check": cmd_check,
    "sheet": cmd_sheet,
    "schema": cmd_schema,
    "new": cmd_new,
    "examples": cmd_examples,
}


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
