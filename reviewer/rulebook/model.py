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


class Case(BaseModel):
    """A mitigation text for one situation, used instead of the rule's ``mitigation`` when it holds.

    Where a figure the mitigation would show is absent, infinite, negative or otherwise
    non-physical, a case says what that means and which lever works. The first case that holds
    at the finding's worst corner is used.
    """

    model_config = ConfigDict(extra="forbid", frozen=True)
    when: str | None = Field(None, description="Condition over the rule's names (as `applies`), "
                             "judged at the worst corner.")
    absent: str | None = Field(None, description="A quantity name: the case holds when it could "
                               "not be computed for this design.")
    text: str = Field(description="The mitigation for this case, with {placeholders}.")

    @model_validator(mode="after")
    def _one(self) -> "Case":
        if (self.when is None) == (self.absent is None):
            raise ValueError("a case has exactly one of 'when' (a condition) or 'absent' "
                             "(a quantity name)")
        return self


class Rule(BaseModel):
    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)

    id: str = Field(description="Dotted slug, stable once released: 'stress.vds-rating'.")
    title: str = Field(description="The condition that holds when the rule passes, as a fact: "
                       "'Fuse protects the supply wire'.")
    fail_title: str = Field("", description="The problem, as a failing or open finding's "
                            "heading: 'Fuse does not protect the supply wire'. Without it the "
                            "views show 'Not met: ' before the title.")
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
    cases: list[Case] = Field(default_factory=list, description="Mitigation texts for "
                              "situations where the mitigation's figures would mean nothing.")
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


PROFILE = re.compile(r"^[a-z][a-z0-9-]*$")


class Override(BaseModel):
    """A change to a rule defined earlier (built-in or in another file), by id.

    Only what is given changes; ``params`` are merged into the rule's own.
    """

    model_config = ConfigDict(extra="forbid", frozen=True, populate_by_name=True)

    id: str = Field(description="The id of the rule to change.")
    severity: Literal["hazard", "risk", "advice"] | None = None
    at_most: str | float | None = Field(None, description="New limit (the rule must be an at_most rule).")
    at_least: str | float | None = Field(None, description="New limit (the rule must be an at_least rule).")
    params: dict[str, str | float] = Field(default_factory=dict)
    applies: str | None = Field(None, description="New condition under which the rule applies.")
    title: str | None = None
    fail_title: str | None = None
    why: str | None = None
    mitigation: str | None = None
    reference: str | None = None
    basis: Literal["standard", "book", "library", "practice", "memory"] | None = None
    pass_: PassValue | None = Field(None, alias="pass")
    note: str = Field("", description="Why the house changes it; shown by 'reviewer rules'.")

    def changes(self) -> dict[str, object]:
        """The keys this override sets, as a rule's keys (pass under its alias)."""
        out: dict[str, object] = {}
        for key in ("severity", "at_most", "at_least", "applies", "title", "fail_title", "why",
                    "mitigation",
                    "reference", "basis"):
            value = getattr(self, key)
            if value is not None:
                out[key] = value
        if self.pass_ is not None:
            out["pass"] = self.pass_.model_dump()
        if self.params:
            out["params"] = dict(self.params)
        return out


class Disable(BaseModel):
    """Switch a rule off. The reason is required: every report shows it."""

    model_config = ConfigDict(extra="forbid", frozen=True)

    id: str
    reason: str = Field(description="Why this rule does not apply to the house's designs.")

    @field_validator("reason")
    @classmethod
    def _reason(cls, v: str) -> str:
        if not v.strip():
            raise ValueError("a rule is switched off only with a reason; give reason = \"...\"")
        return " ".join(v.split())


class RuleFile(BaseModel):
    """One rule file: built-in or a house file. A house file may also change and switch off
    rules defined before it, and may belong to a named profile that extends another."""

    model_config = ConfigDict(extra="forbid", frozen=True)
    area: str = ""
    description: str = ""
    profile: str | None = Field(None, description="The profile this file belongs to; none: "
                                "the default profile, always applied.")
    extends: str | None = Field(None, description="The profile this one builds on "
                                "(default: 'default').")
    rule: list[Rule] = Field(default_factory=list)
    override: list[Override] = Field(default_factory=list)
    disable: list[Disable] = Field(default_factory=list)

    @field_validator("profile", "extends")
    @classmethod
    def _profile(cls, v: str | None) -> str | None:
        if v is not None and not PROFILE.match(v):
            raise ValueError(f"a profile name is a lower-case word like 'strict', found {v!r}")
        return v

    @model_validator(mode="after")
    def _extends(self) -> "RuleFile":
        if self.extends is not None and self.profile is None:
            raise ValueError("'extends' goes with 'profile' (the profile that extends another)")
        if self.profile == "default" and self.extends not in (None,):
            raise ValueError("the default profile extends nothing")
        if self.profile is not None and self.profile == self.extends:
            raise ValueError(f"profile {self.profile!r} cannot extend itself")
        return self


__all__ = ["Case", "Rule", "RuleFile", "PassValue", "Override", "Disable", "SEVERITIES", "BASES"]
