"""The DC bus of a single-phase bridge: ripple current, voltage ripple, capacitor sizing.

Derivation used throughout. A single-phase output ``v = √2·V·sin ωt`` driving ``i = √2·I·sin(ωt − φ)``
takes the instantaneous power ``p = V·I·cos φ − V·I·cos(2ωt − φ)``: a constant part and a part at
twice the output frequency whose amplitude is the apparent power ``S = V·I``. Drawn from a bus at
``V_bus`` (losses taken in proportion), the bus current has the mean ``I_dc = P / V_bus`` and a
component at ``2·f_out`` of amplitude ``S / V_bus``, so its rms is

    I_2f = S / (√2·V_bus) = I_dc / (√2·cos φ)

which is ``I_dc / √2`` for a resistive load and grows as the power factor falls. Averaged over a
switching period the bridge current is exactly this; the rest of the bridge's input current is at
the switching frequency and its sidebands.

References
----------
N. Mohan, T. M. Undeland, W. P. Robbins, *Power Electronics: Converters, Applications and
Design*, 3rd ed., Wiley, 2003, ch. 8 (single-phase inverters, DC-side current).
D. G. Holmes, T. A. Lipo, *Pulse Width Modulation for Power Converters*, IEEE Press/Wiley, 2003,
ch. 3 (switching functions of the single-phase bridge).
R. W. Erickson, D. Maksimović, *Fundamentals of Power Electronics*, 2nd ed., Springer, 2001,
ch. 2 (capacitor charge balance and small-ripple approximation).
"""

from __future__ import annotations

import math
from typing import Any

SQRT2 = math.sqrt(2.0)


