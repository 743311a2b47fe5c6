"""The Markdown report: a golden file for a review built by hand (so that it does not move when
the built-in checks change), the pictures written beside the report, and every example.

The review below is assembled from invented findings and an invented calculation sheet over the
small test design; the Markdown is a pure function of it. To regenerate the golden file after an
intended change of the report, run::

    REVIEWER_REGEN_GOLDEN=1 .venv/bin/python -m pytest tests/report/test_markdown.py

then read tests/data/review_small.md (rendered and as plain text) before committing it.
"""

import os
import re
import xml.etree.ElementTree as ET

import pytest

from reviewer import record as rec
from reviewer.cli import main
from reviewer.design import parse_design
from reviewer.findings import Finding
from reviewer.quantities import Quantity, Sheet
from reviewer.report import markdown
from reviewer.review import Review
from tests.conftest import example
from tests.report.helpers import DATA, SMALL

GOLDEN = DATA / "review_small.md"


def q(name, unit, label, typ, lo=None, hi=None, kind="number", origin="derived", note=""):
    lo = typ if lo is None else lo
    hi = typ if hi is None else hi
    return Quantity(name, unit, label, typ, lo, hi, (typ, lo, hi), kind, origin, note)


def finding(rule_id, subject="", **kw):
    base = dict(area=rule_id.split(".")[0], title="A check", severity="risk", outcome="fail",
                why="Why it matters.", reference="Test reference", basis="practice")
    base.update(kw)
    return Finding(rule_id=rule_id, subject=subject, **base)


def hand_review(series=None, timing=True) -> Review:
    design = parse_design(SMALL.read_text(encoding="utf-8"), "record_small.toml")
    quantities = [
        q("op.bus_max", "V", "Highest bus voltage", 24.0, 22.0, 24.0),
        q("band.beyond_elv", "", "Beyond extra-low voltage", False, kind="flag"),
        q("layout.bus.trace_width", "m", "Minimum trace width of the bus path", 1.9e-3, 1.7e-3,
          2.1e-3, note="estimate"),
        q("layout.bus.spacing", "m", "Spacing between bus and ground nets", 0.6e-3),
        q("design.output.thd_target", "%", "output.thd_target", 0.05, origin="design"),
    ]
    if timing:
        quantities += [
            q("timing.low.dead_time", "s", "Dead time before this switch turns on", 100e-9),
            q("timing.high.dead_time", "s", "Dead time before this switch turns on", 100e-9),
            q("timing.low.overlap", "s", "Time both switches conduct", 50e-9),
            q("timing.high.overlap", "s", "Time both switches conduct", 0.0),
        ]
        for side, td_off, off, td_on, rise in (("high", 60e-9, 180e-9, 30e-9, 20e-9),
                                               ("low", 40e-9, 90e-9, 30e-9, 20e-9)):
            quantities += [q(f"switching.{side}.td_off", "s", "t_d(off)", td_off),
                           q(f"switching.{side}.turn_off_time", "s", "turn-off", off),
                           q(f"switching.{side}.td_on", "s", "t_d(on)", td_on),
                           q(f"switching.{side}.rise_time", "s", "t_r", rise)]
    sheet = Sheet({x.name: x for x in quantities}, {}, ((),), series or {})
    findings = (
        finding("stress.vgs-rating", "high", title="Gate-source voltage within the part's limit",
                severity="hazard", unit="V", relation="≤", value=25.0, value_typ=24.0,
                limit=20.0, margin=-5.0, pass_value=16.0, pass_unit="V",
                pass_field="drive.high.zener", fields=("switch.high.vgs_max",),
                corner=(("source.v_max", "max"),), mitigation="Clamp the gate at 16 V.",
                basis="book"),
        finding("timing.shoot-through", "low", title="The outgoing switch is off first",
                severity="hazard", unit="s", relation="≤", value=50e-9, limit=0.0, margin=-50e-9,
                fields=("timing.dead_time",), mitigation="Lengthen the dead time."),
        finding("bus.ripple-rating", title="Capacitor ripple within its rating", unit="A",
                relation="≤", value=3.0, limit=2.0, margin=-1.0),
        finding("checklist.gate-loop", title="Gate loops are short", question="Is every gate "
                "loop short?", outcome="fail", answer_note="the low side runs across the board"),
        finding("checklist.first-power-up", title="First power-up plan",
                question="Is there a plan for first power-up?", outcome="open"),
        finding("checklist.output-guarded", title="Output guarded",
                question="Are the output terminals guarded?", outcome="answered"),
        finding("thermal.junction", "high", title="Junction temperature", outcome="needs_data",
                needs=("switch.high.rth_jc",)),
        finding("voltage-class.bus-elv", title="Bus within extra-low voltage", severity="hazard",
                outcome="pass", unit="V", relation="≤", value=24.0, limit=120.0, margin=96.0,
                basis="standard"),
        finding("stress.vds-rating", "high", title="Drain-source peak within the rating",
                severity="hazard", outcome="pass", unit="V", relation="≤", value=26.0, limit=60.0,
                margin=34.0),
    )
    at = "2026-02-01T09:30:00Z"
    r = rec.Record("record_small.toml")
    by_key = {f.key: f for f in findings}
    r = rec.decide(r, by_key["stress.vgs-rating[high]"], "accepted",
                   "a 15 V zener is fitted at the gate", "ana", at)
    r = rec.decide(r, by_key["bus.ripple-rating"], "will_change", "", "bo", at)
    # made on numbers that have since moved: 2.5 A then, 3 A now
    moved = rec.Decision("bus.ripple-rating", "accepted", "two capacitors in parallel", "bo", at,
                         "fail", 2.5, 2.0, "A")
    r = rec.replace(r, decisions={**r.decisions, "bus.ripple-rating": moved})
    # resolved by the revision: failed then, passes now
    r = rec.replace(r, decisions={**r.decisions, "stress.vds-rating[high]": rec.Decision(
        "stress.vds-rating[high]", "will_change", "a 60 V part", "ana", at, "fail", 26.0, 40.0,
        "V")})
    # orphan: its rule was renamed
    r = rec.replace(r, decisions={**r.decisions, "gate.old-name[low]": rec.Decision(
        "gate.old-name[low]", "not_applicable", "no such stage", "cleo", at, "fail", 1.0, 2.0,
        "V")})
    r = rec.answer(r, "checklist.output-guarded", "yes", "a cover is fitted", "ana", at)
    r = rec.replace(r, proposals={"timing.dead_time": rec.Proposal("timing.dead_time", "300 ns",
                                                                   "covers the overlap", "bo", at)})
    return Review("record_small.toml", design, sheet, findings, r)


