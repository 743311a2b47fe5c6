"""reviewer examples: list the bundled example designs, or copy them to a folder to work on."""

from __future__ import annotations

import argparse
import sys
from pathlib import Path


def register(sub) -> None:
    e = sub.add_parser("examples", help="list the bundled example designs, or copy them")
    e.add_argument("--copy", type=Path, metavar="DIR", default=None,
                   help="copy the example designs and the sample house rules into DIR (made "
                        "if missing; files already there and the same are left alone, a "
                        "different one is never overwritten)")


def shipped() -> list[Path]:
    """The bundled example designs and sample house rules, relative to their folder; never a
    review record or an export someone left there."""
    from reviewer.paths import examples_dir

    root = examples_dir()
    return sorted(p.relative_to(root) for p in root.rglob("*.toml")
                  if ".review." not in p.name and p.is_file())


def run(args: argparse.Namespace) -> int:
    from reviewer.paths import examples_dir

    if args.copy is None:
        for p in sorted(examples_dir().glob("*.toml")):
            if ".review." not in p.name:
                print(p)
        return 0
    return copy_to(args.copy)


def copy_to(target: Path) -> int:
    """Copy every example into ``target``; an InputError (nothing written) when a file there
    differs from the example of the same name or the folder cannot be made."""
    from reviewer.commands._common import write
    from reviewer.errors import InputError, Problem
    from reviewer.paths import examples_dir

    root = examples_dir()
    todo, clash = [], []
    for rel in shipped():
        text = (root / rel).read_text(encoding="utf-8")
        dest = target / rel
        if dest.is_file():
            if dest.read_text(encoding="utf-8", errors="replace") != text:
                clash.append(Problem(str(dest), None, "", "already exists and differs from the "
                                     "bundled example; not overwritten (copy to another folder)"))
            continue
        todo.append((dest, text))
    if clash:
        raise InputError(clash)
    if target.exists() and not target.is_dir():
        raise InputError([Problem(str(target), None, "", "is a file, not a folder")])
    for dest, text in todo:
        try:
            dest.parent.mkdir(parents=True, exist_ok=True)
        except OSError as e:
            raise InputError([Problem(str(dest.parent), None, "", f"cannot make the folder: "
                                      f"{e.strerror or e}")]) from None
        write(dest, text, "example")
    designs = [target / rel for rel in shipped() if len(rel.parts) == 1]
    print(f"{'copied' if todo else 'already there'}: {len(designs)} example designs in "
          f"{target}", file=sys.stderr)
    for p in designs:
        print(p)
    return 0
