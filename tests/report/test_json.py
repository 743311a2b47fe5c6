"""The JSON report against its own JSON Schema (reviewer/report/review.schema.json).

The schema is checked as a valid draft 2020-12 schema with the jsonschema library (a reference
implementation of the JSON Schema specification); every example design's report, and a report
carrying decisions in every state, must validate; reports broken on purpose must not."""

import copy
import json

import pytest
from jsonschema import Draft202012Validator

from reviewer.cli import main
from tests.conftest import EXAMPLES, designs_in
from tests.report.helpers import write_design, write_rules

ALL = designs_in(EXAMPLES)


@pytest.fixture(scope="module")
def validator():
    from reviewer.report.json import schema

    s = schema()
    Draft202012Validator.check_schema(s)
    return Draft202012Validator(s)


def errors(validator, data):
    return [f"{list(e.absolute_path)}: {e.message}" for e in validator.iter_errors(data)]


@pytest.mark.parametrize("path", ALL, ids=lambda p: p.stem)
def test_every_example_validates(path, validator, capsys):
    assert main(["check", str(path), "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    assert errors(validator, data) == []


def test_one_envelope_for_one_or_several_designs(validator, capsys):
    for paths in (ALL[:1], ALL[:2]):
        assert main(["check", *map(str, paths), "--format", "json"]) == 0
        data = json.loads(capsys.readouterr().out)
        assert list(data) == ["format", "version", "reviews"]
        assert data["format"] == "bridge-reviewer/review" and data["version"] == 2
        assert [r["design"]["file"] for r in data["reviews"]] == list(map(str, paths))
        assert errors(validator, data) == []


def test_relations_are_words(capsys):
    assert main(["check", str(ALL[0]), "--format", "json"]) == 0
    findings = json.loads(capsys.readouterr().out)["reviews"][0]["findings"]
    relations = {f["relation"] for f in findings}
    assert relations <= {"at_most", "at_least", ""} and {"at_most", "at_least"} <= relations


@pytest.fixture
def with_record(tmp_path, capsys):
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    for key, kind in (("house.bus-limit", "accepted"), ("house.power-cap[high]", "will_change"),
                      ("house.power-cap[low]", "not_applicable")):
        main(["decide", str(design), key, "--as", kind, "--note", "n", "--rules", str(rules)])
    main(["answer", str(design), "house.gate-loop-short", "no", "--note", "long", "--rules",
          str(rules)])
    design.write_text(design.read_text().replace('power = "40 W"', 'power = "20 W"')
                      .replace('v_max = "24 V"', 'v_max = "26 V"'))
    write_rules(tmp_path, rename={"house.power-cap": "house.power-limit"})
    capsys.readouterr()
    assert main(["check", str(design), "--rules", str(rules), "--format", "json"]) == 0
    return json.loads(capsys.readouterr().out)


def test_record_in_every_state_validates(with_record, validator):
    [data] = with_record["reviews"]
    states = {d["key"]: d["state"] for d in data["record"]["decisions"]}
    assert states == {"house.bus-limit": "reconfirm", "house.power-cap[high]": "orphan",
                      "house.power-cap[low]": "orphan"}
    assert data["record"]["orphans"] == ["house.power-cap[high]", "house.power-cap[low]"]
    q = next(f for f in data["findings"] if f["key"] == "house.gate-loop-short")
    assert q["outcome"] == "fail" and q["answer_note"] == "long"
    assert errors(validator, with_record) == []


@pytest.mark.parametrize("breaks", [
    lambda d: d.update(version=1),
    lambda d: d["reviews"][0]["findings"][0].update(severity="fatal"),
    lambda d: d["reviews"][0]["findings"][0].update(outcome="maybe"),
    lambda d: d["reviews"][0]["findings"][0].update(relation="≤"),
    lambda d: d["reviews"][0]["findings"][0].pop("margin"),
    lambda d: d["reviews"][0]["record"]["decisions"][0].update(state="stale"),
    lambda d: d["reviews"][0]["record"]["decisions"][0].update(kind="perhaps"),
    lambda d: d["reviews"][0]["sheet"][0].update(name="Not A Name"),
    lambda d: d["reviews"][0].update(extra=1),
    lambda d: d.update(extra=1),
    lambda d: d.update(reviews=d["reviews"][0]),
])
def test_broken_reports_do_not_validate(with_record, validator, breaks):
    data = copy.deepcopy(with_record)
    breaks(data)
    assert errors(validator, data) != []


def test_schema_command_prints_it(capsys):
    assert main(["schema", "--of", "review"]) == 0
    s = json.loads(capsys.readouterr().out)
    assert s["title"].startswith("Bridge Reviewer review")
    assert s["properties"]["version"] == {"const": 2}
