"""The review record: decisions, notes, checklist answers and proposed changes for one design.

Kept in a TOML file beside the design (``NAME.review.toml`` for ``NAME.toml``), written with
tomli-w atomically, in a stable order so that it diffs well under version control. Decisions are
keyed by finding key (rule id and subject), so they survive revisions of the design; each keeps
the numbers it was made on, so that a decision made on numbers that have since moved is flagged
for re-confirmation rather than silently carried over. Nothing in a record is ever dropped: a
decision whose rule no longer exists is kept as an orphan.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field, replace
from pathlib import Path
from typing import Any, Literal

from reviewer.errors import InputError, Problem
from reviewer.findings import Finding

FORMAT = "bridge-reviewer/record"
VERSION = 1
KINDS = ("undecided", "will_change", "accepted", "not_applicable")
"""undecided: not yet judged; will_change: the design will be changed; accepted: the finding is
accepted as it stands, with a reason; not_applicable: the finding does not apply, with a reason."""
NEEDS_REASON = ("accepted", "not_applicable")
ANSWERS = ("yes", "no", "not_applicable")
RECONFIRM_TOLERANCE = 0.02
"""A decision's numbers have moved when the value or the limit changed by more than this
fraction of its old magnitude (2 %), or the margin changed sign."""

Kind = Literal["undecided", "will_change", "accepted", "not_applicable"]


@dataclass(frozen=True)
class Decision:
    key: str
    kind: str
    reason: str = ""
    reviewer: str = ""
    at: str = ""
    outcome: str = ""
    value: float | None = None
    limit: float | None = None
    unit: str = ""
    accepted_by: str = ""
    """Who accepts the finding as it stands (name and role), kept apart from the reviewer who
    recorded it; asked for when a hazard is accepted."""


@dataclass(frozen=True)
class Answer:
    question: str
    answer: str
    note: str = ""
    reviewer: str = ""
    at: str = ""


@dataclass(frozen=True)
class Proposal:
    """A what-if change: the design field, the value proposed (as the user wrote it), a note."""

    field: str
    value: str
    note: str = ""
    reviewer: str = ""
    at: str = ""


@dataclass(frozen=True)
class Record:
    design: str = ""
    decisions: dict[str, Decision] = field(default_factory=dict)
    answers: dict[str, Answer] = field(default_factory=dict)
    proposals: dict[str, Proposal] = field(default_factory=dict)


def record_path(design_path: str | Path) -> Path:
    """Where the record of the design at ``design_path`` lives: ``NAME.review.toml`` beside it.

    Two exceptions keep what is shipped pristine: the bundled example designs (in a checkout or
    an installed package) and designs in a folder this user cannot write keep their records in
    the user's data folder instead (:func:`data_record_path`), so that walking an example never
    changes the examples, the checkout or the installed package.
    """
    p = Path(design_path)
    beside = p.with_name(p.stem + ".review.toml")
    if _shipped(p) or not _writable(p.parent):
        return data_record_path(p)
    return beside


def data_record_path(design_path: str | Path) -> Path:
    """The record of a bundled or read-only design in the user's data folder:
    ``<data>/records/<folder id>/NAME.review.toml`` (the folder id tells designs of the same
    name in different folders apart)."""
    import hashlib

    from platformdirs import user_data_dir

    p = Path(design_path)
    try:
        folder = str(p.resolve().parent)
    except OSError:
        folder = str(p.parent)
    tag = "examples" if _shipped(p) else hashlib.sha256(folder.encode()).hexdigest()[:12]
    return Path(user_data_dir("bridge-reviewer", appauthor=False)) / "records" / tag / (
        p.stem + ".review.toml")


def _shipped(design: Path) -> bool:
    from reviewer.paths import examples_dir

    try:
        return design.resolve().parent == examples_dir().resolve()
    except OSError:
        return False


def _writable(folder: Path) -> bool:
    import os

    target = folder if str(folder) else Path(".")
    return not target.is_dir() or os.access(target, os.W_OK)


def now() -> str:
    """A decision's time stamp: now in UTC, or ``SOURCE_DATE_EPOCH`` (:mod:`reviewer.clock`)."""
    from reviewer.clock import now as _now

    return _now()


