"""The record commands end to end: decide, answer, record, with did-you-mean and reasons.

Check values are the test's own inputs (what is written must come back) and the house rules'
own limits in tests/data (invented test data, over design fields only)."""

import json

import pytest

from reviewer import record as rec
from reviewer.cli import main
from tests.report.helpers import write_design, write_rules


@pytest.fixture
def bench(tmp_path):
    return write_design(tmp_path), write_rules(tmp_path)


def test_decide_round_trip_through_the_cli(bench, capsys):
    design, rules = bench
    assert main(["decide", str(design), "house.bus-limit", "--as", "accepted", "--note",
                 "bench supply capped by its own limit", "--by", "ana", "--rules", str(rules)]) == 0
    assert main(["decide", str(design), "house.power-cap[low]", "--as", "will_change",
                 "--by", "bo", "--rules", str(rules)]) == 0
    assert main(["answer", str(design), "house.gate-loop-short", "yes", "--note",
                 "checked on the layout draft", "--by", "ana", "--rules", str(rules)]) == 0
    path = rec.record_path(design)
    first = rec.load(path)
    d = first.decisions["house.bus-limit"]
    # the numbers the decision was made on: v_max 24 V against the house limit 20 V
    assert (d.kind, d.reason, d.reviewer, d.outcome, d.value, d.limit, d.unit) == (
        "accepted", "bench supply capped by its own limit", "ana", "fail", 24.0, 20.0, "V")
    assert first.decisions["house.power-cap[low]"].kind == "will_change"
    assert first.answers["house.gate-loop-short"].note == "checked on the layout draft"
    # reload and save again: byte-identical (stable order)
    text = path.read_text()
    rec.save(rec.load(path), path)
    assert path.read_text() == text
    capsys.readouterr()
    assert main(["record", str(design), "--rules", str(rules), "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    states = {x["key"]: (x["kind"], x["state"]) for x in data["decisions"]}
    assert states == {"house.bus-limit": ("accepted", "current"),
                      "house.power-cap[low]": ("will_change", "current")}
    settled = {x["key"]: x["settled"] for x in data["failing"]}
    assert settled["house.bus-limit"] is True and settled["house.power-cap[low]"] is False
    assert data["answers"][0]["answer"] == "yes"
    # the answer is taken into the review: the question no longer open
    assert main(["check", str(design), "--rules", str(rules), "--format", "json"]) == 0
    findings = {f["key"]: f for f in json.loads(capsys.readouterr().out)["reviews"][0]["findings"]}
    assert findings["house.gate-loop-short"]["outcome"] == "answered"


def test_reason_required_for_accepted_and_not_applicable(bench, capsys):
    design, rules = bench
    for kind in ("accepted", "not_applicable"):
        assert main(["decide", str(design), "house.bus-limit", "--as", kind, "--rules",
                     str(rules)]) == 2
        assert "needs a reason" in capsys.readouterr().err
    assert not rec.record_path(design).exists()  # nothing written on a refused decision
    assert main(["answer", str(design), "house.gate-loop-short", "not_applicable", "--rules",
                 str(rules)]) == 2
    assert "needs a note" in capsys.readouterr().err


def test_unknown_keys_get_did_you_mean(bench, capsys):
    design, rules = bench
    assert main(["decide", str(design), "house.bus-limt", "--as", "will_change", "--rules",
                 str(rules)]) == 2
    assert "did you mean 'house.bus-limit'" in capsys.readouterr().err
    assert main(["decide", str(design), "house.power-cap", "--as", "will_change", "--rules",
                 str(rules)]) == 2
    err = capsys.readouterr().err
    assert "house.power-cap[high]" in err and "house.power-cap[low]" in err
    assert main(["answer", str(design), "house.gate-loop-shrt", "yes", "--rules", str(rules)]) == 2
    assert "did you mean 'house.gate-loop-short'" in capsys.readouterr().err


def test_default_reviewer_is_the_user_name(bench, monkeypatch):
    design, rules = bench
    for var in ("LOGNAME", "USER", "LNAME", "USERNAME"):
        monkeypatch.setenv(var, "cleo")
    assert main(["decide", str(design), "house.bus-limit", "--as", "will_change", "--rules",
                 str(rules)]) == 0
    assert rec.load(rec.record_path(design)).decisions["house.bus-limit"].reviewer == "cleo"


def test_drop_removes_only_on_request(bench, capsys):
    design, rules = bench
    main(["decide", str(design), "house.bus-limit", "--as", "will_change", "--rules", str(rules)])
    assert main(["decide", str(design), "house.bus-limit", "--drop", "--rules", str(rules)]) == 0
    assert rec.load(rec.record_path(design)).decisions == {}
    assert main(["decide", str(design), "house.bus-limit", "--drop", "--rules", str(rules)]) == 2


def test_fail_on_honours_decisions(bench, capsys):
    """accepted / not_applicable and current: no longer fails; will_change, undecided and a
    decision awaiting re-confirmation still fail."""
    design, rules = bench

    def hazards_left():  # the house hazards that would fail --fail-on hazard
        from reviewer.review import review_file
        from reviewer.rulebook import load_rulebook

        r = review_file(design, book=load_rulebook([rules]))
        return [f.key for f in r.unsettled("hazard") if f.area == "house"]

    assert hazards_left() == ["house.bus-limit"]
    for kind, settles in (("undecided", False), ("will_change", False),
                          ("accepted", True), ("not_applicable", True)):
        assert main(["decide", str(design), "house.bus-limit", "--as", kind, "--note", "why",
                     "--rules", str(rules)]) == 0
        assert (hazards_left() == []) is settles, kind
    # the decision stands on 24 V; the revision moves the bus to 26 V (+8 %, beyond 2 %)
    design.write_text(design.read_text().replace('v_max = "24 V"', 'v_max = "26 V"'))
    assert hazards_left() == ["house.bus-limit"]


def test_fail_on_exit_status(tmp_path, capsys):
    """The exit status of check --fail-on: every built-in hazard of the small design is settled
    first, so that the house hazard alone decides it."""
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    args = ["check", str(design), "--rules", str(rules), "--fail-on", "hazard"]
    from reviewer.review import review_file
    from reviewer.rulebook import load_rulebook

    others = [f for f in review_file(design, book=load_rulebook([rules])).unsettled("hazard")
              if f.area != "house"]
    for f in others:  # settle every built-in hazard, so the house rule decides the status
        main(["decide", str(design), f.key, "--as", "accepted", "--note", "test", "--rules",
              str(rules)])
    assert main(args) == 1
    main(["decide", str(design), "house.bus-limit", "--as", "accepted", "--note", "ok",
          "--rules", str(rules)])
    assert main(args) == 0
    design.write_text(design.read_text().replace('v_max = "24 V"', 'v_max = "26 V"'))
    assert main(args) == 1  # awaiting re-confirmation fails the build
