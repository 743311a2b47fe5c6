"""The timing and spectrum pictures: what is drawn, and where, from published quantities.

The spectrum input is the Fourier series of a square wave, b_n = 4/(πn) for odd n (Kreyszig,
Advanced Engineering Mathematics, 10th ed., §11.1, Example 1), so the third harmonic sits at
20·log10(1/3) = −9.54 dB and the fifth at −13.98 dB of the fundamental, and the THD is
√(π²/8 − 1) = 48.3 % (the same series summed). The timing input is a hand-made edge; the overlap
is its turn-off end minus its turn-on start (the definition of the shoot-through window)."""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.quantities import Missing, Quantity, Sheet
from reviewer.tui import pictures


def sheet(values: dict[str, float], series: dict | None = None, missing=()) -> Sheet:
    qs = {n: Quantity(n, "s", n, v, v, v, (v,), "number",
                      "design" if n.startswith("design.") else "derived")
          for n, v in values.items()}
    return Sheet(qs, {m.name: m for m in missing}, ((),), series or {})


def edge_values(dead: float) -> dict[str, float]:
    v = {}
    for inc, out in (("low", "high"), ("high", "low")):
        v |= {f"timing.{inc}.dead_time": dead, f"timing.{inc}.outgoing_turn_off": 400e-9,
              f"timing.{inc}.incoming_delay": 50e-9, f"switching.{out}.td_off": 200e-9,
              f"switching.{inc}.td_on": 50e-9, f"switching.{inc}.rise_time": 30e-9,
              f"timing.{inc}.overlap": max(0.0, 400e-9 - (dead + 50e-9))}
    return v


def row(lines: list[str], label: str) -> str:
    return next(line for line in lines if line.startswith(label))


def test_overlap_drawn_on_shoot_through():
    width = 60
    lines = pictures.timing_lines(pictures.edge(sheet(edge_values(100e-9)), "low"), width)
    both = row(lines, "BOTH ON")
    # 400 ns − (100 ns + 50 ns), hand calculation
    assert "SHOOT-THROUGH: both on for 250 ns" in row(lines, "dead time 100 ns")
    plot = both[14:14 + width]
    span = 400e-9 * 1.2 * 1.12  # the drawn window: 12 % before the edge, 20 % past the last event
    assert plot.count(pictures.OVERLAP) == pytest.approx(250e-9 / span * (width - 1), abs=1.5)
    # the overlap starts where the incoming switch starts to turn on, after the dead time
    cmd = row(lines, "low gate cmd")[14:]
    assert plot.index(pictures.OVERLAP) > cmd.index(pictures.ON)


def test_no_overlap_with_enough_dead_time():
    lines = pictures.timing_lines(pictures.edge(sheet(edge_values(500e-9)), "low"), 60)
    assert not any(line.startswith("BOTH ON") for line in lines)
    assert "never (margin 150 ns)" in row(lines, "dead time 500 ns")  # 500 + 50 − 400 ns


def test_commands_only_without_switching_times():
    s = sheet({"design.timing.dead_time": 0.0},
              missing=[Missing("switching.low.td_on", ("switch.low.ciss",))])
    lines = pictures.timing_picture(s, 40)
    assert all(len(line) <= pictures.LEAD + 40 for line in lines)  # sentences wrapped to fit
    assert "give switch.low.ciss" in " ".join(line.strip() for line in lines)
    assert not any("channel" in line for line in lines)


def square_series() -> dict:
    f0 = 50.0
    n = np.arange(1, 200, 2)
    amp = 4 / (math.pi * n)
    return {"waveform.spectrum": {"frequency": list(f0 * n), "bridge": list(amp),
                                  "output": list(amp / n**2), "f0": f0}}


