"""Fuzzing the inputs: mutated example designs, arbitrary TOML, engineering notation, rule files.

Every outcome must be a review (exit 0 or 1) or a clear error (exit 2, every line starting
``error:`` and naming its file and line), within :data:`~tests.fuzz.conftest.TIME_LIMIT`. See
``tests/fuzz/conftest.py`` for the bounded and the long run.
"""

from __future__ import annotations

import math
import shutil
import tempfile
from pathlib import Path

import pytest
from hypothesis import given, settings
from hypothesis import strategies as st

from tests.conftest import EXAMPLES, designs_in
from tests.fuzz.conftest import judge, run

pytestmark = pytest.mark.fuzz
settings.load_profile("fuzz")

DESIGNS = {p.stem: p.read_text(encoding="utf-8") for p in designs_in(EXAMPLES)}
RULES = {p.name: p.read_text(encoding="utf-8")
         for p in sorted((Path(__file__).resolve().parents[2] / "rules").glob("*.toml"))}
HOUSE = {p.name: p.read_text(encoding="utf-8")
         for p in sorted((EXAMPLES / "sample-house-rules").glob("*.toml"))}
WORK = Path(tempfile.mkdtemp(prefix="reviewer-fuzz-"))


@pytest.fixture(scope="module", autouse=True)
def _clean_up():
    yield
    shutil.rmtree(WORK, ignore_errors=True)


def write(text: str | bytes, name: str = "mutant.toml") -> Path:
    """The mutant in a folder of its own (so that no record or house rule of another applies)."""
    folder = Path(tempfile.mkdtemp(dir=WORK))
    p = folder / name
    if isinstance(text, bytes):
        p.write_bytes(text)
    else:
        p.write_text(text, encoding="utf-8", errors="surrogatepass")
    return p


def check(path: Path, *extra: str, fmt: str = "json"):
    o = run("check", str(path), "--format", fmt, "--no-house-rules", *extra)
    judge(o, fmt=fmt)
    return o


# --- values a person (or a broken script) types ---------------------------------------------
def _toml_float(x: float) -> str:
    if math.isnan(x):
        return "nan"
    if math.isinf(x):
        return "inf" if x > 0 else "-inf"
    return repr(x)


NASTY = st.sampled_from([
    "nan", "inf", "-inf", "+inf", '"nan"', '"inf"', '"-inf V"', "1e999", '"1e999"', "-1", "0",
    "-0.0", "1e300", "-1e300", "1e-300", '"5e-324"', '""', '"abc"', '"1 meg"', '"1 Meg"',
    '"10k ± -5%"', '"12 V ± 1e999"', '"12 V +/- nan"', "true", "[]", "{}", "[1, 2]",
    "{ min = 1, max = 0 }", "{ min = nan }", "{ typ = 1e999 }", '{ min = "1 V", max = "1 A" }',
    '"2 GHz"', '"-50 Hz"', '"0 Hz"', '"1e12 Hz"', '"-300 °C"', '"5000 %"', '"-5 %"',
    "99999999999999999999999999", "-99999999999999999999", '"１２ V"', '"12\\u0000V"',
    '"\\u202e12 V"', '"12 V\\n"', '"1.2.3"', '"e5"', '"1e"', '"--1"', '"0x10"', '"١٢"',
    '"1 µF"', '"1 uF"', '"1 mF"', '"1 kF"', '"100 nF"', '"4 mm²"', '"12 AWG"', '"99 AWG"',
    '"-4 mm²"', '"nan mm²"', '"1e999 mm²"', '"2/0"', '"0"', '"bus"', '"n"', '"p"', '"yes"',
    "1979-05-27T07:32:00Z", "'''a'''", '"' + "9" * 400 + '"', '"' + "k" * 2000 + '"',
])
FLOATS = st.floats(allow_nan=True, allow_infinity=True).map(_toml_float)
WORDS = st.text(alphabet=st.characters(codec="utf-8", exclude_categories=["Cs"]),
                max_size=30).map(lambda s: '"' + s.replace("\\", "\\\\").replace('"', '\\"')
                                 .replace("\n", "\\n").replace("\r", "\\r") + '"')
