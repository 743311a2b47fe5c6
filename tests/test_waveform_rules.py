"""The §3.9 waveform and filter rules end to end: each threshold, mitigation values, examples.

Thresholds: THD target from the design (EN 50160 / IEC 62040-3 default 8 %); 5 % single
harmonic (IEEE 519-2014 Table 1); corner ≥ 10 × f_out and ≤ first carrier group / 10, 20 kHz
audible limit (common practice); I_sat ≥ peak current; capacitor rating ≥ peak; output within
its tolerance; linear range M ≤ 1 (Holmes & Lipo 2003, ch. 3). Values at a threshold are taken
from the review itself and written back as the limit, so "exactly at the limit passes" is
tested on the real computation.
"""

from __future__ import annotations

import math
from pathlib import Path

import pytest

from tests.conftest import ROOT, describe, example

BASE = """\
[design]
title = "waveform test"

[source]
v_nom = "{bus}"
v_min = "{bus_min}"
v_max = "{bus_max}"

[output]
frequency = "50 Hz"
v_rms = "{v_rms}"
v_tolerance = "{tol}"
thd_target = "{thd}"

[load]
kind = "resistive"
resistance = "{r_load}"

[modulation]
kind = "{kind}"
index = {index}
carrier = "{carrier}"
regulated = {regulated}

[timing]
dead_time = "{dead}"

[filter]
inductance = "{l}"
capacitance = "{c}"
inductor_isat = "{isat}"
capacitor_voltage = "{cap_v}"
inductor_dcr = "{dcr}"

[switch.high]
vds_rating = "60 V"
vgs_max = "20 V"

[switch.low]
vds_rating = "60 V"
vgs_max = "20 V"

[drive.high]
kind = "driver_ic"
on_level = "12 V"
off_level = "0 V"

[drive.low]
kind = "driver_ic"
on_level = "12 V"
off_level = "0 V"
"""

DEFAULTS = dict(bus="24 V", bus_min="24 V", bus_max="24 V", v_rms="12 V", tol="10 %",
                thd="8 %", r_load="10 Ω", kind="spwm_unipolar", index="0.8",
                carrier="20 kHz", regulated="false", dead="0 s", l="1 mH", c="10 µF",
                isat="10 A", cap_v="100 V", dcr="50 mΩ")


def design(**kw: str) -> str:
    return BASE.format(**{**DEFAULTS, **kw})


def book(**params: dict[str, float | str]):
    """The waveform rules alone (the engine judges each rule on its own), params overridable."""
    from reviewer.rulebook.loader import Rulebook, compile_rule, read_rule_file

    b = Rulebook()
    for rule, _line in read_rule_file(ROOT / "rules" / "waveform.toml"):
        if rule.id in params:
            rule = rule.model_copy(update={"params": {**rule.params, **params[rule.id]}})
        b.rules.append(rule)
    for rule in b.rules:
        b.compiled.extend(compile_rule(rule))
    return b


def review(text: str, **params):
    from reviewer.design import parse_design
    from reviewer.review import review_design

    return review_design(parse_design(text, "<test>"), "<test>", book(**params))


def get(r, key: str):
    for f in r.findings:
        if f.key == key:
            return f
    pytest.fail(f"no finding {key!r}:\n{describe(r)}")


def fails(r) -> set[str]:
    return {f.key for f in r.findings if f.outcome == "fail" and f.area == "waveform"}


# --- thresholds --------------------------------------------------------------------------------

def test_thd_threshold_and_its_mitigation():
    # 2 kHz bipolar carrier into a 1.59 kHz filter: far too close (common practice wants 10×)
    text = design(kind="spwm_bipolar", carrier="2 kHz")
    f = get(review(text), "waveform.thd")
    assert f.outcome == "fail" and f.value > 0.08
    thd = f.value
    assert get(review(design(kind="spwm_bipolar", carrier="2 kHz", thd=repr(thd))),
               "waveform.thd").outcome == "pass"
    assert get(review(design(kind="spwm_bipolar", carrier="2 kHz", thd=repr(thd * 0.999))),
               "waveform.thd").outcome == "fail"
    # the pass value is an inductance with the same √(L/C): L/C = 1 mH / 10 µF = 100 Ω²
    l_new = f.pass_solved
    c_new = l_new / 100.0
    fixed = review(design(kind="spwm_bipolar", carrier="2 kHz", l=repr(l_new), c=repr(c_new)))
    # the solve leaves out the 50 mΩ winding resistance and components below 10⁻⁵ of the
    # fundamental, so the re-review lands within 1 % of the target
    assert get(fixed, "waveform.thd").value == pytest.approx(0.08, rel=1e-2)


def test_thd_no_load_threshold():
    r = review(design())
    v = get(r, "waveform.thd-no-load").value
    assert get(review(design(thd=repr(v))), "waveform.thd-no-load").outcome == "pass"
    assert get(review(design(thd=repr(v * 0.999))), "waveform.thd-no-load").outcome == "fail"


