"""Gate-source voltages, zener clamps, pull resistors and gate-drive sizing.

Sign convention: ``vgs`` is the signed gate-to-source voltage [V]. An N-channel switch is
enhanced by a positive ``vgs``, a P-channel switch by a negative one. :func:`enhancement` turns a
signed ``vgs`` into the voltage that drives the channel towards conduction (positive = on-going)
for either polarity, so that limits and thresholds given as magnitudes compare directly.

Where the source sits: a low-side N-channel switch has its source on circuit ground; a high-side
P-channel switch has its source on the bus; a high-side N-channel switch has its source on the
switching node, which is near the bus while the switch conducts and anywhere from ground to the
bus while it is off; a low-side P-channel switch likewise has its source on the switching node,
near ground while it conducts.

Every function accepts floats or numpy arrays (tolerance corners) and returns a float for
scalar input.

References
----------
B. J. Baliga, *Fundamentals of Power Semiconductor Devices*, Springer, 2008, ch. 6 (power
MOSFET gate structure, threshold and its temperature dependence).
P. Horowitz and W. Hill, *The Art of Electronics*, 3rd ed., Cambridge, 2015, §3.5 (power
MOSFETs: gate drive, gate charge, protecting the gate with a zener) and §1.2 (dividers, V²/R).
"""

from __future__ import annotations

from typing import Literal

import numpy as np

Polarity = Literal["n", "p"]
Position = Literal["high", "low"]


def _out(x):
    """A float for a scalar result, the array otherwise."""
    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def enhancement(vgs, polarity: Polarity):
    """The part of ``vgs`` that drives the channel on, positive towards conduction [V].

    Parameters
    ----------
    vgs : signed gate-to-source voltage [V]
    polarity : ``"n"`` or ``"p"``

    Returns
    -------
    ``vgs`` for an N-channel switch, ``-vgs`` for a P-channel one [V].

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §3.5.1 (P-channel devices are the
    complement of N-channel ones, with every polarity reversed).
    """
    if polarity not in ("n", "p"):
        raise ValueError(f"polarity must be 'n' or 'p', not {polarity!r}")
    return _out(vgs) if polarity == "n" else _out(-np.asarray(vgs, dtype=float))


def source_node_voltage(polarity: Polarity, position: Position, v_bus, conducting: bool):
    """Range of the source terminal's potential from circuit ground [V].

    Parameters
    ----------
    polarity : ``"n"`` or ``"p"``
    position : ``"high"`` (drain or source on the bus) or ``"low"`` (on ground)
    v_bus : DC bus voltage [V]
    conducting : whether the switch is on (the switching node then sits at this switch's rail)

    Returns
    -------
    (lowest, highest) potential of the source [V]. A rail-side source (low-side N, high-side P)
    is fixed; a node-side source (high-side N, low-side P) follows the switching node, at this
    switch's rail while it conducts, anywhere from 0 to ``v_bus`` while it is off (the other
    switch, a body diode or the load may set it).

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §3.5.2–3.5.3 (high-side switching,
    why an N-channel high side needs a gate above the bus).
    """
    if position not in ("high", "low"):
        raise ValueError(f"position must be 'high' or 'low', not {position!r}")
    if polarity not in ("n", "p"):
        raise ValueError(f"polarity must be 'n' or 'p', not {polarity!r}")
    bus = np.asarray(v_bus, dtype=float)
    zero = 0.0 * bus
    rail = bus if position == "high" else zero
    rail_side = (polarity == "n" and position == "low") or (polarity == "p" and position == "high")
    if rail_side or conducting:
        return _out(rail), _out(rail)
    return _out(zero), _out(bus)


def vgs_from_gate_node(v_gate, polarity: Polarity, position: Position, v_bus, conducting: bool):
    """Gate-to-source voltage range for a gate-node voltage given from circuit ground [V].

    Parameters
    ----------
    v_gate : gate-node potential measured from circuit ground [V]
    polarity : ``"n"`` or ``"p"``
    position : ``"high"`` or ``"low"``
    v_bus : DC bus voltage [V]
    conducting : the state the level is meant for (on-level: True; off-level: False)

    Returns
    -------
    (lowest, highest) signed V_GS = V_gate − V_source [V]. A P-channel high side whose gate is
    pulled to ground sees V_GS = −V_bus; an N-channel high side held off at 0 V while the node
    sits at the bus sees V_GS = −V_bus.

    References
    ----------
    Kirchhoff's voltage law; source potentials as in :func:`source_node_voltage`.
    """
    s_lo, s_hi = source_node_voltage(polarity, position, v_bus, conducting)
    g = np.asarray(v_gate, dtype=float)
    return _out(g - s_hi), _out(g - s_lo)


