"""The design loader: every error names file, line, dotted field, what was found and expected."""

import json

import pytest

from reviewer.design import load_design, parse_design
from reviewer.errors import InputError
from tests.conftest import EXAMPLES

MINIMAL = """\
[design]
title = "t"

[source]
v_nom = "12 V"

[output]
frequency = "50 Hz"

[switch.high]
vds_rating = "40 V"
vgs_max = "20 V"

[switch.low]
vds_rating = "40 V"
vgs_max = "20 V"

[drive.high]
kind = "driver_ic"
on_level = "12 V"
off_level = "0 V"

[drive.low]
kind = "driver_ic"
on_level = "12 V"
off_level = "0 V"
"""


def problems(text: str):
    with pytest.raises(InputError) as e:
        parse_design(text, "d.toml")
    return e.value.problems


def test_minimal_design_loads():
    d = parse_design(MINIMAL, "d.toml")
    assert d.source.v_nom.typ == 12.0
    assert d.drive.high.off_level.typ == 0.0
    with pytest.raises(Exception):
        d.source.v_nom = 3  # immutable


def test_wrong_unit_names_file_line_and_field():
    text = MINIMAL.replace('v_nom = "12 V"', 'v_nom = "100 nF"')
    (p,) = problems(text)
    assert (p.file, p.line, p.path) == ("d.toml", 5, "source.v_nom")
    assert "F" in p.message and "volts" in p.message


def test_unknown_key_suggests():
    text = MINIMAL.replace('frequency = "50 Hz"', 'frequency = "50 Hz"\nfrequncy = 3')
    (p,) = problems(text)
    assert p.path == "output.frequncy" and p.line == 9
    assert "did you mean 'frequency'" in p.message


def test_unknown_table_suggests():
    text = MINIMAL + '\n[fuze]\nrating = "10 A"\n'
    (p,) = problems(text)
    assert p.path == "fuze" and "did you mean 'fuse'" in p.message


def test_several_errors_reported_together():
    text = (MINIMAL.replace('v_nom = "12 V"', 'v_nom = "12 A"')
            .replace('vgs_max = "20 V"', 'vgs_max = "twenty"', 1)
            .replace('kind = "driver_ic"', 'kind = "driver"', 1))
    ps = problems(text)
    assert [p.path for p in ps] == ["source.v_nom", "switch.high.vgs_max", "drive.high.kind"]
    assert all(p.line for p in ps)
    assert "expected one of" in ps[2].message


def test_missing_required_field():
    text = MINIMAL.replace('vgs_max = "20 V"\n\n[switch.low]', '\n[switch.low]')
    (p,) = problems(text)
    assert p.path == "switch.high.vgs_max" and "required" in p.message
    assert p.line == 10  # the table it belongs in


def test_inline_tolerance_error_located():
    text = MINIMAL.replace('vgs_max = "20 V"', 'vgs_max = "20 V"\nvth = { min = "3 V", max = "1 V" }', 1)
    (p,) = problems(text)
    assert p.path == "switch.high.vth" and p.line == 13
    assert "min ≤ typ ≤ max" in p.message


def test_toml_syntax_error_has_line():
    (p,) = problems(MINIMAL.replace('title = "t"', 'title = "t'))
    assert p.line == 2 and "TOML syntax" in p.message


def test_missing_file():
    with pytest.raises(InputError) as e:
        load_design("/nonexistent/x.toml")
    assert "no such file" in str(e.value)


def test_wire_sizes():
    d = parse_design(MINIMAL + '\n[wiring]\nsize = "12 AWG"\n', "d.toml")
    # ASTM B258: 12 AWG is 2.053 mm in diameter -> 3.31 mm²
    assert d.wiring.size.typ == pytest.approx(3.309e-6, rel=2e-3)
    d = parse_design(MINIMAL + '\n[wiring]\nsize = "4 mm²"\n', "d.toml")
    assert d.wiring.size.typ == pytest.approx(4e-6)
    (p,) = problems(MINIMAL + '\n[wiring]\nsize = "12 gauge"\n')
    assert p.path == "wiring.size" and "AWG" in p.message


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_examples_load_and_match_schema(path):
    import tomllib

    import jsonschema

    from reviewer.design.schema import design_schema

    load_design(path)
    jsonschema.validate(tomllib.loads(path.read_text()), design_schema())


def test_schema_rejects_unknown_key():
    import jsonschema

    from reviewer.design.schema import design_schema

    with pytest.raises(jsonschema.ValidationError):
        jsonschema.validate({"design": {"title": "x", "titel": 1}}, design_schema())
    json.dumps(design_schema())  # serialisable
