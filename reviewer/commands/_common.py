"""Helpers shared by the command modules."""

from __future__ import annotations

import os
import sys
from pathlib import Path

LEVELS = ("hazard", "risk", "advice")


def add_rule_options(parser) -> None:
    """The options that choose the rules a review applies (every reviewing command has them)."""
    parser.add_argument("--rules", type=Path, action="append", default=[], metavar="PATH",
                        help="house rule file or folder, applied after the user and project "
                             "house rules (may be given more than once; later wins)")
    parser.add_argument("--profile", default="default", metavar="NAME",
                        help="the rule profile to apply (default: default)")
    parser.add_argument("--no-house-rules", action="store_true",
                        help="ignore the user and project house-rules folders "
                             "(--rules still applies)")


def rulebook(args, design: Path | None, cache: dict | None = None):
    """The rulebook for ``design`` under the command's rule options: built-in, the user's
    house-rules folder, the project's house-rules folders, then ``--rules``."""
    from reviewer.rulebook.discover import rulebook_for

    return rulebook_for(design, list(getattr(args, "rules", []) or []),
                        profile=getattr(args, "profile", "default") or "default",
                        house=not getattr(args, "no_house_rules", False), _cache=cache)


def rule_files(paths: list[Path]) -> list[Path]:
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


def use_color(choice: str) -> bool:
    if choice != "auto":
        return choice == "always"
    return sys.stdout.isatty() and "NO_COLOR" not in os.environ


def writable(output: Path, what: str = "output") -> Path:
    """``output`` when a file can be written there: its folder exists and it is no folder
    itself; an :class:`~reviewer.errors.InputError` (exit 2) otherwise, before any work."""
    from reviewer.errors import InputError, Problem

    folder = output.parent if str(output.parent) else Path(".")
    if output.is_dir():
        raise InputError([Problem(str(output), None, "", f"the {what} is a folder; name a file "
                                  "in it")])
    if not folder.is_dir():
        reason = "is a file, not a folder" if folder.exists() else "does not exist"
        raise InputError([Problem(str(output), None, "", f"the folder {str(folder)!r} {reason}; "
                                  f"create it first (the {what} is written only into an "
                                  "existing folder)")])
    return output


def write(output: Path, text: str, what: str = "output") -> None:
    """Write ``text`` to ``output`` atomically; a failure (no folder, no permission, a full disk)
    is an :class:`~reviewer.errors.InputError` naming it, and the previous file is kept."""
    from reviewer.atomic import write_text
    from reviewer.errors import InputError, Problem

    writable(output, what)
    try:
        write_text(output, text)
    except OSError as e:
        raise InputError([Problem(str(output), None, "", f"cannot write the {what}: "
                                  f"{e.strerror or e}")]) from None


def emit(text: str, output: Path | None) -> None:
    if output is None:
        sys.stdout.write(text)
    else:
        write(output, text, "report")
        print(f"wrote {output}", file=sys.stderr)


