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
from itertools import islice
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


class Lazy:
    """A run's label made only when it is asked for (rendering values as text costs more than
    many runs; most inside and sample runs are never shown)."""

    __slots__ = ("make",)

    def __init__(self, make: Any):
        self.make = make


def _get_label(run: Run) -> Assign:
    x = run.__dict__["_label"]
    if isinstance(x, Lazy):
        x = run.__dict__["_label"] = tuple(x.make())
    return x


def _set_label(run: Run, value: Any) -> None:
    run.__dict__["_label"] = value


Run.label = property(_get_label, _set_label,  # type: ignore[assignment]
                     doc="The corner, or for an inside run or a sample, each value as text.")


def point_label(at: dict[str, float], units: dict[str, str],
                corner: dict[str, str] | None = None) -> Lazy:
    """The label of a run at values ``at`` (and inputs of ``corner`` at their ends), made when
    first asked for: ((path, "min"|"max"|"<value>"), ...), sorted when ``corner`` is given."""
    def make() -> Assign:
        from reviewer.units import render

        shown = [(p, render(x, units.get(p, ""), prec=4)) for p, x in at.items()]
        if corner is None:
            return tuple(shown)
        return tuple(sorted([*corner.items(), *shown]))

    return Lazy(make)


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


_PLAIN = (str, int, bool, type(None))