class DecisionError(ValueError):
    """A decision that cannot be recorded as asked (e.g. an acceptance without a reason)."""


def decide(record: Record, finding: Finding, kind: str, reason: str = "", reviewer: str = "",
           at: str | None = None) -> Record:
    """Record ``kind`` for ``finding``, with the numbers it is made on."""
    if kind not in KINDS:
        raise DecisionError(f"a decision is one of {', '.join(KINDS)}; found {kind!r}")
    if kind in NEEDS_REASON and not reason.strip():
        raise DecisionError(f"'{kind}' needs a reason: say why")
    d = Decision(finding.key, kind, reason.strip(), reviewer, at or now(), finding.outcome,
                 finding.value, finding.limit, finding.unit)
    return replace(record, decisions={**record.decisions, finding.key: d})


def forget(record: Record, key: str) -> Record:
    """Remove the decision on ``key``: only ever at the user's explicit request."""
    return replace(record, decisions={k: v for k, v in record.decisions.items() if k != key})


def note(record: Record, key: str, text: str, reviewer: str = "") -> Record:
    """Change the note (reason) of a decision, keeping its kind; an undecided one if none."""
    old = record.decisions.get(key) or Decision(key, "undecided")
    if old.kind in NEEDS_REASON and not text.strip():
        raise DecisionError(f"'{old.kind}' needs a reason: say why")
    d = replace(old, reason=text.strip(), reviewer=reviewer or old.reviewer, at=now())
    return replace(record, decisions={**record.decisions, key: d})


def answer(record: Record, question: str, value: str, note_text: str = "", reviewer: str = "",
           at: str | None = None) -> Record:
    if value not in ANSWERS:
        raise DecisionError(f"an answer is one of {', '.join(ANSWERS)}; found {value!r}")
    if value == "not_applicable" and not note_text.strip():
        raise DecisionError("'not_applicable' needs a note: say why the question does not apply")
    a = Answer(question, value, note_text.strip(), reviewer, at or now())
    return replace(record, answers={**record.answers, question: a})


def propose(record: Record, field_path: str, value: str, note_text: str = "",
            reviewer: str = "") -> Record:
    p = Proposal(field_path, value, note_text.strip(), reviewer, now())
    return replace(record, proposals={**record.proposals, field_path: p})


def withdraw(record: Record, field_path: str) -> Record:
    return replace(record, proposals={k: v for k, v in record.proposals.items() if k != field_path})


# states of a decision against the current review ------------------------------------------------
STATES = ("current", "reconfirm", "resolved", "orphan")
"""current: the finding stands on the numbers the decision was made on; reconfirm: its numbers
have moved (or it changed outcome) since; resolved: the finding no longer fails after a
revision; orphan: no current finding has this key (rule renamed or removed, subject gone)."""


def _moved(old: float | None, new: float | None) -> bool:
    if old is None or new is None:
        return (old is None) != (new is None)
    if math.isinf(old) or math.isinf(new):
        return old != new
    return abs(new - old) > RECONFIRM_TOLERANCE * max(abs(old), 1e-30) * (1 + 1e-9)


def moved(old: float | None, new: float | None) -> bool:
    """True when a number moved beyond :data:`RECONFIRM_TOLERANCE` (or appeared / vanished)."""
    return _moved(old, new)


def state(d: Decision, f: Finding | None) -> str:
    if f is None:
        return "orphan"
    if d.outcome == "fail" and f.outcome in ("pass", "not_applicable", "answered"):
        return "resolved"
    if f.outcome != d.outcome:
        return "reconfirm"
    if _moved(d.value, f.value) or _moved(d.limit, f.limit):
        return "reconfirm"
    return "current"


