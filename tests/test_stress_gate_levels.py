"""Gate-source voltages the stress check derives from drive levels: Kirchhoff's voltage law
around gate, source and the rails (the source potentials are those of reviewer.physics.gate)."""

import pytest

from tests.conftest import finding, review_text
from tests.test_stress_rules import P_TRAP, design


def test_p_channel_pulled_to_ground_sees_the_whole_bus():
    # gate at 0 V, source on the 24 V bus: V_SG = 24 V (the classic trap, common practice)
    r = review_text(design(bus_max="24 V", high_pol="p", high_drive=P_TRAP))
    assert r.sheet.value("stress.high.vgs_on") == pytest.approx(24.0)
    assert r.sheet.value("stress.high.vgs_off") == pytest.approx(0.0)


def test_zener_clamps_the_trap():
    drive = P_TRAP + '\nzener = "15 V"'
    r = review_text(design(bus_max="24 V", high_pol="p", high_drive=drive))
    assert r.sheet.value("stress.high.vgs_peak") == pytest.approx(15.0)
    assert finding(r, "stress.vgs-rating[high]").outcome == "pass"


def test_source_referenced_negative_off_bias():
    drive = '[drive.high]\nkind = "isolated_driver"\non_level = "15 V"\noff_level = "-5 V"'
    r = review_text(design(high_drive=drive))
    assert r.sheet.value("stress.high.vgs_off") == pytest.approx(-5.0)
    assert r.sheet.value("stress.high.vgs_peak") == pytest.approx(15.0)


def test_derating_fix_for_a_p_channel_pulled_to_ground_raises_the_on_level():
    # V_SG = V_bus − on level (Kirchhoff): less gate stress needs a *higher* on level, so the
    # text must not say "a drive of … or less" here; the pass value itself is verified by
    # re-review (tests/test_passcheck.py)
    r = review_text(design(bus_max="24 V", high_pol="p", high_drive=P_TRAP))
    f = finding(r, "stress.vgs-derating[high]")
    assert f.outcome == "fail"
    assert f.pass_value == pytest.approx(24.0 - 16.0, rel=0.02)  # 80 % of 20 V, by hand
    assert "no lower than" in f.mitigation and "or less" not in f.mitigation
