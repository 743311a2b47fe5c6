"""A DC offset into an output transformer is read by a rule (volt-second imbalance).

By hand: a mean bridge voltage V_dc is held only by the winding and inductor resistance, so
I_dc = V_dc / (R_w + r_L) (Ohm's law; a transformer passes no DC, Erickson & Maksimović 2001,
ch. 13). The symmetric bridge the synthesis models has no mean (both legs see the same dead
times), so the offset comes from the controller's stated imbalance: 0.1 % of a 12 V bus is
12 mV, through 50 mΩ + 10 mΩ = 0.2 A."""

from __future__ import annotations

import pytest

from reviewer.review import review_file
from tests.bridge_base import bridge
from tests.conftest import example, finding, review_text


def design(dc_max: str, offset: str = "0.1 %") -> str:
    return bridge(("source", "v_max", '"12 V"'), ("output", "transformer_ratio", "10"),
                  ("output", "v_rms", '"80 V"'), ("output", "dc_offset", f'"{offset}"'),
                  ("output", "transformer_primary_resistance", '"50 mΩ"'),
                  ("output", "transformer_dc_max", f'"{dc_max}"'),
                  ("filter", "inductance", '"100 µH"'), ("filter", "capacitance", '"10 µF"'),
                  ("filter", "inductor_dcr", '"10 mΩ"'))


@pytest.mark.parametrize("dc_max,outcome", [("0.2 A", "pass"), ("0.199 A", "fail")])
def test_dc_offset_current_threshold(dc_max, outcome):
    r = review_text(design(dc_max))
    f = finding(r, "waveform.transformer-dc")
    assert r.sheet.value("waveform.bridge_dc_offset") == pytest.approx(0.012, rel=1e-6)
    assert f.value == pytest.approx(0.2, rel=1e-6)
    assert f.outcome == outcome


def test_symmetric_bridge_has_no_offset_of_its_own():
    r = review_text(design("1 A", offset="0 %"))
    assert r.sheet.value("waveform.bridge_dc_offset") < 1e-9


def test_needs_the_winding_data_and_applies_only_with_a_transformer():
    f = finding(review_text(bridge(("output", "transformer_ratio", "10"))), "waveform.transformer-dc")
    assert f.outcome == "needs_data"
    assert "output.transformer_primary_resistance" in f.needs
    assert finding(review_file(example("careful_12v_sine")),
                   "waveform.transformer-dc").outcome == "not_applicable"
    assert finding(review_file(example("mains_output_transformer")),
                   "waveform.transformer-dc").outcome == "pass"


def flux_design(b_max: str, turns: str = "20") -> str:
    return bridge(("source", "v_max", '"12 V"'), ("output", "transformer_ratio", "10"),
                  ("output", "v_rms", '"80 V"'), ("modulation", "kind", '"square"'),
                  ("modulation", "index", None), ("modulation", "carrier", None),
                  ("timing", "dead_time", '"0 s"'),
                  ("output", "transformer_turns", turns),
                  ("output", "transformer_core_area", '"40 cm²"'),
                  ("output", "transformer_b_max", f'"{b_max}"'))


def test_square_wave_flux_by_hand():
    """An unfiltered square wave of ±12 V at 50 Hz: the flux swings by V·(T/2)/(N·A), so its
    peak is V/(4·f·N·A) = 12 / (4 · 50 · 20 · 40e-4) = 0.75 T (Faraday's law). The bound adds
    each harmonic's peak 4V/(nπ)/(2π·n·f·N·A): Σ 1/n² over odd n is π²/8, giving exactly the
    same 0.75 T (the harmonics' flux peaks coincide for a square wave)."""
    r = review_text(flux_design("1 T"))
    assert r.sheet.value("waveform.transformer_flux") == pytest.approx(0.75, rel=1e-4)


@pytest.mark.parametrize("b_max,outcome", [("0.7501 T", "pass"), ("0.749 T", "fail")])
def test_flux_threshold(b_max, outcome):
    f = finding(review_text(flux_design(b_max)), "waveform.transformer-flux")
    assert f.outcome == outcome
    if outcome == "fail":
        # N scales the flux as 1/N: 20 · 0.75 / 0.749 turns
        assert f.pass_solved == pytest.approx(20 * 0.75 / 0.749, rel=1e-4)