SETTLING = ("accepted", "not_applicable")
"""Decision kinds that settle a failing finding (it no longer fails the build) while current."""


def settles(d: Decision | None, f: Finding) -> bool:
    """True when decision ``d`` settles failing finding ``f``: accepted or not applicable, made
    on the numbers that still hold (state current). will_change and undecided never settle; a
    decision awaiting re-confirmation does not either."""
    return d is not None and d.kind in SETTLING and state(d, f) == "current"


def reviewer_name() -> str:
    """The user name from the environment (the default reviewer), or "" when there is none."""
    import getpass

    try:
        return getpass.getuser()
    except (OSError, KeyError, ImportError):
        return ""


# the file ---------------------------------------------------------------------------------------
def _clean(d: dict[str, Any]) -> dict[str, Any]:
    return {k: v for k, v in d.items() if v is not None and v != ""}


def to_toml(record: Record) -> str:
    import tomli_w

    data: dict[str, Any] = {"format": FORMAT, "version": VERSION, "design": record.design}
    if record.decisions:
        data["decision"] = [_clean(vars(d)) for _, d in sorted(record.decisions.items())]
    if record.answers:
        data["answer"] = [_clean(vars(a)) for _, a in sorted(record.answers.items())]
    if record.proposals:
        data["proposal"] = [_clean(vars(p)) for _, p in sorted(record.proposals.items())]
    head = ("# Review record for the design named below: decisions, notes, answers and proposed\n"
            "# changes. Written by the reviewer tool; safe to read, diff and commit.\n")
    return head + tomli_w.dumps(data)


class RecordConflict(DecisionError):
    """The record changed on disk since it was read, and the change cannot be merged with
    this one (both changed the same decision, answer or proposal differently, or the file no
    longer loads). Nothing was written."""


def _same(a: Any, b: Any) -> bool:
    return a == b or repr(a) == repr(b)  # repr: a NaN number equals itself


TABLES = ("decisions", "answers", "proposals")


def merge(base: Record, ours: Record, theirs: Record) -> tuple[Record, list[str]]:
    """Three-way merge by finding key (decisions), question (answers) and field (proposals).

    ``base`` is the record both writers started from, ``ours`` this writer's, ``theirs`` the
    one on disk now. An entry changed (or removed) by one writer only takes that writer's
    version; one changed by both to the same value is kept; one changed by both differently is a
    conflict, listed as ``"decision KEY"`` (and ``theirs`` is kept for it).
    """
    conflicts: list[str] = []
    tables: dict[str, dict[str, Any]] = {}
    for table in TABLES:
        b, o, t = getattr(base, table), getattr(ours, table), getattr(theirs, table)
        merged: dict[str, Any] = {}
        for k in sorted(set(b) | set(o) | set(t)):
            vb, vo, vt = b.get(k), o.get(k), t.get(k)
            if _same(vo, vb):
                v = vt
            elif _same(vt, vb) or _same(vo, vt):
                v = vo
            else:
                conflicts.append(f"{table[:-1]} {k}")
                v = vt
            if v is not None:
                merged[k] = v
        tables[table] = merged
    return Record(ours.design or theirs.design, **tables), conflicts


