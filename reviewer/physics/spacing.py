"""Insulation and spacing: IEC 60664-1 clearance and creepage, IPC-2221 conductor spacing, the
insulation a touchable part needs, and trace width from the IPC-2221 curve fit.

Every lookup states how it reads its table, as the table file says: Table F.1 steps ('up to and
including'), Table F.2 and Table F.4 interpolate linearly between rows, IPC-2221 Table 6-1 steps by
voltage band. Results are minimums for a review, not a certification of any design.

References
----------
IEC 60664-1:2007 (Ed. 2.0), Insulation coordination for equipment within low-voltage systems,
Tables F.1, F.2, F.4 (F.5 in the 2020 edition) and A.2, clauses 5.1.6 and 5.2.
IPC-2221B (2012), Generic Standard on Printed Board Design, Table 6-1 and the conductor sizing
charts of 6.2 (superseded by IPC-2152).
IEC 61140:2016 for the extra-low-voltage band (:mod:`reviewer.physics.band`).
"""

from __future__ import annotations

from typing import Any

import numpy as np

from reviewer import tables
from reviewer.physics.arrays import arr, is_array

MM = 1e-3
MIL = 25.4e-6
INSULATION_ORDER = ("none", "functional", "basic", "reinforced")
INSULATION_EQUIVALENT = {"supplementary": "basic", "double": "reinforced"}
"""Grades that count as another: supplementary insulation alone is one layer like basic; double
insulation (basic plus supplementary) ranks with reinforced (IEC 61140:2016)."""


def _step(bounds: tuple[float, ...], x: Any) -> Any:
    """:func:`reviewer.tables.step_index` per element: the first row at or above ``x``."""
    if not is_array(x):
        return tables.step_index(bounds, x)
    xs = arr(x)
    if np.any(xs > bounds[-1]):
        raise ValueError(f"{np.max(xs):g} lies above the table's last row ({bounds[-1]:g})")
    return np.searchsorted(np.asarray(bounds, dtype=float), xs, side="left")


def _interp(xs: tuple[float, ...], ys: tuple[float, ...], x: Any) -> Any:
    """:func:`reviewer.tables.interpolate` per element (the first row below the table, a
    ValueError above it)."""
    if not is_array(x):
        return tables.interpolate(xs, ys, x)
    at = arr(x)
    if np.any(at > xs[-1]):
        raise ValueError(f"{np.max(at):g} lies above the table's last row ({xs[-1]:g})")
    return np.interp(at, np.asarray(xs, dtype=float), np.asarray(ys, dtype=float))


def highest_system_voltage() -> float:
    """The highest system voltage IEC 60664-1 Table F.1 lists here [V]: beyond it no rated
    impulse, clearance or test voltage is computed (the tables cover low-voltage systems)."""
    return float(tables.load("iec60664_1_impulse")["data"]["system_voltage"][-1])


def highest_working_voltage() -> float:
    """The highest working voltage IEC 60664-1 Table F.4 lists here [V]: beyond it no creepage
    is computed."""
    return float(tables.load("iec60664_1_creepage")["data"]["voltage"][-1])


def rated_impulse_voltage(system_voltage: Any, category: str) -> Any:
    """Rated impulse voltage for equipment fed from a low-voltage system (steps, no interpolation).

    Parameters
    ----------
    system_voltage : float or ndarray
        Nominal line-to-neutral voltage of the supply system, a.c. rms or d.c. [V].
    category : str
        Overvoltage category ``"I"`` to ``"IV"``.

    Returns
    -------
    float or ndarray
        Rated impulse voltage [V] of the first row at or above ``system_voltage``.

    References
    ----------
    IEC 60664-1:2007, Table F.1.
    """
    data = tables.load("iec60664_1_impulse")["data"]
    i = _step(data["system_voltage"], system_voltage)
    if is_array(i):
        return np.asarray(data["category"][category], dtype=float)[i]
    return float(data["category"][category][i])


def altitude_factor(altitude: Any) -> Any:
    """Multiplier for clearances above 2000 m (1 at or below), interpolated.

    Parameters
    ----------
    altitude : float
        Altitude above sea level [m].

    Returns
    -------
    float
        Correction factor [unitless].

    References
    ----------
    IEC 60664-1:2007, Table A.2.
    """
    data = tables.load("iec60664_1_altitude")["data"]
    if is_array(altitude):
        return _interp(data["altitude_m"], data["factor"], np.maximum(altitude, 2000.0))
    return tables.interpolate(data["altitude_m"], data["factor"], max(altitude, 2000.0))


