"""The §3.10 isolation rules and the §3.1 consequence: a design beyond extra-low voltage needs the
insulation grade its protective class asks for, with creepage, clearance and test voltage by
IEC 60664-1, and its review carries the caution.

Check values, IEC 60664-1:2007 (values from memory unless said): Table F.1 gives 2.5 kV for a
230 V system (row "up to 300 V") in overvoltage category II; Table F.2 (Case A, pollution
degree 2) 1.5 mm for 2.5 kV (basic) and, reinforced one step up the preferred series (5.1.6),
3.0 mm for 4.0 kV. Table F.4 (checked against a reprint): material group III, pollution degree 2,
2.5 mm at 250 V and 3.2 mm at 320 V; printed wiring, pollution degree 2, 1.0 mm at 250 V and
1.6 mm at 320 V; pollution degree 1 printed wiring 0.56 mm at 250 V and 0.75 mm at 320 V;
reinforced twice basic (5.2, from memory); creepage never below its clearance (5.2). Linear
interpolation between rows (from memory). The 230 V example's regulated output may reach
230 V + 10 % = 253 V, the working and system voltage: material group III gives
2.5 + 0.7 · 3/70 = 2.53 mm basic, 5.06 mm reinforced."""

from __future__ import annotations

import pytest

from reviewer.report import markdown
from reviewer.review import CAUTION, review_file
from tests.conftest import assert_fails, example, finding, review_text

MAINS = example("mains_output_transformer").read_text(encoding="utf-8")
MM = 1e-3


def mains(**edits: str) -> str:
    """The 230 V example with [isolation] keys replaced (TOML values as text)."""
    text = MAINS
    for key, value in edits.items():
        lines = text.splitlines()
        start = lines.index("[isolation]")
        end = next(i for i in range(start + 1, len(lines)) if lines[i].startswith("["))
        for i in range(start + 1, end):
            if lines[i].split("=")[0].strip() == key:
                lines[i] = f"{key} = {value}"
                break
        else:
            lines.insert(start + 1, f"{key} = {value}")
        text = "\n".join(lines) + "\n"
    return text


def test_beyond_elv_needs_reinforced_insulation_and_carries_the_caution():
    r = review_file(example("mains_output_transformer"))
    assert r.beyond_elv
    assert r.sheet.value("isolation.required") == "reinforced"
    assert finding(r, "isolation.grade").outcome == "pass"
    assert CAUTION in markdown.render([r])


def test_barrier_figures_for_the_230_volt_example():
    r = review_file(example("mains_output_transformer"))
    assert r.sheet.value("isolation.working_voltage") == pytest.approx(253.0)
    assert r.sheet.value("isolation.rated_impulse") == 2500.0
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0 * MM)
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(5.06 * MM)
    # published for the layout table
    assert r.sheet.value("layout.barrier.creepage") == pytest.approx(5.06 * MM)
    assert r.sheet.value("layout.barrier.clearance") == pytest.approx(3.0 * MM)


def test_a_smaller_stated_working_voltage_does_not_lower_the_spacing():
    # 250 V stated, 253 V produced: the larger is used (5.06 mm, not 5.0 mm)
    r = review_text(mains(working_voltage='"250 V"'))
    assert r.sheet.value("isolation.working_voltage") == pytest.approx(253.0)
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(5.06 * MM)


@pytest.mark.parametrize("creepage,outcome", [("5.06 mm", "pass"), ("5.05 mm", "fail")])
def test_creepage_threshold(creepage, outcome):
    f = finding(review_text(mains(creepage=f'"{creepage}"')), "isolation.creepage")
    assert (f.outcome, f.severity) == (outcome, "hazard")
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(5.06 * MM)


@pytest.mark.parametrize("clearance,outcome", [("3 mm", "pass"), ("2.9 mm", "fail")])
def test_clearance_threshold(clearance, outcome):
    f = finding(review_text(mains(clearance=f'"{clearance}"')), "isolation.clearance")
    assert (f.outcome, f.severity) == (outcome, "hazard")


def test_basic_insulation_is_not_enough_for_touchable_parts():
    r = review_text(mains(insulation='"basic"'))
    f = finding(r, "isolation.grade")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert "reinforced" in f.mitigation and "qualified person" in f.mitigation
    # the spacing needed follows the grade required, not the grade given: still 3.0 mm
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0 * MM)


