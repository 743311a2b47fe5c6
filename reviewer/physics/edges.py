"""The bridge voltage's edges for many switching patterns at once (one row per pattern).

The scalar path (:func:`reviewer.physics.pattern.bridge_events`) builds each pattern from its
interval lists: the commanded crossings, their union, pulses shorter than the rounding share and
than the minimum pulse dropped, the dead time set by the current's direction, and the union
again. Here the same steps act on a 2-D array of edge times, one row per pattern (per corner or
yield sample), with a flag per edge that says whether it is still an edge:

* the commanded crossings of every row come from one Newton iteration over the whole array;
* each leg's edges alternate start, end, start, … in time, so merging two touching intervals or
  dropping a short pulse removes two neighbouring edges, which keeps the alternation: each
  pass of the scalar path is a pass over the flags here, in the same order and with the same
  comparisons;
* the dead time moves each remaining edge by the current's sign there, and the scalar path's
  final union is one more pass over the moved edges: a pulse the dead time swallows (moved end
  at or before its moved start) is dropped, then two intervals that now meet are run together.
  This is exact where the moved starts, and the moved ends, of the pulses left keep their
  order; a row where they do not, or where no pulse is left, is flagged, and the caller
  computes it with the scalar path (in random patterns with dead times up to twice the
  shortest carrier pulses, about one row in a thousand).

The result agrees with the scalar path to rounding (tested to 1e-12 over random patterns).

References
----------
Holmes & Lipo (2003), ch. 3 and 5 (naturally sampled PWM, level-shifted carriers); Mohan,
Undeland & Robbins (2003), §8-6 (blanking time; section number from memory).
"""

from __future__ import annotations

import math
from fractions import Fraction
from typing import Callable

import numpy as np

from reviewer.physics.pattern import PWM_KINDS, ROUNDING, _crossings


def _next_edge(real: np.ndarray) -> np.ndarray:
    """For each position ``i`` of each row, the position of the next flagged edge after ``i``
    on the circle, counted on into the next window (``i < j ≤ i + L``); ``≥ 2L`` where a row
    has none."""
    size = real.shape[1]
    none = 2 * size
    pos = np.where(real, np.arange(size), none)
    at_or_after = np.minimum.accumulate(pos[:, ::-1], axis=1)[:, ::-1]
    after = np.empty_like(at_or_after)
    after[:, :-1] = at_or_after[:, 1:]
    after[:, -1] = none
    # past the last flagged edge: the row's first one, a window later
    return np.where(after == none, at_or_after[:, :1] + size, after)


def _at(t: np.ndarray, j: np.ndarray, period: float) -> np.ndarray:
    """``t`` at the positions ``j`` of :func:`_next_edge` (a window later past the row's end)."""
    n, size = t.shape
    jj = np.minimum(j, 2 * size - 1)
    wrap = jj >= size
    flat = (jj - np.where(wrap, size, 0)) + (np.arange(n) * size)[:, None]
    return t.ravel()[flat] + np.where(wrap, period, 0.0)


def _pass(t: np.ndarray, real: np.ndarray, period: float,
          too_short: Callable[[np.ndarray], np.ndarray],
          nxt: np.ndarray | None, kinds: str = "both") -> np.ndarray | None:
    """Drop the pulses (start to next end) that are ``too_short``, then fill the gaps (end to
    next start) among those left that are: in place on ``real``. One pass of the scalar
    path's union (``too_short`` = not positive) or ``drop_short`` (shorter than a width).

    ``kinds`` = ``"pulses"`` or ``"gaps"`` makes only that half of the pass. ``nxt`` is
    :func:`_next_edge` of ``real`` as it comes in (None: not made yet, or every edge still
    there); returns it for ``real`` as it leaves."""
    n, size = t.shape
    if nxt is None and real.all():  # every edge still there: the spans are the differences
        span = np.empty_like(t)
        span[:, :-1] = np.diff(t, axis=1)
        span[:, -1] = t[:, 0] + period - t[:, -1]
        if not too_short(span).any():
            return None
    start = (np.arange(size) % 2 == 0)[None, :]
    for kind in {"both": (start, ~start), "pulses": (start,), "gaps": (~start,)}[kinds]:
        if nxt is None:
            nxt = _next_edge(real)
        hit = real & kind & (nxt < 2 * size) & too_short(_at(t, nxt, period) - t)
        if hit.any():
            r, c = np.nonzero(hit)
            real[r, c] = False
            real[r, nxt[r, c] % size] = False
            nxt = None
    return nxt


