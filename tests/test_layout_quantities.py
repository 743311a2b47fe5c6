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
    r = review_file(example("careful_12v_sine"))
    # bus path: 60 W / (0.88 · 10.5 V) = 6.4935 A; 2 oz outer, 20 °C rise:
    # A = (6.4935 / (0.048 · 20^0.44))^(1/0.725) mil², width = A / (2 · 1.378 mil)
    i = 60 / (0.88 * 10.5)
    assert r.sheet.value("layout.bus.current") == pytest.approx(i)
    area = (i / (0.048 * 20**0.44)) ** (1 / 0.725)
    assert r.sheet.value("layout.bus.trace_width") == pytest.approx(area / (2 * 1.378) * MIL)
    # output path: 60 W / 7 V = 8.571 A rms
    area = ((60 / 7) / (0.048 * 20**0.44)) ** (1 / 0.725)
    assert r.sheet.value("layout.output.trace_width") == pytest.approx(area / (2 * 1.378) * MIL)


def test_net_spacing_of_the_230_volt_example():
    r = review_file(example("mains_output_transformer"))
    # bus peak 29.6 V: IPC-2221 B2 band 16-30 V, 0.1 mm; output nets peak at 230·√2 = 325 V:
    # band 301-500 V, 2.5 mm (Table 6-1, from memory)
    assert r.sheet.value("layout.bus.spacing") == pytest.approx(0.1e-3)
    assert r.sheet.value("layout.output.voltage") == pytest.approx(230 * math.sqrt(2))
    assert r.sheet.value("layout.output.spacing") == pytest.approx(2.5e-3)
    assert r.sheet.value("layout.barrier.creepage") == pytest.approx(5.0e-3)


def test_no_barrier_constraint_within_elv():
    r = review_file(example("careful_12v_sine"))
    assert r.sheet.get("layout.barrier.creepage") is None


def test_fuse_window_values_are_published():
    r = review_file(example("careful_12v_sine"))
    # 6.4935 A on an automotive fuse (80 %): at least 8.117 A; 12 AWG at 90 °C: at most 20 A
    assert r.sheet.value("protection.fuse_min") == pytest.approx(6.4935 / 0.8, rel=1e-4)
    assert r.sheet.value("protection.wire_max_fuse") == 20.0
    assert r.sheet.value("protection.wire_needed").startswith("14 AWG")
