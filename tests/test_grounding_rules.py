"""The §3.10 grounding rules end to end: ground bounce L·di/dt against the noise margin at its
threshold (Johnson & Graham 1993, ground bounce), the flags, and the examples."""

from __future__ import annotations

import pytest

from reviewer.review import review_file
from tests.conftest import assert_fails, example, finding, review_text

CAREFUL = example("careful_12v_sine").read_text(encoding="utf-8")
MAINS = example("mains_output_transformer").read_text(encoding="utf-8")


def _with_common(value: str) -> str:
    return CAREFUL.replace(
        'common_inductance = "40 pH"  # star point at the low-side sources: almost nothing shared',
        f'common_inductance = "{value}"')


def test_bounce_is_l_times_di_dt_at_the_worst_corner():
    r = review_text(_with_common("2 nH"))
    f = finding(r, "grounding.bounce")
    # V = L · ΔI / t: the worst corner pairs the largest current with the shortest edge
    i_pk, t = r.sheet.get("op.load_current_peak"), r.sheet.get("grounding.edge_time")
    assert f.value == pytest.approx(2e-9 * i_pk.hi / t.lo, rel=1e-6)
    assert f.outcome == "fail"
    # the inductance that passes: 0.4 V · t / ΔI
    assert f.pass_solved == pytest.approx(0.4 * t.lo / i_pk.hi, rel=1e-6)


def test_bounce_threshold():
    f = finding(review_text(_with_common("2 nH")), "grounding.bounce")
    at = f.pass_value
    assert finding(review_text(_with_common(f"{at * 0.999:.6g}")), "grounding.bounce").outcome == "pass"
    assert finding(review_text(_with_common(f"{at * 1.01:.6g}")), "grounding.bounce").outcome == "fail"


@pytest.mark.parametrize("line,new,rule", [
    ('scheme = "single_point"', 'scheme = "plane"', "grounding.single-point"),
    ('gate_return = "kelvin"', 'gate_return = "shared"', "grounding.kelvin-return"),
    ('heatsink = "insulated"', 'heatsink = "drain"', "grounding.heatsink-live"),
])
def test_flags(line, new, rule):
    assert finding(review_text(CAREFUL), rule).outcome == "pass"
    assert finding(review_text(CAREFUL.replace(line, new)), rule).outcome == "fail"


def test_metal_enclosure_beyond_elv_needs_protective_earth():
    f = finding(review_text(MAINS.replace("protective_earth = true", "protective_earth = false")),
                "grounding.protective-earth")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert finding(review_text(MAINS), "grounding.protective-earth").outcome == "pass"
    assert finding(review_text(CAREFUL), "grounding.protective-earth").outcome == "not_applicable"


@pytest.mark.parametrize("name,expected", [
    ("careful_12v_sine", set()),
    ("mains_output_transformer", set()),
    ("naive_bench_pchannel", {"grounding.single-point", "grounding.kelvin-return"}),
    ("nchannel_bootstrap_quasi", set()),
])
def test_examples_grounding(name, expected):
    assert_fails(review_file(example(name)), expected, area="grounding")


def test_bounce_uses_the_same_current_edges_as_the_overshoot():
    r = review_text(CAREFUL)
    edges = [r.sheet.value(f"switching.{s}.{k}") for s in ("high", "low")
             for k in ("current_rise", "current_fall")]
    assert r.sheet.value("grounding.edge_time") == pytest.approx(min(edges))
    # without a bound on the current fall (no datasheet t_f, no common-source inductance) the
    # bounce is not judged on the gate-charge tail: it needs data
    text = CAREFUL.replace('current_fall_time = "20 ns"   # datasheet t_f\n', "")
    f = finding(review_text(text), "grounding.bounce")
    assert f.outcome == "needs_data"
    assert "switch.high.current_fall_time" in f.needs
