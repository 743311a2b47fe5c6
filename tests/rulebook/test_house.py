"""House rules: add, override, disable (reason in every view), profiles, precedence of folders.

The rule judged is the built-in stress.vds-headroom: the switch's V_DS rating must be at least
``ratio × op.bus_max``. The design is the loader's minimal one (12 V bus, no v_max, so the
highest bus is the nominal 12 V, 40 V parts). Limits are hand arithmetic on those inputs:
ratio 1.5 → 18 V (built-in), 2 → 24 V, 3 → 36 V, 4 → 48 V (fails against 40 V).
"""

from __future__ import annotations

import json
from pathlib import Path

import pytest

from reviewer.cli import main
from reviewer.design import parse_design
from reviewer.errors import InputError
from reviewer.review import review_design
from reviewer.rulebook import load_rulebook
from reviewer.rulebook import discover
from reviewer.rulebook.discover import rulebook_for
from tests.conftest import finding
from tests.design.test_loader import MINIMAL

HEADROOM = "stress.vds-headroom[high]"


def ratio_file(path: Path, ratio: float, extra: str = "") -> Path:
    path.parent.mkdir(parents=True, exist_ok=True)
    path.write_text(f'[[override]]\nid = "stress.vds-headroom"\nparams = {{ ratio = {ratio} }}\n'
                    + extra, encoding="utf-8")
    return path


def review(book, text: str = MINIMAL):
    return review_design(parse_design(text, "d.toml"), "d.toml", book)


@pytest.fixture(autouse=True)
def no_user_folder(tmp_path, monkeypatch):
    """Every test starts without a per-user folder, so that the machine's own never leaks in."""
    monkeypatch.setattr(discover, "user_rules_dir", lambda: tmp_path / "no-user-folder")


def test_builtin_limit_is_one_and_a_half_times_the_bus():
    f = finding(review(load_rulebook()), HEADROOM)
    assert f.limit == pytest.approx(18.0) and f.outcome == "pass"  # 1.5 × 12 V


def test_override_changes_params_and_severity(tmp_path):
    house = ratio_file(tmp_path / "h.toml", 4, 'severity = "hazard"\nnote = "house"\n')
    book = load_rulebook([house])
    f = finding(review(book), HEADROOM)
    assert f.limit == pytest.approx(48.0)  # 4 × 12 V
    assert f.outcome == "fail" and f.severity == "hazard"
    assert "changed by" in f.origin and str(house) in f.origin
    assert book.history["stress.vds-headroom"][-1].startswith("params, severity changed by")


def test_override_changes_the_limit_itself(tmp_path):
    house = tmp_path / "h.toml"
    house.write_text('[[override]]\nid = "stress.vds-headroom"\nat_least = "2 * op.bus_max + 20 V"\n')
    f = finding(review(load_rulebook([house])), HEADROOM)
    assert f.limit == pytest.approx(44.0) and f.outcome == "fail"  # 2 × 12 V + 20 V


def test_add_a_rule_with_a_condition_and_a_unit_literal(tmp_path):
    house = tmp_path / "h.toml"
    house.write_text('''
area = "house"
[[rule]]
id = "house.p-above-10v"
title = "P-channel high side above 10 V rated at twice the bus"
severity = "risk"
applies = "op.bus_max > 10 V and design.switch.high.polarity == 'p'"
value = "design.switch.high.vds_rating"
at_least = "2 * op.bus_max"
why = "test"
''')
    book = load_rulebook([house])
    assert finding(review(book), "house.p-above-10v").outcome == "not_applicable"  # N-channel
    text = MINIMAL.replace("[switch.high]\n", '[switch.high]\npolarity = "p"\n')
    f = finding(review(book, text), "house.p-above-10v")
    assert f.outcome == "pass" and f.limit == pytest.approx(24.0) and f.area == "house"
    text = text.replace('vds_rating = "40 V"', 'vds_rating = "20 V"', 1)
    assert finding(review(book, text), "house.p-above-10v").outcome == "fail"  # 20 V < 24 V


