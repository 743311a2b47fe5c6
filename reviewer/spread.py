"""What a finding says about the spread of its margin: yield over samples and sensitivity.

Plain records, filled in by :mod:`reviewer.sampling` and :mod:`reviewer.sensitivity`, shown by
every view through :func:`reviewer.report.spread_text.spread_line` and
:func:`reviewer.report.spread_text.sensitivity_line`.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Swing:
    """How much one toleranced input moves one margin."""

    field: str
    """The design path of the input."""
    tolerance: str
    """The input's tolerance as written for a reader ("±20 %", "2 V to 4 V")."""
    swing: float
    """Half the change of the margin between the input's two ends, the others typical
    [unit of the margin]."""
    share: float
    """Its share of the margin's variance, Σ swing² taken as the whole [unitless]."""


@dataclass(frozen=True)
class Spread:
    """A check judged over Monte Carlo samples of the toleranced inputs."""

    samples: int
    seed: int
    distribution: str
    passed: int
    computed: int
    """Samples in which the margin could be computed (and the rule applies)."""
    fraction: float | None
    """Yield: passed / computed [unitless]; None when no sample could be judged."""
    low: float | None
    high: float | None
    """Wilson score interval of the yield at 95 % confidence [unitless]."""
    margin_min: float | None
    margin_p01: float | None
    margin_median: float | None
    missed: bool = False
    """True when a sample was worse than the corner search's worst case: the finding then
    reports that sample as its worst case."""
    interval: str = "Wilson score interval, 95 %"
