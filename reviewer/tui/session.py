"""The walkthrough's state and what it does, kept apart from the screen so it can be tested alone.

A :class:`Walk` holds the design path, the rule book, the review record and the latest
:class:`Snapshot` (the design reviewed as filed, and with the record's proposals applied). Every
change to the record goes through :mod:`reviewer.record` and is saved atomically before the
method returns, so a terminal that dies loses nothing. Nothing here imports Textual.
"""

from __future__ import annotations

import os
from dataclasses import dataclass, field, replace
from pathlib import Path

from typing import TYPE_CHECKING

from reviewer import record as rec
from reviewer.errors import InputError, Problem
from reviewer.findings import SEVERITIES, Finding

if TYPE_CHECKING:  # the review machinery is imported in the worker, after the first screen
    from reviewer.review import Review

NEEDS_ATTENTION = ("fail", "open", "needs_data")
PASSED = ("pass", "answered", "not_applicable")
_GROUP = {"fail": 0, "open": 1, "needs_data": 2, "pass": 3, "answered": 3, "not_applicable": 4}


@dataclass(frozen=True)
class Snapshot:
    """One review of the design: as filed, and as the record's proposals would make it.

    ``problems`` is set (and both reviews are None) when the design file cannot be loaded;
    ``proposal_problems`` when it loads but a proposal does not validate (``current`` is then
    the filed review).
    """

    filed: Review | None = None
    current: Review | None = None
    problems: tuple[Problem, ...] = ()
    proposal_problems: tuple[Problem, ...] = ()
    mtime: float | None = None

    @property
    def ok(self) -> bool:
        return self.current is not None


@dataclass(frozen=True)
class Item:
    """One line of the walkthrough: a finding key, with the finding as filed and with proposals."""

    key: str
    current: Finding | None
    filed: Finding | None

    @property
    def finding(self) -> Finding:
        f = self.current or self.filed
        assert f is not None
        return f

    @property
    def area(self) -> str:
        return self.finding.area

    @property
    def outcome(self) -> str:
        return self.finding.outcome

    @property
    def changed(self) -> bool:
        """True when the proposals change this finding's outcome."""
        return (self.filed is None or self.current is None
                or self.filed.outcome != self.current.outcome)

    @property
    def is_question(self) -> bool:
        return bool(self.finding.question)

    def sort_key(self) -> tuple:
        f = self.finding
        return (_GROUP.get(f.outcome, 5), SEVERITIES.index(f.severity) if f.severity in SEVERITIES
                else 9, f.rule_id, f.subject)


def compute(path: str | Path, book, record: rec.Record,
            cache: dict | None = None) -> Snapshot:
    """Review the design at ``path`` as filed and with ``record``'s proposals (the heavy part).

    ``cache`` (a dict kept by the caller) holds the reviews already made, keyed by the file's
    modification time, its text and the proposals, so that a what-if change reviews only the
    changed design and a new answer only judges the rules again.
    """
    from reviewer.whatif import proposals_of

    p = Path(path)
    try:
        mtime = p.stat().st_mtime
        text = p.read_text(encoding="utf-8")
    except FileNotFoundError:
        return Snapshot(problems=(Problem(str(p), None, "", "no such file"),))
    except (OSError, UnicodeDecodeError) as e:
        return Snapshot(problems=(Problem(str(p), None, "", f"cannot be read: {e}"),))
    cache = {} if cache is None else cache
    try:
        filed = _reviewed(cache, text, str(p), book, record, {})
    except InputError as e:
        return Snapshot(problems=tuple(e.problems), mtime=mtime)
    proposals = proposals_of(record)
    if not proposals:
        return Snapshot(filed, filed, mtime=mtime)
    try:
        current = _reviewed(cache, text, str(p), book, record, proposals, filed)
    except InputError as e:
        return Snapshot(filed, filed, proposal_problems=tuple(e.problems), mtime=mtime)
    return Snapshot(filed, current, mtime=mtime)