UNIT_WORDS = ["V", "A", "Hz", "s", "Ω", "F", "H", "%", "°C"]
VALUES = st.one_of(NASTY, FLOATS, WORDS,
                   st.integers(min_value=-(10 ** 30), max_value=10 ** 30).map(str),
                   st.floats(min_value=-1e6, max_value=1e6).map(
                       lambda x: f'"{x:g} {UNIT_WORDS[int(abs(x)) % 9]}"'))


def _value_lines(text: str) -> list[int]:
    return [i for i, line in enumerate(text.splitlines())
            if "=" in line and not line.lstrip().startswith(("#", "["))]


@st.composite
def mutants(draw) -> str:
    """An example design with one to four faults of the kinds a person or a tool makes."""
    text = DESIGNS[draw(st.sampled_from(sorted(DESIGNS)))]
    for _ in range(draw(st.integers(1, 4))):
        lines = text.splitlines()
        kind = draw(st.sampled_from(["value", "value", "value", "delete", "duplicate", "add",
                                     "header", "unicode", "dotted"]))
        values = _value_lines(text)
        if kind == "value" and values:
            i = draw(st.sampled_from(values))
            key = lines[i].split("=", 1)[0]
            lines[i] = f"{key}= {draw(VALUES)}"
        elif kind == "delete" and lines:
            del lines[draw(st.integers(0, len(lines) - 1))]
        elif kind == "duplicate" and values:
            i = draw(st.sampled_from(values))
            lines.insert(i, lines[i])
        elif kind == "add":
            key = draw(st.sampled_from(["frequency", "carrier", "index", "dead_time", "extra",
                                        "v_nom", "rds_on", "ambient", "kind", "format"]))
            lines.insert(draw(st.integers(0, len(lines))), f"{key} = {draw(VALUES)}")
        elif kind == "header":
            lines.insert(draw(st.integers(0, len(lines))),
                         draw(st.sampled_from(["[switch.middle]", "[[design]]", "[timing]",
                                               "[modulation.index]", "[x.y.z]", "[checklist]"])))
        elif kind == "unicode" and lines:
            i = draw(st.integers(0, len(lines) - 1))
            at = draw(st.integers(0, len(lines[i])))
            junk = draw(st.sampled_from(["\u00a0", "\u200b", "\ufeff", "\u202e", "Ω", "µ", "μ",
                                         "\t", "\x00", "\x7f", "é", "\U0001f600"]))
            lines[i] = lines[i][:at] + junk + lines[i][at:]
        elif kind == "dotted" and values:
            i = draw(st.sampled_from(values))
            key, _, value = lines[i].partition("=")
            lines[i] = f"{key.strip()}.inner ={value}"
        text = "\n".join(lines) + "\n"
    return text


@given(mutants(), st.sampled_from(["json", "text", "sarif", "markdown"]))
def test_mutated_examples(text, fmt):
    check(write(text), fmt=fmt)


@given(st.sampled_from(sorted(DESIGNS)), st.data())
def test_byte_faults(name, data):
    raw = bytearray(DESIGNS[name].encode("utf-8"))
    for _ in range(data.draw(st.integers(1, 6))):
        at = data.draw(st.integers(0, len(raw) - 1))
        kind = data.draw(st.sampled_from(["flip", "insert", "delete", "truncate"]))
        if kind == "flip":
            raw[at] ^= 1 << data.draw(st.integers(0, 7))
        elif kind == "insert":
            raw[at:at] = data.draw(st.binary(min_size=1, max_size=8))
        elif kind == "delete":
            del raw[at:at + data.draw(st.integers(1, 40))]
        else:
            del raw[at:]
        if not raw:
            raw = bytearray(b"x")
    check(write(bytes(raw)))


# --- arbitrary TOML documents --------------------------------------------------------------
KEYS = st.one_of(st.sampled_from(["design", "source", "output", "switch", "high", "low", "drive",
                                  "v_nom", "frequency", "title", "kind", "rule", "format"]),
                 st.text(min_size=1, max_size=8))