def _key(x: Any) -> Any:
    t = type(x)
    if t is float:
        return ("~nan",) if x != x else x
    if t in _PLAIN:
        return x
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

    @property
    def shared_trees(self) -> list[Any] | None:
        """The replay trees, when every read is keyed in them (a runner made with ``trees``):
        a runner of a design that differs in a field or two may then share them (the
        pass-value check, a what-if review); None otherwise."""
        return self._trees if self._shared else None

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
        return self.insides([(corner, at)])[0]

    def insides(self, wanted: list[tuple[dict[str, str], dict[str, float]]]) -> list[Run]:
        """Many kept inside runs (see :meth:`inside`), those not made yet made in one
        :meth:`batch` call."""
        return self.fetch((), wanted)[1]

    def corners_at(self, assigns: Iterable[Iterable[tuple[str, str]]]) -> list[Run]:
        """The kept corner runs of many corners (see :meth:`corner`), in the order asked; those
        not made yet are made in one :meth:`batch` call (an array-evaluating derive module runs
        once for all of them; the other modules share replay as in single runs)."""
        return self.fetch(assigns, ())[0]

    def fetch(self, assigns: Iterable[Iterable[tuple[str, str]]],
              wanted: Iterable[tuple[dict[str, str], dict[str, float]]]
              ) -> tuple[list[Run], list[Run]]:
        """Kept corner runs (as :meth:`corners_at`) and kept inside runs (as :meth:`insides`),
        in the order asked; every one not made yet is made in one :meth:`batch` call."""
        keys = [tuple(sorted(a)) for a in assigns]
        todo: dict[Assign, dict[str, Any]] = {}
        for key in keys:
            if key in self._corners or key in todo:
                continue
            if not key:  # the typical run is made first, in __init__: never here
                continue
            todo[key] = {p: self.end(p, e) for p, e in key}
        wanted = list(wanted)
        inside_keys = [(tuple(sorted(corner.items())), tuple(sorted(at.items())))
                       for corner, at in wanted]
        todo_in: dict[tuple, tuple[dict[str, Any], Lazy]] = {}
        for key, (corner, at) in zip(inside_keys, wanted):
            if key in self._inside or key in todo_in:
                continue
            values: dict[str, Any] = {}
            for p, e in corner.items():
                values[p] = self.end(p, e)
            values.update(at)
            todo_in[key] = (values, point_label(dict(at), self.units, dict(corner)))
        if len(todo) + len(todo_in) == 1 and todo:
            (key,) = todo
            self.corner(key)
        elif todo or todo_in:
            made = self.batch([*todo.values(), *(v for v, _ in todo_in.values())],
                              [*todo, *(lb for _, lb in todo_in.values())])
            self._corners.update(zip(todo, made))
            self._inside.update(zip(todo_in, made[len(todo):]))
        return [self._corners[k] for k in keys], [self._inside[k] for k in inside_keys]

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

    def batch(self, points: list[dict[str, float]], labels: list[Any] | None = None,
              learn: bool = True) -> list[Run]:
        """Runs at many points at once (samples, say): not kept.

        A derive module that sets ``VECTOR = True`` is called once for all points, reading
        numpy arrays (one element per point) for inputs that differ between points and the
        scalars of the others; every other module, and an opted-in module that raises on arrays
        (a plain ``if`` on a value, say), runs once per point as in :meth:`point`. The results
        are the same either way (tested to 1e-12). With ``learn`` False, what the scalar runs
        compute is not added to the replay trees (samples: points that never come again, whose
        entries would only fill memory); they still replay what is there."""
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
        # the columns of what earlier modules published, per set of points, made once: a name is
        # published by one module only and never changes after it ran (see _vector)
        columns: dict[tuple[int, ...], dict[str, Any]] = {}
        for module, tree in zip(self.modules, self._trees):
            rest: Iterable[int] = range(n)
            if getattr(module, "VECTOR", False) and n > 1:
                rest = self._vector_groups(module, ctxs, list(range(n)), varying, reads, np,
                                           columns)
            for i in rest:
                reads[i].append(self._one(module, tree, ctxs[i], learn))
        self.made += n
        return [Run(labels[i], c._values, c.out, c.missing, c.notes, tuple(reads[i]), c.series)
                for i, c in enumerate(ctxs)]

    def _one(self, module: Any, tree: _Node, ctx: Ctx,
             learn: bool = True) -> frozenset[tuple[str, str]]:
        """Run (or replay) one module in one scalar context; what it read. With ``learn``
        False, a module that runs is not added to the replay tree."""
        hit = _lookup(tree, ctx) if self.replay else None
        if hit is None:
            ctx.reads = []
            n_out, n_missing, n_notes = len(ctx.out), len(ctx.missing), len(ctx.notes)
            module.derive(ctx)
            # what the module added (dicts keep insertion order; a key it published again
            # keeps its old place, and is not its own, as before)
            hit = (dict(islice(ctx.out.items(), n_out, None)),
                   dict(islice(ctx.missing.items(), n_missing, None)),
                   dict(islice(ctx.notes.items(), n_notes, None)),
                   frozenset((kind, name) for kind, name, _ in ctx.reads))
            if self.replay and learn:
                # a design field that is not toleranced has the same value in every run of
                # this runner: only the reads that can differ go into the replay tree
                # nor do reads of what the module published itself (it computes them again);
                # a read made again is the same read (the values a module sees do not change
                # while it runs): keyed once
                own = hit[0].keys() | hit[1].keys()
                seen: set[tuple[str, str]] = set()
                keyed = []
                for r in ctx.reads:
                    kn = (r[0], r[1])
                    if kn in seen:
                        continue
                    seen.add(kn)
                    if ((self._shared or r[1] in self._varies) if r[0] == "v"
                            else r[1] not in own):
                        keyed.append(r)
                _insert(tree, keyed, hit)
            self.read_fields.update(name for kind, name in hit[3] if kind == "v")
        else:
            ctx.out.update(hit[0])
            ctx.missing.update(hit[1])
            ctx.notes.update(hit[2])
        return hit[3]

    def _vector_groups(self, module: Any, ctxs: list[Ctx], idx: list[int], varying: set[str],
                       reads: list, np: Any, columns: dict[tuple[int, ...], dict[str, Any]]
                       ) -> list[int]:
        """Array calls of an opted-in module over the contexts ``idx``: one call where they agree
        on what earlier modules published (numbers and flags may differ: arrays), else one call
        per group of contexts that agree; the indices left to run one by one. ``columns`` keeps
        the columns of earlier modules' results per set of points (see :meth:`_vector`)."""
        got = self._vector(module, [ctxs[i] for i in idx], varying, reads, idx, np,
                           columns.setdefault(tuple(idx), {}))
        if isinstance(got, tuple):  # SplitPoints: one call per group of equal keys
            keys = np.asarray(got[1]).reshape(-1).tolist()
            if len(keys) != len(idx) or len(set(keys)) < 2:  # no split: not array-safe here
                self.fallbacks += 1
                return idx
            by_key: dict[Any, list[int]] = {}
            for i, k in zip(idx, keys):
                by_key.setdefault(k, []).append(i)
            left: list[int] = []
            for members in by_key.values():
                left.extend(members if len(members) == 1 else
                            self._vector_groups(module, ctxs, members, varying, reads, np,
                                                columns))
            return sorted(left)
        if got == "done":
            return []
        if got == "fails" or len(idx) < 2:
            return idx
        groups: dict[Any, list[int]] = {}
        for i in idx:  # split by what differs: which names, missing, texts (and flags)
            c = ctxs[i]
            groups.setdefault(_signature(c, flags=got == "flags"), []).append(i)
        if len(groups) == 1:  # nothing to split on: the module is not array-safe here
            return idx
        rest: list[int] = []
        for members in groups.values():
            if len(members) == 1:
                rest.extend(members)
            else:
                rest.extend(self._vector_groups(module, ctxs, members, varying, reads, np,
                                                columns))
        return sorted(rest)

    def _vector(self, module: Any, ctxs: list[Ctx], varying: set[str], reads: list,
                idx: list[int], np: Any, columns: dict[str, Any] | None = None
                ) -> str | tuple[str, Any]:
        """One call of an opted-in module over every context: "done"; "split" where the
        contexts differ in what earlier modules published (call per group), "flags" where the
        module raised on flags that differ (call per group of equal flags), "fails" where it
        raised otherwise (not array-safe: every point one by one); ("groups", keys) where the
        module raised :class:`reviewer.context.SplitPoints` (one call per group of equal keys)."""
        n = len(ctxs)
        values = dict(ctxs[0]._values)
        for p in varying:
            col = [c._values[p] for c in ctxs]
            if any(x != col[0] for x in col):
                values[p] = np.array(col, dtype=float)
        first = ctxs[0]
        out: dict[str, Any] = {}
        flags = False
        # a name is published by one module only, and its value at a point never changes once
        # that module ran: the column made for an earlier module's call over the same points
        # holds for this one
        made = {} if columns is None else columns
        for name in first.out:
            entry = made.get(name)
            if entry is None:
                entry = made[name] = _column(name, ctxs, np)
            if entry is _SPLIT:
                return "split"
            kind, value = entry
            out[name] = value
            flags = flags or kind == "flags"
        if any(len(c.out) != len(first.out) or c.missing != first.missing for c in ctxs):
            return "split"
        actx = Ctx(self.design, values, self.catalogue, typical=False)
        actx.out = dict(out)
        actx.missing = dict(first.missing)
        before = set(actx.out)
        try:
            with np.errstate(all="ignore"):
                module.derive(actx)
        except SplitPoints as e:  # the module's points take different paths: by its keys
            return ("groups", e.groups)
        except (TypeError, ValueError):  # code that is not array-safe: per-element fallback
            if flags:
                return "flags"
            self.fallbacks += 1
            return "fails"
        self.vector_calls += 1
        new = {k: v for k, v in actx.out.items() if k not in before}
        got = frozenset((kind, name) for kind, name, _ in actx.reads)
        self.read_fields.update(name for kind, name in got if kind == "v")
        missing = {k: v for k, v in actx.missing.items() if k not in first.missing}
        # each result as plain Python values: one per point, or one for all
        per_point: dict[str, list[Any]] = {}
        shared: dict[str, Any] = {}
        for k, v in new.items():
            if isinstance(v, np.ndarray) and v.shape == (n,):
                per_point[k] = v.tolist()
            else:
                shared[k] = v.item() if isinstance(v, np.ndarray) and v.ndim == 0 else v
        for i, c in enumerate(ctxs):
            for k, v in new.items():
                c.out[k] = per_point[k][i] if k in per_point else shared[k]
            c.missing.update(missing)
            c.notes.update({k: t for k, v in actx.notes.items() if (t := _element(v, i, n))})
            reads[idx[i]].append(got)
        return "done"

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


