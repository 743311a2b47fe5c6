"""Variant designs: the bundled examples with a few fields changed or removed, for the tests that
must hold on every finding (pass values that pass when entered, texts that mean something).

Each variant is (name, example, changes): a change sets a dotted field to a TOML value (a value
is written as in a design file, "25 °C"), or removes it (None). Invented values throughout.
"""

from __future__ import annotations

import tomllib
from functools import lru_cache
from typing import Any

from tests.conftest import EXAMPLES

NAIVE, CAREFUL, MAINS, QUASI = ("naive_bench_pchannel", "careful_12v_sine",
                                "mains_output_transformer", "nchannel_bootstrap_quasi")

VARIANTS: list[tuple[str, str, dict[str, Any]]] = [
    ("hot ambient", CAREFUL, {"environment.ambient": "85 °C"}),
    ("extreme ambient", QUASI, {"environment.ambient": "160 °C"}),
    ("cold ambient", MAINS, {"environment.ambient": "-40 °C"}),
    ("no thermal data", CAREFUL, {"switch.high.rth_jc": None, "switch.high.rth_cs": None,
                                  "switch.high.rth_sa": None, "switch.low.rth_jc": None,
                                  "switch.low.rth_cs": None, "switch.low.rth_sa": None}),
    ("junction-ambient only", QUASI, {"switch.high.rth_jc": None, "switch.high.rth_cs": None,
                                      "switch.high.rth_sa": None, "switch.high.rth_ja": "90 K/W"}),
    ("no filter", CAREFUL, {"filter": None}),
    ("no filter naive", NAIVE, {"filter": None}),
    ("resonant filter", CAREFUL, {"filter.inductance": "100 µH", "filter.capacitance": "100 µF"}),
    ("filter near carrier", MAINS, {"filter.inductance": "2 µH", "filter.capacitance": "2 µF"}),
    ("unreachable target", CAREFUL, {"output.v_rms": "11 V"}),
    ("unreachable target quasi", QUASI, {"output.v_rms": "28 V"}),
    ("tiny thresholds", CAREFUL, {"switch.high.vth": "0.3 V", "switch.low.vth": "0.3 V"}),
    ("shared signal", CAREFUL, {"drive.shared_signal": True}),
    ("shared signal quasi", QUASI, {"drive.shared_signal": True}),
    ("no dead time", CAREFUL, {"timing.dead_time": "0 s"}),
    ("short dead time", QUASI, {"timing.dead_time": "20 ns"}),
    ("weak bootstrap", QUASI, {"bootstrap.capacitor": "10 nF", "bootstrap.supply": "9 V"}),
    ("bootstrap below gate", QUASI, {"bootstrap.supply": "5 V"}),
    ("small fuse wire", QUASI, {"wiring.size": "22 AWG"}),
    ("big fuse", QUASI, {"fuse.rating": "200 A"}),
    ("no fuse", MAINS, {"fuse": None}),
    ("tiny breaking", MAINS, {"fuse.breaking": "10 A"}),
    ("low ratings", CAREFUL, {"switch.high.vds_rating": "12 V", "switch.low.vds_rating": "12 V",
                              "capacitors.voltage_rating": "10 V"}),
    ("small ripple rating", CAREFUL, {"capacitors.ripple_rating": "0.1 A"}),
    ("huge load", CAREFUL, {"load.power": "2 kW"}),
    ("tiny load", CAREFUL, {"load.power": "0.5 W"}),
    ("fast carrier", NAIVE, {"modulation.carrier": "100 kHz"}),
    ("slow carrier", CAREFUL, {"modulation.carrier": "1 kHz"}),
    ("weak driver", MAINS, {"drive.high.source_current": "10 mA", "drive.low.source_current": "10 mA",
                            "drive.high.sink_current": "10 mA", "drive.low.sink_current": "10 mA"}),
    ("high gate drive", CAREFUL, {"drive.high.on_level": "25 V", "drive.low.on_level": "25 V"}),
    ("thin spacing", MAINS, {"isolation.creepage": "0.5 mm", "isolation.clearance": "0.2 mm"}),
    ("no isolation data", MAINS, {"isolation": None}),
    ("several devices", CAREFUL, {"switch.high.count": 3, "switch.low.count": 3,
                                  "switch.high.id_continuous": "2 A",
                                  "switch.low.id_continuous": "2 A"}),
    ("high source resistance", QUASI, {"source.r_internal": "2 Ω"}),
    # an on level below the Miller plateau at one corner: the edge, its loss and the local
    # capacitor's dip have no finite value there (texts must say so in words)
    ("gate below plateau", QUASI, {"drive.high.on_level": "4 V"}),
    # an on level below the threshold: the switch never turns on (no current rise at all)
    ("gate below threshold", CAREFUL, {"drive.high.on_level": "1.6 V"}),
    # a T_j,max within 25 °C of the ambient: no heat path is enough
    ("low junction rating", CAREFUL, {"switch.low.tj_max": "41 °C"}),
    # no fuse, at an ambient beyond the fuse rerating table: the smallest rating is not computed
    ("unfused hot ambient", NAIVE, {"environment.ambient": "135 °C"}),
    # a warm enclosure beyond the wire table's ambient: the wire's largest fuse is not computed
    ("warm enclosure", MAINS, {"environment.ambient": "85 °C"}),
    # an output beyond the 1 kV the spacing tables cover: the spacing is not computed, and the
    # findings say so in words (never a traceback, never an extrapolated value)
    ("beyond the spacing tables", MAINS, {"output.v_rms": "1200 V"}),
]


def _apply(data: dict[str, Any], path: str, value: Any) -> None:
    parts = path.split(".")
    node = data
    for part in parts[:-1]:
        node = node.setdefault(part, {})
    if value is None:
        node.pop(parts[-1], None)
    else:
        node[parts[-1]] = value


def variant_text(example: str, changes: dict[str, Any]) -> tuple[dict[str, Any], str]:
    """The example's parsed TOML with ``changes`` applied, and its file text (for locations)."""
    text = (EXAMPLES / f"{example}.toml").read_text(encoding="utf-8")
    data = tomllib.loads(text)
    for path, value in changes.items():
        _apply(data, path, value)
    return data, text


def variant_design(example: str, changes: dict[str, Any]):
    from reviewer.design import Design
    from reviewer.design.loader import validate

    data, text = variant_text(example, changes)
    return validate(Design, data, text, f"{example}.toml")


@lru_cache(maxsize=None)
def variant_review(name: str):
    """The review of the variant called ``name`` (cached: several tests read every finding)."""
    from reviewer.review import review_design

    _, example, changes = next(v for v in VARIANTS if v[0] == name)
    return review_design(variant_design(example, changes), f"{name}.toml", _book())


@lru_cache(maxsize=None)
def example_review(name: str):
    from reviewer.review import review_file

    return review_file(EXAMPLES / f"{name}.toml", book=_book(), use_record=False)


@lru_cache(maxsize=1)
def _book():
    from reviewer.rulebook import load_rulebook

    return load_rulebook()


EXAMPLE_NAMES = (NAIVE, CAREFUL, MAINS, QUASI)
VARIANT_NAMES = tuple(v[0] for v in VARIANTS)
