"""The §3.2 stress rules end to end: thresholds, derating arithmetic and mitigation values.

Derating figures are common practice (80 % of V_DS and of V_GS; V_DS ≥ 1.5 × bus)."""

import pytest

from tests.conftest import assert_fails, finding, review_text
from tests.design.test_loader import MINIMAL


def design(bus_max: str = "14.8 V", vds: str = "40 V", high_pol: str = "n", high_drive: str = "",
           low_on: str = "12 V") -> str:
    text = MINIMAL.replace('v_nom = "12 V"', f'v_nom = "12 V"\nv_max = "{bus_max}"')
    text = text.replace('vds_rating = "40 V"', f'vds_rating = "{vds}"')
    if high_pol == "p":
        text = text.replace('[switch.high]\n', '[switch.high]\npolarity = "p"\n')
    if high_drive:
        text = text.replace('[drive.high]\nkind = "driver_ic"\non_level = "12 V"\noff_level = "0 V"',
                            high_drive)
    return text.replace('[drive.low]\nkind = "driver_ic"\non_level = "12 V"',
                        f'[drive.low]\nkind = "driver_ic"\non_level = "{low_on}"')


P_TRAP = ('[drive.high]\nkind = "single_transistor"\nlevels_from = "ground"\non_level = "0 V"\n'
          'off_level = "bus"\npull_resistor = "10 kΩ"\npull_to = "bus"')


def test_p_channel_trap_at_24_v_with_a_20_v_part():
    r = review_text(design(bus_max="24 V", high_pol="p", high_drive=P_TRAP))
    f = finding(r, "stress.vgs-rating[high]")
    assert f.outcome == "fail" and f.severity == "hazard"
    assert f.value == pytest.approx(24.0) and f.limit == pytest.approx(20.0)
    assert f.margin == pytest.approx(-4.0)
    # pass value: 80 % of 20 V = 16 V; divider: 10 kΩ · (24/16 − 1) = 5 kΩ (hand calculation)
    assert f.pass_solved == pytest.approx(16.0)
    # shown: the verified 16.1 V (16 V moved by the 0.5 % margin and rounded to three figures;
    # the design has no zener yet, so both ways are tried and the way up passes the rating),
    # and its divider 10 kΩ · (24/16.1 − 1) = 4.91 kΩ (hand calculation)
    assert "4.91 kΩ" in f.mitigation and "16.1 V" in f.mitigation
    assert_fails(r, {"stress.vgs-rating[high]", "stress.vgs-derating[high]"}, area="stress")


def test_vgs_exactly_at_the_limit_passes():
    r = review_text(design(bus_max="20 V", high_pol="p", high_drive=P_TRAP, vds="40 V"))
    assert finding(r, "stress.vgs-rating[high]").outcome == "pass"


def test_vgs_derating_threshold():
    # 80 % of 20 V is 16 V: 16 V passes, 16.1 V fails
    assert finding(review_text(design(low_on="16 V")), "stress.vgs-derating[low]").outcome == "pass"
    assert finding(review_text(design(low_on="16.1 V")), "stress.vgs-derating[low]").outcome == "fail"


@pytest.mark.parametrize("bus, outcome", [("32 V", "pass"), ("32.1 V", "fail")])
def test_vds_derating_threshold(bus, outcome):
    # 0.8 × 40 V = 32 V (derating arithmetic)
    f = finding(review_text(design(bus_max=bus)), "stress.vds-derating[high]")
    assert f.outcome == outcome
    if outcome == "fail":
        assert f.pass_solved == pytest.approx(32.1 / 0.8)  # rating that passes


@pytest.mark.parametrize("bus, outcome", [("40 V", "pass"), ("40.5 V", "fail")])
def test_vds_absolute_rating(bus, outcome):
    f = finding(review_text(design(bus_max=bus)), "stress.vds-rating[low]")
    assert (f.outcome, f.severity) == (outcome, "hazard")


@pytest.mark.parametrize("vds, outcome", [("22.2 V", "pass"), ("22.1 V", "fail")])
def test_vds_headroom(vds, outcome):
    # 1.5 × 14.8 V = 22.2 V
    f = finding(review_text(design(vds=vds)), "stress.vds-headroom[high]")
    assert f.outcome == outcome


def test_worst_corner_of_a_tolerance():
    # a 15 V ± 10 % drive peaks at 16.5 V: beyond 16 V at the high corner though typical passes
    r = review_text(design(low_on="15 V ± 10%"))
    f = finding(r, "stress.vgs-derating[low]")
    assert f.outcome == "fail"
    assert f.value == pytest.approx(16.5) and f.value_typ == pytest.approx(15.0)
    assert f.corner == (("drive.low.on_level", "max"),)