def _in_order(t: np.ndarray, which: np.ndarray, period: float) -> np.ndarray:
    """Per row: the times ``t`` at the positions ``which`` rise (or stay) in position order,
    the last no later than the first a window on."""
    x = np.where(which, t, -np.inf)
    rising = np.all(~which | (x >= np.maximum.accumulate(x, axis=1)), axis=1)
    first = np.where(which, t, np.inf).min(axis=1)
    last = x.max(axis=1)
    return rising & ~(last > first + period)


def commanded(kind: str, f0: float, index: np.ndarray, carrier: float,
              max_periods: int = 8) -> tuple[np.ndarray, np.ndarray, float, int]:
    """The commanded edges of legs A and B, one row per index (see the module docstring).

    Returns ``(edges_a, edges_b, period, periods)``: per leg an ``(n, 2p)`` array of edge times
    [s], start, end, start, … in rising order from the first start (the last end may pass the
    window); the window [s]; the output periods in it. Raises ``ValueError`` where
    :func:`reviewer.physics.pattern.leg_intervals` does.
    """
    if kind not in PWM_KINDS:
        raise ValueError(f"array edges are for sine PWM, not {kind!r}")
    if f0 <= 0:
        raise ValueError("output frequency must be positive")
    ratio = carrier / f0
    if ratio < 5:
        raise ValueError("carrier must be at least five times the output frequency for sine PWM")
    m = np.asarray(index, dtype=float)
    if np.any(m < 0):
        raise ValueError("modulation index must not be negative")
    gain_max = 2.0 if kind == "spwm_level_shifted" else 1.0
    if math.pi * float(np.max(m)) * gain_max / (2 * ratio) >= 0.9:
        raise ValueError("modulation index too large for this carrier ratio")
    frac = Fraction(ratio).limit_denominator(max_periods)
    p, q = frac.numerator, frac.denominator
    tc = q / (p * f0)
    w0 = 2 * math.pi * f0
    col = m[:, None]

    def interleave(s: np.ndarray, e: np.ndarray) -> np.ndarray:
        out = np.empty((s.shape[0], 2 * s.shape[1]))
        out[:, 0::2] = s
        out[:, 1::2] = e
        return out

    def complement(rise: np.ndarray, fall: np.ndarray) -> np.ndarray:
        # on from each fall to the next rise (the last one a window later)
        nxt = np.concatenate([rise[:, 1:], rise[:, :1] + p * tc], axis=1)
        return interleave(fall, nxt)

    if kind == "spwm_bipolar":
        ra, fa = _crossings(1.0, 0.0, col, w0, tc, p)
        return interleave(ra, fa), complement(ra, fa), q / f0, q
    if kind == "spwm_unipolar":
        a = interleave(*_crossings(1.0, 0.0, col, w0, tc, p))
        return a, interleave(*_crossings(-1.0, 0.0, col, w0, tc, p)), q / f0, q
    a = interleave(*_crossings(2.0, -1.0, col, w0, tc, p))
    return a, complement(*_crossings(2.0, 1.0, col, w0, tc, p)), q / f0, q


