"""Every kind of bad rule file gives a precise error: file, line, key and what is wrong.

Each case is a small house file with one mistake, linted with ``reviewer rules lint`` (exit 2);
the expected message names the line the mistake is on and the key.
"""

from __future__ import annotations

import pytest

from reviewer.cli import main
from reviewer.rulebook import discover

GOOD = '''\
area = "house"

[[rule]]
id = "house.bus-cap"
title = "Bus at most 30 V"
severity = "risk"
value = "op.bus_max"
at_most = "30 V"
why = "test"
'''


@pytest.fixture(autouse=True)
def no_user_folder(tmp_path, monkeypatch):
    monkeypatch.setattr(discover, "user_rules_dir", lambda: tmp_path / "no-user-folder")


def lint(tmp_path, capsys, text: str) -> str:
    path = tmp_path / "house.toml"
    path.write_text(text, encoding="utf-8")
    code = main(["rules", "lint", str(path), "--at", str(tmp_path)])
    err = capsys.readouterr().err
    assert code == 2, err
    return err.replace(str(path), "FILE")


def test_good_file_passes(tmp_path, capsys):
    path = tmp_path / "house.toml"
    path.write_text(GOOD)
    assert main(["rules", "lint", str(path), "--at", str(tmp_path)]) == 0
    assert "ok (profile default: adds 1, changes 0, switches off 0)" in capsys.readouterr().out


