"""Standard tables as data: one TOML file per table, read once and kept read-only.

Each file opens with a ``[table]`` section naming the standard, its edition, the table number, how
a lookup works (``step``, ``interpolate``, ``key``, ``limit`` or ``formula``, as the standard says)
and how sure the values are (checked against the printed table, against a reprint, or from
memory). The physics reads the ``[data]`` sections through :func:`load`; it never edits them.
"""

from __future__ import annotations

import tomllib
from functools import cache
from importlib import resources
from types import MappingProxyType
from typing import Any

REQUIRED = ("standard", "edition", "number", "title", "lookup", "certainty")
LOOKUPS = ("step", "interpolate", "key", "limit", "formula")


def _freeze(value: Any) -> Any:
    if isinstance(value, dict):
        return MappingProxyType({k: _freeze(v) for k, v in value.items()})
    if isinstance(value, list):
        return tuple(_freeze(v) for v in value)
    return value


def names() -> list[str]:
    """The names of the tables shipped with the package (file names without ``.toml``)."""
    return sorted(
        p.name.removesuffix(".toml")
        for p in resources.files(__name__).iterdir()
        if p.name.endswith(".toml")
    )


@cache
def load(name: str) -> Any:
    """The table ``name`` as a read-only mapping (nested mappings and tuples).

    Parameters
    ----------
    name : str
        File name without ``.toml``, e.g. ``"iec60664_1_creepage"``.

    Raises
    ------
    KeyError
        When no such table exists, or its ``[table]`` section lacks a required key.
    """
    path = resources.files(__name__).joinpath(f"{name}.toml")
    if not path.is_file():
        raise KeyError(f"no standard table named {name!r}; known: {', '.join(names())}")
    data = tomllib.loads(path.read_text(encoding="utf-8"))
    head = data.get("table", {})
    missing = [k for k in REQUIRED if k not in head]
    if missing:
        raise KeyError(f"table {name!r} lacks {', '.join(missing)} in its [table] section")
    if head["lookup"] not in LOOKUPS:
        raise KeyError(f"table {name!r} has an unknown lookup kind {head['lookup']!r}")
    return _freeze(data)


def citation(name: str) -> str:
    """A one-line citation of a table: standard, edition and table number."""
    head = load(name)["table"]
    return f"{head['standard']} ({head['edition']}), Table {head['number']}"


def interpolate(xs: tuple[float, ...], ys: tuple[float, ...], x: float) -> float:
    """Linear interpolation in a table whose ``xs`` rise; the first row applies below it.

    Raises
    ------
    ValueError
        Above the last row (the table gives nothing there).
    """
    if x > xs[-1]:
        raise ValueError(f"{x:g} lies above the table's last row ({xs[-1]:g})")
    if x <= xs[0]:
        return float(ys[0])
    for i in range(1, len(xs)):
        if x <= xs[i]:
            x0, x1, y0, y1 = xs[i - 1], xs[i], ys[i - 1], ys[i]
            return float(y0 + (y1 - y0) * (x - x0) / (x1 - x0))
    raise AssertionError("unreachable")  # pragma: no cover


def step_index(bounds: tuple[float, ...], x: float) -> int:
    """The index of the first row whose bound is at or above ``x`` ('up to and including').

    Raises
    ------
    ValueError
        Above the last bound.
    """
    for i, b in enumerate(bounds):
        if x <= b:
            return i
    raise ValueError(f"{x:g} lies above the table's last row ({bounds[-1]:g})")