def _reviewed(cache: dict, text: str, name: str, book, record: rec.Record,
              proposals: dict[str, str], like: Review | None = None) -> Review:
    """The review of ``text`` with ``proposals``: from the cache when the inputs are the same."""
    from reviewer.review import answers_of, judge_all, review_design
    from reviewer.whatif import apply_to_text

    key = (name, text, tuple(sorted(proposals.items())))
    answers_key = tuple(sorted((k, (a.answer, a.note)) for k, a in record.answers.items()))
    hit = cache.get(key)
    if hit is None:
        design = apply_to_text(text, name, proposals)
        review = review_design(design, name, book, record, like=like)
        if len(cache) > 16:
            cache.clear()
        cache[key] = (review, answers_key)
        return review
    review, seen = hit
    if seen != answers_key:
        findings = judge_all(review.design, book, review.sheet, answers_of(review.design, record))
        review = replace(review, findings=tuple(findings), record=record)
        cache[key] = (review, answers_key)
    return replace(review, record=record)


@dataclass
class Walk:
    """The walkthrough of one design: its record, its latest snapshot, and the actions on them."""

    path: Path
    rule_files: list[Path] = field(default_factory=list)
    reviewer: str = ""
    profile: str = "default"
    house: bool = True
    """Apply the user's and the project's house-rules folders, as every reviewing command does."""
    book: object | None = None
    record: rec.Record = field(default_factory=rec.Record)
    snapshot: Snapshot = field(default_factory=Snapshot)
    show_passed: bool = False
    record_mtime: float | None = None
    cache: dict = field(default_factory=dict)

    loaded: bool = False

    @classmethod
    def open(cls, path: str | Path, rule_files: list[Path] | None = None,
             reviewer: str | None = None, profile: str = "default",
             house: bool = True) -> "Walk":
        """A walk of the design at ``path``; nothing is read until :meth:`refresh`."""
        if reviewer is None:
            name = getattr(rec, "reviewer_name", None)
            reviewer = name() if name else os.environ.get("USER", "")
        return cls(Path(path), list(rule_files or []), reviewer, profile, house)

    def load(self) -> None:
        """Read the rule book and the record, once (raises InputError for bad files)."""
        if self.loaded:
            return
        from reviewer.rulebook.discover import rulebook_for

        self.book = rulebook_for(self.path, self.rule_files, profile=self.profile,
                                 house=self.house)
        self.record = self._read_record()
        self.loaded = True

    # files --------------------------------------------------------------------------------
    @property
    def record_file(self) -> Path:
        return rec.record_path(self.path)

    def _read_record(self) -> rec.Record:
        try:
            self.record_mtime = self.record_file.stat().st_mtime
        except OSError:
            self.record_mtime = None
        return rec.load(self.record_file, self.path.name)

    def _save(self, record: rec.Record) -> None:
        self.record = rec.save(record, self.record_file, base=self.record)  # merged, never lost
        self.record_mtime = self.record_file.stat().st_mtime

    def design_mtime(self) -> float | None:
        try:
            return self.path.stat().st_mtime
        except OSError:
            return None

    def changed_on_disk(self) -> tuple[bool, bool]:
        """(design changed, record changed by someone else) since they were last read."""
        design = self.design_mtime() != self.snapshot.mtime
        try:
            rm: float | None = self.record_file.stat().st_mtime
        except OSError:
            rm = None
        return design, rm != self.record_mtime

    def reload_record(self) -> None:
        self.record = self._read_record()

    # reviewing ----------------------------------------------------------------------------
    def refresh(self) -> Snapshot:
        """Review the design again from its file (the heavy step: run it in a worker)."""
        try:
            self.load()
        except InputError as e:
            return Snapshot(problems=tuple(e.problems))
        return compute(self.path, self.book, self.record, self.cache)

    def install(self, snap: Snapshot) -> bool:
        """Show ``snap`` with the latest record; True when it was computed with answers or
        proposals that have changed since (review again)."""
        r = snap.filed
        stale = r is not None and (r.record.answers != self.record.answers
                                   or r.record.proposals != self.record.proposals)
        self.snapshot = _restamp(snap, self.record)
        return stale

    @property
    def review(self) -> Review | None:
        return self.snapshot.current

    # the list -----------------------------------------------------------------------------
    def items(self) -> list[Item]:
        """Every finding to show, grouped by area (worst area first) and ordered by severity."""
        s = self.snapshot
        if not s.ok:
            return []
        cur = {f.key: f for f in s.current.findings}
        filed = {f.key: f for f in s.filed.findings}
        keys = list(dict.fromkeys([*cur, *filed]))
        items = [Item(k, cur.get(k), filed.get(k)) for k in keys]
        shown = [i for i in items if self.show_passed
                 or (i.current and i.current.outcome in NEEDS_ATTENTION)
                 or (i.filed and i.filed.outcome in NEEDS_ATTENTION)
                 or self.conflicts_of(i)]
        def order(i: Item) -> tuple:  # an answer the design contradicts ranks as a failure
            k = i.sort_key()
            return (_GROUP["fail"], *k[1:]) if self.conflicts_of(i) else k

        areas: dict[str, list[Item]] = {}
        for i in sorted(shown, key=order):
            areas.setdefault(i.area, []).append(i)

        def rank(area: str) -> tuple:
            worst = order(areas[area][0])[:2]  # the area's worst item, then how many such
            return (worst, -sum(1 for i in areas[area] if order(i)[:2] == worst), area)

        order = sorted(areas, key=rank)
        return [i for a in order for i in areas[a]]

    def decision(self, key: str) -> rec.Decision | None:
        return self.record.decisions.get(key)

    def decision_state(self, item: Item) -> str | None:
        d = self.record.decisions.get(item.key)
        if d is None:
            return None
        return rec.state(d, item.filed if item.filed is not None else item.current)

    def answer_of(self, item: Item) -> tuple[str, str] | None:
        from reviewer.review import answers_of

        r = self.review
        if r is None or not item.is_question:
            return None
        return answers_of(r.design, self.record).get(item.finding.rule_id)

    def needs_decision(self, item: Item) -> bool:
        """A failing finding with no decision (or one to re-confirm), or an open question."""
        if item.outcome == "open" or self.conflicts_of(item):
            return True
        failing = item.outcome == "fail" or (item.filed is not None and item.filed.outcome == "fail")
        if not failing:
            return False
        d = self.record.decisions.get(item.key)
        return d is None or d.kind == "undecided" or self.decision_state(item) == "reconfirm"

    def next_undecided(self, after: str | None) -> str | None:
        """The key of the next item needing a decision after ``after``, wrapping round."""
        items = self.items()
        keys = [i.key for i in items]
        start = keys.index(after) + 1 if after in keys else 0
        for i in items[start:] + items[:start]:
            if self.needs_decision(i):
                return i.key
        return None

    def item(self, key: str | None) -> Item | None:
        return next((i for i in self.items() if i.key == key), None)

    # the state at a glance ----------------------------------------------------------------
    def tally(self) -> dict[str, int]:
        """Counts for the status line (of the review with proposals applied)."""
        r = self.review
        if r is None:
            return {}
        c = r.counts()
        items = self.items()
        # one basis: the review shown (as filed, or with the what-if changes applied)
        failing = [i for i in items if i.outcome == "fail"]
        decided = [i for i in failing if not self.needs_decision(i)]
        return {
            "hazard": c.get("hazard", 0), "risk": c.get("risk", 0), "advice": c.get("advice", 0),
            "open": c.get("open", 0), "needs_data": c.get("needs_data", 0),
            "passed": c.get("pass", 0) + c.get("answered", 0),
            "failing": len(failing), "decided": len(decided),
            "reconfirm": sum(1 for i in failing if self.decision_state(i) == "reconfirm"),
            "proposals": len(self.record.proposals) if s_applied(self.snapshot) else 0,
            "conflicts": len(conflicts(r)),
            "orphans": len(r.orphans),
        }

    # recording ----------------------------------------------------------------------------
    def _finding_for_record(self, key: str) -> Finding:
        s = self.snapshot
        for r in (s.filed, s.current):
            f = r.finding(key) if r is not None else None
            if f is not None:
                return f
        raise KeyError(key)

    def needs_acceptor(self, key: str, kind: str) -> bool:
        """True when deciding ``kind`` on ``key`` also asks who accepts it: accepting a hazard."""
        if kind != "accepted":
            return False
        try:
            return self._finding_for_record(key).severity == "hazard"
        except KeyError:
            return False

    def decide(self, key: str, kind: str, reason: str = "", accepted_by: str = "") -> None:
        """Record a decision on the finding as filed (the numbers it is made on), and save.

        Accepting a hazard needs ``accepted_by`` (who accepts it) as well as the reason."""
        record = rec.decide(self.record, self._finding_for_record(key), kind, reason,
                            self.reviewer)
        if self.needs_acceptor(key, kind) and not accepted_by.strip():
            raise rec.DecisionError("accepting a hazard needs the name of who accepts it, "
                                    "as well as why")
        if kind == "accepted" and accepted_by.strip():
            d = replace(record.decisions[key], accepted_by=accepted_by.strip())
            record = replace(record, decisions={**record.decisions, key: d})
        self._save(record)
        self.snapshot = _restamp(self.snapshot, self.record)

    def answer_conflicts(self, question: str, answer: str) -> list:
        """What the design file says against answering ``answer`` to ``question``."""
        from reviewer.report.conflicts import answer_conflicts

        r = self.snapshot.filed
        return answer_conflicts(r.sheet if r else None, question, answer)

    def conflicts_of(self, item: Item) -> list:
        """The contradictions of the answer given to the question ``item`` (none if open)."""
        if not item.is_question:
            return []
        ans = self.answer_of(item)
        return [] if ans is None else self.answer_conflicts(item.finding.rule_id, ans[0])

    def note(self, key: str, text: str) -> None:
        self._save(rec.note(self.record, key, text, self.reviewer))
        self.snapshot = _restamp(self.snapshot, self.record)

    def answer(self, question: str, value: str, note_text: str = "") -> None:
        """Answer a checklist question (by rule id) and save; then :meth:`refresh` (the rules
        are judged again, the sheets reused)."""
        self._save(rec.answer(self.record, question, value, note_text, self.reviewer))
        self.snapshot = _restamp(self.snapshot, self.record)

    def check_proposal(self, field_path: str, value: str) -> list[Problem]:
        """The problems the proposal would cause (none when it validates); nothing is saved."""
        from reviewer.whatif import apply_to_text, proposals_of

        try:
            text = self.path.read_text(encoding="utf-8")
            apply_to_text(text, str(self.path), {**proposals_of(self.record),
                                                 field_path.strip(): value})
        except InputError as e:
            return list(e.problems)
        except OSError as e:
            return [Problem(str(self.path), None, "", f"cannot be read: {e}")]
        return []

    def propose(self, field_path: str, value: str, note_text: str = "") -> None:
        """Store a what-if change in the record (the design file is never rewritten)."""
        self._save(rec.propose(self.record, field_path.strip(), value.strip(), note_text,
                               self.reviewer))

    def withdraw(self, field_path: str) -> None:
        self._save(rec.withdraw(self.record, field_path))

    def field_value(self, field_path: str) -> str:
        """The design's current value of a field, as text, to prefill a what-if."""
        p = self.record.proposals.get(field_path)
        if p is not None:
            return p.value
        r = self.snapshot.filed
        if r is None:
            return ""
        q = r.sheet.get(f"design.{field_path}")
        if q is None:
            return ""
        if q.kind == "number":
            from reviewer.report.common import num

            return num(q.typ, q.unit)
        return str(q.typ).lower() if isinstance(q.typ, bool) else str(q.typ)

    def field_hint(self, field_path: str) -> str:
        """What a design field means and holds now, for the what-if dialog:
        'Dead time at every edge (0 is legal and dangerous) · now 0 s'."""
        r = self.snapshot.filed
        if r is None or not field_path:
            return ""
        q = r.sheet.get(f"design.{field_path}")
        meaning = field_description(field_path)
        if q is None:
            if f"design.{field_path}" in r.sheet.missing or meaning:
                return (meaning + " · " if meaning else "") + "not given in the design file"
            return "not a design field of this design: → accepts a suggestion"
        p = self.record.proposals.get(field_path)
        text = (meaning + " · " if meaning else "") + f"now {_shown(q)}"
        if p is not None:
            text += f" as filed, {p.value} proposed"
        return text

    def design_fields(self) -> list[str]:
        """Every design field a what-if may change (from the sheet), for completion."""
        r = self.snapshot.filed
        if r is None:
            return []
        names = {n.removeprefix("design.") for n in (*r.sheet.quantities, *r.sheet.missing)
                 if n.startswith("design.")}
        return sorted(n for n in names if not n.startswith(("design.", "checklist.")))

    def export(self, target: str | Path, with_pictures: bool = True) -> Path:
        """Write the Markdown report with the writer of ``reviewer check -o`` (pictures beside
        it), plus what the proposals would change; never over the design file or its record."""
        from reviewer.report import markdown
        from reviewer.tui.export import whatif_section

        t = Path(target).expanduser()
        if t.resolve() == self.path.resolve() or t.resolve() == self.record_file.resolve():
            raise InputError([Problem(str(t), None, "", "is the design or its record; "
                                      "choose another file for the report")])
        if t.suffix.lower() not in (".md", ".markdown"):
            raise InputError([Problem(str(t), None, "", "a Markdown report's name ends in .md")])
        s = self.snapshot
        if not s.ok:
            raise InputError(list(s.problems))
        markdown.write([s.filed], t, with_pictures=with_pictures,
                       extra=whatif_section(s.filed, s.current))
        return t

    def default_export(self) -> Path:
        """A ``reviews/`` folder beside the design; for a bundled example (whose folder belongs
        to the program), a ``reviews/`` folder in the working directory instead."""
        from reviewer.paths import examples_dir

        here = self.path.resolve().parent
        packaged = {examples_dir().resolve(), Path(__file__).resolve().parents[1]}
        inside = any(here == p or p in here.parents for p in packaged)
        base = Path.cwd() if inside else self.path.parent
        return base / "reviews" / (self.path.stem + ".review.md")


