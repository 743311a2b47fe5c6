"""The §3.8 protection rules end to end, at each threshold.

Check values: hand calculations (I_in = P/(η·V); the supply lead's RMS √(I_dc² + I_2f²) with
I_2f = I_dc/√2 for a resistive load, Mohan, Undeland & Robbins 2003 ch. 8, all of it in the lead when
no bulk capacitance shares it; the fuse limits of reviewer/tables/fuse_loading.toml,
V/R for the prospective current), NEC 2023 Table 310.16 and 240.4(D) (checked against secondary
reprints), ABYC E-11's 178 mm (7 in)."""

from __future__ import annotations

import pytest

from reviewer.review import review_file
from tests.conftest import assert_fails, example, finding, review_text
from tests.design.test_loader import MINIMAL

FUSE = """
[fuse]
rating = "{rating}"
voltage = "{voltage}"
dc_rated = {dc}
breaking = "{breaking}"
standard = "{standard}"
distance = "{distance}"
"""


def design(rating="15 A", voltage="32 V", dc="true", breaking="2 kA", standard="automotive",
           distance="0.1 m", wire="12 AWG", temp="75 °C", kind="battery", extra="", fuse=True):
    # 108 W at 90 % from a 12 V minimum: I_in = 108 / (0.9 · 12) = 10 A; 12.8 V / 10 mΩ = 1280 A.
    # No bulk capacitors: the lead carries I_rms = √(10² + (10/√2)²) = √150 = 12.247 A.
    text = MINIMAL.replace('v_nom = "12 V"', f'kind = "{kind}"\nv_nom = "12 V"\nv_min = "12 V"\n'
                           'v_max = "12.8 V"\nr_internal = "10 mΩ"')
    text = text.replace('frequency = "50 Hz"', 'frequency = "50 Hz"\nv_rms = "12 V"')
    text += '\n[load]\nkind = "resistive"\npower = "108 W"\nefficiency = "90 %"\n'
    if fuse:
        text += FUSE.format(rating=rating, voltage=voltage, dc=dc, breaking=breaking,
                            standard=standard, distance=distance)
    text += f'\n[wiring]\nsize = "{wire}"\ninsulation_temp = "{temp}"\n'
    return text + extra


def test_no_fuse_is_a_hazard_and_the_fuse_rules_do_not_apply():
    r = review_text(design(fuse=False))
    f = finding(r, "protection.fuse-present")
    assert (f.outcome, f.severity) == ("fail", "hazard")
    # the window it proposes: ≥ 12.247 / 0.75 = 16.33 A (no standard: strictest), ≤ 20 A (12 AWG)
    assert "16.3 A" in f.mitigation and "20 A" in f.mitigation
    for rid in ("protection.fuse-loading", "protection.wire-protected",
                "protection.breaking-capacity", "protection.fuse-voltage"):
        assert finding(r, rid).outcome == "not_applicable"


I_RMS = 150 ** 0.5


@pytest.mark.parametrize("standard,at_limit", [("automotive", I_RMS / 0.8 * 1.00001),
                                               ("ul248", I_RMS / 0.75 * 1.00001),
                                               ("iec60127", I_RMS * 1.00001)])
def test_fuse_loading_threshold_by_standard(standard, at_limit):
    # 12.247 A RMS at 80 % (automotive), 75 % (UL 248), 100 % (IEC 60127), 25 °C ambient
    ok = finding(review_text(design(rating=f"{at_limit} A", standard=standard)),
                 "protection.fuse-loading")
    assert ok.outcome == "pass"
    bad = finding(review_text(design(rating=f"{at_limit * 0.99} A", standard=standard)),
                  "protection.fuse-loading")
    assert bad.outcome == "fail"
    assert bad.pass_solved == pytest.approx(I_RMS / {"automotive": 0.8, "ul248": 0.75,
                                                    "iec60127": 1.0}[standard])


