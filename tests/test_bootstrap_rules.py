"""The §3.6 bootstrap rules end to end.

C ≥ Q_total/ΔV with Q_total = Q_g + (I_q + I_leak)·t_on,max + Q_ls and ΔV = V_cc − V_f −
V_GS,needed (Mohan, Undeland & Robbins, Power Electronics, 3rd ed., §23-4), written out term
by term; ten times the minimum is common practice.
"""


import math

import pytest
from scipy.integrate import solve_ivp

from tests.bridge_base import bridge
from tests.conftest import assert_fails, finding, review_text
from tests.test_gate_rules import review_file

# Square wave at 50 Hz: t_on,max = 10 ms. Q = 40 nC + 100 µA × 10 ms + 0 = 1.04 µC.
# ΔV = 12 − 0.7 − 10 = 1.3 V. C_min = 1.04 µC / 1.3 V = 800 nF.
C_MIN = (40e-9 + 100e-6 * 10e-3) / (12 - 0.7 - 10)


def boot(cap: float, *extra):
    return bridge(("modulation", "kind", '"square"'), ("drive.high", "kind", '"bootstrap_driver"'),
                  ("drive.high", "pull_to", '"none"'),
                  ("bootstrap", "capacitor", f'"{cap!r} F"'), ("bootstrap", "supply", '"12 V"'),
                  ("bootstrap", "quiescent_current", '"100 µA"'),
                  ("bootstrap", "leakage_current", '"0 A"'), *extra)


@pytest.mark.parametrize("cap, outcome", [(C_MIN, "pass"), (0.99 * C_MIN, "fail")])
def test_capacitance_threshold(cap, outcome):
    f = finding(review_text(boot(cap)), "bootstrap.gate-droop")
    assert f.outcome == outcome
    assert f.limit == pytest.approx(10.0)
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(C_MIN, rel=1e-9)
        assert f.severity == "hazard"


@pytest.mark.parametrize("scale, outcome", [(10.0, "pass"), (9.9, "fail")])
def test_ten_times_practice(scale, outcome):
    f = finding(review_text(boot(scale * C_MIN)), "bootstrap.capacitance-practice")
    assert f.outcome == outcome


def test_pull_resistor_drains_the_capacitor_against_ode():
    # With a 47 kΩ gate-source resistor: dV/dt = −(I_q + V/R)/C after the gate charge is
    # shared out (V₀ = 11.3 − 40 nC/C), integrated by scipy over 10 ms.
    cap, r = 10e-6, 47e3
    text = boot(cap, ("drive.high", "pull_to", '"source"'), ("drive.high", "pull_resistor", '"47 kΩ"'))
    f = finding(review_text(text), "bootstrap.gate-droop")
    v0 = 11.3 - 40e-9 / cap
    sol = solve_ivp(lambda t, v: [-(100e-6 + v[0] / r) / cap], (0, 10e-3), [v0], rtol=1e-10)
    assert f.value == pytest.approx(sol.y[0][-1], rel=1e-6)
    # The minimum counts the resistor at its largest current, 11.3 V/47 kΩ, for the whole 10 ms.
    q = 40e-9 + (100e-6 + 11.3 / r) * 10e-3
    from reviewer.quantities import compute
    from reviewer.design import parse_design
    sheet = compute(parse_design(text))
    assert sheet.value("bootstrap.c_min") == pytest.approx(q / 1.3)


def test_uvlo_above_the_drive_spec_sets_the_need():
    f = finding(review_text(boot(C_MIN, ("drive.high", "uvlo", '"10.5 V"'))), "bootstrap.gate-droop")
    assert f.limit == pytest.approx(10.5) and f.outcome == "fail"


def test_not_applicable_without_a_bootstrap_driver():
    assert finding(review_text(bridge()), "bootstrap.gate-droop").outcome == "not_applicable"


def test_quasi_square_example_cannot_hold_the_gate():
    r = review_file("nchannel_bootstrap_quasi")
    assert_fails(r, {"bootstrap.gate-droop", "bootstrap.capacitance-practice"}, area="bootstrap")
    f = finding(r, "bootstrap.gate-droop")
    # Half a 20 ms period minus the notches: (180° − 2 × 23°)/360° × 20 ms = 7.444 ms.
    assert "7.44 ms" in f.mitigation
    # Q = 55 nC + (150 µA + 10 µA + 11.3 V/47 kΩ) × 7.444 ms + 5 nC over 1.3 V
    q = 55e-9 + (160e-6 + 11.3 / 47e3) * (134 / 360 * 20e-3) + 5e-9
    assert f.pass_solved == pytest.approx(q / 1.3, rel=1e-9)


@pytest.mark.parametrize("name", ["naive_bench_pchannel", "careful_12v_sine", "mains_output_transformer"])
def test_other_examples(name):
    assert_fails(review_file(name), set(), area="bootstrap")


# ------------------------------------------------------------- refresh, first pulse, diode