def save(record: Record, path: str | Path, base: Record | None = None) -> Record:
    """Write ``record`` to ``path`` atomically and return what was written.

    With ``base`` (the record as this writer last read or wrote it), a record changed on disk
    since by another writer (a second walkthrough, ``reviewer decide`` in another terminal) is
    never silently overwritten: the two are merged entry by entry (:func:`merge`), and a
    conflict raises :class:`RecordConflict` with the file untouched. A failed write (no
    permission, a full disk, an interruption) leaves the previous file as it was.
    """
    from reviewer.atomic import write_text

    p = Path(path)
    if base is not None:
        try:
            disk = load(p, record.design or base.design)
        except InputError as e:
            raise RecordConflict(f"{p} changed on disk and no longer loads "
                                 f"({e.problems[0]}); it was not overwritten: fix or remove "
                                 "it, then decide again") from None
        if to_toml(disk) != to_toml(base):
            record, conflicts = merge(base, record, disk)
            if conflicts:
                raise RecordConflict(
                    f"{p} was changed by another writer since it was read, on the same "
                    f"{', '.join(conflicts)}; nothing was written: review the record again "
                    "(it now holds the other writer's decision) and decide once more")
    p.parent.mkdir(parents=True, exist_ok=True)  # the user's data folder may not exist yet
    write_text(p, to_toml(record))
    return record


def load(path: str | Path, design: str = "") -> Record:
    """Read a record file; an absent file is an empty record. Bad files raise InputError."""
    p = Path(path)
    if not p.exists():
        return Record(design=design)
    from reviewer.design.loader import expect_kind, read_file, read_toml

    text = read_file(p)
    data = read_toml(text, str(p))
    expect_kind(data, "record", text, str(p))
    from reviewer.design.tomlpos import key_lines, line_of

    lines = key_lines(text)
    problems: list[Problem] = []
    if data.get("format") != FORMAT:
        problems.append(Problem(str(p), (line_of(lines, ("format",)) or 1), "format",
                                f"expected {FORMAT!r}, found {data.get('format')!r}"))
    if data.get("version") != VERSION:
        problems.append(Problem(str(p), (line_of(lines, ("version",)) or 1), "version",
                                f"expected {VERSION} (this tool's record version), found "
                                f"{data.get('version')!r}"))
    tables = {"decision": (Decision, "key"), "answer": (Answer, "question"),
              "proposal": (Proposal, "field")}
    out: dict[str, dict[str, Any]] = {k: {} for k in tables}
    for name, (cls, key) in tables.items():
        rows = data.get(name, [])
        if not isinstance(rows, list):
            problems.append(Problem(str(p), line_of(lines, (name,)) or 1, name,
                                    f"expected [[{name}]] tables, found {type(rows).__name__}"))
            continue
        for i, row in enumerate(rows):
            where = (name, str(i))
            try:
                if not isinstance(row, dict):
                    raise TypeError(f"expected a table, found {type(row).__name__}")
                item = cls(**row)
                _typed(item)
            except TypeError as e:
                problems.append(Problem(str(p), (line_of(lines, where) or 1), f"{name}[{i}]",
                                        f"not a valid {name}: {e}"))
                continue
            if name == "decision" and item.kind not in KINDS:
                problems.append(Problem(str(p), (line_of(lines, where + ("kind",)) or 1),
                                        f"{name}[{i}].kind",
                                        f"expected one of {KINDS}, found {item.kind!r}"))
                continue
            if name == "decision":  # a renamed rule's old id names its finding still
                from reviewer.aliases import current_key

                item = replace(item, key=current_key(item.key))
            out[name][getattr(item, key)] = item
    named = data.get("design", design)
    if not isinstance(named, str):
        problems.append(Problem(str(p), line_of(lines, ("design",)) or 1, "design",
                                f"expected the design's file name, found {named!r}"))
    if problems:
        raise InputError(problems)
    return Record(named, out["decision"], out["answer"], out["proposal"])


def _typed(item: Any) -> None:
    """TypeError unless every field of a record entry has its declared type (text, or a
    number for a decision's value and limit)."""
    numbers = ("value", "limit") if isinstance(item, Decision) else ()
    for name, value in vars(item).items():
        if name in numbers:
            ok = value is None or (isinstance(value, (int, float)) and not isinstance(value, bool))
        else:
            ok = isinstance(value, str)
        if not ok:
            what = "a number" if name in numbers else "a text"
            raise TypeError(f"{name} = {value!r} is not {what}")