def input_current(p_out: Any, v_bus: Any, efficiency: Any = 1.0) -> Any:
    """Mean current drawn from the bus.

    Parameters
    ----------
    p_out : float or ndarray
        Real output power [W].
    v_bus : float or ndarray
        Bus voltage [V].
    efficiency : float or ndarray
        Conversion efficiency, 0 < η ≤ 1 [unitless].

    Returns
    -------
    float or ndarray
        ``I_dc = P_out / (η · V_bus)`` [A].

    References
    ----------
    Conservation of energy; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    return p_out / (efficiency * v_bus)


def ripple_current_2f(i_dc: Any, power_factor: Any = 1.0) -> Any:
    """Rms of the bus current component at twice the output frequency, for a sinusoidal output.

    Parameters
    ----------
    i_dc : float or ndarray
        Mean bus current [A].
    power_factor : float or ndarray
        Displacement power factor of the load, cos φ, 0 < cos φ ≤ 1 [unitless].

    Returns
    -------
    float or ndarray
        ``I_2f = I_dc / (√2 · cos φ)`` [A] (the module docstring derives it).

    References
    ----------
    Mohan, Undeland & Robbins (2003), ch. 8; derivation from p(t) in the module docstring.
    """
    return i_dc / (SQRT2 * power_factor)


def input_current_rms(i_out_rms: Any, index: Any, power_factor: Any, modulation: str) -> Any:
    """Total rms of the bridge's input current under sine-triangle PWM (all frequencies).

    The bridge input current is the switching function times the output current. For two-level
    (bipolar) PWM the switching function is ±1, so its square is the output current's square and
    the rms equals the output rms. For three-level (unipolar) PWM the bridge applies ±V_bus for the
    fraction ``M·|sin θ|`` of each switching period and zero otherwise, so

        I_in,rms² = (1/2π)∫ M·|sin θ| · 2·I²·sin²(θ − φ) dθ = (2·M·I²/π)·(1 + cos(2φ)/3).

    Parameters
    ----------
    i_out_rms : float or ndarray
        Rms output current I [A].
    index : float or ndarray
        Modulation index M, 0 ≤ M ≤ 1 [unitless].
    power_factor : float or ndarray
        Displacement power factor cos φ of the output current [unitless].
    modulation : str
        ``"bipolar"`` (two-level) or ``"unipolar"`` (three-level).

    Returns
    -------
    float or ndarray
        Rms input current [A], assuming a carrier far above the output frequency.

    References
    ----------
    Holmes & Lipo (2003), ch. 3 (switching functions); the integral is worked in this docstring.
    """
    import numpy as np

    if modulation == "bipolar":
        out = np.broadcast_to(np.asarray(i_out_rms, dtype=float),
                              np.broadcast_shapes(np.shape(i_out_rms), np.shape(index),
                                                  np.shape(power_factor)))
        return float(out) if out.ndim == 0 else out.copy()
    if modulation == "unipolar":
        cos2phi = 2 * np.asarray(power_factor, dtype=float) ** 2 - 1
        out = np.sqrt(2 * np.asarray(index) * np.asarray(i_out_rms) ** 2 / math.pi
                      * (1 + cos2phi / 3))
        return float(out) if out.ndim == 0 else out
    raise ValueError(f"modulation is 'bipolar' or 'unipolar', found {modulation!r}")


def ripple_current_switching(i_out_rms: Any, index: Any, power_factor: Any, modulation: str) -> Any:
    """Rms of the switching-frequency part of the bus capacitor current under sine PWM.

    The capacitor takes all of the bridge input current but its mean (the source supplies the DC
    part); the low-frequency part of what remains is the 2·f_out component, so the switching part is

        I_sw² = I_in,rms² − I_dc² − I_2f²,  I_dc = M·I·cos φ / √2,  I_2f = M·I / 2.

    Parameters
    ----------
    i_out_rms : float or ndarray
        Rms output current [A].
    index : float or ndarray
        Modulation index M [unitless].
    power_factor : float or ndarray
        Displacement power factor cos φ [unitless].
    modulation : str
        ``"bipolar"`` or ``"unipolar"``.

    Returns
    -------
    float or ndarray
        Rms current at the switching frequency and its sidebands [A].

    References
    ----------
    Holmes & Lipo (2003), ch. 3; see :func:`input_current_rms`.
    """
    import numpy as np

    total = np.asarray(input_current_rms(i_out_rms, index, power_factor, modulation)) ** 2
    i_dc = index * i_out_rms * power_factor / SQRT2
    i_2f = index * i_out_rms / 2
    out = np.sqrt(np.maximum(total - i_dc**2 - i_2f**2, 0.0))
    return float(out) if out.ndim == 0 else out


def capacitor_ripple_rms(i_2f: Any, i_switching: Any) -> Any:
    """Total rms capacitor ripple current from its two components (orthogonal frequencies).

    Parameters
    ----------
    i_2f : float or ndarray
        Rms at twice the output frequency [A].
    i_switching : float or ndarray
        Rms at the switching frequency and its sidebands [A].

    Returns
    -------
    float or ndarray
        ``√(I_2f² + I_sw²)`` [A].

    References
    ----------
    Parseval's theorem: components at different frequencies add in power.
    """
    return (i_2f**2 + i_switching**2) ** 0.5


def bridge_input_current(switching: Any, i_out: Any) -> Any:
    """Instantaneous bridge input current from sampled waveforms: ``i_in = s(t) · i_out(t)``.

    Parameters
    ----------
    switching : ndarray
        Switching function of the bridge: +1, 0 or −1 at each sample [unitless].
    i_out : ndarray
        Output current at the same samples [A].

    Returns
    -------
    ndarray
        Input current samples [A]; their mean is I_dc and the rest flows in the bus capacitor.

    References
    ----------
    Holmes & Lipo (2003), ch. 3.
    """
    import numpy as np

    return np.asarray(switching, dtype=float) * np.asarray(i_out, dtype=float)


def bus_voltage_ripple(i_ripple_rms: Any, frequency: Any, capacitance: Any, esr: Any = 0.0) -> Any:
    """Rms bus voltage ripple when the capacitor carries a ripple current the source does not.

    Parameters
    ----------
    i_ripple_rms : float or ndarray
        Rms ripple current at ``frequency`` [A].
    frequency : float or ndarray
        Frequency of the ripple, 2·f_out for the low-frequency part [Hz].
    capacitance : float or ndarray
        Bus capacitance [F].
    esr : float or ndarray
        Equivalent series resistance [Ω] (default 0: the reactance alone).

    Returns
    -------
    float or ndarray
        ``ΔV_rms = I · √(ESR² + (1/(2π·f·C))²)`` [V]; the peak-to-peak of a sinusoidal ripple is
        ``2·√2`` times this (:func:`peak_to_peak`).

    References
    ----------
    Impedance of a series R-C; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    xc = 1.0 / (2 * math.pi * frequency * capacitance)
    return i_ripple_rms * (esr**2 + xc**2) ** 0.5


def peak_to_peak(rms: Any) -> Any:
    """Peak-to-peak of a sinusoid from its rms: ``2·√2·rms`` [same unit as ``rms``].

    References
    ----------
    Definition of rms for a sinusoid.
    """
    return 2 * SQRT2 * rms


