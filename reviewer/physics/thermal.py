"""Losses, thermal resistance chains and junction temperature, with R_DS(on) rising with T_j.

R_DS(on) against temperature is modelled from two points the design supplies: the value at
T_ref and the "hot factor" k = R(T_hot)/R(T_ref). The default model is exponential,
R(T) = R_ref · k^((T − T_ref)/(T_hot − T_ref)), i.e. the familiar R_25·(1 + α)^(T − 25) form:
datasheet curves of normalised on-resistance against temperature bend upwards, and the
exponential keeps that curvature, so beyond T_hot (where thermal runaway lives) it grows faster
than a straight line and does not understate the loop gain of the electro-thermal feedback.
Between T_ref and T_hot it lies a little below the chord (about 3 % at the middle for k = 1.7),
which the linear model, R_ref·(1 + (k − 1)(T − T_ref)/(T_hot − T_ref)), gives instead for
those who prefer it. Datasheet curve points can be used with :func:`rds_on_from_points`.

Junction temperature and on-resistance depend on each other; :func:`solve_junction_temperature`
iterates T ← T_a + θ·P(T) from ambient. P rises with T, so the iterates rise monotonically and
settle on the lowest (stable) solution when there is one; when there is none the temperature
runs away, and the function says so in its result rather than raising.

Every function but :func:`switch_frequency` takes floats or numpy arrays (one element per
corner or sample) and returns a float for scalar inputs; the two iterative ones
(:func:`solve_junction_temperature`, :func:`largest_total_resistance`) iterate on the whole
array, each element stopping by the scalar rule, so that an element is what a scalar call gives,
to the last bit.

Load currents per switch (:func:`switch_currents`) assume a sinusoidal load current of peak
I_pk and lag φ behind the bridge voltage's fundamental (the fundamental-only estimate until
harmonics are known), and MOSFET channels that conduct in both directions while on (so the
channel, not the body diode, carries reverse current outside dead time).

References
----------
N. Mohan, T. Undeland, W. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003, §2-3 (switching
loss ½·V·I·(t_on + t_off)·f_s), ch. 29 (heat sinks, thermal resistance chains).
B. J. Baliga, *Fundamentals of Power Semiconductor Devices*, Springer, 2008, §6.7 (on-resistance
rises with temperature through falling mobility).
D. G. Holmes and T. A. Lipo, *Pulse Width Modulation for Power Converters*, 2003, ch. 3
(duty cycles of single-phase modulations).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from reviewer.physics import pattern
from reviewer.physics.arrays import arr as _a
from reviewer.physics.arrays import is_array
from reviewer.physics.arrays import out as _out

RdsModel = Literal["exponential", "linear"]
ModulationKind = Literal["square", "quasi_square", "spwm_bipolar", "spwm_unipolar",
                         "spwm_level_shifted"]


def _square(x) -> np.ndarray:
    """x² element by element as Python's ``float ** 2`` gives it (the C library's pow).

    numpy's ``x ** 2`` is x·x, which differs from pow(x, 2) in the last bit for some x; the
    fixed point's stopping rule would see that, so the scalar and the array evaluations square
    the current the same way, to the last bit."""
    a = _a(x)
    return np.array([v ** 2 for v in a.ravel().tolist()], dtype=float).reshape(a.shape)


# ---------------------------------------------------------------- on-resistance and temperature

def rds_on_at(t_j, rds_ref, t_ref, hot_factor, t_hot, model: RdsModel = "exponential"):
    """On-resistance at junction temperature ``t_j`` from a reference value and a hot factor [Ω].

    Parameters
    ----------
    t_j : junction temperature [°C]
    rds_ref : R_DS(on) at ``t_ref`` [Ω]
    t_ref : temperature of the reference value [°C]
    hot_factor : R(t_hot)/R(t_ref) [unitless]
    t_hot : temperature the factor is given at [°C]
    model : ``"exponential"`` (default, see the module text for why) or ``"linear"``

    References
    ----------
    Baliga 2008, §6.7 (temperature dependence of on-resistance); exponential form of the
    normalised curve: common practice.
    """
    t, r, tr, k, th = (_a(x) for x in (t_j, rds_ref, t_ref, hot_factor, t_hot))
    x = (t - tr) / (th - tr)
    if model == "exponential":
        return _out(r * k ** x)
    if model == "linear":
        return _out(r * (1.0 + (k - 1.0) * x))
    raise ValueError(f"model must be 'exponential' or 'linear', not {model!r}")


def rds_on_slope(t_j, rds_ref, t_ref, hot_factor, t_hot, model: RdsModel = "exponential"):
    """dR_DS(on)/dT at ``t_j`` for the model of :func:`rds_on_at` [Ω/°C]."""
    t, r, tr, k, th = (_a(x) for x in (t_j, rds_ref, t_ref, hot_factor, t_hot))
    if model == "exponential":
        return _out(_a(rds_on_at(t, r, tr, k, th, model)) * np.log(k) / (th - tr))
    if model == "linear":
        return _out(r * (k - 1.0) / (th - tr) + 0.0 * t)
    raise ValueError(f"model must be 'exponential' or 'linear', not {model!r}")


def rds_on_from_points(t_j, rds_ref, temperatures, factors):
    """On-resistance from a datasheet's normalised curve, linear between points [Ω].

    Parameters
    ----------
    t_j : junction temperature [°C]
    rds_ref : R_DS(on) where the normalised curve is 1 [Ω]
    temperatures : curve temperatures, increasing [°C]
    factors : normalised R_DS(on) at those temperatures [unitless]

    References
    ----------
    Piecewise-linear interpolation (numpy.interp); beyond the ends the end slopes continue.
    """
    t = _a(t_j)
    tt, ff = _a(temperatures), _a(factors)
    f = np.interp(t, tt, ff)
    lo = ff[0] + (t - tt[0]) * (ff[1] - ff[0]) / (tt[1] - tt[0])
    hi = ff[-1] + (t - tt[-1]) * (ff[-1] - ff[-2]) / (tt[-1] - tt[-2])
    f = np.where(t < tt[0], lo, np.where(t > tt[-1], hi, f))
    return _out(_a(rds_ref) * f)


# ---------------------------------------------------------------------------------- losses

def conduction_loss(i_rms, rds_on):
    """Conduction loss P = I_rms² · R_DS(on) [W].

    Parameters
    ----------
    i_rms : RMS current through the channel [A]
    rds_on : on-resistance at the junction temperature [Ω]

    References
    ----------
    Joule's law; Mohan, Undeland & Robbins, 3rd ed., §2-3.
    """
    i = _a(i_rms)
    return _out(i * i * _a(rds_on))


def switching_loss(v_bus, i_switched, t_rise, t_fall, f_sw):
    """Overlap loss of hard switching, P = ½ · V · I · (t_r + t_f) · f_sw [W].

    Parameters
    ----------
    v_bus : voltage switched [V]
    i_switched : current switched (mean over the edges) [A]
    t_rise, t_fall : voltage transition times at turn-on and turn-off [s]
    f_sw : switching frequency of this switch [Hz]

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §2-3, eq. 2-6 (linearised
    switching waveforms).
    """
    return _out(0.5 * _a(v_bus) * _a(i_switched) * (_a(t_rise) + _a(t_fall)) * _a(f_sw))


def recovery_peak_current(qrr, trr):
    """Peak reverse-recovery current of a diode, I_rr ≈ 2 · Q_rr / t_rr [A].

    A triangular recovery current of height I_rr and base t_rr holds Q_rr = ½·I_rr·t_rr.

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §20-2 (diode reverse recovery,
    Q_rr ≈ ½·I_rr·t_rr; section from memory).
    """
    return _out(2.0 * _a(qrr) / _a(trr))


def recovery_loss(qrr, v_bus, f_sw, share=1.0):
    """Reverse-recovery loss in the incoming switch, P = Q_rr · V_bus · f_sw · share [W].

    Parameters
    ----------
    qrr : the other switch's diode recovery charge [C]
    v_bus : voltage switched [V]
    f_sw : switching frequency [Hz]
    share : fraction of the edges at which this switch turns on against a conducting diode
        [unitless] (½ for sine PWM: only in its own half cycle)

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §20-2 and §7-7 (recovery charge
    removed through the incoming switch at the full bus; sections from memory).
    """
    return _out(_a(qrr) * _a(v_bus) * _a(f_sw) * _a(share))


def coss_loss(coss, v_bus, f_sw):
    """Output-capacitance loss ½ · C_oss · V² · f_sw [W].

    References
    ----------
    Energy ½CV² stored in C_oss and dissipated in the channel at each turn-on; Mohan,
    Undeland & Robbins, 3rd ed., §22-4.
    """
    v = _a(v_bus)
    return _out(0.5 * _a(coss) * v * v * _a(f_sw))


def body_diode_loss(v_f, i, t_dead, f_sw):
    """Body-diode loss in dead time, P = V_f · I · 2 · t_dead · f_sw [W].

    Parameters
    ----------
    v_f : body-diode forward voltage [V]
    i : current the diode carries during the dead intervals [A]
    t_dead : dead time per edge [s]
    f_sw : switching frequency [Hz]

    References
    ----------
    Holmes & Lipo, 2003, §3.6 (two dead intervals per switching period); conduction loss of a
    diode as V_f·I·duty.
    """
    return _out(_a(v_f) * _a(i) * 2.0 * _a(t_dead) * _a(f_sw))


def gate_drive_loss(qg, v_drive, f_sw):
    """Gate-drive power P = Q_g · V_dr · f_sw, shared by the driver and gate resistances [W].

    References
    ----------
    Charge Q_g taken from a supply at V_dr once per period; Mohan, Undeland & Robbins §22-4.
    """
    return _out(_a(qg) * _a(v_drive) * _a(f_sw))


def gate_loss_share(p_gate, r_part, r_loop):
    """The share of gate-drive power dissipated in one resistance of the loop [W].

    P_part = P_gate · R_part / R_loop (the same current flows through every series element).

    References
    ----------
    Series resistors share I²R in proportion to R.
    """
    return _out(_a(p_gate) * _a(r_part) / _a(r_loop))


# --------------------------------------------------------------------- thermal resistance

def thermal_resistance(rth_jc=None, rth_cs=None, rth_sa=None, rth_ja=None):
    """Junction-to-ambient thermal resistance of one device [K/W].

    With a heatsink (``rth_sa`` given): θ_jc + θ_cs + θ_sa (θ_cs 0 when not given). Without:
    θ_ja. Raises ValueError when neither path can be formed (which of them is given is the
    same at every element of an array call: only the values vary).

    References
    ----------
    Mohan, Undeland & Robbins, 3rd ed., §29-2 (series thermal resistances).
    """
    if rth_sa is not None:
        if rth_jc is None:
            raise ValueError("a heatsink path needs the junction-to-case resistance")
        return _out(_a(rth_jc) + (0.0 if rth_cs is None else _a(rth_cs)) + _a(rth_sa))
    if rth_ja is not None:
        return _out(rth_ja)
    raise ValueError("give junction-to-ambient, or junction-to-case and sink-to-ambient")


def junction_temperature(t_ambient, power, rth):
    """T_j = T_a + P · θ [°C].

    References
    ----------
    Mohan, Undeland & Robbins, 3rd ed., §29-2.
    """
    return _out(_a(t_ambient) + _a(power) * _a(rth))


@dataclass(frozen=True)
class JunctionSolution:
    """Result of the electro-thermal solution for one device, or for each element of arrays.

    ``converged`` is False for thermal runaway: ``t_j``, ``rds_on`` and ``power`` are then
    None and ``message`` says what happened. For array inputs every field is an array of the
    inputs' broadcast shape (``converged`` bool, ``iterations`` int, ``t_j``, ``rds_on`` and
    ``power`` NaN where not converged) and ``message`` a list of texts, one per element in
    flattened order.
    """

    converged: bool | np.ndarray
    t_j: float | np.ndarray | None
    rds_on: float | np.ndarray | None
    power: float | np.ndarray | None
    iterations: int | np.ndarray
    message: str | list[str]


def _runaway_message(ceiling: float, steps: int, passed: bool, max_iter: int) -> str:
    if passed:
        return (f"no solution: thermal runaway (junction passes {ceiling:g} °C after {steps} "
                f"steps)")
    return ("no solution: thermal runaway (the junction temperature did not settle within "
            f"{max_iter} steps: at the edge of runaway)")


def _solve_one(t_ambient: float, rth: float, i_rms: float, rds_ref: float, t_ref: float,
               hot_factor: float, t_hot: float, p_other: float, t_ceiling: float,
               model: RdsModel, tol: float, max_iter: int) -> JunctionSolution:
    """:func:`solve_junction_temperature` of floats: the scalar iteration."""
    t = t_ambient
    i2 = i_rms ** 2
    for n in range(1, max_iter + 1):
        r = float(rds_on_at(t, rds_ref, t_ref, hot_factor, t_hot, model))
        p = i2 * r + p_other
        t_new = t_ambient + rth * p
        if not math.isfinite(t_new) or t_new > t_ceiling:
            return JunctionSolution(False, None, None, None, n,
                                    _runaway_message(t_ceiling, n, True, max_iter))
        if abs(t_new - t) < tol:
            r = float(rds_on_at(t_new, rds_ref, t_ref, hot_factor, t_hot, model))
            return JunctionSolution(True, t_new, r, i2 * r + p_other, n, "converged")
        t = t_new
    return JunctionSolution(False, None, None, None, max_iter,
                            _runaway_message(t_ceiling, max_iter, False, max_iter))


def solve_junction_temperature(t_ambient, rth, i_rms, rds_ref, t_ref, hot_factor, t_hot,
                               p_other=0.0, model: RdsModel = "exponential",
                               tol: float = 1e-6, max_iter: int = 20000,
                               t_ceiling=1000.0) -> JunctionSolution:
    """Junction temperature with R_DS(on) evaluated at it, by fixed-point iteration.

    Solves T = T_a + θ·(I_rms²·R(T) + P_other), starting at T_a. The iterates rise
    monotonically; they stop when a step is below ``tol`` (converged) or when T passes
    ``t_ceiling`` or ``max_iter`` is spent (no solution: thermal runaway). Every argument but
    ``model``, ``tol`` and ``max_iter`` may be an array: the whole array is iterated at once,
    each element stopping by the scalar rule at its own step (a mask of the elements still
    iterating), so that each element is what the scalar call gives, to the last bit; scalars
    iterate on floats.

    Parameters
    ----------
    t_ambient : ambient temperature [°C]
    rth : junction-to-ambient thermal resistance [K/W]
    i_rms : RMS channel current [A]
    rds_ref, t_ref, hot_factor, t_hot, model : on-resistance model, see :func:`rds_on_at`
    p_other : losses that do not depend on T (switching, diode, gate share) [W]
    tol : convergence step [K]
    max_iter : iteration limit [unitless]
    t_ceiling : temperature taken as runaway [°C]

    References
    ----------
    Fixed-point iteration of a monotone map (Banach; e.g. R. L. Burden and J. D. Faires,
    *Numerical Analysis*, 9th ed., §2.2); electro-thermal loop: Baliga 2008 §6.7.
    """
    numbers = (t_ambient, rth, i_rms, rds_ref, t_ref, hot_factor, t_hot, p_other, t_ceiling)
    if not is_array(*numbers):
        return _solve_one(*(float(x) for x in numbers), model, tol, max_iter)
    given = np.broadcast_arrays(*(_a(x) for x in numbers))
    shape = given[0].shape
    ta, th, i, rr, tr, k, thot, po, ceil = (g.ravel() for g in given)
    i2 = _square(i)
    size = ta.size
    converged = np.zeros(size, dtype=bool)
    passed = np.zeros(size, dtype=bool)          # went beyond the ceiling (or not finite)
    steps = np.full(size, max_iter, dtype=int)
    t_j = np.full(size, np.nan)
    # the elements still iterating, and their working copies
    live = np.arange(size)
    t = ta.copy()
    w = [ta, th, i2, rr, tr, k, thot, po, ceil]
    with np.errstate(invalid="ignore", over="ignore"):
        for n in range(1, max_iter + 1):
            wta, wth, wi2, wrr, wtr, wk, wthot, wpo, wceil = w
            p = wi2 * _a(rds_on_at(t, wrr, wtr, wk, wthot, model)) + wpo
            t_new = wta + wth * p
            # the scalar rule, per element: past the ceiling (or not finite) first, then settled
            over = ~np.isfinite(t_new) | (t_new > wceil)
            stop = over | (np.abs(t_new - t) < tol)
            if stop.any():
                done = stop & ~over
                passed[live[over]] = True
                converged[live[done]] = True
                steps[live[stop]] = n
                t_j[live[done]] = t_new[done]
                keep = ~stop
                live, t = live[keep], t_new[keep]
                w = [x[keep] for x in w]
                if live.size == 0:
                    break
            else:
                t = t_new
        r_j = _a(rds_on_at(t_j, rr, tr, k, thot, model))
        p_j = i2 * r_j + po
    messages = ["converged" if c else _runaway_message(float(x), int(s), bool(o), max_iter)
                for c, x, s, o in zip(converged.tolist(), ceil.tolist(), steps.tolist(),
                                      passed.tolist())]
    return JunctionSolution(converged.reshape(shape), t_j.reshape(shape),
                            np.where(converged, r_j, np.nan).reshape(shape),
                            np.where(converged, p_j, np.nan).reshape(shape),
                            steps.reshape(shape), messages)


def _largest_total_one(t_limit: float, t_ambient: float, i_rms: float, rds_ref: float,
                       t_ref: float, hot_factor: float, t_hot: float, p_other: float,
                       model: RdsModel) -> float:
    """:func:`largest_total_resistance` of floats: the scalar bisection."""
    i2 = i_rms ** 2

    def p(t):
        return i2 * float(rds_on_at(t, rds_ref, t_ref, hot_factor, t_hot, model)) + p_other

    def dh_sign(t):
        return p(t) - (t - t_ambient) * i2 * float(rds_on_slope(t, rds_ref, t_ref, hot_factor,
                                                                  t_hot, model))

    if t_limit <= t_ambient:
        return 0.0
    if dh_sign(t_limit) >= 0:
        t_best = t_limit
    else:
        lo, hi = t_ambient, t_limit
        for _ in range(200):
            mid = 0.5 * (lo + hi)
            if dh_sign(mid) >= 0:
                lo = mid
            else:
                hi = mid
        t_best = lo
    return (t_best - t_ambient) / p(t_best)


def largest_total_resistance(t_limit, t_ambient, i_rms, rds_ref, t_ref, hot_factor, t_hot,
                             p_other=0.0, model: RdsModel = "exponential"):
    """Largest junction-to-ambient resistance whose stable T_j stays at or below ``t_limit`` [K/W].

    θ makes T a solution when θ = h(T) = (T − T_a)/P(T). The stable solution rises with θ until
    h peaks (beyond that peak there is none: runaway), so the answer is the maximum of h over
    [T_a, T_limit]: h(T_limit) if h still rises there, else the peak of h (found by bisection
    on h' = 0, i.e. P(T) = (T − T_a)·P'(T)); 0 where T_limit ≤ T_a. Arrays are bisected
    element by element at once (the same 200 halvings as a scalar call, which works on floats).

    References
    ----------
    Inversion of T = T_a + θ·P(T); Mohan, Undeland & Robbins §29-2.
    """
    numbers = (t_limit, t_ambient, i_rms, rds_ref, t_ref, hot_factor, t_hot, p_other)
    if not is_array(*numbers):
        return _largest_total_one(*(float(x) for x in numbers), model)
    given = np.broadcast_arrays(*(_a(x) for x in numbers))
    t_lim, ta, i, rr, tr, k, thot, po = given
    i2 = _square(i)

    def p(t):
        return i2 * _a(rds_on_at(t, rr, tr, k, thot, model)) + po

    def dh_sign(t):
        return p(t) - (t - ta) * i2 * _a(rds_on_slope(t, rr, tr, k, thot, model))

    below = t_lim <= ta
    rising = dh_sign(t_lim) >= 0
    lo, hi = ta, t_lim
    if (~below & ~rising).any():
        for _ in range(200):
            mid = 0.5 * (lo + hi)
            up = dh_sign(mid) >= 0
            lo, hi = np.where(up, mid, lo), np.where(up, hi, mid)
    t_best = np.where(rising, t_lim, lo)
    with np.errstate(divide="ignore", invalid="ignore"):
        return _out(np.where(below, 0.0, (t_best - ta) / p(t_best)))


def largest_sink_to_ambient(t_limit, t_ambient, rth_jc, rth_cs, i_rms, rds_ref, t_ref,
                            hot_factor, t_hot, p_other=0.0, model: RdsModel = "exponential"):
    """Largest heatsink (sink-to-ambient) resistance that keeps T_j ≤ ``t_limit`` [K/W].

    θ_sa,max = θ_total,max − θ_jc − θ_cs with θ_total,max from :func:`largest_total_resistance`.
    Negative means no heatsink is enough: reduce the loss or spread it over more devices.

    References
    ----------
    Mohan, Undeland & Robbins, 3rd ed., §29-2 (choosing a heat sink).
    """
    total = largest_total_resistance(t_limit, t_ambient, i_rms, rds_ref, t_ref, hot_factor,
                                     t_hot, p_other, model)
    return _out(_a(total) - _a(rth_jc) - _a(rth_cs))


def pulse_temperature_swing(p_on, rth, tau, t_on, period):
    """Peak junction rise above its mean under a periodic power pulse, single-pole Z_th [K].

    A single-pole thermal impedance Z(t) = R·(1 − e^(−t/τ)) driven by P_on for t_on in every
    period T settles to a periodic temperature whose peak above the far end is
    P_on·R·(1 − e^(−t_on/τ))/(1 − e^(−T/τ)) and whose mean is P_on·R·t_on/T; the swing is their
    difference. It tends to 0 for τ ≫ T and to P_on·R·(1 − t_on/T) for τ ≪ t_on.

    Parameters
    ----------
    p_on : power during the pulse [W]
    rth : resistance of the pole (junction to case) [K/W]
    tau : its time constant [s]
    t_on : pulse length [s]
    period : repetition period [s]

    References
    ----------
    Superposition of step responses of a first-order thermal network over a periodic pulse
    train; Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §29-3 (transient thermal
    impedance; section from memory).
    """
    p, r, tau, ton, tp = (_a(x) for x in (p_on, rth, tau, t_on, period))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        peak = p * r * -np.expm1(-ton / tau) / -np.expm1(-tp / tau)
    return _out(np.maximum(peak - p * r * ton / tp, 0.0))


def device_current(i_total, count, sharing_derating=0.2):
    """Current of the most heavily loaded of ``count`` paralleled devices [A].

    I_dev = (I / n)·(1 + d) for n > 1 (d = 0.2 by common practice: paralleled MOSFETs share
    unevenly through R_DS(on) and threshold spread), I for a single device.

    References
    ----------
    Current-sharing allowance: common practice.
    """
    n = _a(count)
    return _out(np.where(n > 1, _a(i_total) / n * (1.0 + _a(sharing_derating)), _a(i_total)))


# ------------------------------------------------------------------- currents per modulation

_ZERO_ALIASES = {"low": "low_sides", "alternating": "phase_shifted",
                 "low_sides": "low_sides", "phase_shifted": "phase_shifted"}


@dataclass(frozen=True)
class SwitchCurrents:
    """RMS and average (drain-to-source, the sourcing direction) current of each position [A],
    the larger of the two legs' values."""

    high_rms: float
    high_avg: float
    low_rms: float
    low_avg: float