SCALARS = st.one_of(st.booleans(), st.integers(-(2 ** 63), 2 ** 63 - 1),
                    st.floats(allow_nan=True, allow_infinity=True), st.text(max_size=20), NASTY)
TOML_DATA = st.recursive(
    SCALARS.filter(lambda v: not isinstance(v, str) or not v.startswith(("[", "{"))),
    lambda inner: st.one_of(st.lists(inner, max_size=4), st.dictionaries(KEYS, inner, max_size=4)),
    max_leaves=30)


@given(st.dictionaries(KEYS, TOML_DATA, max_size=6))
def test_arbitrary_toml(data):
    import tomli_w

    try:
        text = tomli_w.dumps(data)
    except (TypeError, ValueError):  # a document TOML cannot hold (e.g. mixed arrays): not ours
        return
    check(write(text))


@given(st.dictionaries(KEYS, TOML_DATA, max_size=4), st.sampled_from(sorted(DESIGNS)))
def test_arbitrary_toml_tables_in_a_design(data, name):
    """An example with arbitrary tables and keys added at its end."""
    import tomli_w

    try:
        extra = tomli_w.dumps({"source": data}) if data else ""
    except (TypeError, ValueError):
        return
    check(write(DESIGNS[name] + "\n" + extra))


# --- engineering notation ------------------------------------------------------------------
NOTATION = st.one_of(
    WORDS.map(lambda s: s[1:-1]),
    st.builds(lambda n, p, u, t: f"{n}{p}{u}{t}",
              st.one_of(st.floats(allow_nan=True, allow_infinity=True).map(repr),
                        st.sampled_from(["1", "-1", "0", "4.7", ".5", "5.", "1e3", "1e-400",
                                         "1e400", "1_000", "nan", "inf", "", "+", "1,5"])),
              st.sampled_from(["", " ", "k", "M", "m", "u", "µ", "n", "p", "f", "G", "T", "meg",
                               " meg", "MEG", "Meg", "mil"]),
              st.sampled_from(["", "V", "A", "Hz", "s", "Ω", "ohm", "R", "F", "H", "%", "°C",
                               "K/W", "°", "deg", "W", "C", "S", "m", "AWG", "mm²"]),
              st.sampled_from(["", " ± 5%", " +/- 0.5", " ± -5%", " ± nan", " ± 1e999", " ±",
                               "±5", " ± 5 %", " +- 1e-3"])))


@given(NOTATION, st.sampled_from(["V", "A", "Ω", "F", "H", "s", "Hz", "W", "C", "S", "m", "m²",
                                  "°C", "K/W", "rad", "", "%"]))
def test_notation_is_a_finite_span_or_a_value_error(text, unit):
    """The field validator either gives a finite, ordered span within the unit's range or
    raises ValueError (which the loader turns into a located error); nothing else."""
    from reviewer.design.fields import _validator
    from reviewer.design.ranges import for_unit

    try:
        span = _validator(unit)(text)
    except ValueError:
        return
    assert all(math.isfinite(v) for v in (span.lo, span.typ, span.hi))
    assert span.lo <= span.typ <= span.hi
    assert for_unit(unit).allows(span.lo) and for_unit(unit).allows(span.hi)


FIELDS = [("switch.high", "rds_on"), ("output", "frequency"), ("modulation", "carrier"),
          ("timing", "dead_time"), ("source", "v_nom"), ("drive.high", "r_gate"),
          ("environment", "ambient"), ("modulation", "index"), ("wiring", "size")]


@given(NOTATION, st.sampled_from(FIELDS))
def test_notation_in_a_design(text, where):
    table, key = where
    escaped = text.replace("\\", "\\\\").replace('"', '\\"').replace("\n", "\\n")
    design = DESIGNS["careful_12v_sine"] + f'\n[{table}]\n{key} = "{escaped}"\n'
    # a table given twice is a TOML error; set the key inside the existing table instead
    lines = DESIGNS["careful_12v_sine"].splitlines()
    if f"[{table}]" in lines:
        at = lines.index(f"[{table}]") + 1
        lines = [x for x in lines if not x.startswith(f"{key} =") or
                 lines.index(x) < at - 1 or not _in_table(lines, lines.index(x), table)]
        lines.insert(at, f'{key} = "{escaped}"')
        design = "\n".join(lines) + "\n"
    check(write(design))