_SPLIT = ("split", None)


def _column(name: str, ctxs: list[Ctx], np: Any) -> tuple[str, Any]:
    """What an array call reads for ``name`` over ``ctxs``: ("same", the one value), ("flags",
    a bool array), ("numbers", a float array), or :data:`_SPLIT` where some point lacks it or
    the values are texts (or tables) that differ."""
    col = [c.out.get(name, _GONE) for c in ctxs]
    first = col[0]
    if type(first) is float and set(map(type, col)) == {float}:  # the common case, in C loops
        a = np.array(col, dtype=float)
        if (a == first).all():
            return ("same", first)
        a.setflags(write=False)
        return ("numbers", a)
    if any(x is _GONE for x in col):
        return _SPLIT
    if all(_same_value(x, col[0]) for x in col):
        return ("same", col[0])
    if all(isinstance(x, bool) for x in col):
        a = np.array(col, dtype=bool)
    elif all(_is_number(x) for x in col):
        a = np.array(col, dtype=float)
    else:
        return _SPLIT
    a.setflags(write=False)  # shared by the calls of later modules: none may change it in place
    return ("flags" if a.dtype == bool else "numbers", a)


def _signature(c: Ctx, flags: bool) -> tuple:
    """What a context's earlier modules published, as far as an array call must agree on it:
    the names, what is missing, and every value that is not a number (nor, unless ``flags``,
    a flag)."""
    keep = [(k, _key(v)) for k, v in c.out.items()
            if not _is_number(v) and (flags or not isinstance(v, bool))]
    return (tuple(sorted(c.out)), tuple(sorted((k, tuple(v)) for k, v in c.missing.items())),
            tuple(sorted(keep, key=lambda kv: kv[0])))


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
            tag = _tag_of(type(model), name, info, UnitTag)
            if isinstance(value, BaseModel):
                walk(value, type(value), path + ".")
                continue
            if value is None:
                sub = _submodel(type(model), name, info.annotation)
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


