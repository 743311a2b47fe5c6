"""The calculation sheet: every value a design implies, by a stable dotted name, at every corner.

The derive modules (:mod:`reviewer.derive`) read the design and call the physics; each value they
compute is *published* here under a name declared in advance (its unit and label come from the
declaration). Design fields are published too, under ``design.<path>``. Rules read this one
namespace; the report's calculation sheet lists it.

Runs
----
A :class:`Runner` runs every derive module for one design at any point of its tolerance box:
a *corner* (each toleranced input at typical, min or max) or a *sample* (any values inside the
box). A run keeps what each module read; a module whose reads in a run equal those of an earlier
run is not run again (derive code is deterministic: the same reads give the same results), which
makes the many corner runs of a worst-case search cheap. What the modules read also gives, for
every published quantity, the toleranced inputs it depends on (through the values it read from
earlier modules): :meth:`Runner.deps`.

The sheet
---------
:func:`compute` makes the typical run, one run per end of every toleranced input, and, for each
quantity the rules judge, the run with every input at the end that pushed it each way. A
quantity's low and high on the sheet are the extremes over those runs; a quantity that a run
could not compute is ``None`` in that run, never filled in from another run. The rules are then
judged on their own margins by :mod:`reviewer.worstcase` (every vertex of the inputs a rule
depends on, or a search), which asks the sheet's runner for the corners it needs.
"""

from __future__ import annotations

import re
from dataclasses import dataclass, field
from typing import Any, Iterable

from reviewer.context import SIDES, Ctx, Declared, NeedsData, SplitPoints, declare
from reviewer.derive import MODULES
from reviewer.units import Span

__all__ = ["SIDES", "Ctx", "Declared", "NeedsData", "declare", "Quantity", "Missing", "Sheet",
           "Run", "Runner", "compute", "catalogue", "design_values"]

Assign = tuple[tuple[str, str], ...]
"""A corner: which toleranced inputs are away from typical, ((path, "min"|"max"), ...), sorted."""


@dataclass(frozen=True)
class Quantity:
    """One published value: typical, low and high over the corners, and its value in every run.

    ``runs`` holds None where a run could not compute the quantity."""

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
    corners: tuple[Assign, ...]
    """For each run, which toleranced inputs were away from typical: ((path, "min"|"max"), ...)."""
    series: dict[str, Any] = field(default_factory=dict)
    """Data for pictures (spectra, timing), from the typical run; never judged by rules."""
    runner: "Runner | None" = field(default=None, compare=False, repr=False)
    """Makes further runs of the same design (the per-rule worst-case search); None on a sheet
    built by hand, where the engine judges the runs above only."""

    def get(self, name: str) -> Quantity | None:
        return self.quantities.get(name)

    def value(self, name: str, default: Any = None) -> Any:
        q = self.quantities.get(name)
        return default if q is None else q.typ

    @property
    def run_count(self) -> int:
        return len(self.corners)

    @property
    def read_fields(self) -> frozenset[str]:
        """Every design path (dotted, without ``design.``) a derive module read in any run."""
        return frozenset(self.runner.read_fields) if self.runner is not None else frozenset()


@dataclass
class Run:
    """One run of every derive module: the design values it used and what was published."""

    label: Assign
    """The corner, ((path, "min"|"max"), ...); for a sample, ((path, "<value>"), ...)."""
    values: dict[str, Any]
    out: dict[str, Any]
    missing: dict[str, tuple[str, ...]]
    notes: dict[str, str]
    reads: tuple[frozenset[tuple[str, str]], ...]
    """For each module in order, what it read: ("v", design path), ("q"/"h", quantity name)."""
    series: dict[str, Any] = field(default_factory=dict)

    def get(self, name: str, default: Any = None) -> Any:
        """A sheet name's value in this run (``design.<path>`` or a published quantity)."""
        if name.startswith("design."):
            return self.values.get(name[7:], default)
        return self.out.get(name, default)

    def has(self, name: str) -> bool:
        if name.startswith("design."):
            return self.values.get(name[7:]) is not None
        return name in self.out


_GONE = object()


def _same_value(a: Any, b: Any) -> bool:
    try:
        return bool(a == b)
    except (TypeError, ValueError):
        return False


class _Node:
    """A replay tree: each node asks the read a module made next; a leaf holds its results."""

    __slots__ = ("read", "kids", "result")

    def __init__(self) -> None:
        self.read: tuple[str, str] | None = None
        self.kids: dict[Any, _Node] = {}
        self.result: tuple[dict, dict, dict, frozenset] | None = None


