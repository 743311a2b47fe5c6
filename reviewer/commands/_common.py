"""Helpers shared by the command modules."""

from __future__ import annotations

import os
import sys
from pathlib import Path

LEVELS = ("hazard", "risk", "advice")


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


def emit(text: str, output: Path | None) -> None:
    if output is None:
        sys.stdout.write(text)
    else:
        from reviewer.atomic import write_text

        write_text(output, text)
        print(f"wrote {output}", file=sys.stderr)