@pytest.mark.parametrize("wire,temp,rating,outcome", [
    ("12 AWG", "75 °C", "20 A", "pass"),   # 240.4(D): 12 AWG up to 20 A
    ("12 AWG", "90 °C", "25 A", "fail"),   # though its 90 °C ampacity is 30 A
    ("10 AWG", "75 °C", "30 A", "pass"),
    ("8 AWG", "75 °C", "50 A", "pass"),    # Table 310.16, 75 °C
    ("8 AWG", "60 °C", "50 A", "fail"),    # 40 A at 60 °C
    ("4 mm²", "75 °C", "20 A", "pass"),    # rated as the next smaller size, 12 AWG, with its limits
    ("4 mm²", "75 °C", "25 A", "fail"),
])
def test_wire_protected_threshold(wire, temp, rating, outcome):
    f = finding(review_text(design(rating=rating, wire=wire, temp=temp)), "protection.wire-protected")
    assert (f.outcome, f.severity) == (outcome, "hazard")


def test_wire_protected_mitigation_names_the_wire():
    f = finding(review_text(design(rating="25 A", wire="12 AWG")), "protection.wire-protected")
    assert f.pass_solved == pytest.approx(20.0)
    assert "10 AWG" in f.mitigation  # 25 A needs 10 AWG (30 A by 240.4(D))


@pytest.mark.parametrize("wire,rating,outcome", [
    ("18 AWG", "7 A", "pass"), ("18 AWG", "7.1 A", "fail"),     # NEC 240.4(D)(1): 7 A
    ("16 AWG", "10 A", "pass"), ("16 AWG", "10.1 A", "fail"),   # NEC 240.4(D)(2): 10 A
])
def test_small_conductors_by_240_4_d(wire, rating, outcome):
    # NFPA 70 240.4(D)(1)/(2), from memory: 18 AWG at most 7 A, 16 AWG at most 10 A
    r = review_text(design(rating=rating, wire=wire))
    assert finding(r, "protection.wire-protected").outcome == outcome
    assert "240.4(D)" in r.sheet.value("protection.wire_table")


@pytest.mark.parametrize("power,outcome", [("70.544 W", "pass"), ("70.6 W", "fail")])
def test_small_conductor_continuous_condition(power, outcome):
    """240.4(D)(2): 16 AWG only with a continuous load of at most 8 A (from memory).

    By hand: I_dc = P / (0.9 · 12 V), I_rms = √1.5 · I_dc (no bulk capacitors), so the 8 A
    condition holds up to P = 8 · 10.8 / √1.5 = 70.544 W."""
    text = design(rating="10 A", wire="16 AWG").replace('power = "108 W"', f'power = "{power}"')
    f = finding(review_text(text), "protection.small-conductor-load")
    i_rms = 1.5 ** 0.5 * float(power.split()[0]) / 10.8
    assert f.value == pytest.approx(i_rms, rel=1e-6)
    assert f.limit == pytest.approx(8.0)
    assert (f.outcome, f.severity) == (outcome, "hazard")


def test_wire_below_the_tables_is_outside_them_never_zero():
    # 20 AWG: neither Table 310.16 nor 240.4(D) rates it: the finding needs data, never "0 A"
    r = review_text(design(rating="5 A", wire="20 AWG"))
    f = finding(r, "protection.wire-protected")
    assert f.outcome == "needs_data" and "wiring.size" in f.needs
    assert r.sheet.get("protection.wire_max_fuse") is None
    assert "outside the table" in r.sheet.value("protection.wire_table")


@pytest.mark.parametrize("breaking,outcome", [("1280 A", "pass"), ("1 kA", "fail")])
def test_breaking_capacity_against_battery_fault_current(breaking, outcome):
    # 12.8 V / 10 mΩ = 1280 A (Ohm's law)
    f = finding(review_text(design(breaking=breaking)), "protection.breaking-capacity")
    assert f.limit == pytest.approx(1280.0)
    assert f.outcome == outcome


@pytest.mark.parametrize("voltage,outcome", [("12.8 V", "pass"), ("12 V", "fail")])
def test_fuse_voltage_threshold(voltage, outcome):
    assert finding(review_text(design(voltage=voltage)), "protection.fuse-voltage").outcome == outcome


