"""Yield per check: Monte Carlo samples of the toleranced inputs, judged by every rule.

Each sample sets every toleranced input of the design at once: uniform between its min and max,
or, where the design gives a sigma, normal about the typical value with that sigma, cut off at
min and max (redrawn until inside, so that no sample leaves the tolerance box the worst case was
searched in). The generator is numpy's PCG64 seeded with ``seed`` (default :data:`DEFAULT_SEED`),
so the same design and seed give the same samples and the same report, byte for byte.

Per finding: the yield (samples that pass over samples in which the rule applies and its margin
can be computed), its Wilson score interval at 95 % confidence, and the margin's minimum, 1st
percentile and median. A self-check compares the worst sample with the corner search's worst
case: a sample worse than it (beyond floating-point slack) becomes the finding's worst case, and
the finding says that the corner search missed it.

References
----------
E. B. Wilson, "Probable inference, the law of succession, and statistical inference", Journal of
the American Statistical Association 22 (1927) 209-212 (the score interval).
"""

from __future__ import annotations

import dataclasses
import math
from typing import Any, Callable

import numpy as np

from reviewer.margins import SLACK, margins
from reviewer.spread import Spread

DEFAULT_SEED = 12
Z95 = 1.959963984540054
"""The two-sided 95 % point of the standard normal distribution, Φ⁻¹(0.975)."""
DISTRIBUTION = "each input uniform in its tolerance, or normal where a sigma is given"


def wilson(passed: int, n: int, z: float = Z95) -> tuple[float, float]:
    """The Wilson score interval of a binomial proportion.

    Parameters
    ----------
    passed : int
        Successes [count].
    n : int
        Trials [count], above zero.
    z : float
        Standard normal quantile of the confidence level [unitless] (1.96 for 95 %).

    Returns
    -------
    (float, float)
        Lower and upper bound of the proportion [unitless].

    References
    ----------
    Wilson (1927), see the module docstring.
    """
    p = passed / n
    denom = 1 + z * z / n
    centre = (p + z * z / (2 * n)) / denom
    half = z * math.sqrt(p * (1 - p) / n + z * z / (4 * n * n)) / denom
    lo = 0.0 if passed == 0 else max(0.0, centre - half)
    hi = 1.0 if passed == n else min(1.0, centre + half)
    return lo, hi


def draw(spans: dict[str, Any], paths: tuple[str, ...], n: int,
         seed: int = DEFAULT_SEED) -> dict[str, np.ndarray]:
    """``n`` values of every input in ``paths``, in the order given (see the module docstring)."""
    rng = np.random.default_rng(seed)
    out: dict[str, np.ndarray] = {}
    for p in paths:
        s = spans[p]
        if s.sigma is None:
            out[p] = rng.uniform(s.lo, s.hi, n)
            continue
        x = rng.normal(s.typ, s.sigma, n)
        bad = (x < s.lo) | (x > s.hi)
        while bad.any():
            x[bad] = rng.normal(s.typ, s.sigma, int(bad.sum()))
            bad = (x < s.lo) | (x > s.hi)
        out[p] = x
    return out


def sample_runs(runner: Any, n: int, seed: int = DEFAULT_SEED,
                step: Callable[[], None] | None = None, chunk: int = 64) -> list[Any]:
    """``n`` runs of the derive step at sampled inputs, made in batches of ``chunk`` (see
    :meth:`reviewer.quantities.Runner.batch`); ``step`` is called once per sample."""
    from reviewer.quantities import point_label

    values = draw(runner.spans, runner.tol, n, seed)
    runs: list[Any] = []
    for start in range(0, n, chunk):
        points, labels = [], []
        for i in range(start, min(n, start + chunk)):
            at = {p: float(v[i]) for p, v in values.items()}
            points.append(at)
            labels.append(point_label(at, runner.units))
        runs.extend(runner.batch(points, labels, learn=False))  # samples never come again
        if step is not None:
            for _ in points:
                step()
    return runs


def with_yield(review: Any, book: Any, n: int, seed: int = DEFAULT_SEED,
               step: Callable[[], None] | None = None) -> Any:
    """The review with every limit and flag finding judged over ``n`` samples as well."""
    from reviewer.engine import finding_at

    sheet = review.sheet
    if sheet.runner is None or n <= 0:
        return review
    runs = sample_runs(sheet.runner, n, seed, step)
    by_key = {(c.rule.id, c.subject): c for c in book.compiled}
    findings = []
    for f in review.findings:
        c = by_key.get((f.rule_id, f.subject))
        if c is None or c.rule.kind == "question" or f.outcome not in ("pass", "fail"):
            findings.append(f)
            continue
        m = margins(c, runs)
        judged = m.applies & m.ok
        k = int(judged.sum())
        fails = np.array([m.failed(i) for i in np.flatnonzero(judged)], dtype=bool)
        passed = int(k - fails.sum())
        lo = hi = frac = None
        if k:
            frac = passed / k
            lo, hi = wilson(passed, k)
        ms = m.margin[judged] if c.value is not None else np.array([])
        stats = (float(ms.min()), float(np.percentile(ms, 1)), float(np.median(ms))) \
            if ms.size else (None, None, None)
        missed = False
        if k:
            worst = int(np.flatnonzero(judged)[int(np.argmin(m.margin[judged]))])
            if f.margin is not None and m.value is not None:
                slack = SLACK * max(abs(float(m.limit[worst])), 1e-30) + 1e-12 * abs(f.margin)
                missed = float(m.margin[worst]) < f.margin - slack
            elif f.outcome == "pass" and m.failed(worst):
                missed = True
        spread = Spread(n, seed, DISTRIBUTION, passed, k, frac, lo, hi, *stats, missed=missed)
        if missed:
            typ = sheet.runner.typical
            pair = [typ, runs[worst]]
            g = finding_at(c, sheet, pair, margins(c, pair), f.search + "; the corner search "
                           "missed a worse sample, reported here as the worst case")
            f = dataclasses.replace(g, sensitivity=f.sensitivity,
                                    sensitivity_method=f.sensitivity_method)
        findings.append(dataclasses.replace(f, spread=spread))
    return dataclasses.replace(review, findings=tuple(findings))