def _key(x: Any) -> Any:
    try:
        hash(x)
    except TypeError:  # lists and tables: compared by their text
        return ("~", repr(x))
    if isinstance(x, float) and x != x:
        return ("~nan",)
    return x


class Runner:
    """Runs the derive modules for one design at any point of its tolerance box.

    Corner runs are kept (asking twice for a corner runs it once); sample runs are not.

    Parameters
    ----------
    design : Design
        The validated design.
    replay : bool
        Reuse a module's results when its reads equal those of an earlier run.
    modules : list, optional
        The derive modules in order (default :data:`reviewer.derive.MODULES`).
    trees : list, optional
        Replay trees shared with other runners (of designs that differ in a field or two, as
        the pass-value check makes): every read, not only the toleranced ones, is then keyed,
        so a module replays only where all it read is the same.
    """

    def __init__(self, design: Any, replay: bool = True, modules: list[Any] | None = None,
                 trees: list[Any] | None = None):
        self.design = design
        self.modules = list(MODULES if modules is None else modules)
        self.catalogue = catalogue(self.modules)
        self.base, self.spans, self.units = design_values(design)
        self.tol: tuple[str, ...] = tuple(p for p, s in self.spans.items() if not s.exact)
        self.replay = replay
        self.owner = {n: i for i, m in enumerate(self.modules) for d in m.QUANTITIES
                      for n in d.names()}
        self._shared = trees is not None and replay
        if trees is not None and not trees:
            trees.extend(_Node() for _ in self.modules)
        self._trees = trees if trees is not None else [_Node() for _ in self.modules]
        self._corners: dict[Assign, Run] = {}
        self._inside: dict[tuple, Run] = {}
        self._varies = frozenset(self.tol)
        self._dep_runs = -1
        self._module_deps: list[frozenset[str]] = []
        self.read_fields: set[str] = set()
        self.made = 0
        self.vector_calls = 0
        self.fallbacks = 0
        """How many runs were made (corners and samples), for the report and the benchmarks."""
        self.typical = self.corner(())

    # making runs ----------------------------------------------------------------------------
    def end(self, path: str, end: str) -> float:
        s = self.spans[path]
        return s.lo if end == "min" else s.hi

    def corner(self, assign: Iterable[tuple[str, str]]) -> Run:
        """The run with each named input at its "min" or "max" end and the rest typical."""
        key = tuple(sorted(assign))
        got = self._corners.get(key)
        if got is None:
            values = dict(self.base)
            for p, e in key:
                values[p] = self.end(p, e)
            got = self._corners[key] = self._run(values, key, typical=not key)
        return got

    @property
    def corners(self) -> dict[Assign, Run]:
        """Every corner run made so far, by corner."""
        return self._corners

    def inside(self, corner: dict[str, str], at: dict[str, float]) -> Run:
        """A kept run: inputs in ``corner`` at their "min"/"max" end, inputs in ``at`` at the
        given values (inside their tolerance), the rest typical. Its label gives each value."""
        from reviewer.units import render

        key = (tuple(sorted(corner.items())), tuple(sorted(at.items())))
        got = self._inside.get(key)
        if got is None:
            values = dict(self.base)
            for p, e in corner.items():
                values[p] = self.end(p, e)
            values.update(at)
            label = tuple(sorted([*corner.items(), *((p, render(x, self.units.get(p, ""), prec=4))
                                                     for p, x in at.items())]))
            got = self._inside[key] = self._run(values, label, typical=False)
        return got

    def point(self, at: dict[str, float], label: Assign = ()) -> Run:
        """A run with the toleranced inputs in ``at`` at the given values (a sample); not kept."""
        values = dict(self.base)
        values.update(at)
        return self._run(values, label, typical=False)

    def _run(self, values: dict[str, Any], label: Assign, typical: bool) -> Run:
        self.made += 1
        ctx = Ctx(self.design, values, self.catalogue, typical=typical)
        reads = [self._one(module, tree, ctx) for module, tree in zip(self.modules, self._trees)]
        return Run(label, values, ctx.out, ctx.missing, ctx.notes, tuple(reads), ctx.series)

    def batch(self, points: list[dict[str, float]],
              labels: list[Assign] | None = None) -> list[Run]:
        """Runs at many points at once (samples, say): not kept.

        A derive module that sets ``VECTOR = True`` is called once for all points, reading
        numpy arrays (one element per point) for inputs that differ between points and the
        scalars of the others; every other module, and an opted-in module that raises on arrays
        (a plain ``if`` on a value, say), runs once per point as in :meth:`point`. The results
        are the same either way (tested to 1e-12)."""
        import numpy as np

        n = len(points)
        labels = labels if labels is not None else [()] * n
        ctxs = []
        for at in points:
            values = dict(self.base)
            values.update(at)
            ctxs.append(Ctx(self.design, values, self.catalogue, typical=False))
        reads: list[list[frozenset[tuple[str, str]]]] = [[] for _ in range(n)]
        varying = {p for p in self.tol if len({at.get(p) for at in points}) > 1}
        for module, tree in zip(self.modules, self._trees):
            done = False
            if getattr(module, "VECTOR", False) and n > 1:
                done = self._vector(module, tree, ctxs, varying, reads, np)
            if not done:
                for i, ctx in enumerate(ctxs):
                    reads[i].append(self._one(module, tree, ctx))
        self.made += n
        return [Run(labels[i], c._values, c.out, c.missing, c.notes, tuple(reads[i]), c.series)
                for i, c in enumerate(ctxs)]

    def _one(self, module: Any, tree: _Node, ctx: Ctx) -> frozenset[tuple[str, str]]:
        """Run (or replay) one module in one scalar context; what it read."""
        hit = _lookup(tree, ctx) if self.replay else None
        if hit is None:
            ctx.reads = []
            out0, missing0, notes0 = set(ctx.out), set(ctx.missing), set(ctx.notes)
            module.derive(ctx)
            hit = ({k: v for k, v in ctx.out.items() if k not in out0},
                   {k: v for k, v in ctx.missing.items() if k not in missing0},
                   {k: v for k, v in ctx.notes.items() if k not in notes0},
                   frozenset((kind, name) for kind, name, _ in ctx.reads))
            if self.replay:
                # a design field that is not toleranced has the same value in every run of
                # this runner: only the reads that can differ go into the replay tree
                # nor do reads of what the module published itself (it computes them again)
                own = hit[0].keys() | hit[1].keys()
                _insert(tree, [r for r in ctx.reads
                               if ((self._shared or r[1] in self._varies) if r[0] == "v"
                                   else r[1] not in own)], hit)
            self.read_fields.update(name for kind, name in hit[3] if kind == "v")
        else:
            ctx.out.update(hit[0])
            ctx.missing.update(hit[1])
            ctx.notes.update(hit[2])
        return hit[3]

    def _vector(self, module: Any, tree: _Node, ctxs: list[Ctx], varying: set[str],
                reads: list, np: Any) -> bool:
        """One call of an opted-in module over every context; False to fall back to scalars."""
        n = len(ctxs)
        values = dict(ctxs[0]._values)
        for p in varying:
            values[p] = np.array([c._values[p] for c in ctxs], dtype=float)
        first = ctxs[0]
        out: dict[str, Any] = {}
        for name in first.out:
            col = [c.out.get(name, _GONE) for c in ctxs]
            if any(x is _GONE for x in col):
                return False
            if all(_same_value(x, col[0]) for x in col):
                out[name] = col[0]
            elif all(_is_number(x) for x in col):
                out[name] = np.array(col, dtype=float)
            elif all(isinstance(x, bool) for x in col):
                out[name] = np.array(col, dtype=bool)
            else:  # texts that differ between points: an array of them (code that branches on
                out[name] = np.array(col, dtype=object)  # one raises, and falls back)
        if any(c.missing != first.missing for c in ctxs):
            return False
        actx = Ctx(self.design, values, self.catalogue, typical=False)
        actx.out = dict(out)
        actx.missing = dict(first.missing)
        before = set(actx.out)
        try:
            with np.errstate(all="ignore"):
                module.derive(actx)
        except SplitPoints as e:  # points on different paths: one array call per group
            return self._groups(module, tree, ctxs, varying, reads, e.groups, np)
        except (TypeError, ValueError):  # code that is not array-safe: per-element fallback
            self.fallbacks += 1
            return False
        self.vector_calls += 1
        new = {k: v for k, v in actx.out.items() if k not in before}
        got = frozenset((kind, name) for kind, name, _ in actx.reads)
        self.read_fields.update(name for kind, name in got if kind == "v")
        # what this call marked missing (taken before the loop, which updates ``first`` too)
        gone = {k: v for k, v in actx.missing.items() if k not in first.missing}
        for i, c in enumerate(ctxs):
            for k, v in new.items():
                if isinstance(v, np.ndarray) and v.shape == (n,):
                    x = v[i].item()
                elif isinstance(v, np.ndarray) and v.ndim == 0:
                    x = v.item()
                else:
                    x = v
                c.out[k] = x
            c.missing.update(gone)
            c.notes.update({k: t for k, v in actx.notes.items() if (t := _element(v, i, n))})
            reads[i].append(got)
        return True

    def _groups(self, module: Any, tree: _Node, ctxs: list[Ctx], varying: set[str],
                reads: list, groups: Any, np: Any) -> bool:
        """The module again over each group of points with equal keys (see :class:`SplitPoints`);
        a group of one point is a scalar call."""
        keys = np.asarray(groups).reshape(-1).tolist()
        if len(keys) != len(ctxs) or len(set(keys)) < 2:  # no split: not array-safe after all
            self.fallbacks += 1
            return False
        for key in dict.fromkeys(keys):
            at = [i for i, k in enumerate(keys) if k == key]
            sub, part = [ctxs[i] for i in at], [reads[i] for i in at]
            if len(sub) == 1 or not self._vector(module, tree, sub, varying, part, np):
                for ctx, r in zip(sub, part):
                    r.append(self._one(module, tree, ctx))
        return True

    # dependencies ---------------------------------------------------------------------------
    def module_deps(self) -> list[frozenset[str]]:
        """For each module, the toleranced inputs its results depend on, directly or through
        the quantities it read from earlier modules, over every corner run made so far."""
        if self._dep_runs == len(self._corners):
            return self._module_deps
        tol = set(self.tol)
        deps: list[frozenset[str]] = []
        for i in range(len(self.modules)):
            mine: set[str] = set()
            for run in self._corners.values():
                for kind, name in run.reads[i]:
                    if kind == "v":
                        if name in tol:
                            mine.add(name)
                    else:
                        j = self.owner.get(name)
                        if j is not None and j < i:
                            mine |= deps[j]
            deps.append(frozenset(mine))
        self._module_deps, self._dep_runs = deps, len(self._corners)
        return deps

    def deps(self, names: Iterable[str]) -> tuple[str, ...]:
        """The toleranced inputs that the sheet names ``names`` depend on, in design order."""
        md = self.module_deps()
        found: set[str] = set()
        for n in names:
            if n.startswith("design."):
                found.add(n[7:])
            elif n in self.owner:
                found |= md[self.owner[n]]
        return tuple(p for p in self.tol if p in found)


