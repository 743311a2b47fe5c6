"""The sheet's corner runs: replaying unchanged modules gives exactly what running them does,
and the worst corner of a product of toleranced inputs is found (interval arithmetic: the
extremes of a·b for positive a, b are lo·lo and hi·hi)."""

import pytest

from reviewer.design import load_design
from reviewer.quantities import compute
from tests.conftest import EXAMPLES, review_text
from tests.design.test_loader import MINIMAL


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_replay_changes_nothing(path):
    d = load_design(path)
    fast, slow = compute(d), compute(d, replay=False)
    assert fast.corners == slow.corners
    assert set(fast.quantities) == set(slow.quantities)
    for name, q in fast.quantities.items():
        assert q.runs == slow.quantities[name].runs, name
    assert fast.missing == slow.missing


def test_corners_of_a_product():
    # P_in = P / (η · V_bus,min): with P fixed, the extremes come from η and V_bus,min ends.
    text = MINIMAL.replace('v_nom = "12 V"', 'v_nom = "12 V"\nv_min = "10 V ± 5%"')
    text += '\n[load]\npower = "100 W"\nefficiency = { min = "80 %", typ = "85 %", max = "90 %" }\n'
    r = review_text(text)
    q = r.sheet.get("op.input_current")
    assert q.hi == pytest.approx(100 / (0.80 * 9.5))   # lowest η and lowest bus together
    assert q.lo == pytest.approx(100 / (0.90 * 10.5))
    assert q.typ == pytest.approx(100 / (0.85 * 10.0))