def switch_currents(modulation: ModulationKind, i_peak: float, phase: float = 0.0,
                    notch_angle: float = 0.0, index: float = 1.0,
                    zero_state: Literal["low_sides", "phase_shifted", "low", "alternating"]
                    = "low_sides") -> SwitchCurrents:
    """RMS and average channel current per switch for a sinusoidal load current.

    Load current i = I_pk·sin(θ − φ), θ the phase of the bridge voltage's fundamental. Each
    switch carries i² while it is on, so I_rms² = (1/2π)·∫ d(θ)·i² dθ with d the switch's
    local on-fraction from the switching pattern (:func:`reviewer.physics.pattern.conduction`).

    - square: each switch on for half the cycle: I_rms = I_pk/2, I_avg = I_pk·cos φ/π.
    - quasi-square with zero interval 2α at each zero crossing; ``zero_state="low_sides"``
      (``"low"``; both low sides on in the zero interval, the usual choice with bootstrap
      drives): high sides on for (π − 2α) per cycle, low sides for (π + 2α);
      ``"phase_shifted"`` (``"alternating"``): every switch on for half the cycle.
    - bipolar and unipolar sine PWM: duty (1 ± M·sin θ)/2, which gives I_rms = I_pk/2 and
      I_avg = I_pk·M·cos φ/4.
    - level-shifted sine PWM: the high side of leg A is on for M·sin θ in the positive half
      cycle only and its low side for the rest, so the low sides carry more than the high
      sides: at M = 1, φ = 0, I_rms,high = I_pk·√(2/(3π)) = 0.461·I_pk and
      I_rms,low = I_pk·√(1/2 − 2/(3π)) = 0.537·I_pk.

    Parameters
    ----------
    modulation : modulation kind
    i_peak : load current amplitude [A]
    phase : load current lag φ [rad]
    notch_angle : quasi-square zero-interval half-angle α [rad]
    index : sine-PWM modulation index M [unitless] (over-modulation clips the duty)
    zero_state : quasi-square zero state

    References
    ----------
    Holmes & Lipo, *Pulse Width Modulation for Power Converters*, 2003, ch. 3 and 5 (duty-cycle
    functions of single-phase modulations); local-average RMS as in Mohan, Undeland & Robbins
    §8-3.
    """
    if modulation not in pattern.KINDS:
        raise ValueError(f"unknown modulation {modulation!r}")
    if zero_state not in _ZERO_ALIASES:
        raise ValueError(f"zero_state must be 'low_sides' or 'phase_shifted', not {zero_state!r}")
    c = pattern.conduction(modulation, i_peak, phase, index=index, notch=notch_angle,
                           zero_state=_ZERO_ALIASES[zero_state])  # type: ignore[arg-type]
    r, m = c.rms, c.mean
    return SwitchCurrents(_out(np.maximum(r["a_high"], r["b_high"])),
                          _out(np.maximum(np.abs(m["a_high"]), np.abs(m["b_high"]))),
                          _out(np.maximum(r["a_low"], r["b_low"])),
                          _out(np.maximum(np.abs(m["a_low"]), np.abs(m["b_low"]))))


