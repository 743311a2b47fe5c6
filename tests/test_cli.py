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
