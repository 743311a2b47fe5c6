"""The calculation sheet: every value a design implies, by a stable dotted name, at every corner.

The derive modules (:mod:`reviewer.derive`) read the design and call the physics; each value they
compute is *published* here under a name declared in advance (its unit and label come from the
declaration). Design fields are published too, under ``design.<path>``. Rules read this one
namespace; the report's calculation sheet lists it.

Tolerance corners
-----------------
A quantity's worst corner is found in three passes over the derive step, each a plain scalar run:

1. the typical run (every input at its typical value);
2. one run per end of every toleranced input (that input at min or max, the rest typical), which
   shows which end pushes each quantity up or down;
3. for every quantity and direction, one run with each toleranced input set to the end that
   pushed it that way (runs that coincide are made once).

Every quantity then carries its value in every run; its low and high are the extremes over the
runs, and a rule picks the run where its own margin is worst. This finds the true worst corner of
any quantity that is monotonic in each input (the usual case for these formulas); a quantity
that is not monotonic in an input may be underestimated, as with any corner analysis.
"""

from __future__ import annotations

import math
import re
from contextlib import contextmanager
from dataclasses import dataclass, field
from typing import Any, Iterator

from reviewer.units import Span

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


@dataclass(frozen=True)
class Quantity:
    """One published value: typical, low and high over the corners, and its value in every run."""

    name: str
    unit: str
    label: str
    typ: Any
    lo: Any
    hi: Any
    runs: tuple[Any, ...]
    kind: str = "number"
    origin: str = "derived"  # derived | design | default
    note: str = ""

    @property
    def toleranced(self) -> bool:
        return self.kind == "number" and self.lo != self.hi


@dataclass(frozen=True)
class Missing:
    """A quantity that could not be computed, and the design fields that would let it be."""

    name: str
    needs: tuple[str, ...]


@dataclass(frozen=True)
class Sheet:
    """Everything the derive step published for one design."""

    quantities: dict[str, Quantity]
    missing: dict[str, Missing]
    corners: tuple[tuple[tuple[str, str], ...], ...]
    """For each run, which toleranced inputs were away from typical: ((path, "min"|"max"), ...)."""
    series: dict[str, Any] = field(default_factory=dict)
    """Data for pictures (spectra, timing), from the typical run; never judged by rules."""
    read_fields: frozenset[str] = frozenset()
    """Every design field path a derive module read in any run."""

    def get(self, name: str) -> Quantity | None:
        return self.quantities.get(name)

    def value(self, name: str, default: Any = None) -> Any:
        q = self.quantities.get(name)
        return default if q is None else q.typ

    @property
    def run_count(self) -> int:
        return len(self.corners)


class Ctx:
    """What a derive module sees during one run: the design's values at this corner."""

    def __init__(self, design: Any, values: dict[str, Any], catalogue: dict[str, Declared],
                 typical: bool = True):
        self.design = design
        self.typical = typical
        """True in the typical run only: compute picture data (``plot``) there and nowhere else."""
        self._values = values
        self._catalogue = catalogue
        self.out: dict[str, Any] = {}
        self.missing: dict[str, tuple[str, ...]] = {}
        self.notes: dict[str, str] = {}
        self.series: dict[str, Any] = {}
        self.reads: list[tuple[str, str, Any]] = []
        """What the running module read, in order: replaying a module whose reads are the same
        as a run before gives the same results (derive code is deterministic)."""

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
        if name in self.out:
            return ("value", self.out[name])
        return ("missing", self.missing.get(name))

    # publishing ---------------------------------------------------------------------------
    def publish(self, name: str, value: Any, note: str = "") -> None:
        """Publish ``value`` (SI, in the declared unit) under the declared ``name``."""
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
        if self.typical:
            self.series[key] = data


