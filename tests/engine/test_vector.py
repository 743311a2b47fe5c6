"""Array evaluation of an opted-in derive module equals its scalar runs.

The operating module is opted in for the test only (``VECTOR = True``, monkeypatched: the derive
modules are converted one by one after review); every vertex of every bundled example's
tolerance box is evaluated once as a batch (one call of the opted-in module over all vertices)
and once corner by corner (the scalar reference), and every published value must agree to
1e-12 relative."""

from __future__ import annotations

import itertools
import math

import pytest

from reviewer.derive import operating
from reviewer.design import load_design
from reviewer.quantities import Runner
from tests.conftest import EXAMPLES


@pytest.mark.parametrize("path", sorted(EXAMPLES.glob("*.toml")), ids=lambda p: p.stem)
def test_vector_module_equals_scalar_runs(path, monkeypatch):
    monkeypatch.setattr(operating, "VECTOR", True, raising=False)
    d = load_design(path)
    scalar, vector = Runner(d, replay=False), Runner(d, replay=False)
    tol = vector.tol
    ends = list(itertools.product(("min", "max"), repeat=len(tol))) or [()]
    points = [{p: vector.end(p, e) for p, e in zip(tol, combo)} for combo in ends]
    if len(points) < 2:  # an example without tolerances: batch typical with one toleranced copy
        points = [{}, {}]
    batch = vector.batch(points)
    assert vector.vector_calls >= 1 and vector.fallbacks == 0
    for at, got in zip(points, batch):
        want = scalar.corner(tuple((p, "min" if at[p] == scalar.spans[p].lo else "max")
                                   for p in at))
        assert set(got.out) == set(want.out)
        assert got.missing == want.missing
        for name, x in want.out.items():
            y = got.out[name]
            if isinstance(x, float) and not math.isinf(x):
                assert y == pytest.approx(x, rel=1e-12, abs=0), name
            elif isinstance(x, (bool, str)) or x is None:
                assert y == x, name
