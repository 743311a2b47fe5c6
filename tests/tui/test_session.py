"""The walkthrough's state without a screen: order, decisions saved at once, answers, what-if,
export, bad files. Check values are the tests' own inputs read back from the files written, and
the example designs' documented faults (the naive bench build has no dead time)."""

from __future__ import annotations

import pytest

from reviewer import record as rec
from reviewer.findings import SEVERITIES
from reviewer.record import DecisionError
from reviewer.tui.session import Walk


def opened(path) -> Walk:
    walk = Walk.open(path, reviewer="tester")
    walk.install(walk.refresh())
    return walk


def test_grouped_by_area_and_ordered_by_severity(naive):
    walk = opened(naive)
    items = walk.items()
    areas = [i.area for i in items]
    blocks = [a for n, a in enumerate(areas) if n == 0 or areas[n - 1] != a]
    assert len(blocks) == len(set(blocks)), "each area is one block"
    for area in blocks:
        fails = [SEVERITIES.index(i.finding.severity) for i in items
                 if i.area == area and i.outcome == "fail"]
        assert fails == sorted(fails)
    assert all(i.outcome in ("fail", "open", "needs_data") for i in items)
    walk.show_passed = True
    assert len(walk.items()) == len(walk.review.findings)


def test_decisions_are_saved_at_once(naive):
    walk = opened(naive)
    first = walk.next_undecided(None)
    walk.decide(first, "will_change")
    on_disk = rec.load(rec.record_path(naive))
    assert on_disk.decisions[first].kind == "will_change"
    assert on_disk.decisions[first].reviewer == "tester"
    with pytest.raises(DecisionError):
        walk.decide(first, "accepted", "  ")
    hazard = walk.item(first).finding.severity == "hazard"
    if hazard:  # accepting a hazard asks who accepts it, as well as why
        with pytest.raises(DecisionError, match="who accepts"):
            walk.decide(first, "accepted", "clamped on the next revision")
    walk.decide(first, "accepted", "clamped on the next revision", "A. Lead, design owner")
    walk.note(first, "clamped by a zener on revision 2")
    on_disk = rec.load(rec.record_path(naive))
    assert on_disk.decisions[first].kind == "accepted"
    assert on_disk.decisions[first].reason == "clamped by a zener on revision 2"
    assert on_disk.decisions[first].accepted_by == "A. Lead, design owner"
    assert walk.next_undecided(first) != first


def test_answer_closes_the_question(naive):
    walk = opened(naive)
    question = next(i for i in walk.items() if i.is_question and i.outcome == "open")
    open_before = walk.tally()["open"]
    walk.answer(question.finding.rule_id, "yes", "checked on the schematic")
    walk.install(walk.refresh())
    assert rec.load(rec.record_path(naive)).answers[question.finding.rule_id].answer == "yes"
    assert walk.review.finding(question.key).outcome == "answered"
    assert walk.tally()["open"] == open_before - 1


def test_whatif_changes_findings_not_the_file(naive):
    walk = opened(naive)
    before = naive.read_bytes()
    assert walk.review.finding("timing.no-dead-time").outcome == "fail"
    assert walk.check_proposal("timing.dead_time", "800 nF")  # wrong unit: refused
    assert walk.check_proposal("timing.dead_time", "800 ns") == []
    # the example feeds each leg one signal and its inverse, so dead time needs both changes
    walk.propose("drive.shared_signal", "false")
    walk.propose("timing.dead_time", "800 ns", "try a hardware dead time")
    walk.install(walk.refresh())
    item = walk.item("timing.no-dead-time")
    assert item.filed.outcome == "fail" and item.current.outcome == "pass" and item.changed
    assert walk.review.design.timing.dead_time.typ == pytest.approx(800e-9)
    saved = rec.load(rec.record_path(naive)).proposals
    assert saved["timing.dead_time"].value == "800 ns"
    assert saved["timing.dead_time"].note == "try a hardware dead time"
    assert naive.read_bytes() == before
    walk.withdraw("timing.dead_time")
    walk.withdraw("drive.shared_signal")
    walk.install(walk.refresh())
    assert walk.review.finding("timing.no-dead-time").outcome == "fail"
    assert rec.load(rec.record_path(naive)).proposals == {}


def test_export_marks_proposals_and_refuses_the_design(naive, tmp_path):
    walk = opened(naive)
    walk.propose("drive.shared_signal", "false")
    walk.install(walk.refresh())
    out = walk.export(tmp_path / "report.md")
    text = out.read_text(encoding="utf-8")
    assert text.startswith("# ") and "First bench inverter, 24 V" in text
    assert "drive.shared_signal" in text and "propos" in text.lower()
    assert "## What the proposed changes would do (what-if)" in text
    with pytest.raises(Exception):
        walk.export(naive)
    assert naive.read_text(encoding="utf-8").startswith("#")


def test_bad_design_is_located(broken):
    walk = opened(broken)
    line = int(broken.with_suffix(".line").read_text())
    assert not walk.snapshot.ok
    (p,) = walk.snapshot.problems
    assert p.line == line and p.path == "switch.high.vds_rating"
    assert walk.items() == [] and walk.tally() == {}


def test_notices_a_changed_design(naive):
    import os

    walk = opened(naive)
    assert walk.changed_on_disk() == (False, False)
    st = naive.stat()
    os.utime(naive, (st.st_atime, st.st_mtime + 5))
    assert walk.changed_on_disk()[0] is True


def test_walk_applies_project_house_rules(tmp_path):
    # the walk sees the same rules as `reviewer check`: a project house-rules folder beside the
    # design switches a built-in rule off, with its reason
    import shutil

    from tests.conftest import example

    design = tmp_path / "d.toml"
    shutil.copy(example("careful_12v_sine"), design)
    (tmp_path / "house-rules").mkdir()
    (tmp_path / "house-rules" / "team.toml").write_text(
        '[[disable]]\nid = "stress.vds-headroom"\nreason = "our parts are all 60 V"\n')
    review = opened(design).review
    assert [d.rule_id for d in review.disabled] == ["stress.vds-headroom"]
    assert all(f.rule_id != "stress.vds-headroom" for f in review.findings)
