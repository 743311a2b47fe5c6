"""Grounding and loop inductance: ground bounce and switching overshoot, both L · di/dt.

References
----------
H. W. Johnson, M. Graham, *High-Speed Digital Design: A Handbook of Black Magic*, Prentice Hall,
1993, ch. 1 and 5 (ground bounce V = L·di/dt against the logic's noise margin).
N. Mohan, T. M. Undeland, W. P. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003 (turn-off
overshoot from the commutation-loop inductance).
"""

from __future__ import annotations

from typing import Any


def current_slope(i_step: Any, t_transition: Any) -> Any:
    """Mean rate of change of a current step: ``di/dt ≈ ΔI / t`` [A/s].

    Parameters
    ----------
    i_step : float or ndarray
        Current change, e.g. the peak current commutated [A].
    t_transition : float or ndarray
        Time the change takes, e.g. the fall time [s].

    References
    ----------
    Mohan, Undeland & Robbins (2003): linearised switching transition. A zero transition time
    gives an unbounded slope (``inf``), never a division error.
    """
    import numpy as np

    from reviewer.physics.arrays import out

    with np.errstate(divide="ignore", invalid="ignore"):
        return out(np.divide(np.asarray(i_step, dtype=float), np.asarray(t_transition, dtype=float)))


def inductive_voltage(inductance: Any, di_dt: Any) -> Any:
    """Voltage across an inductance carrying a changing current: ``V = L · di/dt`` [V].

    Parameters
    ----------
    inductance : float or ndarray
        Inductance [H].
    di_dt : float or ndarray
        Rate of change of current [A/s].

    References
    ----------
    Faraday's law for a lumped inductance.
    """
    return inductance * di_dt


def ground_bounce(l_common: Any, i_step: Any, t_transition: Any) -> Any:
    """Voltage a shared ground inductance puts between logic ground and power ground.

    Parameters
    ----------
    l_common : float or ndarray
        Inductance shared by the logic return and the power return [H].
    i_step : float or ndarray
        Power current switched through it [A].
    t_transition : float or ndarray
        Switching transition time [s].

    Returns
    -------
    float or ndarray
        ``V = L_common · ΔI / t`` [V], to be compared with the logic's noise margin.

    References
    ----------
    Johnson & Graham (1993), ch. 5.
    """
    return inductive_voltage(l_common, current_slope(i_step, t_transition))


def switching_overshoot(l_loop: Any, i_peak: Any, t_fall: Any) -> Any:
    """Drain-source overshoot at turn-off from the commutation-loop inductance.

    Parameters
    ----------
    l_loop : float or ndarray
        Commutation-loop inductance (bus capacitor, both switches, back) [H].
    i_peak : float or ndarray
        Current being turned off [A].
    t_fall : float or ndarray
        Current fall time [s].

    Returns
    -------
    float or ndarray
        ``ΔV = L_loop · I_peak / t_fall`` [V], added to the bus voltage.

    References
    ----------
    Mohan, Undeland & Robbins (2003), switching transients.
    """
    return inductive_voltage(l_loop, current_slope(i_peak, t_fall))


def avalanche_energy(l_loop: Any, i_peak: Any, v_rating: Any, v_bus: Any, v_peak: Any) -> Any:
    """Energy a switch absorbs in avalanche at one turn-off where the overshoot passes its rating.

    E = ½ · L · I² · V_BR / (V_BR − V_bus) where the unclamped peak ``v_peak`` exceeds the rating
    V_BR (taken as the breakdown voltage), else 0. Infinite when the bus itself is at or above
    the rating (the part cannot block it).

    Parameters
    ----------
    l_loop : float or ndarray
        Commutation-loop inductance [H].
    i_peak : float or ndarray
        Current being turned off [A].
    v_rating : float or ndarray
        Drain-source rating, taken as the avalanche voltage [V].
    v_bus : float or ndarray
        Bus voltage [V].
    v_peak : float or ndarray
        Peak drain-source voltage without avalanche [V].

    Returns
    -------
    float or ndarray
        Avalanche energy per edge [J].

    References
    ----------
    Unclamped inductive switching energy, E = ½·L·I²·V_BR/(V_BR − V_DD): Baliga, *Fundamentals
    of Power Semiconductor Devices*, 2008, §6 (avalanche ruggedness; section from memory).
    """
    import numpy as np

    l, i, vr, vb, vp = (np.asarray(x, dtype=float) for x in (l_loop, i_peak, v_rating, v_bus, v_peak))
    with np.errstate(divide="ignore", invalid="ignore"):
        e = np.where(vr > vb, 0.5 * l * i * i * vr / np.where(vr > vb, vr - vb, 1.0), np.inf)
    e = np.where(vp > vr, e, 0.0)
    return float(e) if e.ndim == 0 else e


def max_inductance(v_allowed: Any, i_step: Any, t_transition: Any) -> Any:
    """Largest inductance that keeps ``L · ΔI / t`` within ``v_allowed``: the layout target.

    Parameters
    ----------
    v_allowed : float or ndarray
        Allowed voltage (noise margin, or overshoot headroom) [V].
    i_step : float or ndarray
        Current switched [A].
    t_transition : float or ndarray
        Transition time [s].

    Returns
    -------
    float or ndarray
        ``L ≤ V · t / ΔI`` [H].

    References
    ----------
    :func:`inductive_voltage` solved for L.
    """
    return v_allowed * t_transition / i_step


def min_transition_time(v_allowed: Any, inductance: Any, i_step: Any) -> Any:
    """Shortest transition that keeps ``L · ΔI / t`` within ``v_allowed`` (slow the edge instead).

    Parameters
    ----------
    v_allowed : float or ndarray
        Allowed voltage [V].
    inductance : float or ndarray
        Inductance [H].
    i_step : float or ndarray
        Current switched [A].

    Returns
    -------
    float or ndarray
        ``t ≥ L · ΔI / V`` [s].

    References
    ----------
    :func:`inductive_voltage` solved for t.
    """
    return inductance * i_step / v_allowed
