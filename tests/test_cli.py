"""The command line end to end on every example design: exit statuses, formats, bad input."""

import json
import subprocess
import sys

import pytest

from reviewer.cli import main
from tests.conftest import EXAMPLES, example

ALL = sorted(EXAMPLES.glob("*.toml"))


def reviewer(*args: str) -> subprocess.CompletedProcess:
    return subprocess.run([sys.executable, "-m", "reviewer.cli", *args], capture_output=True,
                          text=True, timeout=120)


@pytest.mark.parametrize("path", ALL, ids=lambda p: p.stem)
def test_check_every_example_as_json(path, capsys):
    assert main(["check", str(path), "--format", "json"]) == 0
    envelope = json.loads(capsys.readouterr().out)
    assert envelope["format"] == "bridge-reviewer/review" and envelope["version"] == 2
    [data] = envelope["reviews"]
    assert data["design"]["file"] == str(path)
    outcomes = {f["outcome"] for f in data["findings"]}
    assert outcomes <= {"fail", "pass", "needs_data", "open", "answered", "not_applicable"}
    for f in data["findings"]:
        assert f["rule_id"] and f["severity"] in ("hazard", "risk", "advice")
        if f["outcome"] == "fail" and f["value"] is not None:
            assert f["margin"] < 0 and f["limit"] is not None


@pytest.mark.parametrize("path", ALL, ids=lambda p: p.stem)
def test_check_text_and_markdown(path, capsys):
    assert main(["check", str(path), "--color", "never"]) == 0
    out = capsys.readouterr().out
    assert "aid, not an approval" in out
    assert main(["check", str(path), "--format", "markdown"]) == 0
    md = capsys.readouterr().out
    assert md.startswith("# Design review:") and "## Appendix: calculation sheet" in md


def test_several_designs_in_one_call(capsys):
    assert main(["check", *map(str, ALL), "--format", "json"]) == 0
    assert len(json.loads(capsys.readouterr().out)["reviews"]) == len(ALL)


def test_beyond_elv_design_carries_the_caution(capsys):
    main(["check", str(example("mains_output_transformer")), "--color", "never"])
    out = capsys.readouterr().out
    assert "beyond extra-low voltage" in out and "qualified person" in out
    main(["check", str(example("careful_12v_sine")), "--color", "never"])
    assert "CAUTION" not in capsys.readouterr().out


def test_fail_on_levels(capsys):
    naive = str(example("naive_bench_pchannel"))
    assert main(["check", naive, "--fail-on", "hazard"]) == 1
    careful = str(example("careful_12v_sine"))
    assert main(["check", careful, "--fail-on", "hazard"]) == 0


def test_output_file(tmp_path, capsys):
    out = tmp_path / "r.md"
    assert main(["check", str(example("careful_12v_sine")), "--format", "markdown", "-o", str(out)]) == 0
    assert out.read_text().startswith("# Design review:")


def test_bad_input_exit_2_without_traceback(tmp_path):
    bad = tmp_path / "bad.toml"
    bad.write_text('[design]\ntitle = "x"\n[source]\nv_nom = "12 F"\n')
    p = reviewer("check", str(bad))
    assert p.returncode == 2
    assert "Traceback" not in p.stderr
    assert f"{bad}:4: source.v_nom:" in p.stderr
    p = reviewer("check", str(tmp_path / "missing.toml"))
    assert p.returncode == 2 and "no such file" in p.stderr and "Traceback" not in p.stderr


def test_sheet_text_and_json(capsys):
    assert main(["sheet", str(example("careful_12v_sine"))]) == 0
    assert "op.bus_max" in capsys.readouterr().out
    assert main(["sheet", str(example("careful_12v_sine")), "--format", "json"]) == 0
    rows = json.loads(capsys.readouterr().out)
    assert {r["name"] for r in rows} >= {"op.bus_max", "band.bus_peak"}


def test_schema_is_json(capsys):
    assert main(["schema"]) == 0
    assert json.loads(capsys.readouterr().out)["title"] == "Bridge Reviewer design file"


def test_new_writes_a_design_that_loads_and_refuses_to_overwrite(tmp_path, capsys):
    target = tmp_path / "mine.toml"
    assert main(["new", str(target)]) == 0
    assert main(["check", str(target)]) == 0
    assert main(["new", str(target)]) == 2


def test_examples_listed(capsys):
    assert main(["examples"]) == 0
    assert "careful_12v_sine.toml" in capsys.readouterr().out


def test_bare_reviewer_prints_usage_and_exits_2(capsys):
    assert main([]) == 2
    assert "usage: reviewer" in capsys.readouterr().err


def test_mistyped_command_gets_a_suggestion(capsys):
    assert main(["chek", "x.toml"]) == 2
    assert "did you mean 'check'" in capsys.readouterr().err


def test_every_command_and_argument_has_help():
    from reviewer.cli import _parser

    parser, _ = _parser()
    sub = next(a for a in parser._actions if a.__class__.__name__ == "_SubParsersAction")
    assert all(c.help for c in sub._choices_actions)
    for name, sp in sub.choices.items():
        missing = [a.dest for a in sp._actions if not a.help]
        assert not missing, f"{name}: {missing}"


