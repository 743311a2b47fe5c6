"""The record under concurrent writers and failed saves.

Two writers start from the same record; each saves with the record it read as the base. Changes
to different findings merge; the same finding changed differently by both is refused with the
file untouched; interrupted, refused and full-disk writes keep the previous file byte for byte.
Check values are the test's own inputs: what each writer decided must be on disk afterwards.
"""

from __future__ import annotations

import errno
import os

import pytest

from reviewer import atomic
from reviewer import record as rec
from reviewer.cli import main
from reviewer.findings import Finding
from tests.report.helpers import write_design, write_rules


def f(subject: str, value: float = 24.0) -> Finding:
    return Finding(rule_id="stress.vgs-rating", subject=subject, area="stress", title="t",
                   severity="hazard", outcome="fail", value=value, limit=20.0, unit="V")


@pytest.fixture
def shared(tmp_path):
    """A record on disk with one decision, read by two writers."""
    path = tmp_path / "d.review.toml"
    start = rec.decide(rec.Record(design="d.toml"), f("high"), "will_change", at="t0")
    rec.save(start, path)
    return path, rec.load(path), rec.load(path)


def test_changes_to_different_findings_merge(shared):
    path, a, b = shared
    a2 = rec.decide(a, f("low"), "accepted", "clamped", "ana", at="t1")
    written_a = rec.save(a2, path, base=a)
    b2 = rec.answer(b, "checklist.gate-loop", "yes", "", "ben", at="t2")
    b2 = rec.decide(b2, f("high"), "accepted", "zener fitted", "ben", at="t2")
    written_b = rec.save(b2, path, base=b)
    on_disk = rec.load(path)
    assert on_disk == written_b
    assert on_disk.decisions["stress.vgs-rating[low]"].reason == "clamped"  # a's, kept
    assert on_disk.decisions["stress.vgs-rating[high]"].reason == "zener fitted"  # b's
    assert on_disk.answers["checklist.gate-loop"].reviewer == "ben"
    assert written_a != written_b


def test_same_finding_changed_by_both_is_refused_and_nothing_written(shared):
    path, a, b = shared
    rec.save(rec.decide(a, f("high"), "accepted", "clamped", "ana", at="t1"), path, base=a)
    before = path.read_bytes()
    with pytest.raises(rec.RecordConflict, match=r"decision stress.vgs-rating\[high\]"):
        rec.save(rec.decide(b, f("high"), "not_applicable", "no gate", "ben", at="t2"), path,
                 base=b)
    assert path.read_bytes() == before


def test_same_change_by_both_is_no_conflict(shared):
    path, a, b = shared
    same = rec.decide(a, f("high"), "accepted", "clamped", "ana", at="t1")
    rec.save(same, path, base=a)
    assert rec.save(rec.decide(b, f("high"), "accepted", "clamped", "ana", at="t1"), path,
                    base=b) == same


def test_a_removal_by_one_writer_merges(shared):
    path, a, b = shared
    rec.save(rec.forget(a, "stress.vgs-rating[high]"), path, base=a)
    merged = rec.save(rec.answer(b, "q", "no", "", "ben", at="t2"), path, base=b)
    assert "stress.vgs-rating[high]" not in merged.decisions and "q" in merged.answers


def test_a_record_that_no_longer_loads_is_not_overwritten(shared):
    path, a, _ = shared
    path.write_text("this is [ not a record\n")
    with pytest.raises(rec.RecordConflict, match="no longer loads"):
        rec.save(rec.decide(a, f("low"), "will_change", at="t1"), path, base=a)
    assert path.read_text() == "this is [ not a record\n"


def test_two_decide_commands_on_one_design_both_land(tmp_path, capsys, monkeypatch):
    """The command line's decide reads, then saves with what it read as the base: a decision
    saved in between (another terminal, a walkthrough) is kept."""
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    real_save = rec.save

    def meanwhile(record, path, base=None):
        # another writer saves its decision after this command read the record
        other = rec.decide(rec.load(path, "bridge.toml"), f("other"), "will_change", at="t9")
        real_save(other, path)
        return real_save(record, path, base=base)

    monkeypatch.setattr(rec, "save", meanwhile)
    assert main(["decide", str(design), "house.bus-limit", "--as", "will_change",
                 "--rules", str(rules)]) == 0
    monkeypatch.setattr(rec, "save", real_save)
    keys = set(rec.load(rec.record_path(design)).decisions)
    assert keys == {"house.bus-limit", "stress.vgs-rating[other]"}


def _fails_at(monkeypatch, name: str, exc: BaseException) -> None:
    def boom(*a, **k):
        raise exc

    monkeypatch.setattr(atomic.os if name != "mkstemp" else atomic.tempfile, name, boom)


@pytest.mark.parametrize("where, exc", [
    ("fsync", OSError(errno.ENOSPC, "No space left on device")),  # a full disk
    ("replace", KeyboardInterrupt()),  # interrupted between write and rename
    ("mkstemp", PermissionError(errno.EACCES, "Permission denied")),  # read-only folder
])
def test_failed_saves_keep_the_previous_file(shared, monkeypatch, where, exc):
    path, a, _ = shared
    before = path.read_bytes()
    _fails_at(monkeypatch, where, exc)
    with pytest.raises(type(exc)):
        rec.save(rec.decide(a, f("low"), "will_change", at="t1"), path, base=a)
    monkeypatch.undo()
    assert path.read_bytes() == before
    assert [p.name for p in path.parent.iterdir()] == [path.name]  # no temporary left behind


def test_decide_on_a_full_disk_is_a_clear_error(tmp_path, capsys, monkeypatch):
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    _fails_at(monkeypatch, "fsync", OSError(errno.ENOSPC, "No space left on device"))
    assert main(["decide", str(design), "house.bus-limit", "--as", "will_change",
                 "--rules", str(rules)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ") and "No space left on device" in err
    assert "previous file is kept" in err
    assert not rec.record_path(design).exists()


@pytest.mark.skipif(os.name != "posix" or os.geteuid() == 0,
                    reason="POSIX permissions, not as root (root writes anywhere)")
def test_read_only_folder_keeps_the_record(shared):
    path, a, _ = shared
    before = path.read_bytes()
    os.chmod(path.parent, 0o500)
    try:
        with pytest.raises(PermissionError):
            rec.save(rec.decide(a, f("low"), "will_change", at="t1"), path, base=a)
    finally:
        os.chmod(path.parent, 0o700)
    assert path.read_bytes() == before
