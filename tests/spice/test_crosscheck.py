"""The review's estimates cross-checked against ngspice on the deck the tool writes.

The outside reference is ngspice (batch mode, ``ngspice -b``) simulating the deck exactly as
``reviewer deck`` writes it. Every expected value is one the review PUBLISHES at the deck's
corner (``Quantity.runs`` at ``Deck.corner.run``), never a copied number, so the checks hold
whatever the switching-time formulas become, as long as the review and the circuit agree.

Quantity definitions (chosen so that both sides measure the same thing):

- turn-on delay ``switching.{side}.td_on``: from the command edge until V_GS reaches the
  threshold ``design.switch.{side}.vth`` (before the threshold the channel carries nothing and
  the drain does not move, so the gate network is a plain RC (or constant-current) charge of
  C_iss through the drive's resistances);
- turn-off delay ``switching.{side}.td_off``: from the command edge until V_GS falls to the
  review's Miller plateau ``switching.{side}.v_plateau`` (the channel is fully on until then and
  the drain stays put, so the gate discharges C_iss through the turn-off path, the pull
  resistor where it is the only one).

Both are measured on the edges where the switch switches hard (the load current flows through
its channel, not its body diode): the high side at the positive current peak, the low side at
the negative one. On the other edges the drain moves before the threshold (third-quadrant
conduction) and the comparison would not be like for like.

The filter checks: the gain |v(out)/v(ab)| of an AC analysis at the output frequency (against
``waveform.output_fundamental / waveform.bridge_fundamental``), at the corner
``filter.corner`` and at the carrier (against the review's own transfer function,
:func:`reviewer.physics.filter.transfer`, with the design's values at the corner); and the
filtered THD ``waveform.output_thd``, against the THD of ngspice's transient output over whole
output periods after settling, computed with numpy's FFT (every bin but DC and the
fundamental, as the review counts).
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest

from reviewer.deck import build_deck
from reviewer.deck.corner import Values
from tests.conftest import example, review_text
from tests.spice.ngspice import crossing, needs_ngspice, simulate

pytestmark = needs_ngspice


@pytest.fixture(scope="module")
def careful():
    from reviewer.review import review_file

    return review_file(example("careful_12v_sine"))


def pull_only_design() -> str:
    """The naive bench design (P-channel high side, single-transistor stages that only pull the
    gate on, pull resistors as the only turn-off path), with separate signals and a dead time
    long enough that the leg never cross-conducts, so each turn-off is a clean RC discharge
    (200 µs: the two dead times stay within the 500 µs carrier period, as the loader requires)."""
    text = example("naive_bench_pchannel").read_text(encoding="utf-8")
    assert "shared_signal = true" in text and 'dead_time = "0 s"' in text
    return (text.replace("shared_signal = true", "shared_signal = false")
                .replace('dead_time = "0 s"', 'dead_time = "200 µs"'))


def gate_times(review, corner, tmp: Path):
    """(side, measured td_on, published td_on, measured td_off, published td_off) per side."""
    deck = build_deck(review, corner, "leg")
    v = Values(review.sheet, deck.corner.run)
    plot = simulate(deck.text, tmp, "leg")[0]
    t = plot["time"]
    rows = []
    for side, half in (("high", "pos"), ("low", "neg")):
        sign = 1.0 if v.design(f"switch.{side}.polarity") == "n" else -1.0
        vgs = sign * (plot.v(deck.nodes[f"{side}.gate"]) - plot.v(deck.nodes[f"{side}.source"]))
        vth = v.design(f"switch.{side}.vth")
        vpl = v.get(f"switching.{side}.v_plateau")
        on, off = deck.edges[f"{half}.{side}.on"], deck.edges[f"{half}.{side}.off"]
        rows.append((side,
                     crossing(t, vgs, vth, on, rising=True) - on, v.get(f"switching.{side}.td_on"),
                     crossing(t, vgs, vpl, off, rising=False) - off,
                     v.get(f"switching.{side}.td_off")))
    return deck, rows


@pytest.mark.parametrize("corner", ["typical", "worst"])
def test_rc_gate_network_times_match_a_transient(careful, corner, tmp_path):
    # Driver IC stages with output resistances, series gate resistors and internal gate
    # resistance: RC charging and discharging of C_iss.
    deck, rows = gate_times(careful, corner, tmp_path)
    assert not careful.sheet.value("switching.high.pull_only")
    for side, td_on, want_on, td_off, want_off in rows:
        assert td_on == pytest.approx(want_on, rel=0.02), (side, "t_d(on)", deck.corner.label)
        assert td_off == pytest.approx(want_off, rel=0.02), (side, "t_d(off)", deck.corner.label)


def test_pull_resistor_network_times_match_a_transient(tmp_path):
    # Current-limited turn-on (t = C_iss·V_th / I_source) and a pull resistor as the only
    # turn-off path (an RC discharge through it).
    review = review_text(pull_only_design(), "pull_only.toml")
    for side in ("high", "low"):
        assert review.sheet.value(f"switching.{side}.pull_only") is True
        assert review.sheet.value(f"timing.{side}.overlap") == 0.0  # no cross-conduction
    deck, rows = gate_times(review, "worst", tmp_path)
    for side, td_on, want_on, td_off, want_off in rows:
        assert td_on == pytest.approx(want_on, rel=0.02), (side, "t_d(on)", deck.corner.label)
        assert td_off == pytest.approx(want_off, rel=0.02), (side, "t_d(off)", deck.corner.label)
        assert want_off > 1e-6  # tens of microseconds through 10 kΩ: the case that matters


def _gain(plot, f: float) -> float:
    freq = np.real(plot["frequency"])
    h = np.abs(plot.v("out") / plot.v("ab"))
    # log-log interpolation between the analysis's points (100 per decade)
    return float(np.exp(np.interp(math.log(f), np.log(freq), np.log(h))))


@pytest.mark.parametrize("name", ["careful_12v_sine", "naive_bench_pchannel"])
def test_filter_gain_matches_an_ac_analysis(name, tmp_path):
    from reviewer.physics import filter as flt
    from reviewer.review import review_file

    review = review_file(example(name))
    deck = build_deck(review, "typical", "ac")
    v = Values(review.sheet, deck.corner.run)
    plots = simulate(deck.text, tmp_path, "ac")
    ac = next(p for p in plots if "ac" in p.name.lower())
    f0 = v.design("output.frequency")
    carrier = v.get("waveform.carrier_used")
    corner = v.get("filter.corner")
    # at the output frequency: the review's published fundamental after over before the filter
    published = v.get("waveform.output_fundamental") / v.get("waveform.bridge_fundamental")
    assert _gain(ac, f0) == pytest.approx(published, rel=0.01)
    # at the corner and the carrier: the review's transfer function with the design's values
    r_load = v.get("op.output_rms") ** 2 / v.design("load.power")
    # the winding resistance and capacitor ESR the review used (published where it assumes
    # them), else the design's
    dcr = v.get("filter.inductor_dcr", v.design("filter.inductor_dcr")) or 0.0
    esr = v.get("filter.capacitor_esr", v.design("filter.capacitor_esr")) or 0.0
    extra = {"esr": esr} if esr else {}
    for f in (corner, carrier):
        want = abs(complex(flt.transfer(f, v.design("filter.inductance"),
                                        v.design("filter.capacitance"), dcr=dcr,
                                        load_resistance=r_load, **extra)))
        assert _gain(ac, f) == pytest.approx(want, rel=0.01), f


def thd_of(t: np.ndarray, y: np.ndarray, start: float, stop: float, periods: int) -> float:
    """THD of ``y`` over [start, stop) (whole output periods): every FFT bin but DC and the
    fundamental (bin ``periods``), over the fundamental, after resampling uniformly."""
    n = 1 << 17
    grid = start + (stop - start) * np.arange(n) / n
    spec = np.abs(np.fft.rfft(np.interp(grid, t, y)))
    rest = np.delete(spec[1:n // 2], periods - 1)
    return float(np.sqrt(np.sum(rest ** 2)) / spec[periods])


@pytest.mark.parametrize("name", ["careful_12v_sine", "naive_bench_pchannel"])
def test_filtered_thd_matches_a_transient(name, tmp_path):
    from reviewer.review import review_file

    review = review_file(example(name))
    deck = build_deck(review, "typical", "filter")
    v = Values(review.sheet, deck.corner.run)
    assert v.get("waveform.pwm") is True
    plot = simulate(deck.text, tmp_path, "filter")[0]
    start, stop = deck.measure
    periods = int(round((stop - start) * deck.f_out))
    thd = thd_of(plot["time"], plot.v("out"), start, stop, periods)
    assert 100 * thd == pytest.approx(100 * v.get("waveform.output_thd"), abs=0.5)

