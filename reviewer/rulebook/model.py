"""The rule-file format: plain TOML data, the same for the built-in rules and house rules.

A file holds ``area = "..."`` and an array of ``[[rule]]`` tables. A rule is one of three kinds:

- a **limit**: ``value`` (an expression over quantities) must stay ``at_most`` or ``at_least`` a
  limit (a number with a unit, or an expression), judged at the worst tolerance corner;
- a **flag**: ``fails_when`` (a condition) must not hold at any corner;
- a **question** (``ask``): something the numbers cannot settle, answered in the design's
  ``[checklist]`` table; unanswered, it stays open and never counts as passed.
"""

from __future__ import annotations

import re
from typing import Literal

from pydantic import BaseModel, ConfigDict, Field, field_validator, model_validator

from reviewer.findings import BASES, SEVERITIES

ID = re.compile(r"^[a-z][a-z0-9-]*(\.[a-z0-9-]+)+$")
SUBJECT = re.compile(r"^[a-z0-9_]+$")


class PassValue(BaseModel):
    """The value of a designer-controlled parameter that would make the rule pass."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    value: str = Field(description="Expression; may use `value`, `limit` and the rule's params.")
    unit: str = Field("", description="Unit of the result, for display.")
    field: str = Field("", description="The design field this value is for (for what-if changes).")


class Rule(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)

    id: str = Field(description="Dotted slug, stable once released: 'stress.vds-rating'.")
    title: str
    area: str = ""
    severity: Literal["hazard", "risk", "advice"]
    each: list[str] = Field(default_factory=list, description="Subjects, substituted for {each}.")
    applies: str | None = Field(None, description="Condition under which the rule applies.")
    value: str | None = None
    unit: str | None = Field(None, description="Unit of `value` when it is an expression.")
    at_most: str | float | None = None
    at_least: str | float | None = None
    fails_when: str | None = None
    ask: str | None = None
    params: dict[str, str | float] = Field(default_factory=dict)
    pass_: PassValue | None = Field(None, alias="pass")
    why: str
    mitigation: str = ""
    reference: str = ""
    basis: Literal["standard", "book", "library", "practice", "memory"] = "practice"
    fields: list[str] = Field(default_factory=list, description="Design fields the finding is about.")
    assumptions: list[str] = Field(default_factory=list)
    enabled: bool = True
    origin: str = "built-in"

    @field_validator("id")
    @classmethod
    def _id(cls, v: str) -> str:
        if not ID.match(v):
            raise ValueError(f"a rule id is a dotted lower-case slug like 'gate.vgs-stress', found {v!r}")
        return v

    @field_validator("each")
    @classmethod
    def _each(cls, v: list[str]) -> list[str]:
        for s in v:
            if not SUBJECT.match(s):
                raise ValueError(f"subjects are lower-case words, found {s!r}")
        return v

    @model_validator(mode="after")
    def _kind(self) -> "Rule":
        kinds = [k for k in ("value", "fails_when", "ask") if getattr(self, k) is not None]
        if len(kinds) != 1:
            raise ValueError("a rule has exactly one of 'value' (with at_most or at_least), "
                             f"'fails_when' or 'ask'; found {kinds or 'none'}")
        if self.value is not None and (self.at_most is None) == (self.at_least is None):
            raise ValueError("a 'value' rule needs exactly one of 'at_most' or 'at_least'")
        if self.value is None and (self.at_most is not None or self.at_least is not None):
            raise ValueError("'at_most' and 'at_least' go with 'value'")
        return self

    @property
    def kind(self) -> str:
        return "limit" if self.value is not None else ("flag" if self.fails_when else "question")

    @property
    def limit_text(self) -> str | float | None:
        return self.at_most if self.at_most is not None else self.at_least

    @property
    def relation(self) -> str:
        return "≤" if self.at_most is not None else ("≥" if self.at_least is not None else "")


class RuleFile(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True)
    area: str = ""
    description: str = ""
    rule: list[Rule] = Field(default_factory=list)


__all__ = ["Rule", "RuleFile", "PassValue", "SEVERITIES", "BASES"]
