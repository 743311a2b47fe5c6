"""The §3.4 timing rules end to end: dead time, shoot-through, dv/dt turn-on, pulse widths.

Switching times by the gate-charge method (Mohan, Undeland & Robbins, Power Electronics, 3rd ed.,
§22-4), worked by hand for the test bridge (10 Ω loop, C_iss 2 nF, Q_gd 10 nC, V_th 3 V,
V_pl 5 V, 0 → 12 V): t_d(on) = 20 ns·ln(12/9); turn-off to cutoff at the peak current =
20 ns·ln(12/5) + 10 nC·10 Ω/5 V + 20 ns·ln(5/3), and at low current, where the plateau nears
V_th = 3 V, 20 ns·ln(12/3) + 10 nC·10 Ω/3 V: the longer one (low current) sets the dead time
needed. Dead-time relations from Holmes & Lipo (2003) §3.6; the +50 %
allowance is common practice.
"""

import math

import pytest
from scipy.integrate import solve_ivp

from reviewer.units import render
from tests.bridge_base import bridge
from tests.conftest import assert_fails, finding, review_text
from tests.test_gate_rules import review_file

TD_ON = 20e-9 * math.log(12 / 9)                                     # 5.754 ns
T_OFF_PEAK = 20e-9 * math.log(12 / 5) + 10e-9 * 10 / 5 + 20e-9 * math.log(5 / 3)   # 47.726 ns
T_OFF = 20e-9 * math.log(12 / 3) + 10e-9 * 10 / 3                   # 61.059 ns, low current
NEEDED = T_OFF - TD_ON                                               # 55.305 ns


def test_clean_bridge_passes_every_timing_rule():
    assert_fails(review_text(bridge()), set(), area="timing")


def test_zero_dead_time_and_shared_signal_are_hazards():
    r = review_text(bridge(("timing", "dead_time", '"0 s"')))
    f = finding(r, "timing.no-dead-time")
    assert f.outcome == "fail" and f.severity == "hazard"
    assert finding(r, "timing.shoot-through[high]").outcome == "fail"
    r = review_text(bridge(("drive", "shared_signal", "true")))
    assert finding(r, "timing.no-dead-time").outcome == "fail"


@pytest.mark.parametrize("scale, outcome", [(1.0, "pass"), (0.98, "fail")])
def test_shoot_through_threshold(scale, outcome):
    # Dead time exactly t_off − t_d(on) = 55.31 ns: no overlap; 2 % less: overlap.
    r = review_text(bridge(("timing", "dead_time", f'"{NEEDED * scale!r} s"')))
    f = finding(r, "timing.shoot-through[low]")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.value == pytest.approx(NEEDED * 0.98, rel=1e-6)
        assert render(NEEDED * 0.02, "s") in f.mitigation          # the overlap
        assert f.pass_solved == pytest.approx(1.5 * NEEDED, rel=1e-6)
        assert f.severity == "hazard"


@pytest.mark.parametrize("scale, outcome", [(1.0, "pass"), (0.99, "fail")])
def test_dead_time_allowance_threshold(scale, outcome):
    # 1.5 × 55.31 ns = 82.96 ns
    r = review_text(bridge(("timing", "dead_time", f'"{1.5 * NEEDED * scale!r} s"')))
    f = finding(r, "timing.dead-time-margin[high]")
    assert f.outcome == outcome and f.limit == pytest.approx(1.5 * NEEDED, rel=1e-6)


def test_pull_resistor_only_turn_off_and_its_mitigation_values():
    # The low side loses its active sink: its gate discharges through 10 kΩ alone.
    text = bridge(("drive.low", "r_sink", None), ("timing", "dead_time", '"1 µs"'))
    r = review_text(text)
    f = finding(r, "timing.shoot-through[high]")
    # 10 kΩ × 2 nF = 20 µs: at low current 20 µs·ln(12/3) + 10 nC·10 kΩ/3 V = 61.06 µs
    t_off = 1e3 * T_OFF
    assert f.outcome == "fail"
    assert f.value == pytest.approx(1e-6) and f.limit == pytest.approx(t_off - TD_ON, rel=1e-6)
    assert render(t_off - 1e-6 - TD_ON, "s") in f.mitigation     # the overlap
    assert f.pass_solved == pytest.approx(1.5 * (t_off - TD_ON), rel=1e-6)
    assert "10 kΩ pull resistor" in f.mitigation
    # Largest turn-off resistance for 1 µs: (1 µs/1.5 + 5.754 ns)/(6.1059 ns/Ω) = 110.1 Ω;
    # smallest sink: (2 nF·9 V + 10 nC)/(1 µs/1.5 + 5.754 ns) = 28 nC/672.4 ns = 41.6 mA.
    allowed = 1e-6 / 1.5 + TD_ON
    assert render(allowed / (T_OFF / 10.0), "Ω") in f.mitigation
    assert render(28e-9 / allowed, "A") in f.mitigation


