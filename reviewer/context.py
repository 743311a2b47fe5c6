"""What a derive module sees: declarations of what it publishes, and the context of one run.

The bottom of the derive step: :mod:`reviewer.derive` modules import this module (never
:mod:`reviewer.quantities`, which runs them), so that the registry of modules
(:data:`reviewer.derive.MODULES`) and the machinery that runs them import without a circle.
"""

from __future__ import annotations

import math
from contextlib import contextmanager
from dataclasses import dataclass
from typing import Any, Iterator

SIDES = ("high", "low")


@dataclass(frozen=True)
class Declared:
    """A quantity a derive module may publish: name pattern (``{side}`` for each side), unit, label."""

    pattern: str
    unit: str
    label: str
    kind: str = "number"  # number | flag | text

    def names(self) -> list[str]:
        if "{side}" in self.pattern:
            return [self.pattern.replace("{side}", s) for s in SIDES]
        return [self.pattern]


def declare(*rows: tuple) -> list[Declared]:
    """Declare what a derive module publishes: rows of (pattern, unit, label[, kind])."""
    return [Declared(*row) for row in rows]


class NeedsData(Exception):
    """Raised inside a derive section when a value it needs was not given."""

    def __init__(self, *needs: str):
        self.needs = tuple(needs)
        super().__init__(", ".join(needs))


class SplitPoints(ValueError):
    """Raised by a derive module in an array call whose points take paths that publish
    different quantities (a solver that converges at some points and not at others, say).

    ``groups`` gives each point a key (an array of shape (n,), bools say); the runner calls the
    module again once for each group of points with equal keys, where the paths agree. A
    ValueError, so that a runner that does not group points falls back to scalar calls."""

    def __init__(self, groups: Any):
        self.groups = groups
        super().__init__("the points take different paths: evaluate them in groups")


class Ctx:
    """What a derive module sees during one run: the design's values at this corner."""

    def __init__(self, design: Any, values: dict[str, Any], catalogue: dict[str, Declared],
                 typical: bool = True):
        self.design = design
        self._typical = typical
        self._values = values
        self._catalogue = catalogue
        self.out: dict[str, Any] = {}
        self.missing: dict[str, tuple[str, ...]] = {}
        self.notes: dict[str, str] = {}
        self.series: dict[str, Any] = {}
        self.reads: list[tuple[str, str, Any]] = []
        """What the running module read, in order: replaying a module whose reads are the same
        as a run before gives the same results (derive code is deterministic)."""

    @property
    def typical(self) -> bool:
        """True in the typical run only: compute picture data (``plot``) there and nowhere else.

        Asking is recorded as a read, so a result that depends on it is replayed only in a run
        that is typical too."""
        self.reads.append(("t", "typical", self._typical))
        return self._typical

    # reading the design -------------------------------------------------------------------
    def v(self, path: str) -> Any:
        """The value of design field ``path`` at this corner (a float for quantities), or None."""
        try:
            value = self._values[path]
        except KeyError:
            raise KeyError(f"no design field {path!r}") from None
        self.reads.append(("v", path, value))
        return value

    def need(self, *paths: str) -> Any:
        """Like :meth:`v` for each path, raising :class:`NeedsData` naming every absent one."""
        values = [self.v(p) for p in paths]
        absent = [p for p, x in zip(paths, values) if x is None]
        if absent:
            raise NeedsData(*absent)
        return values[0] if len(values) == 1 else values

    def q(self, name: str) -> Any:
        """A value published earlier in this run; :class:`NeedsData` if it could not be computed."""
        self.reads.append(("q", name, self.peek("q", name)))
        if name in self.out:
            return self.out[name]
        if name in self.missing:
            raise NeedsData(*self.missing[name])
        raise KeyError(f"{name!r} is not published (yet): check the derive order")

    def has(self, name: str) -> bool:
        self.reads.append(("h", name, name in self.out))
        return name in self.out

    def peek(self, kind: str, name: str) -> Any:
        """What a read of ``kind`` ("v", "q", "h") would see now, without recording it."""
        if kind == "v":
            return self._values[name]
        if kind == "h":
            return name in self.out
        if kind == "t":
            return self._typical
        if name in self.out:
            return ("value", self.out[name])
        return ("missing", self.missing.get(name))

    # publishing ---------------------------------------------------------------------------
    def publish(self, name: str, value: Any, note: str = "") -> None:
        """Publish ``value`` (SI, in the declared unit) under the declared ``name``.

        In an array call (a module with ``VECTOR = True``, see :meth:`Runner.batch`) ``value``
        may be a numpy array with one element per point, and ``note`` a list of texts, one per
        point, where the note quotes a number that differs between points."""
        if name not in self._catalogue:
            raise KeyError(f"{name!r} is published but not declared")
        if isinstance(value, float) and math.isnan(value):
            raise ValueError(f"{name!r}: NaN published; publish a flag or nothing instead")
        self.out[name] = value
        if note:
            self.notes[name] = note

    @contextmanager
    def section(self, *names: str) -> Iterator[None]:
        """Compute ``names`` inside the block; if it lacks data, mark them all missing."""
        try:
            yield
        except NeedsData as e:
            for n in names:
                if n not in self._catalogue:
                    raise KeyError(f"{n!r} is not declared") from None
                if n not in self.out:
                    self.missing[n] = tuple(dict.fromkeys(self.missing.get(n, ()) + e.needs))

    def plot(self, key: str, data: Any) -> None:
        """Keep data for a picture; kept from the typical run only (check ``ctx.typical``)."""
        if self._typical:
            self.series[key] = data
