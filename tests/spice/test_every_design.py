"""Every bundled example and every variant design writes decks that run to completion in ngspice.

The outside reference is ngspice itself (``ngspice -b``): a deck passes when the run ends with
exit 0 and its log has no error, no singular matrix and no "timestep too small"
(:func:`tests.spice.ngspice.simulate`). A design the deck cannot represent must instead give a
:class:`~reviewer.deck.DeckError` naming the missing field, never another exception.

Run time (the ``tests/spice/`` group stays within 60 s on a 2-core machine): by default each
bundled example runs every analysis at the worst corner (but the 230 V example's filter
transient) and its leg at the typical corner. The
whole matrix (every example and variant, every analysis, the typical and worst corners and each
shoot-through and V_DS finding's own corner) takes minutes, mostly in the filter transients of
the 230 V example (a 24 kHz carrier over several 20 ms windows); it runs with
``REVIEWER_DECK_SWEEP=1``.
"""

from __future__ import annotations

import os

import pytest

from reviewer.deck import ANALYSES, DeckError, build_deck
from reviewer.deck.corner import WORST_RULES
from tests.spice.ngspice import needs_ngspice, simulate
from tests.variants import EXAMPLE_NAMES, VARIANT_NAMES, example_review, variant_review

pytestmark = needs_ngspice

SWEEP = bool(os.environ.get("REVIEWER_DECK_SWEEP"))
needs_sweep = pytest.mark.skipif(
    not SWEEP, reason="the whole design x analysis x corner matrix takes minutes: set "
                      "REVIEWER_DECK_SWEEP=1 to run it")


def _review(name: str):
    return example_review(name) if name in EXAMPLE_NAMES else variant_review(name)


def _run(review, corner, analysis: str, tmp_path) -> None:
    try:
        deck = build_deck(review, corner, analysis)
    except DeckError as e:  # a design the deck cannot represent: a message naming the field
        assert e.field and e.field in str(e), str(e)
        return
    plots = simulate(deck.text, tmp_path, analysis)
    assert plots and all(len(next(iter(p.vectors.values()))) > 1 for p in plots)


# the 230 V example's filter transient alone takes 15-30 s (thousands of PWL points): sweep only
_LONG = {("mains_output_transformer", "filter")}


@pytest.mark.parametrize("name,analysis", [
    pytest.param(n, a, marks=[needs_sweep] if (n, a) in _LONG else [])
    for n in EXAMPLE_NAMES for a in ANALYSES])
def test_each_example_runs_at_the_worst_corner(name, analysis, tmp_path):
    _run(_review(name), "worst", analysis, tmp_path)


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_each_example_leg_runs_at_the_typical_corner(name, tmp_path):
    _run(_review(name), "typical", "leg", tmp_path)


@needs_sweep
@pytest.mark.parametrize("name", EXAMPLE_NAMES + VARIANT_NAMES)
@pytest.mark.parametrize("analysis", ANALYSES)
def test_every_design_analysis_and_corner_runs(name, analysis, tmp_path):
    review = _review(name)
    keys = [f.key for f in review.findings if f.rule_id in WORST_RULES]
    for i, corner in enumerate(["typical", "worst"] + keys):
        which = corner if corner in ("typical", "worst") else review.finding(corner)
        folder = tmp_path / str(i)
        folder.mkdir()
        _run(review, which, analysis, folder)
