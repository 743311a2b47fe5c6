"""Re-review across revisions: decisions matched by rule id and subject; a finding that no longer
fires is resolved; numbers moved beyond the tolerance ask for re-confirmation (old and new side
by side); a new finding appears undecided; a renamed rule leaves an orphan that is kept.

Designs are the small invented design of tests/data, revised in a tmp dir; the rules are the
house rules of tests/data over design fields, so that each number is the test's own input. The
2 % re-confirmation tolerance is this project's choice (reviewer.record.RECONFIRM_TOLERANCE)."""

import json

import pytest

from reviewer import record as rec
from reviewer.cli import main
from tests.report.helpers import write_design, write_rules


def decide(design, rules, key, kind="accepted", note="bench supply capped"):
    assert main(["decide", str(design), key, "--as", kind, "--note", note, "--by", "ana",
                 "--rules", str(rules)]) == 0


def views(design, rules, capsys):
    """The text, Markdown and JSON views of the design's review, as strings / data."""
    capsys.readouterr()
    out = {}
    for fmt in ("text", "markdown", "json"):
        assert main(["check", str(design), "--rules", str(rules), "--format", fmt,
                     "--color", "never"]) == 0
        out[fmt] = capsys.readouterr().out
    [out["json"]] = json.loads(out["json"])["reviews"]
    out["flat"] = " ".join(out["text"].split())  # the terminal view wraps long lines
    return out


def revise(design, old, new):
    text = design.read_text()
    assert old in text
    design.write_text(text.replace(old, new, 1))


@pytest.fixture
def bench(tmp_path):
    design, rules = write_design(tmp_path), write_rules(tmp_path)
    decide(design, rules, "house.bus-limit")
    return design, rules


def test_finding_disappears_resolved(bench, capsys):
    design, rules = bench
    # 18 V ≤ 20 V: passes now (the nominal and lowest bus move with it: v_min ≤ v_nom ≤ v_max)
    revise(design, 'v_max = "24 V"', 'v_max = "18 V"')
    revise(design, 'v_nom = "24 V"', 'v_nom = "18 V"')
    revise(design, 'v_min = "22 V"', 'v_min = "17 V"')
    v = views(design, rules, capsys)
    [d] = [x for x in v["json"]["record"]["decisions"] if x["key"] == "house.bus-limit"]
    assert d["state"] == "resolved" and d["decided_on"]["value"] == 24.0
    assert "house.bus-limit: accepted (ana" in v["flat"] and "resolved by the revision" in v["flat"]
    assert "| `house.bus-limit` | accepted (ana" in v["markdown"]
    assert "resolved by the revision | 24 V, limit 20 V (fail) | 18 V, limit 20 V (pass) |" \
        in v["markdown"]


def test_numbers_move_beyond_tolerance(bench, capsys):
    design, rules = bench
    revise(design, 'v_max = "24 V"', 'v_max = "24.4 V"')  # +1.7 %: within 2 %, still current
    v = views(design, rules, capsys)
    assert v["json"]["record"]["decisions"][0]["state"] == "current"
    revise(design, 'v_max = "24.4 V"', 'v_max = "26 V"')  # +8.3 % of the 24 V decided on
    v = views(design, rules, capsys)
    f = next(x for x in v["json"]["findings"] if x["key"] == "house.bus-limit")
    assert f["decision"]["state"] == "reconfirm" and f["settled"] is False
    assert f["decision"]["decided_on"]["value"] == 24.0 and f["value"] == 26.0
    # old and new side by side
    assert "| value | 24 V | 26 V |" in v["markdown"] and "| limit | 20 V | 20 V |" in v["markdown"]
    assert "decided on  24 V, limit 20 V (fail)" in v["text"]
    assert "now         26 V, limit 20 V (fail)" in v["text"]
    # re-confirming records the new numbers and makes it current again
    decide(design, rules, "house.bus-limit", note="re-confirmed at 26 V")
    assert views(design, rules, capsys)["json"]["record"]["decisions"][0]["state"] == "current"