def design_values(design: Any) -> tuple[dict[str, Any], dict[str, Span], dict[str, str]]:
    """Flatten the design: path -> typical value, path -> Span for quantities, path -> unit."""
    from pydantic import BaseModel

    from reviewer.design.fields import UnitTag

    values: dict[str, Any] = {}
    spans: dict[str, Span] = {}
    units: dict[str, str] = {}

    def walk(model: Any, cls: Any, prefix: str) -> None:
        for name, info in type(model).model_fields.items():
            path = f"{prefix}{name}"
            value = getattr(model, name)
            tag = next((m for m in info.metadata if isinstance(m, UnitTag)), None)
            if tag is None:
                tag = _unit_in_annotation(info.annotation)
            if isinstance(value, BaseModel):
                walk(value, type(value), path + ".")
                continue
            if value is None:
                sub = _submodel(info.annotation)
                if sub is not None:
                    _none_fields(sub, f"{path}.", values, units)
                    continue
            if isinstance(value, Span):
                spans[path] = value
                values[path] = value.typ
            elif isinstance(value, (bool, int, float, str)) or value is None:
                values[path] = value
            else:
                values[path] = value  # lists and tables: readable by derive modules, not rules
            if tag is not None:
                units[path] = tag.unit

    walk(design, type(design), "")
    return values, spans, units


def _none_fields(cls: Any, prefix: str, values: dict[str, Any], units: dict[str, str]) -> None:
    """An absent optional table: its fields exist as None so that derive code can ask for them."""
    from reviewer.design.fields import UnitTag

    for name, info in cls.model_fields.items():
        sub = _submodel(info.annotation)
        if sub is not None:
            _none_fields(sub, f"{prefix}{name}.", values, units)
        else:
            values[f"{prefix}{name}"] = None
            tag = next((m for m in info.metadata if isinstance(m, UnitTag)), None) \
                or _unit_in_annotation(info.annotation)
            if tag is not None:
                units[f"{prefix}{name}"] = tag.unit


def _submodel(annotation: Any) -> Any:
    from reviewer.design.loader import _model_of

    return _model_of(annotation)


def _unit_in_annotation(annotation: Any) -> Any:
    import typing

    from reviewer.design.fields import UnitTag

    for arg in typing.get_args(annotation):
        if isinstance(arg, UnitTag):
            return arg
        found = _unit_in_annotation(arg)
        if found is not None:
            return found
    return None


_NAME = re.compile(r"^[a-z][a-z0-9_]*(\.[a-z0-9_]+)+$")


def catalogue() -> dict[str, Declared]:
    """Every quantity name the derive modules may publish."""
    from reviewer.derive import MODULES

    out: dict[str, Declared] = {}
    for module in MODULES:
        for d in module.QUANTITIES:
            for n in d.names():
                assert _NAME.match(n), n
                assert n not in out, f"{n} declared twice"
                out[n] = d
    return out


