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

ELV_AC_RMS = 50.0
"""Extra-low-voltage limit for a.c. [V r.m.s.] (IEC 61140)."""
ELV_DC_RIPPLE_FREE = 120.0
"""Extra-low-voltage limit for ripple-free d.c. [V] (IEC 61140)."""
ELV_DC_PEAK_120V = 140.0
"""Highest peak of a nominal 120 V ripple-free d.c. system [V] (IEC 61140)."""
RIPPLE_FREE = 0.10
"""Largest r.m.s. ripple, over the d.c. value, that still counts as ripple-free [unitless]."""


def dc_band_limit(ripple: float) -> float:
    """The extra-low-voltage limit for a d.c. bus with r.m.s. ripple ``ripple``.

    Parameters
    ----------
    ripple : float
        R.m.s. ripple over the d.c. value [unitless].

    Returns
    -------
    float
        120 V for ripple-free d.c.; for d.c. with more ripple, the peak of the a.c. limit,
        50 V·√2 ≈ 70.7 V, against which the bus peak is judged [V]. The second figure is a
        conservative reading (common practice), not a value the standard states for d.c.
    """
    return ELV_DC_RIPPLE_FREE if ripple <= RIPPLE_FREE else ELV_AC_RMS * math.sqrt(2)


def dc_peak(v_max: float, ripple: float) -> float:
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
