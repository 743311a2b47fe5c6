"""A rule's margin in each of a list of runs: the numbers one finding is made of.

A run is one evaluation of the derive step (a tolerance corner or a Monte Carlo sample, see
:class:`reviewer.quantities.Run`). For a limit rule the margin is ``limit − value`` (``at_most``)
or ``value − limit`` (``at_least``); for a flag rule (``fails_when``) it is −1 where the flag is
raised and +1 where it is not. Every number in one run comes from that run alone: a quantity a
run could not compute makes that run *uncomputable* for the rule, never filled in from another.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any, Sequence

import numpy as np

from reviewer.rulebook.loader import Compiled

SLACK = 1e-9
"""Relative slack: a value exactly at its limit passes despite floating-point noise."""

_ABSENT = object()


def rule_names(c: Compiled, applies: bool = True) -> frozenset[str]:
    """The sheet names a rule's verdict depends on: value, limit, flag and (optionally) applies."""
    exprs = [c.value, c.limit, c.fails_when] + ([c.applies] if applies else [])
    names: set[str] = set()
    for e in exprs:
        if e is not None:
            names |= e.names
    return frozenset(names - set(c.params) - {"value", "limit"})


@dataclass
class Margins:
    """A rule over a list of runs (arrays, one element per run)."""

    applies: np.ndarray
    """True where the rule applies (or where its ``applies`` cannot be computed: judged there)."""
    ok: np.ndarray
    """True where every number the verdict needs could be computed."""
    margin: np.ndarray
    """The margin where ok (NaN elsewhere); ±1 for a flag rule."""
    value: np.ndarray | None
    limit: np.ndarray | None
    env: dict[str, Any]
    absent: list[tuple[str, ...]]
    """For each run, the names the verdict needs that the run could not compute."""

    @property
    def score(self) -> np.ndarray:
        """What a worst-case search minimises: the margin where the rule applies and can be
        computed, −inf where it applies and cannot be (a corner to report), +inf elsewhere."""
        s = np.where(self.ok, self.margin, -np.inf)
        return np.where(self.applies, s, np.inf)

    def failed(self, i: int) -> bool:
        """Whether run ``i`` fails the rule (beyond the floating-point slack)."""
        if not (self.applies[i] and self.ok[i]):
            return False
        scale = abs(float(self.limit[i])) if self.limit is not None else 0.0
        return bool(self.margin[i] < -SLACK * max(scale, 1e-30))


def column(runs: Sequence[Any], name: str) -> tuple[Any, np.ndarray]:
    """The values of ``name`` over ``runs`` as an array (numbers float, flags bool, texts kept
    as one text when they agree), and a mask of the runs that have it."""
    raw = [r.get(name, _ABSENT) for r in runs]
    have = np.array([x is not _ABSENT and x is not None for x in raw], dtype=bool)
    sample = next((x for x, h in zip(raw, have) if h), None)
    if isinstance(sample, bool) or isinstance(sample, np.bool_):
        return np.array([bool(x) if h else False for x, h in zip(raw, have)], dtype=bool), have
    if isinstance(sample, (int, float, np.floating)):
        return np.array([float(x) if h else np.nan for x, h in zip(raw, have)], dtype=float), have
    texts = {x for x, h in zip(raw, have) if h}
    if len(texts) <= 1:
        return (texts.pop() if texts else None), have
    return np.array([x if h else "" for x, h in zip(raw, have)], dtype=object), have


def margins(c: Compiled, runs: Sequence[Any], verdict: bool = True) -> Margins:
    """Evaluate rule ``c`` (a limit or flag rule) in every run of ``runs``.

    With ``verdict`` False, only ``applies`` is evaluated (the margin is NaN): for a rule whose
    value cannot be computed at all, to tell "not applicable" from "needs data"."""
    n = len(runs)
    env: dict[str, Any] = dict(c.params)
    have: dict[str, np.ndarray] = {}
    for name in rule_names(c):
        env[name], have[name] = column(runs, name)

    def usable(names: frozenset[str]) -> np.ndarray:
        ok = np.ones(n, dtype=bool)
        for nm in names:
            if nm in have:
                ok &= have[nm]
        return ok

    with np.errstate(all="ignore"):
        if c.applies is not None:
            a_ok = usable(c.applies.names)
            a = np.broadcast_to(np.asarray(c.applies.evaluate(env), dtype=bool), (n,))
            applies = np.where(a_ok, a, True)
        else:
            applies = np.ones(n, dtype=bool)
        exprs = [e for e in (c.value, c.limit, c.fails_when) if e is not None]
        need = frozenset().union(*(e.names for e in exprs)) - set(c.params) - {"value", "limit"}
        ok = usable(need)
        value = limit = None
        if not all(have[nm].any() for nm in need if nm in have):
            verdict = False  # a name no run has: nothing to evaluate (the finding needs data)
        if not verdict:
            ok = np.zeros(n, dtype=bool)
            m = np.full(n, np.nan)
        elif c.value is not None:
            value = np.broadcast_to(np.asarray(c.value.evaluate(env), dtype=float), (n,)).copy()
            lim = c.limit_const if c.limit is None else c.limit.evaluate({**env, "value": value})
            limit = np.broadcast_to(np.asarray(lim, dtype=float), (n,)).copy()
            m = (limit - value) if c.rule.at_most is not None else (value - limit)
            m = np.where(ok, np.where(np.isnan(m), -np.inf, m), np.nan)
            env["value"], env["limit"] = value, limit
        else:
            f = np.broadcast_to(np.asarray(c.fails_when.evaluate(env), dtype=bool), (n,))
            m = np.where(ok, np.where(f, -1.0, 1.0), np.nan)
    absent = [tuple(nm for nm in sorted(need) if nm in have and not have[nm][i]) for i in range(n)]
    return Margins(applies, ok, m, value, limit, env, absent)