def test_naive_bench_reports_turn_off_shoot_through_and_what_would_pass():
    r = review_file("naive_bench_pchannel")
    assert_fails(r, {"timing.no-dead-time", "timing.shoot-through[high]", "timing.shoot-through[low]",
                     "timing.dvdt-turn-on[high]", "timing.dvdt-turn-on[low]", "timing.min-pulse"},
                 area="timing")
    for side in ("high", "low"):
        f = finding(r, f"timing.shoot-through[{side}]")
        assert "pull resistor, its only turn-off path" in f.mitigation
        # tens of microseconds through 10 kΩ (gate-charge method with R_off = the pull resistor)
        assert f.value == 0.0 and 10e-6 < f.limit < 1e-3
        assert f.pass_solved == pytest.approx(1.5 * f.limit, rel=1e-9)
        assert "must be at most" in f.mitigation and "active sink of at least" in f.mitigation


@pytest.mark.parametrize("dead, outcome", [('"750 ns"', "pass"), ('"760 ns"', "fail")])
def test_dead_time_excess_threshold(dead, outcome):
    # 2 × 750 ns × 20 kHz = 3 %
    f = finding(review_text(bridge(("timing", "dead_time", dead))), "timing.dead-time-excess")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(750e-9)


def test_dvdt_induced_voltage_against_ode_and_threshold():
    # Low side held by 10 Ω; the high side's t_r = 10 nC·10 Ω/(12 − 5) V = 14.29 ns sets
    # dv/dt = 12 V/14.29 ns. (C_gs + C_gd)·dv_g/dt = C_gd·dv/dt − v_g/R over the ramp (scipy).
    cgd, cgs, rh = 100e-12, 1.9e-9, 10.0
    dvdt = 12.0 / (10e-9 * 10 / 7)
    sol = solve_ivp(lambda t, v: [(cgd * dvdt - v[0] / rh) / (cgs + cgd)], (0, 12.0 / dvdt), [0.0],
                    rtol=1e-10, atol=1e-14)
    v = float(sol.y[0][-1])
    f = finding(review_text(bridge()), "timing.dvdt-turn-on[low]")
    assert f.value == pytest.approx(v, rel=1e-6)
    # Threshold at 150 °C: max(V_th − 5 mV/°C·125 °C, V_th/2) (memory; floored at half);
    # 0.8 × that = v  ⇒  V_th = v/0.8 + 0.625 V on the linear branch, else v/0.4.
    vth = v / 0.8 + 0.625
    if vth - 0.625 < vth / 2:
        vth = v / 0.4
    assert finding(review_text(bridge(("switch.low", "vth", f'"{vth!r} V"'))),
                   "timing.dvdt-turn-on[low]").outcome == "pass"
    f = finding(review_text(bridge(("switch.low", "vth", f'"{vth - 0.01!r} V"'))),
                "timing.dvdt-turn-on[low]")
    assert f.outcome == "fail"
    # pass: R_hold ≤ limit/(C_gd·dv/dt) (linear envelope, conservative)
    assert f.pass_solved == pytest.approx(f.limit / (cgd * dvdt))


@pytest.mark.parametrize("scale, outcome", [(1.0, "pass"), (1.02, "fail")])
def test_min_pulse_threshold(scale, outcome):
    # Gate pulses of either leg, d = (1 ± M sin θ)/2 (Holmes & Lipo 2003, ch. 3): an off-gap
    # (1 − d)/f_c < t where |sin θ| > (1 − 2·t·f_c)/M, a share 1 − (2/π)·asin((1 − 2 t f_c)/M)
    # = 5 %  ⇒  t = (1 − M·sin(0.95·π/2))/(2 f_c) = (1 − 0.9·0.99692)/40 kHz = 2.569 µs.
    # (Three-level unipolar legs each keep a duty near ½ at the zero crossing: no gate pulse is
    # short there, only the bridge's output pulse, which no switch has to make.)
    t = (1 - 0.9 * math.sin(0.95 * math.pi / 2)) / (2 * 20e3) * scale
    text = bridge(("modulation", "kind", '"spwm_unipolar"'), ("modulation", "min_pulse", f'"{t!r} s"'))
    f = finding(review_text(text), "timing.min-pulse")
    assert f.outcome == outcome


