"""The worst case of each rule, searched on the rule's own margin.

For one rule (one subject), the toleranced design inputs that its value, its limit or its
``applies`` depend on are found from what the derive modules read (transitively through the
quantities they read from earlier modules: :meth:`reviewer.quantities.Runner.deps`). Then:

- with at most :data:`VERTEX_INPUTS` such inputs, every vertex of their tolerance box is run
  (each input at min or max, every other input typical: the rule cannot see the others), next to
  the typical run and the one-at-a-time ends; the worst margin over these is exact for a margin
  that is monotonic in each input, and never optimistic about the points it ran;
- with more, the one-at-a-time runs give the direction of the margin in each input; the
  combined corner (each input at the end that lowered the margin) is run, then a local search
  flips one input at a time from it and keeps every flip that lowers the margin, and
  :data:`SAMPLED_VERTICES` further vertices are drawn at random (seeded by the rule's key, so
  the same design always gives the same search).

Corners are kept by the runner, so rules with the same inputs share their runs. ``applies`` is
judged in every run: the rule applies where it applies at any of them.
"""

from __future__ import annotations

import itertools
import random
import zlib
from typing import Any, Generator

import numpy as np

from reviewer.margins import margins, rule_names
from reviewer.rulebook.loader import Compiled
from reviewer.spread import NO_INPUTS

VERTEX_INPUTS = 10
"""Every vertex is run for a rule with at most this many toleranced inputs (2**10 corners)."""
SAMPLED_VERTICES = 64
"""Random vertices added to the local search beyond :data:`VERTEX_INPUTS` inputs."""
ENDS = ("min", "max")


Want = tuple[list[Any], list[tuple[dict[str, str], dict[str, float]]]]
"""What one step of a search asks for: corners (as for :meth:`Runner.corners_at
<reviewer.quantities.Runner.corners_at>`) and inside points (as for :meth:`Runner.insides
<reviewer.quantities.Runner.insides>`)."""


def search_all(compiled: list[Compiled], runner: Any) -> list[tuple[list[Any], str]]:
    """:func:`runs_for` of every rule in ``compiled``, the searches run side by side: each
    step asks for the runs it needs, and the steps of all the rules are made in one
    :meth:`~reviewer.quantities.Runner.fetch` batch (the one-at-a-time ends and vertices of
    every rule, then every rule's probes inside its inputs, then the first probes of each
    input where the margin bends), so an array-evaluating derive module runs once per step for
    all of them. The local search of a rule with more than :data:`VERTEX_INPUTS` inputs and
    the Brent steps run within the rule's own step, one batch or run at a time. Rules share
    corners; every run is kept by the runner, so each rule gets the runs it would get alone."""
    searches = [_plan(c, runner) for c in compiled]
    done: list[tuple[list[Any], str] | None] = [None] * len(searches)
    asked: dict[int, Want] = {}
    for i, g in enumerate(searches):
        try:
            asked[i] = next(g)
        except StopIteration as stop:
            done[i] = stop.value
    while asked:
        corners, points = runner.fetch([a for w in asked.values() for a in w[0]],
                                       [x for w in asked.values() for x in w[1]])
        step: dict[int, Want] = {}
        i_c = i_p = 0
        for i, (cw, pw) in asked.items():
            answer = (corners[i_c:i_c + len(cw)], points[i_p:i_p + len(pw)])
            i_c, i_p = i_c + len(cw), i_p + len(pw)
            try:
                step[i] = searches[i].send(answer)
            except StopIteration as stop:
                done[i] = stop.value
        asked = step
    return [d for d in done if d is not None]


def runs_for(c: Compiled, runner: Any) -> tuple[list[Any], str]:
    """The runs rule ``c`` is judged on, and a sentence saying how they were chosen."""
    return search_all([c], runner)[0]


def _plan(c: Compiled, runner: Any) -> Generator[Want, tuple[list[Any], list[Any]],
                                                 tuple[list[Any], str]]:
    """The search of :func:`runs_for`, as steps: yields what it wants made, is sent those runs,
    returns the runs and the sentence."""
    if c.rule.kind == "question":
        return [runner.typical], NO_INPUTS
    deps = runner.deps(rule_names(c))
    typ = runner.typical
    k = len(deps)
    if k == 0:
        return [typ], NO_INPUTS
    ends = [((p, e),) for p in deps for e in ENDS]
    if k <= VERTEX_INPUTS:
        vertices = [tuple(zip(deps, combo)) for combo in itertools.product(ENDS, repeat=k)]
        got, _ = yield ends + vertices, []  # the ends and every vertex
        runs = [typ, *got]
        method = (f"worst of every vertex of the {k} toleranced input{'s' if k > 1 else ''}"
                  f" it depends on ({2 ** k} corners)")
    else:
        got, _ = yield ends, []
        runs, method = _search(c, runner, deps, [typ, *got])
    return (yield from _interior(c, runner, deps, runs, method))