def zener_clamped_vgs(vgs, v_zener, polarity: Polarity, v_forward=0.7, bidirectional: bool = False):
    """Gate-to-source voltage after a gate-source zener clamp [V].

    A single zener is fitted with its cathode towards the enhancing direction (at the gate of an
    N-channel switch, at the source of a P-channel one): it holds the enhancing voltage to
    ``v_zener`` and the reverse direction to one forward drop. Back-to-back zeners clamp both
    directions at ``v_zener + v_forward``. The clamp only works with resistance in series with
    the gate (see :func:`zener_series_resistor_min`).

    Parameters
    ----------
    vgs : unclamped signed gate-to-source voltage [V]
    v_zener : zener voltage [V]
    polarity : ``"n"`` or ``"p"``
    v_forward : zener forward drop [V]; 0.7 V is typical of silicon (common practice)
    bidirectional : back-to-back pair instead of a single zener

    Returns
    -------
    clamped signed V_GS [V]; a value exactly at the zener voltage is left unchanged.

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §3.5.4 (gate protection by zener);
    §1.2.6 (zener diodes).
    """
    v = np.asarray(vgs, dtype=float)
    vz = np.asarray(v_zener, dtype=float)
    vf = np.asarray(v_forward, dtype=float)
    if bidirectional:
        lo, hi = -(vz + vf), vz + vf
    elif polarity == "n":
        lo, hi = -vf, vz
    elif polarity == "p":
        lo, hi = -vz, vf
    else:
        raise ValueError(f"polarity must be 'n' or 'p', not {polarity!r}")
    return _out(np.clip(v, lo, hi))


def divided_vgs(v_applied, r_series, r_pull):
    """Gate-source voltage of a series resistor and gate-source pull resistor divider [V].

    Parameters
    ----------
    v_applied : voltage the drive stage applies across series resistor plus gate [V]
    r_series : resistor in series with the gate [Ω]
    r_pull : gate-to-source resistor [Ω]

    Returns
    -------
    V_GS = V · R_pull / (R_series + R_pull) [V] (steady state, no zener conducting).

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.3 (voltage dividers).
    """
    v, rs, rp = (np.asarray(a, dtype=float) for a in (v_applied, r_series, r_pull))
    return _out(v * rp / (rs + rp))


def divider_series_resistor(v_applied, v_target, r_pull):
    """Series resistor that divides ``v_applied`` down to ``v_target`` across ``r_pull`` [Ω].

    Solves V_target = V · R_p / (R_s + R_p) for R_s = R_p · (V / V_target − 1). Zero when the
    applied voltage is already at or below the target.

    Parameters
    ----------
    v_applied : magnitude of the voltage applied by the drive [V]
    v_target : wanted gate-source magnitude [V]
    r_pull : gate-to-source resistor [Ω]

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.3.
    """
    v, vt, rp = (np.asarray(a, dtype=float) for a in (v_applied, v_target, r_pull))
    return _out(np.maximum(rp * (v / vt - 1.0), 0.0))


def divider_ratio_window(v_applied_min, v_applied_max, v_needed, v_limit):
    """Divider ratios k = R_p/(R_s+R_p) that keep V_GS within [needed, limit] over a bus range.

    Requires k · V_min ≥ V_needed and k · V_max ≤ V_limit, so k ∈ [V_needed/V_min,
    V_limit/V_max]; a divider can serve only when the lower end does not exceed the upper
    (that is, V_max / V_min ≤ V_limit / V_needed). Beyond that ratio a zener clamp or a
    level-shifting driver is needed.

    Parameters
    ----------
    v_applied_min, v_applied_max : range of the applied drive voltage [V]
    v_needed : smallest acceptable |V_GS| while on [V]
    v_limit : largest acceptable |V_GS| [V]

    Returns
    -------
    (k_low, k_high) [unitless]; infeasible when k_low > k_high.

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.3 (dividers), applied to both
    ends of the supply range.
    """
    lo = np.asarray(v_needed, dtype=float) / np.asarray(v_applied_min, dtype=float)
    hi = np.asarray(v_limit, dtype=float) / np.asarray(v_applied_max, dtype=float)
    return _out(lo), _out(np.minimum(hi, 1.0))


def zener_current(v_applied, v_zener, r_series, r_pull=np.inf):
    """Current through a gate-source zener fed through a series resistor [A].

    I_z = (V − V_z)/R_s − V_z/R_pull while the divider alone would exceed V_z; zero otherwise.

    Parameters
    ----------
    v_applied : magnitude applied across series resistor plus gate [V]
    v_zener : zener voltage [V]
    r_series : series resistor [Ω]
    r_pull : gate-to-source resistor in parallel with the zener [Ω] (infinite if none)

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.6 (zener regulator with series
    resistor and load).
    """
    v, vz, rs, rp = (np.asarray(a, dtype=float) for a in (v_applied, v_zener, r_series, r_pull))
    return _out(np.maximum((v - vz) / rs - vz / rp, 0.0))


