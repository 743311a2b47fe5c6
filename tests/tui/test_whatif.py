"""What-if proposals applied to a design: values parsed as TOML, fields set, errors located.

Check values are the tests' own inputs (what is proposed must come back, validated by the same
loader as the file) and the TOML v1.0.0 specification's value syntax (toml.io)."""

from __future__ import annotations

import pytest

from reviewer.errors import InputError
from reviewer.whatif import apply, apply_to_text, parse_value, set_field
from tests.conftest import example


def test_parse_value_follows_toml():
    # TOML v1.0.0: integers, floats, booleans, strings and inline tables are values on their own
    assert parse_value("12") == 12
    assert parse_value("2.5e-9") == 2.5e-9
    assert parse_value("true") is True
    assert parse_value('"800 ns"') == "800 ns"
    assert parse_value('{ min = "1 V", max = "3 V" }') == {"min": "1 V", "max": "3 V"}
    # not a TOML value: taken as the string a quantity is written as
    assert parse_value(" 800 ns ") == "800 ns"
    assert parse_value("10k ± 5%") == "10k ± 5%"


def test_set_field_copies_and_makes_tables():
    data = {"timing": {"dead_time": "0 s"}, "design": {"title": "x"}}
    out = set_field(data, "timing.dead_time", "800 ns")
    assert out["timing"]["dead_time"] == "800 ns"
    assert data["timing"]["dead_time"] == "0 s"  # the original is untouched
    assert set_field({}, "filter.inductance", "1 mH") == {"filter": {"inductance": "1 mH"}}
    with pytest.raises(ValueError):
        set_field(data, "design.title.x", 1)


def test_apply_changes_the_design_not_the_file(tmp_path):
    path = tmp_path / "d.toml"
    path.write_bytes(example("naive_bench_pchannel").read_bytes())
    before = path.read_bytes()
    d = apply(path, {"timing.dead_time": "800 ns", "drive.shared_signal": "false"})
    assert d.timing.dead_time.typ == pytest.approx(800e-9)  # 800 ns in seconds
    assert d.drive.shared_signal is False
    assert path.read_bytes() == before


def test_bad_proposal_names_field_and_value():
    text = example("careful_12v_sine").read_text(encoding="utf-8")
    with pytest.raises(InputError) as e:
        apply_to_text(text, "c.toml", {"timing.dead_time": "800 nF"})
    (p,) = e.value.problems
    assert p.path == "timing.dead_time" and "proposed value '800 nF'" in p.message
    with pytest.raises(InputError) as e:
        apply_to_text(text, "c.toml", {"timing.dead_tme": "800 ns"})
    assert "dead_time" in str(e.value)  # the loader's "did you mean"
