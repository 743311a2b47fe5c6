"""Protection and wiring: input current, fuse loading, prospective fault current, wire ampacity,
the fuse window that carries the load and protects the wire, TVS window, fault response.

References
----------
UL 248-14 (supplemental fuses); IEC 60127-1/-2 (miniature fuses); NFPA 70 (NEC) 2023, 210.20(A),
215.3, 240.4(D) and Table 310.16; ASTM B258-18 (AWG sizes, via :mod:`reviewer.physics.wire`).
The tables and their sources are in ``reviewer/tables/fuse_loading.toml`` and
``reviewer/tables/nec_310_16.toml``.
"""

from __future__ import annotations

from typing import Any

import numpy as np

from reviewer import tables
from reviewer.physics import wire
from reviewer.physics.arrays import arr, is_array
from reviewer.physics.bus import input_current

__all__ = [
    "input_current", "fuse_loading", "fuse_loading_limit", "fuse_rating_min",
    "prospective_short_circuit_current", "wire_ampacity", "wire_max_protection",
    "smallest_wire_for_fuse", "fuse_window", "tvs_window", "fault_current_at_response",
]

AREA_TOLERANCE = 0.01
"""A conductor counts as a listed size when its area is within 1 % below it (so that '5.26 mm²'
is 10 AWG) [unitless]."""


def fuse_loading(i_continuous: Any, rating: Any) -> Any:
    """Continuous current as a fraction of the fuse rating.

    Parameters
    ----------
    i_continuous : float or ndarray
        Continuous current through the fuse [A].
    rating : float or ndarray
        Fuse current rating [A].

    Returns
    -------
    float or ndarray
        ``I / I_rating`` [unitless].

    References
    ----------
    Definition; the limits it is judged against are in :func:`fuse_loading_limit`.
    """
    return i_continuous / rating


def fuse_loading_limit(standard: str) -> float:
    """Highest continuous loading of a fuse made to ``standard``.

    Parameters
    ----------
    standard : str
        ``"ul248"`` (0.75), ``"nec"`` (0.80, the code's 125 % sizing), ``"iec60127"`` (1.0),
        ``"automotive"`` (0.80) or ``"other"`` (0.75, the strictest).

    Returns
    -------
    float
        The limit [unitless]; each entry's basis and certainty are in the table file.

    References
    ----------
    ``reviewer/tables/fuse_loading.toml``: UL 248-14; NFPA 70 210.20(A) and 215.3; IEC 60127;
    ISO 8820-3 / SAE J1284 with common practice.
    """
    entries = tables.load("fuse_loading")["standards"]
    if standard not in entries:
        raise KeyError(f"no fuse loading limit for {standard!r}; known: {', '.join(entries)}")
    return float(entries[standard]["limit"])


def fuse_rating_min(i_continuous: Any, standard: str) -> Any:
    """Smallest fuse rating that carries a continuous current within its standard's limit.

    Parameters
    ----------
    i_continuous : float or ndarray
        Continuous current [A].
    standard : str
        Fuse standard, as in :func:`fuse_loading_limit`.

    Returns
    -------
    float or ndarray
        ``I / limit`` [A].

    References
    ----------
    As :func:`fuse_loading_limit`.
    """
    return i_continuous / fuse_loading_limit(standard)


def prospective_short_circuit_current(v_source: Any, r_internal: Any, r_circuit: Any = 0.0) -> Any:
    """Prospective short-circuit current of a source behind its internal resistance.

    Parameters
    ----------
    v_source : float or ndarray
        Open-circuit (or highest) source voltage [V].
    r_internal : float or ndarray
        Internal resistance of the source [Ω].
    r_circuit : float or ndarray
        Resistance of the wiring and fuse up to the fault [Ω] (default 0: a bolted fault at the
        terminals, the worst case).

    Returns
    -------
    float or ndarray
        ``I = V / (R_internal + R_circuit)`` [A]; for a battery often kiloamperes.

    References
    ----------
    Ohm's law for a Thévenin source.
    """
    return v_source / (r_internal + r_circuit)


def _nec() -> Any:
    return tables.load("nec_310_16")["data"]


def _column(insulation_temp: float) -> str | None:
    cols = sorted((int(c) for c in _nec()["column"]), reverse=True)
    for c in cols:
        if insulation_temp >= c:
            return str(c)
    return None