def test_golden_markdown():
    text = markdown.render([hand_review()], review_date="2026-02-02")
    if os.environ.get("REVIEWER_REGEN_GOLDEN"):
        GOLDEN.write_text(text, encoding="utf-8")
    assert text == GOLDEN.read_text(encoding="utf-8"), (
        "the Markdown report changed; if intended, regenerate with REVIEWER_REGEN_GOLDEN=1 "
        "(see this module's docstring) and read the result before committing it")


def test_markdown_sections_and_decisions():
    text = markdown.render([hand_review()], review_date="2026-02-02")
    heads = re.findall(r"^## (.+)$", text, flags=re.M)
    assert heads == ["Summary", "Findings", "Other decisions in the record", "Open questions",
                     "Answered questions", "Not checked: needs data", "Passed checks",
                     "Layout constraints", "Proposed changes", "Appendix: calculation sheet"]
    # the layout table carries the worst corner (2.1 mm) beside the typical value (1.9 mm)
    assert "| Minimum trace width of the bus path | `layout.bus.trace_width` | 2.1 mm | 1.9 mm |" \
        in text
    # the decision awaiting re-confirmation: old and new side by side
    assert "| value | 2.5 A | 3 A |" in text
    # every table row has the same number of cells as its header
    for block in re.findall(r"((?:^\|.*\|\n)+)", text, flags=re.M):
        rows = block.strip().split("\n")
        widths = {len(re.findall(r"(?<!\\)\|", row)) for row in rows}
        assert len(widths) == 1, block


def test_caution_beyond_elv():
    r = hand_review()
    sheet = r.sheet
    qs = dict(sheet.quantities)
    qs["band.beyond_elv"] = q("band.beyond_elv", "", "Beyond extra-low voltage", True, kind="flag")
    r2 = Review(r.path, r.design, Sheet(qs, {}, sheet.corners, {}), r.findings, r.record)
    text = markdown.render([r2], review_date="2026-02-02")
    assert "> **CAUTION: beyond extra-low voltage.**" in text and "qualified person" in text
    assert "CAUTION" not in markdown.render([r], review_date="2026-02-02")


SPECTRUM = {"unit": "V rms", "f0": 50.0, "frequency": [50.0, 150.0, 250.0, 20e3, 40e3],
            "bridge": [12.0, 0.4, 0.24, 6.0, 2.0], "output": [12.0, 0.39, 0.23, 0.02, 0.004],
            "output_side": "load"}


def svg_text(path):
    root = ET.parse(path).getroot()  # well-formed XML
    assert root.tag.endswith("svg")
    return " ".join(t.strip() for t in root.itertext() if t.strip())


