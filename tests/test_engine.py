"""The engine's outcomes: limit at its threshold, flags, questions, needs data, not applicable.

Values here are arithmetic on the test's own inputs (a rule judged against a number it was given);
no physics is checked in this file."""

from pathlib import Path

import pytest

from reviewer.design import parse_design
from reviewer.review import review_design
from reviewer.rulebook import load_rulebook
from tests.conftest import finding
from tests.design.test_loader import MINIMAL

RULES = """
area = "test"

[[rule]]
id = "test.bus-limit"
title = "Bus at most 14 V"
severity = "risk"
value = "op.bus_max"
at_most = "14 V"
pass = { value = "limit", unit = "V", field = "source.v_max" }
why = "test"
mitigation = "Lower the bus to {pass_value}; it is {value}, margin {margin}."

[[rule]]
id = "test.p-high"
title = "High side is not P-channel"
severity = "advice"
fails_when = "design.switch.high.polarity == 'p'"
why = "test"

[[rule]]
id = "test.fuse"
title = "Fuse rating at least 1 A"
severity = "hazard"
value = "design.fuse.rating"
at_least = "1 A"
why = "test"

[[rule]]
id = "test.only-square"
title = "Square only"
severity = "advice"
applies = "design.modulation.kind == 'quasi_square'"
value = "op.bus_nom"
at_most = "1 V"
why = "test"

[[rule]]
id = "test.loop-short"
title = "Gate loop short"
severity = "risk"
ask = "Is every gate loop short and tight?"
why = "test"
mitigation = "Shorten it."
"""


def run(tmp_path: Path, extra_design: str = "", bus_max: str = "14 V"):
    rules = tmp_path / "house.toml"
    rules.write_text(RULES)
    text = MINIMAL.replace('v_nom = "12 V"', f'v_nom = "12 V"\nv_max = "{bus_max}"') + extra_design
    book = load_rulebook([rules])
    return review_design(parse_design(text, "d.toml"), "d.toml", book)


def test_limit_exactly_at_threshold_passes(tmp_path):
    assert finding(run(tmp_path, bus_max="14 V"), "test.bus-limit").outcome == "pass"


def test_limit_just_beyond_fails_with_text(tmp_path):
    f = finding(run(tmp_path, bus_max="14.01 V"), "test.bus-limit")
    assert f.outcome == "fail" and f.margin == pytest.approx(-0.01)
    assert f.pass_solved == 14.0 and f.pass_field == "source.v_max"
    # the verified pass value (14 V less a 0.5 % margin, rounded down) and a value shown with
    # the digits that tell it from the 14 V limit
    assert f.mitigation.startswith("Lower the bus to 13.9 V; it is 14.01 V, margin -10 mV. "
                                   "Checked: reviewed again with source.v_max = 13.9 V")


def test_flag(tmp_path):
    assert finding(run(tmp_path), "test.p-high").outcome == "pass"
    rules = tmp_path / "house.toml"
    rules.write_text(RULES)
    text = MINIMAL.replace("[switch.high]\n", '[switch.high]\npolarity = "p"\n')
    r = review_design(parse_design(text, "d.toml"), "d.toml", load_rulebook([rules]))
    assert finding(r, "test.p-high").outcome == "fail"


def test_needs_data_names_the_field(tmp_path):
    f = finding(run(tmp_path), "test.fuse")
    assert f.outcome == "needs_data" and f.needs == ("fuse.rating",)
    f = finding(run(tmp_path, '\n[fuse]\nrating = "0.5 A"\n'), "test.fuse")
    assert f.outcome == "fail"


def test_not_applicable(tmp_path):
    assert finding(run(tmp_path), "test.only-square").outcome == "not_applicable"


@pytest.mark.parametrize("answer, outcome", [
    (None, "open"), ('"yes"', "answered"), ('"no"', "fail"),
    ('{ answer = "not_applicable", note = "no gate loop" }', "not_applicable"),
])
def test_questions_are_never_silently_passed(tmp_path, answer, outcome):
    extra = f'\n[checklist]\n"test.loop-short" = {answer}\n' if answer else ""
    f = finding(run(tmp_path, extra), "test.loop-short")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.mitigation == "Shorten it."