def _in_table(lines: list[str], i: int, table: str) -> bool:
    for j in range(i, -1, -1):
        if lines[j].startswith("["):
            return lines[j] == f"[{table}]"
    return False


# --- rule files ----------------------------------------------------------------------------
@st.composite
def rule_mutants(draw) -> str:
    pool = {**RULES, **HOUSE}
    text = pool[draw(st.sampled_from(sorted(pool)))]
    lines = text.splitlines()
    for _ in range(draw(st.integers(1, 3))):
        values = _value_lines("\n".join(lines))
        kind = draw(st.sampled_from(["value", "expr", "delete", "duplicate"]))
        if kind in ("value", "expr") and values:
            i = draw(st.sampled_from(values))
            key = lines[i].split("=", 1)[0]
            if kind == "expr":
                junk = draw(st.sampled_from([
                    '"1 / 0"', '"op.bus_max ** 1e9"', '"10 ** 10 ** 10"', '"(" * 500',
                    '"' + "(" * 300 + "1" + ")" * 300 + '"', '"__import__(\'os\')"',
                    '"op.bus_max.__class__"', '"max()"', '"sqrt(-1)"', '"log(0)"',
                    '"nan"', '"inf V"', '"1e999 V"', '"x if y else"', '"op.nothing > 1 V"',
                    '"2 * op.bus_max + 20 A"', '"\'a\' * 100000000"', '"[1] * 10 ** 8"']))
                lines[i] = f"{key}= {junk}"
            else:
                lines[i] = f"{key}= {draw(VALUES)}"
        elif kind == "delete" and lines:
            del lines[draw(st.integers(0, len(lines) - 1))]
        elif kind == "duplicate" and values:
            i = draw(st.sampled_from(values))
            lines.insert(i, lines[i])
    return "\n".join(lines) + "\n"


@given(rule_mutants())
def test_mutated_rule_files(text):
    rules = write(text, "house.toml")
    design = rules.parent / "design.toml"
    design.write_text(DESIGNS["naive_bench_pchannel"], encoding="utf-8")
    check(design, "--rules", str(rules))
    o = run("rules", "lint", str(rules))
    judge(o)


# --- review records ------------------------------------------------------------------------
RECORD = """format = "bridge-reviewer/record"
version = 1
design = "design.toml"

[[decision]]
key = "timing.no-dead-time"
kind = "accepted"
reason = "bench only"
reviewer = "ana"
at = "2026-01-01T00:00:00Z"
outcome = "fail"
value = 0.0
limit = 1e-07
unit = "s"

[[answer]]
question = "checklist.gate-loop"
answer = "yes"

[[proposal]]
field = "timing.dead_time"
value = "800 ns"
"""


@st.composite
def record_mutants(draw) -> str:
    lines = RECORD.splitlines()
    for _ in range(draw(st.integers(1, 3))):
        values = _value_lines("\n".join(lines))
        kind = draw(st.sampled_from(["value", "value", "delete", "duplicate", "header"]))
        if kind == "value" and values:
            i = draw(st.sampled_from(values))
            lines[i] = f"{lines[i].split('=', 1)[0]}= {draw(VALUES)}"
        elif kind == "delete" and lines:
            del lines[draw(st.integers(0, len(lines) - 1))]
        elif kind == "duplicate" and values:
            i = draw(st.sampled_from(values))
            lines.insert(i, lines[i])
        else:
            lines.insert(draw(st.integers(0, len(lines))),
                         draw(st.sampled_from(["[[decision]]", "[decision]", "[[answer]]",
                                               "[design]", "[[rule]]"])))
    return "\n".join(lines) + "\n"


@given(record_mutants())
def test_mutated_records(text):
    """A broken record beside a design: the check reviews or names the record's problem."""
    design = write(DESIGNS["naive_bench_pchannel"], "design.toml")
    (design.parent / "design.review.toml").write_text(text, encoding="utf-8")
    check(design)
