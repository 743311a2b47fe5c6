"""The switching physics on arrays equals the same functions called once per element.

Array calls (one element per corner or sample, see :meth:`reviewer.quantities.Runner.batch`)
must not change a number: each function below is called on arrays whose rows take every branch
(current-limited ramp, RC, both joined, started past the crossing, never reached, headroom gone,
pull-resistor turn-off) and compared with the list of scalar calls to 1e-12 relative. The scalar
values themselves are checked against hand calculations and scipy in ``test_switching.py``; the
piecewise stage is also integrated here with ``scipy.integrate.solve_ivp`` row by row, and the
switching module is run as one array call on the designs whose branches differ (shared signal,
pull-only turn-off, current-limited stage).
"""

from __future__ import annotations

import math

import numpy as np
import pytest
from scipy.integrate import solve_ivp

from reviewer.physics import switching as sw


def _same(a, b) -> bool:
    a, b = float(a), float(b)
    if math.isinf(a) or math.isinf(b) or math.isnan(a) or math.isnan(b):
        return a == b or (math.isnan(a) and math.isnan(b))
    return b == pytest.approx(a, rel=1e-12, abs=1e-300)


def _parts(x):
    if isinstance(x, sw.SwitchingTimes):
        return (x.td_on, x.tr, x.td_off, x.tf, x.tail, x.t_ri, x.turn_on, x.turn_off_to_cutoff)
    if isinstance(x, tuple):
        return x
    return (x,)


def check(fn, rows, **fixed):
    """``fn`` on columns of ``rows`` (arrays) equals ``fn`` on each row (floats)."""
    cols = [np.array(c, dtype=float) for c in zip(*rows)]
    got = _parts(fn(*cols, **fixed))
    for i, row in enumerate(rows):
        want = _parts(fn(*row, **fixed))
        assert len(want) == len(got)
        for w, g in zip(want, got):
            assert isinstance(w, float), (fn.__name__, row, type(w))  # floats in, a float out
            assert isinstance(g, np.ndarray) and g.shape == (len(rows),)
            assert _same(w, g[i]), (fn.__name__, row, w, g[i])


# rows of (c, v_from, v_to, v_cross, r, i_limit): every branch of the piecewise stage
STAGE_ROWS = [
    (2e-9, 0.0, 12.0, 3.0, 10.0, 0.5),     # limit holds past the crossing (5 V headroom < 9 V)
    (2e-9, 0.0, 12.0, 9.0, 10.0, 0.5),     # ramp to 5 V headroom, then RC to 3 V headroom
    (2e-9, 0.0, 12.0, 3.0, 10.0, 2.0),     # I·R = 20 V above the headroom: RC throughout
    (2e-9, 12.0, 0.0, 5.0, 4.0, 1.0),      # falling: turn-off towards 0 V
    (2e-9, 12.0, -5.0, 0.0, 4.0, 1.0),     # falling towards a negative off level
    (2e-9, 3.0, 12.0, 3.0, 10.0, 0.5),     # starts at the crossing: zero
    (2e-9, 5.0, 12.0, 3.0, 10.0, 0.5),     # starts past it: zero
    (2e-9, 0.0, 2.0, 3.0, 10.0, 0.5),      # the target is short of the crossing: infinite
    (2e-9, 0.0, 3.0, 3.0, 10.0, 0.5),      # the crossing is the target: infinite
    (1e-9, 0.0, 12.0, 3.0, 10.0, np.inf),  # no limit: the RC form
]


def test_stage_time_both_limits_on_arrays():
    check(lambda c, v0, v1, vx, r, i: sw.stage_time(c, v0, v1, vx, r, i), STAGE_ROWS)


def test_stage_time_rc_only_and_current_only_on_arrays():
    check(lambda c, v0, v1, vx, r, i: sw.stage_time(c, v0, v1, vx, r=r), STAGE_ROWS)
    check(lambda c, v0, v1, vx, r, i: sw.stage_time(c, v0, v1, vx, i_limit=i), STAGE_ROWS[:9])


