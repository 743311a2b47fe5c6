"""The deck itself, without a simulator: syntax, the corner it is written at, the values it takes
from the review, the bridge waveform it carries, the command line and the time it takes.

Outside references named beside each check: the SPICE3 element and card syntax (the SPICE3f5
user's manual, "Circuit elements and models"; from memory); the RMS of a piecewise-constant
waveform by exact integration (its definition); the rest are the review's own published values,
which the deck must carry unchanged.
"""

from __future__ import annotations

import math
import re
import statistics
import time

import numpy as np
import pytest

from reviewer.deck import ANALYSES, DeckError, build_deck
from reviewer.deck.bridge import pwl_points, ramp_half_width
from reviewer.deck.corner import Values, choose_corner
from tests.conftest import EXAMPLES, example, review_text


@pytest.fixture(scope="module")
def careful():
    from reviewer.review import review_file

    return review_file(example("careful_12v_sine"))


@pytest.fixture(scope="module")
def naive():
    from reviewer.review import review_file

    return review_file(example("naive_bench_pchannel"))


# SPICE3 element letters used here: V I R C L D M S G; cards start with a dot; comments with *.
_ELEMENT = re.compile(r"^(?:[VIRCLDSMG][A-Za-z0-9_]*\s+\S+|\.(?:model|tran|ac|options|end)\b|\*|\+ |$)")


def _prose(text: str) -> str:
    """The comment lines of a deck as one line of words (they are wrapped at any word)."""
    return " ".join(ln.lstrip("*").strip() for ln in text.splitlines() if ln.startswith("*"))


def _cards(text: str) -> list[str]:
    return [ln for ln in text.splitlines()[1:] if ln and not ln.startswith(("*", "+"))]


@pytest.mark.parametrize("name", [p.stem for p in sorted(EXAMPLES.glob("*.toml"))])
@pytest.mark.parametrize("analysis", ANALYSES)
def test_every_example_makes_a_plain_deck(name, analysis):
    from reviewer.review import review_file

    review = review_file(example(name))
    deck = build_deck(review, "worst", analysis)
    text = deck.text
    assert text.isascii()
    lines = text.splitlines()
    assert lines[-1] == ".end"
    for ln in lines[1:]:  # the first line of a deck is its title
        assert _ELEMENT.match(ln), ln
    active = [c for c in _cards(text) if c.startswith((".tran", ".ac"))]
    assert len(active) == 1
    assert active[0].startswith(".ac" if analysis == "ac" else ".tran")
    # the other analyses are there as comments
    assert sum(ln.startswith(("*.tran", "*.ac")) for ln in lines) == 2
    # element names are unique (SPICE refuses duplicates)
    names = [c.split()[0].lower() for c in _cards(text) if not c.startswith(".")]
    assert len(names) == len(set(names))
    # no scale suffixes that SPICE reads differently from engineering notation ("1M" is milli)
    for c in _cards(text):
        for tok in c.split()[1:]:
            assert not re.fullmatch(r"-?[0-9.]+[mM]", tok), c


def test_worst_is_the_failing_shoot_through_corner(naive):
    # The naive design fails shoot-through at both edges (one signal and its inverse) and
    # passes V_DS: the failing finding's corner wins.
    c = choose_corner(naive, "worst")
    assert c.finding is not None and c.finding.rule_id == "timing.shoot-through"
    assert c.finding.outcome == "fail"
    assert c.run == naive.sheet.corners.index(c.finding.corner)
    deck = build_deck(naive, "worst")
    vth = Values(naive.sheet, c.run).design("switch.high.vth")
    assert dict(c.assignment)["switch.high.vth"] == "min"
    assert vth == pytest.approx(1.0)  # the design's V_th min
    assert f"VTO={-vth:g}" in deck.text  # P-channel: a negative threshold
    assert "one signal and its inverse feed the leg" in _prose(deck.text)