def _element(note: Any, i: int, n: int) -> str:
    """Point ``i``'s note from a vector call: a note is one text for every point, or a list of
    ``n`` texts, one per point (a note that quotes a number that differs between points)."""
    if isinstance(note, (list, tuple)) and len(note) == n:
        return note[i]
    return note


def _lookup(node: _Node, ctx: Ctx) -> tuple | None:
    while True:
        if node.result is not None:
            return node.result
        if node.read is None:
            return None
        kind, name = node.read
        try:
            seen = ctx.peek(kind, name)
        except KeyError:
            return None
        nxt = node.kids.get(_key(seen))
        if nxt is None:
            return None
        node = nxt


def _insert(node: _Node, reads: list[tuple[str, str, Any]], result: tuple) -> None:
    for kind, name, value in reads:
        if node.result is not None:
            return
        if node.read is None:
            node.read = (kind, name)
        elif node.read != (kind, name):  # a module that is not deterministic: never replayed
            return
        k = _key(value)
        nxt = node.kids.get(k)
        if nxt is None:
            nxt = node.kids[k] = _Node()
        node = nxt
    if node.read is None and not node.kids:
        node.result = result


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


def catalogue(modules: list[Any] | None = None) -> dict[str, Declared]:
    """Every quantity name the derive modules may publish."""
    out: dict[str, Declared] = {}
    for module in MODULES if modules is None else modules:
        for d in module.QUANTITIES:
            for n in d.names():
                assert _NAME.match(n), n
                assert n not in out, f"{n} declared twice"
                out[n] = d
    return out