def test_class_i_with_earthed_touchable_parts_needs_basic_values():
    """Class I, every touchable part earthed: basic insulation (IEC 61140), so Table F.2 at the
    rated impulse itself, 2.5 kV → 1.5 mm, and Table F.4 basic, 2.53 mm at 253 V, general
    columns."""
    r = review_text(mains(protective_class='"I"', touchable_earthed="true", insulation='"basic"',
                          creepage='"2.53 mm"', clearance='"1.5 mm"'))
    assert r.sheet.value("isolation.required") == "basic"
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(1.5 * MM)
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(2.53 * MM)
    assert_fails(r, set(), area="isolation")
    r = review_text(mains(protective_class='"I"', touchable_earthed="true", insulation='"basic"',
                          creepage='"2.52 mm"', clearance='"1.49 mm"'))
    assert_fails(r, {"isolation.creepage", "isolation.clearance"}, area="isolation")


def test_class_ii_needs_reinforced_values():
    """Class II: reinforced throughout: 3.0 mm clearance (4.0 kV one step up), 5.06 mm creepage
    (twice 2.53 mm), whatever isolation.touchable_earthed says."""
    r = review_text(mains(protective_class='"II"', touchable_earthed="true"))
    assert r.sheet.value("isolation.required") == "reinforced"
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0 * MM)
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(5.06 * MM)


def test_class_i_without_protective_earth_or_class_iii_beyond_elv_is_a_hazard():
    text = mains(protective_class='"I"').replace("protective_earth = true", "protective_earth = false")
    f = finding(review_text(text), "isolation.class-consistent")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert finding(review_text(mains(protective_class='"III"')),
                   "isolation.class-consistent").outcome == "fail"
    assert finding(review_text(mains(protective_class='"II"')),
                   "isolation.class-consistent").outcome == "pass"


def test_barrier_on_the_board_uses_the_printed_wiring_columns():
    """Printed wiring, pollution degree 2: 1.0 + 0.6 · 3/70 = 1.0257 mm basic at 253 V, 2.0514 mm
    reinforced, below the 3.0 mm reinforced clearance, so 3.0 mm (5.2: never below the
    clearance)."""
    r = review_text(mains(barrier_on_board="true"))
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(3.0 * MM)
    r = review_text(mains(barrier_on_board="true", protective_class='"I"', touchable_earthed="true"))
    # basic: 1.0257 mm against a 1.5 mm clearance: 1.5 mm
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(1.5 * MM)


def test_coated_board_is_pollution_degree_1_under_the_coating():
    """IEC 60664-3 type 1 coating (from memory): pollution degree 1 under it. Printed wiring PD1:
    0.56 + 0.19 · 3/70 = 0.5681 mm basic, 1.1363 mm reinforced; Table F.2 PD1 at 4.0 kV:
    3.0 mm, so the creepage needed is the 3.0 mm clearance."""
    r = review_text(mains(barrier_on_board="true", coating="true"))
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0 * MM)
    assert "pollution degree 1" in r.sheet.get("isolation.clearance_needed").note
    # a coating off the board changes nothing
    r = review_text(mains(coating="true"))
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(5.06 * MM)


@pytest.mark.parametrize("test_voltage,outcome", [("2906 V", "pass"), ("2905 V", "fail")])
def test_barrier_test_voltage_for_reinforced(test_voltage, outcome):
    # IEC 60664-1 5.3.3.2.3 / 6.1.3.4 (from memory): 2 × (253 V + 1200 V) = 2906 V reinforced
    f = finding(review_text(mains(test_voltage=f'"{test_voltage}"')), "isolation.test-voltage")
    assert (f.outcome, f.severity) == (outcome, "hazard")


def test_barrier_test_voltage_for_basic():
    # class I, earthed: basic, 253 V + 1200 V = 1453 V
    r = review_text(mains(protective_class='"I"', touchable_earthed="true", test_voltage='"1453 V"'))
    assert finding(r, "isolation.test-voltage").outcome == "pass"
    assert r.sheet.value("isolation.test_voltage_needed") == pytest.approx(1453.0)


def test_pollution_degree_3_needs_more_creepage():
    # Table F.4, pollution degree 3, group III: 4.0 mm at 250 V, 5.0 mm at 320 V →
    # 4.0 + 1.0 · 3/70 = 4.0429 mm basic, 8.0857 mm reinforced at 253 V
    r = review_text(MAINS.replace("pollution_degree = 2", "pollution_degree = 3"))
    assert r.sheet.value("isolation.creepage_needed") == pytest.approx(8.0857 * MM, rel=1e-4)
    assert finding(r, "isolation.creepage").outcome == "fail"