def stepped_edge_current(i_peak, phase=0.0, notch_angle=0.0):
    """Load current at the turn-off edge of a square or quasi-square bridge voltage into R-L [A].

    The bridge applies +V for (π − 2α), 0 for 2α, −V for (π − 2α), 0 for 2α. With
    e₁ = e^(−t₁/τ) over the active interval and e₀ = e^(−t₀/τ) over the zero interval, the
    periodic, half-wave antisymmetric solution has, at the end of the active interval,
    i_b = (V/R)·(1 − e₁)/(1 + e₀·e₁) (and −e₀·i_b at its start), the largest current any switch
    turns off. V/R follows from the fundamental's peak I₁ = (4/π)·V·cos α·cos φ/R. A resistor
    (φ = 0) gives V/R, not 0 A; α = 0 gives the square wave's (V/R)·tanh(T/(4τ)).

    Parameters
    ----------
    i_peak : peak of the load current's fundamental [A]
    phase : load angle φ [rad], 0 ≤ φ < π/2
    notch_angle : zero-interval half-angle α [rad]

    References
    ----------
    Piecewise first-order response of an R-L load to a stepped voltage (Mohan, Undeland &
    Robbins, *Power Electronics*, 3rd ed., §8-3 and §8-4, square-wave and quasi-square
    inverters; sections from memory).
    """
    i, phi, a = _a(i_peak), np.abs(_a(phase)), _a(notch_angle)
    v_over_r = np.pi / 4.0 * i / (np.cos(phi) * np.cos(a))
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        tan = np.tan(phi)
        # times in units of 1/ω: t/τ = θ/tan φ
        e1 = np.where(tan > 0, np.exp(-(np.pi - 2.0 * a) / np.where(tan > 0, tan, 1.0)), 0.0)
        e0 = np.where(tan > 0, np.exp(-(2.0 * a) / np.where(tan > 0, tan, 1.0)), 0.0)
    return _out(v_over_r * (1.0 - e1) / (1.0 + e0 * e1))


