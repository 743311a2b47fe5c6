"""Bootstrap supply of an N-channel high side: charge, capacitance, droop and on-time.

The bootstrap capacitor is charged through its diode from V_cc while the low side conducts
(switching node near ground) and supplies the high-side gate and driver while the high side
is on. It holds the gate only as long as its charge lasts, so long on-times (square and
quasi-square waves at 50–60 Hz keep the high side on for milliseconds) need a large capacitor,
a charge pump or an isolated supply.

References
----------
N. Mohan, T. Undeland, W. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003, §23-4 (gate
drive circuits with bootstrap supply for the high side).
B. J. Baliga, *Fundamentals of Power Semiconductor Devices*, Springer, 2008, §6 (gate charge).
D. G. Holmes and T. A. Lipo, *Pulse Width Modulation for Power Converters*, 2003, ch. 3
(duty cycle of sine-triangle modulation; overmodulation).
"""

from __future__ import annotations

import math
import numpy as np

# the on- and refresh times come from the one switching-pattern description
from reviewer.physics.pattern import longest_on_time, shortest_refresh_time

__all__ = ["bootstrap_charge", "allowed_droop", "minimum_capacitance", "practice_capacitance",
           "gate_voltage_after", "longest_on_time", "refresh_charge", "shortest_refresh_time"]


def _a(x) -> np.ndarray:
    return np.asarray(x, dtype=float)


def _out(x):
    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def bootstrap_charge(qg, i_quiescent, i_leakage, t_on_max, q_level_shift=0.0):
    """Charge the bootstrap capacitor gives up in one high-side on-time [C].

    Q_total = Q_g + (I_q + I_leak) · t_on,max + Q_ls.

    Parameters
    ----------
    qg : total gate charge of the high side (all paralleled devices) [C]
    i_quiescent : high-side driver quiescent current [A]
    i_leakage : capacitor, diode and gate leakage [A]
    t_on_max : longest on-time the modulation asks of the high side [s]
    q_level_shift : level-shifter charge per cycle [C]

    References
    ----------
    Mohan, Undeland & Robbins, 3rd ed., §23-4 (charge drawn from the bootstrap capacitor).
    """
    return _out(_a(qg) + (_a(i_quiescent) + _a(i_leakage)) * _a(t_on_max) + _a(q_level_shift))


def allowed_droop(v_cc, v_f, v_gs_needed, v_low_side=0.0):
    """Voltage the bootstrap capacitor may lose, ΔV = V_cc − V_f − V_LS − V_GS,needed [V].

    Parameters
    ----------
    v_cc : gate-drive supply that charges the capacitor [V]
    v_f : bootstrap diode forward voltage [V]
    v_gs_needed : smallest gate-source voltage the high side needs while on [V]
    v_low_side : drop across the low side while it charges the capacitor [V]

    References
    ----------
    Mohan, Undeland & Robbins, 3rd ed., §23-4.
    """
    return _out(_a(v_cc) - _a(v_f) - _a(v_low_side) - _a(v_gs_needed))


def minimum_capacitance(q_total, delta_v):
    """Smallest bootstrap capacitance, C_min = Q_total / ΔV [F]; infinite when ΔV ≤ 0.

    References
    ----------
    Q = C·ΔV; Mohan, Undeland & Robbins, 3rd ed., §23-4.
    """
    q, dv = _a(q_total), _a(delta_v)
    with np.errstate(divide="ignore"):
        return _out(np.where(dv > 0, q / np.where(dv > 0, dv, 1.0), np.inf))


def practice_capacitance(c_min, factor=10.0):
    """The capacitance common practice fits: ``factor`` (ten) times the minimum [F].

    References
    ----------
    "Ten times the minimum": common practice.
    """
    return _out(_a(c_min) * _a(factor))


def gate_voltage_after(v_start, capacitance, q_gate, i_dc, t_on, r_load=np.inf):
    """High-side gate voltage at the end of an on-time, fed by the bootstrap capacitor [V].

    The gate charge Q_g is shared out at turn-on (V₀ = V_start − Q_g/C); then a constant
    current I (driver quiescent + leakage) and a resistive load R across the capacitor's
    output (a gate-source pull resistor) discharge it:
    dV/dt = −(I + V/R)/C, so V(t) = (V₀ + I·R)·e^(−t/RC) − I·R, or V₀ − I·t/C without R.
    A capacitor cannot discharge below zero: once its charge runs out the gate has nothing left
    (the driver's output collapses), so the result is never below 0 V.

    Parameters
    ----------
    v_start : capacitor voltage before turn-on, V_cc − V_f [V]
    capacitance : bootstrap capacitance [F]
    q_gate : gate charge delivered at turn-on [C]
    i_dc : constant load on the capacitor [A]
    t_on : on-time [s]
    r_load : resistance across the gate (infinite if none) [Ω]

    References
    ----------
    Linear first-order ODE with constant input (W. E. Boyce and R. C. DiPrima, *Elementary
    Differential Equations*, §2.1); Mohan, Undeland & Robbins §23-4.
    """
    v0 = _a(v_start) - _a(q_gate) / _a(capacitance)
    c, i, t, r = _a(capacitance), _a(i_dc), _a(t_on), _a(r_load)
    with np.errstate(invalid="ignore", over="ignore"):
        finite = np.isfinite(r)
        rr = np.where(finite, r, 1.0)
        v_r = (v0 + i * rr) * np.exp(-t / (rr * c)) - i * rr
    return _out(np.maximum(np.where(finite, v_r, v0 - i * t / c), 0.0))


def refresh_charge(capacitance, r_charge, t_refresh, deficit):
    """Charge a refresh interval returns to a capacitor ``deficit`` volts short of full [C].

    Through the charging path resistance R the deficit decays as e^(−t/RC):
    ΔQ = C · D · (1 − e^(−t/(R·C))).

    Parameters
    ----------
    capacitance : bootstrap capacitance [F]
    r_charge : resistance of the charging path (diode and series resistor) [Ω]
    t_refresh : time the low side conducts, the capacitor charging [s]
    deficit : voltage the capacitor is short of V_cc − V_f at the start [V]

    References
    ----------
    First-order RC charging (Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.4.2);
    bootstrap refresh while the low side conducts: Mohan, Undeland & Robbins, 3rd ed., §23-4.
    """
    c, r, t, d = _a(capacitance), _a(r_charge), _a(t_refresh), _a(deficit)
    with np.errstate(divide="ignore", invalid="ignore", over="ignore"):
        frac = np.where(r > 0, -np.expm1(-t / np.where(r > 0, r * c, 1.0)), np.where(t > 0, 1.0, 0.0))
    return _out(c * d * np.maximum(frac, 0.0))
