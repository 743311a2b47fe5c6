"""The worst case is searched on each rule's own margin.

The oracle here is exhaustive: the derive step run at every vertex of the whole tolerance box
(every toleranced input of the design at its min or its max, 2**k runs, no replay, no dependency
tracking) and the rule's margin evaluated at each. Each variant below tolerances two inputs so
that the rule fails only with them at *opposite* ends (one lowering the value, the other raising
the limit): no one-at-a-time end fails, which the test asserts too. The relations are arithmetic
on the rule's own definition (rules/*.toml); no physics is checked in this file.
"""

from __future__ import annotations

import itertools
from pathlib import Path

import pytest

from reviewer.design import parse_design
from reviewer.engine import judge
from reviewer.margins import margins
from reviewer.quantities import Runner, compute
from tests.conftest import EXAMPLES

CAREFUL = (EXAMPLES / "careful_12v_sine.toml").read_text(encoding="utf-8")


def variant(*subs: tuple[str, str], base: str = CAREFUL) -> str:
    text = base
    for old, new in subs:
        assert old in text, old
        text = text.replace(old, new, 1)
    return text


def compiled(book, key: str):
    for c in book.compiled:
        if (f"{c.rule.id}[{c.subject}]" if c.subject else c.rule.id) == key:
            return c
    raise AssertionError(f"no rule {key}")


def vertices(design):
    runner = Runner(design, replay=False)
    tol = runner.tol
    return runner, [runner.corner(zip(tol, ends))
                    for ends in itertools.product(("min", "max"), repeat=len(tol))]


def oracle(c, design):
    """(worst vertex margin, its run, margin of the worst one-at-a-time end)."""
    runner, runs = vertices(design)
    m = margins(c, runs)
    i = int(m.margin.argmin())
    oat = [runner.corner(((p, e),)) for p in runner.tol for e in ("min", "max")]
    return float(m.margin[i]), runs[i], m, float(margins(c, oat).margin.min())


DEAD_TIME = ('dead_time = "500 ns ± 10%"', 'dead_time = "125 ns ± 20%"')


@pytest.mark.parametrize("side", ["high", "low"])
def test_dead_time_tolerance_fails_like_its_short_end(book, side):
    # the example: 125 ns ± 20 % can be 100 ns, and a fixed 100 ns fails shoot-through
    c = compiled(book, f"timing.shoot-through[{side}]")
    fixed = judge(c, compute(parse_design(variant(('dead_time = "500 ns ± 10%"',
                                                   'dead_time = "100 ns"')), "f.toml")), {})
    assert fixed.outcome == "fail"
    d = parse_design(variant(DEAD_TIME), "v.toml")
    f = judge(c, compute(d), {})
    assert f.outcome == "fail"
    # 125 ns − 20 % = 100 ns set, less the design's driver mismatch and controller step
    loss = compute(d).runner.typical.out[f"timing.{side}.dead_time_loss"]
    assert loss > 0
    assert f.value == pytest.approx(100e-9 - loss, rel=1e-12)
    assert f.value == pytest.approx(fixed.value, rel=1e-12)
    assert f.limit == pytest.approx(fixed.limit, rel=1e-12)
    assert f.margin == pytest.approx(fixed.margin, rel=1e-12)
    assert ("timing.dead_time", "min") in f.corner
    worst, run, _, _ = oracle(c, d)
    assert f.margin == pytest.approx(worst, rel=1e-12)


# (rule key, substitutions): the value's input and the limit's input, each toleranced
OPPOSITE = {
    "bus.cap-voltage": [('voltage_rating = "25 V"', 'voltage_rating = "17 V ± 10%"'),
                        ('v_max = "14.8 V"', 'v_max = "14.8 V ± 5%"')],
    "protection.fuse-voltage": [('voltage = "32 V"', 'voltage = "17 V ± 10%"'),
                                ('v_max = "14.8 V"', 'v_max = "14.8 V ± 5%"')],
    "stress.vds-rating[high]": [('vds_rating = "40 V"', 'vds_rating = "22.5 V ± 10%"'),
                                ('v_max = "14.8 V"', 'v_max = "14.8 V ± 5%"')],
    "gate.vgs-on-threshold[high]": [('on_level = "12 V"', 'on_level = "8.5 V ± 10%"')],
    "grounding.bounce": [('logic_noise_margin = "0.4 V"', 'logic_noise_margin = "0.4 V ± 20%"'),
                         ('common_inductance = "40 pH"', 'common_inductance = "35 pH ± 20%"')],
}


@pytest.mark.parametrize("key", sorted(OPPOSITE))
def test_two_inputs_at_opposite_ends(book, key):
    c = compiled(book, key)
    d = parse_design(variant(*OPPOSITE[key]), "v.toml")
    worst, run, m, oat_worst = oracle(c, d)
    assert worst < 0 and oat_worst > 0, "the variant must fail only with two inputs combined"
    f = judge(c, compute(d), {})
    assert f.outcome == "fail"
    assert f.margin == pytest.approx(worst, rel=1e-12)
    i = [r.label for r in vertices(d)[1]].index(run.label)
    assert f.value == pytest.approx(float(m.value[i]), rel=1e-12)   # the numbers of that vertex
    assert f.limit == pytest.approx(float(m.limit[i]), rel=1e-12)
    # the reported corner is a real run with that margin
    again = margins(c, [compute(d).runner.corner(f.corner)])
    assert float(again.margin[0]) == pytest.approx(worst, rel=1e-12)