def _listed_index(area: float) -> int | None:
    """Index of the largest listed size whose area the conductor reaches (within tolerance)."""
    best = None
    for i, g in enumerate(_nec()["awg"]):
        if area >= wire.awg_area(wire.parse_awg(g)) * (1 - AREA_TOLERANCE):
            best = i
    return best


def _column_indices(insulation_temp: Any) -> tuple[Any, list[str]]:
    """Array form of :func:`_column`: for each element the index into the rising list of column
    temperatures (−1 where the insulation is below every column), and that list."""
    cols = sorted(int(c) for c in _nec()["column"])
    i = np.searchsorted(np.asarray(cols, dtype=float), arr(insulation_temp), side="right") - 1
    return i, [str(c) for c in cols]


def _listed_indices(area: Any) -> Any:
    """Array form of :func:`_listed_index`: −1 where the conductor reaches no listed size."""
    reach = np.asarray([wire.awg_area(wire.parse_awg(g)) * (1 - AREA_TOLERANCE)
                        for g in _nec()["awg"]])
    assert np.all(np.diff(reach) > 0), "the listed sizes rise"
    return np.searchsorted(reach, arr(area), side="right") - 1


def _ampacities(area: Any, insulation_temp: Any) -> tuple[Any, Any]:
    """Table 310.16 ampacity per element (NaN where the table says nothing) and the listed
    index per element (−1: below the table)."""
    ci, cols = _column_indices(insulation_temp)
    li = _listed_indices(area)
    ci, li = np.broadcast_arrays(ci, li)
    table = np.asarray([_nec()["column"][c] for c in cols], dtype=float)
    ok = (ci >= 0) & (li >= 0)
    return np.where(ok, table[np.maximum(ci, 0), np.maximum(li, 0)], np.nan), li


def wire_ampacity(area: Any, insulation_temp: Any = 75.0) -> Any:
    """Allowable ampacity of a copper conductor by NEC Table 310.16.

    A conductor between listed sizes (an mm² size, say) is rated as the next smaller listed size;
    the column is the highest temperature rating not above the insulation's.

    Parameters
    ----------
    area : float or ndarray
        Conductor cross-section [m²] (from an AWG size or mm², see :mod:`reviewer.physics.wire`).
    insulation_temp : float or ndarray
        Temperature rating of the insulation [°C].

    Returns
    -------
    float, None or ndarray
        Ampacity [A] (30 °C ambient, not more than three current-carrying conductors together);
        ``None`` when the conductor is smaller than 14 AWG or the insulation is rated below 60 °C,
        where the table says nothing (for array inputs: an array, NaN at those elements).
        Battery cables run in free air carry more (Table 310.17); this lookup is the
        conservative one.

    References
    ----------
    NFPA 70 (NEC) 2023, Table 310.16, copper; ASTM B258-18 for the AWG areas.
    """
    if is_array(area, insulation_temp):
        return _ampacities(area, insulation_temp)[0]
    col, i = _column(insulation_temp), _listed_index(area)
    if col is None or i is None:
        return None
    return float(_nec()["column"][col][i])


def wire_max_protection(area: Any, insulation_temp: Any = 75.0) -> Any:
    """Largest fuse rating that protects a copper conductor: its ampacity, and for 14, 12 and
    10 AWG no more than 15, 20 and 30 A.

    Parameters
    ----------
    area : float or ndarray
        Conductor cross-section [m²].
    insulation_temp : float or ndarray
        Temperature rating of the insulation [°C].

    Returns
    -------
    float, None or ndarray
        The limit [A], or ``None`` where :func:`wire_ampacity` has no value (NaN there for array
        inputs).

    References
    ----------
    NFPA 70 (NEC) 2023, 240.4(D) and Table 310.16. The code's allowance to round up to the next
    standard device rating (240.4(B)) is not taken: the review stays on the safe side.
    """
    small = tables.load("nec_310_16")["small_conductor"]
    if is_array(area, insulation_temp):
        amp, li = _ampacities(area, insulation_temp)
        cap = np.asarray([float(small["max_protection"][small["awg"].index(g)])
                          if g in small["awg"] else np.inf for g in _nec()["awg"]])
        return np.minimum(amp, cap[np.maximum(li, 0)])  # NaN (no ampacity) stays NaN
    amp = wire_ampacity(area, insulation_temp)
    if amp is None:
        return None
    i = _listed_index(area)
    gauge = _nec()["awg"][i]
    if gauge in small["awg"]:
        amp = min(amp, float(small["max_protection"][small["awg"].index(gauge)]))
    return amp


