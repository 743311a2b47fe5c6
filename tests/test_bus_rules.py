"""The §3.7 bus rules end to end: thresholds, the ripple figures and the mitigation values.

Check values: hand calculations written out (I_2f = I_dc/√2 for a resistive load, Mohan,
Undeland & Robbins 2003 ch. 8; capacitor reactance; Q = C·ΔV), and the 80 % electrolytic
derating (common practice)."""

from __future__ import annotations

import math

import pytest

from reviewer.review import review_file
from tests.conftest import assert_fails, example, finding, review_text
from tests.design.test_loader import MINIMAL

CAPS = '\n[capacitors]\nbulk = "10 mF"\nvoltage_rating = "{vr}"\nripple_rating = "{rr}"\n'


def design(vr: str = "25 V", rr: str = "10 A", kind: str = "battery", v_max: str = "14.8 V") -> str:
    # 108 W into a resistive load at 90 % from 12 V: I_dc = 108 / (0.9 · 12) = 10 A (square wave).
    text = MINIMAL.replace('v_nom = "12 V"', f'kind = "{kind}"\nv_nom = "12 V"\nv_min = "12 V"\n'
                           f'v_max = "{v_max}"\nripple = 0.0')
    text = text.replace('frequency = "50 Hz"', 'frequency = "50 Hz"\nv_rms = "12 V"')
    text += '\n[load]\nkind = "resistive"\npower = "108 W"\nefficiency = "90 %"\n'
    return text + CAPS.format(vr=vr, rr=rr)


def test_ripple_current_is_i_dc_over_root_two_for_a_resistive_load():
    # I_2f = 10 / √2 = 7.0711 A; a square wave switches at the output frequency: no carrier part.
    r = review_text(design())
    assert r.sheet.value("bus.ripple_2f") == pytest.approx(10 / math.sqrt(2))
    assert r.sheet.value("bus.ripple_switching") == 0.0
    assert finding(r, "bus.ripple-rating").outcome == "pass"


@pytest.mark.parametrize("rating,outcome", [("7.072 A", "pass"), ("7.07 A", "fail")])
def test_ripple_rating_threshold(rating, outcome):
    f = finding(review_text(design(rr=rating)), "bus.ripple-rating")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(7.0711, rel=1e-4)


@pytest.mark.parametrize("rating,outcome", [("14.8 V", "pass"), ("14.7 V", "fail")])
def test_capacitor_voltage_threshold(rating, outcome):
    f = finding(review_text(design(vr=rating)), "bus.cap-voltage")
    assert (f.outcome, f.severity) == (outcome, "hazard")


@pytest.mark.parametrize("rating,outcome", [("18.5 V", "pass"), ("18.4 V", "fail")])
def test_capacitor_derating_threshold(rating, outcome):
    # 14.8 V / 0.8 = 18.5 V (common practice for electrolytics)
    f = finding(review_text(design(vr=rating)), "bus.cap-derating")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(18.5)


def test_capacitor_derating_does_not_apply_to_film():
    text = design(vr="15 V").replace('ripple_rating = "10 A"', 'ripple_rating = "10 A"\nkind = "film"')
    assert finding(review_text(text), "bus.cap-derating").outcome == "not_applicable"


def test_voltage_ripple_where_the_source_cannot_supply_it():
    # ΔV_rms = 7.0711 A · 1/(2π · 100 Hz · 10 mF) = 7.0711 · 0.159155 = 1.12540 V;
    # peak to peak 2√2 · 1.12540 = 3.18310 V, beyond 5 % of 12 V = 0.6 V.
    r = review_text(design(kind="rectified_mains"))
    f = finding(r, "bus.voltage-ripple")
    assert f.value == pytest.approx(3.18310, rel=1e-4)
    assert f.limit == pytest.approx(0.6)
    assert f.outcome == "fail"
    # the capacitance that passes: 10 mF · 3.18310 / 0.6 = 53.05 mF
    assert f.pass_solved == pytest.approx(53.052e-3, rel=1e-4)
    passed = review_text(design(kind="rectified_mains").replace('bulk = "10 mF"', 'bulk = "53.06 mF"'))
    assert finding(passed, "bus.voltage-ripple").outcome == "pass"
    # a battery supplies the pulsing current itself: not judged
    assert finding(review_text(design()), "bus.voltage-ripple").outcome == "not_applicable"


def _careful(local: str) -> str:
    return example("careful_12v_sine").read_text(encoding="utf-8").replace(
        'local = "10 µF"', f'local = "{local}"')


def test_local_capacitance_threshold():
    r = review_text(_careful("10 µF"))
    f = finding(r, "bus.local-capacitance")
    # ΔV = I_peak · t_edge / C (Q = C·ΔV), at the worst corner
    i_pk = r.sheet.get("op.load_current_peak")
    t = r.sheet.get("bus.edge_time")
    assert f.value <= i_pk.hi * t.hi / 10e-6 * (1 + 1e-9)
    # shrink the capacitor until the dip just exceeds 5 % of the lowest bus (10.5 V: 0.525 V)
    c_edge = 10e-6 * f.value / 0.525
    assert finding(review_text(_careful(f"{c_edge * 1.001:.6g}")), "bus.local-capacitance").outcome == "pass"
    low = finding(review_text(_careful(f"{c_edge * 0.99:.6g}")), "bus.local-capacitance")
    assert low.outcome == "fail"
    assert low.pass_solved == pytest.approx(c_edge, rel=1e-6)


@pytest.mark.parametrize("name,expected", [
    ("careful_12v_sine", set()),
    ("mains_output_transformer", {"bus.ripple-rating"}),
    ("naive_bench_pchannel", set()),
    ("nchannel_bootstrap_quasi", set()),
])
def test_examples_bus(name, expected):
    assert_fails(review_file(example(name)), expected, area="bus")
