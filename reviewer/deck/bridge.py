"""The bridge voltage the review's spectrum is made from, as the edges of a piecewise-linear source.

The review's waveform figures (:mod:`reviewer.derive.waveform`) come from the bridge voltage's
steps of the switching pattern (:func:`reviewer.physics.pattern.bridge_events`): the commanded
intervals, short pulses dropped, edges delayed by the dead time according to the current's
direction. This module takes the very same steps, with the same inputs, and returns the edges
instead of a spectrum, so that a circuit simulator can be fed the waveform the review analysed.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import TYPE_CHECKING

from reviewer.physics import pattern

if TYPE_CHECKING:
    import numpy as np


@dataclass(frozen=True)
class BridgeEdges:
    """One window of the bridge voltage ``v_ab / V_bus``, piecewise constant.

    Attributes
    ----------
    period : float
        Length of the window [s] (``periods`` output periods).
    periods : int
        Output periods in the window [unitless].
    carrier : float or None
        Carrier frequency synthesised [Hz].
    times : numpy.ndarray
        Edge times in ``[0, period)``, sorted, distinct [s].
    levels : numpy.ndarray
        Level after each edge, in units of the bus voltage (−1, 0 or +1) [unitless].
    level0 : float
        Level before the first edge [unitless].
    """

    period: float
    periods: int
    carrier: float | None
    times: "np.ndarray"
    levels: "np.ndarray"
    level0: float


def bridge_edges(kind: str, f0: float, *, index: float | None, carrier: float | None,
                 notch: float, dead_time_high: float, dead_time_low: float,
                 current_lag: float, min_pulse: float,
                 zero_state: str = pattern.DEFAULT_ZERO_STATE) -> BridgeEdges:
    """The edges of the bridge voltage over one window, as :func:`reviewer.physics.waveform.
    synthesise` builds them before its FFT (both from :func:`reviewer.physics.pattern.
    bridge_events`).

    Parameters
    ----------
    kind : str
        Modulation kind.
    f0 : float
        Output frequency [Hz].
    index : float or None
        Modulation index [unitless] (sine PWM).
    carrier : float or None
        Carrier frequency [Hz] (sine PWM).
    notch : float
        Quasi-square notch half-angle [rad].
    dead_time_high, dead_time_low : float
        Dead time before a high / low switch turns on [s].
    current_lag : float
        Lag of the leg A current behind the reference [rad].
    min_pulse : float
        Shortest pulse the controller emits [s].
    zero_state : {"low_sides", "phase_shifted"}
        Quasi-square: which switches hold the zero state.

    Returns
    -------
    BridgeEdges

    References
    ----------
    Holmes & Lipo, *Pulse Width Modulation for Power Converters*, 2003, ch. 3 and 5; Mohan,
    Undeland & Robbins, *Power Electronics*, 3rd ed., 2003, ch. 8 (blanking time).
    """
    import numpy as np

    ev = pattern.bridge_events(kind, f0, index=index, carrier=carrier,  # type: ignore[arg-type]
                               notch=notch, zero_state=zero_state,  # type: ignore[arg-type]
                               dead_time_high=dead_time_high, dead_time_low=dead_time_low,
                               current_lag=current_lag, min_pulse=min_pulse)
    period, q, fc = ev.period, ev.periods, ev.carrier
    t_all, s_all, level0 = ev.times, ev.steps, ev.level0
    # edges of the two legs at the same instant are one step of the bridge voltage
    new = np.concatenate([[True], np.diff(t_all) > 1e-12 * period]) if t_all.size else \
        np.zeros(0, dtype=bool)
    ut = t_all[new]
    us = np.bincount(np.cumsum(new) - 1, weights=s_all, minlength=ut.size) if t_all.size else s_all
    keep = np.abs(us) > 1e-9
    ut, us = ut[keep], us[keep]
    return BridgeEdges(period, q, fc, ut, level0 + np.cumsum(us), level0)


def ramp_half_width(edges: BridgeEdges, longest: float = 5e-9) -> float:
    """Half the rise time given to each edge of the PWL source [s].

    At most ``longest``, and at most a quarter of the shortest interval between edges
    (including the one across the window's end), so that ramps never overlap. A ramp centred
    on the edge keeps each pulse's volt-seconds.
    """
    import numpy as np

    if edges.times.size == 0:
        return longest
    gaps = np.diff(np.append(edges.times, edges.times[0] + edges.period))
    return float(min(longest, 0.25 * float(np.min(gaps))))


def pwl_points(edges: BridgeEdges, v_bus: float, settle: float, windows: int,
               half_width: float) -> list[tuple[float, float]]:
    """Time-voltage points of the PWL source: ``settle`` seconds of the waveform's end, then
    ``windows`` whole windows.

    Time 0 of the source is ``settle`` before the start of a window, and every time is delayed
    by ``half_width`` so that the first edge ramps from no earlier than 0.

    Parameters
    ----------
    edges : BridgeEdges
    v_bus : float
        Bus voltage [V].
    settle : float
        Time before the first whole window [s] (0 for none).
    windows : int
        Whole windows after it [unitless].
    half_width : float
        Half the ramp of each edge [s], see :func:`ramp_half_width`.

    Returns
    -------
    list of (float, float)
        ``(time [s], voltage [V])``, times strictly increasing.
    """
    import numpy as np

    period = edges.period
    before = np.concatenate([[edges.level0], edges.levels[:-1]])
    after = edges.levels
    first = -math.ceil(settle / period) if settle > 0 else 0
    ts, v0, v1 = [], [], []
    for k in range(first, windows):
        ts.append(edges.times + k * period)
        v0.append(before)
        v1.append(after)
    t = np.concatenate(ts) if ts else np.zeros(0)
    b = np.concatenate(v0) if v0 else np.zeros(0)
    a = np.concatenate(v1) if v1 else np.zeros(0)
    keep = t >= -settle
    t, b, a = t[keep] + settle + half_width, b[keep], a[keep]
    pts: list[tuple[float, float]] = []
    for tk, lb, la in zip(t.tolist(), (b * v_bus).tolist(), (a * v_bus).tolist()):
        pts.append((tk - half_width, lb))
        pts.append((tk + half_width, la))
    if not pts:
        return [(0.0, edges.level0 * v_bus)]
    if pts[0][0] > 0:
        pts.insert(0, (0.0, pts[0][1]))
    return pts