def zener_series_resistor_min(v_applied, v_zener, p_zener_max, r_pull=np.inf):
    """Smallest series resistor that keeps a clamping zener within its power rating [Ω].

    From V_z · ((V − V_z)/R_s − V_z/R_p) ≤ P_z: R_s ≥ (V − V_z) / (P_z/V_z + V_z/R_p).

    Parameters
    ----------
    v_applied : largest magnitude applied across series resistor plus gate [V]
    v_zener : zener voltage [V]
    p_zener_max : zener power rating, derated as the designer wishes [W]
    r_pull : gate-to-source resistor in parallel with the zener [Ω]

    References
    ----------
    Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.6.
    """
    v, vz, pz, rp = (np.asarray(a, dtype=float) for a in (v_applied, v_zener, p_zener_max, r_pull))
    return _out(np.maximum(v - vz, 0.0) / (pz / vz + vz / rp))


def miller_plateau(vth, i_d, gfs):
    """Miller plateau gate voltage V_pl ≈ V_th + I_D / g_fs [V].

    Parameters
    ----------
    vth : gate threshold magnitude [V]
    i_d : drain current being switched [A]
    gfs : forward transconductance [S]

    References
    ----------
    N. Mohan, T. Undeland, W. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003, §22-4
    (MOSFET switching waveforms); Baliga 2008 §6.
    """
    vth, i_d, gfs = (np.asarray(a, dtype=float) for a in (vth, i_d, gfs))
    return _out(vth + i_d / gfs)


def resistor_power(v, r):
    """Power dissipated by a resistor with ``v`` across it, P = V²/R [W].

    Parameters
    ----------
    v : voltage across the resistor [V]
    r : resistance [Ω]

    References
    ----------
    Joule's law; Horowitz & Hill, *The Art of Electronics*, 3rd ed., §1.2.2.
    """
    v, r = np.asarray(v, dtype=float), np.asarray(r, dtype=float)
    return _out(v * v / r)


def pin_edge_time(qg, i_pin):
    """Edge time of a gate driven by a current-limited pin, t = Q_g / I_pin [s].

    Parameters
    ----------
    qg : total gate charge moved in the edge [C]
    i_pin : current the pin can source or sink [A]

    References
    ----------
    Definition of gate charge, I = dQ/dt; Mohan, Undeland & Robbins, *Power Electronics*,
    3rd ed., §22-4.
    """
    qg, i = np.asarray(qg, dtype=float), np.asarray(i_pin, dtype=float)
    return _out(qg / i)


def vth_at_temperature(vth_ref, t, t_ref, coefficient):
    """Gate threshold at temperature ``t``, linear in temperature [V].

    V_th(T) = V_th(T_ref) + k · (T − T_ref); k is negative for silicon MOSFETs (a few mV/°C,
    from memory: take the part's curve where it gives one).

    Parameters
    ----------
    vth_ref : threshold magnitude at ``t_ref`` [V]
    t : temperature [°C]
    t_ref : temperature the threshold is given at [°C]
    coefficient : temperature coefficient of the threshold [V/°C]

    References
    ----------
    Baliga, *Fundamentals of Power Semiconductor Devices*, 2008, §6.3 (threshold falls with
    temperature through the Fermi potential and intrinsic carrier density).
    """
    v, tt, tr, k = (np.asarray(a, dtype=float) for a in (vth_ref, t, t_ref, coefficient))
    return _out(v + k * (tt - tr))


VTH_FLOOR_FRACTION = 0.5
"""Lowest threshold at temperature, as a fraction of the 25 °C value, for the linear model
[unitless]: normalised threshold curves of silicon MOSFETs seldom fall below about half at
150–175 °C (from memory)."""


def vth_hot_estimate(vth_ref, t, t_ref=25.0, coefficient=-5e-3, floor_fraction=VTH_FLOOR_FRACTION):
    """Threshold at ``t`` by the linear coefficient, never below ``floor_fraction`` of V_th(T_ref) [V].

    A linear coefficient taken far enough goes negative, which no part does; the floor keeps the
    estimate physical. Use the part's own threshold at temperature where it is given.

    Parameters
    ----------
    vth_ref : threshold magnitude at ``t_ref`` [V]
    t : temperature [°C]
    t_ref : temperature the threshold is given at [°C]
    coefficient : temperature coefficient [V/°C] (−5 mV/°C: from memory)
    floor_fraction : lowest fraction of ``vth_ref`` [unitless]

    References
    ----------
    Baliga, *Fundamentals of Power Semiconductor Devices*, 2008, §6.3 (threshold against
    temperature); coefficient and floor from memory.
    """
    v = np.asarray(vth_ref, dtype=float)
    lin = np.asarray(vth_at_temperature(v, t, t_ref, coefficient), dtype=float)
    return _out(np.maximum(lin, np.asarray(floor_fraction, dtype=float) * v))