def test_single_harmonic_threshold_and_scope():
    text = design(kind="spwm_bipolar", carrier="2 kHz")
    v = get(review(text), "waveform.single-harmonic").value
    p = {"waveform.single-harmonic": {"limit_single": v}}
    assert get(review(text, **p), "waveform.single-harmonic").outcome == "pass"
    p = {"waveform.single-harmonic": {"limit_single": v * 0.999}}
    assert get(review(text, **p), "waveform.single-harmonic").outcome == "fail"
    # a design that asks only for a stepped wave (target above 8 %) is not judged by it
    assert get(review(design(thd="30 %")), "waveform.single-harmonic").outcome == "not_applicable"


@pytest.mark.parametrize("l_factor, outcome", [(1.0, "pass"), (1.01, "fail")])
def test_corner_at_ten_times_the_output(l_factor, outcome):
    # f₀ = 1/(2π√(LC)) = 500 Hz = 10 × 50 Hz with C = 10 µF: L = 1/((2π·500)²·10 µF) = 10.13 mH
    l_ = 1 / ((2 * math.pi * 500) ** 2 * 10e-6) * l_factor
    f = get(review(design(l=repr(l_))), "waveform.corner-above-output")
    assert f.outcome == outcome
    if outcome == "fail":
        # same capacitor, corner back at 500 Hz: L·(ratio/10)² = the 10.13 mH again
        assert f.pass_solved == pytest.approx(l_ / l_factor, rel=1e-9)


@pytest.mark.parametrize("kind, carrier, outcome", [
    ("spwm_unipolar", "20 kHz", "pass"),    # first group at 2 × 20 kHz = 40 kHz = 10 × 4 kHz
    ("spwm_unipolar", "19.9 kHz", "fail"),
    ("spwm_bipolar", "40 kHz", "pass"),     # first group at the carrier
    ("spwm_bipolar", "39.9 kHz", "fail"),
])
def test_corner_a_decade_below_the_first_carrier_group(kind, carrier, outcome):
    l_ = 1 / ((2 * math.pi * 4000) ** 2 * 10e-6)  # corner 4 kHz with 10 µF
    f = get(review(design(kind=kind, carrier=carrier, l=repr(l_))), "waveform.corner-below-carrier")
    assert f.outcome == outcome


def test_inductor_saturation_threshold():
    r = review(design())
    peak = get(r, "waveform.inductor-saturation").value
    # hand check of the order of magnitude: √2·(24·0.8/√2)/10 Ω ≈ 1.9 A fundamental plus half
    # the unipolar ripple V/(8·L·f_c) = 24/(8·1 mH·20 kHz) = 0.15 A (Erickson ch. 2)
    assert 1.9 < peak < 1.9 * 1.1 + 0.15
    assert get(review(design(isat=repr(peak))), "waveform.inductor-saturation").outcome == "pass"
    f = get(review(design(isat=repr(peak * 0.99))), "waveform.inductor-saturation")
    assert f.outcome == "fail" and f.pass_solved == pytest.approx(peak)


def test_capacitor_voltage_threshold():
    v = get(review(design()), "waveform.capacitor-voltage").value
    assert get(review(design(cap_v=repr(v))), "waveform.capacitor-voltage").outcome == "pass"
    assert get(review(design(cap_v=repr(v * 0.99))), "waveform.capacitor-voltage").outcome == "fail"


def test_open_loop_output_thresholds():
    # bus 20 … 28 V around 24 V: the output follows the bus (Holmes & Lipo ch. 3)
    text = design(bus_min="20 V", bus_max="28 V")
    r = review(text)
    lo = get(r, "waveform.output-low").value
    hi = get(r, "waveform.output-high").value
    assert hi / lo == pytest.approx(28 / 20)
    # the tolerance that puts each exactly at its limit, then a hair tighter
    tol_lo = 1 - lo / 12.0
    tol_hi = hi / 12.0 - 1
    assert get(review(design(bus_min="20 V", bus_max="28 V", tol=repr(tol_lo))),
               "waveform.output-low").outcome == "pass"
    assert get(review(design(bus_min="20 V", bus_max="28 V", tol=repr(tol_lo * 0.99))),
               "waveform.output-low").outcome == "fail"
    assert get(review(design(bus_min="20 V", bus_max="28 V", tol=repr(tol_hi))),
               "waveform.output-high").outcome == "pass"
    assert get(review(design(bus_min="20 V", bus_max="28 V", tol=repr(tol_hi * 0.99))),
               "waveform.output-high").outcome == "fail"
    # a regulated design is not judged open loop
    reg = review(design(bus_min="20 V", bus_max="28 V", regulated="true"))
    assert get(reg, "waveform.output-low").outcome == "not_applicable"


