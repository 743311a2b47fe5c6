"""Voltage bands: is a DC bus or an AC output within extra-low voltage?

References
----------
IEC 61140:2016, Protection against electric shock — Common aspects for installation and
equipment, and IEC 60050-826 (International Electrotechnical Vocabulary, electrical
installations): extra-low voltage is at most 50 V a.c. r.m.s. or 120 V ripple-free d.c.
"Ripple-free" d.c. has an r.m.s. ripple of at most 10 % of the d.c. component; a nominal 120 V
ripple-free system may then peak at no more than 140 V. (IEC 60449, which also gave these bands,
was withdrawn in 2016.)
"""

from __future__ import annotations

import math
from typing import Any

ELV_AC_RMS = 50.0
"""Extra-low-voltage limit for a.c. [V r.m.s.] (IEC 61140)."""
ELV_DC_RIPPLE_FREE = 120.0
"""Extra-low-voltage limit for ripple-free d.c. [V] (IEC 61140)."""
ELV_DC_PEAK_120V = 140.0
"""Highest peak of a nominal 120 V ripple-free d.c. system [V] (IEC 61140)."""
RIPPLE_FREE = 0.10
"""Largest r.m.s. ripple, over the d.c. value, that still counts as ripple-free [unitless]."""


def _out(x: Any) -> Any:
    import numpy as np

    a = np.asarray(x, dtype=float)
    return float(a) if a.ndim == 0 else a


def dc_band_limit(ripple: Any) -> Any:
    """The extra-low-voltage limit for a d.c. bus with r.m.s. ripple ``ripple``.

    Parameters
    ----------
    ripple : float
        R.m.s. ripple over the d.c. value [unitless].

    Returns
    -------
    float or ndarray
        120 V for ripple-free d.c.; for d.c. with more ripple, the peak of the a.c. limit,
        50 V·√2 ≈ 70.7 V, against which the bus peak is judged [V]. The second figure is a
        conservative reading (common practice), not a value the standard states for d.c.
    """
    import numpy as np

    return _out(np.where(np.asarray(ripple) <= RIPPLE_FREE, ELV_DC_RIPPLE_FREE,
                         ELV_AC_RMS * math.sqrt(2)))


def dc_peak(v_max: Any, ripple: Any) -> Any:
    """Peak of a d.c. bus whose r.m.s. ripple is ``ripple`` of ``v_max`` [V], for sinusoidal ripple.

    Parameters
    ----------
    v_max : float
        Highest d.c. (mean) bus voltage [V].
    ripple : float
        R.m.s. ripple over the d.c. value [unitless].
    """
    return v_max * (1 + math.sqrt(2) * ripple)


def beyond_elv(bus_peak: float, bus_limit: float, output_rms: float | None) -> bool:
    """Whether the bus or the output is beyond extra-low voltage (IEC 61140 bands)."""
    return bus_peak > bus_limit or (output_rms is not None and output_rms > ELV_AC_RMS)


def bus_peak(v_max: Any, ripple_2f_rms: Any, switching_pp: Any = 0.0) -> Any:
    """Highest instantaneous bus voltage: the highest mean plus the crest of each ripple.

    Parameters
    ----------
    v_max : float or ndarray
        Highest mean (DC) bus voltage [V].
    ripple_2f_rms : float or ndarray
        Rms bus voltage ripple at twice the output frequency (sinusoidal) [V].
    switching_pp : float or ndarray
        Peak-to-peak bus ripple at the switching frequency [V] (0 for a stepped wave).

    Returns
    -------
    float or ndarray
        ``V_peak = V_max + √2·ΔV_2f,rms + ΔV_sw,pp / 2`` [V]; the two ripples are taken to crest
        together, the worst case.

    References
    ----------
    Definition of rms for a sinusoid; the ripples from :mod:`reviewer.physics.bus`.
    """
    return v_max + math.sqrt(2) * ripple_2f_rms + 0.5 * switching_pp


def ripple_fraction(ripple_rms: Any, v_mean: Any) -> Any:
    """Rms ripple over the mean bus voltage, the figure IEC 61140 judges 'ripple-free' by.

    Parameters
    ----------
    ripple_rms : float or ndarray
        Rms of the bus ripple, all components [V].
    v_mean : float or ndarray
        Mean bus voltage [V].

    Returns
    -------
    float or ndarray
        ``ΔV_rms / V`` [unitless].

    References
    ----------
    IEC 61140:2016 and IEC 60050-826 ('ripple-free': at most 10 % rms ripple).
    """
    return ripple_rms / v_mean


def chemistry_v_max(v_nom: Any, cell_max: Any, cell_nominal_low: Any) -> Any:
    """Highest bus voltage of a battery from its nominal voltage and its chemistry.

    Parameters
    ----------
    v_nom : float or ndarray
        Nominal pack voltage [V].
    cell_max : float or ndarray
        Highest cell voltage while charging [V].
    cell_nominal_low : float or ndarray
        Lowest nominal cell voltage quoted for the chemistry [V].

    Returns
    -------
    float or ndarray
        ``V_max = V_nom · cell_max / cell_nominal_low`` [V]: for a pack quoted at a higher
        nominal than ``cell_nominal_low`` per cell this over-estimates, never under-estimates.

    References
    ----------
    ``reviewer/tables/battery_chemistry.toml`` (cell voltages from memory).
    """
    return v_nom * cell_max / cell_nominal_low
