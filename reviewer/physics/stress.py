"""Device voltage stress: drain-source peak and gate-source voltage in both directions.

Sign convention: gate-source voltages are given in the *enhancement direction* of the switch,
V_GS for an N-channel part and V_SG for a P-channel part, so that a positive value turns either
kind on and a negative value is reverse gate bias.
"""

from __future__ import annotations

from typing import Literal

ZENER_FORWARD = 0.7
"""Forward drop of a gate clamp zener conducting in reverse gate bias [V] (common practice)."""


def overshoot(loop_inductance: float, current: float, fall_time: float) -> float:
    """Drain-source overshoot at turn-off, ΔV = L_loop · di/dt with di/dt ≈ I / t_f.

    Parameters
    ----------
    loop_inductance : float
        Commutation-loop inductance [H].
    current : float
        Current being switched off [A].
    fall_time : float
        Current fall time [s].

    Returns
    -------
    float
        Overshoot above the bus [V].

    References
    ----------
    Mohan, Undeland, Robbins, *Power Electronics*, 3rd ed., Wiley 2003, on stray inductance in
    switching circuits: v = L·di/dt.
    """
    if fall_time <= 0:
        return float("inf")
    return loop_inductance * current / fall_time


def source_node(position: Literal["high", "low"], polarity: Literal["n", "p"], on: bool,
                v_bus: float) -> float:
    """Potential of a switch's source terminal from circuit ground [V].

    A low-side source sits at ground. A P-channel high side has its source on the bus. An
    N-channel high side has its source on the switching node: at the bus while it conducts, at
    ground while the low side conducts.
    """
    if position == "low":
        return 0.0
    if polarity == "p":
        return v_bus
    return v_bus if on else 0.0


def gate_source(level: float, levels_from: Literal["source", "ground"],
                position: Literal["high", "low"], polarity: Literal["n", "p"], on: bool,
                v_bus: float) -> float:
    """Gate-source voltage in the enhancement direction for a drive level.

    Parameters
    ----------
    level : float
        The drive level [V]: gate-to-source (in the enhancement direction) when
        ``levels_from == "source"``, the gate node's potential from ground when ``"ground"``.
    levels_from : {"source", "ground"}
    position : {"high", "low"}
    polarity : {"n", "p"}
    on : bool
        Whether this is the on state (it decides where an N-channel high side's source sits).
    v_bus : float
        Bus voltage [V].

    Returns
    -------
    float
        V_GS for N-channel, V_SG for P-channel [V].

    Examples
    --------
    A P-channel high side on a 24 V bus whose gate is pulled to ground to turn on sees
    V_SG = 24 V − 0 V = 24 V, beyond a 20 V gate rating:

    >>> gate_source(0.0, "ground", "high", "p", True, 24.0)
    24.0
    """
    if levels_from == "source":
        return level
    v_s = source_node(position, polarity, on, v_bus)
    return (level - v_s) if polarity == "n" else (v_s - level)


def clamp(vgs: float, zener: float | None) -> float:
    """Gate-source voltage after a gate-source zener clamp of ``zener`` volts (none: unchanged)."""
    if zener is None:
        return vgs
    return min(vgs, zener) if vgs >= 0 else max(vgs, -ZENER_FORWARD)
