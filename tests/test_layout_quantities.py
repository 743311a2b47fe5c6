"""Layout constraints published for the report's layout table: trace width per current path
(IPC-2221 chart fit, an estimate) and spacing between net classes (IPC-2221 Table 6-1, from
memory), creepage and clearance across the barrier (IEC 60664-1)."""

from __future__ import annotations

import math

import pytest

from reviewer.review import review_file
from tests.conftest import example

MIL = 25.4e-6


def test_trace_widths_of_the_careful_example_by_hand():
    """Each path is sized on its own RMS current (IPC-2221 fit, 2 oz outer, 20 °C rise:
    A = (I / (0.048 · 20^0.44))^(1/0.725) mil², width = A / (2 · 1.378 mil)).

    Output path: the inductor current, 60 W / 7 V = 8.571 A rms at the fundamental, the ripple
    adding under 0.1 %. Bus path between the local capacitors and the bridge: three-level sine
    PWM at M = 0.8 and cos φ = 1 chops it to I_in,rms = I·√(2M/π · (1 + cos 2φ/3)) =
    0.8241 · I (Holmes & Lipo 2003, ch. 3, the switching function squared and averaged); the
    mean input current 60 / (0.88 · 10.5) = 6.49 A would be 6 % too low."""
    r = review_file(example("careful_12v_sine"))
    i_out = r.sheet.value("layout.output.current")
    assert i_out == pytest.approx(60 / 7, rel=1e-3)
    i_bus = i_out * math.sqrt(2 * 0.8 / math.pi * (1 + 1 / 3))
    assert r.sheet.value("layout.bus.current") == pytest.approx(i_bus, rel=1e-9)
    area = (i_bus / (0.048 * 20**0.44)) ** (1 / 0.725)
    assert r.sheet.value("layout.bus.trace_width") == pytest.approx(area / (2 * 1.378) * MIL)
    area = (i_out / (0.048 * 20**0.44)) ** (1 / 0.725)
    assert r.sheet.value("layout.output.trace_width") == pytest.approx(area / (2 * 1.378) * MIL)


def test_two_level_pwm_bus_path_carries_the_output_rms():
    """Two-level PWM: the switching function is ±1, so the bus path's RMS equals the output
    current's (Holmes & Lipo 2003, ch. 3); the mean input current is far lower."""
    text = example("careful_12v_sine").read_text().replace('kind = "spwm_unipolar"',
                                                           'kind = "spwm_bipolar"')
    from tests.conftest import review_text

    r = review_text(text)
    assert r.sheet.value("layout.bus.current") == pytest.approx(
        r.sheet.value("layout.output.current"), rel=1e-12)
    assert r.sheet.value("layout.bus.current") > 1.3 * r.sheet.value("op.input_current")


def test_net_spacing_of_the_230_volt_example():
    r = review_file(example("mains_output_transformer"))
    # bus peak 29.8 V: IPC-2221 B2 band 16-30 V, 0.1 mm; output nets peak at the largest output,
    # 253·√2 = 357.8 V: band 301-500 V, 2.5 mm (Table 6-1, from memory)
    assert r.sheet.value("layout.bus.spacing") == pytest.approx(0.1e-3)
    assert r.sheet.value("layout.output.voltage") == pytest.approx(253 * math.sqrt(2))
    assert r.sheet.value("layout.output.spacing") == pytest.approx(2.5e-3)
    assert r.sheet.value("layout.barrier.creepage") == pytest.approx(5.06e-3)


def test_no_barrier_constraint_within_elv():
    r = review_file(example("careful_12v_sine"))
    assert r.sheet.get("layout.barrier.creepage") is None


def test_fuse_window_values_are_published():
    r = review_file(example("careful_12v_sine"))
    # the lead's RMS on an automotive fuse (80 %) at 40 °C (0.95, fuse_ambient.toml, from memory);
    # 12 AWG at 90 °C: at most 20 A (240.4(D))
    i_rms = r.sheet.value("protection.supply_current_rms")
    assert r.sheet.value("protection.fuse_min") == pytest.approx(i_rms / (0.8 * 0.95), rel=1e-9)
    assert r.sheet.value("protection.wire_max_fuse") == 20.0
    assert r.sheet.value("protection.wire_needed").startswith("14 AWG")
