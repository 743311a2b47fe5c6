"""The thermal physics and the thermal derive module on arrays: element by element what the
scalar calls give (1e-12 relative), in every regime a design can be in.

The scalar functions are checked against outside references in tests/physics/test_thermal.py
(hand calculations from Mohan, Undeland & Robbins, 3rd ed., §2-3 and §29-2; scipy's brentq and
minimize_scalar on the electro-thermal balance; numpy time-domain integration of the switching
patterns, Holmes & Lipo 2003 ch. 3). Here every converted function is called once on an array
and compared with the list of scalar calls, and the array solutions are checked again against
scipy (brentq for the fixed point, minimize_scalar for the heatsink limit), so the array code is
tied to the same references. The regimes: a steady junction, thermal runaway (no balance at
all), destruction (a balance beyond T_j,max, and a Z_th peak beyond it in every cycle), the
iteration limit, no thermal data, and the derive module's batch calls where points differ in
those regimes.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.optimize import brentq, minimize_scalar

from reviewer.design import parse_design
from reviewer.physics import thermal as th
from reviewer.quantities import Runner
from tests.bridge_base import bridge

R25, K, THOT = 0.020, 1.7, 125.0       # illustrative: 20 mΩ at 25 °C, ×1.7 at 125 °C
REL = 1e-12


def close(x, y) -> bool:
    if x is None or y is None:
        return x is None and y is None
    return float(y) == pytest.approx(float(x), rel=REL, abs=1e-300)


# ------------------------------------------------------------------------- the fixed point

def _balance(t, ta, rth, i, p_other, model="exponential"):
    return t - ta - rth * (i * i * th.rds_on_at(t, R25, 25.0, K, THOT, model) + p_other)


THETAS = np.array([5.0, 20.0, 40.0, 55.0, 60.0, 80.0, 150.0, 400.0])


@pytest.mark.parametrize("model", ["exponential", "linear"])
def test_fixed_point_array_equals_scalar_calls_through_runaway(model):
    ta, i, p_other = 40.0, np.linspace(3.0, 10.0, THETAS.size), 0.3
    sol = th.solve_junction_temperature(ta, THETAS, i, R25, 25.0, K, THOT, p_other=p_other,
                                        model=model)
    assert isinstance(sol.converged, np.ndarray) and sol.converged.shape == THETAS.shape
    assert sol.converged.any() and not sol.converged.all()     # both regimes in one call
    for k, (theta, ik) in enumerate(zip(THETAS, i)):
        one = th.solve_junction_temperature(ta, float(theta), float(ik), R25, 25.0, K, THOT,
                                            p_other=p_other, model=model)
        assert bool(sol.converged[k]) == one.converged
        assert int(sol.iterations[k]) == one.iterations       # the same stopping step
        assert sol.message[k] == one.message
        if one.converged:
            assert close(one.t_j, sol.t_j[k]) and close(one.rds_on, sol.rds_on[k])
            assert close(one.power, sol.power[k])
            # and the balance itself, by scipy: the lowest root of T − T_a − θ·P(T)
            root = brentq(_balance, ta, one.t_j + 1.0, args=(ta, theta, ik, p_other, model),
                          xtol=1e-12)
            assert sol.t_j[k] == pytest.approx(root, abs=1e-4)
        else:
            assert one.t_j is None and np.isnan(sol.t_j[k]) and np.isnan(sol.power[k])
            assert "thermal runaway" in sol.message[k]


def test_fixed_point_runaway_has_no_balance_by_scipy():
    # the elements the array call calls runaway: scipy finds T − T_a − θ·P(T) < 0 everywhere
    ta, i = 40.0, 10.0
    sol = th.solve_junction_temperature(ta, THETAS, i, R25, 25.0, K, THOT)
    for theta, conv in zip(THETAS, sol.converged):
        best = minimize_scalar(lambda t: -_balance(t, ta, theta, i, 0.0), bounds=(ta, 1000.0),
                               method="bounded")
        assert conv == (-best.fun >= 0)


def test_fixed_point_destruction_ceiling_per_element():
    # a flat on-resistance (hot factor 1): the balance is T = T_a + θ·P exactly, here 25 + 50·2
    # = 125 °C; a ceiling (T_j,max) below it stops the iteration there: destruction, not a
    # steady temperature; the ceiling varies between the elements
    ceilings = np.array([100.0, 124.0, 126.0, 175.0])
    sol = th.solve_junction_temperature(25.0, 50.0, 0.0, R25, 25.0, 1.0, THOT, p_other=2.0,
                                        t_ceiling=ceilings)
    assert sol.converged.tolist() == [False, False, True, True]
    assert sol.t_j[2:] == pytest.approx(125.0, abs=1e-5)
    for k, c in enumerate(ceilings):
        one = th.solve_junction_temperature(25.0, 50.0, 0.0, R25, 25.0, 1.0, THOT, p_other=2.0,
                                            t_ceiling=float(c))
        assert (one.converged, one.iterations, one.message) == (
            bool(sol.converged[k]), int(sol.iterations[k]), sol.message[k])
        assert close(one.t_j, None if np.isnan(sol.t_j[k]) else sol.t_j[k])
    assert "passes 100 °C" in sol.message[0]


def test_fixed_point_iteration_limit_per_element():
    # near the edge of runaway the iterates creep: with few steps allowed they do not settle
    ta, i = 40.0, 10.0
    theta_c = th.largest_total_resistance(1000.0, ta, i, R25, 25.0, K, THOT)
    thetas = np.array([0.2, 0.5, 0.999]) * theta_c
    sol = th.solve_junction_temperature(ta, thetas, i, R25, 25.0, K, THOT, max_iter=60)
    assert sol.converged.tolist() == [True, True, False]
    assert sol.iterations[2] == 60 and "did not settle within 60 steps" in sol.message[2]
    for k, theta in enumerate(thetas):
        one = th.solve_junction_temperature(ta, float(theta), i, R25, 25.0, K, THOT, max_iter=60)
        assert (one.converged, one.iterations, one.message) == (
            bool(sol.converged[k]), int(sol.iterations[k]), sol.message[k])


def test_fixed_point_scalar_call_keeps_its_types():
    one = th.solve_junction_temperature(40.0, 20.0, 5.0, R25, 25.0, K, THOT)
    assert one.converged is True and type(one.t_j) is float and type(one.iterations) is int
    assert isinstance(one.message, str)


# ------------------------------------------------------------------- the heatsink figures

def test_largest_resistance_array_equals_scalar_calls_and_scipy():
    # three regimes in one call: T_limit at or below ambient (0), h still rising at T_limit,
    # and h peaking below T_limit (the runaway tangency, found by bisection)
    t_lim = np.array([30.0, 40.0, 125.0, 150.0, 1000.0, 1000.0])
    i = np.array([5.0, 5.0, 5.0, 10.0, 10.0, 20.0])
    ta, p_other = 40.0, 0.4
    got = th.largest_total_resistance(t_lim, ta, i, R25, 25.0, K, THOT, p_other=p_other)
    sa = th.largest_sink_to_ambient(t_lim, ta, 1.0, 0.5, i, R25, 25.0, K, THOT, p_other=p_other)
    for k in range(t_lim.size):
        one = th.largest_total_resistance(float(t_lim[k]), ta, float(i[k]), R25, 25.0, K, THOT,
                                          p_other=p_other)
        assert type(one) is float and close(one, got[k])
        assert close(th.largest_sink_to_ambient(float(t_lim[k]), ta, 1.0, 0.5, float(i[k]), R25,
                                                25.0, K, THOT, p_other=p_other), sa[k])
        if t_lim[k] <= ta:
            assert got[k] == 0.0
            continue
        # scipy: the largest θ = (T − T_a)/P(T) over [T_a, T_limit]
        def minus_h(t):
            return -(t - ta) / (i[k] ** 2 * th.rds_on_at(t, R25, 25.0, K, THOT) + p_other)
        best = minimize_scalar(minus_h, bounds=(ta, float(t_lim[k])), method="bounded",
                               options={"xatol": 1e-9})
        assert got[k] == pytest.approx(max(-best.fun, -minus_h(float(t_lim[k]))), rel=1e-7)


def test_thermal_resistance_arrays_and_no_thermal_data():
    jc, sa = np.array([0.5, 1.0, 1.5]), np.array([2.0, 3.0, 4.0])
    got = th.thermal_resistance(jc, 0.2, sa)
    ja = th.thermal_resistance(rth_ja=np.array([40.0, 62.0]))
    for k in range(3):
        assert close(th.thermal_resistance(float(jc[k]), 0.2, float(sa[k])), got[k])
        assert close(th.thermal_resistance(float(jc[k]), None, float(sa[k])),
                     th.thermal_resistance(jc, None, sa)[k])
    assert ja.tolist() == [40.0, 62.0]
    # θ_jc + θ_cs + θ_sa by hand (Mohan, Undeland & Robbins §29-2): 0.5 + 0.2 + 2 = 2.7 K/W
    assert got[0] == pytest.approx(2.7)
    assert type(th.thermal_resistance(0.5, 0.2, 2.0)) is float
    # no thermal data: which fields are given is the same at every point, so arrays raise too
    with pytest.raises(ValueError):
        th.thermal_resistance(rth_sa=sa)
    with pytest.raises(ValueError):
        th.thermal_resistance(rth_jc=jc)


def test_zth_pulse_swing_arrays_against_the_closed_form():
    # single-pole Z_th driven by a pulse train (Mohan, Undeland & Robbins §29-3, from memory):
    # swing = P·R·((1 − e^(−t_on/τ))/(1 − e^(−T/τ)) − t_on/T), computed here with math
    tau = np.array([1e-5, 1e-3, 4e-3, 1e-2, 1.0])
    p, r, t_on, period = 12.0, 1.2, 10e-3, 20e-3
    got = th.pulse_temperature_swing(p, r, tau, t_on, period)
    for k, t in enumerate(tau):
        want = p * r * ((1 - math.exp(-t_on / t)) / (1 - math.exp(-period / t)) - t_on / period)
        assert got[k] == pytest.approx(want, rel=1e-9)
        assert close(th.pulse_temperature_swing(p, r, float(t), t_on, period), got[k])


# ------------------------------------------------------------------ currents per switch

@pytest.mark.parametrize("kind", ["square", "quasi_square", "spwm_bipolar", "spwm_unipolar"])
def test_switch_currents_arrays_equal_scalar_calls(kind):
    i = np.array([1.0, 4.0, 9.5, 20.0])
    phi = np.array([0.0, 0.3, 0.9, 1.4])
    alpha = np.array([0.0, 0.2, 0.4, 0.6])
    m = np.array([0.5, 0.8, 0.95, 1.0])
    c = th.switch_currents(kind, i, phi, notch_angle=alpha, index=m)
    sw = th.switched_current(kind, i, phi, alpha)
    for k in range(i.size):
        one = th.switch_currents(kind, float(i[k]), float(phi[k]), notch_angle=float(alpha[k]),
                                 index=float(m[k]))
        assert type(one.high_rms) is float
        for f in ("high_rms", "high_avg", "low_rms", "low_avg"):
            assert close(getattr(one, f), getattr(c, f)[k]), f
        assert close(th.switched_current(kind, float(i[k]), float(phi[k]), float(alpha[k])),
                     sw[k])


def test_quasi_square_rms_arrays_against_time_domain():
    # low zero state: the high side conducts for θ in (α, π − α) (Holmes & Lipo 2003 ch. 3);
    # its RMS by numpy integration of i² over that interval
    alpha, phi, ipk = np.array([0.1, 0.3, 0.5]), np.array([0.2, 0.6, 1.0]), 10.0
    c = th.switch_currents("quasi_square", ipk, phi, notch_angle=alpha)
    for k in range(alpha.size):
        th_ = np.linspace(alpha[k], math.pi - alpha[k], 200001)
        i2 = (ipk * np.sin(th_ - phi[k])) ** 2
        assert c.high_rms[k] == pytest.approx(math.sqrt(np.trapezoid(i2, th_) / (2 * math.pi)),
                                              rel=1e-8)


# ------------------------------------------------------------- the derive module on batches

def _runner(text: str) -> Runner:
    return Runner(parse_design(text, "<test>"), replay=False)


def assert_batch_equals_points(text: str, points: list[dict[str, float]]) -> list:
    """One batch over ``points`` equals the scalar runs at each point; the thermal module
    ran as arrays (no fallback). Returns the scalar runs."""
    vector, scalar = _runner(text), _runner(text)
    batch = vector.batch(points)
    assert vector.fallbacks == 0 and vector.vector_calls >= 1
    runs = []
    for at, got in zip(points, batch):
        want = scalar.point(at)
        runs.append(want)
        assert set(got.out) == set(want.out), sorted(set(got.out) ^ set(want.out))
        assert got.missing == want.missing
        assert got.notes == want.notes
        for key, x in want.out.items():
            y = got.out[key]
            assert type(y) is type(x), key
            assert (close(x, y) if type(x) is float else x == y), (key, x, y)
    return runs


def test_batch_with_and_without_a_steady_junction():
    # θ_ja from 20 to 300 K/W: the clean bridge settles at the low end and has no balance below
    # T_j,max at the high end (200 K/W is destruction: tests/test_thermal_rules.py); both kinds
    # of point in one batch, the rest of the design toleranced too
    text = bridge(("switch.low", "rth_ja", '"100 K/W ± 90%"'),
                  ("switch.high", "rth_ja", '"40 K/W ± 50%"'))
    points = [{"switch.low.rth_ja": t, "switch.high.rth_ja": h}
              for t, h in [(20.0, 20.0), (300.0, 60.0), (60.0, 40.0), (250.0, 20.0),
                           (30.0, 55.0), (190.0, 30.0)]]
    runs = assert_batch_equals_points(text, points)
    runaway = [r.out["thermal.low.runaway"] for r in runs]
    assert True in runaway and False in runaway
    for r in runs:
        assert ("thermal.low.tj" in r.out) != r.out["thermal.low.runaway"]


def test_batch_with_a_zth_peak_beyond_tj_max_at_some_points():
    # square wave, τ = 10 µs ≪ the 10 ms conduction: the junction follows each pulse, and with
    # a large junction-to-case resistance its peak passes T_j,max while the mean does not
    # (tests/test_thermal_rules.py); a smaller R_jc keeps the peak below
    parts = [("modulation", "kind", '"square"')]
    for side in ("high", "low"):
        parts += [(f"switch.{side}", "rth_ja", None),
                  (f"switch.{side}", "rth_jc", '"200 K/W ± 60%"'),
                  (f"switch.{side}", "rth_sa", '"1 K/W"'),
                  (f"switch.{side}", "zth_tau", '"10 µs ± 50%"')]
    text = bridge(*parts)
    points = [{"switch.low.rth_jc": jc, "switch.high.rth_jc": jc, "switch.low.zth_tau": tau,
               "switch.high.zth_tau": tau}
              for jc, tau in [(300.0, 1e-5), (80.0, 1e-5), (100.0, 1.4e-5), (320.0, 6e-6),
                              (90.0, 8e-6)]]
    runs = assert_batch_equals_points(text, points)
    peaks = ["thermal.low.tj_peak" in r.out for r in runs]
    assert True in peaks and False in peaks
    for r in runs:
        if "thermal.low.tj_peak" not in r.out:
            assert r.out["thermal.low.runaway"] is True
            assert "peaks above T_j,max" in r.out["thermal.low.verdict"]


def test_batch_without_thermal_data_or_zth():
    # no thermal path for the low side: its temperature figures need data at every point (the
    # losses, computed before the thermal path is needed, are published); no Z_th: the
    # peak needs data where a steady junction exists and is not asked for where none does
    text = bridge(("switch.low", "rth_ja", None), ("switch.high", "rth_ja", '"100 K/W ± 90%"'),
                  ("switch.high", "rds_on", '"10 mΩ ± 20%"'))
    points = [{"switch.high.rth_ja": t, "switch.high.rds_on": r}
              for t, r in [(20.0, 0.008), (300.0, 0.012), (50.0, 0.011), (280.0, 0.009)]]
    runs = assert_batch_equals_points(text, points)
    for r in runs:
        assert "thermal.low.tj" in r.missing and "thermal.low.rth" in r.missing
        assert "thermal.low.device_rms" in r.out
        assert ("thermal.high.tj_peak" in r.missing) == ("thermal.high.tj" in r.out)


def test_batch_where_the_recovery_charge_is_zero_at_some_points():
    # Q_rr = 0 at a point counts no recovery loss there and says so in its note, as a scalar
    # run does; Q_rr·V·f_sw·½ elsewhere (Mohan, Undeland & Robbins §20-2, from memory)
    text = bridge(("switch.high", "diode_qrr", '"50 nC ± 100%"'))
    points = [{"switch.high.diode_qrr": q} for q in (0.0, 5e-8, 1e-7, 0.0)]
    runs = assert_batch_equals_points(text, points)
    assert runs[0].out["thermal.low.recovery_loss"] == 0.0
    assert "no recovery loss" in runs[0].notes["thermal.low.recovery_loss"]
    assert "thermal.low.recovery_loss" not in runs[1].notes


class _Quotes:
    """A stand-in array module that quotes an earlier module's text in its note."""

    VECTOR = True
    from reviewer.context import declare as _declare
    QUANTITIES = _declare(("quoted.path", "", "the low side's turn-off path, quoted", "text"))

    @staticmethod
    def derive(ctx):
        path = ctx.q("timing.low.outgoing_path")
        ctx.publish("quoted.path", "path", f"turned off {path}")


