"""Which path each point of an array call takes (see :meth:`reviewer.quantities.Runner.batch`).

A derive module that branches on a value (a table row, a case of the standard) asks
:func:`one_path` for the branch key: every point on the same path gives that path's key; points
on different paths make the runner evaluate each group of equal keys on its own
(:class:`reviewer.context.SplitPoints`), where the scalar branch code applies unchanged.
:func:`each` gives a note that quotes a number differing between points, one text per point.
"""

from __future__ import annotations

from typing import Any, Callable

import numpy as np

from reviewer.context import SplitPoints


def _is_array(x: Any) -> bool:
    return isinstance(x, np.ndarray) and x.ndim > 0


def one_path(key: Any) -> Any:
    """The branch key of every point: ``key`` itself for a scalar, the one value of an array
    whose elements are all equal (as a Python scalar).

    Raises
    ------
    SplitPoints
        When the elements differ (use integer, bool or text keys: the runner groups equal ones).
    """
    if not _is_array(key):
        return key
    flat = key.reshape(-1)
    if bool(np.any(flat != flat[0])):
        raise SplitPoints(key)
    first = flat[0]
    return first.item() if isinstance(first, np.generic) else first


def each(fn: Callable[..., str], *xs: Any) -> Any:
    """``fn(*xs)`` for scalars; with arrays among ``xs``, the list of ``fn`` at every point (the
    point's element of each array, a Python scalar, and the scalars as they are)."""
    arrays = [x for x in xs if _is_array(x)]
    if not arrays:
        return fn(*xs)
    n = len(arrays[0])
    return [fn(*(x[i].item() if _is_array(x) else x for x in xs)) for i in range(n)]