def test_applies_is_judged_at_every_corner(tmp_path):
    # a house rule that applies only when the bus can exceed 15 V: with v_max 14.8 V ± 5 % it
    # can (15.54 V), so the rule applies although it does not at typical values
    from reviewer.review import review_design
    from reviewer.rulebook import load_rulebook

    rules = tmp_path / "house.toml"
    rules.write_text('''
[[rule]]
id = "test.high-bus"
title = "Bus at most 15 V where it may exceed 15 V"
severity = "risk"
applies = "op.bus_max > 15 V"
value = "op.bus_max"
at_most = "15 V"
why = "test"
''')
    book = load_rulebook([rules])
    text = variant(('v_max = "14.8 V"', 'v_max = "14.8 V ± 5%"'))
    f = next(x for x in review_design(parse_design(text, "v.toml"), "v.toml", book).findings
             if x.rule_id == "test.high-bus")
    assert f.outcome == "fail" and f.value == pytest.approx(14.8 * 1.05)
    text = variant(('v_max = "14.8 V"', 'v_max = "14.8 V ± 1%"'))
    f = next(x for x in review_design(parse_design(text, "v.toml"), "v.toml", book).findings
             if x.rule_id == "test.high-bus")
    assert f.outcome == "not_applicable"


def test_no_typical_fill_in_for_a_corner_that_cannot_compute():
    from reviewer.quantities import Run
    from reviewer.engine import finding_at

    # a value present at typical and absent at a corner: the finding says so, never passes
    from reviewer.rulebook import load_rulebook

    c = compiled(load_rulebook(), "bus.cap-voltage")
    d = parse_design(CAREFUL, "c.toml")
    sheet = compute(d)
    typ = sheet.runner.typical
    broken = Run((("source.v_max", "max"),), dict(typ.values), dict(typ.out), {}, {}, typ.reads)
    assert "band.bus_peak" in c.limit.names  # the limit: highest bus, ripple included
    del broken.out["band.bus_peak"]
    runs = [typ, broken]
    f = finding_at(c, sheet, runs, margins(c, runs), "test")
    assert f.outcome == "needs_data"
    assert "band.bus_peak cannot be computed at source.v_max at max" in f.uncomputed


def test_read_fields_are_design_paths(book):
    sheet = compute(parse_design(CAREFUL, "c.toml"))
    assert "timing.dead_time" in sheet.read_fields
    assert not any(p.startswith("design.") for p in sheet.read_fields)


def test_sensitivity_names_the_dead_time_swing(book):
    # margin = dead time − needed, linear in the dead time: 125 ns ± 20 % swings it by ±25 ns
    from reviewer.spread import sensitivity_line

    c = compiled(book, "timing.shoot-through[high]")
    f = judge(c, compute(parse_design(variant(DEAD_TIME), "v.toml")), {})
    swing = {w.field: w for w in f.sensitivity}
    assert swing["timing.dead_time"].swing == pytest.approx(25e-9, rel=1e-9)
    assert swing["timing.dead_time"].tolerance == "±20 %"
    assert sum(w.share for w in f.sensitivity) == pytest.approx(1.0)
    shares = [w.share for w in f.sensitivity]
    assert shares == sorted(shares, reverse=True)
    assert "timing.dead_time ±20 % moves this margin by ±25 ns" in sensitivity_line(f)
    assert "one-at-a-time" in f.sensitivity_method


@pytest.mark.parametrize("fn", [
    lambda t: (t - 0.37) ** 2,                        # smooth, inside a middle bracket
    lambda t: -abs(__import__("math").sin(3.1 * t)),  # a kink at the minimum (t = π/6.2)
    lambda t: (t - 0.9) ** 4 + 0.01 * t,              # flat bottom near an end
    lambda t: abs(t - 0.6) + (0.2 if t > 0.61 else 0.0),  # a step beside the minimum
])
def test_interior_minimisation_against_scipy(fn):
    # reference: scipy.optimize.minimize_scalar (bounded Brent) on the same bracket
    from scipy.optimize import minimize_scalar

    from reviewer.worstcase import LEVELS, _minimise

    calls = []

    def f(t):
        calls.append(t)
        return fn(t)

    probes = [fn(t) for t in LEVELS]
    t = _minimise(f, probes)
    i = min(range(len(LEVELS)), key=lambda j: probes[j])
    a = LEVELS[i - 1] if i > 0 else 0.0
    b = LEVELS[i + 1] if i + 1 < len(LEVELS) else 1.0
    ref = minimize_scalar(fn, bounds=(a, b), method="bounded", options={"xatol": 1e-6})
    assert fn(t) <= min(probes)  # never worse than the best probe
    assert fn(t) <= ref.fun + 1e-3 * (max(probes) - min(probes)) + 1e-9
    assert len(calls) <= 16  # golden section alone took 14 here


@pytest.mark.parametrize("name", ["careful_12v_sine", "naive_bench_pchannel",
                                  "mains_output_transformer", "nchannel_bootstrap_quasi"])
def test_the_searches_side_by_side_equal_each_rule_searched_alone(book, name):
    # the oracle: the rules searched one after another, each to its end before the next
    # starts (no point batched with another rule's): the same runs, in the same order, the
    # same method sentence and the same margins (to the batching's floating-point noise)
    from reviewer.design import load_design
    from reviewer.worstcase import runs_for, search_all

    design = load_design(EXAMPLES / f"{name}.toml")
    rules = [c for c in book.compiled if c.rule.kind != "question"]
    together = search_all(rules, Runner(design))
    assert len(together) == len(rules)
    one_by_one = Runner(design)
    for c, (runs, method) in zip(rules, together):
        alone, how = runs_for(c, one_by_one)
        assert how == method, c.rule.id
        assert [r.label for r in runs] == [r.label for r in alone], c.rule.id
        a, b = margins(c, runs).score, margins(c, alone).score
        assert a.tolist() == pytest.approx(b.tolist(), rel=1e-9, abs=1e-12), c.rule.id