def _interior(c: Compiled, runner: Any, deps: tuple[str, ...], runs: list[Any], method: str
              ) -> Generator[Want, tuple[list[Any], list[Any]], tuple[list[Any], str]]:
    """Where the margin is smallest inside an input's tolerance rather than at an end, search
    that input by Brent's minimisation with the others at the worst corner found: a margin that is
    not monotonic in an input (a ripple current that peaks at a middle modulation index, say)
    is then not missed. Every input is probed, the others typical: at :data:`LEVELS` where the
    typical run lies below the chord between its two one-at-a-time ends (the sign of a margin
    that bends down between them), else at :data:`EDGE_LEVELS`, just inside each end (a margin
    that dips there, distortion where pulses start to be dropped near the top of the index
    range, shows no bend at typical; the chord test alone missed it). The yield self-check
    covers what the probes miss. Steps as in :func:`_plan`."""
    score = margins(c, runs).score
    worst = runs[int(np.argmin(score))]
    corner = dict(worst.label) if all(e in ENDS for _, e in worst.label) else {}
    typical = float(score[0])
    probed: list[tuple[str, tuple[float, ...]]] = []
    for i, p in enumerate(deps):
        s = runner.spans[p]
        lo, hi = float(score[1 + 2 * i]), float(score[2 + 2 * i])
        if not np.isfinite(typical) or not np.isfinite([lo, hi]).any() or s.hi <= s.lo:
            continue  # not applicable or not computable at typical or either end
        levels = LEVELS
        if np.isfinite([lo, hi]).all():
            chord = lo + (s.typ - s.lo) / (s.hi - s.lo) * (hi - lo)
            if typical >= chord - _tiny(np.array([lo, hi, typical])):
                levels = EDGE_LEVELS  # no bend shows at typical: just inside each end only
        # (one end not applicable or not computable, a thermal runaway say: the margin may
        # fall all the way to that edge, so the whole inside is probed)
        probed.append((p, levels))
    if not probed:
        return runs, method
    # every input's probes and ends in one step
    ends, probes = yield ([((p, e),) for p, _ in probed for e in ENDS],
                          [({}, {p: _level(runner, p, t)}) for p, levels in probed
                           for t in levels])
    bent: list[str] = []
    scores = margins(c, [*probes, *ends]).score  # one run's margin is its own: one call for all
    start, outer_at = 0, len(probes)
    for k, (p, levels) in enumerate(probed):
        inner = scores[start:start + len(levels)]
        start += len(levels)
        outer = scores[outer_at + k * len(ENDS):outer_at + (k + 1) * len(ENDS)]
        inner, outer = inner[inner < np.inf], outer[outer < np.inf]  # where it applies
        if inner.size and outer.size and inner.min() < outer.min() - _tiny(outer):
            bent.append(p)
    if not bent:
        return runs, method
    fixed = {p: e for p, e in corner.items() if p not in bent}
    at: dict[str, float] = {}
    for p in bent:
        def f(t: float) -> float:
            run = runner.inside(fixed, {**at, p: _level(runner, p, t)})
            runs.append(run)
            return float(margins(c, [run]).score[0])

        _, first = yield [], [(fixed, {**at, p: _level(runner, p, t)}) for t in LEVELS]
        # the probes in one step (with the other rules' probes), then the minimisation one run
        # at a time (side by side with the other rules', its runs were measured slower: their
        # points differ in every input, and array calls split)
        runs.extend(first)
        t = _minimise(f, [float(x) for x in margins(c, first).score])
        at[p] = _level(runner, p, t)
    return runs, method + (f", and inside the tolerance of {', '.join(bent)} where the margin "
                           "is smallest away from its ends (Brent's minimisation)")


def _level(runner: Any, p: str, t: float) -> float:
    """Input ``p`` at the fraction ``t`` of its tolerance from min to max."""
    s = runner.spans[p]
    return s.lo + t * (s.hi - s.lo)


EDGE_LEVELS = (0.02, 0.98)
"""The probes of an input whose typical run shows no bend: just inside each end."""
LEVELS = (0.02, 0.25, 0.5, 0.75, 0.98)
"""Interior probes of each input, as fractions of its tolerance from min to max (the first and
last show a margin that falls on leaving an end: a minimum just inside it)."""


def _tiny(x: np.ndarray) -> float:
    finite = x[np.isfinite(x)]
    return 1e-9 * (float(np.max(np.abs(finite))) if finite.size else 1.0)


