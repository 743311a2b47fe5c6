"""The switching pattern: which switch of the full bridge is on when, and what follows from it.

One description of the four switches (high and low side of legs A and B) serves every module
that needs to know the pattern: the waveform synthesis, the current each device carries and
switches, the bootstrap on-time and refresh, and the minimum-pulse check.

Two views of the same pattern are kept here:

* **Gate signals in time** (:func:`leg_intervals`, :func:`gate_signals`, :func:`bridge_events`):
  the commanded on-intervals of each leg over one synthesis window, edge times solved to
  machine precision, short pulses dropped, the dead time inserted before each switch turns on,
  and the leg voltages that result with the current's direction in the dead time.
* **Local averages over the output cycle** (:func:`duty`, :func:`conduction`,
  :func:`hard_switching`, :func:`narrow_pulse_fraction`): the on-fraction of every switch
  within a carrier period as a function of the output phase ``θ`` (the duty-cycle functions of
  sine-triangle modulation, or the 0/1 states of a stepped wave), integrated exactly against the
  load current. The tests check these against the time-domain gate signals.

Conventions
-----------
* Time: the reference is ``M · cos(ω₀t)``; the triangular carrier (−1 … +1) has its positive
  peak at ``t = 0``; the square wave is ``+V`` for ``|ω₀t| < π/2``.
* Output phase: ``θ = ω₀t + π/2``, so the reference is ``M · sin θ`` and the bridge voltage's
  fundamental is in sine phase; the load current is ``i = I_pk · sin(θ − φ)`` out of leg A
  and into leg B.
* A leg is "on" when its high side conducts; leg A's high-side duty is ``d_A``, its low side's
  ``1 − d_A`` (dead time neglected in the local averages).

Modulations
-----------
* ``square``: leg A high for ``0 < θ < π``, leg B its complement.
* ``quasi_square`` with a zero interval of ``2α`` at each zero crossing, two ways of making
  the zero state (the design chooses, ``modulation.zero_state``):

  - ``low_sides`` (both low sides hold the zero state; the usual choice with bootstrap drives,
    which then refresh in every zero interval): leg A high for ``α < θ < π − α``, leg B high
    for ``π + α < θ < 2π − α``. The high sides conduct for ``π − 2α`` per cycle, the low sides
    for ``π + 2α``.
  - ``phase_shifted`` (each leg a square wave, A leading by ``α``, B lagging by ``α``; the zero
    state alternates between both high sides and both low sides): leg A high for
    ``α < θ < π + α``, leg B high for ``π − α < θ < 2π − α``. Every switch conducts for half a
    cycle.

  The bridge voltage is the same for both; the currents per switch and the high side's
  longest on-time are not.
* ``spwm_bipolar``: ``d_A = (1 + M sin θ)/2``, leg B the complement of A.
* ``spwm_unipolar``: ``d_A = (1 + M sin θ)/2``, ``d_B = (1 − M sin θ)/2``.
* ``spwm_level_shifted``: two carriers stacked in ``[0, 1]`` and ``[−1, 0]``; leg A follows the
  upper one, ``d_A = clip(M sin θ, 0, 1)``, and rests on its low side for the negative half
  cycle, leg B the mirror, ``d_B = clip(−M sin θ, 0, 1)``. Each leg switches only in its own
  half cycle, so the high and low sides carry and switch different currents.

Duties are clipped to ``[0, 1]`` (over-modulation).

References
----------
D. G. Holmes and T. A. Lipo, *Pulse Width Modulation for Power Converters: Principles and
Practice*, IEEE Press / Wiley, 2003, ch. 3 (naturally sampled PWM, duty-cycle functions of
single-phase modulations) and ch. 5 (level-shifted carriers); chapter numbers from memory.
N. Mohan, T. M. Undeland and W. P. Robbins, *Power Electronics: Converters, Applications and
Design*, 3rd ed., Wiley, 2003, ch. 8 (square-wave and voltage-cancellation (quasi-square)
inverters, blanking time; chapter from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from fractions import Fraction
from functools import lru_cache
from typing import Callable, Literal

import numpy as np

from reviewer.physics.arrays import arr, out

Kind = Literal["square", "quasi_square", "spwm_bipolar", "spwm_unipolar", "spwm_level_shifted"]
KINDS: tuple[str, ...] = ("square", "quasi_square", "spwm_bipolar", "spwm_unipolar",
                          "spwm_level_shifted")
PWM_KINDS: tuple[str, ...] = ("spwm_bipolar", "spwm_unipolar", "spwm_level_shifted")
STEPPED_KINDS: tuple[str, ...] = ("square", "quasi_square")

ZeroState = Literal["low_sides", "phase_shifted"]
ZERO_STATES: tuple[str, ...] = ("low_sides", "phase_shifted")
DEFAULT_ZERO_STATE: ZeroState = "low_sides"

ROUNDING = 1e-12
"""Pulses and gaps shorter than this share of the window are rounding, not pulses [unitless]."""

SWITCHES: tuple[str, ...] = ("a_high", "a_low", "b_high", "b_low")
"""The four switches of the bridge, by leg and position."""


def _zero_state(zero_state: str) -> str:
    if zero_state not in ZERO_STATES:
        raise ValueError(f"quasi-square zero state must be one of {', '.join(ZERO_STATES)}, "
                         f"not {zero_state!r}")
    return zero_state


# ============================================================================================
# Gate signals in time
# ============================================================================================

def _crossings(gain: float, offset: float, index: float, w0: float, tc: float,
               p: int) -> tuple[np.ndarray, np.ndarray]:
    """Natural-sampling edges of ``ref(t) = gain · M · cos(w0 t) + offset`` against the carrier.

    The leg is on while ``ref > carrier``; in carrier period ``k`` it turns on on the falling
    slope (``carrier = 1 − 4u``) and off on the rising slope (``carrier = 4u − 3``), with
    ``u = (t − k·tc) / tc``. Each edge solves ``t = k·tc + tc·(1 ∓ ref(t))/4`` (``ref``
    clipped to ±1), which has one root per slope while ``π·M·|gain|·f0/(2·f_c) < 1``.
    """
    t0 = np.arange(p, dtype=float) * tc
    amp = gain * index
    q = tc / 4

    def ref(t: np.ndarray) -> tuple[np.ndarray, np.ndarray]:
        c = np.cos(w0 * t)
        r = amp * c + offset
        inside = np.abs(r) < 1.0
        slope = np.where(inside, -amp * w0 * np.sin(w0 * t), 0.0)
        return np.clip(r, -1.0, 1.0), slope

    # Newton's method on g(t) = t − k·tc − tc·(1 ∓ ref(t))/4, whose derivative
    # 1 ± tc·ref'(t)/4 stays within (0.1, 1.9) by the index check in leg_intervals
    rise = t0 + q
    fall = t0 + 3 * q
    tol = max(1e-13 * tc, 16 * np.finfo(float).eps * p * tc)
    for _ in range(50):
        r, dr = ref(rise)
        step_r = (rise - t0 - q * (1.0 - r)) / (1.0 + q * dr)
        r, dr = ref(fall)
        step_f = (fall - t0 - q * (3.0 + r)) / (1.0 - q * dr)
        rise = rise - step_r
        fall = fall - step_f
        if max(np.max(np.abs(step_r)), np.max(np.abs(step_f))) < tol:
            break
    return rise, fall


def union_periodic(a: np.ndarray, b: np.ndarray,
                   period: float) -> tuple[np.ndarray, np.ndarray, bool]:
    """Union of intervals ``[a, b)`` on a circle of length ``period``.

    Returns sorted starts in ``[0, period)``, their ends (possibly beyond ``period``), and
    whether the union covers the whole circle.
    """
    keep = b > a
    a, b = a[keep], b[keep]
    if a.size == 0:
        return a, b, False
    if np.max(b - a) >= period:
        return a[:0], b[:0], True
    shift = np.floor(a / period) * period
    a, b = a - shift, b - shift
    order = np.argsort(a, kind="stable")
    a, b = a[order], b[order]
    reach = np.maximum.accumulate(b)
    start = np.ones(a.size, dtype=bool)
    start[1:] = a[1:] > reach[:-1]
    idx = np.flatnonzero(start)
    ua = a[idx]
    ub = np.append(reach[idx[1:] - 1], reach[-1])
    # the last interval may reach past the period into the first ones
    while ua.size > 1 and ub[-1] >= ua[0] + period:
        ub[-1] = max(ub[-1], ub[0] + period)
        ua, ub = ua[1:], ub[1:]
    if ua.size == 1 and ub[0] - ua[0] >= period:
        return ua[:0], ub[:0], True
    if ua.size and ub[-1] - ua[-1] >= period:
        return ua[:0], ub[:0], True
    return ua, ub, False


def gaps(a: np.ndarray, b: np.ndarray, period: float) -> np.ndarray:
    """Off-gap lengths between consecutive sorted intervals on the circle [s]."""
    if a.size == 0:
        return a
    nxt = np.append(a[1:], a[0] + period)
    return nxt - b


def drop_short(a: np.ndarray, b: np.ndarray, full: bool, period: float,
               min_pulse: float) -> tuple[np.ndarray, np.ndarray, bool]:
    """Remove on-pulses shorter than ``min_pulse`` and fill off-gaps shorter than it.

    A controller that cannot emit pulses shorter than ``min_pulse`` is modelled as dropping
    them (common practice; some controllers stretch instead of dropping).
    """
    if full or a.size == 0 or min_pulse <= 0:
        return a, b, full
    keep = (b - a) >= min_pulse
    a, b = a[keep], b[keep]
    if a.size == 0:
        return a, b, False
    g = gaps(a, b, period)
    short = g < min_pulse
    b = np.where(short, np.append(a[1:], a[0] + period), b)
    return union_periodic(a, b, period)


def apply_dead_time(a: np.ndarray, b: np.ndarray, full: bool, period: float,
                    current_sign_at: Callable[[np.ndarray], np.ndarray], dead_high: float,
                    dead_low: float) -> tuple[np.ndarray, np.ndarray, bool]:
    """The leg voltage's high intervals after dead time, by the leg current's sign.

    During the dead time both switches are off and a diode carries the current: current out of
    the leg (> 0) keeps the leg low, so a rising edge is delayed by the high side's dead time;
    current into the leg keeps it high, so a falling edge is delayed by the low side's
    (Mohan, Undeland & Robbins, §8-6 "effect of blanking time", section number from memory).
    """
    if full or a.size == 0 or (dead_high <= 0 and dead_low <= 0):
        return a, b, full
    sa = current_sign_at(a)
    sb = current_sign_at(b)
    a2 = a + np.where(sa > 0, dead_high, 0.0)
    b2 = b + np.where(sb < 0, dead_low, 0.0)
    return union_periodic(a2, b2, period)


def leg_intervals(kind: Kind, f0: float, *, index: float | None = None,
                  carrier: float | None = None, notch: float = 0.0,
                  zero_state: ZeroState = DEFAULT_ZERO_STATE,
                  disposition: Literal["pd", "pod"] = "pd", max_periods: int = 8,
                  ) -> tuple[tuple[np.ndarray, np.ndarray], tuple[np.ndarray, np.ndarray],
                             int, float | None]:
    """Commanded on-intervals (high side on) of legs A and B over the synthesis window.

    Parameters
    ----------
    kind : str
        Modulation: ``square``, ``quasi_square``, ``spwm_bipolar`` (two-level),
        ``spwm_unipolar`` (three-level, both legs against one carrier with opposite
        references) or ``spwm_level_shifted`` (three-level, two carriers stacked in
        ``[0, 1]`` and ``[−1, 0]``; leg A follows the upper one, leg B the lower one).
    f0 : float
        Output frequency [Hz].
    index : float, optional
        Modulation index ``M`` (reference peak over carrier peak) [unitless], PWM only.
    carrier : float, optional
        Carrier frequency [Hz], PWM only.
    notch : float
        Quasi-square zero-voltage half-angle ``α`` each side of the zero crossing [rad].
    zero_state : {"low_sides", "phase_shifted"}
        Quasi-square: which switches hold the zero state (see the module's notes).
    disposition : {"pd", "pod"}
        Level-shifted carriers in phase (``pd``) or in phase opposition (``pod``) [unitless].
    max_periods : int
        Largest number of output periods in the window [unitless].

    Returns
    -------
    tuple
        ``((a_start, a_end), (b_start, b_end), periods, carrier_used)``: interval starts and
        ends [s] (ends may pass the window end and wrap), the output periods in the window
        [unitless] and the carrier synthesised [Hz] (``None`` without a carrier).

    Notes
    -----
    Window: the ratio ``f_c / f₀`` is replaced by its best rational approximation ``p / q``
    with ``q ≤ max_periods``, and ``q`` output periods (``p`` carrier periods) are synthesised.

    References
    ----------
    Holmes & Lipo (2003), ch. 3 and 5; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    if f0 <= 0:
        raise ValueError("output frequency must be positive")
    t0 = 1.0 / f0
    if kind == "square":
        return ((np.array([-t0 / 4]), np.array([t0 / 4])),
                (np.array([t0 / 4]), np.array([3 * t0 / 4])), 1, None)
    if kind == "quasi_square":
        if not 0.0 <= notch < math.pi / 2:
            raise ValueError("notch half-angle must lie in [0, π/2)")
        s = notch / (2 * math.pi * f0)
        if _zero_state(zero_state) == "phase_shifted":
            # A leads a square wave by α, B lags its complement by α
            return ((np.array([-t0 / 4 + s]), np.array([t0 / 4 + s])),
                    (np.array([t0 / 4 - s]), np.array([3 * t0 / 4 - s])), 1, None)
        # both low sides hold the zero state: each high side on for the active interval only
        return ((np.array([-t0 / 4 + s]), np.array([t0 / 4 - s])),
                (np.array([t0 / 4 + s]), np.array([3 * t0 / 4 - s])), 1, None)
    if kind not in PWM_KINDS:
        raise ValueError(f"unknown modulation kind {kind!r}")
    if index is None or carrier is None:
        raise ValueError("sine PWM needs a modulation index and a carrier frequency")
    if index < 0:
        raise ValueError("modulation index must not be negative")
    ratio = carrier / f0
    if ratio < 5:
        raise ValueError("carrier must be at least five times the output frequency for sine PWM")
    gain_max = 2.0 if kind == "spwm_level_shifted" else 1.0
    if math.pi * index * gain_max / (2 * ratio) >= 0.9:
        raise ValueError("modulation index too large for this carrier ratio")
    frac = Fraction(ratio).limit_denominator(max_periods)
    p, q = frac.numerator, frac.denominator
    fc = p / q * f0
    tc = 1.0 / fc
    w0 = 2 * math.pi * f0
    if kind == "spwm_bipolar":
        ra, fa = _crossings(1.0, 0.0, index, w0, tc, p)
        a = (ra, fa)
        b = (fa, np.append(ra[1:], ra[0] + p * tc))
    elif kind == "spwm_unipolar":
        a = _crossings(1.0, 0.0, index, w0, tc, p)
        b = _crossings(-1.0, 0.0, index, w0, tc, p)
    else:
        # upper carrier (c+1)/2: A on while r > (c+1)/2  <=>  2r − 1 > c
        a = _crossings(2.0, -1.0, index, w0, tc, p)
        if disposition == "pd":
            # lower carrier (c−1)/2: B on while r < (c−1)/2  <=>  not (2r + 1 > c)
            rb, fb = _crossings(2.0, 1.0, index, w0, tc, p)
            b = (fb, np.append(rb[1:], rb[0] + p * tc))
        elif disposition == "pod":
            # lower carrier (−c−1)/2: B on while r < (−c−1)/2  <=>  −2r − 1 > c
            b = _crossings(-2.0, -1.0, index, w0, tc, p)
        else:
            raise ValueError(f"unknown carrier disposition {disposition!r}")
    return a, b, q, fc


@dataclass(frozen=True, eq=False)
class Intervals:
    """On-intervals of one switch on a circle of length ``period``.

    Attributes
    ----------
    start, end : numpy.ndarray
        Sorted starts in ``[0, period)`` and their ends (an end may pass ``period``) [s].
    always_on : bool
        The switch is on for the whole window (``start`` and ``end`` then empty).
    period : float
        Window length [s].
    """

    start: np.ndarray = field(repr=False)
    end: np.ndarray = field(repr=False)
    always_on: bool
    period: float

    def on_times(self) -> np.ndarray:
        """Length of every on-interval [s] (the whole window when always on)."""
        return np.array([self.period]) if self.always_on else self.end - self.start

    def off_times(self) -> np.ndarray:
        """Length of every off-interval [s] (the whole window when never on)."""
        if self.always_on:
            return np.empty(0)
        if self.start.size == 0:
            return np.array([self.period])
        return gaps(self.start, self.end, self.period)

    def state(self, t: np.ndarray) -> np.ndarray:
        """1 where the switch is on at times ``t`` [s], else 0 [unitless]."""
        t = np.mod(np.asarray(t, dtype=float), self.period)
        if self.always_on:
            return np.ones_like(t)
        on = np.zeros(t.shape, dtype=bool)
        if self.start.size == 0:
            return on.astype(float)
        for shift in (0.0, self.period):
            k = np.searchsorted(self.start, t + shift, side="right") - 1
            ok = k >= 0
            on |= ok & (t + shift < self.end[np.where(ok, k, 0)])
        return on.astype(float)


@dataclass(frozen=True, eq=False)
class GateSignals:
    """The gate signals of the four switches over one synthesis window.

    Attributes
    ----------
    period : float
        Window length [s] (``periods`` output periods).
    periods : int
        Output periods in the window [unitless].
    carrier : float or None
        Carrier synthesised [Hz] (``None`` for square and quasi-square).
    switches : dict of str to Intervals
        On-intervals of ``a_high``, ``a_low``, ``b_high`` and ``b_low``.
    """

    period: float
    periods: int
    carrier: float | None
    switches: dict[str, Intervals] = field(repr=False)

    def longest_on(self, switch: str) -> float:
        """Longest continuous on-time of ``switch`` [s]."""
        t = self.switches[switch].on_times()
        return float(np.max(t)) if t.size else 0.0

    def shortest_off(self, switch: str) -> float:
        """Shortest off-time of ``switch`` [s] (``inf`` when it never turns off)."""
        t = self.switches[switch].off_times()
        return float(np.min(t)) if t.size else math.inf

    def shortest_on(self, switch: str) -> float:
        """Shortest on-pulse of ``switch`` [s] (``inf`` when it never turns on)."""
        t = self.switches[switch].on_times()
        return float(np.min(t)) if t.size else math.inf


@lru_cache(maxsize=128)
def _commanded_legs(kind: Kind, f0: float, *, index: float | None, carrier: float | None,
                    notch: float, zero_state: ZeroState, min_pulse: float,
                    disposition: Literal["pd", "pod"], max_periods: int):
    """The commanded on-intervals of both legs (short pulses dropped) and the pulse widths.

    Cached on its inputs: the dead time and the current direction act afterwards, so every run
    that differs only in those (corners, samples) shares one pattern. The arrays are read-only.
    """
    (aa, ab), (ba, bb), q, fc = leg_intervals(kind, f0, index=index, carrier=carrier,
                                              notch=notch, zero_state=zero_state,
                                              disposition=disposition,
                                              max_periods=max_periods)
    period = q / f0
    legs, pulses = [], []
    for s, e in ((aa, ab), (ba, bb)):
        a, b, full = union_periodic(s, e, period)
        # a clipped reference meets the carrier's end at the period boundary: the pulse or gap
        # left there is rounding (~1e-19 s), not a pulse
        a, b, full = drop_short(a, b, full, period, ROUNDING * period)
        if not full and a.size:
            pulses.append(b - a)
            pulses.append(gaps(a, b, period))
        legs.append(drop_short(a, b, full, period, min_pulse))
    for x in [*pulses, *(v for leg in legs for v in leg[:2])]:
        x.setflags(write=False)
    return tuple(legs), tuple(pulses), period, q, fc


def _circle(start: np.ndarray, end: np.ndarray, period: float) -> Intervals:
    """Non-empty intervals with their starts wrapped into ``[0, period)``, sorted."""
    keep = end > start
    start, end = start[keep], end[keep]
    wrap = np.floor(start / period) * period
    start, end = start - wrap, end - wrap
    order = np.argsort(start, kind="stable")
    return Intervals(start[order], end[order], False, period)


def gate_signals(kind: Kind, f0: float, *, index: float | None = None,
                 carrier: float | None = None, notch: float = 0.0,
                 zero_state: ZeroState = DEFAULT_ZERO_STATE, dead_time_high: float = 0.0,
                 dead_time_low: float = 0.0, min_pulse: float = 0.0,
                 disposition: Literal["pd", "pod"] = "pd", max_periods: int = 8) -> GateSignals:
    """Gate signals of the four switches: the commanded pattern with dead time inserted.

    Each leg's commanded on-interval ``[a, b)`` (short pulses dropped first) gives its high
    side's gate ``[a + t_dead,high, b)`` and its low side's ``[b + t_dead,low, a_next)``; a
    pulse no longer than the dead time vanishes.

    Parameters
    ----------
    kind, f0, index, carrier, notch, zero_state, disposition, max_periods
        As :func:`leg_intervals`.
    dead_time_high : float
        Dead time before a high-side switch turns on [s].
    dead_time_low : float
        Dead time before a low-side switch turns on [s].
    min_pulse : float
        Shortest pulse the controller emits; shorter ones are dropped [s].

    Returns
    -------
    GateSignals

    References
    ----------
    Holmes & Lipo (2003), ch. 3 and 5; Mohan, Undeland & Robbins (2003), ch. 8 (blanking time).
    """
    legs, _, period, q, fc = _commanded_legs(kind, f0, index=index, carrier=carrier,
                                             notch=notch, zero_state=zero_state,
                                             min_pulse=min_pulse, disposition=disposition,
                                             max_periods=max_periods)
    sw: dict[str, Intervals] = {}
    empty = np.empty(0)
    for name, (a, b, full) in zip(("a", "b"), legs):
        if full:
            sw[f"{name}_high"] = Intervals(empty, empty, True, period)
            sw[f"{name}_low"] = Intervals(empty, empty, False, period)
            continue
        if a.size == 0:
            sw[f"{name}_high"] = Intervals(empty, empty, False, period)
            sw[f"{name}_low"] = Intervals(empty, empty, True, period)
            continue
        nxt = np.append(a[1:], a[0] + period)
        hs, he = a + max(dead_time_high, 0.0), b
        ls, le = b + max(dead_time_low, 0.0), nxt
        sw[f"{name}_high"] = _circle(hs, he, period)
        sw[f"{name}_low"] = _circle(ls, le, period)
    return GateSignals(period, q, fc, sw)


@dataclass(frozen=True, eq=False)
class BridgeEvents:
    """The steps of the bridge voltage ``v_ab / V_bus`` over one window.

    Attributes
    ----------
    period : float
        Window length [s].
    periods : int
        Output periods in the window [unitless].
    carrier : float or None
        Carrier synthesised [Hz].
    times : numpy.ndarray
        Step times in ``[0, period)``, sorted (two legs may step at the same instant) [s].
    steps : numpy.ndarray
        Level change at each time, ±1 [unitless].
    level0 : float
        Level just before ``t = 0`` [unitless].
    pulses : numpy.ndarray
        Widths of the commanded on-pulses and off-gaps of both legs, before minimum-pulse
        dropping and dead time [s].
    """

    period: float
    periods: int
    carrier: float | None
    times: np.ndarray = field(repr=False)
    steps: np.ndarray = field(repr=False)
    level0: float
    pulses: np.ndarray = field(repr=False)


def _events(a: np.ndarray, b: np.ndarray, full: bool, period: float,
            weight: float) -> tuple[np.ndarray, np.ndarray, float]:
    """Edge times in ``[0, period)``, their level steps and the level just before ``t = 0``."""
    if full:
        return np.empty(0), np.empty(0), weight
    am = np.mod(a, period)
    bm = np.mod(b, period)
    level0 = weight * float(np.count_nonzero(am > bm))
    times = np.concatenate([am, bm])
    steps = np.concatenate([np.full(am.size, weight), np.full(bm.size, -weight)])
    return times, steps, level0


def bridge_events(kind: Kind, f0: float, *, index: float | None = None,
                  carrier: float | None = None, notch: float = 0.0,
                  zero_state: ZeroState = DEFAULT_ZERO_STATE, dead_time_high: float = 0.0,
                  dead_time_low: float = 0.0, current_lag: float = 0.0,
                  min_pulse: float = 0.0, disposition: Literal["pd", "pod"] = "pd",
                  max_periods: int = 8) -> BridgeEvents:
    """The bridge voltage's steps: the legs' voltages with the dead time set by the current.

    The current of leg A is taken as the fundamental load current ``cos(ω₀t − φ)`` (``φ`` =
    ``current_lag``), leg B carries the opposite; see :func:`apply_dead_time`.

    Parameters
    ----------
    kind, f0, index, carrier, notch, zero_state, disposition, max_periods
        As :func:`leg_intervals`.
    dead_time_high, dead_time_low, min_pulse
        As :func:`gate_signals` [s].
    current_lag : float
        Lag of leg A's current behind the reference [rad].

    Returns
    -------
    BridgeEvents

    References
    ----------
    Holmes & Lipo (2003), ch. 3 and 5; Mohan, Undeland & Robbins (2003), §8-6 (from memory).
    """
    legs, pulses, period, q, fc = _commanded_legs(kind, f0, index=index, carrier=carrier,
                                                  notch=notch, zero_state=zero_state,
                                                  min_pulse=min_pulse,
                                                  disposition=disposition,
                                                  max_periods=max_periods)
    w0 = 2 * math.pi * f0
    times, steps, level0 = [], [], 0.0
    for sign, (a, b, full) in zip((1.0, -1.0), legs):
        def current_sign(t: np.ndarray, sign: float = sign) -> np.ndarray:
            return np.sign(sign * np.cos(w0 * t - current_lag))

        a, b, full = apply_dead_time(a, b, full, period, current_sign,
                                     dead_time_high, dead_time_low)
        t, s, l0 = _events(a, b, full, period, sign)
        times.append(t)
        steps.append(s)
        level0 += l0
    t_all = np.concatenate(times)
    s_all = np.concatenate(steps)
    order = np.argsort(t_all, kind="stable")
    widths = np.concatenate(pulses) if pulses else np.empty(0)
    return BridgeEvents(period, q, fc, t_all[order], s_all[order], level0, widths)


# ============================================================================================
# Local averages over the output cycle
# ============================================================================================

_PWM_LEGS: dict[str, tuple[tuple[float, float], tuple[float, float]]] = {
    # (gain, offset) of each leg's duty d = clip(gain · M sin θ + offset, 0, 1), legs A and B;
    # bipolar and unipolar share their local averages (B = 1 − A) and differ in the carrier
    "spwm_bipolar": ((0.5, 0.5), (-0.5, 0.5)),
    "spwm_unipolar": ((0.5, 0.5), (-0.5, 0.5)),
    "spwm_level_shifted": ((1.0, 0.0), (-1.0, 0.0)),
}


def duty(kind: Kind, theta, index=1.0, notch=0.0,
         zero_state: ZeroState = DEFAULT_ZERO_STATE) -> tuple[np.ndarray, np.ndarray]:
    """Local-average high-side on-fraction of legs A and B at output phase ``θ`` [unitless].

    The low side of each leg is on for the rest (``1 − d``); dead time is neglected.

    Parameters
    ----------
    kind : str
        Modulation kind.
    theta : float or numpy.ndarray
        Output phase, reference ``M sin θ`` [rad].
    index : float
        Modulation index ``M`` [unitless] (sine PWM).
    notch : float
        Quasi-square zero-interval half-angle ``α`` [rad].
    zero_state : {"low_sides", "phase_shifted"}
        Quasi-square zero state.

    Returns
    -------
    tuple of numpy.ndarray
        ``(d_A, d_B)`` in ``[0, 1]``.

    References
    ----------
    Holmes & Lipo (2003), ch. 3 (duty-cycle functions (1 ± M sin θ)/2) and ch. 5
    (level-shifted carriers); Mohan, Undeland & Robbins (2003), ch. 8.
    """
    th = np.mod(arr(theta), 2 * np.pi)
    m, a = arr(index), arr(notch)
    if kind == "square":
        da = (th < np.pi).astype(float)
        return da, 1.0 - da
    if kind == "quasi_square":
        if _zero_state(zero_state) == "phase_shifted":
            da = ((th > a) & (th < np.pi + a)).astype(float)
            db = ((th > np.pi - a) & (th < 2 * np.pi - a)).astype(float)
        else:
            da = ((th > a) & (th < np.pi - a)).astype(float)
            db = ((th > np.pi + a) & (th < 2 * np.pi - a)).astype(float)
        return da, db
    if kind not in _PWM_LEGS:
        raise ValueError(f"unknown modulation {kind!r}")
    r = m * np.sin(th)
    (ga, ca), (gb, cb) = _PWM_LEGS[kind]
    return np.clip(ga * r + ca, 0.0, 1.0), np.clip(gb * r + cb, 0.0, 1.0)


# Gauss-Legendre nodes on [-1, 1]: the integrands are smooth between break points
_GL_X, _GL_W = np.polynomial.legendre.leggauss(24)


def cycle_mean(f: Callable[[np.ndarray], np.ndarray], breaks: np.ndarray) -> np.ndarray:
    """Mean over ``θ ∈ [0, 2π)`` of ``f(θ)``, piecewise smooth between ``breaks`` [as f].

    ``breaks`` has the break angles along its last axis (any order, any value: they are taken
    modulo 2π); leading axes broadcast with ``f``'s result. Composite 24-point Gauss-Legendre
    quadrature on every piece: exact to rounding for the trigonometric polynomials of low
    order met here.

    References
    ----------
    Gauss-Legendre quadrature (numpy.polynomial.legendre.leggauss).
    """
    b = np.mod(np.asarray(breaks, dtype=float), 2 * np.pi)
    shape = b.shape[:-1]
    b = np.concatenate([np.zeros(shape + (1,)), b, np.full(shape + (1,), 2 * np.pi)], axis=-1)
    b = np.sort(b, axis=-1)
    lo, hi = b[..., :-1, None], b[..., 1:, None]
    th = lo + (hi - lo) * (_GL_X + 1.0) / 2.0
    vals = np.broadcast_to(f(th), th.shape)
    return np.sum(vals * (hi - lo) / 2.0 * _GL_W, axis=(-2, -1)) / (2 * np.pi)


def _breaks(kind: str, phase, index, notch) -> np.ndarray:
    """Angles where a duty, a switching state or the current's sign changes [rad]."""
    phi, m, a = np.broadcast_arrays(arr(phase), arr(index), arr(notch))
    with np.errstate(divide="ignore"):
        clip = np.where(m > 1.0, np.arcsin(np.minimum(1.0 / np.where(m > 0, m, 1.0), 1.0)), 0.0)
    pts = [phi, phi + np.pi, np.zeros_like(phi), np.full_like(phi, np.pi),
           clip, np.pi - clip, np.pi + clip, -clip]
    if kind == "quasi_square":
        pts += [a, np.pi - a, np.pi + a, -a]
    return np.stack(pts, axis=-1)


def _on_grid(x: np.ndarray) -> np.ndarray:
    """A per-point parameter shaped to broadcast against :func:`cycle_mean`'s quadrature grid
    (points × pieces × nodes); a scalar stays as it is."""
    return x[..., None, None] if x.ndim else x


def on_share(kind: Kind, *, index=1.0, notch=0.0,
             zero_state: ZeroState = DEFAULT_ZERO_STATE) -> dict[str, object]:
    """Share of the output period each switch is on, (1/2π)·∫ d(θ) dθ [unitless].

    Square: ½ for every switch; quasi-square with the zero state on the low sides:
    (π − 2α)/(2π) for the high sides, (π + 2α)/(2π) for the low sides; phase-shifted legs: ½.

    References
    ----------
    Holmes & Lipo (2003), ch. 3; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    mi, ai = np.broadcast_arrays(arr(index), arr(notch))
    bk = _breaks(kind, 0.0, mi, ai)
    mg, ag = _on_grid(mi), _on_grid(ai)
    da = cycle_mean(lambda th: duty(kind, th, mg, ag, zero_state)[0], bk)
    db = cycle_mean(lambda th: duty(kind, th, mg, ag, zero_state)[1], bk)
    return {"a_high": out(da), "a_low": out(1.0 - da), "b_high": out(db), "b_low": out(1.0 - db)}


@dataclass(frozen=True)
class Conduction:
    """RMS and mean channel current of the four switches for a sinusoidal load current [A].

    The mean is in the sourcing (drain-to-source for a high side, leg-to-rail for a low side)
    direction, so its sign says which way the switch's net current flows; the magnitude is what
    the conduction-loss figures use.
    """

    rms: dict[str, object]
    mean: dict[str, object]


def conduction(kind: Kind, i_peak, phase=0.0, *, index=1.0, notch=0.0,
               zero_state: ZeroState = DEFAULT_ZERO_STATE) -> Conduction:
    """RMS and mean channel current of every switch, I_rms² = (1/2π)·∫ d(θ)·i(θ)² dθ.

    Each switch carries the load current while it is on (channels conduct both ways, so the
    body diode carries only in the dead time, neglected here); the carrier is taken as far
    above the output frequency (local averages).

    Parameters
    ----------
    kind : str
        Modulation kind.
    i_peak : float or numpy.ndarray
        Load current amplitude [A].
    phase : float or numpy.ndarray
        Load current lag φ behind the bridge voltage's fundamental [rad].
    index : float
        Modulation index [unitless] (over-modulation clips the duties).
    notch : float
        Quasi-square zero-interval half-angle [rad].
    zero_state : {"low_sides", "phase_shifted"}
        Quasi-square zero state.

    Returns
    -------
    Conduction
        Per switch RMS [A] and mean [A].

    References
    ----------
    Holmes & Lipo (2003), ch. 3 (duty-cycle functions); local-average RMS as in Mohan, Undeland
    & Robbins (2003) §8-3 (from memory).
    """
    i = arr(i_peak)
    phi, mi, ai = np.broadcast_arrays(arr(phase), arr(index), arr(notch))
    bk = _breaks(kind, phi, mi, ai)
    p, mg, ag = _on_grid(phi), _on_grid(mi), _on_grid(ai)

    def parts(th: np.ndarray) -> dict[str, np.ndarray]:
        da, db = duty(kind, th, mg, ag, zero_state)
        cur = np.sin(th - p)
        return {"a_high": (da, cur), "a_low": (1.0 - da, -cur),
                "b_high": (db, -cur), "b_low": (1.0 - db, cur)}

    rms, mean = {}, {}
    for name in SWITCHES:
        ms = cycle_mean(lambda th, n=name: parts(th)[n][0] * parts(th)[n][1] ** 2, bk)
        mu = cycle_mean(lambda th, n=name: parts(th)[n][0] * parts(th)[n][1], bk)
        rms[name] = out(np.abs(i) * np.sqrt(np.maximum(ms, 0.0)))
        mean[name] = out(i * mu)
    return Conduction(rms, mean)


@dataclass(frozen=True)
class HardSwitching:
    """How a device of one position hard-switches over the output cycle (sine PWM).

    Attributes
    ----------
    fraction : float or numpy.ndarray
        Share of the carrier periods in which the device hard-switches [unitless].
    current : float or numpy.ndarray
        Mean over every carrier period of the output cycle of the current it hard-switches
        (zero in the periods it does not) [A].
    """

    fraction: object
    current: object


def hard_switching(kind: Kind, i_peak, phase=0.0, *, index=1.0,
                   side: Literal["high", "low"] = "high") -> HardSwitching:
    """Share of carrier periods and mean current a device hard-switches, sine PWM.

    In a carrier period where its leg switches (``0 < d < 1``), the high side hard-switches
    when the leg current flows out of the leg (it turns on against, and off into, the low
    side's diode) and the low side when it flows in; the other device's transitions are soft
    (its own diode takes or hands over the current). So the high device of leg A switches
    ``mean[s_A·max(i, 0)]`` and its low device ``mean[s_A·max(−i, 0)]``, with ``s_A`` 1 where
    leg A switches. Bipolar and unipolar (``M ≤ 1``): both ``I_pk/π`` at any load angle.
    Level-shifted: leg A switches only for ``0 < θ < π``, so the high side switches
    ``I_pk·(1 + cos φ)/(2π)`` and the low side ``I_pk·(1 − cos φ)/(2π)``. The larger of the two
    legs' values is returned (they are equal by symmetry).

    Parameters
    ----------
    kind : str
        Sine-PWM kind.
    i_peak : float or numpy.ndarray
        Load current amplitude [A].
    phase : float or numpy.ndarray
        Load current lag φ [rad].
    index : float
        Modulation index [unitless]; where over-modulation clips the duty no edge is made.
    side : {"high", "low"}
        Position.

    Returns
    -------
    HardSwitching

    References
    ----------
    Holmes & Lipo (2003), ch. 3 and 5 (edge positions); mean of max(sin, 0) over a cycle is
    1/π; hard and soft transitions of a half bridge with an inductive load: Mohan, Undeland &
    Robbins (2003), §2-3 and ch. 7 (from memory).
    """
    if kind not in PWM_KINDS:
        raise ValueError(f"hard-switching shares are for sine PWM, not {kind!r}")
    i = arr(i_peak)
    phi, mi = np.broadcast_arrays(arr(phase), arr(index))
    bk = _breaks(kind, phi, mi, 0.0)
    p, mg = _on_grid(phi), _on_grid(mi)
    sgn = 1.0 if side == "high" else -1.0

    def legs(th: np.ndarray):
        da, db = duty(kind, th, mg)
        cur = np.sin(th - p)
        eps = 1e-12
        sa = ((da > eps) & (da < 1 - eps)).astype(float)
        sb = ((db > eps) & (db < 1 - eps)).astype(float)
        return (sa, sgn * cur), (sb, -sgn * cur)

    frac, cur = [], []
    for k in (0, 1):
        frac.append(cycle_mean(lambda th, k=k: legs(th)[k][0] * (legs(th)[k][1] > 0), bk))
        cur.append(cycle_mean(lambda th, k=k: legs(th)[k][0] * np.maximum(legs(th)[k][1], 0.0),
                              bk))
    return HardSwitching(out(np.maximum(*frac)), out(np.abs(i) * np.maximum(*cur)))


def _narrow_one(kind: str, m: float, fc: float, tm: float) -> float:
    x = tm * fc
    cuts = {-1.0, 1.0}
    for g, c in _PWM_LEGS[kind]:
        a = g * m
        if a != 0:
            cuts.update((v - c) / a for v in (0.0, 1.0, x, 1.0 - x))
    s = np.array(sorted(v for v in cuts if -1.0 <= v <= 1.0))
    mid = (s[:-1] + s[1:]) / 2
    short = np.zeros(mid.shape, dtype=bool)
    for g, c in _PWM_LEGS[kind]:
        d = g * m * mid + c
        short |= (d > 0.0) & (d < 1.0) & (np.minimum(d, 1.0 - d) < x)
    # θ uniform over the cycle: P(sin θ ∈ [s₁, s₂]) = (arcsin s₂ − arcsin s₁)/π
    return float(np.sum(np.where(short, np.arcsin(s[1:]) - np.arcsin(s[:-1]), 0.0)) / np.pi)


def narrow_pulse_fraction(kind: Kind, index, f_carrier, t_min):
    """Share of the output cycle where a leg's gate asks for a pulse shorter than ``t_min``.

    Where a leg switches (``0 < d < 1``) it makes an on-pulse ``d/f_c`` and an off-gap
    ``(1 − d)/f_c`` per carrier period; the phase counts when either, for either leg, is
    shorter than ``t_min``. Two-level and unipolar legs (``d = (1 ± M sin θ)/2``) ask for narrow
    pulses near the reference's peaks, where ``|sin θ| > (1 − 2·t_min·f_c)/M``: a share
    ``1 − (2/π)·arcsin((1 − 2·t_min·f_c)/M)``; level-shifted legs (``d = M|sin θ|``) also at
    every zero crossing, where ``|sin θ| < t_min·f_c/M``. The duties depend on ``θ`` through
    ``sin θ`` alone, so the share is exact: the break points in ``sin θ`` are solved and each
    piece weighted by ``(arcsin s₂ − arcsin s₁)/π``.

    Parameters
    ----------
    kind : str
        Sine-PWM kind.
    index : float or numpy.ndarray
        Modulation index [unitless].
    f_carrier : float or numpy.ndarray
        Carrier frequency [Hz].
    t_min : float or numpy.ndarray
        Shortest pulse the controller or the switches can make [s].

    Returns
    -------
    float or numpy.ndarray
        Fraction in ``[0, 1]`` [unitless].

    References
    ----------
    Holmes & Lipo (2003), §3.2 and ch. 11 (minimum pulse width, pulse dropping; sections from
    memory).
    """
    if kind not in PWM_KINDS:
        raise ValueError(f"narrow pulses are counted for sine PWM, not {kind!r}")
    m, fc, tm = np.broadcast_arrays(arr(index), arr(f_carrier), arr(t_min))
    res = np.array([_narrow_one(kind, float(a), float(b), float(c))
                    for a, b, c in zip(m.ravel(), fc.ravel(), tm.ravel())]).reshape(m.shape)
    return out(res)


# ============================================================================================
# Closed-form figures of the bootstrap supply
# ============================================================================================

def longest_on_time(modulation: Kind, f_out: float, notch_angle: float = 0.0,
                    index: float | None = None, f_carrier: float | None = None, *,
                    zero_state: ZeroState = DEFAULT_ZERO_STATE) -> float:
    """Longest continuous on-time the pattern asks of a high side [s].

    - square: half a period, 1/(2·f_out).
    - quasi-square, zero state on the low sides: half a period minus the zero interval,
      (π − 2α)/(2π·f_out); phase-shifted legs: every high side is on for half a period,
      1/(2·f_out).
    - sine PWM, M ≤ 1: duty (1 + M)/2 at the peak (level-shifted: M), so (1 + M)/(2·f_c) (M/f_c),
      at most one carrier period; beyond (over-modulation) the high side stays on while the
      duty is clipped at 1, for (π − 2·arcsin(1/M))/(2π·f_out) (level-shifted: the same), and
      the pulses either side merge into that run: up to one carrier period at each end, so this
      returns the core plus two carrier periods (an upper bound).

    The figures are bounds over every carrier phase (the synthesised window of
    :func:`gate_signals` gives at most these); the dead time is not subtracted.

    Parameters
    ----------
    modulation : modulation kind
    f_out : output frequency [Hz]
    notch_angle : quasi-square half-angle α [rad]
    index : sine-PWM modulation index [unitless]
    f_carrier : sine-PWM carrier [Hz]
    zero_state : quasi-square zero state

    References
    ----------
    Holmes & Lipo, 2003, ch. 3 (sine-triangle duty cycle (1 + M·sin θ)/2; pulse dropping in
    over-modulation) and ch. 5.
    """
    if modulation == "square":
        return 1.0 / (2.0 * f_out)
    if modulation == "quasi_square":
        if _zero_state(zero_state) == "phase_shifted":
            return 1.0 / (2.0 * f_out)
        return (math.pi - 2.0 * notch_angle) / (2.0 * math.pi * f_out)
    if modulation in PWM_KINDS:
        if index is None or f_carrier is None:
            raise ValueError("sine PWM needs a modulation index and a carrier frequency")
        if index <= 1.0:
            peak = index if modulation == "spwm_level_shifted" else (1.0 + index) / 2.0
            return peak / f_carrier
        return (math.pi - 2.0 * math.asin(1.0 / index)) / (2.0 * math.pi * f_out) + 2.0 / f_carrier
    raise ValueError(f"unknown modulation {modulation!r}")


def shortest_refresh_time(modulation: Kind, f_out, t_dead=0.0, notch_angle=0.0, index=None,
                          f_carrier=None, *, zero_state: ZeroState = DEFAULT_ZERO_STATE):
    """Shortest low-side on-time per switching period, the time a bootstrap recharges [s].

    - square: half a period less the dead time, 1/(2·f_out) − t_dead;
    - quasi-square, zero state on the low sides: (π + 2α)/(2π·f_out) − t_dead; phase-shifted
      legs: every low side is on for half a period, 1/(2·f_out) − t_dead;
    - sine PWM: at the highest index the high side is off for (1 − M)/(2·f_c) per carrier
      period (level-shifted: (1 − M)/f_c); at the reference's peak the load current flows out
      of the leg (for any load angle below 90°), so the switch node sits at the low rail
      through the low channel or its diode for all of that time, dead times included; zero at
      and beyond M = 1 (over-modulation drops the low-side pulses: no refresh there).

    References
    ----------
    Holmes & Lipo, 2003, ch. 3 (duty (1 + M·sin θ)/2 of sine-triangle modulation) and ch. 5.
    """
    if modulation == "square":
        return out(np.maximum(0.5 / arr(f_out) - arr(t_dead), 0.0))
    if modulation == "quasi_square":
        a = 0.0 if _zero_state(zero_state) == "phase_shifted" else arr(notch_angle)
        return out(np.maximum((np.pi + 2.0 * a) / (2.0 * np.pi * arr(f_out)) - arr(t_dead), 0.0))
    if modulation in PWM_KINDS:
        if index is None or f_carrier is None:
            raise ValueError("sine PWM needs a modulation index and a carrier frequency")
        gain = 1.0 if modulation == "spwm_level_shifted" else 0.5
        return out(np.maximum(gain * (1.0 - arr(index)) / arr(f_carrier), 0.0))
    raise ValueError(f"unknown modulation {modulation!r}")
