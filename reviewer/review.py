"""A review: the design, its calculation sheet and the findings, ready for any view."""

from __future__ import annotations

from collections import Counter
from dataclasses import dataclass
from pathlib import Path

from reviewer import cases
from reviewer import record as rec
from reviewer.design import Design, load_design
from reviewer.engine import evaluate
from reviewer.findings import SEVERITIES, Finding
from reviewer.inputs import notices
from reviewer.passcheck import verify
from reviewer.quantities import Sheet, compute, with_all_runs
from reviewer.rulebook.loader import Disabled, Rulebook, load_rulebook

CAUTION = (
    "This design is beyond extra-low voltage. Mains-level voltages and battery fault currents "
    "can kill or burn. This review is an aid to the designer, not an approval: it cannot "
    "certify the design as safe. Follow your local electrical codes and have the design "
    "examined by a qualified person before it is powered."
)
AID_NOTE = (
    "This review is an aid, not an approval: it checks the numbers it is given against rules "
    "of thumb and published standards, and cannot certify a design as safe."
)


@dataclass(frozen=True)
class Review:
    path: str
    design: Design
    sheet: Sheet
    findings: tuple[Finding, ...]
    record: rec.Record = rec.Record()
    disabled: tuple[Disabled, ...] = ()
    """Rules switched off by house files, each with its reason: every view shows them."""
    notices: tuple[str, ...] = ()
    """Sentences about the input: a field the design gives that no check uses (see
    :mod:`reviewer.inputs`)."""

    def finding(self, key: str) -> Finding | None:
        return next((f for f in self.findings if f.key == key), None)

    def decision(self, key: str) -> rec.Decision | None:
        return self.record.decisions.get(key)

    def state(self, key: str) -> str | None:
        """The state of the decision on ``key`` (see :data:`reviewer.record.STATES`), or None."""
        d = self.record.decisions.get(key)
        return None if d is None else rec.state(d, self.finding(key))

    @property
    def orphans(self) -> list[rec.Decision]:
        """Decisions whose finding no longer exists: kept, never dropped."""
        keys = {f.key for f in self.findings}
        return [d for k, d in sorted(self.record.decisions.items()) if k not in keys]

    @property
    def beyond_elv(self) -> bool:
        return bool(self.sheet.value("band.beyond_elv", False))

    @property
    def failures(self) -> list[Finding]:
        order = {s: i for i, s in enumerate(SEVERITIES)}
        return sorted((f for f in self.findings if f.outcome == "fail"),
                      key=lambda f: (order[f.severity], f.area, f.rule_id, f.subject))

    def settled(self, f: Finding) -> bool:
        """A failing finding settled by a current accepted / not-applicable decision."""
        return rec.settles(self.record.decisions.get(f.key), f)

    def unsettled(self, level: str = "advice") -> list[Finding]:
        """Failing findings at or above severity ``level`` that no current decision settles:
        what fails the build under ``--fail-on level``."""
        worst = SEVERITIES.index(level)
        return [f for f in self.failures
                if SEVERITIES.index(f.severity) <= worst and not self.settled(f)]

    def by_outcome(self, outcome: str) -> list[Finding]:
        return [f for f in self.findings if f.outcome == outcome]

    def counts(self) -> dict[str, int]:
        """Failing findings by severity, and the other outcomes by name."""
        c: Counter[str] = Counter()
        for f in self.findings:
            c[f.severity if f.outcome == "fail" else f.outcome] += 1
        return dict(c)

    def worst(self) -> str | None:
        """The most severe failing severity, or None."""
        fails = self.failures
        return fails[0].severity if fails else None


def answers_of(design: Design, record: rec.Record | None = None) -> dict[str, tuple[str, str]]:
    """Checklist answers: the design's ``[checklist]``, overridden by the record's answers."""
    out = {}
    for qid, a in design.checklist.items():
        out[qid] = (a, "") if isinstance(a, str) else (a.answer, a.note)
    for qid, a in (record.answers if record else {}).items():
        out[qid] = (a.answer, a.note)
    return out


def judged_names(book: Rulebook) -> frozenset[str]:
    """The quantities whose worst corners the rules judge (value, limit and flag expressions)."""
    return frozenset(n for c in book.compiled for e in (c.value, c.limit, c.fails_when)
                     if e is not None for n in e.names)


def judge_all(design: Design, book: Rulebook, sheet: Sheet,
              answers: dict[str, tuple[str, str]]) -> list[Finding]:
    """Every rule judged on ``sheet``, its text fitted to the case, and every pass value verified
    by re-review: the one way findings are made, for a first review and for a re-judged one."""
    findings = cases.apply(evaluate(book, sheet, answers), book, sheet, answers)
    return verify(findings, design, book, sheet, answers)


def review_design(design: Design, path: str, book: Rulebook,
                  record: rec.Record | None = None, like: Review | None = None) -> Review:
    """Review ``design``. ``like``: a review of a design that differs from this one in a few
    fields (the design as filed, for a what-if review): its replay trees are shared, so every
    derive module that reads none of the changed fields (nor anything they change) replays
    instead of running again. The findings are the same either way."""
    record = record or rec.Record(design=Path(path).name)
    # replay trees that key every read: the pass-value check's re-reviews share them
    runner = like.sheet.runner if like is not None else None
    shared = runner.shared_trees if runner is not None else None
    sheet = compute(design, focus=judged_names(book), combined=False,
                    trees=shared if shared is not None else [])
    findings = judge_all(design, book, sheet, answers_of(design, record))
    sheet = with_all_runs(sheet)  # the sheet's extremes over every corner the rules were judged on
    return Review(path, design, sheet, tuple(findings), record, tuple(book.disabled),
                  notices(design, sheet, book))


def review_file(path: str | Path, rule_files: list[Path] | None = None,
                book: Rulebook | None = None, use_record: bool = True) -> Review:
    """Review the design at ``path`` with the built-in rules plus ``rule_files``, and its record
    (``NAME.review.toml`` beside it) when there is one."""
    design = load_design(path)
    record = rec.load(rec.record_path(path), Path(path).name) if use_record else None
    return review_design(design, str(path), book or load_rulebook(rule_files), record)