def test_disable_needs_a_reason_and_every_view_shows_it(tmp_path, capsys):
    house = tmp_path / "h.toml"
    house.write_text('[[disable]]\nid = "stress.vds-headroom"\n'
                     'reason = "Ringing measured on every board; see test log 7"\n')
    book = load_rulebook([house])
    r = review(book)
    assert not [f for f in r.findings if f.rule_id == "stress.vds-headroom"]
    assert [(d.rule_id, d.reason) for d in r.disabled] == [
        ("stress.vds-headroom", "Ringing measured on every board; see test log 7")]
    design = tmp_path / "d.toml"
    design.write_text(MINIMAL)
    for fmt in ("text", "markdown", "json"):
        assert main(["check", str(design), "--rules", str(house), "--format", fmt,
                     "--color", "never"]) == 0
        out = capsys.readouterr().out
        flat = " ".join(out.split())
        assert "Ringing measured on every board; see test log 7" in flat, fmt
        assert "stress.vds-headroom" in out
        if fmt == "json":
            [data] = json.loads(out)["reviews"]
            assert data["disabled_rules"] == [{
                "rule": "stress.vds-headroom", "title": book.disabled[0].title,
                "reason": "Ringing measured on every board; see test log 7", "origin": str(house)}]
    house.write_text('[[disable]]\nid = "stress.vds-headroom"\nreason = "  "\n')
    with pytest.raises(InputError, match="only with a reason"):
        load_rulebook([house])
    house.write_text('[[disable]]\nid = "stress.vds-headroom"\n')
    with pytest.raises(InputError, match="disable.0.reason: required"):
        load_rulebook([house])


def test_json_with_a_switched_off_rule_matches_its_schema(tmp_path, capsys):
    jsonschema = pytest.importorskip("jsonschema")
    from importlib.resources import files

    house = tmp_path / "h.toml"
    house.write_text('[[disable]]\nid = "stress.vds-headroom"\nreason = "measured"\n')
    design = tmp_path / "d.toml"
    design.write_text(MINIMAL)
    assert main(["check", str(design), "--rules", str(house), "--format", "json"]) == 0
    schema = json.loads(files("reviewer.report").joinpath("review.schema.json").read_text())
    jsonschema.validate(json.loads(capsys.readouterr().out), schema)


def test_profile_extends_another(tmp_path):
    folder = tmp_path / "rules"
    ratio_file(folder / "a-default.toml", 2)
    ratio_file(folder / "b-strict.toml", 4, "").write_text(
        'profile = "strict"\nextends = "default"\n' + (folder / "b-strict.toml").read_text())
    (folder / "c-extreme.toml").write_text(
        'profile = "extreme"\nextends = "strict"\n'
        '[[override]]\nid = "stress.vds-headroom"\nseverity = "hazard"\n')
    files = sorted(folder.glob("*.toml"))
    default = finding(review(load_rulebook(files)), HEADROOM)
    assert default.limit == pytest.approx(24.0) and default.severity == "advice"  # 2 × 12 V
    strict = finding(review(load_rulebook(files, profile="strict")), HEADROOM)
    assert strict.limit == pytest.approx(48.0) and strict.severity == "advice"  # 4 × 12 V
    extreme_book = load_rulebook(files, profile="extreme")
    extreme = finding(review(extreme_book), HEADROOM)
    assert extreme.limit == pytest.approx(48.0) and extreme.severity == "hazard"
    assert [x.profile for x in extreme_book.layers if x.kind != "built-in"] == [
        "default", "strict", "extreme"]
    with pytest.raises(InputError, match="no profile 'strikt' \\(did you mean 'strict'\\?\\)"):
        load_rulebook(files, profile="strikt")


def test_profiles_in_a_circle_are_refused(tmp_path):
    a = tmp_path / "a.toml"
    b = tmp_path / "b.toml"
    a.write_text('profile = "one"\nextends = "two"\n')
    b.write_text('profile = "two"\nextends = "one"\n')
    with pytest.raises(InputError, match="circle"):
        load_rulebook([a, b], profile="one")