def leg_fundamental(t: np.ndarray, period: float, periods: int, sign: float,
                    min_pulse: float, dead_high: np.ndarray, dead_low: np.ndarray,
                    current_lag: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
    """One leg's share of the bridge voltage's fundamental, per row, and which rows are exact.

    ``t`` are the leg's commanded edges (:func:`commanded`); ``sign`` is +1 for leg A, −1 for
    leg B (its voltage enters ``v_ab`` negatively and its current is the opposite of A's).
    Returns ``Σ ± e^{−jωt}`` over the leg's final edges (+ for a start) [unitless] and a flag per
    row: False where the dead time reordered the edges of the pulses left, or left none
    (compute that row with the scalar path).
    """
    n, size = t.shape
    real = np.ones((n, size), dtype=bool)
    # in rising order to rounding (a clipped reference meets the carrier's end at the window's)
    slack = ROUNDING * period
    ok = (np.all(np.diff(t, axis=1) >= -slack, axis=1)
          & (t[:, -1] <= t[:, 0] + period + slack))
    j = _pass(t, real, period, lambda w: w <= 0, None)  # the union of the raw intervals
    j = _pass(t, real, period, lambda w: w < ROUNDING * period, j)
    if min_pulse > 0:
        j = _pass(t, real, period, lambda w: w < min_pulse, j)
    w0 = 2 * math.pi * periods / period  # the output frequency, the fundamental's
    dh, dl = dead_high[:, None], dead_low[:, None]
    c, s_ = np.cos(w0 * t), np.sin(w0 * t)
    lag = current_lag[:, None]
    # the current's sign there: cos(ω₀t − φ) = cos ω₀t · cos φ + sin ω₀t · sin φ
    cur = np.sign(sign * (c * np.cos(lag) + s_ * np.sin(lag)))
    start = (np.arange(size) % 2 == 0)[None, :]
    moves = ((dead_high > 0) | (dead_low > 0))[:, None]
    late_start = moves & start & (cur > 0)
    late_end = moves & ~start & (cur < 0)
    moved = t + np.where(late_start, dh, 0.0) + np.where(late_end, dl, 0.0)
    # the scalar path's union of the moved intervals: a pulse the dead time swallows (its
    # moved end at or before its moved start) is dropped, then two intervals that now meet
    # (a moved end at or past the next moved start) are run together; exact where the moved
    # starts and the moved ends of the pulses left each keep their order (then every run of
    # merged intervals ends at its last end)
    real_moved = real.copy()
    j = _pass(moved, real_moved, period, lambda w: w <= 0, j, kinds="pulses")
    ok &= _in_order(moved, real_moved & start, period) & _in_order(moved, real_moved & ~start,
                                                                   period)
    j = _pass(moved, real_moved, period, lambda w: w <= 0, j, kinds="gaps")
    ok &= real_moved.any(axis=1)  # not every pulse gone, nor one covering the whole window
    if real_moved.all():
        nxt = np.empty_like(moved)
        nxt[:, :-1] = moved[:, 1:]
        nxt[:, -1] = moved[:, 0] + period
    else:
        j = _next_edge(real_moved) if j is None else j
        nxt = np.where(j < 2 * size, _at(moved, j, period), np.inf)
    # each remaining edge before the next remaining one (cyclically): a safeguard
    ok &= np.all(~real_moved | (nxt > moved), axis=1)
    real = real_moved
    # the moved edge's phase from the commanded one's: ω(t + δ), each row's δ turned in
    ch, sh = np.cos(w0 * dh), np.sin(w0 * dh)
    cl, sl = np.cos(w0 * dl), np.sin(w0 * dl)
    cm = np.where(late_start, c * ch - s_ * sh, np.where(late_end, c * cl - s_ * sl, c))
    sm = np.where(late_start, s_ * ch + c * sh, np.where(late_end, s_ * cl + c * sl, s_))
    step = np.where(real, np.where(start, 1.0, -1.0), 0.0)
    total = np.einsum("ij,ij->i", step, cm) - 1j * np.einsum("ij,ij->i", step, sm)
    return sign * total, ok
