"""The §3.10 isolation rules and the §3.1 consequence: a design beyond extra-low voltage needs
reinforced insulation from what a person can touch, with creepage and clearance by IEC 60664-1,
and its review carries the caution.

Check values for the 230 V example (pollution degree 2, category II, material group IIIa,
working voltage 250 V): IEC 60664-1:2007 Table F.1 gives 2.5 kV for a 230 V system in
category II (from memory); reinforced one step up, 4.0 kV, needs 3.0 mm of clearance (Table F.2,
from memory); Table F.4, material group III at 250 V, 2.5 mm basic (checked against a reprint),
twice that, 5.0 mm, for reinforced (clause 5.2, from memory)."""

from __future__ import annotations

import pytest

from reviewer.report import markdown
from reviewer.review import CAUTION, review_file
from tests.conftest import assert_fails, example, finding, review_text

MAINS = example("mains_output_transformer").read_text(encoding="utf-8")


def test_beyond_elv_needs_reinforced_insulation_and_carries_the_caution():
    r = review_file(example("mains_output_transformer"))
    assert r.beyond_elv
    assert r.sheet.value("isolation.required") == "reinforced"
    assert finding(r, "isolation.grade").outcome == "pass"
    assert CAUTION in markdown.render([r])


def test_barrier_figures_for_the_230_volt_example():
    r = review_file(example("mains_output_transformer"))
    assert r.sheet.value("isolation.rated_impulse") == 2500.0
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0e-3)
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(5.0e-3)
    # published for the layout table
    assert r.sheet.value("layout.barrier.creepage") == pytest.approx(5.0e-3)
    assert r.sheet.value("layout.barrier.clearance") == pytest.approx(3.0e-3)


@pytest.mark.parametrize("creepage,outcome", [("5 mm", "pass"), ("4.9 mm", "fail")])
def test_creepage_threshold(creepage, outcome):
    f = finding(review_text(MAINS.replace('creepage = "5 mm"', f'creepage = "{creepage}"')),
                "isolation.creepage")
    assert (f.outcome, f.severity) == (outcome, "hazard")
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(5.0e-3)


@pytest.mark.parametrize("clearance,outcome", [("3 mm", "pass"), ("2.9 mm", "fail")])
def test_clearance_threshold(clearance, outcome):
    f = finding(review_text(MAINS.replace('clearance = "4 mm"', f'clearance = "{clearance}"')),
                "isolation.clearance")
    assert (f.outcome, f.severity) == (outcome, "hazard")


def test_basic_insulation_is_not_enough_for_touchable_parts():
    r = review_text(MAINS.replace('insulation = "reinforced"', 'insulation = "basic"'))
    f = finding(r, "isolation.grade")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert "reinforced" in f.mitigation and "qualified person" in f.mitigation
    # the spacing needed follows the grade required, not the grade given: still 3.0 mm
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0e-3)


def test_pollution_degree_3_needs_more_creepage():
    # Table F.4, pollution degree 3, group III at 250 V: 4.0 mm basic, 8.0 mm reinforced
    r = review_text(MAINS.replace("pollution_degree = 2", "pollution_degree = 3"))
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(8.0e-3)
    assert finding(r, "isolation.creepage").outcome == "fail"


def test_within_elv_the_barrier_rules_do_not_apply():
    r = review_file(example("careful_12v_sine"))
    assert not r.beyond_elv
    for rid in ("isolation.grade", "isolation.creepage", "isolation.clearance"):
        assert finding(r, rid).outcome == "not_applicable"
    assert r.sheet.value("isolation.required") == "functional"


@pytest.mark.parametrize("name", ["careful_12v_sine", "mains_output_transformer",
                                  "naive_bench_pchannel", "nchannel_bootstrap_quasi"])
def test_examples_isolation(name):
    assert_fails(review_file(example(name)), set(), area="isolation")
