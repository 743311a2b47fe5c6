"""What a finding says about the spread of its margin: yield over samples and sensitivity.

Plain records, filled in by :mod:`reviewer.sampling` and :mod:`reviewer.sensitivity`, shown by
every view through :func:`spread_rows` (and :func:`spread_properties` for machine-readable
views), so that the wording is the same everywhere.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from reviewer.units import render

NO_INPUTS = "no toleranced input reaches this check: judged at typical values"


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
    interval: str = "95 % Wilson score interval"


# wording: every view shows these the same way ----------------------------------------------

def _pct(x: float) -> str:
    return f"{x * 100:.4g} %"


def yield_line(f: Any) -> str:
    """"yield 97.3 % (95 % Wilson score interval 96.9 % to 97.6 %) over 10000 samples, seed 12;
    margin min …, 1st percentile …, median …" — empty when no samples were drawn."""
    s = f.spread
    if s is None:
        return ""
    if s.fraction is None:
        return (f"no sample of {s.samples} (seed {s.seed}) could be judged: the check does not "
                "apply or cannot be computed in any of them")
    text = (f"yield {_pct(s.fraction)} ({s.passed} of {s.computed} samples pass; "
            f"{s.interval} {_pct(s.low)} to {_pct(s.high)}; {s.distribution}, seed {s.seed})")
    if s.margin_min is not None:
        text += (f"; margin min {render(s.margin_min, f.unit)}, 1st percentile "
                 f"{render(s.margin_p01, f.unit)}, median {render(s.margin_median, f.unit)}")
    if s.missed:
        text += ("; a sample was worse than the corner search found: it is reported as the "
                 "worst case")
    return text


def sensitivity_line(f: Any, top: int = 3) -> str:
    """"timing.dead_time ±20 % moves this margin by ±25 ns (87 % of its spread); …"."""
    if not f.sensitivity:
        return ""
    parts = [f"{w.field} {w.tolerance} moves this margin by ±{render(w.swing, f.unit)} "
             f"({w.share * 100:.0f} % of its spread)" for w in f.sensitivity[:top]]
    return "; ".join(parts)


def spread_rows(f: Any) -> list[tuple[str, str]]:
    """(label, sentence) rows for a finding's worst-case search, spread and sensitivity: the
    one call every view makes (empty rows left out)."""
    search = "" if f.search == NO_INPUTS else f.search
    rows = [("worst case", search), ("cannot compute", f.uncomputed),
            ("yield", yield_line(f)), ("sensitivity", sensitivity_line(f))]
    return [(k, v) for k, v in rows if v]


def spread_properties(f: Any) -> dict[str, Any]:
    """Machine-readable properties (SARIF and the like): yield, interval, margin spread."""
    s = f.spread
    out: dict[str, Any] = {}
    if f.search:
        out["worstCaseSearch"] = f.search
    if f.uncomputed:
        out["cannotCompute"] = f.uncomputed
    if s is not None:
        out.update({"yield": s.fraction, "yieldLow": s.low, "yieldHigh": s.high,
                    "yieldInterval": s.interval, "samples": s.samples, "seed": s.seed,
                    "samplesJudged": s.computed, "marginMin": s.margin_min,
                    "marginP01": s.margin_p01, "marginMedian": s.margin_median,
                    "cornerSearchMissed": s.missed})
    if f.sensitivity:
        out["sensitivity"] = [{"field": w.field, "tolerance": w.tolerance, "swing": w.swing,
                               "share": w.share} for w in f.sensitivity[:3]]
        out["sensitivityMethod"] = f.sensitivity_method
    return out


def yield_cell(f: Any) -> str:
    """A short yield for a table cell: "97.3 % (96.9 % to 97.6 %)", or words where the finding
    has none (a flag or a question, or no samples drawn)."""
    s = f.spread
    if s is None or s.fraction is None:
        return "no yield (not sampled)"
    return f"{_pct(s.fraction)} ({_pct(s.low)} to {_pct(s.high)})"