@pytest.mark.parametrize("row", [r for r in STAGE_ROWS if r[4] > 0 and np.isfinite(r[5])
                                 and abs(r[2] - r[3]) > 0 and (r[3] - r[1]) * (r[2] - r[1]) > 0
                                 and abs(r[2] - r[1]) > abs(r[3] - r[1])])
def test_stage_time_array_elements_against_solve_ivp(row):
    # C·dv/dt = min(I_lim, |V_to − v|/R) towards V_to, integrated until v crosses V_cross
    c, v0, v1, vx, r, i = row
    times = sw.stage_time(*(np.array([x, x]) for x in row))
    s = 1.0 if v1 >= v0 else -1.0

    def rhs(_t, v):
        return [s * min(i, abs(v1 - v[0]) / r) / c]

    def cross(_t, v):
        return v[0] - vx
    cross.terminal = True
    sol = solve_ivp(rhs, (0.0, 1e-5), [v0], events=cross, rtol=1e-10, atol=1e-12, max_step=1e-9)
    assert times[0] == pytest.approx(sol.t_events[0][0], rel=1e-5)


def test_plateau_and_rc_pieces_on_arrays():
    check(lambda q, vh, r, i: sw.plateau_time(q, vh, r, i),
          [(10e-9, 7.0, 10.0, 0.5), (10e-9, 7.0, 10.0, 2.0), (10e-9, 0.0, 10.0, 0.5),
           (10e-9, -1.0, 10.0, 0.5), (10e-9, 7.0, 0.0, 0.5)])
    check(sw.rc_crossing_time, [(100.0, 1e-9, 0.0, 12.0, 3.0), (100.0, 1e-9, 12.0, 0.0, 5.0),
                                (100.0, 1e-9, 3.0, 12.0, 3.0), (100.0, 1e-9, 0.0, 2.0, 3.0),
                                (100.0, 1e-9, 0.0, 12.0, 12.0), (100.0, 1e-9, 5.0, 5.0, 3.0)])
    rows = [(10e-9, 10.0, 12.0, 5.0), (10e-9, 10.0, 5.0, 5.0), (10e-9, 10.0, 4.0, 5.0)]
    check(sw.rise_time, rows)
    check(lambda q, r, vp, vo: sw.fall_time(q, r, vp, vo - 5.0), rows)
    check(sw.current_rise_time, [(10.0, 2e-9, 12.0, 3.0, 5.0), (10.0, 2e-9, 12.0, 3.0, 12.0),
                                 (10.0, 2e-9, 2.0, 3.0, 5.0)])
    check(sw.gate_loop_resistance, [(2.0, 5.0, 3.0), (0.0, 0.0, 0.0)])
    check(sw.turn_on_delay_current, [(2e-9, 3.0, 0.5, 0.0), (2e-9, 3.0, 0.5, 4.0)])
    check(sw.turn_off_delay_current, [(2e-9, 12.0, 5.0, 1.0), (2e-9, 4.0, 5.0, 1.0)])
    check(sw.current_fall_tail_current, [(2e-9, 5.0, 3.0, 1.0), (2e-9, 2.0, 3.0, 1.0)])
    check(sw.plateau_time_current, [(10e-9, 0.5), (10e-9, 2.0)])


# rows of (c_below, qgd, v_drive, vth, v_plateau, r_on, r_off, i_source, i_sink, v_off, c_above)
TIMES_ROWS = [
    (2e-9, 10e-9, 12.0, 3.0, 5.0, 10.0, 7.0, 0.5, 1.0, 0.0, 2.5e-9),    # both limits
    (2e-9, 10e-9, 12.0, 3.0, 5.0, 10.0, 7.0, 5.0, 5.0, -5.0, 2.5e-9),   # RC throughout
    (2e-9, 10e-9, 10.0, 3.0, 3.0, 10.0, 7.0, 0.2, 0.2, 0.0, 1.5e-9),    # plateau at threshold
    (2e-9, 10e-9, 4.0, 3.0, 5.0, 10.0, 7.0, 0.5, 1.0, 0.0, 2.5e-9),     # drive below plateau
    (2e-9, 10e-9, 2.0, 3.0, 5.0, 10.0, 7.0, 0.5, 1.0, 0.0, 2.5e-9),     # drive below threshold
]


