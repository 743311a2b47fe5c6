"""Every field the switching, gate, thermal and bootstrap physics added is read by a derive
module (an input the physics ignores would be a silent wrong answer)."""

from __future__ import annotations

import pytest

from pathlib import Path

from reviewer.design import parse_design
from reviewer.quantities import Ctx, compute
from tests.conftest import example

RULES = Path(__file__).resolve().parent.parent / "rules"

NEW_FIELDS = [
    "timing.delay_mismatch", "timing.delay_spread", "timing.resolution",
    *(f"switch.{s}.{k}" for s in ("high", "low") for k in (
        "qgs", "qg_vgs", "rg_internal", "current_fall_time", "common_source_inductance",
        "vth_hot", "diode_qrr", "diode_trr", "zth_tau", "id_pulse")),
    "drive.high.reference_negative_limit",
    "bootstrap.diode_rating", "bootstrap.series_resistance", "bootstrap.quiescent_current",
    "bootstrap.leakage_current",
]


@pytest.fixture(scope="module")
def reads(request):
    seen: set[str] = set()
    original = Ctx.v

    def spy(self, path):
        seen.add(path)
        return original(self, path)

    Ctx.v = spy
    try:
        compute(parse_design(example("careful_12v_sine").read_text(encoding="utf-8")))
    finally:
        Ctx.v = original
    return seen


@pytest.mark.parametrize("path", NEW_FIELDS)
def test_new_field_is_read(reads, path):
    # id_pulse, reference_negative_limit and the diode rating are limits read by rules (design.*
    # names); every other one by a derive module
    if path.endswith(".id_pulse") or path in ("drive.high.reference_negative_limit",
                                              "bootstrap.diode_rating"):
        text = "\n".join(p.read_text(encoding="utf-8") for p in RULES.glob("*.toml"))
        key = path.replace(".high.", ".{each}.").replace(".low.", ".{each}.") if "switch." in path else path
        assert f"design.{key}" in text
    else:
        assert path in reads