def compute(design: Any, max_runs: int = 400, focus: set[str] | frozenset[str] | None = None,
            replay: bool = True) -> Sheet:
    """Run every derive module over the design's tolerance corners and return the sheet.

    ``focus`` names the quantities whose extremes matter (those the rules judge); the third
    pass makes corner runs for these only. None: every published number. With ``replay``, a
    module whose reads in a run equal those of an earlier run is not run again: its earlier
    results are reused (the same inputs give the same outputs).
    """
    from reviewer.derive import MODULES

    cat = catalogue()
    base, spans, units = design_values(design)
    tol = [p for p, s in spans.items() if not s.exact]

    replays: list[list[_Replay]] = [[] for _ in MODULES]

    def run(assign: dict[str, str]) -> Ctx:
        values = dict(base)
        for p, end in assign.items():
            values[p] = spans[p].lo if end == "min" else spans[p].hi
        ctx = Ctx(design, values, cat, typical=not assign)
        for module, seen in zip(MODULES, replays):
            hit = next((r for r in seen if r.matches(ctx)), None) if replay else None
            if hit is not None:
                ctx.out.update(hit.out)
                ctx.missing.update(hit.missing)
                ctx.notes.update(hit.notes)
                continue
            ctx.reads = []
            out0, missing0, notes0 = set(ctx.out), set(ctx.missing), set(ctx.notes)
            module.derive(ctx)
            seen.append(_Replay(
                tuple(ctx.reads),
                {k: v for k, v in ctx.out.items() if k not in out0},
                {k: v for k, v in ctx.missing.items() if k not in missing0},
                {k: v for k, v in ctx.notes.items() if k not in notes0},
            ))
        return ctx

    assigns: list[dict[str, str]] = [{}]
    ctxs: list[Ctx] = [run({})]
    for p in tol:
        for end in ("min", "max"):
            assigns.append({p: end})
            ctxs.append(run({p: end}))

    typ_out = ctxs[0].out
    seen = {(): 0}
    numeric = [n for n, v in typ_out.items() if _is_number(v) and (focus is None or n in focus)]
    for n in numeric:
        for direction in (1, -1):
            assign: dict[str, str] = {}
            for i, p in enumerate(tol):
                y0 = typ_out[n]
                ylo = ctxs[1 + 2 * i].out.get(n, y0)
                yhi = ctxs[2 + 2 * i].out.get(n, y0)
                best = max((direction * (ylo - y0), "min"), (direction * (yhi - y0), "max"))
                if _is_number(ylo) and _is_number(yhi) and best[0] > 0:
                    assign[p] = best[1]
            key = tuple(sorted(assign.items()))
            if key in seen or len(assign) < 2:
                continue  # a single-input corner was already run in pass 2
            if len(ctxs) >= max_runs:
                break
            seen[key] = len(ctxs)
            assigns.append(assign)
            ctxs.append(run(assign))

    quantities: dict[str, Quantity] = {}
    for n, v in typ_out.items():
        d = cat[n]
        runs = tuple(c.out.get(n, v) for c in ctxs)
        lo, hi = _extremes(runs, v)
        quantities[n] = Quantity(n, d.unit, d.label, v, lo, hi, runs, d.kind, "derived",
                                 ctxs[0].notes.get(n, ""))
    for path, value in base.items():
        name = f"design.{path}"
        runs = tuple(c._values[path] for c in ctxs)
        lo, hi = _extremes(runs, value)
        kind = "flag" if isinstance(value, bool) else ("number" if _is_number(value) else "text")
        if value is None or isinstance(value, (list, dict)):
            continue
        quantities[name] = Quantity(name, units.get(path, ""), path, value, lo, hi, runs, kind,
                                    "design")
    missing = {n: Missing(n, needs) for n, needs in ctxs[0].missing.items() if n not in typ_out}
    for path, value in base.items():
        if value is None:
            missing[f"design.{path}"] = Missing(f"design.{path}", (path,))
    corners = tuple(tuple(sorted(a.items())) for a in assigns)
    read = frozenset(name for seen in replays for r in seen for kind, name, _ in r.reads
                     if kind == "v")
    return Sheet(quantities, missing, corners, ctxs[0].series, read)


@dataclass(frozen=True)
class _Replay:
    """One module's results in an earlier run, and everything it read to get them."""

    reads: tuple[tuple[str, str, Any], ...]
    out: dict[str, Any]
    missing: dict[str, tuple[str, ...]]
    notes: dict[str, str]

    def matches(self, ctx: Ctx) -> bool:
        return all(_same(ctx.peek(kind, name), value) for kind, name, value in self.reads)


def _same(a: Any, b: Any) -> bool:
    try:
        return bool(a == b)
    except (TypeError, ValueError):  # values that do not compare plainly: never replay
        return False


def _is_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _extremes(runs: tuple[Any, ...], typ: Any) -> tuple[Any, Any]:
    nums = [r for r in runs if _is_number(r)]
    if not _is_number(typ) or not nums:
        return typ, typ
    return min(nums), max(nums)
