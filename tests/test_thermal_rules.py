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
    i_sw = i_pk / math.pi                          # per device: hard edges in its own half cycle
    t_ri = 20e-9 * math.log((12 - 3) / (12 - 5))   # R·C_iss·ln((V_dr − V_th)/(V_dr − V_pl))
    t_fv = 10e-9 * 10 / (12 - 5)                   # Q_gd·R/(V_dr − V_pl)
    t_rv = 10e-9 * 10 / 5                          # Q_gd·R/V_pl
    t_fi = 20e-9 * math.log(5 / 3)                 # R·C_iss·ln(V_pl/V_th)
    p_sw = 0.5 * 12 * i_sw * (t_ri + t_fv + t_rv + t_fi) * 20e3 + 0.5 * 300e-12 * 12**2 * 20e3
    p_d = 0.8 * i_sw * 2 * 500e-9 * 20e3           # its diode: I_pk/π over both dead intervals
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
    # the naive bench's worst corners settle above its 150 °C T_j,max: destruction, a hazard
    # junction[low]: inside V_th's tolerance, just short of runaway, the junction passes T_j,max
    # − 25 °C (found by the search inside a tolerance whose end leaves the rule's domain)
    ("naive_bench_pchannel", {"thermal.junction[high]", "thermal.junction[low]",
                              "thermal.runaway[high]", "thermal.runaway[low]"}),
    ("nchannel_bootstrap_quasi", set()),
    ("careful_12v_sine", set()),
    ("mains_output_transformer", set()),
])
def test_example_designs(name, expected):
    assert_fails(review_file(name), expected, area="thermal")


def test_findings_say_the_current_is_from_the_fundamental():
    f = finding(review_file("naive_bench_pchannel"), "thermal.junction[high]")
    assert any("fundamental" in a for a in f.assumptions)


def _temperatures_in(review) -> list[float]:
    """Every °C figure printed in the findings' texts and the thermal quantities' values."""
    import re
    out = []
    for f in review.findings:
        for text in (f.mitigation or "", f.why or ""):
            out += [float(x) for x in re.findall(r"(-?\d+(?:\.\d+)?) ?°C", text)]
    for name in ("thermal.high.tj", "thermal.low.tj"):
        q = review.sheet.get(name)
        if q is not None:
            out += [q.typ, q.lo, q.hi]
    return out


def test_200_k_per_w_reports_destruction_and_prints_no_temperature_beyond_tj_max():
    # 200 K/W junction to ambient: T = 25 + 200·P(T) has no balance below 150 °C (P > 0.63 W
    # at every T: checked by hand against the loss formulas above, I_rms ≈ 3.5 A).
    r = review_text(bridge(("switch.low", "rth_ja", '"200 K/W"')))
    f = finding(r, "thermal.runaway[low]")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert "destroys the part" in f.mitigation
    assert all(t <= 150.0 for t in _temperatures_in(r))
    assert r.sheet.get("thermal.low.tj") is None


def test_a_fixed_point_far_above_tj_max_is_a_hazard_not_a_steady_temperature():
    # With a flat on-resistance (hot factor 1) the balance is T = T_a + θ·P exactly: choose θ so
    # that it lies at 527 °C; the part is destroyed long before, so it is a hazard and no
    # temperature above T_j,max appears as a result.
    base = review_text(bridge(("switch.low", "rds_hot_factor", "1.0")))
    p = base.sheet.value("thermal.low.power")
    theta = (527.0 - 25.0) / p
    r = review_text(bridge(("switch.low", "rds_hot_factor", "1.0"),
                           ("switch.low", "rth_ja", f'"{theta!r} K/W"')))
    f = finding(r, "thermal.runaway[low]")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert finding(r, "thermal.junction[low]").outcome == "not_applicable"
    assert all(t <= 150.0 for t in _temperatures_in(r))


def test_tj_above_tj_max_at_one_corner_only_is_a_hazard():
    # a ±30 % thermal resistance whose typical value stays below T_j,max but whose high end
    # passes it: the hazard fires at that corner
    base = review_text(bridge(("switch.low", "rds_hot_factor", "1.0")))
    p = base.sheet.value("thermal.low.power")
    theta = (140.0 - 25.0) / p                         # typical 140 °C; +30 % gives 174.5 °C
    r = review_text(bridge(("switch.low", "rds_hot_factor", "1.0"),
                           ("switch.low", "rth_ja", f'"{theta!r} K/W ± 30%"')))
    f = finding(r, "thermal.runaway[low]")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert f.corner == (("switch.low.rth_ja", "max"),)


def test_junction_peak_over_the_output_cycle_with_a_single_pole_zth():
    # square wave at 50 Hz, each device conducting 10 ms of 20 ms; junction-to-case 1.5 K/W
    # and τ = 5 ms on a 38.5 K/W sink path: peak = mean + P/0.5·R_jc·((1 − e^(−2))/(1 − e^(−4))
    # − 0.5) (single-pole pulse train, see tests/physics/test_thermal.py)
    parts = [("modulation", "kind", '"square"')]
    for side in ("high", "low"):
        parts += [(f"switch.{side}", "rth_ja", None), (f"switch.{side}", "rth_jc", '"1.5 K/W"'),
                  (f"switch.{side}", "rth_sa", '"38.5 K/W"'), (f"switch.{side}", "zth_tau", '"5 ms"')]
    r = review_text(bridge(*parts))
    f = finding(r, "thermal.junction-peak[low]")
    mean, p = r.sheet.value("thermal.low.tj"), r.sheet.value("thermal.low.power")
    swing = p / 0.5 * 1.5 * ((1 - math.exp(-2)) / (1 - math.exp(-4)) - 0.5)
    assert f.value == pytest.approx(mean + swing, rel=1e-6)
    # no Z_th: needs data rather than a pass on the mean alone
    assert finding(review_text(bridge()), "thermal.junction-peak[low]").outcome == "needs_data"


def test_a_peak_above_tj_max_in_every_cycle_is_destruction():
    # τ = 10 µs ≪ the 10 ms conduction: the junction follows the pulse, peak ≈ T_case + 2·P·R_jc
    # while the mean is T_case + P·R_jc (single-pole pulse train, τ ≪ t_on): with P·R_jc near
    # 65 K the mean stays below 150 °C and the peak passes it
    parts = [("modulation", "kind", '"square"')]
    for side in ("high", "low"):
        parts += [(f"switch.{side}", "rth_ja", None), (f"switch.{side}", "rth_jc", '"300 K/W"'),
                  (f"switch.{side}", "rth_sa", '"1 K/W"'), (f"switch.{side}", "zth_tau", '"10 µs"')]
    r = review_text(bridge(*parts))
    mean, p = r.sheet.value("thermal.low.tj"), r.sheet.value("thermal.low.power")
    assert mean < 150.0 and mean + p * 300.0 > 150.0
    f = finding(r, "thermal.runaway[low]")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert "peaks above T_j,max" in f.mitigation
    assert all(t <= 150.0 for t in _temperatures_in(r))