def reinforced_impulse(v_impulse: Any) -> Any:
    """The impulse voltage reinforced insulation is dimensioned for: one step higher in the
    preferred series than the smallest preferred value at or above ``v_impulse``.

    Parameters
    ----------
    v_impulse : float
        Rated impulse voltage for basic insulation [V].

    Returns
    -------
    float
        Impulse voltage for reinforced insulation [V].

    References
    ----------
    IEC 60664-1:2007, 5.1.6 and the preferred series of 4.2.3.
    """
    series = tables.load("iec60664_1_clearance")["reinforced"]["preferred_series"]
    i = _step(series, v_impulse)
    if np.any(np.asarray(i) + 1 >= len(series)):
        raise ValueError(f"no preferred impulse voltage above {series[-1]} V")
    if is_array(i):
        return np.asarray(series, dtype=float)[i + 1]
    return float(series[i + 1])


def clearance_for_impulse(v_impulse: Any, pollution_degree: int, altitude: Any = 0.0) -> Any:
    """Minimum clearance for a required impulse withstand voltage, inhomogeneous field.

    Parameters
    ----------
    v_impulse : float
        Required impulse withstand voltage [V].
    pollution_degree : int
        1 to 4.
    altitude : float
        Altitude [m]; above 2000 m the Table A.2 factor applies.

    Returns
    -------
    float
        Clearance [m], interpolated linearly between rows.

    References
    ----------
    IEC 60664-1:2007, Table F.2 (Case A) and Table A.2.
    """
    data = tables.load("iec60664_1_clearance")["data"]
    mm = _interp(data["impulse_kv"], data["pollution_degree"][str(pollution_degree)],
                 v_impulse / 1000.0)
    return mm * MM * altitude_factor(altitude)


def clearance_required(system_voltage: Any, category: str, pollution_degree: int,
                       insulation: str = "basic", altitude: Any = 0.0) -> Any:
    """Clearance for basic or reinforced insulation in equipment fed from a low-voltage system.

    Parameters
    ----------
    system_voltage : float
        Nominal line-to-neutral system voltage [V].
    category : str
        Overvoltage category ``"I"`` to ``"IV"``.
    pollution_degree : int
        1 to 4.
    insulation : str
        ``"basic"`` (also functional) or ``"reinforced"``.
    altitude : float
        Altitude [m].

    Returns
    -------
    float
        Clearance [m].

    References
    ----------
    IEC 60664-1:2007, Tables F.1, F.2, A.2 and clause 5.1.6.
    """
    v = rated_impulse_voltage(system_voltage, category)
    if insulation == "reinforced":
        v = reinforced_impulse(v)
    return clearance_for_impulse(v, pollution_degree, altitude)


def _creepage_column(pollution_degree: int, material_group: str, printed_wiring: bool) -> str:
    group = "III" if material_group in ("IIIa", "IIIb") else material_group
    if group not in ("I", "II", "III"):
        raise ValueError(f"material group is I, II, IIIa or IIIb, found {material_group!r}")
    if pollution_degree == 1:
        return "pwb_pd1" if printed_wiring else "pd1"
    if pollution_degree == 2:
        if printed_wiring and material_group != "IIIb":
            return "pwb_pd2"
        return f"pd2_{group}"
    if pollution_degree == 3:
        return f"pd3_{group}"
    raise ValueError("Table F.4 as kept here covers pollution degrees 1 to 3")


def creepage_required(v_working: Any, pollution_degree: int, material_group: str,
                      printed_wiring: bool = True, insulation: str = "basic") -> Any:
    """Minimum creepage distance for a working voltage, interpolated linearly between rows.

    Parameters
    ----------
    v_working : float
        Working voltage across the insulation, rms (d.c.: its value) [V].
    pollution_degree : int
        1 to 3.
    material_group : str
        ``"I"``, ``"II"``, ``"IIIa"`` or ``"IIIb"`` (by comparative tracking index).
    printed_wiring : bool
        The creepage path runs over printed-wiring material (the printed-wiring columns apply at
        pollution degrees 1 and 2, except material group IIIb at 2).
    insulation : str
        ``"basic"`` (also functional) or ``"reinforced"`` (twice the basic value).

    Returns
    -------
    float
        Creepage [m]; below 10 V the 10 V row applies.

    References
    ----------
    IEC 60664-1:2007, Table F.4 (Table F.5 in the 2020 edition) and 5.2 (reinforced: twice basic).
    """
    table = tables.load("iec60664_1_creepage")
    col = _creepage_column(pollution_degree, material_group, printed_wiring)
    mm = _interp(table["data"]["voltage"], table["data"]["columns"][col], v_working)
    if insulation == "reinforced":
        mm *= table["reinforced"]["factor"]
    return mm * MM