_TAGS: dict[tuple[type, str], Any] = {}


def _tag_of(cls: type, name: str, info: Any, unit_tag: type) -> Any:
    """The unit tag of field ``name`` of model ``cls`` (found once per model class)."""
    key = (cls, name)
    try:
        return _TAGS[key]
    except KeyError:
        pass
    tag = next((m for m in info.metadata if isinstance(m, unit_tag)), None)
    if tag is None:
        tag = _unit_in_annotation(info.annotation)
    _TAGS[key] = tag
    return tag


def _none_fields(cls: Any, prefix: str, values: dict[str, Any], units: dict[str, str]) -> None:
    """An absent optional table: its fields exist as None so that derive code can ask for them."""
    from reviewer.design.fields import UnitTag

    for name, info in cls.model_fields.items():
        sub = _submodel(cls, name, info.annotation)
        if sub is not None:
            _none_fields(sub, f"{prefix}{name}.", values, units)
        else:
            values[f"{prefix}{name}"] = None
            tag = _tag_of(cls, name, info, UnitTag)
            if tag is not None:
                units[f"{prefix}{name}"] = tag.unit


_SUBMODELS: dict[tuple[type, str], Any] = {}


def _submodel(cls: type, name: str, annotation: Any) -> Any:
    """The table model of field ``name`` of model ``cls`` (None for a value), found once per
    model class: every runner of every trial design walks the same classes."""
    key = (cls, name)
    try:
        return _SUBMODELS[key]
    except KeyError:
        from reviewer.design.loader import _model_of

        got = _SUBMODELS[key] = _model_of(annotation)
        return got


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
            trees: list[Any] | None = None, modules: list[Any] | None = None) -> Sheet:
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
    :class:`Runner`). ``modules``: the derive modules to run, in order (default all; a caller
    that judges one rule may leave out the modules after the last one it reads).
    """
    runner = Runner(design, replay=replay, trees=trees, modules=modules)
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
    several = len(runs) > 1
    cat = runner.catalogue
    quantities: dict[str, Quantity] = {}
    for n, v in typ.out.items():
        d = cat[n]
        values = tuple(r.out.get(n) for r in runs) if several else (v,)
        lo, hi = _extremes(values, v) if several else (v, v)
        quantities[n] = Quantity(n, d.unit, d.label, v, lo, hi, values, d.kind, "derived",
                                 typ.notes.get(n, ""))
    for path, value in runner.base.items():
        if value is None or isinstance(value, (list, dict)):
            continue
        name = f"design.{path}"
        values = tuple(r.values[path] for r in runs) if several else (value,)
        lo, hi = _extremes(values, value) if several else (value, value)
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
