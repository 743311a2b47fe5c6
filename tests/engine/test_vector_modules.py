"""Every derive module that evaluates arrays (``VECTOR = True``) gives, element by element, what
its scalar runs give: on every bundled example and every test variant, with every numeric input
that the design gives as a fixed value toleranced ±10 % (so that every input varies between the
points), at all ends of the first inputs and at random points inside the box.

The scalar reference is the same code run once per point (:meth:`Runner.point`, no replay); the
comparison is to 1e-12 relative, as the array evaluation must not change a number. A module that
falls back to scalar runs (it raised on arrays) counts as a failure here: an opted-in module must
handle arrays at every point of every design below."""

from __future__ import annotations

import math
import random

import numpy as np
import pytest

from reviewer.derive import MODULES, index
from reviewer.quantities import Runner, design_values
from reviewer.units import Span
from tests.engine.test_worstcase_property import with_spans
from tests.variants import VARIANTS, variant_design

VECTORISED = [m for m in MODULES if getattr(m, "VECTOR", False)]
CASES = [(v[0], v[1], v[2]) for v in VARIANTS]


def _designs():
    from tests.conftest import EXAMPLES
    from reviewer.design import load_design

    for p in sorted(EXAMPLES.glob("*.toml")):
        yield p.stem, load_design(p)
    for name, example, changes in CASES:
        try:
            yield name, variant_design(example, changes)
        except Exception:  # a variant the loader refuses is not a design to evaluate
            continue


def all_toleranced(design):
    _, spans, _ = design_values(design)
    new = {p: Span(s.typ * 0.9, s.typ, s.typ * 1.1) for p, s in spans.items()
           if s.exact and s.typ > 0}
    return with_spans(design, new)


def same(x, y) -> bool:
    if isinstance(x, float) and isinstance(y, float):
        if math.isnan(x) or math.isnan(y):
            return math.isnan(x) and math.isnan(y)
        if math.isinf(x) or math.isinf(y):
            return x == y
        return y == pytest.approx(x, rel=1e-12, abs=1e-300)
    if isinstance(x, (int, float)) and isinstance(y, (int, float)) and not isinstance(x, bool):
        return y == pytest.approx(x, rel=1e-12, abs=1e-300)
    try:
        return bool(x == y)
    except (TypeError, ValueError):
        return repr(x) == repr(y)


@pytest.mark.skipif(not VECTORISED, reason="no derive module evaluates arrays yet")
@pytest.mark.parametrize("name,design", list(_designs()), ids=lambda x: x if isinstance(x, str)
                         else "")
def test_vectorised_modules_equal_scalar_runs(name, design):
    d = all_toleranced(design)
    vector, scalar = Runner(d, replay=False), Runner(d, replay=False)
    rng = random.Random(name)
    tol = vector.tol
    points = []
    for _ in range(6):
        points.append({p: vector.end(p, rng.choice(("min", "max"))) for p in tol})
    for _ in range(6):
        points.append({p: rng.uniform(vector.spans[p].lo, vector.spans[p].hi) for p in tol})
    batch = vector.batch(points)
    index._SOLVED.clear()  # the scalar runs below solve afresh, not from the array call's store
    assert vector.fallbacks == 0, "an opted-in module fell back to scalar runs"
    assert vector.vector_calls >= 1
    for at, got in zip(points, batch):
        want = scalar.point(at)
        assert set(got.out) == set(want.out), sorted(set(got.out) ^ set(want.out))
        assert got.missing == want.missing
        assert got.notes == want.notes
        for key, x in want.out.items():
            assert not isinstance(got.out[key], np.ndarray), key
            assert same(x, got.out[key]), (key, x, got.out[key])
