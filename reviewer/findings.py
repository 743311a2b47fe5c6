"""Findings: what the engine concluded for one rule and one subject. Immutable records."""

from __future__ import annotations

from dataclasses import dataclass, field

from reviewer.spread import Spread, Swing

SEVERITIES = ("hazard", "risk", "advice")
OUTCOMES = ("fail", "open", "needs_data", "pass", "answered", "not_applicable")
"""fail: the check does not hold; open: a checklist question awaits an answer; needs_data: the
design lacks a value the check needs; pass: the check holds at the worst corner; answered: a
checklist question answered yes; not_applicable: the rule does not apply to this design."""

BASES = {
    "standard": "published standard",
    "book": "textbook or handbook method",
    "library": "reference library",
    "practice": "common practice",
    "memory": "from memory, not yet checked against the source",
}


@dataclass(frozen=True)
class Finding:
    rule_id: str
    subject: str
    area: str
    title: str
    severity: str
    outcome: str
    why: str = ""
    mitigation: str = ""
    reference: str = ""
    basis: str = "practice"
    unit: str = ""
    relation: str = ""  # "≤", "≥", or "" for flags and questions
    value: float | None = None  # at the worst corner
    value_typ: float | None = None
    limit: float | None = None
    margin: float | None = None  # limit − value for ≤, value − limit for ≥, at the worst corner
    pass_value: float | None = None
    pass_unit: str = ""
    pass_field: str = ""  # the design field the pass value is for
    needs: tuple[str, ...] = ()
    fields: tuple[str, ...] = ()
    corner: tuple[tuple[str, str], ...] = ()
    origin: str = "built-in"
    question: str = ""
    answer_note: str = ""
    assumptions: tuple[str, ...] = field(default_factory=tuple)
    search: str = ""  # how the worst corner was found (every vertex, or a search)
    uncomputed: str = ""  # where a quantity this check needs cannot be computed, as a sentence
    sensitivity: tuple[Swing, ...] = ()  # inputs ranked by their share of the margin's spread
    sensitivity_method: str = ""
    spread: Spread | None = None  # yield over Monte Carlo samples, when drawn

    fail_title: str = ""
    """The problem, as the heading of a failing or open finding; "" when the rule gives none."""
    pass_solved: float | None = None
    """The pass value as the rule's ``pass`` expression solves it at the worst corner, before the
    margin, rounding and re-review that give ``pass_value`` (see :mod:`reviewer.passcheck`)."""
    fix: tuple[tuple[str, str], ...] = ()
    """Field changes (path, text as a designer enters it) verified by re-review to make this
    finding pass (see :mod:`reviewer.passcheck`); empty when none was found or none is needed."""

    @property
    def key(self) -> str:
        """Stable identity across revisions: rule id and subject."""
        return f"{self.rule_id}[{self.subject}]" if self.subject else self.rule_id

    @property
    def heading(self) -> str:
        """The title for this outcome: the problem for a failing or open finding, the condition
        that holds otherwise. A rule with no failing title shows "Not met: " before its title."""
        if self.outcome in ("fail", "open"):
            return self.fail_title or f"Not met: {self.title}"
        return self.title

    @property
    def relative_margin(self) -> float | None:
        if self.margin is None or not self.limit:
            return None
        return self.margin / abs(self.limit)
