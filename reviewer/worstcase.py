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
from typing import Any

from reviewer.margins import margins, rule_names
from reviewer.rulebook.loader import Compiled
from reviewer.spread import NO_INPUTS

VERTEX_INPUTS = 10
"""Every vertex is run for a rule with at most this many toleranced inputs (2**10 corners)."""
SAMPLED_VERTICES = 64
"""Random vertices added to the local search beyond :data:`VERTEX_INPUTS` inputs."""
ENDS = ("min", "max")


def runs_for(c: Compiled, runner: Any) -> tuple[list[Any], str]:
    """The runs rule ``c`` is judged on, and a sentence saying how they were chosen."""
    deps = runner.deps(rule_names(c))
    typ = runner.typical
    runs = [typ]
    for p in deps:
        runs.extend(runner.corner(((p, e),)) for e in ENDS)
    k = len(deps)
    if k == 0:
        return runs, NO_INPUTS
    if k <= VERTEX_INPUTS:
        for ends in itertools.product(ENDS, repeat=k):
            runs.append(runner.corner(zip(deps, ends)))
        return runs, (f"worst of every vertex of the {k} toleranced input{'s' if k > 1 else ''}"
                      f" it depends on ({2 ** k} corners)")
    return _search(c, runner, deps, runs)


def _search(c: Compiled, runner: Any, deps: tuple[str, ...], runs: list[Any]) -> tuple[list, str]:
    score = margins(c, runs).score
    assign: dict[str, str] = {}
    for i, p in enumerate(deps):
        lo, hi = score[1 + 2 * i], score[2 + 2 * i]
        assign[p] = "max" if hi < lo else "min"

    def value(a: dict[str, str]) -> tuple[float, Any]:
        run = runner.corner(a.items())
        runs.append(run)
        return float(margins(c, [run]).score[0]), run

    best, _ = value(assign)
    for _ in range(3):  # passes of the local search
        better = False
        for p in deps:
            trial = dict(assign)
            trial[p] = "min" if assign[p] == "max" else "max"
            s, _ = value(trial)
            if s < best:
                best, assign, better = s, trial, True
        if not better:
            break
    rng = random.Random(zlib.crc32(f"{c.rule.id}[{c.subject}]".encode()))
    for _ in range(SAMPLED_VERTICES):
        value({p: rng.choice(ENDS) for p in deps})
    return runs, (f"{len(deps)} toleranced inputs: combined corner from the one-at-a-time "
                  f"directions, local search by single flips, and {SAMPLED_VERTICES} random "
                  "vertices")