def compute(design: Any, max_runs: int = 400, focus: set[str] | frozenset[str] | None = None,
            replay: bool = True, combined: bool = True, ends: bool = True,
            trees: list[Any] | None = None) -> Sheet:
    """Run every derive module over the design's tolerance corners and return the sheet.

    ``focus`` names the quantities whose extremes the sheet should show (those the rules judge);
    the combined-corner runs are made for these only. None: every published number. With
    ``replay``, a module whose reads in a run equal those of an earlier run is not run again.
    With ``combined`` False, the sheet has the typical and one-at-a-time runs only: for a caller
    that judges the rules next and then takes :func:`with_all_runs` (the rules' own corners give
    the extremes). The sheet's :attr:`Sheet.runner` makes the further corners each rule's own
    worst-case search needs (:mod:`reviewer.worstcase`). With ``ends`` False, the sheet has the
    typical run only (a caller that judges one rule next, whose own search makes the corners it
    needs: the pass-value check). ``trees``: replay trees shared between such calls (see
    :class:`Runner`).
    """
    runner = Runner(design, replay=replay, trees=trees)
    if not ends:
        return _sheet(runner, [runner.typical])
    return sheet_of(runner, max_runs=max_runs, focus=focus, combined=combined)


def with_all_runs(sheet: Sheet) -> Sheet:
    """The sheet again, its quantities' extremes taken over every run its runner has kept (the
    corners and inside points the rules were judged on, as well as the sheet's own)."""
    runner = sheet.runner
    if runner is None:
        return sheet
    runs = list(runner.corners.values()) + list(runner._inside.values())
    return _sheet(runner, runs)


