"""reviewer walk: take the reviewer through every finding of a design in a full-screen view."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands._common import rule_files


def register(sub) -> None:
    w = sub.add_parser("walk", help="walk through the findings of a design, deciding each one")
    w.add_argument("design", type=Path, metavar="DESIGN")
    w.add_argument("--rules", type=Path, action="append", default=[], metavar="PATH",
                   help="extra rule file or folder (may be given more than once)")
    w.add_argument("--reviewer", default=None,
                   help="name written with each decision (default: your user name)")


def run(args: argparse.Namespace) -> int:
    from reviewer.errors import InputError, Problem

    if not args.design.is_file():  # nothing to watch: say so on the command line
        raise InputError([Problem(str(args.design), None, "", "no such design file")])
    from reviewer.tui.app import WalkApp
    from reviewer.tui.session import Walk

    walk = Walk.open(args.design, rule_files(args.rules), args.reviewer)
    result = WalkApp(walk).run()
    return result or 0