def test_worst_without_failures_takes_the_smallest_relative_margin(careful):
    c = choose_corner(careful, "worst")
    judged = [f for f in careful.findings
              if f.rule_id in ("timing.shoot-through", "stress.vds-rating", "stress.vds-derating")
              and f.margin is not None]
    assert all(f.outcome == "pass" for f in judged)
    assert c.finding.relative_margin == min(f.relative_margin for f in judged)


def test_a_finding_key_picks_that_findings_corner(careful):
    f = careful.finding("timing.shoot-through[high]")
    c = choose_corner(careful, f)
    assert c.assignment == tuple(f.corner)
    v = Values(careful.sheet, c.run)
    deck = build_deck(careful, f)
    # the dead time in the commands is the one the finding was judged on
    dead = deck.edges["pos.high.on"] - deck.edges["pos.low.off"]
    assert dead == pytest.approx(f.value)
    assert dead == pytest.approx(v.get("timing.high.dead_time"))


def test_typical_takes_the_typical_run(careful):
    c = choose_corner(careful, "typical")
    assert c.run == 0 and c.assignment == ()
    deck = build_deck(careful, "typical")
    assert "VTO=3 " in deck.text  # switch.high.vth typ


def test_values_come_from_the_review(careful):
    deck = build_deck(careful, "typical")
    v = Values(careful.sheet, 0)
    cards = {c.split()[0]: c.split() for c in _cards(deck.text)}
    assert float(cards["Vbus"][-1]) == pytest.approx(v.get("op.bus_max"))
    assert float(cards["Von_h"][-1]) == pytest.approx(v.get("switching.high.v_drive"))
    assert float(cards["Rg_h"][-1]) == pytest.approx(v.design("drive.high.r_gate"))
    assert float(cards["Rsrc_h"][-1]) == pytest.approx(v.design("drive.high.r_source"))
    assert float(cards["Rsnk_l"][-1]) == pytest.approx(v.design("drive.low.r_sink"))
    assert float(cards["Rpull_h"][-1]) == pytest.approx(v.design("drive.high.pull_resistor"))
    ciss, crss = v.design("switch.high.ciss"), v.design("switch.high.crss")
    # the input capacitance below and above the plateau: C_iss, or the review's charge-based
    # figures where its switching times are sized from the gate charges
    from reviewer.physics import switching as sp

    if hasattr(sp, "charge_capacitances"):
        lo, hi = sp.charge_capacitances(ciss, v.design("switch.high.qg"),
                                        v.design("switch.high.qgs"), v.design("switch.high.qgd"),
                                        v.get("switching.high.v_plateau"),
                                        v.design("switch.high.rds_on_vgs"))
    else:
        lo = hi = ciss
    base = float(cards["Cgs_h"][-1]) + float(cards["Cgd_h"][-1])
    extra = float(cards["Cxc_h"][-1]) if "Cxc_h" in cards else 0.0
    assert base == pytest.approx(min(lo, hi))
    assert base + extra == pytest.approx(max(lo, hi))
    assert float(cards["Cgd_h"][-1]) == pytest.approx(crss)
    assert float(cards["Lf"][-1]) == pytest.approx(v.design("filter.inductance"))
    assert float(cards["Cf"][-1]) == pytest.approx(v.design("filter.capacitance"))
    # every element has a comment line naming where it came from
    lines = deck.text.splitlines()
    for i, ln in enumerate(lines):
        if ln.startswith(("Rg_h", "Cgs_h", "Von_h", "Lf", "Cf", "Rload", "Vbus")):
            assert lines[i - 1].startswith("*"), ln


