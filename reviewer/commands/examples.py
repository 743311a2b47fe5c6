"""reviewer examples: list the bundled example designs."""

from __future__ import annotations

import argparse


def register(sub) -> None:
    sub.add_parser("examples", help="list the bundled example designs")


def run(args: argparse.Namespace) -> int:
    from reviewer.paths import examples_dir

    for p in sorted(examples_dir().glob("*.toml")):
        if not p.name.endswith(".review.toml"):
            print(p)
    return 0
