"""Placeholder lines of the starter design (``reviewer new``) still unchanged in a design file.

The starter marks every value it invents with a ``# PLACEHOLDER`` comment. A line of a design
file that still reads exactly as a placeholder line of the starter, under the same table, has
not been filled in: every report lists those fields, so that an invented value is never taken
for the designer's. A line whose value was changed (or whose comment was removed) no longer
matches. Nothing here judges a value.
"""

from __future__ import annotations

from functools import lru_cache
from pathlib import Path

MARK = "# PLACEHOLDER"


def _lines(text: str) -> list[tuple[str, str]]:
    """(table, stripped line) for every key line of a TOML text, the table as written."""
    table, out = "", []
    for raw in text.splitlines():
        line = raw.strip()
        if line.startswith("[") and not line.startswith("[["):
            table = line.strip("[] ")
        elif line and not line.startswith("#") and "=" in line:
            out.append((table, line))
    return out


@lru_cache(maxsize=1)
def _starter() -> frozenset[tuple[str, str]]:
    from importlib.resources import files

    text = files("reviewer").joinpath("starter.toml").read_text(encoding="utf-8")
    return frozenset((t, line) for t, line in _lines(text) if MARK in line)


def unchanged(path: str | Path) -> list[str]:
    """The fields (``table.key``) whose line is still the starter's placeholder, in file order;
    [] when the file cannot be read."""
    try:
        text = Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError):
        return []
    marked = _starter()
    return [f"{t}.{line.split('=', 1)[0].strip()}" if t else line.split("=", 1)[0].strip()
            for t, line in _lines(text) if (t, line) in marked]


def sentence(fields: list[str], limit: int = 12) -> str:
    """'149 placeholder values from the starter are unchanged: design.title, …'."""
    n = len(fields)
    shown = ", ".join(fields[:limit]) + (f" and {n - limit} more" if n > limit else "")
    noun = "value is" if n == 1 else "values are"
    return (f"{n} placeholder {noun} still as the starter wrote {'it' if n == 1 else 'them'} "
            f"(invented, not yours): {shown}. Replace each and delete its PLACEHOLDER comment.")
