"""Conductor sizes.

References
----------
ASTM B258-18, Standard Specification for Standard Nominal Diameters and Cross-Sectional Areas
of AWG Sizes of Solid Round Wires Used as Electrical Conductors: d = 0.127 mm · 92^((36 − n)/39).
"""

from __future__ import annotations

import math


def parse_awg(text: str) -> int:
    """The gauge number of ``"10"``, ``"0"``, ``"00"``, ``"2/0"`` (0 AWG is 0, 2/0 is −1, 4/0 is −3)."""
    t = text.strip()
    if "/" in t:
        n, _, zero = t.partition("/")
        if zero.strip() == "0" and n.strip().isdigit() and 1 <= int(n) <= 4:
            return 1 - int(n)
    elif t and set(t) == {"0"} and len(t) <= 4:
        return 1 - len(t)
    elif t.isdigit() and 0 <= int(t) <= 40:
        return int(t)
    raise ValueError(f"expected an AWG gauge from 4/0 to 40, found {text.strip()!r}")


def awg_diameter(n: float) -> float:
    """Diameter of solid wire of gauge ``n`` [m] (ASTM B258 formula; 0000 is −3)."""
    return 0.127e-3 * 92 ** ((36 - n) / 39)


def awg_area(n: float) -> float:
    """Cross-section area of gauge ``n`` [m²]."""
    return math.pi / 4 * awg_diameter(n) ** 2


def area_to_awg(area: float) -> float:
    """The (fractional) gauge whose area is ``area`` [m²]: the inverse of :func:`awg_area`."""
    d = math.sqrt(4 * area / math.pi)
    return 36 - 39 * math.log(d / 0.127e-3, 92)


COPPER_RESISTIVITY_20C = 1.0 / 58.0 * 1e-6
"""Resistivity of annealed copper at 20 °C [Ω·m]: 1/58 Ω·mm²/m (IEC 60028, the International
Annealed Copper Standard: 1.7241 µΩ·cm)."""
COPPER_ALPHA_20C = 0.00393
"""Temperature coefficient of the resistance of annealed copper at 20 °C [1/K] (IEC 60028)."""


def conductor_resistance(length: "float | object", area: "float | object",
                         temperature: "float | object" = 20.0) -> "float | object":
    """Resistance of a copper conductor.

    Parameters
    ----------
    length : float or ndarray
        Conductor length [m].
    area : float or ndarray
        Cross-section [m²].
    temperature : float or ndarray
        Conductor temperature [°C].

    Returns
    -------
    float or ndarray
        ``R = ρ₂₀ · (1 + α₂₀ · (T − 20)) · l / S`` [Ω].

    References
    ----------
    IEC 60028 (International Annealed Copper Standard): ρ₂₀ = 1/58 Ω·mm²/m, α₂₀ = 0.00393 /K.
    """
    return COPPER_RESISTIVITY_20C * (1 + COPPER_ALPHA_20C * (temperature - 20.0)) * length / area  # type: ignore[operator]
