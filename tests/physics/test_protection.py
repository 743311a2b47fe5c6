"""Protection and wiring: input current, fuse loading and window, battery fault current, wire
sizes and ampacity, TVS window, fault current at the protection's response.

Sources beside each value: ASTM B258-18 (AWG diameters), NEC 2023 Table 310.16 and 240.4(D)
(checked against secondary reprints), the fuse loading table's entries, and hand calculations
from Ohm's law and v = L di/dt.
"""

from __future__ import annotations

import pytest

from reviewer.physics import protection as p
from reviewer.physics.wire import awg_area, awg_diameter, parse_awg

MM2 = 1e-6


@pytest.mark.parametrize("gauge,d_mm", [
    (12, 2.053),  # ASTM B258-18
    (10, 2.588),  # ASTM B258-18
    (14, 1.628),  # ASTM B258-18
    (-3, 11.684),  # 4/0 = 0.4600 in by definition of the AWG series (ASTM B258)
    (36, 0.127),  # 36 AWG = 0.0050 in by definition
])
def test_awg_diameters_against_astm_b258(gauge, d_mm):
    assert awg_diameter(gauge) * 1e3 == pytest.approx(d_mm, abs=5e-4)


def test_input_current_at_the_lowest_bus():
    # I_in = P_out / (η · V_bus,min): 600 W, 85 %, 10.5 V -> 67.23 A.
    assert p.input_current(600, 10.5, 0.85) == pytest.approx(67.227, rel=1e-4)


def test_fuse_loading_against_its_standard():
    # 20 A on a 25 A UL 248 fuse is 80 %: above the 75 % limit, within the NEC's 80 %.
    loading = p.fuse_loading(20, 25)
    assert loading == pytest.approx(0.8)
    assert loading > p.fuse_loading_limit("ul248")
    assert loading <= p.fuse_loading_limit("nec")
    # Smallest fuse carrying 20 A: UL 248 26.67 A, NEC 25 A, IEC 60127 20 A.
    assert p.fuse_rating_min(20, "ul248") == pytest.approx(26.667, rel=1e-4)
    assert p.fuse_rating_min(20, "nec") == pytest.approx(25.0)
    assert p.fuse_rating_min(20, "iec60127") == pytest.approx(20.0)


def test_battery_prospective_short_circuit_current():
    # Ohm's law: a 12.8 V battery with 5 mΩ internal resistance, bolted fault at its terminals:
    # 12.8 / 0.005 = 2560 A; through 3 mΩ of cable and fuse: 12.8 / 0.008 = 1600 A.
    assert p.prospective_short_circuit_current(12.8, 0.005) == pytest.approx(2560.0)
    assert p.prospective_short_circuit_current(12.8, 0.005, 0.003) == pytest.approx(1600.0)


@pytest.mark.parametrize("area,temp,amps", [
    (awg_area(10), 75, 35),          # NEC Table 310.16
    (4 * MM2, 75, 25),               # 4 mm² lies between 12 AWG (3.31) and 10 AWG (5.26): 12 AWG
    (6 * MM2, 75, 35),               # 6 mm² rated as 10 AWG
    (5.26 * MM2, 90, 40),            # within 1 % of 10 AWG counts as 10 AWG
    (2.0 * MM2, 75, None),           # smaller than 14 AWG (2.08 mm²): not in the table
    (50 * MM2, 75, 130),             # 50 mm² rated as 1 AWG (42.4 mm²), not 1/0 (53.5 mm²)
])
def test_wire_ampacity_for_an_area(area, temp, amps):
    assert p.wire_ampacity(area, temp) == amps


