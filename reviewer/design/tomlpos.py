"""Where each key of a TOML text stands: a map from the dotted key path to its line number.

tomllib gives values but no positions; error messages need the line. This reads only the
structure (table headers, ``key =`` lines, inline tables) and is used for locating, never for
values.
"""

from __future__ import annotations

import re

_HEADER = re.compile(r"^\s*(\[\[?)\s*([^\]]+?)\s*\]\]?\s*(?:#.*)?$")
_KEY = re.compile(r"""^\s*((?:[A-Za-z0-9_\-]+|"[^"]*"|'[^']*')(?:\s*\.\s*(?:[A-Za-z0-9_\-]+|"[^"]*"|'[^']*'))*)\s*=""")
_INLINE_KEY = re.compile(r"""(?:[{,]\s*)([A-Za-z0-9_\-]+|"[^"]*")\s*=""")


def _split(dotted: str) -> list[str]:
    parts = re.findall(r"""[A-Za-z0-9_\-]+|"[^"]*"|'[^']*'""", dotted)
    return [p.strip("\"'") for p in parts]


def key_lines(text: str) -> dict[tuple[str, ...], int]:
    """Map every key path to the 1-based line where it is written.

    Arrays of tables get their index: the second ``[[rule]]`` is ``("rule", "1")``.
    """
    lines: dict[tuple[str, ...], int] = {}
    counts: dict[tuple[str, ...], int] = {}
    table: tuple[str, ...] = ()
    in_multiline = False
    for number, line in enumerate(text.splitlines(), start=1):
        stripped = line.strip()
        if in_multiline:
            if stripped.count('"""') % 2 == 1 or stripped.count("'''") % 2 == 1:
                in_multiline = False
            continue
        if not stripped or stripped.startswith("#"):
            continue
        header = _HEADER.match(line)
        if header and not _KEY.match(line):
            path = tuple(_split(header.group(2)))
            if header.group(1) == "[[":
                index = counts.get(path, 0)
                counts[path] = index + 1
                table = _resolve(path, counts) + (str(index),)
                lines.setdefault(path, number)
            else:
                table = _resolve(path, counts)
            lines.setdefault(table, number)
            continue
        key = _KEY.match(line)
        if key:
            path = table + tuple(_split(key.group(1)))
            lines.setdefault(path, number)
            rest = line[key.end():]
            for inner in _INLINE_KEY.finditer(rest):
                lines.setdefault(path + (inner.group(1).strip('"'),), number)
            if rest.count('"""') % 2 == 1 or rest.count("'''") % 2 == 1:
                in_multiline = True
    return lines


def _resolve(path: tuple[str, ...], counts: dict[tuple[str, ...], int]) -> tuple[str, ...]:
    """``[rule.extra]`` under ``[[rule]]`` belongs to the latest array element."""
    out: list[str] = []
    for i, part in enumerate(path):
        out.append(part)
        prefix = path[: i + 1]
        if prefix in counts and i < len(path) - 1:
            out.append(str(counts[prefix] - 1))
    return tuple(out)


def line_of(lines: dict[tuple[str, ...], int], path: tuple[str, ...]) -> int | None:
    """The line of ``path``, or of its nearest written parent."""
    p = tuple(str(x) for x in path)
    while p:
        if p in lines:
            return lines[p]
        p = p[:-1]
    return None