@pytest.mark.parametrize("stage", ["both", "rc", "current"])
def test_switching_times_and_turn_off_intervals_on_arrays(stage):
    def kw(r_on, r_off, i_src, i_snk):
        return {"both": dict(r_on=r_on, r_off=r_off, i_source=i_src, i_sink=i_snk),
                "rc": dict(r_on=r_on, r_off=r_off),
                "current": dict(i_source=i_src, i_sink=i_snk)}[stage]

    def times(c, q, vd, vt, vp, r_on, r_off, i_src, i_snk, vo, ca):
        return sw.switching_times(c, q, vd, vt, vp, v_off=vo, c_above=ca,
                                  **kw(r_on, r_off, i_src, i_snk))

    def off(c, q, vd, vt, vp, r_on, r_off, i_src, i_snk, vo, ca):
        k = kw(r_on, r_off, i_src, i_snk)
        return sw.turn_off_intervals(c, q, vd, vt, vp, r_off=k.get("r_off"),
                                     i_sink=k.get("i_sink"), v_off=vo, c_above=ca)

    check(times, TIMES_ROWS)
    check(off, TIMES_ROWS)
    # the turn-off half gives exactly the numbers of the whole
    for row in TIMES_ROWS:
        t = times(*row)
        assert off(*row) == (t.td_off, t.tf, t.tail)


def test_pull_resistor_and_sizing_on_arrays():
    rows = [(10e3, 2e-9, 10e-9, 12.0, 5.0, 3.0, 3.0), (1e3, 2e-9, 10e-9, 12.0, 5.0, 5.0, 0.0),
            (10e3, 2e-9, 10e-9, 4.0, 5.0, 3.0, 1.0)]
    check(lambda *a: sw.pull_resistor_turn_off(*a[:5], vth=a[5], r_internal=a[6]), rows)
    check(lambda *a: sw.pull_resistor_turn_off(*a[:5], r_internal=a[6]), rows)
    rows = [(2e-9, 10e-9, 12.0, 5.0, 3.0, 0.0), (2e-9, 10e-9, 12.0, 5.0, 3.0, -5.0),
            (2e-9, 10e-9, 12.0, 3.0, 3.0, 0.0)]
    check(sw.turn_off_seconds_per_ohm, rows)
    check(lambda *a: sw.largest_turn_off_resistance(200e-9, 20e-9, *a), rows)
    check(lambda c, q, vd, vp, vt, vo: sw.smallest_sink_current(200e-9, 20e-9, c, q, vd, vp, vt),
          rows)
    check(sw.dead_time_required, [(300e-9, 50e-9, 0.5), (30e-9, 50e-9, 0.5)])


def test_dead_time_and_shoot_through_on_arrays():
    check(sw.effective_dead_time, [(200e-9, 20e-9, 10e-9, 5e-9), (20e-9, 20e-9, 10e-9, 5e-9)])
    check(sw.shoot_through_overlap, [(100e-9, 250e-9, 20e-9), (300e-9, 250e-9, 20e-9)])
    check(sw.shoot_through_peak_current, [(12.0, 0.01, 0.012, 0.0), (48.0, 0.02, 0.02, 0.001)])
    check(sw.dead_time_fraction, [(200e-9, 20e3), (0.0, 20e3)])
    check(sw.node_slew_rate, [(12.0, 20e-9), (48.0, 5e-9)])


def test_charge_capacitances_on_arrays():
    rows = [(2e-9, 30e-9, 8e-9, 10e-9, 5.0, 10.0),     # both from the charge data
            (2e-9, 30e-9, 8e-9, 10e-9, 0.0, 10.0),     # no positive plateau: C_iss below
            (2e-9, 15e-9, 8e-9, 10e-9, 5.0, 10.0),     # no charge above the plateau: C_iss
            (2e-9, 30e-9, 8e-9, 10e-9, 12.0, 10.0)]    # V_Qg below the plateau: C_iss above
    check(lambda c, qg, qgs, qgd, vp, vq: sw.charge_capacitances(c, qg, qgs, qgd, vp, vq), rows)
    check(lambda c, qg, qgs, qgd, vp, vq: sw.charge_capacitances(c, None, qgs, None, vp), rows)