def smallest_wire_for_fuse(fuse_rating: Any, insulation_temp: Any = 75.0) -> Any:
    """The smallest listed copper conductor that a fuse of ``fuse_rating`` protects.

    Parameters
    ----------
    fuse_rating : float or ndarray
        Fuse current rating [A].
    insulation_temp : float or ndarray
        Temperature rating of the insulation [°C].

    Returns
    -------
    tuple of (str, float), None, or tuple of two ndarrays
        The AWG size (``"10"``, ``"1/0"``) and its area [m²]; ``None`` when no size in the table
        is enough. For array inputs: an object array of sizes (None where none is enough) and
        an array of areas (NaN there).

    References
    ----------
    NFPA 70 (NEC) 2023, 240.4(D) and Table 310.16.
    """
    if is_array(fuse_rating, insulation_temp):
        rating, temp = np.broadcast_arrays(arr(fuse_rating), arr(insulation_temp))
        gauges = np.full(rating.shape, None, dtype=object)
        areas = np.full(rating.shape, np.nan)
        for g in reversed(_nec()["awg"]):  # the smallest size that is enough wins
            area = wire.awg_area(wire.parse_awg(g))
            enough = wire_max_protection(np.full(rating.shape, area), temp) >= rating
            gauges[enough] = g
            areas[enough] = area
        return gauges, areas
    for g in _nec()["awg"]:
        area = wire.awg_area(wire.parse_awg(g))
        limit = wire_max_protection(area, insulation_temp)
        if limit is not None and limit >= fuse_rating:
            return g, area
    return None


def fuse_window(i_continuous: float, standard: str, wire_area: float | None,
                insulation_temp: float = 75.0) -> tuple[float, float | None]:
    """The range of fuse ratings that carries the load and protects the wire.

    Parameters
    ----------
    i_continuous : float
        Continuous current through the fuse [A].
    standard : str
        Fuse standard, as in :func:`fuse_loading_limit`.
    wire_area : float or None
        Cross-section of the conductor the fuse protects [m²]; ``None`` when not given.
    insulation_temp : float
        Temperature rating of the insulation [°C].

    Returns
    -------
    tuple of (float, float or None)
        ``(lowest, highest)`` rating [A]; the highest is ``None`` when the wire is not given or is
        below the table. The window is empty when lowest > highest: a bigger wire is needed.

    References
    ----------
    :func:`fuse_rating_min` and :func:`wire_max_protection`.
    """
    low = fuse_rating_min(i_continuous, standard)
    high = None if wire_area is None else wire_max_protection(wire_area, insulation_temp)
    return low, high


def tvs_window(v_bus_max: Any, vds_rating: Any) -> tuple[Any, Any]:
    """The standoff and clamp limits of a bus TVS (or snubber clamp).

    Parameters
    ----------
    v_bus_max : float or ndarray
        Highest bus voltage in service [V].
    vds_rating : float or ndarray
        Drain-source rating of the switches it protects [V].

    Returns
    -------
    tuple
        ``(lowest standoff, highest clamp)`` [V]: the standoff must sit at or above the highest bus
        so the TVS never conducts in service, the clamp at its rated pulse current at or below the
        switch rating. A TVS clamps near 1.6 times its standoff (common practice), so the window
        is practical only when ``vds_rating ≥ ~1.6 · v_bus_max``.

    References
    ----------
    Common practice for transient-voltage suppressor selection.
    """
    return v_bus_max, vds_rating


def fault_current_at_response(i_threshold: Any, v_bus: Any, l_fault: Any, t_response: Any) -> Any:
    """Current reached when overcurrent protection acts, for a fault that rises at V/L.

    Parameters
    ----------
    i_threshold : float or ndarray
        Overcurrent trip threshold [A].
    v_bus : float or ndarray
        Bus voltage driving the fault [V].
    l_fault : float or ndarray
        Inductance of the fault path [H].
    t_response : float or ndarray
        Time from the threshold being crossed to the switches being off [s].

    Returns
    -------
    float or ndarray
        ``I = I_threshold + (V / L) · t_response`` [A] (resistance neglected: the worst case).

    References
    ----------
    v = L·di/dt for an inductor.
    """
    return i_threshold + v_bus / l_fault * t_response