@pytest.mark.parametrize("name, expected", [
    ("nchannel_bootstrap_quasi", set()),
    # Unipolar legs at the largest index M = 0.98, 20 kHz, 1 µs controller minimum: each leg's
    # off-gap (1 − d)/f_c is shortest at the reference's peak, (1 − 0.98)/(2·20 kHz) = 0.5 µs,
    # and shorter than 1 µs where |sin θ| > (1 − 2·1 µs·20 kHz)/0.98 = 0.9796: a share
    # 1 − (2/π)·asin(0.9796) = 12.9 % > 5 % (Holmes & Lipo 2003, ch. 3 duty (1 + M sin θ)/2).
    # The former three-level figure looked at the bridge's output pulse near the zero crossing,
    # which no gate makes, and missed these.
    ("careful_12v_sine", {"timing.min-pulse"}),
    ("mains_output_transformer", set()),
])
def test_example_designs(name, expected):
    assert_fails(review_file(name), expected, area="timing")


def test_push_pull_stage_current_limited_and_with_a_gate_resistor():
    # Current-limited 0.5 A both ways, no resistance: t = Q/I (MU&R §22-4):
    # t_d(on) = 2 nF·3 V/0.5 A = 12 ns; off = (2 nF·7 V + 10 nC + 2 nF·2 V)/0.5 A = 56 ns.
    pp = [("drive.low", "kind", '"push_pull"'), ("drive.high", "kind", '"push_pull"')]
    for side in ("high", "low"):
        pp += [(f"drive.{side}", "r_source", None), (f"drive.{side}", "r_sink", None),
               (f"drive.{side}", "r_gate", '"0 Ω"'),
               (f"drive.{side}", "source_current", '"0.5 A"'), (f"drive.{side}", "sink_current", '"0.5 A"')]
    f = finding(review_text(bridge(*pp)), "timing.dead-time-margin[low]")
    assert f.limit == pytest.approx(1.5 * (56e-9 - 12e-9))
    # With an 8 Ω gate resistor as well the stage gives min(0.5 A, ΔV/8 Ω): limited while the
    # headroom exceeds 4 V, RC after (exact piecewise). t_d(on): 0 → 3 V all limited, 12 ns.
    # Turn-off at low current (plateau at V_th = 3 V), the longer: 12 → 4 V limited
    # (2 nF·8 V/0.5 A = 32 ns), 4 → 3 V RC (16 ns·ln(4/3) = 4.603 ns); plateau
    # 10 nC/min(0.5 A, 3 V/8 Ω) = 26.67 ns; no tail. (At the 5 V plateau: 28 + 20 + 8.60 ns.)
    rg = [(f"drive.{s}", "r_gate", '"8 Ω"') for s in ("high", "low")]
    f = finding(review_text(bridge(*pp, *rg)), "timing.dead-time-margin[low]")
    t_off = 32e-9 + 16e-9 * math.log(4 / 3) + 10e-9 / 0.375
    assert f.limit == pytest.approx(1.5 * (t_off - 12e-9))


def test_threshold_at_temperature_never_negative_and_part_figure_used():
    # V_th 0.6 V at 25 °C and −5 mV/°C to 175 °C would give −0.15 V: the floor holds V_th/2.
    r = review_text(bridge(("switch.low", "vth", '"0.6 V"'), ("switch.low", "tj_max", '"175 °C"')))
    assert r.sheet.value("gate.low.vth_hot") == pytest.approx(0.3)
    f = finding(r, "timing.dvdt-turn-on[low]")
    assert f.limit == pytest.approx(0.8 * 0.3) and f.limit > 0
    assert any("memory" in a for a in f.assumptions)
    # the part's own figure at T_j,max wins
    r = review_text(bridge(("switch.low", "vth_hot", '"1.9 V"')))
    assert finding(r, "timing.dvdt-turn-on[low]").limit == pytest.approx(0.8 * 1.9)
    assert finding(r, "gate.vgs-off[low]").limit == pytest.approx(0.5 * 1.9)