def creepage_needed(creepage: Any, clearance: Any) -> Any:
    """A creepage distance is never less than its associated clearance: ``max(creepage, clearance)``
    [m] (per element for arrays).

    References
    ----------
    IEC 60664-1:2007, 5.2.
    """
    if is_array(creepage, clearance):
        return np.maximum(creepage, clearance)
    return max(creepage, clearance)


def ipc2221_spacing(voltage: Any, column: str) -> Any:
    """Minimum conductor spacing on a printed board by voltage band.

    Parameters
    ----------
    voltage : float
        Voltage between the conductors, d.c. or a.c. peak [V].
    column : str
        ``"B1"`` internal; ``"B2"`` external uncoated ≤ 3050 m; ``"B3"`` external uncoated
        > 3050 m; ``"B4"`` external with permanent polymer coating; ``"A5"`` external with
        conformal coating over the assembly; ``"A6"`` component lead uncoated; ``"A7"`` component
        lead with conformal coating.

    Returns
    -------
    float
        Spacing [m]: the band's value (steps), or above 500 V the 301–500 V value plus the
        column's increment per volt above 500.

    References
    ----------
    IPC-2221B, Table 6-1.
    """
    data = tables.load("ipc2221_spacing")["data"]
    values = data["columns"][column]
    top = data["band_upper"][-1]
    if is_array(voltage):
        v = arr(voltage)
        above = (values[-1] + data["per_volt_above_500"][column] * (v - top)) * MM
        row = np.searchsorted(np.asarray(data["band_upper"], dtype=float), np.minimum(v, top),
                              side="left")
        return np.where(v > top, above, np.asarray(values, dtype=float)[row] * MM)
    if voltage > top:
        return (values[-1] + data["per_volt_above_500"][column] * (voltage - top)) * MM
    return values[tables.step_index(data["band_upper"], voltage)] * MM


def ipc2221_column(layer: str, coated: bool, altitude: Any = 0.0) -> Any:
    """The Table 6-1 column for bare conductors on a layer.

    Parameters
    ----------
    layer : str
        ``"inner"`` or ``"outer"``.
    coated : bool
        The assembly carries a conformal coating.
    altitude : float
        Altitude [m] (uncoated outer conductors above 3050 m take B3).

    Returns
    -------
    str or ndarray
        ``"B1"``, ``"A5"``, ``"B2"`` or ``"B3"`` (for an array of altitudes on an uncoated outer
        layer, an object array of these, one per element).

    References
    ----------
    IPC-2221B, Table 6-1 column headings.
    """
    if layer == "inner":
        return "B1"
    if coated:
        return "A5"
    if is_array(altitude):  # one column per element
        return np.where(arr(altitude) > 3050.0, "B3", "B2").astype(object)
    return "B3" if altitude > 3050.0 else "B2"


def required_insulation(beyond_elv: bool, earthed: bool = False) -> str:
    """The insulation a part a person can touch needs from the circuit that drives the bridge.

    Parameters
    ----------
    beyond_elv : bool
        The bus or the output is beyond extra-low voltage (:mod:`reviewer.physics.band`).
    earthed : bool
        The touchable part is conductive and bonded to protective earth (protective class I).

    Returns
    -------
    str
        ``"reinforced"`` (or double: basic plus supplementary) for a part that is not earthed,
        ``"basic"`` for an earthed conductive part, ``"functional"`` within extra-low voltage.

    References
    ----------
    IEC 61140:2016, protective provisions: class I (basic insulation and protective earthing),
    class II (double or reinforced insulation); extra-low voltage needs no protection against
    shock for itself.
    """
    if not beyond_elv:
        return "functional"
    return "basic" if earthed else "reinforced"


