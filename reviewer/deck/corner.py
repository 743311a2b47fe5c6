"""Which corner of the review a deck is written at, and the published values at that corner.

A review computes every quantity in several runs (typical, each toleranced input at each end,
and the combinations that push a quantity to its extreme); :attr:`reviewer.quantities.Sheet.
corners` says which inputs were where in each run and every :class:`~reviewer.quantities.
Quantity` carries its value in every run (``runs``). A finding was judged at one of these runs
(:attr:`reviewer.findings.Finding.corner`). The deck reads every value from one run, so that the
circuit it describes is the one the review judged.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

from reviewer.findings import Finding

WORST_RULES = ("timing.shoot-through", "stress.vds-rating", "stress.vds-derating")
"""The findings whose corner ``worst`` means: shoot-through at either edge, and V_DS."""


class DeckError(ValueError):
    """The review cannot be written as a deck (a value the circuit needs was not given)."""

    def __init__(self, message: str, field: str = ""):
        self.field = field
        super().__init__(message)


@dataclass(frozen=True)
class Corner:
    """One run of the review: its index, which inputs were away from typical, and why chosen."""

    run: int
    assignment: tuple[tuple[str, str], ...]
    label: str
    """How the corner was chosen, in words, for the deck's comment lines."""
    finding: Finding | None = None

    def describe(self) -> str:
        """The inputs away from typical, e.g. ``switch.high.vth at its min``; or ``typical``."""
        if not self.assignment:
            return "every toleranced input at its typical value"
        return ", ".join(f"{path} at its {end}" for path, end in self.assignment)


def _run_of(review: Any, corner: tuple[tuple[str, str], ...]) -> int:
    corners = review.sheet.corners
    key = tuple(sorted(corner))
    for i, c in enumerate(corners):
        if tuple(sorted(c)) == key:
            return i
    raise DeckError(f"the corner {key!r} is not one of the review's runs")


def _rank(f: Finding) -> tuple[int, float]:
    rel = f.relative_margin
    return (0 if f.outcome == "fail" else 1, rel if rel is not None else float("inf"))


def choose_corner(review: Any, which: str | Finding = "worst") -> Corner:
    """The run a deck is written at.

    Parameters
    ----------
    review : reviewer.review.Review
        The review whose sheet the deck reads.
    which : str or Finding
        ``"typical"``; ``"worst"``: the corner of whichever shoot-through or V_DS finding
        (:data:`WORST_RULES`) is worst, failing ones first, then the smallest relative margin;
        or a finding, whose own corner is taken.

    Returns
    -------
    Corner
    """
    if isinstance(which, Finding):
        run = _run_of(review, which.corner)
        label = (f"the corner finding {which.key} ({which.outcome}) was judged at"
                 if which.corner else
                 f"finding {which.key} ({which.outcome}) was judged at the typical values")
        return Corner(run, tuple(which.corner), label, which)
    if which == "typical":
        return Corner(0, (), "typical values")
    if which != "worst":
        raise DeckError(f"unknown corner {which!r}: expected typical, worst or a finding key")
    judged = [f for f in review.findings
              if f.rule_id in WORST_RULES and f.outcome in ("fail", "pass") and f.margin is not None]
    if not judged:
        return Corner(0, (), "typical values (no shoot-through or V_DS finding was judged)")
    f = min(judged, key=_rank)
    others = sorted({g.key for g in judged if tuple(g.corner) != tuple(f.corner)})
    label = (f"the worst of the shoot-through and V_DS findings: {f.key} ({f.outcome}"
             + (f", margin {100 * f.relative_margin:.1f} %" if f.relative_margin is not None else "")
             + ")")
    if others:
        label += "; judged at other corners: " + ", ".join(others)
    return Corner(_run_of(review, f.corner), tuple(f.corner), label, f)


class Values:
    """Published quantities and design fields at one run of the sheet."""

    def __init__(self, sheet: Any, run: int):
        self.sheet = sheet
        self.run = run

    def get(self, name: str, default: Any = None) -> Any:
        """Quantity ``name`` (``design.<path>`` for a design field) at this run, or ``default``."""
        q = self.sheet.quantities.get(name)
        if q is None:
            return default
        return q.runs[self.run] if self.run < len(q.runs) else q.typ

    def need(self, name: str, why: str) -> Any:
        """Like :meth:`get`, raising :class:`DeckError` naming the field when it is absent."""
        v = self.get(name)
        if v is None:
            field = name[len("design."):] if name.startswith("design.") else name
            missing = self.sheet.missing.get(name)
            hint = f" (give {', '.join(missing.needs)})" if missing and missing.needs else ""
            raise DeckError(f"the deck needs {field} for {why}{hint}", field)
        return v

    def design(self, path: str, default: Any = None) -> Any:
        return self.get(f"design.{path}", default)