CASES = [
    ("syntax", GOOD.replace('severity = "risk"', 'severity = "risk'),
     "FILE:6: TOML syntax"),
    ("unknown key", GOOD.replace('why = "test"', 'why = "test"\nlimit_text = "2"'),
     "FILE:10: rule.0.limit_text: unknown key 'limit_text'"),
    ("unknown top-level key", "areas = 'x'\n" + GOOD, "FILE:1: areas: unknown key 'areas' (did you mean 'area'?)"),
    ("unknown quantity", GOOD.replace('"op.bus_max"', '"op.bus_maxx"'),
     "FILE:7: rule[0] (house.bus-cap).value: unknown quantity 'op.bus_maxx' (did you mean 'op.bus_max'?)"),
    ("unknown design field", GOOD.replace('why = "test"', 'why = "test"\nfields = ["switch.high.vds_ratin"]'),
     "unknown design field 'switch.high.vds_ratin' (did you mean 'switch.high.vds_rating'?)"),
    ("unit mismatch in a limit", GOOD.replace('"30 V"', '"30 A"'),
     "FILE:8: rule[0] (house.bus-cap).at_most: limit '30 A' is in A, but the value (op.bus_max) is in V"),
    ("unit mismatch in a param", GOOD.replace('at_most = "30 V"', 'at_most = "cap"\nparams = { cap = "2.2 kΩ" }'),
     "rule[0] (house.bus-cap).at_most: the limit 'cap' is in Ω, but the value (op.bus_max) is in V"),
    ("unit mismatch in an expression", GOOD.replace('"30 V"', '"op.bus_max + 2 A"'),
     "FILE:8: rule[0] (house.bus-cap).at_most: adding: 'op.bus_max' is in V but '2.0' is in A"),
    ("unit mismatch in a condition", GOOD.replace('why = "test"', 'why = "test"\napplies = "op.bus_max > 10 ms"'),
     "FILE:10: rule[0] (house.bus-cap).applies: comparing: 'op.bus_max' is in V but '0.01' is in s"),
    ("number compared with a text", GOOD.replace('why = "test"', "why = \"test\"\napplies = \"op.bus_max == 'high'\""),
     """FILE:10: rule[0] (house.bus-cap).applies: "op.bus_max == 'high'" compares a number ('op.bus_max') with a text"""),
    ("flag in arithmetic", GOOD.replace('"op.bus_max"', '"op.bus_max * design.drive.shared_signal"'),
     "FILE:7: rule[0] (house.bus-cap).value: 'design.drive.shared_signal' is a flag (true/false) and cannot be used in arithmetic"),
    ("text choice that never occurs", GOOD.replace('why = "test"', "why = \"test\"\napplies = \"design.switch.high.polarity == 'P'\""),
     "'design.switch.high.polarity' is one of 'n', 'p'; it is never 'P'"),
    ("number where a condition is needed", GOOD.replace('why = "test"', 'why = "test"\napplies = "op.bus_max"'),
     "applies: 'op.bus_max' gives a number; applies needs a condition"),
    ("forbidden expression", GOOD.replace('"op.bus_max"', '"op.bus_max.__class__"'),
     "FILE:7: rule[0] (house.bus-cap).value: name parts may not start with '_'"),
    ("duplicate id", GOOD + GOOD.split("\n", 1)[1],
     "FILE:11: rule[1].id: duplicate rule id 'house.bus-cap': already defined in FILE:3"),
    ("duplicate of a built-in id", GOOD.replace("house.bus-cap", "stress.vds-rating"),
     "FILE:3: rule[0].id: duplicate rule id 'stress.vds-rating': already defined in"),
    ("override of an unknown rule", '[[override]]\nid = "stress.vds-deratin"\nseverity = "hazard"\n',
     "FILE:1: override[0].id: no rule 'stress.vds-deratin' to change (did you mean 'stress.vds-derating'?)"),
    ("override of an unknown parameter", '[[override]]\nid = "stress.vds-derating"\nparams = { derate = "70 %" }\n',
     "FILE:3: override[0] (stress.vds-derating).params: rule 'stress.vds-derating' has no parameter 'derate' (did you mean 'derating'?)"),
    ("override with the wrong relation", '[[override]]\nid = "stress.vds-derating"\nat_least = "30 V"\n',
     "FILE:3: override[0] (stress.vds-derating).at_least: rule 'stress.vds-derating' is an at_most rule"),
    ("override with a unit mismatch", '[[override]]\nid = "stress.vds-rating"\nat_most = "30 A"\n',
     "FILE:3: override[0] (stress.vds-rating).at_most: limit '30 A' is in A, but the value (stress.high.vds_peak) is in V"),
    ("override param with a unit mismatch", '[[override]]\nid = "stress.vds-derating"\nparams = { derating = "80 V" }\n',
     "FILE:3: override[0] (stress.vds-derating).params: the limit 'derating * design.switch.high.vds_rating' is in V², but the value (stress.high.vds_peak) is in V (with the parameters set here)"),
    ("disable without a reason", '[[disable]]\nid = "stress.vds-derating"\n',
     "FILE:1: disable.0.reason: required, but not given"),
    ("disable of an unknown rule", '[[disable]]\nid = "stress.nope"\nreason = "x"\n',
     "FILE:1: disable[0].id: no rule 'stress.nope' to switch off"),
    ("extends without profile", 'extends = "default"\n', "'extends' goes with 'profile'"),
    ("profile extends an unknown one", 'profile = "strict"\nextends = "strong"\n',
     "profile 'strict' extends 'strong', which no file defines"),
    ("bad severity", GOOD.replace('"risk"', '"danger"'),
     "FILE:6: rule.0.severity: expected one of 'hazard', 'risk' or 'advice', found 'danger'"),
]


@pytest.mark.parametrize("text, expected", [c[1:] for c in CASES], ids=[c[0] for c in CASES])
def test_bad_file_gives_a_precise_error(tmp_path, capsys, text, expected):
    err = lint(tmp_path, capsys, text)
    assert expected in err, err


def test_several_problems_are_reported_together(tmp_path, capsys):
    text = GOOD.replace('"op.bus_max"', '"op.bus_maxx"').replace('"30 V"', '"x +"')
    err = lint(tmp_path, capsys, text)
    assert "unknown quantity 'op.bus_maxx'" in err and "not a valid expression" in err


def test_builtin_rules_pass_the_stricter_checks():
    # Every built-in rule compiles, and every expression in it is of the right kind and
    # dimension (load_rulebook raises InputError, with every problem located, otherwise).
    from reviewer.rulebook import load_rulebook

    book = load_rulebook()
    assert book.rules and book.compiled and not book.disabled