def square_edge_current(i_peak, phase=0.0):
    """Load current at the edge of a square-wave bridge voltage into an R-L load [A].

    (V/R)·tanh(T/(4τ)): :func:`stepped_edge_current` with no zero interval.

    References
    ----------
    Mohan, Undeland & Robbins, *Power Electronics*, 3rd ed., §8-3 (from memory).
    """
    return stepped_edge_current(i_peak, phase, 0.0)


def switched_current(modulation: ModulationKind, i_peak: float, phase: float = 0.0,
                     notch_angle: float = 0.0, *, index: float = 1.0,
                     side: Literal["high", "low"] = "high",
                     hard: "pattern.HardSwitching | None" = None) -> float:
    """Mean current one device hard-switches per edge, over the output period [A].

    sine PWM: a device hard-switches only in the carrier periods where its leg switches and
    the current flows its way (the other transitions hand the current to, or take it from, its
    own body diode: soft); the mean over every carrier period of the output cycle is
    :func:`reviewer.physics.pattern.hard_switching`: I_pk/π for bipolar and unipolar (the whole
    leg's is 2·I_pk/π), I_pk·(1 ± cos φ)/(2π) for the high (+) and low (−) side of a
    level-shifted bridge. Square and quasi-square: the actual current at the edge of the
    stepped waveform into the R-L load, :func:`stepped_edge_current` (the larger edge,
    conservative, for either zero state).

    Parameters
    ----------
    modulation : modulation kind
    i_peak : load current amplitude [A]
    phase : load current lag φ [rad]
    notch_angle : quasi-square zero-interval half-angle α [rad]
    index : sine-PWM modulation index [unitless]
    side : position of the device
    hard : sine PWM: the device's :func:`reviewer.physics.pattern.hard_switching` for these
        inputs, when the caller has it already (it is the costly part)

    References
    ----------
    Holmes & Lipo 2003 ch. 3 and 5 (edge positions); mean of max(sin, 0) over a cycle is 1/π.
    """
    i, phi, a = _a(i_peak), _a(phase), _a(notch_angle)
    if modulation == "square":
        return _out(square_edge_current(i, phi))
    if modulation == "quasi_square":
        return _out(stepped_edge_current(i, phi, a))
    if modulation in pattern.PWM_KINDS:
        if hard is None:
            hard = pattern.hard_switching(modulation, i, phi, index=index, side=side)
        return _out(hard.current)
    raise ValueError(f"unknown modulation {modulation!r}")


def switch_frequency(modulation: ModulationKind, f_out: float, f_carrier: float | None) -> float:
    """How often each switch turns on (and off) [Hz]: f_out for square and quasi-square waves,
    the carrier for sine PWM.

    References
    ----------
    Holmes & Lipo 2003, ch. 3.
    """
    if modulation in ("square", "quasi_square"):
        return float(f_out)
    if modulation in ("spwm_bipolar", "spwm_unipolar", "spwm_level_shifted"):
        if f_carrier is None:
            raise ValueError("sine PWM needs a carrier frequency")
        return float(f_carrier)
    raise ValueError(f"unknown modulation {modulation!r}")
