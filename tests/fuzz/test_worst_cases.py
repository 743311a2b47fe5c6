"""The fuzzer's worst kinds of input, each on its own: refused (or reviewed) in bounded time.

Each case is a review (0 or 1) or a located error (2), in under the time limit; the bounds are
the loader's stated ones (:data:`reviewer.design.loader.MAX_BYTES`, ``MAX_DEPTH``,
``MAX_ENTRIES``) and the spectrum engine's carrier ratio
(:data:`reviewer.design.ranges.MAX_CARRIER_RATIO`).
"""

from __future__ import annotations

import re

import pytest

from reviewer.design import loader, ranges
from tests.conftest import example
from tests.fuzz.conftest import judge, run

pytestmark = pytest.mark.fuzz
CAREFUL = example("careful_12v_sine").read_text(encoding="utf-8")


def design(tmp_path, text: str, name: str = "d.toml"):
    p = tmp_path / name
    p.write_text(text, encoding="utf-8")
    return p


def check(path, *extra: str, factor: float = 5.0):
    o = run("check", str(path), "--format", "json", "--no-house-rules", *extra)
    judge(o, fmt="json", factor=factor)
    return o


def with_line(text: str, key: str, value: str) -> str:
    return re.sub(rf"(?m)^{key} = .*$", f"{key} = {value}", text, count=1)


@pytest.mark.parametrize("value, words", [
    ("nan", "finite number"), ("inf", "finite number"), ("-inf", "finite number"),
    ("1e999", "finite number"), ('"1e999 Hz"', "finite number"),
    ('"2 GHz"', "out of range"), ('"-20 kHz"', "out of range"), ('"0 Hz"', "out of range"),
    ('"100 Hz"', "less than 5 times"), ('"400 kHz"', "spectrum engine"),
])
def test_carrier_values_refused_with_line_field_value_and_range(tmp_path, value, words):
    text = with_line(CAREFUL, "carrier", value)
    o = check(design(tmp_path, text))
    assert o.code == 2
    line = text.splitlines().index(f"carrier = {value}") + 1
    assert f"d.toml:{line}: modulation.carrier: " in o.err and words in o.err, o.err


@pytest.mark.parametrize("key, value, words", [
    ("index", "-0.5", "above 0"), ("index", "7", "at most 3"), ("index", "nan", "finite"),
    ("frequency", '"-50 Hz"', "out of range"), ("frequency", '"0 Hz"', "out of range"),
    ("frequency", '"1 MHz"', "at most 100 kHz"),
    ("dead_time", '"-1 ns"', "at least 0 s"), ("dead_time", '"30 µs"', "neither switch"),
    ("ambient", '"-300 °C"', "absolute zero"), ("rds_on", '"-5 mΩ"', "out of range"),
    ("v_nom", "{ min = 13, typ = 12, max = 14 }", "min ≤ typ ≤ max"),
    ("v_nom", '"12 V ± -5%"', "min ≤ typ ≤ max"), ("efficiency", '"120 %"', "out of range"),
    ("efficiency", '"0 %"', "above 0"), ("min_pulse", '"1 ms"', "carrier period"),
])
def test_physical_ranges(tmp_path, key, value, words):
    text = with_line(CAREFUL, key, value)
    assert text != CAREFUL, key
    o = check(design(tmp_path, text))
    assert o.code == 2 and words in o.err, o.err
    line = text.splitlines().index(f"{key} = {value}") + 1
    assert f"d.toml:{line}: " in o.err, o.err


def test_the_largest_carrier_allowed_is_reviewed_in_time(tmp_path):
    top = ranges.MAX_CARRIER_RATIO * 50.0  # the example's output is 50 Hz
    # Measured with the batched worst-case search and the lighter pass-value check (branch
    # e12, a loaded 2-core machine): 5.0 and 5.1 times the plain example check in the same
    # session (was 7 to 10). The time still grows with the carrier because the waveform
    # synthesis covers five times as many carrier periods, and the pass-value re-reviews run it
    # again. The bound (12 times, over twice the measured ratio) catches what this test is for,
    # an input whose time grows without bound (a 2 GHz carrier ran out of memory); the
    # benchmarks measure the speed.
    o = check(design(tmp_path, with_line(CAREFUL, "carrier", f'"{top:g} Hz"')), factor=12.0)
    assert o.code in (0, 1), o.err


def test_a_file_above_the_size_limit_is_refused_unread(tmp_path):
    big = CAREFUL + ("# padding\n" * (loader.MAX_BYTES // 10 + 10))
    o = check(design(tmp_path, big))
    assert o.code == 2 and "larger than" in o.err
    huge = tmp_path / "huge.toml"
    with huge.open("w") as fh:  # tens of megabytes: refused without reading it whole
        fh.write(CAREFUL)
        fh.seek(40 << 20)
        fh.write("\n")
    o = check(huge)
    assert o.code == 2 and o.seconds < 2


@pytest.mark.parametrize("text", [
    "x = " + "[" * 100_000 + "]" * 100_000 + "\n",
    "x = " + "{ a = " * 5000 + "1" + " }" * 5000 + "\n",
    "x = " + "[" * 17 + "]" * 17 + "\n",
    ".".join(f"k{i}" for i in range(20_000)) + " = 1\n",
    "[" + ".".join(f"t{i}" for i in range(5000)) + "]\nx = 1\n",
    "x = [" + "[1]," * 200_000 + "]\n",
], ids=["deep-array", "deep-inline-table", "just-too-deep", "long-dotted-key", "long-header",
        "wide-array"])
def test_deep_nesting_is_refused(tmp_path, text):
    o = check(design(tmp_path, CAREFUL + text))
    assert o.code == 2 and ("nested more than" in o.err or "entries" in o.err
                            or "arrays and tables" in o.err), o.err


def test_too_many_entries_are_refused(tmp_path):
    extra = "[checklist]\n" + "".join(f'"q{i}" = "yes"\n' for i in range(loader.MAX_ENTRIES + 1))
    o = check(design(tmp_path, CAREFUL.replace("[checklist]", "[checklist_old]") + extra))
    assert o.code == 2 and "entries" in o.err, o.err


def test_many_small_problems_stay_fast(tmp_path):
    """Every line broken at once: one error each, quickly."""
    lines = [(line.split("=")[0] + "= nan") if "=" in line and not line.startswith(("[", "#"))
             else line for line in CAREFUL.splitlines()]
    o = check(design(tmp_path, "\n".join(lines)))
    assert o.code == 2 and o.err.count("\n") > 20


def test_not_utf8_names_the_line(tmp_path):
    p = tmp_path / "d.toml"
    raw = CAREFUL.encode("utf-8").split(b"\n")
    raw[5] = raw[5] + b"\xff\xfe"
    p.write_bytes(b"\n".join(raw))
    o = check(p)
    assert o.code == 2 and "d.toml:6: not UTF-8" in o.err, o.err
