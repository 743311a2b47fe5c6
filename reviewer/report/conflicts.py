"""Checklist answers that the design file itself contradicts.

A checklist question is answered by a person; some of them are about something the design file
also states. When the two disagree (the answer "yes, the dead time is enforced in hardware"
against ``timing.enforced_in = "none"``), the answer cannot be taken as a pass: every view shows
the contradiction beside the answer, and the walkthrough shows it the moment the answer is
chosen. This module only compares; it changes no finding.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any


@dataclass(frozen=True)
class Conflict:
    """An answer to ``question`` that the design field ``field`` contradicts."""

    question: str
    answer: str
    field: str
    value: str
    message: str

    def text(self) -> str:
        """One sentence for any view."""
        return (f"the answer '{self.answer}' contradicts the design file: "
                f"{self.field} = {self.value}; {self.message}")


# (question, answer, design field, values of the field that contradict the answer, why)
CHECKS: tuple[tuple[str, str, str, tuple[Any, ...], str], ...] = (
    ("checklist.dead-time-enforced", "yes", "timing.enforced_in", ("none", "firmware"),
     "the question asks for a dead time that firmware cannot bypass (hardware or the driver)"),
    ("checklist.dead-time-enforced", "yes", "drive.shared_signal", (True,),
     "one signal and its inverse feed both switches of a leg, so there is no dead time to "
     "enforce"),
)


def _shown(value: Any) -> str:
    if isinstance(value, bool):
        return "true" if value else "false"
    return f'"{value}"' if isinstance(value, str) else str(value)


def answer_conflicts(sheet: Any, question: str, answer: str) -> list[Conflict]:
    """The contradictions an answer ``answer`` to ``question`` would have with the design.

    Parameters
    ----------
    sheet
        The calculation sheet (design fields are published there as ``design.<path>``).
    question
        The checklist rule id.
    answer
        "yes", "no" or "not_applicable".
    """
    out = []
    for q, a, path, bad, why in CHECKS:
        if q != question or a != answer:
            continue
        value = sheet.value(f"design.{path}") if sheet is not None else None
        if value is not None and value in bad:
            out.append(Conflict(question, answer, path, _shown(value), why))
    return out


def conflicts(review: Any) -> list[Conflict]:
    """Every answered question of ``review`` (design file or record) the design contradicts."""
    from reviewer.review import answers_of

    out: list[Conflict] = []
    for question, (answer, _note) in sorted(answers_of(review.design, review.record).items()):
        out += answer_conflicts(review.sheet, question, answer)
    return out


def for_question(review: Any, question: str) -> list[Conflict]:
    return [c for c in conflicts(review) if c.question == question]