def test_shunt_on_a_hazardous_bus_asks_about_its_signal():
    # a 340 V bus (beyond 120 V ripple-free DC) with a low-side shunt
    text = MAINS.replace('v_max = "29.6 V"', 'v_max = "340 V"')
    r = review_text(text)
    assert r.sheet.value("isolation.shunt_crosses") is True
    f = finding(r, "isolation.shunt-signal")
    assert f.outcome == "needs_data" and "grounding.shunt_isolated" in f.needs
    iso = text.replace('shunt = "low_side"', 'shunt = "low_side"\nshunt_isolated = true')
    assert finding(review_text(iso), "isolation.shunt-signal").outcome == "pass"
    bare = text.replace('shunt = "low_side"', 'shunt = "low_side"\nshunt_isolated = false')
    assert finding(review_text(bare), "isolation.shunt-signal").outcome == "fail"
    assert finding(review_file(example("mains_output_transformer")),
                   "isolation.shunt-signal").outcome == "not_applicable"


def test_within_elv_the_barrier_rules_do_not_apply():
    r = review_file(example("careful_12v_sine"))
    assert not r.beyond_elv
    for rid in ("isolation.grade", "isolation.creepage", "isolation.clearance",
                "isolation.test-voltage"):
        assert finding(r, rid).outcome == "not_applicable"
    assert r.sheet.value("isolation.required") == "functional"


@pytest.mark.parametrize("name", ["careful_12v_sine", "mains_output_transformer",
                                  "naive_bench_pchannel", "nchannel_bootstrap_quasi"])
def test_examples_isolation(name):
    assert_fails(review_file(example(name)), set(), area="isolation")


def test_grades_per_boundary_and_double_insulation():
    # class I with protective earth: basic to earthed parts, reinforced to unearthed ones
    r = review_file(example("mains_output_transformer"))
    assert r.sheet.value("isolation.required_to_earthed") == "basic"
    assert r.sheet.value("isolation.required_to_unearthed") == "reinforced"
    r = review_text(mains(protective_class='"II"'))
    assert r.sheet.value("isolation.required_to_earthed") == "reinforced"
    # double (basic + supplementary) counts as reinforced; supplementary alone as basic
    assert finding(review_text(mains(insulation='"double"')), "isolation.grade").outcome == "pass"
    assert finding(review_text(mains(insulation='"supplementary"')),
                   "isolation.grade").outcome == "fail"


def _output(text: str, v_rms: str) -> str:
    import re

    out, n = re.subn(r'(?m)^v_rms = .*$', f"v_rms = {v_rms}", text, count=1)
    assert n == 1
    return out


@pytest.mark.parametrize("working, computed", [('"1000 V"', True), ('"1001 V"', False)])
def test_creepage_threshold_at_the_end_of_table_f4(working, computed):
    # IEC 60664-1:2007 Table F.4 ends at a 1000 V working voltage: at it the last row applies,
    # beyond it nothing is extrapolated and the finding says why, in words
    r = review_text(mains(working_voltage=working))
    f = finding(r, "isolation.creepage")
    assert r.sheet.value("isolation.clearance_needed") == pytest.approx(3.0 * MM)  # 253 V system
    if computed:
        assert r.sheet.value("isolation.creepage_needed") is not None
        assert f.outcome in ("pass", "fail")
    else:
        assert f.outcome == "needs_data"
        assert "Table F.4" in " ".join(f.needs) and "qualified person" in " ".join(f.needs)


@pytest.mark.parametrize("v_rms", ['"1200 V"', '"990 V ± 5%"'])
def test_an_output_beyond_the_spacing_tables_is_not_judged(v_rms):
    # a system voltage above Table F.1's 1000 V (at every corner, or at some corners only):
    # clearance, creepage and test voltage need the standard itself, never a traceback
    r = review_text(_output(MAINS, v_rms))
    for key in ("isolation.clearance", "isolation.creepage", "isolation.test-voltage"):
        f = finding(r, key)
        assert f.outcome == "needs_data", (key, f.outcome)
        assert "IEC 60664-1" in " ".join(f.needs)
