"""Fuse and wiring judged on the currents and energies the design produces (§3.8).

Hand calculations, each with its source:
- supply-lead RMS √(I_dc² + (k·I_2f)²), k = |Z_c / (R_s + Z_c)| the current divider between the
  source and the bus capacitors, I_2f = I_dc/√2 (Mohan, Undeland & Robbins 2003, ch. 8);
- fuse rerating 0.95 at 40 °C (reviewer/tables/fuse_ambient.toml, from memory);
- inrush I²t = C·V²/(2R) of RC charging (integrate (V/R)²·e^(−2t/RC));
- adiabatic withstand k²S², k = 115 (PVC) or 143 (XLPE/EPR) for copper (IEC 60364-4-43,
  434.5.2 and Table 43A, from memory), S from ASTM B258 (12 AWG: 2.053 mm, 3.309 mm²);
- copper 1/58 Ω·mm²/m at 20 °C (IEC 60028);
- fault rise V/L over blanking plus response (v = L·di/dt).
The design: 108 W at 90 % from 12 V (I_dc = 10 A), 12.8 V highest, 10 mΩ internal
(tests/test_protection_rules.py)."""

from __future__ import annotations

import math

import pytest

from tests.conftest import finding, review_text
from tests.test_protection_rules import design

RHO = 1 / 58 * 1e-6
AREA_12 = math.pi / 4 * (0.127e-3 * 92 ** (24 / 39)) ** 2


def test_awg_12_area_from_astm_b258():
    assert AREA_12 == pytest.approx(3.309e-6, rel=1e-3)  # 2.053 mm diameter (ASTM B258)


def test_ripple_split_between_battery_and_capacitors():
    """R_s = 10 mΩ, C = 10 mF with 5 mΩ ESR at 100 Hz: Z_c = 0.005 − j·0.15915 Ω,
    k = |Z_c| / |0.015 − j·0.15915| = 0.15923 / 0.15986 = 0.99608;
    I_rms = √(10² + (0.99608 · 7.0711)²) = 12.231 A."""
    r = review_text(design(extra='\n[capacitors]\nbulk = "10 mF"\nesr = "5 mΩ"\n'))
    zc = complex(0.005, -1 / (2 * math.pi * 100 * 10e-3))
    k = abs(zc / (0.01 + zc))
    assert r.sheet.value("protection.supply_ripple_share") == pytest.approx(k, rel=1e-9)
    assert k == pytest.approx(0.99608, abs=1e-5)
    i_rms = math.sqrt(100 + (k * 10 / math.sqrt(2)) ** 2)
    assert r.sheet.value("protection.supply_current_rms") == pytest.approx(i_rms, rel=1e-9)


def test_without_source_resistance_the_lead_carries_all_the_ripple():
    text = design(extra='\n[capacitors]\nbulk = "10 mF"\n').replace('r_internal = "10 mΩ"', "")
    r = review_text(text)
    assert r.sheet.value("protection.supply_ripple_share") == 1.0
    assert r.sheet.value("protection.supply_current_rms") == pytest.approx(math.sqrt(150))


@pytest.mark.parametrize("factor,outcome", [(1.0, "pass"), (0.999, "fail")])
def test_ambient_rerating_at_40_degrees(factor, outcome):
    """Automotive fuse at 40 °C: 0.80 × 0.95 = 0.76; I_rms = √150 = 12.247 A, so a fuse of
    12.247 / 0.76 = 16.115 A is at the limit."""
    rating = math.sqrt(150) / 0.76 * factor * 1.000001
    text = design(rating=f"{rating} A") + '\n[environment]\nambient = "40 °C"\n'
    f = finding(review_text(text), "protection.fuse-loading")
    assert f.limit == pytest.approx(0.76)
    assert f.outcome == outcome