def test_regulation_headroom_threshold():
    # 12 V rms at a 16 V bus needs M ≈ √2·12/16 = 1.06 before losses (Holmes & Lipo ch. 3)
    text = design(bus_min="16 V", regulated="true")
    f = get(review(text), "waveform.regulation-headroom")
    assert f.outcome == "fail" and f.value > math.sqrt(2) * 12 / 16
    p = {"waveform.regulation-headroom": {"index_max": f.value}}
    assert get(review(text, **p), "waveform.regulation-headroom").outcome == "pass"
    assert get(review(design(bus_min="20 V", regulated="true")),
               "waveform.regulation-headroom").outcome == "pass"


@pytest.mark.parametrize("index, outcome", [("1.0", "pass"), ("1.01", "fail")])
def test_overmodulation_threshold(index, outcome):
    assert get(review(design(index=index)), "waveform.overmodulation").outcome == outcome


@pytest.mark.parametrize("kind, carrier, outcome", [
    ("spwm_unipolar", "10 kHz", "pass"),    # ripple at 2 × 10 kHz = 20 kHz
    ("spwm_unipolar", "9.9 kHz", "fail"),
    ("spwm_bipolar", "20 kHz", "pass"),
    ("spwm_bipolar", "19.9 kHz", "fail"),
])
def test_audible_threshold(kind, carrier, outcome):
    l_ = "100 µH"  # keep the corner far below the carrier so only the audible rule matters
    f = get(review(design(kind=kind, carrier=carrier, l=l_)), "waveform.audible")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(10e3 if kind == "spwm_unipolar" else 20e3)


def test_square_wave_rules_that_do_not_apply():
    text = design(kind="square").replace('index = 0.8\ncarrier = "20 kHz"\n', "")
    r = review(text)
    for rid in ("waveform.overmodulation", "waveform.audible", "waveform.corner-above-output",
                "waveform.corner-below-carrier", "waveform.regulation-headroom"):
        assert get(r, rid).outcome == "not_applicable", rid
    # an unfiltered square wave: 48.3 % THD (Fourier series, Mohan et al. 2003 ch. 8)
    nof = text.replace('inductance = "1 mH"\ncapacitance = "10 µF"\n', "")
    assert get(review(nof), "waveform.thd").value == pytest.approx(
        math.sqrt(math.pi ** 2 / 8 - 1), rel=1e-4)


def test_load_current_from_harmonics_for_an_r_l_load():
    # unfiltered square wave into R-L (4 Ω, 5 mH at 50 Hz): the published RMS current is the
    # harmonic sum, larger than the fundamental alone, (4V/π)/√2/|R + jωL| (Mohan ch. 8)
    from reviewer.design import parse_design
    from reviewer.quantities import compute

    text = design(kind="square", v_rms="21.6 V").replace('index = 0.8\ncarrier = "20 kHz"\n', "")
    text = text.replace('inductance = "1 mH"\ncapacitance = "10 µF"\n', "")
    text = text.replace('kind = "resistive"\nresistance = "10 Ω"',
                        'kind = "r_l"\nresistance = "4 Ω"\ninductance = "5 mH"')
    sheet = compute(parse_design(text, "<t>"))
    i1 = 4 * 24 / math.pi / math.sqrt(2) / abs(complex(4, 2 * math.pi * 50 * 5e-3))
    i = sheet.value("waveform.load_current_rms")
    v1 = sheet.value("waveform.output_fundamental")
    # scaled to the 21.6 V target: the fundamental ratio 21.6 / V₁
    assert i > i1 * 21.6 / v1
    assert i < 1.05 * i1 * 21.6 / v1
    assert "waveform.spectrum" in sheet.series
    s = sheet.series["waveform.spectrum"]
    assert len(s["frequency"]) == len(s["bridge"]) == len(s["output"]) > 10


# --- the example designs -----------------------------------------------------------------------

EXPECTED = {
    "careful_12v_sine": {"waveform.thd-no-load", "waveform.regulation-headroom"},
    "mains_output_transformer": {"waveform.corner-below-carrier", "waveform.regulation-headroom"},
    "naive_bench_pchannel": {"waveform.thd", "waveform.thd-no-load", "waveform.single-harmonic",
                             "waveform.corner-below-carrier", "waveform.inductor-saturation",
                             "waveform.capacitor-voltage",
                             "waveform.audible"},
    "nchannel_bootstrap_quasi": {"waveform.output-high"},
}


@pytest.mark.parametrize("name", sorted(EXPECTED))
def test_example_designs_waveform_findings(name):
    r = review(Path(example(name)).read_text())
    got = fails(r)
    if got != EXPECTED[name]:
        pytest.fail(f"{name}: missing {sorted(EXPECTED[name] - got)}, unexpected "
                    f"{sorted(got - EXPECTED[name])}\n{describe(r)}")