def test_precedence_builtin_user_project_command_line(tmp_path, monkeypatch):
    user = tmp_path / "user" / "house-rules"
    ratio_file(user / "u.toml", 3)
    monkeypatch.setattr(discover, "user_rules_dir", lambda: user)
    proj = tmp_path / "proj"
    (proj / ".git").mkdir(parents=True)
    ratio_file(tmp_path / "house-rules" / "above-git-root.toml", 9)  # beyond the git root: unused
    design = proj / "boards" / "inverter" / "d.toml"
    design.parent.mkdir(parents=True)
    design.write_text(MINIMAL)

    def limit(**kw):
        return finding(review(rulebook_for(design, **kw)), HEADROOM).limit

    assert limit() == pytest.approx(36.0)  # user: 3 × 12 V
    ratio_file(proj / "house-rules" / "p.toml", 4)
    assert limit() == pytest.approx(48.0)  # project beats user: 4 × 12 V
    ratio_file(proj / "boards" / "house-rules" / "nearer.toml", 2.5)
    assert limit() == pytest.approx(30.0)  # the folder nearer the design wins: 2.5 × 12 V
    cli = ratio_file(tmp_path / "cli.toml", 2)
    assert limit(given=[cli]) == pytest.approx(24.0)  # --rules beats all: 2 × 12 V
    assert limit(given=[cli], house=False) == pytest.approx(24.0)
    assert limit(house=False) == pytest.approx(18.0)  # built-in only
    kinds = [s.kind for s in discover.house_sources(design, [cli])]
    assert kinds == ["user", "project", "project", "command line"]


def test_check_command_finds_the_project_folder(tmp_path, capsys):
    proj = tmp_path / "proj"
    (proj / ".git").mkdir(parents=True)
    ratio_file(proj / "house-rules" / "p.toml", 4)
    design = proj / "d.toml"
    design.write_text(MINIMAL)
    assert main(["check", str(design), "--format", "json"]) == 0
    [data] = json.loads(capsys.readouterr().out)["reviews"]
    f = next(x for x in data["findings"] if x["key"] == HEADROOM)
    assert f["outcome"] == "fail" and f["limit"] == pytest.approx(48.0)
    assert main(["check", str(design), "--format", "json", "--no-house-rules"]) == 0
    [data] = json.loads(capsys.readouterr().out)["reviews"]
    assert next(x for x in data["findings"] if x["key"] == HEADROOM)["outcome"] == "pass"


def test_rules_command_lists_where_and_explains(tmp_path, capsys):
    house = ratio_file(tmp_path / "h.toml", 4, 'note = "tighter"\n[[disable]]\n'
                       'id = "stress.vgs-derating"\nreason = "zener-clamped gates"\n')
    assert main(["rules", "--rules", str(house), "--at", str(tmp_path)]) == 0
    out = capsys.readouterr().out
    assert "stress.vds-headroom [high, low]  (stress, advice)" in out
    assert "ratio = 4" in out and f"built-in; changed by {house}" in out
    assert "switched off:" in out and "zener-clamped gates" in out
    assert main(["rules", "--where", "--rules", str(house), "--at", str(tmp_path)]) == 0
    out = capsys.readouterr().out
    assert f"1. command line {house}" in out
    assert "changes       stress.vds-headroom (params): tighter" in out
    assert "switches off  stress.vgs-derating: zener-clamped gates" in out
    assert main(["rules", "explain", "stress.vds-headroom", "--rules", str(house)]) == 0
    out = capsys.readouterr().out
    assert "history" in out and "params changed by" in out and "tighter" in out
    assert main(["rules", "explain", "stress.vds-hedroom"]) == 2
    assert "did you mean 'stress.vds-headroom'" in capsys.readouterr().err


def test_the_example_house_rules_load_and_apply(capsys):
    from tests.conftest import EXAMPLES, example

    folder = EXAMPLES / "sample-house-rules"
    files = sorted(folder.glob("*.toml"))
    assert [p.name for p in files] == ["house.toml", "strict.toml"]
    for p in files:
        assert main(["rules", "lint", str(p), "--rules", str(folder / "house.toml"),
                     "--no-house-rules"]) == 0
    assert "ok" in capsys.readouterr().out
    default = load_rulebook(files)
    strict = load_rulebook(files, profile="strict")
    # 70 % then 60 % of a 40 V rating (hand arithmetic: 28 V, 24 V)
    r = review_design(parse_design(example("naive_bench_pchannel").read_text(), "n"), "n", default)
    assert finding(r, "stress.vds-derating[high]").limit == pytest.approx(28.0)
    r = review_design(parse_design(example("naive_bench_pchannel").read_text(), "n"), "n", strict)
    f = finding(r, "stress.vds-derating[high]")
    assert f.limit == pytest.approx(24.0) and f.severity == "hazard"
    assert strict.get("house.junction-ceiling") and not default.get("house.junction-ceiling")
    assert [d.rule_id for d in strict.disabled] == ["waveform.audible"]