def test_fuse_makers_factor_replaces_the_table_and_hot_ambients_need_it():
    text = design(rating="20 A").replace("[fuse]", '[fuse]\nambient_factor = "0.5"')
    text += '\n[environment]\nambient = "40 °C"\n'
    assert finding(review_text(text), "protection.fuse-loading").limit == pytest.approx(0.4)
    hot = design(rating="20 A") + '\n[environment]\nambient = "110 °C"\n'
    f = finding(review_text(hot), "protection.fuse-loading")
    assert f.outcome == "needs_data" and "fuse.ambient_factor" in f.needs


@pytest.mark.parametrize("melting,outcome", [(8.192 / 0.3 * 1.000001, "pass"), (27.3, "fail")])
def test_inrush_against_the_melting_i2t(melting, outcome):
    """1 mF charged from 12.8 V through 10 mΩ: I²t = 1e-3 · 12.8² / (2 · 0.01) = 8.192 A²s,
    against 30 % of the melting I²t (common practice): at the limit 27.307 A²s."""
    text = design(extra='\n[capacitors]\nbulk = "1 mF"\n').replace(
        "[fuse]", f'[fuse]\ni2t_melting = "{melting} A²s"')
    r = review_text(text)
    f = finding(r, "protection.inrush")
    assert f.value == pytest.approx(8.192, rel=1e-9)
    assert r.sheet.value("protection.inrush_peak") == pytest.approx(1280.0)
    assert f.outcome == outcome


def test_precharge_resistor_lowers_the_inrush():
    # 10 Ω more in series: 1e-3 · 12.8² / (2 · 10.01) = 8.1838e-3 A²s
    text = design(extra='\n[capacitors]\nbulk = "1 mF"\n[protection]\nprecharge_resistance = "10 Ω"\n')
    assert review_text(text).sheet.value("protection.inrush_i2t") == pytest.approx(
        1e-3 * 12.8**2 / (2 * 10.01), rel=1e-9)


@pytest.mark.parametrize("temp,k", [("75 °C", 115.0), ("90 °C", 143.0)])
@pytest.mark.parametrize("factor,outcome", [(1.0, "pass"), (1.001, "fail")])
def test_clearing_i2t_against_the_wire_withstand(temp, k, factor, outcome):
    """12 AWG: k²·S² = 115² · 3.309² = 1.448e5 A²s (PVC), 143² · 3.309² = 2.239e5 A²s (XLPE)."""
    withstand = k**2 * (AREA_12 * 1e6) ** 2
    text = design(temp=temp).replace("[fuse]", f'[fuse]\ni2t_clearing = "{withstand * factor} A²s"')
    f = finding(review_text(text), "protection.wire-withstand")
    assert f.limit == pytest.approx(withstand, rel=1e-9)
    assert (f.outcome, f.severity) == (outcome, "hazard")


@pytest.mark.parametrize("threshold,outcome", [("15.275 A", "pass"), ("15.27 A", "fail")])
def test_overcurrent_threshold_above_the_normal_peak(threshold, outcome):
    # no filter: 108 W at 12 V is 9 A rms, 12.728 A peak; × 1.2 (common practice) = 15.274 A
    f = finding(review_text(design(extra=f'\n[protection]\novercurrent_threshold = "{threshold}"\n')),
                "protection.overcurrent-above-normal")
    assert f.limit == pytest.approx(1.2 * 9 * math.sqrt(2))
    assert f.outcome == outcome


FILTER = '\n[filter]\ninductance = "100 µH"\ninductor_isat = "20 A"\ncapacitance = "10 µF"\n'


@pytest.mark.parametrize("threshold,outcome", [("20 A", "pass"), ("20.1 A", "fail")])
def test_overcurrent_threshold_below_inductor_saturation(threshold, outcome):
    text = design(extra=FILTER + f'\n[protection]\novercurrent_threshold = "{threshold}"\n')
    assert finding(review_text(text), "protection.overcurrent-below-saturation").outcome == outcome


