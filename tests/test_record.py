"""The review record: round trip, atomic save, decision states across revisions.

Check values are the test's own inputs (what was written must come back); the 2 % re-confirmation
tolerance is this project's choice, tested at its threshold."""

import os

import pytest

from reviewer import record as rec
from reviewer.findings import Finding


def f(key="stress.vgs-rating", subject="high", outcome="fail", value=24.0, limit=20.0):
    return Finding(rule_id=key, subject=subject, area="stress", title="t", severity="hazard",
                   outcome=outcome, value=value, limit=limit, unit="V")


def test_round_trip(tmp_path):
    r = rec.Record(design="d.toml")
    r = rec.decide(r, f(), "accepted", "clamped by a zener on the next revision", "ana", "2026-12-01T10:00:00Z")
    r = rec.answer(r, "checklist.gate-loop", "yes", "checked on the schematic", "ana", "2026-12-01T10:01:00Z")
    r = rec.propose(r, "timing.dead_time", "800 ns", "try")
    path = tmp_path / "d.review.toml"
    rec.save(r, path)
    assert rec.load(path) == r
    text = path.read_text()
    assert 'format = "bridge-reviewer/record"' in text and "version = 1" in text


def test_stable_order(tmp_path):
    r = rec.Record(design="d.toml")
    r1 = rec.decide(rec.decide(r, f(subject="low"), "will_change", at="x"), f(subject="high"), "will_change", at="x")
    r2 = rec.decide(rec.decide(r, f(subject="high"), "will_change", at="x"), f(subject="low"), "will_change", at="x")
    assert rec.to_toml(r1) == rec.to_toml(r2)


def test_reason_required():
    for kind in ("accepted", "not_applicable"):
        with pytest.raises(rec.DecisionError):
            rec.decide(rec.Record(), f(), kind, "  ")
    with pytest.raises(rec.DecisionError):
        rec.decide(rec.Record(), f(), "maybe")


def test_failed_rename_leaves_previous_record(tmp_path, monkeypatch):
    path = tmp_path / "d.review.toml"
    first = rec.decide(rec.Record("d.toml"), f(), "will_change", at="x")
    rec.save(first, path)
    before = path.read_text()

    def boom(*a, **k):
        raise OSError("disk gone")

    monkeypatch.setattr(os, "replace", boom)
    with pytest.raises(OSError):
        rec.save(rec.decide(first, f(subject="low"), "will_change"), path)
    monkeypatch.undo()
    assert path.read_text() == before
    assert [p.name for p in tmp_path.iterdir()] == ["d.review.toml"]  # no temporary left behind


@pytest.mark.parametrize("new, expected", [
    (f(), "current"),
    (f(value=24.0 * 1.02), "current"),        # exactly at the 2 % tolerance
    (f(value=24.0 * 1.0201), "reconfirm"),     # just beyond it
    (f(limit=25.0), "reconfirm"),
    (f(outcome="pass", value=18.0), "resolved"),
    (None, "orphan"),
])
def test_states_across_revisions(new, expected):
    d = rec.decide(rec.Record(), f(), "accepted", "ok", at="x").decisions["stress.vgs-rating[high]"]
    assert rec.state(d, new) == expected


def test_bad_record_file(tmp_path):
    from reviewer.errors import InputError

    path = tmp_path / "d.review.toml"
    path.write_text('format = "bridge-reviewer/record"\nversion = 9\n')
    with pytest.raises(InputError) as e:
        rec.load(path)
    assert e.value.problems[0].line == 2 and "version" in e.value.problems[0].path
    path.write_text('format = "bridge-reviewer/record"\nversion = 1\n[[decision]]\nkey = "a"\nkind = "perhaps"\n')
    with pytest.raises(InputError) as e:
        rec.load(path)
    assert e.value.problems[0].line == 5


def test_absent_record_is_empty(tmp_path):
    assert rec.load(tmp_path / "none.review.toml", "d.toml") == rec.Record("d.toml")
    assert rec.record_path("x/d.toml").name == "d.review.toml"