def insulation_sufficient(provided: str | None, required: str) -> bool:
    """Whether the insulation provided is at least the grade required.

    Parameters
    ----------
    provided : str or None
        ``"none"``, ``"functional"``, ``"basic"``, ``"supplementary"``, ``"double"``,
        ``"reinforced"`` or ``None`` (not stated).
    required : str
        The grade required, from :func:`required_insulation`.

    Returns
    -------
    bool

    References
    ----------
    IEC 61140:2016 grades of insulation (reinforced counts as basic plus supplementary).
    """
    if provided is None:
        return required in ("none", "functional")
    provided = INSULATION_EQUIVALENT.get(provided, provided)
    return INSULATION_ORDER.index(provided) >= INSULATION_ORDER.index(required)


def _trace_constants(layer: str) -> tuple[float, float, float, float]:
    data = tables.load("ipc2221_trace")["data"]
    if layer not in ("outer", "inner"):
        raise ValueError(f"layer is 'outer' or 'inner', found {layer!r}")
    return data[f"k_{layer}"], data["b"], data["c"], data["mil_per_oz"]


def trace_current(width: Any, temp_rise: Any, copper_oz: Any = 1.0, layer: str = "outer") -> Any:
    """Estimated current a trace carries at a temperature rise (IPC-2221 chart fit).

    Parameters
    ----------
    width : float or ndarray
        Trace width [m].
    temp_rise : float or ndarray
        Temperature rise above ambient [°C].
    copper_oz : float or ndarray
        Copper weight [oz/ft²] (1 oz is 1.378 mil thick).
    layer : str
        ``"outer"`` (k = 0.048) or ``"inner"`` (k = 0.024).

    Returns
    -------
    float or ndarray
        ``I = k · ΔT^0.44 · A^0.725`` with A in mil² [A]: an estimate; IPC-2152 gives better data.

    References
    ----------
    IPC-2221B, 6.2, the curve fit to its conductor sizing charts.
    """
    k, b, c, mil_per_oz = _trace_constants(layer)
    area_mil2 = (width / MIL) * (copper_oz * mil_per_oz)
    return k * temp_rise**b * area_mil2**c


def trace_width(current: Any, temp_rise: Any, copper_oz: Any = 1.0, layer: str = "outer") -> Any:
    """Estimated trace width for a current: :func:`trace_current` solved for the width.

    Parameters
    ----------
    current : float or ndarray
        Continuous (rms) current [A].
    temp_rise : float or ndarray
        Allowed temperature rise [°C].
    copper_oz : float or ndarray
        Copper weight [oz/ft²].
    layer : str
        ``"outer"`` or ``"inner"``.

    Returns
    -------
    float or ndarray
        ``w = (I / (k · ΔT^0.44))^(1/0.725) / (1.378 mil · oz)`` [m]: an estimate and a layout
        constraint, not a guarantee.

    References
    ----------
    IPC-2221B, 6.2, the curve fit to its conductor sizing charts.
    """
    k, b, c, mil_per_oz = _trace_constants(layer)
    area_mil2 = (current / (k * temp_rise**b)) ** (1.0 / c)
    return area_mil2 / (copper_oz * mil_per_oz) * MIL


TEMPORARY_OVERVOLTAGE = 1200.0
"""Short-term (≤ 5 s) temporary overvoltage added to the system voltage [V] (IEC 60664-1:2007,
5.3.3.2.3, from memory)."""


def ac_test_voltage(system_voltage: Any, insulation: str = "basic") -> Any:
    """Rms a.c. dielectric test voltage of solid insulation for its grade.

    Parameters
    ----------
    system_voltage : float or ndarray
        Nominal voltage of the hazardous circuit, line to neutral [V].
    insulation : str
        ``"basic"`` (also functional and supplementary) or ``"reinforced"`` (double).

    Returns
    -------
    float or ndarray
        ``U_n + 1200 V`` for basic insulation, twice that for reinforced [V rms].

    References
    ----------
    IEC 60664-1:2007, 5.3.3.2.3 (temporary overvoltages) and 6.1.3.4 (a.c. test of solid
    insulation; reinforced at twice the basic value), from memory.
    """
    basic = system_voltage + TEMPORARY_OVERVOLTAGE
    return 2 * basic if insulation == "reinforced" else basic