def field_description(field_path: str) -> str:
    """The design format's description of a field ('' when it has none)."""
    import typing

    from reviewer.design import model

    cls: object = model.Design
    parts = field_path.split(".")
    for i, name in enumerate(parts):
        fields = getattr(cls, "model_fields", {})
        f = fields.get(name)
        if f is None:
            return ""
        if i == len(parts) - 1:
            return (f.description or "").rstrip(".")
        ann = f.annotation
        nxt = next((a for a in (typing.get_args(ann) or (ann,))
                    if isinstance(a, type) and issubclass(a, model.Part)), None)
        if nxt is None:
            return ""
        cls = nxt
    return ""


def _shown(q) -> str:
    if q.kind == "number":
        from reviewer.report.common import num

        return num(q.typ, q.unit)
    return str(q.typ).lower() if isinstance(q.typ, bool) else str(q.typ)


def s_applied(snap: Snapshot) -> bool:
    """True when the review shown has the what-if changes applied (they validated)."""
    return snap.current is not None and snap.current is not snap.filed


def conflicts(review: Review) -> list:
    from reviewer.report.conflicts import conflicts as found

    return found(review)


def _restamp(snap: Snapshot, record: rec.Record) -> Snapshot:
    """The same findings with a new record (decisions do not change any finding)."""
    def put(r: Review | None) -> Review | None:
        return None if r is None else replace(r, record=record)

    filed = put(snap.filed)
    current = filed if snap.current is snap.filed else put(snap.current)
    return replace(snap, filed=filed, current=current)