@pytest.mark.parametrize("threshold,outcome", [("19.616 A", "pass"), ("19.62 A", "fail")])
def test_fault_current_at_trip_within_the_pulse_rating(threshold, outcome):
    """Threshold + 12.8 V / 100 µH · (1 µs blanking + 2 µs response) = threshold + 0.384 A,
    against a 20 A pulse rating."""
    text = design(extra=FILTER + f'\n[protection]\novercurrent_threshold = "{threshold}"\n'
                  'overcurrent_response = "2 µs"\novercurrent_blanking = "1 µs"\n').replace(
        'vgs_max = "20 V"', 'vgs_max = "20 V"\nid_pulse = "20 A"')
    r = review_text(text)
    f = finding(r, "protection.overcurrent-below-pulse[high]")
    assert f.value == pytest.approx(float(threshold.split()[0]) + 0.384, rel=1e-9)
    assert (f.outcome, f.severity) == (outcome, "hazard")
    assert r.sheet.value("protection.overcurrent_delay") == pytest.approx(3e-6)


def test_short_circuit_response_counts_the_blanking():
    text = design(extra='\n[protection]\novercurrent_response = "4 µs"\novercurrent_blanking = "1.1 µs"\n'
                  ).replace('vgs_max = "20 V"', 'vgs_max = "20 V"\nsc_withstand = "5 µs"')
    assert finding(review_text(text), "protection.short-circuit-response[high]").outcome == "fail"


def lead(length: float) -> str:
    return design(extra="").replace('[wiring]', f'[wiring]\nlength = "{length} m"')


def test_lead_drop_at_the_end_of_discharge():
    """3 % of 12 V is 0.36 V; at √150 A the out-and-back resistance may be 0.029394 Ω, so a
    12 AWG lead may be 0.029394 · 3.309 mm² / (2 · 1/58 Ω·mm²/m) = 2.8208 m long."""
    limit = 0.36 / math.sqrt(150) * AREA_12 / (2 * RHO)
    assert limit == pytest.approx(2.8208, rel=1e-3)
    assert finding(review_text(lead(limit * 0.9999)), "protection.lead-drop").outcome == "pass"
    assert finding(review_text(lead(limit * 1.001)), "protection.lead-drop").outcome == "fail"


@pytest.mark.parametrize("speed,multiple", [("fast", 5.0), ("slow", 10.0)])
def test_far_end_fault_against_the_fuse_speed(speed, multiple):
    """A 15 A fuse; a short at the far end draws 12 V / (10 mΩ + R_lead). It must reach 5× (fast)
    or 10× (time-delay) the rating (typical curves, from memory): R_lead ≤ 12/(75 A) − 0.01 =
    0.15 Ω (fast) or 12/150 − 0.01 = 0.07 Ω (slow)."""
    r_max = 12 / (multiple * 15) - 0.01
    length = r_max * AREA_12 / (2 * RHO)
    for factor, outcome in ((0.999, "pass"), (1.001, "fail")):
        text = lead(length * factor).replace("[fuse]", f'[fuse]\nspeed = "{speed}"')
        assert finding(review_text(text), "protection.far-fault-clears").outcome == outcome


@pytest.mark.parametrize("ambient,rating,outcome", [
    ("30 °C", "50 A", "pass"),    # 8 AWG, 75 °C column: 50 A (Table 310.16)
    ("45 °C", "41 A", "pass"),    # × 0.82 (Table 310.15(B)(1)(1), from memory) = 41 A
    ("45 °C", "41.1 A", "fail"),
])
def test_wire_ampacity_corrected_for_the_ambient(ambient, rating, outcome):
    text = design(rating=rating, wire="8 AWG") + f'\n[environment]\nambient = "{ambient}"\n'
    f = finding(review_text(text.replace("[fuse]", '[fuse]\nambient_factor = "1"')),
                "protection.wire-protected")
    assert f.outcome == outcome