def test_square_wave_bars_and_thd():
    thd = math.sqrt(math.pi**2 / 8 - 1)  # 48.34 %, closed form for the square wave
    s = sheet({"design.output.frequency": 50.0, "design.output.thd_target": 0.08,
               "waveform.bridge_thd": thd, "waveform.output_thd": 0.02}, square_series())
    data = pictures.spectrum_data(s)
    assert data is not None and data.f0 == 50.0
    width, height = 60, 8
    lines = pictures.spectrum_lines(data, width, height)
    chart = [line[8:8 + width] for line in lines[2:2 + height]]
    edges = np.geomspace(50.0 * 0.8, float(np.max(data.freq)) * 1.0001, width + 1)

    def bar(f: float) -> int:
        c = int(np.searchsorted(edges, f) - 1)
        return sum(1 for r in chart if r[c] != " ")

    # rows are 7.5 dB each; a component fills the rows whose middle lies at or below its level
    assert bar(50.0) == 8
    assert bar(150.0) == 7   # −9.54 dB
    assert bar(250.0) == 6   # −13.98 dB
    before = row(lines, "THD before")
    assert "48.3 %" in before
    after = row(lines, "THD after")
    assert "2.0 %" in after and "within the target" in row(lines, "After the filter")
    scale = thd * 1.1
    bars = width - 12  # the THD bars leave room for their labels and values within the width
    tcol = round(0.08 / scale * bars)
    assert before[12 + tcol] == "┃" and after[12 + tcol] == "┃"
    assert "target 8.0 %" in lines[-2]


def test_no_spectrum_is_said():
    s = sheet({"design.output.thd_target": 0.05})
    lines = pictures.spectrum_picture(s)
    assert "No spectrum" in lines[0] and "5.0 %" in lines[-1]


def cornered(values_typ: dict[str, float], values_worst: dict[str, float]) -> Sheet:
    """A sheet with two runs: typical, and one corner (switch.low.vth at min)."""
    qs = {n: Quantity(n, "s", n, v, min(v, values_worst[n]), max(v, values_worst[n]),
                      (v, values_worst[n]), "number") for n, v in values_typ.items()}
    return Sheet(qs, {}, ((), (("switch.low.vth", "min"),)), {})


def test_timing_drawn_at_the_corner_the_finding_was_judged_at():
    from reviewer.findings import Finding
    from reviewer.report.timing import worst_run

    typ, worst = edge_values(100e-9), edge_values(100e-9)
    for inc in ("low", "high"):  # a slower turn-off at the corner: 600 ns instead of 400 ns
        worst[f"timing.{inc}.outgoing_turn_off"] = 600e-9
        worst[f"timing.{inc}.overlap"] = 600e-9 - (100e-9 + 50e-9)
    s = cornered(typ, worst)
    f = Finding("timing.shoot-through", "high", "timing", "t", "hazard", "fail",
                corner=(("switch.low.vth", "min"),))
    assert worst_run(s, "high", [f]) == 1
    lines = pictures.timing_picture(s, 60, [f])
    text = " ".join(line.strip() for line in lines)  # sentences are wrapped to the width
    at = text.index("AT THE WORST CORNER")
    typical_at = text.index("at typical values", at)
    # 600 − 150 = 450 ns at the corner, 400 − 150 = 250 ns typical (hand calculation)
    assert "both on for 450 ns" in text[at:typical_at]
    assert "both on for 250 ns" in text[typical_at:]
    assert "switch.low.vth at min" in text[at:typical_at]
    # panels are named by the outgoing and incoming switch, as the finding's text does
    assert "outgoing low side, incoming high side (timing.shoot-through[high])" in text


@pytest.mark.parametrize("width", [20, 30, 60, 120])
def test_time_scale_at_every_width(width):
    lines = pictures.timing_lines(pictures.edge(sheet(edge_values(100e-9)), "low"), width)
    assert any("full width" in line for line in lines)
    axis = next(i for i, line in enumerate(lines) if "┴" in line)
    assert lines[axis + 1].strip()  # at least one time label under the ticks