def _minimise(f: Any, probes: list[float], tol: float = 5e-4, most: int = 16) -> float:
    """Minimise ``f`` on [0, 1] near the best of its values at :data:`LEVELS` (``probes``).

    Brent's method (R. P. Brent, *Algorithms for Minimization without Derivatives*, 1973,
    ch. 5, procedure *localmin*): parabolic steps through the best three points where they
    behave, golden-section steps where they do not, in the bracket of the best probe's two
    neighbours, to ``tol`` in ``t`` or ``most`` evaluations. A smooth margin takes a few
    evaluations where golden section alone takes a dozen; a kinked or stepped one still
    shrinks by golden section. The result is never worse than the best probe.
    """
    i = int(np.argmin(probes))
    a, b = (LEVELS[i - 1] if i > 0 else 0.0), (LEVELS[i + 1] if i + 1 < len(LEVELS) else 1.0)
    x, fx = LEVELS[i], float(probes[i])
    # the neighbouring probes are the second and third best points of the first parabola
    near = sorted((float(probes[j]), LEVELS[j]) for j in (i - 1, i + 1) if 0 <= j < len(LEVELS))
    (fw, w), (fv, v) = (near + [(fx, x)] * 2)[:2]
    golden = (3 - 5 ** 0.5) / 2
    d, e = 0.0, b - a  # a parabola through the three probes may be the first step
    for _ in range(most):
        m = 0.5 * (a + b)
        if abs(x - m) <= 2 * tol - 0.5 * (b - a):
            break
        parabolic = False
        if abs(e) > tol:
            r = (x - w) * (fx - fv)
            q = (x - v) * (fx - fw)
            p = (x - v) * q - (x - w) * r
            q = 2 * (q - r)
            if q > 0:
                p = -p
            q = abs(q)
            if abs(p) < abs(0.5 * q * e) and q * (a - x) < p < q * (b - x):
                e, d = d, p / q
                parabolic = True
                if (x + d) - a < 2 * tol or b - (x + d) < 2 * tol:
                    d = tol if x < m else -tol
        if not parabolic:
            e = (b - x) if x < m else (a - x)
            d = golden * e
        u = x + (d if abs(d) >= tol else (tol if d > 0 else -tol))
        fu = f(u)
        if fu <= fx:
            if u < x:
                b = x
            else:
                a = x
            v, fv, w, fw, x, fx = w, fw, x, fx, u, fu
        else:
            if u < x:
                a = u
            else:
                b = u
            if fu <= fw or w == x:
                v, fv, w, fw = w, fw, u, fu
            elif fu <= fv or v == x or v == w:
                v, fv = u, fu
    return x


def _search(c: Compiled, runner: Any, deps: tuple[str, ...], runs: list[Any]) -> tuple[list, str]:
    score = margins(c, runs).score
    assign: dict[str, str] = {}
    for i, p in enumerate(deps):
        lo, hi = score[1 + 2 * i], score[2 + 2 * i]
        assign[p] = "max" if hi < lo else "min"

    def scores(trials: list[dict[str, str]], keep: bool = True) -> tuple[list[Any], list[float]]:
        got = runner.corners_at(t.items() for t in trials)  # one batch
        if keep:
            runs.extend(got)
        return got, [float(x) for x in margins(c, got).score]

    best = scores([assign])[1][0]
    for _ in range(3):  # passes of the local search
        better = False
        # every single flip of the current corner in one batch; after a flip that lowers the
        # margin is kept, the flips after it are made again from the new corner (the same
        # first-improvement search as one flip at a time)
        start = 0
        while start < len(deps):
            trials = []
            for p in deps[start:]:
                trial = dict(assign)
                trial[p] = "min" if assign[p] == "max" else "max"
                trials.append(trial)
            made, got = scores(trials, keep=False)
            start_again = None
            for j, (trial, sc) in enumerate(zip(trials, got)):
                if sc < best:
                    best, assign, better = sc, trial, True
                    start_again = start + j + 1
                    break
            # judged on the flips a one-at-a-time search makes: up to the one kept
            runs.extend(made if start_again is None else made[:j + 1])
            if start_again is None:
                break
            start = start_again
        if not better:
            break
    rng = random.Random(zlib.crc32(f"{c.rule.id}[{c.subject}]".encode()))
    scores([{p: rng.choice(ENDS) for p in deps} for _ in range(SAMPLED_VERTICES)])
    return runs, (f"{len(deps)} toleranced inputs: combined corner from the one-at-a-time "
                  f"directions, local search by single flips, and {SAMPLED_VERTICES} random "
                  "vertices")
