"""The §3.5 thermal rules end to end: junction temperature, runaway, heatsink figure, sharing.

The electro-thermal solution is checked against scipy.optimize.brentq on the same equation,
T = T_a + θ·(I_rms²·R(T) + P_other), with the losses written out by the formulas of Mohan,
Undeland & Robbins, Power Electronics, 3rd ed. (§2-3 switching, ½·C·V²·f, body diode
V_f·I·2·t_dead·f_sw per Holmes & Lipo 2003 §3.6); the 25 °C headroom and 20 % sharing
allowance are common practice.
"""

import math

import pytest
from scipy.optimize import brentq

from tests.bridge_base import bridge
from tests.conftest import assert_fails, finding, review_text
from tests.test_gate_rules import review_file


def harmonic_factor() -> float:
    """True RMS of the bridge current over its fundamental's, for the unfiltered test bridge.

    Taken from the waveform module, whose spectra are checked against closed forms and the
    double Fourier series in tests/physics/test_waveform.py; this file checks the thermal solve.
    """
    r = review_text(bridge())
    return float(r.sheet.value("waveform.bridge_current_rms") / r.sheet.value("op.load_current_rms"))


def expected_tj(rth: float, ta: float = 25.0) -> float:
    # Load: 40 W at 8 V rms → 5 A rms, 7.071 A peak; sine PWM: each switch I_rms = I_pk/2,
    # scaled by the harmonics' extra heating (the conduction current's true RMS).
    i_pk = 5.0 * math.sqrt(2)
    i_rms = i_pk / 2 * harmonic_factor()
    i_sw = 2 * i_pk / math.pi                      # mean |i| at the edges
    tr = 10e-9 * 10 / (12 - 5)                     # Q_gd·R/(V_dr − V_pl)
    tf = 10e-9 * 10 / 5                            # Q_gd·R/V_pl
    p_sw = 0.5 * 12 * i_sw * (tr + tf) * 20e3 + 0.5 * 300e-12 * 12**2 * 20e3
    p_d = 0.8 * (i_sw / 2) * 2 * 500e-9 * 20e3     # diode carries the current at half the edges
    b = math.log(1.7) / 100                        # R(T) = R25·1.7^((T − 25)/100)

    def f(t):
        return t - ta - rth * (i_rms**2 * 0.010 * math.exp(b * (t - 25)) + p_sw + p_d)

    return brentq(f, ta, 400.0, xtol=1e-10)


def test_clean_bridge_junction_matches_brentq():
    f = finding(review_text(bridge()), "thermal.junction[low]")
    assert f.outcome == "pass"
    assert f.value == pytest.approx(expected_tj(40.0), abs=1e-3)


@pytest.mark.parametrize("delta, outcome", [(25.0, "pass"), (24.9, "fail")])
def test_junction_headroom_threshold(delta, outcome):
    tj = expected_tj(40.0)
    text = bridge(("switch.low", "tj_max", f'"{tj + delta!r} °C"'))
    f = finding(review_text(text), "thermal.junction[low]")
    assert f.outcome == outcome


def test_heatsink_figure_round_trip():
    # A 40 K/W path on a 55 °C-limited junction: fails; the figure that passes brings T_j to
    # exactly T_j,max − 25 °C when put back in.
    text = bridge(("switch.low", "tj_max", '"55 °C"'))
    f = finding(review_text(text), "thermal.junction[low]")
    assert f.outcome == "fail"
    again = bridge(("switch.low", "tj_max", '"55 °C"'), ("switch.low", "rth_ja", f'"{f.pass_solved!r} K/W"'))
    g = finding(review_text(again), "thermal.junction[low]")
    assert g.outcome == "pass" and g.value == pytest.approx(30.0, abs=1e-3)
    assert expected_tj(f.pass_solved) == pytest.approx(30.0, abs=1e-3)


def test_heatsink_figure_with_a_case_path():
    text = bridge(("switch.low", "rth_ja", None), ("switch.low", "rth_jc", '"2 K/W"'),
                  ("switch.low", "rth_cs", '"1 K/W"'), ("switch.low", "rth_sa", '"37 K/W"'),
                  ("switch.low", "tj_max", '"55 °C"'))
    r = review_text(text)
    f = finding(r, "thermal.junction[low]")
    # same 40 K/W in total, so the same T_j and the same total; the sink figure is 3 K/W less
    assert f.value == pytest.approx(expected_tj(40.0), abs=1e-3)
    from reviewer.units import render
    assert render(f.pass_solved - 3.0, "K/W") in f.mitigation


def test_thermal_runaway_is_a_hazard():
    # 2000 K/W: no steady state exists (checked: f(T) = T − T_a − θ·P(T) stays negative).
    b = math.log(1.7) / 100
    i2 = (5.0 * math.sqrt(2) / 2) ** 2
    worst = max(t - 25 - 2000 * i2 * 0.010 * math.exp(b * (t - 25)) for t in range(25, 1000))
    assert worst < 0
    r = review_text(bridge(("switch.low", "rth_ja", '"2000 K/W"')))
    f = finding(r, "thermal.runaway[low]")
    assert f.outcome == "fail" and f.severity == "hazard"
    assert finding(r, "thermal.junction[low]").outcome == "not_applicable"


@pytest.mark.parametrize("scale, outcome", [(1.0, "pass"), (0.99, "fail")])
def test_paralleled_device_current_with_sharing_allowance(scale, outcome):
    # (I_pk/2)·k/3 × 1.2 per device, k the harmonic factor (20 % allowance: common practice).
    per_device = 1.2 * 5.0 * math.sqrt(2) / 2 * harmonic_factor() / 3
    rating = per_device * scale
    text = bridge(("switch.low", "count", "3"), ("switch.low", "id_continuous", f'"{rating!r} A"'))
    f = finding(review_text(text), "thermal.device-current[low]")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(3 / scale, rel=1e-6)  # count × value / limit


@pytest.mark.parametrize("name, expected", [
    ("naive_bench_pchannel", {"thermal.junction[high]", "thermal.junction[low]"}),
    ("nchannel_bootstrap_quasi", set()),
    ("careful_12v_sine", set()),
    ("mains_output_transformer", set()),
])
def test_example_designs(name, expected):
    assert_fails(review_file(name), expected, area="thermal")


def test_findings_say_the_current_is_from_the_fundamental():
    f = finding(review_file("naive_bench_pchannel"), "thermal.junction[high]")
    assert any("fundamental" in a for a in f.assumptions)