def test_new_finding_appears_undecided(bench, capsys):
    design, rules = bench
    revise(design, 'carrier = "20 kHz"', 'carrier = "12 kHz"')  # below the 16 kHz floor
    v = views(design, rules, capsys)
    f = next(x for x in v["json"]["findings"] if x["key"] == "house.carrier-floor")
    assert f["outcome"] == "fail" and f["decision"] is None
    assert "`house.carrier-floor` · area house · risk" in v["markdown"]
    md = v["markdown"]
    block = md[md.index("`house.carrier-floor` · area house"):]
    assert block.index("**Decision.** none recorded.") < block.index("###")
    # the decision on the other finding is untouched
    assert v["json"]["record"]["decisions"][0]["state"] == "current"


def test_rule_renamed_leaves_an_orphan_that_is_kept(bench, capsys):
    design, rules = bench
    write_rules(design.parent, rename={"house.bus-limit": "house.bus-ceiling"})
    v = views(design, rules, capsys)
    assert v["json"]["record"]["orphans"] == ["house.bus-limit"]
    assert "house.bus-limit: accepted (ana" in v["flat"]
    assert "orphan: no such finding any more" in v["flat"]
    assert "| `house.bus-limit` | accepted (ana" in v["markdown"] and "no such finding |" in v["markdown"]
    # another decision is saved: the orphan stays in the file
    decide(design, rules, "house.bus-ceiling", note="same limit, new name")
    kept = rec.load(rec.record_path(design))
    assert set(kept.decisions) == {"house.bus-limit", "house.bus-ceiling"}
    assert kept.decisions["house.bus-limit"].reason == "bench supply capped"
    capsys.readouterr()
    assert main(["record", str(design), "--rules", str(rules)]) == 0
    out = capsys.readouterr().out
    assert "house.bus-limit: accepted (ana" in out and "no such finding (kept)" in out


def test_diff_side_by_side(tmp_path, capsys):
    rules = write_rules(tmp_path)
    old = write_design(tmp_path, "old.toml")
    new = write_design(tmp_path, "new.toml", a=('v_max = "24 V"', 'v_max = "18 V"'),
                       e=('v_nom = "24 V"', 'v_nom = "18 V"'), f=('v_min = "22 V"', 'v_min = "17 V"'),
                       b=('carrier = "20 kHz"', 'carrier = "12 kHz"'),
                       c=('power = "40 W"', 'power = "44 W"'), d=('revision = "A"', 'revision = "B"'))
    assert main(["diff", str(old), str(new), "--rules", str(rules), "--format", "json"]) == 0
    data = json.loads(capsys.readouterr().out)
    kinds = {c["key"]: c["kind"] for c in data["changes"] if c["key"].startswith("house.")}
    assert kinds == {"house.carrier-floor": "appeared", "house.bus-limit": "disappeared",
                     "house.power-cap[high]": "moved", "house.power-cap[low]": "moved"}
    moved = next(c for c in data["changes"] if c["key"] == "house.power-cap[high]")
    assert (moved["old"]["value"], moved["new"]["value"]) == (40.0, 44.0)
    assert (moved["old"]["margin"], moved["new"]["margin"]) == (pytest.approx(-10.0),
                                                                 pytest.approx(-14.0))
    fields = {f["path"]: (f["old"], f["new"]) for f in data["fields"]}
    assert fields["source.v_max"] == ("24 V", "18 V") and fields["design.revision"] == ("A", "B")
    assert main(["diff", str(old), str(new), "--rules", str(rules)]) == 0
    text = capsys.readouterr().out
    assert "New failures" in text and "No longer failing" in text and "Numbers moved" in text
    assert "old  ADVICE 40 W ≤ 30 W, margin -10 W (-33 %)" in text
    assert "new  ADVICE 44 W ≤ 30 W, margin -14 W (-47 %)" in text
    assert main(["diff", str(old), str(new), "--rules", str(rules), "--format", "markdown"]) == 0
    md = capsys.readouterr().out
    assert "| `house.bus-limit` Highest bus within the house limit | HAZARD 24 V ≤ 20 V, margin " \
           "-4 V (-20 %) | pass 18 V ≤ 20 V, margin 2 V (+10 %) |" in md


def test_diff_of_identical_designs(tmp_path, capsys):
    a, b = write_design(tmp_path, "a.toml"), write_design(tmp_path, "b.toml")
    assert main(["diff", str(a), str(b)]) == 0
    assert "No differences" in capsys.readouterr().out