def fuse_ambient_factor(standard: str, ambient: Any) -> Any:
    """Rerating factor of a fuse's current rating at an ambient temperature.

    Parameters
    ----------
    standard : str
        Fuse standard, as in :func:`fuse_loading_limit`.
    ambient : float or ndarray
        Air temperature around the fuse [°C].

    Returns
    -------
    float or ndarray
        Factor [unitless], 1 at or below 25 °C, interpolated linearly above.

    Raises
    ------
    ValueError
        Above the table's last row: give the fuse maker's factor instead.

    References
    ----------
    ``reviewer/tables/fuse_ambient.toml`` (typical makers' curves, from memory).
    """
    import numpy as np

    data = tables.load("fuse_ambient")["data"]
    xs = np.asarray(data["ambient"], dtype=float)
    t = np.asarray(ambient, dtype=float)
    if np.any(t > xs[-1]):
        raise ValueError(f"no fuse rerating above {xs[-1]:g} °C in the table")
    ys = np.asarray(data["standard"][standard if standard in data["standard"] else "other"])
    out = np.interp(np.maximum(t, xs[0]), xs, ys)
    return float(out) if out.ndim == 0 else out


def fuse_ambient_covered(ambient: Any) -> Any:
    """Whether :func:`fuse_ambient_factor` has a value at ``ambient`` (at or below the table's
    last row) [bool, or a bool array].

    References
    ----------
    ``reviewer/tables/fuse_ambient.toml``.
    """
    top = float(tables.load("fuse_ambient")["data"]["ambient"][-1])
    covered = np.asarray(ambient, dtype=float) <= top
    return bool(covered) if covered.ndim == 0 else covered


def small_conductor(gauge: str) -> tuple[float, float, str] | None:
    """NEC 240.4(D)(1)/(2) for 18 and 16 AWG copper: (largest protection [A], largest continuous
    load [A], conditions), or None for other sizes.

    References
    ----------
    NFPA 70 (NEC) 2023, 240.4(D)(1) and (2) (from memory): 18 AWG 7 A with continuous load at
    most 5.6 A, 16 AWG 10 A with continuous load at most 8 A, and listed device kinds only.
    """
    below = tables.load("nec_310_16")["below_table"]
    if gauge not in below["awg"]:
        return None
    i = below["awg"].index(gauge)
    return float(below["max_protection"][i]), float(below["continuous_max"][i]), below["conditions"]


def small_conductor_gauge(area: Any) -> Any:
    """The 240.4(D) small size ('18' or '16') an area reaches (within :data:`AREA_TOLERANCE`)
    when it is below 14 AWG, or None; for an array of areas, an object array of these."""
    below = tables.load("nec_310_16")["below_table"]["awg"]
    if is_array(area):
        reach = np.asarray([wire.awg_area(wire.parse_awg(g)) * (1 - AREA_TOLERANCE)
                            for g in below])
        assert np.all(np.diff(reach) > 0), "the small sizes rise"
        i = np.searchsorted(reach, arr(area), side="right") - 1
        names = np.asarray([None, *below], dtype=object)
        return names[i + 1]
    best = None
    for g in below:
        if area >= wire.awg_area(wire.parse_awg(g)) * (1 - AREA_TOLERANCE):
            best = g
    return best


def capacitor_inrush_i2t(v_source: Any, capacitance: Any, r_total: Any) -> Any:
    """I²t of the current that charges an empty capacitor bank through a resistance.

    ``i(t) = (V/R)·e^(−t/RC)``, so ``∫i²dt = (V/R)²·RC/2 = C·V² / (2R)``: half the stored energy
    over the resistance, whatever the time constant.

    Parameters
    ----------
    v_source : float or ndarray
        Source voltage at connection [V].
    capacitance : float or ndarray
        Bus capacitance [F].
    r_total : float or ndarray
        Everything in series: source internal resistance, leads, capacitor ESR, pre-charge
        resistor [Ω].

    Returns
    -------
    float or ndarray
        ``I²t = C·V² / (2R)`` [A²s].

    References
    ----------
    First-order RC charging, integrated (any circuits text, e.g. Mohan, Undeland & Robbins 2003).
    """
    return capacitance * v_source**2 / (2 * r_total)


