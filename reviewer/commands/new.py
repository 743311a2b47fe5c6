"""reviewer new: write a starter design file (never overwrites)."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


def register(sub) -> None:
    n = sub.add_parser("new", help="write a starter design file to fill in")
    n.add_argument("file", type=Path, metavar="FILE")
    n.add_argument("--minimal", action="store_true",
                   help="a thin starter with the few tables every design needs, instead of "
                        "every table with placeholders")


def run(args: argparse.Namespace) -> int:
    from importlib.resources import files

    from reviewer.commands._common import write
    from reviewer.errors import InputError, Problem

    target: Path = args.file
    if target.exists():
        raise InputError([Problem(str(target), None, "", "already exists; not overwritten")])
    starter = "starter_minimal.toml" if getattr(args, "minimal", False) else "starter.toml"
    write(target, files("reviewer").joinpath(starter).read_text(encoding="utf-8"),
          "starter design")
    hint = "" if starter == "starter_minimal.toml" else (
        " (every value is a placeholder: each review lists those still unchanged)")
    print(f"wrote {target}: fill it in, then run: reviewer check {target}{hint}", file=sys.stderr)
    return 0