def test_pictures_from_the_sheet(tmp_path):
    pytest.importorskip("matplotlib")
    from reviewer.report import pictures

    made = pictures.write_pictures(hand_review({"waveform.spectrum": SPECTRUM}), tmp_path, "r")
    assert [name for _, name in made] == ["r.timing.svg", "r.spectrum.svg"]
    timing = svg_text(tmp_path / "r.timing.svg")
    # the low side turns on 100 ns + 30 ns after the high side's command falls, while the high
    # side conducts until 180 ns: the published 50 ns overlap is marked on that commutation
    assert "overlap 50 ns" in timing and "no overlap" in timing and "dead 100 ns" in timing
    spectrum = svg_text(tmp_path / "r.spectrum.svg")
    # the target is a total, stated in words, not drawn as one component's level
    assert "target: total THD at the load at most 5 %" in spectrum
    assert spectrum.count("at the bridge, before the filter") == 1
    assert spectrum.count("at the load, after the filter") == 1
    assert "after" not in spectrum.replace("at the load, after the filter", "")
    # data absent: no picture, and no error
    assert pictures.write_pictures(hand_review(None, timing=False), tmp_path, "none") == []
    # switching times absent, dead time known: gate commands only
    r = hand_review(None, timing=False)
    qs = dict(r.sheet.quantities)
    qs["design.timing.dead_time"] = q("design.timing.dead_time", "s", "timing.dead_time", 2e-7,
                                      origin="design")
    r = Review(r.path, r.design, Sheet(qs, {}, ((),), {}), r.findings, r.record)
    assert [n for _, n in pictures.write_pictures(r, tmp_path, "cmd")] == ["cmd.timing.svg"]
    assert "gate commands only" in svg_text(tmp_path / "cmd.timing.svg")


def test_check_writes_pictures_beside_the_report(tmp_path, capsys):
    pytest.importorskip("matplotlib")
    out = tmp_path / "review.md"
    design = example("careful_12v_sine")
    assert main(["check", str(design), "--format", "markdown", "-o", str(out)]) == 0
    text = out.read_text()
    links = re.findall(r"!\[[^\]]+\]\(([^)]+)\)", text)
    assert links and all((tmp_path / link).is_file() for link in links)
    for link in links:
        svg_text(tmp_path / link)
    other = tmp_path / "plain" / "review.md"
    other.parent.mkdir()
    assert main(["check", str(design), "--format", "markdown", "-o", str(other),
                 "--no-pictures"]) == 0
    assert "## Pictures" not in other.read_text()
    assert [p.name for p in other.parent.iterdir()] == ["review.md"]
    capsys.readouterr()
    assert main(["check", str(design), "--format", "markdown"]) == 0
    assert "## Pictures" not in capsys.readouterr().out  # to stdout: nowhere to put them


def test_renders_as_commonmark_with_tables():
    """Rendered by markdown-it-py (a CommonMark parser, with GitHub-style tables on): every
    table written is a table rendered, and no raw pipe row is left as a paragraph."""
    from markdown_it import MarkdownIt

    text = markdown.render([hand_review()], review_date="2026-02-02")
    html = MarkdownIt("gfm-like").render(text)
    tables = len(re.findall(r"^\|---", text, flags=re.M))
    assert tables == html.count("<table>") > 5
    assert not re.search(r"<p>\|", html)
    assert html.count("<h3>") == 4  # one per failing finding


def test_spectrum_in_db_of_each_sides_own_fundamental():
    """A square wave's b_n = 4/(πn) for odd n (Kreyszig, Advanced Engineering Mathematics, 10th
    ed., §11.1, Example 1): the third harmonic is 20·log10(1/3) = −9.54 dB of the fundamental
    and the fifth −13.98 dB, whatever the scale; a transformer's ratio (×9.6 here) changes
    nothing once each side is referred to its own fundamental."""
    import math

    from reviewer.report.pictures import db_of_fundamental

    freq = [50.0, 150.0, 250.0]
    bridge = [4 / (math.pi * n) for n in (1, 3, 5)]
    load = [9.6 * b for b in bridge]
    for mag in (bridge, load):
        db = db_of_fundamental(freq, mag, 50.0)
        assert db[0] == pytest.approx(0.0)
        assert db[1] == pytest.approx(-9.542, abs=1e-3)
        assert db[2] == pytest.approx(-13.979, abs=1e-3)
    assert db_of_fundamental(freq, [0.0, 1.0, 1.0], 50.0) is None  # no fundamental: no picture


SHEET_SYMBOLS = re.compile(r"∞|\binf\b|\bnan\b|\bNone\b|\|\s*—\s*\|")
"""Symbols where the calculation sheet must give words (an unbounded or absent figure)."""


@pytest.mark.parametrize("name", ["low ratings", "no filter", "no thermal data",
                                  "unreachable target", "shared signal"])
def test_calculation_sheet_gives_words_for_unbounded_figures(name):
    # a switch rated below the bus peak avalanches without end (E = ½·L·I²·V_BR/(V_BR − V_bus)
    # has no finite value for V_BR ≤ V_bus: the unclamped-inductive-switching form, common
    # practice): the sheet says so in words and gives the reason, never "∞ J"
    from tests.variants import variant_review

    review = variant_review(name)
    lines = markdown.render([review]).split("## Appendix: calculation sheet", 1)[1].splitlines()
    bad = [ln for ln in lines if SHEET_SYMBOLS.search(ln)]
    assert not bad, "\n".join(bad)
    if name == "low ratings":
        (row,) = [ln for ln in lines if "`stress.high.avalanche_energy`" in ln]
        assert "no finite figure" in row and "at or above the switch's rating (12 V)" in row