def test_fuse_dc_rating_on_a_battery():
    assert finding(review_text(design(dc="false")), "protection.fuse-dc").outcome == "fail"
    assert finding(review_text(design(dc="true")), "protection.fuse-dc").outcome == "pass"
    assert finding(review_text(design(dc="false", kind="bench_supply")),
                   "protection.fuse-dc").outcome == "not_applicable"


@pytest.mark.parametrize("distance,outcome", [("178 mm", "pass"), ("179 mm", "fail")])
def test_fuse_distance_threshold(distance, outcome):
    # ABYC E-11: within 7 in (178 mm) of the battery
    assert finding(review_text(design(distance=distance)), "protection.fuse-distance").outcome == outcome


@pytest.mark.parametrize("kind,outcome", [("none", "fail"), ("fuse_only", "pass"),
                                          ("p_mosfet", "pass")])
def test_reverse_polarity(kind, outcome):
    extra = f'\n[protection]\nreverse_polarity = "{kind}"\n'
    assert finding(review_text(design(extra=extra)), "protection.reverse-polarity").outcome == outcome


@pytest.mark.parametrize("response,outcome", [("5 µs", "pass"), ("5.1 µs", "fail")])
def test_short_circuit_response_threshold(response, outcome):
    text = design(extra=f'\n[protection]\novercurrent_response = "{response}"\n').replace(
        'vgs_max = "20 V"', 'vgs_max = "20 V"\nsc_withstand = "5 µs"')
    f = finding(review_text(text), "protection.short-circuit-response[high]")
    assert (f.outcome, f.severity) == (outcome, "hazard")


@pytest.mark.parametrize("standoff,clamp,ok_standoff,ok_clamp", [
    ("12.8 V", "40 V", "pass", "pass"),   # standoff at the highest bus, clamp at the 40 V rating
    ("12 V", "41 V", "fail", "fail"),
])
def test_tvs_window(standoff, clamp, ok_standoff, ok_clamp):
    r = review_text(design(extra=f'\n[protection]\ntvs_standoff = "{standoff}"\ntvs_clamp = "{clamp}"\n'))
    assert finding(r, "protection.tvs-standoff").outcome == ok_standoff
    assert finding(r, "protection.tvs-clamp[low]").outcome == ok_clamp
    assert finding(r, "protection.bus-clamp").outcome == "pass"


def test_no_clamp_is_advice_and_the_tvs_rules_do_not_apply():
    r = review_text(design())
    assert finding(r, "protection.bus-clamp").outcome == "fail"
    assert finding(r, "protection.tvs-standoff").outcome == "not_applicable"


def test_battery_uvlo():
    assert finding(review_text(design()), "protection.battery-uvlo").outcome == "fail"
    r = review_text(design(extra='\n[protection]\nbattery_uvlo = "10.5 V"\n'))
    assert finding(r, "protection.battery-uvlo").outcome == "pass"


@pytest.mark.parametrize("name,expected", [
    ("careful_12v_sine", set()),
    # 21.3 A RMS in the lead (16.8 A mean and 98 % of the 13.2 A 2·f ripple) on a 25 A UL 248
    # fuse at 40 °C: 0.851 against 0.75 × 0.95 = 0.7125; a 45 A trip above the 40 A inductor
    ("mains_output_transformer", {"protection.fuse-loading",
                                  "protection.overcurrent-below-saturation"}),
    ("naive_bench_pchannel", {"protection.fuse-present", "protection.bus-clamp"}),
    ("nchannel_bootstrap_quasi", {"protection.breaking-capacity", "protection.bus-clamp"}),
])
def test_examples_protection(name, expected):
    assert_fails(review_file(example(name)), expected, area="protection")


def test_quasi_square_example_breaking_capacity_numbers():
    # 29.2 V / 15 mΩ = 1946.7 A against a 1 kA fuse (Ohm's law)
    f = finding(review_file(example("nchannel_bootstrap_quasi")), "protection.breaking-capacity")
    assert f.limit == pytest.approx(1946.67, rel=1e-4) and f.value == pytest.approx(1000.0)
