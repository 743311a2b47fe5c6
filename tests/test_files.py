"""Files nobody trips over: kinds recognised, several designs reviewed past a bad one, output
folders checked before any work, the bundled examples never written to, identical bytes for
identical input with SOURCE_DATE_EPOCH.

Check values are the tests' own inputs and the conventions named: SOURCE_DATE_EPOCH is seconds
since 1970-01-01 UTC (reproducible-builds.org specification), so 1767225600 is
2026-01-01T00:00:00Z.
"""

from __future__ import annotations

import json
import shutil

import pytest

from reviewer import record as rec
from reviewer.cli import main
from tests.conftest import BUNDLED_EXAMPLES, EXAMPLES, designs_in, example
from tests.report.helpers import write_design, write_rules

ALL = designs_in(EXAMPLES)


@pytest.fixture
def folder(tmp_path):
    """The four example designs, a record beside one, a rule file and a broken design."""
    for p in ALL:
        shutil.copy(p, tmp_path / p.name)
    naive = tmp_path / "naive_bench_pchannel.toml"
    assert main(["decide", str(naive), "timing.no-dead-time", "--as", "will_change",
                 "--no-house-rules"]) == 0
    shutil.copy(EXAMPLES / "sample-house-rules" / "house.toml", tmp_path / "zz_rules.toml")
    return tmp_path


def test_check_skips_a_record_and_a_rule_file_with_one_note_each(folder, capsys):
    capsys.readouterr()
    paths = sorted(str(p) for p in folder.glob("*.toml"))
    assert len(paths) == 6
    assert main(["check", *paths, "--format", "json", "--no-house-rules"]) == 0
    out, err = capsys.readouterr()
    assert len(json.loads(out)["reviews"]) == 4
    notes = err.splitlines()
    assert notes == [
        f"note: {folder / 'naive_bench_pchannel.review.toml'} is the review record of "
        "naive_bench_pchannel.toml: skipped",
        f"note: {folder / 'zz_rules.toml'} is a rule file: skipped"], err


def test_one_bad_design_hides_no_other(folder, capsys):
    bad = folder / "bad.toml"
    bad.write_text(example("careful_12v_sine").read_text().replace('carrier = "20 kHz"',
                                                                    "carrier = nan"))
    capsys.readouterr()
    code = main(["check", *map(str, sorted(folder.glob("*.toml"))), "--format", "json",
                 "--no-house-rules"])
    out, err = capsys.readouterr()
    assert code == 2
    assert len(json.loads(out)["reviews"]) == 4  # every design that loads is reported
    errors = [x for x in err.splitlines() if x.startswith("error:")]
    assert len(errors) == 1 and f"{bad}:" in errors[0] and "modulation.carrier" in errors[0]


