"""The gate physics on arrays equals the same functions called once per element.

Each function of :mod:`reviewer.physics.gate` is called on arrays whose rows take every branch
(N and P channel, high and low side, on and off, clamp active or not, divider clipped, threshold
floor reached or not) and compared with the list of scalar calls to 1e-12 relative. The scalar
values are checked by hand (Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2 and §3.5)
in ``test_gate.py``; here a few array elements are also checked against those hand figures, and
the gate and stress modules are run as one array call on a P-channel design with gate levels
given from ground.
"""

from __future__ import annotations

import itertools

import numpy as np
import pytest

from reviewer.physics import gate as gp
from tests.physics.test_switching_arrays import check


@pytest.mark.parametrize("polarity", ["n", "p"])
def test_enhancement_on_arrays(polarity):
    check(lambda v: gp.enhancement(v, polarity), [(12.0,), (-12.0,), (0.0,)])


@pytest.mark.parametrize("polarity,position,conducting",
                         list(itertools.product("np", ("high", "low"), (True, False))))
def test_source_and_gate_node_on_arrays(polarity, position, conducting):
    rows = [(12.0, 15.0), (48.0, 0.0), (0.0, 5.0)]
    check(lambda vb, vg: gp.source_node_voltage(polarity, position, vb, conducting), rows)
    check(lambda vb, vg: gp.vgs_from_gate_node(vg, polarity, position, vb, conducting), rows)
    # by hand (Kirchhoff): a high-side N gate held at 0 V while the node sits at the bus sees
    # V_GS down to −V_bus; a low-side N gate sees its node voltage directly
    lo, hi = gp.vgs_from_gate_node(np.array([0.0, 0.0]), "n", "high", np.array([12.0, 48.0]),
                                   False)
    assert list(lo) == [-12.0, -48.0] and list(hi) == [0.0, 0.0]


@pytest.mark.parametrize("polarity,bidirectional", [("n", False), ("p", False), ("n", True)])
def test_zener_clamp_on_arrays(polarity, bidirectional):
    rows = [(20.0, 15.0), (10.0, 15.0), (-10.0, 15.0), (15.0, 15.0), (-20.0, 12.0)]
    check(lambda v, vz: gp.zener_clamped_vgs(v, vz, polarity, bidirectional=bidirectional), rows)
    # by hand: an N-channel zener of 15 V holds 20 V to 15 V and −10 V to one forward drop
    got = gp.zener_clamped_vgs(np.array([20.0, -10.0]), 15.0, "n")
    assert list(got) == [15.0, -0.7]


def test_dividers_and_zener_sizing_on_arrays():
    check(gp.divided_vgs, [(24.0, 10e3, 10e3), (12.0, 0.0, 10e3)])
    check(gp.divider_series_resistor, [(24.0, 12.0, 10e3), (10.0, 12.0, 10e3)])  # clipped at 0
    check(gp.divider_ratio_window, [(10.0, 30.0, 8.0, 20.0), (20.0, 24.0, 8.0, 30.0)])
    check(gp.zener_current, [(24.0, 15.0, 1e3, 10e3), (12.0, 15.0, 1e3, 10e3),
                             (24.0, 15.0, 1e3, np.inf)])
    check(gp.zener_series_resistor_min, [(24.0, 15.0, 0.25, 10e3), (12.0, 15.0, 0.25, np.inf)])
    # by hand: 24 V across 10 kΩ + 10 kΩ gives 12 V (Horowitz & Hill §1.2.3)
    assert list(gp.divided_vgs(np.array([24.0, 12.0]), 10e3, 10e3)) == [12.0, 6.0]


def test_plateau_power_edge_and_threshold_on_arrays():
    check(gp.miller_plateau, [(3.0, 10.0, 20.0), (2.0, 0.0, 5.0)])
    check(gp.resistor_power, [(12.0, 10e3), (-5.0, 100.0)])
    check(gp.pin_edge_time, [(30e-9, 20e-3), (100e-9, 1.0)])
    check(gp.vth_at_temperature, [(3.0, 150.0, 25.0, -5e-3), (2.0, -40.0, 25.0, -4e-3)])
    # the floor at half of V_th: reached at 175 °C for 1 V, not for 4 V
    rows = [(1.0, 175.0), (4.0, 175.0), (2.0, 25.0)]
    check(gp.vth_hot_estimate, rows)
    got = gp.vth_hot_estimate(np.array([1.0, 4.0]), 175.0)
    assert got[0] == 0.5 and got[1] == pytest.approx(4.0 - 0.005 * 150.0, rel=1e-12)


def test_gate_and_stress_modules_as_one_array_call(monkeypatch):
    """The P-channel bench design (levels from ground, pull resistors): gate and stress run as
    one array call each and equal the scalar runs point by point."""
    import random

    from reviewer import quantities
    from reviewer.derive import gate, stress
    from reviewer.design import load_design
    from tests.conftest import EXAMPLES
    from tests.engine.test_vector_modules import all_toleranced, same

    calls = []
    real = quantities.Runner._vector

    def spy(self, module, *a):
        done = real(self, module, *a)
        calls.append((module, done))
        return done

    monkeypatch.setattr(quantities.Runner, "_vector", spy)
    d = all_toleranced(load_design(EXAMPLES / "naive_bench_pchannel.toml"))
    vector, scalar = quantities.Runner(d, replay=False), quantities.Runner(d, replay=False)
    rng = random.Random(2)
    points = [{p: rng.uniform(vector.spans[p].lo, vector.spans[p].hi) for p in vector.tol}
              for _ in range(4)]
    batch = vector.batch(points)
    # stress reads texts of earlier modules that differ between these points: the runner then
    # calls it per group of points that agree ("split"), never a scalar fallback
    assert (gate, "done") in calls and vector.fallbacks == 0
    assert any(m is stress and r in ("done", "split") for m, r in calls)
    for at, got in zip(points, batch):
        want = scalar.point(at)
        assert got.missing == want.missing and got.notes == want.notes
        for k, x in want.out.items():
            if k.startswith(("gate.", "stress.")):
                assert same(x, got.out[k]), (k, x, got.out[k])
    assert len({r.out["gate.high.pull_voltage"] for r in batch}) > 1  # it did vary
