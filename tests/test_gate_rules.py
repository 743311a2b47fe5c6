"""The §3.3 gate-drive rules end to end: thresholds, mitigation values, the example designs.

Hand calculations name their source; rule-of-thumb limits are common practice (on-drive at the
R_DS(on) test level and at twice V_th,max; a 10 kΩ hold-off resistor; a resistor at no more than
half its rating). The threshold temperature coefficient, −5 mV/°C, is from memory.
"""

import pytest

from tests.bridge_base import bridge
from tests.conftest import assert_fails, example, finding, review_text


def review_file(name):
    from reviewer.design import load_design
    from reviewer.review import review_design
    from reviewer.rulebook import load_rulebook

    return review_design(load_design(example(name)), name, load_rulebook())


def test_clean_bridge_passes_every_gate_rule():
    assert_fails(review_text(bridge()), set(), area="gate")


@pytest.mark.parametrize("on, outcome", [('"10 V"', "pass"), ('"9.9 V"', "fail")])
def test_on_drive_at_the_rds_on_test_level(on, outcome):
    f = finding(review_text(bridge(("drive.low", "on_level", on))), "gate.vgs-on-spec[low]")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(10.0) and f.severity == "risk"


@pytest.mark.parametrize("on, outcome", [('"10 V"', "pass"), ('"9.9 V"', "fail")])
def test_on_drive_twice_the_highest_threshold(on, outcome):
    # V_th max 5 V: 2 × 5 V = 10 V (common practice); R_DS(on) specified at 4.5 V.
    text = bridge(("switch.low", "vth", '{ min = "3 V", typ = "4 V", max = "5 V" }'),
                  ("switch.low", "rds_on_vgs", '"4.5 V"'), ("drive.low", "on_level", on))
    f = finding(review_text(text), "gate.vgs-on-threshold[low]")
    assert f.outcome == outcome and f.limit == pytest.approx(10.0)


def test_n_channel_high_side_with_ground_referenced_drive_is_starved():
    # Gate node at 12 V from ground, source at the 12 V bus when on: V_GS = 12 − 12 = 0 V (KVL).
    text = bridge(("drive.high", "levels_from", '"ground"'))
    f = finding(review_text(text), "gate.vgs-on-spec[high]")
    assert f.outcome == "fail" and f.value == pytest.approx(0.0)


@pytest.mark.parametrize("off, outcome", [('"1.1875 V"', "pass"), ('"1.2 V"', "fail")])
def test_off_level_against_hot_threshold(off, outcome):
    # 0.5 × (3 V − 0.005 V/°C × (150 − 25) °C) = 0.5 × 2.375 V = 1.1875 V.
    f = finding(review_text(bridge(("drive.low", "off_level", off))), "gate.vgs-off[low]")
    assert f.outcome == outcome and f.limit == pytest.approx(1.1875)


def test_pull_resistor_missing_or_on_the_wrong_rail():
    r = review_text(bridge(("drive.low", "pull_resistor", None)))
    assert finding(r, "gate.pull-resistor[low]").outcome == "fail"
    # An N-channel high side's source is the switching node: ground is not its source.
    r = review_text(bridge(("drive.high", "pull_to", '"ground"')))
    assert finding(r, "gate.pull-resistor[high]").outcome == "fail"
    # A P-channel high side's source is the bus: pulled to the bus is right.
    r = review_text(bridge(("switch.high", "polarity", '"p"'), ("drive.high", "pull_to", '"bus"')))
    assert finding(r, "gate.pull-resistor[high]").outcome == "pass"


@pytest.mark.parametrize("r, outcome", [('"2880 Ω"', "pass"), ('"2870 Ω"', "fail")])
def test_pull_resistor_power_threshold(r, outcome):
    # V²/R = 12²/2880 = 50 mW = 50 % of the assumed 0.1 W rating (Joule's law).
    f = finding(review_text(bridge(("drive.low", "pull_resistor", r))), "gate.pull-power[low]")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(2880.0)


@pytest.mark.parametrize("carrier, outcome", [('"5 kHz"', "pass"), ('"5.1 kHz"', "fail")])
def test_controller_pin_edge_threshold(carrier, outcome):
    # Q_g / I = 40 nC / 20 mA = 2 µs; 1 % of a 5 kHz period is 2 µs (t = Q/I).
    text = bridge(("drive.low", "kind", '"controller_pin"'), ("drive.low", "source_current", '"20 mA"'),
                  ("modulation", "carrier", carrier))
    f = finding(review_text(text), "gate.pin-drive[low]")
    assert f.outcome == outcome and f.value == pytest.approx(2e-6)
    if outcome == "fail":
        # 20 mA × 2 µs / (0.01 / 5.1 kHz) = 20.4 mA
        assert f.pass_solved == pytest.approx(20e-3 * 2e-6 / (0.01 / 5.1e3))


def test_paralleled_devices_need_their_own_gate_resistors():
    shared = bridge(("switch.low", "count", "2"), ("switch.low", "own_gate_resistor", "false"))
    assert finding(review_text(shared), "gate.parallel-gate-resistor[low]").outcome == "fail"
    own = bridge(("switch.low", "count", "2"))
    assert finding(review_text(own), "gate.parallel-gate-resistor[low]").outcome == "pass"


@pytest.mark.parametrize("name, expected", [
    ("naive_bench_pchannel", {"gate.pull-power[high]"}),
    ("nchannel_bootstrap_quasi", set()),
    ("careful_12v_sine", set()),
    ("mains_output_transformer", set()),
])
def test_example_designs(name, expected):
    r = review_file(name)
    assert_fails(r, expected, area="gate")


def test_naive_p_channel_pull_resistor_power():
    # 25 V across 10 kΩ = 62.5 mW, over 50 % of 0.1 W; 25²/0.05 = 12.5 kΩ passes.
    f = finding(review_file("naive_bench_pchannel"), "gate.pull-power[high]")
    assert f.value == pytest.approx(0.0625) and f.pass_solved == pytest.approx(12.5e3)