def test_only_a_record_is_an_error_not_a_silent_success(folder, capsys):
    capsys.readouterr()
    assert main(["check", str(folder / "naive_bench_pchannel.review.toml")]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ") and "review record of naive_bench_pchannel.toml" in err


def test_a_design_given_as_a_rule_file_or_a_record_says_what_it_is(tmp_path, capsys):
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    assert main(["check", str(design), "--rules", str(design)]) == 2
    assert "this is a design, not a rule file" in capsys.readouterr().err
    rec.record_path(design).write_text(design.read_text())
    assert main(["check", str(design), "--rules", str(rules)]) == 2
    err = capsys.readouterr().err
    assert "this is a design, not a review record" in err and "bridge.review.toml:" in err
    record = tmp_path / "other.review.toml"
    record.write_text('format = "bridge-reviewer/record"\nversion = 1\ndesign = "x.toml"\n')
    rec.record_path(design).unlink()
    assert main(["check", str(design), "--rules", str(record)]) == 2  # an error, not a skip
    err = capsys.readouterr().err
    assert "this is the review record of x.toml, not a rule file" in err and "note:" not in err


@pytest.mark.parametrize("argv", [
    ["check", "{design}", "-o", "{missing}/r.md", "--format", "markdown"],
    ["check", "{design}", "-o", "{missing}/r.json", "--format", "json"],
    ["check", "{design}", "-o", "{missing}/r.sarif", "--format", "sarif"],
    ["check", "{design}", "-o", "{tmp}", "--format", "json"],
    ["new", "{missing}/new.toml"],
])
def test_writing_into_a_missing_folder_is_exit_2(tmp_path, capsys, argv):
    design = write_design(tmp_path)
    args = [a.format(design=design, missing=tmp_path / "nope", tmp=tmp_path) for a in argv]
    assert main(args) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ") and "Traceback" not in err
    assert not (tmp_path / "nope").exists()


def test_the_walkthrough_export_into_a_missing_folder(tmp_path):
    """The walkthrough's export uses the same writer: a clear error, the folder not made."""
    from reviewer.commands._common import write
    from reviewer.errors import InputError

    with pytest.raises(InputError, match="does not exist"):
        write(tmp_path / "nope" / "r.md", "x", "report")


def test_source_date_epoch_gives_identical_bytes(tmp_path, monkeypatch, capsys):
    monkeypatch.setenv("SOURCE_DATE_EPOCH", "1767225600")
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    assert main(["decide", str(design), "house.bus-limit", "--as", "accepted", "--note", "n",
                 "--rules", str(rules), "--by", "ana"]) == 0
    first = rec.record_path(design).read_bytes()
    assert b'at = "2026-01-01T00:00:00Z"' in first
    assert main(["decide", str(design), "house.bus-limit", "--as", "accepted", "--note", "n",
                 "--rules", str(rules), "--by", "ana"]) == 0
    assert rec.record_path(design).read_bytes() == first
    capsys.readouterr()
    outputs = {}
    for fmt in ("json", "sarif", "markdown", "text"):
        runs = []
        for _ in range(2):
            assert main(["check", str(design), "--rules", str(rules), "--format", fmt,
                         "--color", "never"]) == 0
            runs.append(capsys.readouterr().out)
        assert runs[0] == runs[1], fmt
        outputs[fmt] = runs[0]
    assert "2026-01-01" in outputs["markdown"]


def test_examples_copy_and_records_of_bundled_designs(tmp_path, capsys, monkeypatch):
    """`examples --copy` copies designs and house rules, never a record; copying again is a
    no-op; a differing file is never overwritten. A decision on a bundled example itself goes
    to the user's data folder, never beside the example."""
    target = tmp_path / "mine"
    assert main(["examples", "--copy", str(target)]) == 0
    copied = sorted(p.relative_to(target).as_posix() for p in target.rglob("*.toml"))
    assert copied == sorted([*(p.name for p in designs_in(BUNDLED_EXAMPLES)),
                             "sample-house-rules/house.toml", "sample-house-rules/strict.toml"])
    assert main(["examples", "--copy", str(target)]) == 0
    (target / "careful_12v_sine.toml").write_text("# mine\n")
    assert main(["examples", "--copy", str(target)]) == 2
    assert (target / "careful_12v_sine.toml").read_text() == "# mine\n"
    capsys.readouterr()

    monkeypatch.setenv("XDG_DATA_HOME", str(tmp_path / "data"))  # other tests walk it too
    bundled = BUNDLED_EXAMPLES / "naive_bench_pchannel.toml"
    before = sorted(p.name for p in BUNDLED_EXAMPLES.iterdir())
    where = rec.record_path(bundled)
    assert where.parent != BUNDLED_EXAMPLES and "records" in where.parts
    assert where.is_relative_to(tmp_path / "data")
    assert main(["decide", str(bundled), "timing.no-dead-time", "--as", "will_change",
                 "--no-house-rules"]) == 0
    assert where.is_file() and sorted(p.name for p in BUNDLED_EXAMPLES.iterdir()) == before
    # and the record is read back from there
    assert main(["record", str(bundled), "--no-house-rules", "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert data["record_file"] == str(where)
    assert [d["key"] for d in data["decisions"]] == ["timing.no-dead-time"]