@pytest.mark.parametrize("fuse,temp,gauge", [
    (15, 60, "14"),   # 240.4(D): 14 AWG up to 15 A
    (20, 75, "12"),
    (30, 75, "10"),   # 240.4(D): 10 AWG up to 30 A although its 75 C ampacity is 35 A
    (31, 75, "8"),    # 8 AWG, 50 A at 75 C
    (150, 75, "1/0"),
    (151, 75, "2/0"),
    (240, 75, None),  # beyond 4/0 at 75 C (230 A)
])
def test_smallest_wire_a_fuse_protects(fuse, temp, gauge):
    got = p.smallest_wire_for_fuse(fuse, temp)
    if gauge is None:
        assert got is None
    else:
        assert got[0] == gauge and got[1] == pytest.approx(awg_area(parse_awg(gauge)))


def test_fuse_window_carries_the_load_and_protects_the_wire():
    # 20 A continuous on a UL 248 fuse needs ≥ 26.67 A; 10 AWG is protected up to 30 A: a window.
    low, high = p.fuse_window(20, "ul248", awg_area(10))
    assert low == pytest.approx(26.667, rel=1e-4) and high == 30
    # On 12 AWG (20 A at most) there is none: the wire must grow.
    low, high = p.fuse_window(20, "ul248", awg_area(12))
    assert low > high
    assert p.fuse_window(20, "ul248", None)[1] is None


def test_tvs_window():
    # Standoff at or above the highest bus, clamp at or below the switch rating.
    assert p.tvs_window(14.8, 40.0) == (14.8, 40.0)


def test_fault_current_when_protection_acts():
    # v = L di/dt: 12 V across 1 µH rises at 12 A/µs; 2 µs after a 100 A threshold: 124 A.
    assert p.fault_current_at_response(100.0, 12.0, 1e-6, 2e-6) == pytest.approx(124.0)


def test_fault_energy_functions_by_hand_and_on_arrays():
    import numpy as np

    from reviewer.physics import protection as pr
    from reviewer.physics import wire as w

    # C·V²/(2R): 1 mF, 12 V, 0.1 Ω → 0.72 A²s (RC charging integrated)
    assert pr.capacitor_inrush_i2t(12.0, 1e-3, 0.1) == pytest.approx(0.72)
    np.testing.assert_allclose(pr.capacitor_inrush_i2t(12.0, 1e-3, np.array([0.1, 1.0])), [0.72, 0.072])
    # IEC 60364-4-43 Table 43A (from memory): 115 thermoplastic, 143 thermosetting copper
    np.testing.assert_allclose(pr.adiabatic_k(np.array([70.0, 75.0, 90.0, 105.0])),
                               [115.0, 115.0, 143.0, 143.0])
    # k²S²: 115² · 2.5² = 82 656 A²s for 2.5 mm²
    assert pr.wire_withstand_i2t(115.0, 2.5e-6) == pytest.approx(82656.25)
    # fuse rerating: 1 at or below 25 °C, 0.95 at 40 °C, halfway 0.915 at 50 °C (from memory)
    np.testing.assert_allclose(pr.fuse_ambient_factor("ul248", np.array([0.0, 25.0, 40.0, 50.0])),
                               [1.0, 1.0, 0.95, 0.915])
    with pytest.raises(ValueError):
        pr.fuse_ambient_factor("ul248", 120.0)
    # NEC 240.4(D) (from memory)
    assert pr.small_conductor("18")[:2] == (7.0, 5.6)
    assert pr.small_conductor("16")[:2] == (10.0, 8.0)
    assert pr.small_conductor("14") is None
    assert pr.small_conductor_gauge(w.awg_area(18)) == "18"
    assert pr.small_conductor_gauge(w.awg_area(20)) is None
    # copper 1/58 Ω·mm²/m at 20 °C (IEC 60028): 10 m of 1 mm² is 0.17241 Ω; +39.3 % at 120 °C
    assert w.conductor_resistance(10.0, 1e-6) == pytest.approx(10 / 58)
    assert w.conductor_resistance(10.0, 1e-6, 120.0) == pytest.approx(10 / 58 * 1.393)
    assert pr.clearing_multiple(None) == pr.clearing_multiple("slow") == 10.0