def spwm_boot(index: str, *extra):
    return bridge(("drive.high", "kind", '"bootstrap_driver"'), ("drive.high", "pull_to", '"none"'),
                  ("modulation", "index", index),
                  ("bootstrap", "capacitor", '"1 µF"'), ("bootstrap", "supply", '"12 V"'),
                  ("bootstrap", "quiescent_current", '"100 µA"'),
                  ("bootstrap", "leakage_current", '"0 A"'), *extra)


def test_refresh_returns_the_charge_a_carrier_period_takes():
    # M = 0.9 at 20 kHz: (1 − M)/(2 f_c) = 2.5 µs of recharge; 1 Ω · 1 µF = 1 µs:
    # returned C·ΔV·(1 − e^(−2.5)) = 1 µF · 1.3 V · 0.91792 = 1.1933 µC; drawn per period
    # Q_g + I_q·t_on with t_on = (1 + M)/(2 f_c) = 47.5 µs: 40 nC + 4.75 nC (hand calculation).
    r = review_text(spwm_boot("0.9"))
    f = finding(r, "bootstrap.refresh")
    assert f.value == pytest.approx(1e-6 * 1.3 * (1 - math.exp(-2.5)), rel=1e-6)
    assert f.limit == pytest.approx(40e-9 + 100e-6 * 47.5e-6, rel=1e-6)
    assert f.outcome == "pass"
    # a 100 Ω charging path: τ = 100 µs, returned 1.3 µC·(1 − e^(−0.025)) = 32.1 nC < 44.75 nC
    f = finding(review_text(spwm_boot("0.9", ("bootstrap", "series_resistance", '"100 Ω"'))),
                "bootstrap.refresh")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    # the largest resistance that passes: t / (C · ln(1/(1 − Q/(C·ΔV))))
    q = 40e-9 + 100e-6 * 47.5e-6
    assert f.pass_solved == pytest.approx(2.5e-6 / (1e-6 * math.log(1 / (1 - q / 1.3e-6))), rel=1e-6)


def test_overmodulation_leaves_no_refresh():
    f = finding(review_text(spwm_boot("1.05")), "bootstrap.refresh")
    assert f.outcome == "fail" and f.value == 0.0


def test_refresh_not_applicable_to_stepped_waves():
    assert finding(review_text(boot(C_MIN)), "bootstrap.refresh").outcome == "not_applicable"


def test_first_pulse_from_an_empty_capacitor():
    # first carrier period at zero reference: 1/(2 f_c) = 25 µs of charging through 1 Ω · 1 µF:
    # 11.3 V·(1 − e^(−25)) − 40 nC/1 µF = 11.26 V; through 10 Ω: 11.3·(1 − e^(−2.5)) − 0.04 = 10.33 V
    f = finding(review_text(spwm_boot("0.9")), "bootstrap.first-pulse")
    assert f.value == pytest.approx(11.3 * (1 - math.exp(-25)) - 0.04, rel=1e-6)
    f = finding(review_text(spwm_boot("0.9", ("bootstrap", "series_resistance", '"25 Ω"'))),
                "bootstrap.first-pulse")
    assert f.value == pytest.approx(11.3 * (1 - math.exp(-1)) - 0.04, rel=1e-6)
    assert f.outcome == "fail"


@pytest.mark.parametrize("rating, outcome", [("24 V", "pass"), ("23.9 V", "fail")])
def test_bootstrap_diode_rating(rating, outcome):
    # 12 V bus (no loop inductance given: no overshoot) + 12 V drive supply = 24 V
    f = finding(review_text(spwm_boot("0.9", ("bootstrap", "diode_rating", f'"{rating}"'))),
                "bootstrap.diode-rating")
    assert f.outcome == outcome and f.limit == pytest.approx(24.0)


# The capacitor empties within the on-time where V₀ − I_q·t_on/C ≤ 0 with V₀ = 11.3 V − Q_g/C:
# C = (Q_g + I_q·t_on)/11.3 V = 1.04 µC/11.3 V = 92.04 nF (charge balance, hand calculation).
C_EMPTY = (40e-9 + 100e-6 * 10e-3) / (12 - 0.7)


@pytest.mark.parametrize("scale, empties", [(0.5, True), (0.99, True), (1.01, False), (2.0, False)])
def test_capacitor_that_runs_out_of_charge_is_said_in_words(scale, empties):
    f = finding(review_text(boot(scale * C_EMPTY)), "bootstrap.gate-droop")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    assert f.value >= 0.0  # never a negative gate voltage
    assert ("runs out of charge" in f.mitigation) == empties
    assert ("has sagged to" in f.mitigation) == (not empties)
    assert "sagged to -" not in f.mitigation and "−" not in f.mitigation  # no negative figure
    # the pass value still is the charge balance C_min, and it passes when entered
    assert f.pass_solved == pytest.approx(C_MIN, rel=1e-9)
    assert finding(review_text(boot(f.pass_solved)), "bootstrap.gate-droop").outcome == "pass"
    if empties:
        assert f.value == 0.0
    else:
        # V₀ − I_q·t_on/C with V₀ = 11.3 − Q_g/C: the sag of a linear discharge (hand calculation)
        c = scale * C_EMPTY
        assert f.value == pytest.approx(11.3 - (40e-9 + 1e-6) / c, rel=1e-6)