def sheet_of(runner: Runner, max_runs: int = 400,
             focus: set[str] | frozenset[str] | None = None, combined: bool = True) -> Sheet:
    """The sheet of a runner: typical, one-at-a-time ends and per-quantity combined corners."""
    tol = runner.tol
    typ = runner.typical
    runs: list[Run] = [typ]
    for p in tol:
        for end in ("min", "max"):
            runs.append(runner.corner(((p, end),)))
    seen = {r.label for r in runs}
    numeric = [n for n, v in typ.out.items() if _is_number(v) and (focus is None or n in focus)
               and combined]
    for n in numeric:
        y0 = typ.out[n]
        for direction in (1, -1):
            assign: list[tuple[str, str]] = []
            for i, p in enumerate(tol):
                ylo = runs[1 + 2 * i].out.get(n)
                yhi = runs[2 + 2 * i].out.get(n)
                if not (_is_number(ylo) and _is_number(yhi)):
                    continue
                best = max((direction * (ylo - y0), "min"), (direction * (yhi - y0), "max"))
                if best[0] > 0:
                    assign.append((p, best[1]))
            key = tuple(sorted(assign))
            if key in seen or len(assign) < 2:
                continue  # a single-input corner was already run
            if len(runs) >= max_runs:
                break
            seen.add(key)
            runs.append(runner.corner(key))
    return _sheet(runner, runs)


def _sheet(runner: Runner, runs: list[Run]) -> Sheet:
    typ = runs[0]
    cat = runner.catalogue
    quantities: dict[str, Quantity] = {}
    for n, v in typ.out.items():
        d = cat[n]
        values = tuple(r.out.get(n) for r in runs)
        lo, hi = _extremes(values, v)
        quantities[n] = Quantity(n, d.unit, d.label, v, lo, hi, values, d.kind, "derived",
                                 typ.notes.get(n, ""))
    for path, value in runner.base.items():
        if value is None or isinstance(value, (list, dict)):
            continue
        name = f"design.{path}"
        values = tuple(r.values[path] for r in runs)
        lo, hi = _extremes(values, value)
        kind = "flag" if isinstance(value, bool) else ("number" if _is_number(value) else "text")
        quantities[name] = Quantity(name, runner.units.get(path, ""), path, value, lo, hi, values,
                                    kind, "design")
    missing = {n: Missing(n, needs) for n, needs in typ.missing.items() if n not in typ.out}
    for path, value in runner.base.items():
        if value is None:
            missing[f"design.{path}"] = Missing(f"design.{path}", (path,))
    return Sheet(quantities, missing, tuple(r.label for r in runs), typ.series, runner)


def _is_number(v: Any) -> bool:
    return isinstance(v, (int, float)) and not isinstance(v, bool)


def _extremes(runs: tuple[Any, ...], typ: Any) -> tuple[Any, Any]:
    nums = [r for r in runs if _is_number(r)]
    if not _is_number(typ) or not nums:
        return typ, typ
    return min(nums), max(nums)