def test_the_pwl_carries_the_reviews_bridge_waveform(careful):
    # Exact RMS of the piecewise-linear waveform (each ramp integrated exactly: a linear
    # segment from a to b has mean square (a² + ab + b²)/3) against the review's published
    # bridge RMS at the nominal bus.
    from reviewer.deck import _edges

    v = Values(careful.sheet, 0)
    edges = _edges(v)
    v_nom = v.get("op.bus_nom")
    pts = np.array(pwl_points(edges, v_nom, 0.0, 1, ramp_half_width(edges)))
    pts = np.vstack([pts, [edges.period + ramp_half_width(edges), pts[-1, 1]]])
    t, y = pts[:, 0], pts[:, 1]
    dt = np.diff(t)
    ms = np.sum(dt * (y[:-1] ** 2 + y[:-1] * y[1:] + y[1:] ** 2) / 3) / (t[-1] - t[0])
    assert math.sqrt(ms) == pytest.approx(v.get("waveform.bridge_rms"), rel=1e-3)
    assert np.all(np.diff(t) > 0)
    assert set(np.round(y / v_nom, 9)) <= {-1.0, 0.0, 1.0}


def test_a_design_without_gate_capacitance_is_a_clear_error(tmp_path):
    text = example("naive_bench_pchannel").read_text(encoding="utf-8")
    text = re.sub(r'(?m)^ciss = .*\n', "", text)
    text = re.sub(r'(?m)^qg = .*\n', "", text)
    review = review_text(text, "no_ciss.toml")
    with pytest.raises(DeckError) as e:
        build_deck(review)
    assert "ciss" in str(e.value)


def test_the_deck_for_the_careful_example_takes_at_most_50_ms(careful):
    times = []  # median of seven: the machine is shared
    for _ in range(7):
        t0 = time.perf_counter()
        build_deck(careful, "worst")
        times.append(time.perf_counter() - t0)
    assert statistics.median(times) <= 0.050, times


# --- the command line --------------------------------------------------------------------

def test_command_writes_the_deck_atomically(tmp_path, capsys):
    from reviewer.cli import main

    out = tmp_path / "leg.cir"
    assert main(["deck", str(example("careful_12v_sine")), "-o", str(out)]) == 0
    text = out.read_text(encoding="ascii")
    assert text.startswith("Bridge Reviewer deck: ") and text.endswith(".end\n")
    assert [p.name for p in tmp_path.iterdir()] == ["leg.cir"]  # no temporary file left
    assert "wrote" in capsys.readouterr().err


def test_command_prints_to_standard_output(capsys):
    from reviewer.cli import main

    assert main(["deck", str(example("careful_12v_sine")), "--corner", "typical",
                 "--analysis", "ac"]) == 0
    text = capsys.readouterr().out
    assert "\n.ac dec " in text and "\n*.tran " in text


def test_command_missing_folder_is_exit_2(tmp_path, capsys):
    from reviewer.cli import main

    out = tmp_path / "absent" / "leg.cir"
    assert main(["deck", str(example("careful_12v_sine")), "-o", str(out)]) == 2
    err = capsys.readouterr().err
    assert "no such folder" in err and "absent" in err
    assert not out.parent.exists()


def test_command_unknown_finding_key_is_exit_2(capsys):
    from reviewer.cli import main

    assert main(["deck", str(example("careful_12v_sine")), "--corner",
                 "timing.shoot-throug[high]"]) == 2
    assert "did you mean 'timing.shoot-through[high]'" in capsys.readouterr().err


def test_command_finding_key_and_bare_rule_id(capsys):
    from reviewer.cli import main

    # a rule with two subjects needs the subject
    assert main(["deck", str(example("careful_12v_sine")), "--corner",
                 "timing.shoot-through"]) == 2
    assert "several subjects" in capsys.readouterr().err
    assert main(["deck", str(example("careful_12v_sine")), "--corner",
                 "timing.shoot-through[low]"]) == 0
    assert "timing.shoot-through[low]" in capsys.readouterr().out


def test_command_missing_data_is_exit_2(tmp_path, capsys):
    from reviewer.cli import main

    text = example("naive_bench_pchannel").read_text(encoding="utf-8")
    text = re.sub(r'(?m)^(ciss|qg) = .*\n', "", text)
    design = tmp_path / "no_ciss.toml"
    design.write_text(text, encoding="utf-8")
    assert main(["deck", str(design), "--no-house-rules"]) == 2
    err = capsys.readouterr().err
    assert "no_ciss.toml" in err and "ciss" in err