def test_a_differing_earlier_text_quoted_in_an_array_call_names_each_points_value():
    # the naive bench design turns its switches off through the pull resistor alone, and says
    # so with the resistor's value: a toleranced resistor makes that text differ between the
    # points; the runner calls a module that reads it once per group of points with the same
    # text (so each point's note names its own resistor) rather than printing an array
    from reviewer.derive import MODULES, switching
    from reviewer.design import load_design
    from reviewer.units import Span
    from tests.conftest import EXAMPLES
    from tests.engine.test_worstcase_property import with_spans

    design = with_spans(load_design(EXAMPLES / "naive_bench_pchannel.toml"),
                        {"drive.high.pull_resistor": Span(8e3, 1e4, 1.2e4)})
    modules = MODULES[:MODULES.index(switching) + 1] + [_Quotes]
    vector = Runner(design, replay=False, modules=modules)
    scalar = Runner(design, replay=False, modules=modules)
    points = [{"drive.high.pull_resistor": r} for r in (8e3, 1e4, 1.2e4)]
    batch = vector.batch(points)
    notes = [run.notes["quoted.path"] for run in batch]
    assert notes == [scalar.point(at).notes["quoted.path"] for at in points]
    assert "8 kΩ" in notes[0] and "12 kΩ" in notes[2] and "[" not in notes[1]
    # the thermal module, which does not read the text, still runs as arrays over those points
    full = Runner(design, replay=False)
    full.batch(points)
    assert full.fallbacks == 0 and full.vector_calls >= 1