def test_keys_without_brackets_and_one_reviewer_option(tmp_path, capsys):
    import shutil

    from reviewer import record as rec

    design = tmp_path / "bench.toml"
    shutil.copy(example("naive_bench_pchannel"), design)
    assert main(["decide", str(design), "timing.shoot-through.high", "--as", "will_change",
                 "--reviewer", "ana"]) == 0
    assert main(["decide", str(design), "timing.shoot-through.low", "--as", "will_change",
                 "--by", "bo"]) == 0  # the old name still works
    decisions = rec.load(rec.record_path(design)).decisions
    assert decisions["timing.shoot-through[high]"].reviewer == "ana"
    assert decisions["timing.shoot-through[low]"].reviewer == "bo"
    # accepting a hazard keeps who accepts it: the reviewer unless someone else is named
    assert main(["decide", str(design), "timing.no-dead-time", "--as", "accepted",
                 "--note", "bench only", "--reviewer", "ana"]) == 0
    assert "--accepted-by" in capsys.readouterr().err
    assert rec.load(rec.record_path(design)).decisions["timing.no-dead-time"].accepted_by == "ana"
    assert main(["decide", str(design), "timing.no-dead-time", "--as", "accepted",
                 "--note", "bench only", "--accepted-by", "A. Lead, owner"]) == 0
    d = rec.load(rec.record_path(design)).decisions["timing.no-dead-time"]
    assert d.accepted_by == "A. Lead, owner"
    # an answer the design file contradicts is flagged at once
    assert main(["answer", str(design), "checklist.dead-time-enforced", "yes"]) == 0
    assert "contradicts the design file" in capsys.readouterr().err


def test_new_starter_reaches_every_check_and_names_its_placeholders(tmp_path, capsys):
    """The full starter has every table: no check lacks data, the shoot-through checks run.
    Its invented values are listed until replaced; the thin one is still there."""
    from reviewer.report.placeholders import unchanged
    from reviewer.review import review_file

    target = tmp_path / "mine.toml"
    assert main(["new", str(target)]) == 0
    r = review_file(target, use_record=False)
    assert not r.by_outcome("needs_data")
    shoot = [f for f in r.findings if f.rule_id == "timing.shoot-through"]
    assert shoot and all(f.outcome in ("pass", "fail") for f in shoot)
    left = unchanged(target)
    assert "switch.high.vds_rating" in left and "design.title" in left
    lines = target.read_text(encoding="utf-8").splitlines()
    i = next(n for n, line in enumerate(lines) if line.startswith("vds_rating"))  # switch.high
    lines[i] = 'vds_rating = "60 V"'
    target.write_text("\n".join(lines) + "\n", encoding="utf-8")
    after = unchanged(target)
    assert "switch.high.vds_rating" not in after and len(after) == len(left) - 1
    capsys.readouterr()
    assert main(["check", str(target), "--color", "never"]) == 0
    assert "placeholder values are still as the starter wrote them" in capsys.readouterr().out
    thin = tmp_path / "thin.toml"
    assert main(["new", str(thin), "--minimal"]) == 0
    assert len(thin.read_text(encoding="utf-8")) < len(target.read_text(encoding="utf-8")) / 3
    assert not unchanged(thin)
    review_file(thin, use_record=False)  # loads


def test_shell_completion_script_and_no_cost_elsewhere(capsys):
    assert main(["completion", "bash"]) == 0
    script = capsys.readouterr().out
    for name in ("check", "walk", "decide", "--fail-on"):
        assert name in script
    probe = ("import sys, reviewer.cli as c; c.main(['check', sys.argv[1], '--format', 'json']); "
             "print('shtab' in sys.modules, 'textual' in sys.modules)")
    out = subprocess.run([sys.executable, "-c", probe, str(example("careful_12v_sine"))],
                         capture_output=True, text=True, timeout=120).stdout.splitlines()[-1]
    assert out == "False False"  # neither the completion library nor Textual on check's path


def test_fail_on_counts_a_contradicted_answer(tmp_path, capsys):
    """A "yes" the design file contradicts is not a pass: --fail-on hazard fails on it even
    where every finding is settled. The careful example says enforced_in = "hardware"; changed
    to "firmware" its "yes" is contradicted."""
    import shutil

    design = tmp_path / "c.toml"
    shutil.copy(example("careful_12v_sine"), design)
    assert main(["answer", str(design), "checklist.dead-time-enforced", "yes"]) == 0
    assert main(["check", str(design), "--fail-on", "hazard"]) == 0
    design.write_text(design.read_text(encoding="utf-8").replace(
        'enforced_in = "hardware"', 'enforced_in = "firmware"'), encoding="utf-8")
    capsys.readouterr()
    assert main(["check", str(design), "--fail-on", "hazard"]) == 1
    assert "contradict" in capsys.readouterr().out