def test_driver_delays_and_resolution_eat_the_dead_time():
    # 500 ns set, 30 ns mismatch, 15 ns spread, 10 ns step: 445 ns at the gates (hand sum).
    r = review_text(bridge(("timing", "delay_mismatch", '"30 ns"'), ("timing", "delay_spread", '"15 ns"'),
                           ("timing", "resolution", '"10 ns"')))
    assert r.sheet.value("timing.low.dead_time") == pytest.approx(445e-9)
    # a setting that only just covers the need fails once the driver's delays are counted
    r = review_text(bridge(("timing", "dead_time", f'"{NEEDED * 1.01!r} s"'),
                           ("timing", "delay_mismatch", '"5 ns"')))
    f = finding(r, "timing.shoot-through[low]")
    assert f.outcome == "fail"
    assert f.pass_solved == pytest.approx(1.5 * NEEDED + 5e-9, rel=1e-6)


def test_shared_signal_makes_dead_time_zero_everywhere():
    r = review_text(bridge(("drive", "shared_signal", "true")))
    for side in ("high", "low"):
        assert r.sheet.value(f"timing.{side}.dead_time") == 0.0
        assert "has no effect" in r.sheet.get(f"timing.{side}.dead_time").note
    assert r.sheet.value("timing.dead_time_fraction") == 0.0
    assert r.sheet.value("thermal.low.diode_loss") == 0.0
    f = finding(r, "timing.shoot-through-peak[low]")
    assert f.outcome in ("fail", "needs_data") and f.outcome != "pass"


def test_shared_signal_waveform_synthesis_ignores_the_dead_time_field():
    # the synthesised bridge voltage with a shared signal equals the one with zero dead time
    shared = review_text(bridge(("drive", "shared_signal", "true")))
    zero = review_text(bridge(("timing", "dead_time", '"0 s"')))
    for name in ("waveform.bridge_fundamental", "waveform.bridge_rms"):
        assert shared.sheet.value(name) == pytest.approx(zero.sheet.value(name), rel=1e-12)
    assert shared.sheet.value("waveform.bridge_fundamental") != review_text(
        bridge(("timing", "dead_time", '"2 µs"'))).sheet.value("waveform.bridge_fundamental")


def test_internal_gate_resistance_absent_is_stated_and_conservative_each_way():
    # no rg_internal: 3 Ω for turn-off and dead time (slower), 0 Ω for the edges (faster)
    r0 = review_text(bridge())                               # 0 Ω given
    r = review_text(bridge(("switch.low", "rg_internal", None)))
    assert r.sheet.value("switching.low.rg_internal_used") == 3.0
    assert "3 Ω assumed" in r.sheet.get("switching.low.turn_off_time").note
    assert r.sheet.value("switching.low.turn_off_time") == pytest.approx(
        r0.sheet.value("switching.low.turn_off_time") * 13 / 10)   # RC forms linear in R: 13 Ω/10 Ω
    # the dv/dt the high side sees comes from the low side's fastest (0 Ω) voltage fall
    assert r.sheet.value("switching.high.dvdt") == pytest.approx(r0.sheet.value("switching.high.dvdt"))


def test_charge_data_size_the_intervals_instead_of_c_iss():
    # Q_gs 15 nC to the 5 V plateau: 3 nF below it; (40 − 15 − 10) nC over 10 − 5 V (Q_g given
    # at the R_DS(on) drive, 10 V): 3 nF above it. With the 10 Ω loop, R·C = 30 ns both ways:
    # t_d(on) = 30 ns·ln(12/9), t_d(off) = 30 ns·ln(12/5) at the peak-current plateau.
    r = review_text(bridge(("switch.low", "qgs", '"15 nC"')))
    assert r.sheet.value("switching.low.td_on") == pytest.approx(30e-9 * math.log(12 / 9), rel=1e-9)
    assert r.sheet.value("switching.low.td_off") == pytest.approx(30e-9 * math.log(12 / 5), rel=1e-9)
    # Q_g at 12 V instead: (40 − 25) nC / 7 V = 2.143 nF above the plateau
    r = review_text(bridge(("switch.low", "qgs", '"15 nC"'), ("switch.low", "qg_vgs", '"12 V"')))
    assert r.sheet.value("switching.low.td_off") == pytest.approx(10 * 15e-9 / 7 * math.log(12 / 5), rel=1e-9)
