"""Which toleranced input drives a margin most: one-at-a-time swings from the corner runs.

For each toleranced input a rule depends on, the swing is half the change of the rule's margin
between the runs with that input at its max and at its min (every other input typical); its
share is swing² over the sum of the swings² (a first-order variance split, as in a tolerance
stack-up by root sum of squares). Inputs are ranked by share. Shown for failing findings and for
passing ones within :data:`NEAR` of their limit.

References
----------
Root-sum-square tolerance analysis: common practice in mechanical and electrical tolerance
stack-ups (e.g. the "RSS" method of statistical tolerancing).
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from reviewer.margins import margins, rule_names
from reviewer.spread import Swing
from reviewer.units import render

NEAR = 0.1
"""A passing finding whose margin is within 10 % of its limit counts as near the limit."""
METHOD = ("one-at-a-time swings: each input from its min to its max with the others typical; "
          "share of the sum of squared swings")


def wanted(f: Any) -> bool:
    """Whether a finding gets a sensitivity ranking (failing, or passing near its limit)."""
    if f.outcome == "fail":
        return True
    rel = f.relative_margin
    return f.outcome == "pass" and rel is not None and rel < NEAR


def tolerance_text(span: Any, unit: str) -> str:
    """A tolerance for a reader: "±20 %" when symmetric about typical, else "2 V to 4 V"."""
    if span.typ and math.isclose(span.hi - span.typ, span.typ - span.lo, rel_tol=1e-9):
        pct = (span.hi - span.typ) / abs(span.typ) * 100
        return f"±{pct:.3g} %"
    return f"{render(span.lo, unit)} to {render(span.hi, unit)}"


def swings(c: Any, runner: Any) -> tuple[Swing, ...]:
    """The inputs of rule ``c`` ranked by their share of its margin's spread (largest first)."""
    deps = runner.deps(rule_names(c))
    if not deps:
        return ()
    runs = [runner.corner(((p, e),)) for p in deps for e in ("min", "max")]
    m = margins(c, runs)
    if m.value is None:
        return ()
    raw = []
    for i, p in enumerate(deps):
        lo, hi = m.margin[2 * i], m.margin[2 * i + 1]
        if not (m.ok[2 * i] and m.ok[2 * i + 1]) or not np.isfinite(lo) or not np.isfinite(hi):
            continue
        raw.append((p, abs(float(hi) - float(lo)) / 2))
    total = sum(s * s for _, s in raw)
    if total <= 0:
        return ()
    out = [Swing(p, tolerance_text(runner.spans[p], runner.units.get(p, "")), s, s * s / total)
           for p, s in raw if s > 0]
    return tuple(sorted(out, key=lambda w: (-w.share, w.field)))
