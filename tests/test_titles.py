"""Failing findings are headed with the problem, passed ones with the condition that holds, in
every view; a rule with one title is headed "Not met: " when it fails."""

from __future__ import annotations

import json


from reviewer.findings import Finding
from tests.variants import example_review

PROBLEM = "No dead time between the switches of a leg"
CONDITION = "The controller leaves a dead time between the switches of a leg"


def test_every_built_in_rule_has_a_failing_title_unlike_its_title(book):
    for rule in book.rules:
        assert rule.fail_title, rule.id
        assert rule.fail_title.lower() != rule.title.lower(), rule.id


def test_heading_follows_the_outcome():
    f = Finding("a.b", "", "a", "Fuse protects the wire", "hazard", "fail",
                fail_title="Fuse does not protect the wire")
    assert f.heading == "Fuse does not protect the wire"
    assert Finding("a.b", "", "a", "T", "risk", "pass", fail_title="F").heading == "T"
    assert Finding("a.b", "", "a", "T", "risk", "open", fail_title="F").heading == "F"
    assert Finding("a.b", "", "a", "Bus below 30 V", "risk", "fail").heading == \
        "Not met: Bus below 30 V"


def test_a_house_rule_with_one_title_reads_not_met(tmp_path):
    from reviewer.review import review_file
    from tests.conftest import example

    house = tmp_path / "house.toml"
    house.write_text('''
[[rule]]
id = "house.bus-low"
title = "Bus at most 5 V"
severity = "advice"
value = "op.bus_max"
at_most = "5 V"
why = "A house limit for the test."
reference = "House practice"
''', encoding="utf-8")
    r = review_file(example("nchannel_bootstrap_quasi"), [house], use_record=False)
    f = r.finding("house.bus-low")
    assert f.outcome == "fail" and f.heading == "Not met: Bus at most 5 V"


def _naive():
    return example_review("naive_bench_pchannel")


def _careful_passes(title: str) -> None:
    r = example_review("careful_12v_sine")
    assert any(f.outcome == "pass" and f.title == title for f in r.findings)


def test_text_view_heads_a_failure_with_the_problem():
    from reviewer.report import text

    out = text.render([_naive()])
    assert PROBLEM in out
    assert CONDITION not in out


def test_markdown_heads_failures_with_problems_and_passes_with_conditions():
    from reviewer.report import markdown

    r = example_review("careful_12v_sine")
    md = markdown.render([_naive(), r], review_date="2026-12-03")
    assert f"HAZARD: {PROBLEM}" in md
    assert CONDITION in md  # the careful design passes it: its passed list says so
    _careful_passes(CONDITION)


def test_json_carries_the_heading():
    from reviewer.report import json as report_json

    data = report_json.to_data(_naive())
    f = next(x for x in data["findings"] if x["key"] == "timing.no-dead-time")
    assert f["heading"] == PROBLEM and f["title"] == CONDITION
    passed = next(x for x in data["findings"] if x["outcome"] == "pass")
    assert passed["heading"] == passed["title"]
    json.dumps(data)


def test_sarif_message_states_the_problem():
    from reviewer.report import sarif

    data = sarif.to_data([_naive()])
    messages = [res["message"]["text"] for run in data["runs"] for res in run["results"]]
    assert any(m.startswith(f"HAZARD: {PROBLEM}") for m in messages)
    assert not any(CONDITION in m for m in messages)


async def test_walkthrough_detail_heads_with_the_problem(tmp_path):
    import shutil

    from reviewer.tui.app import WalkApp
    from reviewer.tui.session import Walk
    from tests.conftest import example

    target = tmp_path / "bench.toml"
    shutil.copy(example("naive_bench_pchannel"), target)
    app = WalkApp(Walk.open(target, reviewer="tester"), poll=0)
    async with app.run_test(size=(120, 40)) as pilot:
        await app.workers.wait_for_complete()
        await pilot.pause()
        item = app.walk.item("timing.no-dead-time")
        from reviewer.tui import views

        assert PROBLEM in views.detail(app.walk, item).plain
        assert CONDITION not in views.detail(app.walk, item).plain
