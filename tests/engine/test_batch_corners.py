"""Corners made many at once equal corners made one at a time.

The oracle is the scalar run of every derive module at one corner (:meth:`Runner.corner`, no
replay): a batch of corners (:meth:`Runner.corners_at`), of inside points (:meth:`Runner.insides`)
and an array call of an opted-in module over points whose upstream flags differ must publish the
same values, missing entries and notes at every point. The toy modules below are arithmetic on
their own definition; no physics is checked in this file.
"""

from __future__ import annotations

import itertools
import math

import numpy as np
import pytest

from reviewer.context import declare
from reviewer.derive import MODULES, operating
from reviewer.design import load_design
from reviewer.passcheck import find_fix
from reviewer.quantities import Lazy, Runner, point_label
from tests.conftest import EXAMPLES

CAREFUL = EXAMPLES / "careful_12v_sine.toml"


def same(a, b):
    assert set(a.out) == set(b.out)
    assert a.missing == b.missing
    assert a.notes == b.notes
    for name, x in b.out.items():
        y = a.out[name]
        if isinstance(x, float) and math.isfinite(x):
            assert y == pytest.approx(x, rel=1e-12, abs=0), name
        else:
            assert y == x, name


@pytest.mark.parametrize("vector", [False, True], ids=["scalar", "operating-vector"])
def test_corners_at_equals_one_corner_at_a_time(vector, monkeypatch):
    if vector:
        monkeypatch.setattr(operating, "VECTOR", True, raising=False)
    d = load_design(CAREFUL)
    ref, batched = Runner(d, replay=False), Runner(d)
    tol = batched.tol[:4]
    corners = [tuple(zip(tol, combo)) for combo in itertools.product(("min", "max"), repeat=4)]
    got = batched.corners_at(corners + [((tol[0], "min"),)])
    assert len(got) == len(corners) + 1
    for key, run in zip(corners, got):
        same(run, ref.corner(key))
        assert batched.corner(key) is run  # kept: asked again, not run again
        assert run.label == tuple(sorted(key))
    if vector:
        assert batched.vector_calls >= 1 and batched.fallbacks == 0


def test_insides_equal_single_inside_runs():
    d = load_design(CAREFUL)
    ref, batched = Runner(d, replay=False), Runner(d)
    s = batched.spans["timing.dead_time"]
    wanted = [({"switch.low.vth": "max"}, {"timing.dead_time": s.lo + t * (s.hi - s.lo)})
              for t in (0.1, 0.5, 0.9)]
    got = batched.insides(wanted)
    for (corner, at), run in zip(wanted, got):
        one = ref.inside(corner, at)
        same(run, one)
        assert run.label == one.label
        assert ("switch.low.vth", "max") in run.label


def test_labels_are_made_when_asked():
    lazy = point_label({"timing.dead_time": 4.75e-7}, {"timing.dead_time": "s"})
    assert isinstance(lazy, Lazy)
    d = load_design(CAREFUL)
    r = Runner(d)
    run = r.batch([{"timing.dead_time": 4.75e-7}], [lazy])[0]
    assert "_label" in run.__dict__ and isinstance(run.__dict__["_label"], Lazy)
    assert run.label == (("timing.dead_time", "475 ns"),)  # 4.75e-7 s to 4 figures


# toy modules: a scalar module raises a flag at one end of the dead time, and array-evaluating
# modules read it (one with np.where, one with a plain ``if``, which cannot take arrays)

class _Flagger:
    QUANTITIES = declare(("toy.short", "", "dead time below 480 ns", "flag"))

    @staticmethod
    def derive(ctx):
        ctx.publish("toy.short", bool(ctx.v("timing.dead_time") < 480e-9))


class _Where:
    VECTOR = True
    QUANTITIES = declare(("toy.where", "s", "dead time, doubled when short"))

    @staticmethod
    def derive(ctx):
        t = ctx.v("timing.dead_time")
        ctx.publish("toy.where", np.where(ctx.q("toy.short"), 2 * t, t) if isinstance(t, np.ndarray)
                    or isinstance(ctx.q("toy.short"), np.ndarray)
                    else (2 * t if ctx.q("toy.short") else t))


class _If:
    VECTOR = True
    QUANTITIES = declare(("toy.if", "s", "dead time, doubled when short"))

    @staticmethod
    def derive(ctx):
        t = ctx.v("timing.dead_time")
        ctx.publish("toy.if", 2 * t if ctx.q("toy.short") else t + 0 * t)


