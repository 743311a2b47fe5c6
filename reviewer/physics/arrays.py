"""Numbers or arrays in, the same kind out: the two helpers every array-aware physics function uses.

A physics function takes floats or numpy arrays (one element per corner or sample, see
:meth:`reviewer.quantities.Runner.batch`); it computes on arrays and gives back a Python float
when every input was a scalar, so that a scalar run publishes exactly what it did before.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np


def arr(x: Any) -> np.ndarray:
    """``x`` as a float array (a scalar becomes a 0-d array)."""
    return np.asarray(x, dtype=float)


def out(x: Any) -> Any:
    """A 0-d result as a Python float, an array result as it is."""
    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def is_array(*xs: Any) -> bool:
    """True when any of ``xs`` is an array with more than one element (an array call)."""
    return any(isinstance(x, np.ndarray) and x.ndim > 0 for x in xs)


def or_default(x: Any, default: float) -> Any:
    """``x or default`` for a value that may be an array: ``default`` where ``x`` is None or
    zero, ``x`` elsewhere (an optional design field whose absence, or zero, means ``default``)."""
    if isinstance(x, np.ndarray) and x.ndim > 0:
        return np.where(x == 0, default, x)
    return x or default


def hypot(a: Any, b: Any) -> Any:
    """``√(a² + b²)`` without overflow: :func:`math.hypot` for scalars (a float, as before),
    :func:`numpy.hypot` when either is an array."""
    if is_array(a, b):
        return np.hypot(a, b)
    return math.hypot(a, b)
