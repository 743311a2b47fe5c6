"""Every standard table file names its standard, edition, table number, lookup kind and certainty,
and its data are shaped as its lookup needs (rising row keys, one value per row)."""

from __future__ import annotations

import pytest

from reviewer import tables

NAMES = tables.names()


def test_the_expected_tables_are_shipped():
    assert set(NAMES) >= {
        "iec60664_1_impulse", "iec60664_1_clearance", "iec60664_1_creepage",
        "iec60664_1_altitude", "ipc2221_spacing", "ipc2221_trace", "nec_310_16", "fuse_loading",
    }


@pytest.mark.parametrize("name", NAMES)
def test_header_is_complete(name):
    head = tables.load(name)["table"]
    for key in tables.REQUIRED:
        assert str(head[key]).strip(), f"{name}: empty {key}"
    assert head["lookup"] in tables.LOOKUPS


@pytest.mark.parametrize("name", NAMES)
def test_values_not_checked_against_the_printed_standard_say_so(name):
    certainty = tables.load(name)["table"]["certainty"]
    # A table file either says where its values were checked or that they are recalled.
    assert any(w in certainty for w in ("from memory", "checked", "see each entry")), certainty


def _rising(xs):
    return all(a < b for a, b in zip(xs, xs[1:]))


@pytest.mark.parametrize("name,keys,columns", [
    ("iec60664_1_impulse", "system_voltage", "category"),
    ("iec60664_1_clearance", "impulse_kv", "pollution_degree"),
    ("iec60664_1_creepage", "voltage", "columns"),
    ("ipc2221_spacing", "band_upper", "columns"),
    ("nec_310_16", "awg", "column"),
])
def test_rows_rise_and_every_column_has_one_value_per_row(name, keys, columns):
    data = tables.load(name)["data"]
    rows = data[keys]
    if name != "nec_310_16":
        assert _rising(rows)
    for col, values in data[columns].items():
        assert len(values) == len(rows), (name, col)
        # Spacings, impulse voltages and ampacities never fall as the row rises.
        assert all(a <= b for a, b in zip(values, values[1:])), (name, col)


def test_creepage_file_pins_the_2007_edition_and_names_the_2020_number():
    head = tables.load("iec60664_1_creepage")["table"]
    assert "2007" in head["edition"] and head["number"] == "F.4"
    assert "F.5" in head["number_note"] and "2020" in head["number_note"]


def test_tables_are_read_only_and_cached():
    t = tables.load("fuse_loading")
    assert t is tables.load("fuse_loading")
    with pytest.raises(TypeError):
        t["standards"]["ul248"]["limit"] = 1.0  # type: ignore[index]


def test_unknown_table_is_a_clear_error():
    with pytest.raises(KeyError, match="no standard table"):
        tables.load("no_such_table")


def test_interpolate_and_step_helpers():
    xs, ys = (1.0, 2.0, 4.0), (10.0, 20.0, 60.0)
    assert tables.interpolate(xs, ys, 3.0) == pytest.approx(40.0)
    assert tables.interpolate(xs, ys, 0.5) == 10.0
    assert tables.step_index(xs, 2.0) == 1 and tables.step_index(xs, 2.0001) == 2
    with pytest.raises(ValueError):
        tables.interpolate(xs, ys, 4.1)
    with pytest.raises(ValueError):
        tables.step_index(xs, 5.0)


def test_fuse_rerating_rows_rise_and_factors_fall():
    data = tables.load("fuse_ambient")["data"]
    assert _rising(data["ambient"]) and data["ambient"][0] == 25.0
    for std, values in data["standard"].items():
        assert len(values) == len(data["ambient"]), std
        assert values[0] == 1.0 and all(a >= b for a, b in zip(values, values[1:])), std


def test_new_tables_say_their_values_are_from_memory():
    for name in ("battery_chemistry", "fuse_ambient", "iec60364_4_43_k"):
        assert "from memory" in tables.load(name)["table"]["certainty"]
    assert "from memory" in tables.load("nec_310_16")["below_table"]["certainty"]