def test_edges_and_induced_gate_voltage_on_arrays():
    check(sw.current_edge_time, [(10.0, 6.0, 2e-9, 10.0, 2e-9, 20.0),
                                 (-10.0, 6.0, 0.0, 10.0, 2e-9, 20.0),
                                 (10.0, 0.0, 2e-9, 10.0, 2e-9, 20.0)])
    rows = [(100e-12, 1.9e-9, 10.0, 1e9, 12.0),       # stiff hold
            (100e-12, 1.9e-9, 10e3, 1e9, 12.0),       # weak hold: near the capacitive divider
            (100e-12, 1.9e-9, np.inf, 1e9, 12.0),     # no hold at all: the divider
            (100e-12, 1.9e-9, 0.0, 1e9, 12.0)]        # a short: none
    check(sw.induced_gate_voltage, rows)
    check(sw.induced_gate_voltage_bound, rows[:2])


def test_narrow_pulse_fractions_on_arrays():
    rows = [(0.9, 20e3, 1e-6), (0.9, 20e3, 30e-6), (0.0, 20e3, 1e-6), (0.0, 20e3, 30e-6),
            (0.5, 20e3, 0.0), (1.0, 20e3, 24e-6)]
    check(sw.narrow_pulse_fraction_leg, rows)
    check(sw.narrow_pulse_fraction_unipolar, rows)


# ---- the switching module as one array call, on the designs whose branches differ ---------

def _array_call_equals_scalar_runs(design, monkeypatch):
    import random

    from reviewer import quantities
    from reviewer.derive import switching
    from tests.engine.test_vector_modules import all_toleranced, same

    calls = []
    real = quantities.Runner._vector

    def spy(self, module, *a):
        done = real(self, module, *a)
        calls.append((module, done))
        return done

    monkeypatch.setattr(quantities.Runner, "_vector", spy)
    d = all_toleranced(design)
    vector, scalar = quantities.Runner(d, replay=False), quantities.Runner(d, replay=False)
    rng = random.Random(1)
    points = [{p: rng.uniform(vector.spans[p].lo, vector.spans[p].hi) for p in vector.tol}
              for _ in range(4)]
    batch = vector.batch(points)
    assert (switching, "done") in calls and vector.fallbacks == 0
    for at, got in zip(points, batch):
        want = scalar.point(at)
        assert got.missing == want.missing and got.notes == want.notes
        assert set(got.out) == set(want.out)
        for k, x in want.out.items():
            assert same(x, got.out[k]), (k, x, got.out[k])
    return batch[0]


def test_shared_signal_as_one_array_call(monkeypatch):
    from tests.variants import variant_design

    run = _array_call_equals_scalar_runs(
        variant_design("careful_12v_sine", {"drive.shared_signal": True}), monkeypatch)
    assert run.out["timing.high.dead_time"] == 0.0
    assert "one signal and its inverse" in run.notes["timing.high.dead_time"]


def test_pull_only_turn_off_as_one_array_call(monkeypatch):
    from reviewer.design import load_design
    from tests.conftest import EXAMPLES

    run = _array_call_equals_scalar_runs(load_design(EXAMPLES / "naive_bench_pchannel.toml"),
                                         monkeypatch)
    assert run.out["switching.high.pull_only"] is True
    assert "pull resistor, its only turn-off path" in run.out["timing.low.outgoing_path"]


def test_current_limited_stage_as_one_array_call(monkeypatch):
    from tests.variants import variant_design

    design = variant_design("mains_output_transformer", {
        "drive.high.source_current": "10 mA", "drive.low.source_current": "10 mA"})
    assert design.drive.high.source_current is not None
    _array_call_equals_scalar_runs(design, monkeypatch)