def adiabatic_k(insulation_temp: Any) -> Any:
    """k of copper for the adiabatic short-circuit withstand ``I²t ≤ k²·S²`` (S in mm²).

    Parameters
    ----------
    insulation_temp : float or ndarray
        Temperature rating of the insulation [°C]: below 90 °C thermoplastic (k = 115), at or
        above thermosetting (k = 143).

    Returns
    -------
    float or ndarray
        k [A·√s/mm²].

    References
    ----------
    IEC 60364-4-43, 434.5.2 and Table 43A (``reviewer/tables/iec60364_4_43_k.toml``, from
    memory).
    """
    import numpy as np

    ins = tables.load("iec60364_4_43_k")["insulation"]
    t = np.asarray(insulation_temp, dtype=float)
    out = np.where(t >= ins["thermosetting"]["from_temp"], ins["thermosetting"]["k"],
                   ins["thermoplastic"]["k"])
    return float(out) if out.ndim == 0 else out


def wire_withstand_i2t(k: Any, area: Any) -> Any:
    """Largest I²t a conductor takes adiabatically in a fault: ``k²·S²`` with S in mm².

    Parameters
    ----------
    k : float or ndarray
        From :func:`adiabatic_k` [A·√s/mm²].
    area : float or ndarray
        Conductor cross-section [m²].

    Returns
    -------
    float or ndarray
        ``k² · (S / 1 mm²)²`` [A²s].

    References
    ----------
    IEC 60364-4-43, 434.5.2 (t = (k·S/I)², valid up to 5 s).
    """
    return k**2 * (area * 1e6) ** 2


CLEARING_MULTIPLE = {"fast": 5.0, "medium": 7.0, "slow": 10.0}
"""Multiple of the rating at which a fuse of each speed opens within about 0.1 s [unitless]:
read from typical time-current curves of fast-acting, medium and time-delay fuses (from memory;
the fuse's own curve decides). A fuse of unstated speed is taken as time-delay."""


def clearing_multiple(speed: str | None) -> float:
    """The multiple of :data:`CLEARING_MULTIPLE` for a fuse speed (``None``: time-delay).

    References
    ----------
    Typical fuse time-current curves (from memory); IEC 60127-2 distinguishes F and T types.
    """
    return CLEARING_MULTIPLE["slow" if speed is None else speed]


def ampacity_ambient_factor(ambient: Any, insulation_temp: Any = 75.0) -> Any:
    """Correction of a Table 310.16 ampacity for an ambient above 30 °C.

    Parameters
    ----------
    ambient : float or ndarray
        Air temperature around the conductor [°C].
    insulation_temp : float or ndarray
        Temperature rating of the insulation [°C] (the column, as :func:`wire_ampacity`).

    Returns
    -------
    float, None or ndarray
        The factor [unitless] (1 at or below 30 °C); ``None`` above the table or for insulation
        below 60 °C (NaN at those elements for array inputs).

    References
    ----------
    NFPA 70 (NEC) 2023, Table 310.15(B)(1)(1) (``reviewer/tables/nec_310_15_ambient.toml``,
    from memory).
    """
    data = tables.load("nec_310_15_ambient")["data"]
    if is_array(ambient, insulation_temp):
        ci, cols = _column_indices(insulation_temp)
        upper = np.asarray(data["ambient_upper"], dtype=float)
        ri = np.searchsorted(upper, arr(ambient), side="left")  # first row at or above
        ci, ri = np.broadcast_arrays(ci, ri)
        table = np.asarray([data["column"][c] for c in cols], dtype=float)
        ok = (ci >= 0) & (ri < len(upper))
        return np.where(ok, table[np.maximum(ci, 0), np.minimum(ri, len(upper) - 1)], np.nan)
    col = _column(insulation_temp)
    if col is None or ambient > data["ambient_upper"][-1]:
        return None
    return float(data["column"][col][tables.step_index(data["ambient_upper"], ambient)])
