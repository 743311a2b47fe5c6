"""The LC output filter between the bridge and the load, solved exactly per harmonic.

Circuit: bridge voltage → series inductor ``L`` with its winding resistance ``r_L`` → output
node; across the output node the capacitor ``C``, an optional damping branch ``R_d`` in series
with ``C_d`` (``R_d`` alone when ``C_d`` is not given) and the load ``R`` or ``R + jωL_load``.
With the shunt admittance ``Y_p = jωC + Y_d + Y_load`` and the series impedance
``Z_s = r_L + jωL`` the transfer to the load is ``H = 1 / (1 + Z_s · Y_p)``, the inductor
(bridge) current ``I_L = Y_p · H · V_bridge`` and the load current ``Y_load · H · V_bridge``.
Writing everything with admittances keeps the open-circuit (no load) and no-capacitor cases
finite.

References
----------
R. W. Erickson and D. Maksimović, *Fundamentals of Power Electronics*, 2nd ed., Kluwer, 2001,
ch. 2 (inductor volt-second balance and the small-ripple approximation) and ch. 10 (input
filter design, damping of the LC resonance).
N. Mohan, T. M. Undeland and W. P. Robbins, *Power Electronics*, 3rd ed., Wiley, 2003, ch. 8
(output filtering of PWM inverters).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import TYPE_CHECKING

from reviewer.physics.waveform import thd_band, time_samples

if TYPE_CHECKING:
    import numpy as np


def _w(freq: "np.ndarray | float") -> "np.ndarray":
    import numpy as np

    return 2 * np.pi * np.asarray(freq, dtype=float)


def load_admittance(freq: "np.ndarray | float", resistance: float | None,
                    inductance: float = 0.0) -> "np.ndarray":
    """Admittance of a resistive or series R-L load [S].

    Parameters
    ----------
    freq : array_like
        Frequencies [Hz].
    resistance : float or None
        Load resistance [Ω]; ``None`` for no load (open output).
    inductance : float
        Series load inductance [H].

    Returns
    -------
    numpy.ndarray
        ``1 / (R + jωL)`` [S] (zero with no load).

    References
    ----------
    Circuit theory (impedance of series elements).
    """
    import numpy as np

    w = _w(freq)
    if resistance is None:
        return np.zeros(w.shape, dtype=complex)
    return 1.0 / (resistance + 1j * w * inductance)


def damping_admittance(freq: "np.ndarray | float", resistance: float | None,
                       capacitance: float | None = None) -> "np.ndarray":
    """Admittance of the damping branch across the filter capacitor [S].

    Parameters
    ----------
    freq : array_like
        Frequencies [Hz].
    resistance : float or None
        Damping resistor ``R_d`` [Ω]; ``None`` for no damping branch.
    capacitance : float or None
        Blocking capacitor ``C_d`` in series with ``R_d`` [F]; ``None`` for ``R_d`` alone.

    Returns
    -------
    numpy.ndarray
        ``jωC_d / (1 + jωC_d·R_d)`` or ``1 / R_d`` [S].

    References
    ----------
    Erickson & Maksimović (2001), ch. 10 (parallel R-C_b damping).
    """
    import numpy as np

    w = _w(freq)
    if resistance is None:
        return np.zeros(w.shape, dtype=complex)
    if capacitance is None:
        return np.full(w.shape, 1.0 / resistance, dtype=complex)
    return 1j * w * capacitance / (1.0 + 1j * w * capacitance * resistance)


def capacitor_admittance(freq: "np.ndarray | float", capacitance: float,
                         esr: float = 0.0) -> "np.ndarray":
    """Admittance of the filter capacitor with its series resistance: ``jωC / (1 + jωC·ESR)`` [S].

    Parameters
    ----------
    freq : array_like
        Frequencies [Hz].
    capacitance : float or ndarray
        Capacitance [F] (0 for none).
    esr : float or ndarray
        Equivalent series resistance [Ω].

    References
    ----------
    Impedance of a series R-C.
    """
    y = 1j * _w(freq) * capacitance
    return y / (1.0 + y * esr)


def shunt_admittance(freq: "np.ndarray | float", capacitance: float, *,
                     load_resistance: float | None = None, load_inductance: float = 0.0,
                     damping_resistance: float | None = None,
                     damping_capacitance: float | None = None,
                     esr: float = 0.0) -> "np.ndarray":
    """Total admittance from the output node to the return: capacitor, damping, load [S].

    Parameters
    ----------
    freq : array_like
        Frequencies [Hz].
    capacitance : float
        Filter capacitor [F] (0 for none).
    load_resistance : float or None
        Load resistance [Ω] (``None``: open).
    load_inductance : float
        Load series inductance [H].
    damping_resistance : float or None
        Damping resistor [Ω].
    damping_capacitance : float or None
        Damping blocking capacitor [F].
    esr : float
        Series resistance of the filter capacitor [Ω] (default 0).

    Returns
    -------
    numpy.ndarray
        ``Y_p`` [S].

    References
    ----------
    Circuit theory (parallel admittances add).
    """
    return (capacitor_admittance(freq, capacitance, esr)
            + damping_admittance(freq, damping_resistance, damping_capacitance)
            + load_admittance(freq, load_resistance, load_inductance))


def transfer(freq: "np.ndarray | float", inductance: float, capacitance: float, *,
             dcr: float = 0.0, load_resistance: float | None = None,
             load_inductance: float = 0.0, damping_resistance: float | None = None,
             damping_capacitance: float | None = None, esr: float = 0.0) -> "np.ndarray":
    """Voltage transfer ``H(jω) = V_load / V_bridge`` of the LC filter into its load.

    Parameters
    ----------
    freq : array_like
        Frequencies [Hz].
    inductance : float
        Filter inductor [H] (0 for none).
    capacitance : float
        Filter capacitor [F] (0 for none).
    dcr : float
        Inductor winding resistance [Ω].
    load_resistance : float or None
        Load resistance [Ω] (``None``: no load).
    load_inductance : float
        Load series inductance [H].
    damping_resistance : float or None
        Damping resistor across the capacitor [Ω].
    damping_capacitance : float or None
        Capacitor in series with the damping resistor [F].
    esr : float
        Series resistance of the filter capacitor [Ω].

    Returns
    -------
    numpy.ndarray
        ``1 / (1 + (r_L + jωL) · Y_p)`` [unitless, complex].

    References
    ----------
    Erickson & Maksimović (2001), ch. 10; voltage divider of series and shunt branches.
    """
    import numpy as np

    zs = dcr + 1j * _w(freq) * inductance
    yp = shunt_admittance(freq, capacitance, load_resistance=load_resistance,
                          load_inductance=load_inductance,
                          damping_resistance=damping_resistance,
                          damping_capacitance=damping_capacitance, esr=esr)
    with np.errstate(divide="ignore", invalid="ignore"):
        # a lossless, unloaded filter has infinite gain exactly at its corner
        return np.where(1.0 + zs * yp == 0, np.inf, 1.0 / (1.0 + zs * yp))


def corner_frequency(inductance: float, capacitance: float) -> float:
    """Undamped LC corner ``f₀ = 1 / (2π√(LC))`` [Hz].

    Parameters
    ----------
    inductance : float
        [H]
    capacitance : float
        [F]

    Returns
    -------
    float
        [Hz]

    References
    ----------
    Erickson & Maksimović (2001), ch. 8 (second-order low-pass, resonant frequency).
    """
    return 1.0 / (2 * math.pi * math.sqrt(inductance * capacitance))


def peaking_q(resistance: float, inductance: float, capacitance: float) -> float:
    """Quality factor of the LC filter loaded by ``R`` in parallel: ``Q = R·√(C/L)`` [unitless].

    Parameters
    ----------
    resistance : float
        Load (or damping) resistance across the capacitor [Ω].
    inductance : float
        [H]
    capacitance : float
        [F]

    Returns
    -------
    float
        ``Q``; the gain at the corner of the lossless filter is ``Q`` [unitless].

    References
    ----------
    Erickson & Maksimović (2001), ch. 8 (parallel-loaded L-C low-pass: ``Q = R / R₀``,
    ``R₀ = √(L/C)``).
    """
    return resistance * math.sqrt(capacitance / inductance)


def peak_gain(inductance: float, capacitance: float, **circuit: float | None) -> tuple[float, float]:
    """Largest ``|H|`` of the filter and where it occurs (resonance peaking).

    Searched on a logarithmic grid of 4001 points from 0.1 to 10 times the corner, then
    refined by a parabola through the three points about the maximum.

    Parameters
    ----------
    inductance : float
        [H]
    capacitance : float
        [F]
    **circuit
        ``dcr``, ``load_resistance``, ``load_inductance``, ``damping_resistance``,
        ``damping_capacitance`` as for :func:`transfer`.

    Returns
    -------
    tuple of float
        ``(gain [unitless], frequency [Hz])``.

    References
    ----------
    Erickson & Maksimović (2001), ch. 8.
    """
    import numpy as np

    f_c = corner_frequency(inductance, capacitance)
    x = np.linspace(-1.0, 1.0, 4001)
    f = f_c * 10.0 ** x
    g = np.abs(transfer(f, inductance, capacitance, **circuit))
    i = int(np.argmax(g))
    if not np.isfinite(g[i]):
        return math.inf, float(f[i])
    if 0 < i < g.size - 1:
        y0, y1, y2 = g[i - 1], g[i], g[i + 1]
        den = y0 - 2 * y1 + y2
        if den < 0:
            d = 0.5 * (y0 - y2) / den
            h = x[1] - x[0]
            xp = x[i] + d * h
            gp = float(np.abs(transfer(f_c * 10.0 ** xp, inductance, capacitance, **circuit)))
            if gp >= y1:
                return gp, float(f_c * 10.0 ** xp)
    return float(g[i]), float(f[i])


def ripple_pp(kind: str, v_bus: float, inductance: float, carrier: float,
              index: float) -> float:
    """Largest peak-to-peak inductor ripple current over the output cycle [A].

    Small-ripple approximation: over one switching period the output voltage equals the local
    reference ``m·V`` (``m = M cos ω₀t``) and the inductor sees the bridge voltage minus it.
    Volt-second balance gives, with ``f_c`` the carrier:

    * two-level bipolar (``±V``): ``ΔI = V·(1 − m²) / (2·L·f_c)``, largest at ``m = 0``:
      ``V / (2·L·f_c)``;
    * three-level unipolar (``0/±V`` at ``2·f_c``): ``ΔI = V·|m|·(1 − |m|) / (2·L·f_c)``,
      largest ``V / (8·L·f_c)`` at ``|m| = ½``;
    * level-shifted carriers (``0/±V`` at ``f_c``): ``ΔI = V·|m|·(1 − |m|) / (L·f_c)``,
      largest ``V / (4·L·f_c)``.

    ``|m|`` is limited to ``min(M, 1)``.

    Parameters
    ----------
    kind : str
        ``spwm_bipolar``, ``spwm_unipolar`` or ``spwm_level_shifted``.
    v_bus : float
        [V]
    inductance : float
        [H]
    carrier : float
        [Hz]
    index : float
        Modulation index ``M`` [unitless].

    Returns
    -------
    float
        [A]

    References
    ----------
    Erickson & Maksimović (2001), ch. 2 (inductor volt-second balance); Holmes & Lipo,
    *Pulse Width Modulation for Power Converters*, 2003, ch. 3 (three-level switching at
    twice the carrier).
    """
    m = min(abs(index), 1.0)
    if kind == "spwm_bipolar":
        return v_bus / (2 * inductance * carrier)
    d = 0.5 if m >= 0.5 else m
    if kind == "spwm_unipolar":
        return v_bus * d * (1 - d) / (2 * inductance * carrier)
    if kind == "spwm_level_shifted":
        return v_bus * d * (1 - d) / (inductance * carrier)
    raise ValueError(f"no carrier ripple formula for modulation {kind!r}")


@dataclass(frozen=True, eq=False)
class FilterResponse:
    """Harmonic-by-harmonic result of a bridge spectrum through the filter into the load.

    Attributes are complex peak amplitudes per bin (``freq`` [Hz]): ``v_out`` [V] (capacitor
    and load voltage), ``i_inductor`` [A] (= bridge current), ``i_load`` [A], ``i_capacitor``
    [A]; and their RMS values over the band [V, A] and the time-domain peaks of the output
    voltage and inductor current reconstructed from all bins [V, A].
    """

    freq: "np.ndarray" = field(repr=False)
    v_out: "np.ndarray" = field(repr=False)
    i_inductor: "np.ndarray" = field(repr=False)
    i_load: "np.ndarray" = field(repr=False)
    i_capacitor: "np.ndarray" = field(repr=False)
    v_out_rms: float
    i_inductor_rms: float
    i_load_rms: float
    i_capacitor_rms: float
    v_out_peak: float
    i_inductor_peak: float
    i_inductor_pp: float


def band_rms(amp: "np.ndarray") -> float:
    """RMS of a one-sided set of peak amplitudes, ``amp[0]`` being DC [same unit as amp].

    Parameters
    ----------
    amp : numpy.ndarray
        Complex peak amplitudes [V or A].

    Returns
    -------
    float
        ``√(a₀² + Σ |a_k|² / 2)``.

    References
    ----------
    Parseval's theorem for Fourier series.
    """
    import numpy as np

    a = np.abs(np.asarray(amp))
    return float(math.sqrt(a[0] ** 2 + float(np.sum(a[1:] ** 2)) / 2))


def respond(freq: "np.ndarray", v_bridge: "np.ndarray", inductance: float,
            capacitance: float, *, dcr: float = 0.0, load_resistance: float | None = None,
            load_inductance: float = 0.0, damping_resistance: float | None = None,
            damping_capacitance: float | None = None, esr: float = 0.0) -> FilterResponse:
    """Pass a bridge spectrum through the filter: load voltage and all currents per bin.

    Parameters
    ----------
    freq : numpy.ndarray
        Bin frequencies of one window, ``freq[k] = k · Δf`` [Hz].
    v_bridge : numpy.ndarray
        Complex peak bridge voltage per bin [V].
    inductance, capacitance, dcr, load_resistance, load_inductance, damping_resistance, damping_capacitance, esr
        As for :func:`transfer` [H, F, Ω, Ω, H, Ω, F, Ω].

    Returns
    -------
    FilterResponse
        Amplitudes, RMS values and time-domain peaks.

    References
    ----------
    Erickson & Maksimović (2001), ch. 10; superposition of harmonics in a linear circuit.
    """
    import numpy as np

    w = _w(freq)
    y_load = load_admittance(freq, load_resistance, load_inductance)
    y_c = capacitor_admittance(freq, capacitance, esr)
    yp = y_c + damping_admittance(freq, damping_resistance, damping_capacitance) + y_load
    den = 1.0 + (dcr + 1j * w * inductance) * yp
    with np.errstate(divide="ignore", invalid="ignore"):
        h = np.where(den == 0, np.inf, 1.0 / den)
    v_out = h * v_bridge
    i_l = yp * v_out
    i_load = y_load * v_out
    i_c = y_c * v_out
    # time-domain peaks from the lower half of the band (16 carrier groups and more): the
    # rest carries less than 10⁻⁴ of the current in any filter worth the name
    half = max(len(freq) // 2, 1)
    vt = time_samples(v_out[:half])
    it = time_samples(i_l[:half])
    return FilterResponse(freq=np.asarray(freq), v_out=v_out, i_inductor=i_l, i_load=i_load,
                          i_capacitor=i_c, v_out_rms=band_rms(v_out),
                          i_inductor_rms=band_rms(i_l), i_load_rms=band_rms(i_load),
                          i_capacitor_rms=band_rms(i_c), v_out_peak=float(np.max(np.abs(vt))),
                          i_inductor_peak=float(np.max(np.abs(it))),
                          i_inductor_pp=float(np.max(it) - np.min(it)))


def open_loop_output(v_out_rms: float, v_bus: float, v_bus_min: float, v_bus_max: float,
                     v_target: float) -> tuple[float, float, float, float]:
    """Output RMS at the bus extremes without feedback, and its deviation from the target.

    Every voltage in the bridge model is the bus voltage times a switching function, and the
    filter and load are linear, so the output scales with the bus: ``V_out(V) = V_out · V / V_nom``.

    Parameters
    ----------
    v_out_rms : float
        Output RMS computed at ``v_bus`` [V].
    v_bus : float
        Bus voltage it was computed at [V].
    v_bus_min, v_bus_max : float
        Bus extremes [V].
    v_target : float
        Target output RMS [V].

    Returns
    -------
    tuple of float
        ``(V_out at min [V], V_out at max [V], deviation at min [unitless],
        deviation at max [unitless])``, deviations as ``V/V_target − 1``.

    References
    ----------
    Holmes & Lipo (2003), ch. 3 (open-loop output proportional to the DC link voltage).
    """
    lo = v_out_rms * v_bus_min / v_bus
    hi = v_out_rms * v_bus_max / v_bus
    return lo, hi, lo / v_target - 1, hi / v_target - 1


def index_for_rms(v_target: float, v_bus: float, gain: float) -> float:
    """Modulation index for a target RMS fundamental at the load (linear range).

    ``M = √2 · V_target / (V_bus · |H(jω₀)|)``, from the fundamental ``M·V_bus`` of
    naturally sampled sine PWM for ``M ≤ 1``.

    Parameters
    ----------
    v_target : float
        [V rms]
    v_bus : float
        [V]
    gain : float
        ``|H|`` of the filter at the output frequency [unitless].

    Returns
    -------
    float
        [unitless]; above 1 it is over-modulation and the linear law no longer holds.

    References
    ----------
    Holmes & Lipo (2003), ch. 3.
    """
    return math.sqrt(2.0) * v_target / (v_bus * gain)


def _significant(freq: "np.ndarray", amp: "np.ndarray", f0: float,
                 floor: float = 1e-5) -> tuple["np.ndarray", "np.ndarray"]:
    import numpy as np

    mag = np.abs(amp)
    i1 = int(np.argmin(np.abs(freq - f0)))
    keep = mag >= floor * mag[i1]
    keep[0] = False
    return freq[keep], amp[keep]


def corner_for_thd(freq: "np.ndarray", v_bridge: "np.ndarray", f0: float, target: float,
                   z0: float, *, load_resistance: float | None = None,
                   load_inductance: float = 0.0, max_order: float | None = None,
                   ) -> tuple[float, float, float]:
    """The highest LC corner whose filtered distortion meets ``target``, and its L and C.

    The characteristic impedance ``z0 = √(L/C)`` is held (keep the design's ratio, or take
    ``z0`` equal to the full-load resistance for ``Q ≈ 1``), so ``L = z0 / (2π·f_LC)`` and
    ``C = 1 / (2π·f_LC·z0)``. The inductor's resistance and any damping branch are left out
    (both only lower the distortion). Components below ``10⁻⁵`` of the fundamental are ignored.
    The corner is scanned on a logarithmic grid from ``1.2·f₀`` to the top of the band and the
    first passing corner from the top is refined by bisection.

    Parameters
    ----------
    freq : numpy.ndarray
        Bin frequencies [Hz].
    v_bridge : numpy.ndarray
        Bridge voltage per bin [V].
    f0 : float
        Output frequency [Hz].
    target : float
        Distortion target [unitless].
    z0 : float
        Characteristic impedance to hold [Ω].
    load_resistance, load_inductance : float
        Load [Ω, H].
    max_order : float, optional
        Highest order counted in the distortion (``None``: the resolved band).

    Returns
    -------
    tuple of float
        ``(f_LC [Hz], L [H], C [F])``; all ``nan`` when no corner above ``1.2·f₀`` passes.

    References
    ----------
    Erickson & Maksimović (2001), ch. 8 and 10; Mohan, Undeland & Robbins (2003), ch. 8.
    """
    import numpy as np

    f, a = _significant(np.asarray(freq), np.asarray(v_bridge), f0)

    def thd_at(fc: float) -> float:
        ll = z0 / (2 * math.pi * fc)
        cc = 1.0 / (2 * math.pi * fc * z0)
        h = transfer(f, ll, cc, load_resistance=load_resistance,
                     load_inductance=load_inductance)
        return thd_band(f, h * a, f0, max_order)

    lo, hi = 1.2 * f0, float(np.max(f))
    grid = np.geomspace(hi, lo, 60)
    i = next((k for k, x in enumerate(grid) if thd_at(x) <= target), None)  # the first from the top
    if i is None:
        return math.nan, math.nan, math.nan
    if i == 0:
        best = float(grid[0])
    else:
        bad, good = float(grid[i - 1]), float(grid[i])
        for _ in range(30):
            mid = math.sqrt(bad * good)
            if thd_at(mid) <= target:
                good = mid
            else:
                bad = mid
        best = good
    return best, z0 / (2 * math.pi * best), 1.0 / (2 * math.pi * best * z0)


def carrier_for_thd(freq: "np.ndarray", v_bridge: "np.ndarray", f0: float, carrier: float,
                    target: float, inductance: float, capacitance: float, *,
                    max_order: float | None = None, **circuit: float | None) -> float:
    """The lowest carrier at which the given filter meets the distortion ``target`` [Hz].

    The carrier sidebands keep their amplitudes and move with the carrier: a component at
    ``f = m·f_c + n·f₀`` (``m = round(f / f_c)``) is moved to ``m·f_c' + n·f₀``; components
    below ``f_c / 2`` stay. This holds while the sideband groups stay clear of the baseband
    (carrier ratios above about 10; Holmes & Lipo, ch. 3: the Bessel amplitudes depend on
    ``M`` and ``m``, not on ``f_c``). The result should be confirmed by a new synthesis.

    Parameters
    ----------
    freq : numpy.ndarray
        Bin frequencies [Hz].
    v_bridge : numpy.ndarray
        Bridge voltage per bin at ``carrier`` [V].
    f0 : float
        Output frequency [Hz].
    carrier : float
        Carrier the spectrum was made with [Hz].
    target : float
        Distortion target [unitless].
    inductance, capacitance : float
        Filter [H, F].
    max_order : float, optional
        Highest order counted.
    **circuit
        ``dcr``, ``load_resistance``, ``load_inductance``, ``damping_resistance``,
        ``damping_capacitance`` as for :func:`transfer`.

    Returns
    -------
    float
        Carrier [Hz] searched from ``max(20·f₀, f_c/8)`` to ``64·f_c``; ``nan`` when none passes.

    References
    ----------
    Holmes & Lipo (2003), ch. 3.
    """
    import numpy as np

    f, a = _significant(np.asarray(freq), np.asarray(v_bridge), f0)
    m = np.where(f >= carrier / 2, np.round(f / carrier), 0.0)
    offset = f - m * carrier

    def thd_at(fc: float) -> float:
        fn = m * fc + offset
        h = transfer(np.abs(fn), inductance, capacitance, **circuit)
        return thd_band(np.abs(fn), h * a, f0, max_order)

    grid = np.geomspace(max(20 * f0, carrier / 8), 64 * carrier, 60)
    i = next((k for k, x in enumerate(grid) if thd_at(x) <= target), None)  # the lowest passing
    if i is None:
        return math.nan
    if i == 0:
        return float(grid[0])
    bad, good = float(grid[i - 1]), float(grid[i])
    for _ in range(30):
        mid = math.sqrt(bad * good)
        if thd_at(mid) <= target:
            good = mid
        else:
            bad = mid
    return good


DEFAULT_INDUCTOR_Q = 50.0
"""Inductor quality factor ωL/r_L at the corner assumed when the winding resistance is not given
[unitless] (common practice for powdered-iron and ferrite filter chokes: 30-100)."""
DEFAULT_CAPACITOR_Q = 200.0
"""Capacitor quality factor 1/(ωC·ESR) at the corner assumed when its ESR is not given
[unitless] (common practice for film capacitors: several hundred at a few kHz)."""


def default_dcr(inductance: "float | np.ndarray", capacitance: "float | np.ndarray",
                q: float = DEFAULT_INDUCTOR_Q) -> "float | np.ndarray":
    """Winding resistance of an inductor of quality ``q`` at the LC corner: ``r_L = ω₀L / Q``.

    Parameters
    ----------
    inductance : float or ndarray
        [H]
    capacitance : float or ndarray
        [F]
    q : float
        Inductor quality factor at the corner [unitless].

    Returns
    -------
    float or ndarray
        ``r_L = √(L/C) / Q`` [Ω] (ω₀L = √(L/C) at the corner).

    References
    ----------
    Definition of the quality factor of a reactor, Q = ωL / R.
    """
    return (inductance / capacitance) ** 0.5 / q


def default_esr(inductance: "float | np.ndarray", capacitance: "float | np.ndarray",
                q: float = DEFAULT_CAPACITOR_Q) -> "float | np.ndarray":
    """Series resistance of a capacitor of quality ``q`` at the LC corner: ``ESR = 1/(ω₀C·Q)``.

    Parameters
    ----------
    inductance : float or ndarray
        [H]
    capacitance : float or ndarray
        [F]
    q : float
        Capacitor quality factor at the corner [unitless].

    Returns
    -------
    float or ndarray
        ``ESR = √(L/C) / Q`` [Ω] (1/(ω₀C) = √(L/C) at the corner).

    References
    ----------
    Definition of the quality factor of a capacitor, Q = 1 / (ωC·ESR).
    """
    return (inductance / capacitance) ** 0.5 / q