def capacitance_for_ripple(i_ripple_rms: Any, frequency: Any, dv_rms: Any) -> Any:
    """Capacitance that holds the rms ripple at ``dv_rms`` (reactance alone): the inverse of
    :func:`bus_voltage_ripple` with zero ESR.

    Parameters
    ----------
    i_ripple_rms : float or ndarray
        Rms ripple current [A].
    frequency : float or ndarray
        Ripple frequency [Hz].
    dv_rms : float or ndarray
        Allowed rms voltage ripple [V].

    Returns
    -------
    float or ndarray
        ``C = I / (2π · f · ΔV)`` [F].

    References
    ----------
    Impedance of a capacitor.
    """
    return i_ripple_rms / (2 * math.pi * frequency * dv_rms)


def capacitor_voltage_needed(v_bus_max: Any, derating: Any = 0.8) -> Any:
    """Lowest capacitor voltage rating for a bus, with a derating factor.

    Parameters
    ----------
    v_bus_max : float or ndarray
        Highest bus voltage [V].
    derating : float or ndarray
        Largest allowed fraction of the rating in service [unitless] (0.8 for electrolytics:
        common practice).

    Returns
    -------
    float or ndarray
        ``V_rating ≥ V_bus,max / derating`` [V].

    References
    ----------
    Common practice for aluminium electrolytic capacitors.
    """
    return v_bus_max / derating


def local_capacitance(i_peak: Any, f_sw: Any, dv_allowed: Any, duty: Any = 0.5) -> Any:
    """High-frequency capacitance across a leg that supplies its switched current for one period.

    The leg draws a pulsed current of height ``I_peak`` for the fraction D of each switching period;
    charge balance on the local capacitor (the bulk capacitor and wiring supply only the mean)
    gives a peak-to-peak voltage step ``ΔV = I_peak · D · (1 − D) / (f_sw · C)``, largest at D = ½.

    Parameters
    ----------
    i_peak : float or ndarray
        Peak leg current [A].
    f_sw : float or ndarray
        Switching frequency [Hz].
    dv_allowed : float or ndarray
        Allowed peak-to-peak ripple across the local capacitor [V].
    duty : float or ndarray
        Duty cycle D [unitless] (default ½, the worst case).

    Returns
    -------
    float or ndarray
        ``C ≥ I_peak · D · (1 − D) / (f_sw · ΔV)`` [F].

    References
    ----------
    Erickson & Maksimović (2001), ch. 2, capacitor charge balance (the buck converter's input
    capacitor is the same calculation).
    """
    return i_peak * duty * (1 - duty) / (f_sw * dv_allowed)


def local_voltage_step(i_peak: Any, f_sw: Any, capacitance: Any, duty: Any = 0.5) -> Any:
    """Peak-to-peak step across a leg's local capacitor: :func:`local_capacitance` solved for ΔV.

    Parameters
    ----------
    i_peak : float or ndarray
        Peak leg current [A].
    f_sw : float or ndarray
        Switching frequency [Hz].
    capacitance : float or ndarray
        Local capacitance across the leg [F].
    duty : float or ndarray
        Duty cycle D [unitless] (default ½, the worst case).

    Returns
    -------
    float or ndarray
        ``ΔV = I_peak · D · (1 − D) / (f_sw · C)`` [V].

    References
    ----------
    Erickson & Maksimović (2001), ch. 2, capacitor charge balance.
    """
    return i_peak * duty * (1 - duty) / (f_sw * capacitance)


def edge_voltage_step(i_peak: Any, t_edge: Any, capacitance: Any) -> Any:
    """Dip across a leg's local capacitor while it supplies one switching edge.

    Through an edge the inductance of the leads to the bulk capacitors holds their current, so the
    change of leg current comes from the local capacitor: it gives up about ``Q = I_peak · t_edge``.

    Parameters
    ----------
    i_peak : float or ndarray
        Current commutated at the edge [A].
    t_edge : float or ndarray
        Duration of the edge [s].
    capacitance : float or ndarray
        Local capacitance across the leg [F].

    Returns
    -------
    float or ndarray
        ``ΔV = I_peak · t_edge / C`` [V] (an upper bound: the current ramps through the edge).

    References
    ----------
    Charge on a capacitor, Q = C·ΔV; Mohan, Undeland & Robbins (2003), switching transients.
    """
    return i_peak * t_edge / capacitance