def test_flags_that_differ_are_bool_arrays_or_split():
    d = load_design(CAREFUL)
    mods = [_Flagger, _Where, _If]
    ref, batched = Runner(d, replay=False, modules=mods), Runner(d, modules=mods)
    s = batched.spans["timing.dead_time"]
    xs = [s.lo, 4.6e-7, 4.9e-7, s.hi, 5.2e-7]
    runs = batched.batch([{"timing.dead_time": x} for x in xs])
    for x, run in zip(xs, runs):
        want = ref.point({"timing.dead_time": x})
        same(run, want)
        assert run.out["toy.where"] == (2 * x if x < 480e-9 else x)
    # _Where took the flags as one bool array; _If raised on it and ran once per group of
    # equal flags (two calls), never point by point
    assert batched.vector_calls == 3 and batched.fallbacks == 0


def test_pass_value_check_sharing_the_review_trees_finds_the_same_fix():
    from reviewer.review import review_file
    from reviewer.rulebook import load_rulebook

    book = load_rulebook()
    r = review_file(EXAMPLES / "naive_bench_pchannel.toml", book=book)
    assert r.sheet.runner.shared_trees is not None
    by_key = {(c.rule.id, c.subject): c for c in book.compiled}
    from reviewer.review import answers_of

    answers = answers_of(r.design)
    checked = 0
    for f in r.findings:
        if f.outcome != "fail" or not f.fix or f.pass_solved is None:
            continue
        c = by_key[(f.rule_id, f.subject)]
        from dataclasses import replace

        g = replace(f, pass_value=f.pass_solved)
        alone = find_fix(r.design, c, g, answers)
        shared = find_fix(r.design, c, g, answers, trees=r.sheet.runner.shared_trees)
        assert alone == shared
        assert alone is not None and alone.value == f.pass_value
        checked += 1
        if checked == 3:
            break
    assert checked
    assert len(MODULES) == len(r.sheet.runner.shared_trees)


def test_pass_check_judges_on_the_modules_the_rule_reads_alone():
    """The verdict on the derive modules up to the last one a rule reads equals the verdict on
    all of them (a module reads only what earlier ones published), for every rule of the naive
    example; and the early stop says "fails" only where the full search fails."""
    from reviewer.engine import judge
    from reviewer.passcheck import _fails_somewhere, _modules_for
    from reviewer.quantities import compute
    from reviewer.review import answers_of
    from reviewer.rulebook import load_rulebook

    book = load_rulebook()
    d = load_design(EXAMPLES / "naive_bench_pchannel.toml")
    answers = answers_of(d)
    full = compute(d, ends=False)
    shorter = 0
    for c in book.compiled:
        if c.rule.kind == "question":
            continue
        mods = _modules_for(c)
        shorter += len(mods) < len(MODULES)
        part = compute(d, ends=False, modules=mods)
        a, b = judge(c, full, answers, sensitivity=False), judge(c, part, answers,
                                                                sensitivity=False)
        assert (a.outcome, a.value, a.limit, a.margin, a.corner) == \
            (b.outcome, b.value, b.limit, b.margin, b.corner), c.rule.id
        if _fails_somewhere(c, compute(d, ends=False, modules=mods).runner):
            assert a.outcome == "fail", c.rule.id
    assert shorter > 0


def test_fetch_makes_corners_and_inside_points_in_one_batch():
    # the oracle: the same corners and inside points made one at a time, without replay
    d = load_design(CAREFUL)
    ref, batched = Runner(d, replay=False), Runner(d)
    tol = batched.tol[:3]
    corners = [tuple(zip(tol, combo)) for combo in itertools.product(("min", "max"), repeat=3)]
    s = batched.spans["timing.dead_time"]
    wanted = [({tol[0]: "max"}, {"timing.dead_time": s.lo + t * (s.hi - s.lo)})
              for t in (0.2, 0.7)]
    calls = []
    real = batched.batch
    batched.batch = lambda *a, **k: calls.append(len(a[0])) or real(*a, **k)
    got_c, got_i = batched.fetch(corners + corners[:1], wanted + wanted[:1])
    assert calls == [len(corners) + len(wanted)]  # one batch, each point once
    assert len(got_c) == len(corners) + 1 and len(got_i) == len(wanted) + 1
    assert got_c[-1] is got_c[0] and got_i[-1] is got_i[0]
    for key, run in zip(corners, got_c):
        same(run, ref.corner(key))
    for (corner, at), run in zip(wanted, got_i):
        same(run, ref.inside(corner, at))
    assert batched.fetch(corners, wanted)[0] == got_c[:-1]  # kept: nothing made again
    assert calls == [len(corners) + len(wanted)]
