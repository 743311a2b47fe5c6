"""The array-aware physics and helpers of the operating, band, bus, protection, isolation,
layout and grounding modules: on an array they give, element by element, what the scalar calls
give (1e-12 relative), branches included, and a float for float inputs.

The scalar calls are the reference; their own values are checked against outside sources in the
per-module tests (tests/physics/test_<module>.py). Here numpy's and Python's own arithmetic are
the oracle: ``math.hypot`` for :func:`hypot`, Python's ``or`` for :func:`or_default`."""

from __future__ import annotations

import math

import numpy as np
import pytest

from reviewer.physics.arrays import hypot, or_default


def same_as_scalars(fn, *columns, **kw):
    """``fn`` on arrays equals the list of scalar calls, and a scalar call gives a float."""
    arrays = [np.asarray(c, dtype=float) if isinstance(c, (list, tuple)) else c for c in columns]
    got = fn(*arrays, **kw)
    n = max(len(c) for c in columns if isinstance(c, (list, tuple)))
    want = []
    for i in range(n):
        args = [float(c[i]) if isinstance(c, (list, tuple)) else c for c in columns]
        one = fn(*args, **kw)
        assert isinstance(one, float) and not isinstance(one, np.floating), type(one)
        want.append(one)
    got = np.asarray(got, dtype=float)
    assert got.shape == (n,)
    for g, w in zip(got, want):
        if math.isinf(w):
            assert g == w
        else:
            assert g == pytest.approx(w, rel=1e-12, abs=0.0)
    return want


def test_or_default_takes_the_default_where_python_or_would():
    xs = [0.0, 2.5, 0.0, 1e-9]
    assert same_as_scalars(lambda x: or_default(x, 1.0), xs) == [x or 1.0 for x in xs]
    assert or_default(None, 1.0) == 1.0
    assert or_default(3.0, 1.0) == 3.0


def test_hypot_equals_math_hypot():
    a, b = [3.0, 1e200, 0.0, 5e-3], [4.0, 1e200, 2.0, 12e-3]
    got = same_as_scalars(hypot, a, b)
    assert got[0] == 5.0  # the 3-4-5 triangle
    assert got[1] == math.hypot(1e200, 1e200)  # no overflow
    # one array, one scalar
    assert np.allclose(hypot(np.array([3.0, 6.0]), 4.0), [5.0, math.hypot(6.0, 4.0)], rtol=1e-12)
