"""Figures in sentences: a number that is absent, infinite or not a number becomes words.

The engine fills a mitigation's ``{placeholders}`` with :func:`figure`; a rule whose figure can
be absent or non-physical gives a ``[[rule.cases]]`` text for that situation (see
:mod:`reviewer.cases`), so these words are the last resort, never a symbol.
"""

from __future__ import annotations

import math
from typing import Any

ABSENT = "(not computed for this design)"
UNBOUNDED = "(no finite figure: unbounded)"


def figure(result: Any, unit: str) -> str:
    """``result`` in engineering notation with ``unit``, or words where it has no finite value.

    Parameters
    ----------
    result : float, str or None
        The value [``unit``], a text, or None when it could not be computed.
    unit : str
        The unit symbol for display.
    """
    from reviewer.units import render

    if result is None:
        return ABSENT
    if isinstance(result, str):
        return result
    try:
        x = float(result)
    except (TypeError, ValueError):
        return str(result)
    if math.isnan(x):
        return ABSENT
    if math.isinf(x):
        return UNBOUNDED
    return render(x, unit)


def distinct(a: float, b: float, unit: str, prec: int = 3) -> tuple[str, str]:
    """``a`` and ``b`` rendered with as many significant figures as it takes to tell them apart.

    A value just over its limit must not read the same as the limit ("5.45 A, limit ≤ 5.45 A").

    Parameters
    ----------
    a, b : float
        Two values in the same unit [``unit``].
    unit : str
        Their unit.
    prec : int
        The usual number of significant figures.
    """
    from reviewer.units import render

    if a is None or b is None or not (math.isfinite(a) and math.isfinite(b)) or a == b:
        return figure(a, unit), figure(b, unit)
    for p in range(prec, 10):
        ta, tb = render(a, unit, p), render(b, unit, p)
        if ta != tb:
            return ta, tb
    return render(a, unit, 10), render(b, unit, 10)