def _as_out(x: Any) -> Any:
    import numpy as np

    a = np.asarray(x)
    return a.item() if a.ndim == 0 else a


def capacitor_impedance(frequency: Any, capacitance: Any, esr: Any = 0.0) -> Any:
    """Complex impedance of the bus capacitors at ``frequency``: ``ESR + 1/(jωC)`` [Ω].

    Parameters
    ----------
    frequency : float or ndarray
        Frequency [Hz].
    capacitance : float or ndarray
        Bus capacitance [F].
    esr : float or ndarray
        Equivalent series resistance [Ω].

    References
    ----------
    Impedance of a series R-C.
    """
    import numpy as np

    w = 2 * np.pi * np.asarray(frequency, dtype=float)
    return _as_out(np.asarray(esr, dtype=float) + 1.0 / (1j * w * np.asarray(capacitance, dtype=float)))


def source_share(r_source: Any, frequency: Any, capacitance: Any, esr: Any = 0.0) -> Any:
    """Fraction of a ripple current the source supplies when it shares it with the capacitors.

    The bridge draws the ripple current ``I`` from the node where the source (resistance ``R_s``)
    and the bus capacitors (``Z_c``) meet; the two branches divide it as a current divider:
    ``I_s = I · Z_c / (R_s + Z_c)``.

    Parameters
    ----------
    r_source : float or ndarray
        Source resistance up to the capacitors (internal resistance plus the leads) [Ω];
        ``inf`` for a source that cannot supply it (a rectifier off its peak), 0 for a stiff one.
    frequency : float or ndarray
        Ripple frequency [Hz].
    capacitance : float or ndarray
        Bus capacitance [F].
    esr : float or ndarray
        Capacitor ESR [Ω].

    Returns
    -------
    float or ndarray
        ``|Z_c / (R_s + Z_c)|`` [unitless], between 0 and 1 for a resistive source.

    References
    ----------
    Current divider; Mohan, Undeland & Robbins (2003), ch. 8 (DC-side current of the inverter).
    """
    import numpy as np

    zc = np.asarray(capacitor_impedance(frequency, capacitance, esr))
    rs = np.asarray(r_source, dtype=float)
    finite = np.isfinite(rs)
    share = np.abs(zc / (np.where(finite, rs, 0.0) + zc))
    return _as_out(np.where(finite, share, 0.0))


def shared_bus_ripple(i_ripple_rms: Any, r_source: Any, frequency: Any, capacitance: Any,
                      esr: Any = 0.0) -> Any:
    """Rms bus voltage ripple when source and capacitors share a ripple current.

    Parameters
    ----------
    i_ripple_rms : float or ndarray
        Rms ripple current the bridge draws at ``frequency`` [A].
    r_source : float or ndarray
        Source resistance [Ω] (``inf``: the capacitors carry it all).
    frequency : float or ndarray
        Ripple frequency [Hz].
    capacitance : float or ndarray
        Bus capacitance [F].
    esr : float or ndarray
        Capacitor ESR [Ω].

    Returns
    -------
    float or ndarray
        ``ΔV_rms = I · |R_s ∥ Z_c|`` [V]; with ``R_s = inf`` this is :func:`bus_voltage_ripple`.

    References
    ----------
    Parallel impedances; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    import numpy as np

    zc = np.asarray(capacitor_impedance(frequency, capacitance, esr))
    rs = np.asarray(r_source, dtype=float)
    finite = np.isfinite(rs)
    rs_f = np.where(finite, rs, 1.0)
    z = np.where(finite, rs_f * zc / (rs_f + zc), zc)
    return _as_out(np.asarray(i_ripple_rms, dtype=float) * np.abs(z))


def supply_lead_rms(i_dc: Any, i_2f_source: Any) -> Any:
    """Rms current in the supply lead: the mean plus the share of the 2·f ripple the source carries.

    Parameters
    ----------
    i_dc : float or ndarray
        Mean input current [A].
    i_2f_source : float or ndarray
        Rms of the 2·f_out current the source supplies [A].

    Returns
    -------
    float or ndarray
        ``√(I_dc² + I_2f,s²)`` [A] (components at different frequencies add in power; the
        switching-frequency part stays in the capacitors).

    References
    ----------
    Parseval's theorem; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    return (i_dc**2 + i_2f_source**2) ** 0.5
