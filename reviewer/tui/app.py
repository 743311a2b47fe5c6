"""The walkthrough app: a thin shell that lays out the widgets and routes keys to the walk.

The state and every change to the record live in :class:`reviewer.tui.session.Walk`; the text
comes from :mod:`reviewer.tui.views` and :mod:`reviewer.tui.pictures`. The heavy review runs in
a thread worker, so the first screen appears at once and a what-if answers while you look.
"""

from __future__ import annotations

from collections.abc import Iterable
from pathlib import Path

from textual import on, work
from textual.app import App, ComposeResult, SystemCommand
from textual.binding import Binding
from textual.containers import Horizontal, Vertical
from textual.screen import Screen
from textual.widgets import Footer, OptionList, Static, TabbedContent, TabPane
from textual.worker import get_current_worker

from reviewer.errors import InputError
from reviewer.record import NEEDS_REASON, DecisionError
from reviewer.tui import pictures, views
from reviewer.tui.views import finding_title
from reviewer.tui.dialogs import ChoiceDialog, KeysScreen, PathDialog, PickDialog, WhatIfDialog
from reviewer.tui.keys import ACTIONS
from reviewer.tui.session import Snapshot, Walk
from reviewer.tui.widgets import Detail, FindingList, Picture

DECISIONS = [("c", "will_change", "will change the design"),
             ("a", "accepted", "accept as it stands (say why)"),
             ("x", "not_applicable", "does not apply here (say why)"),
             ("u", "undecided", "undecided")]
ANSWERS = [("y", "yes", "yes"), ("n", "no", "no"), ("x", "not_applicable", "does not apply (say why)")]


SAID = {"'accepted'": "accepting", "'not_applicable'": "saying it does not apply",
        "'will_change'": "will change", "'undecided'": "undecided"}
"""The record's names of decisions as the walkthrough says them."""


def plain_words(message: str) -> str:
    """A record message in the walkthrough's words (no snake_case names of values)."""
    for name, words in SAID.items():
        message = message.replace(name, words)
    return message[:1].upper() + message[1:]


class WalkApp(App[int]):
    """``reviewer walk DESIGN``: take the reviewer through every finding of one design."""

    CSS_PATH = Path(__file__).with_name("walk.tcss")
    TITLE = "Bridge Reviewer walkthrough"
    BINDINGS = [Binding(a.keys, a.action, a.title, show=a.footer) for a in ACTIONS]

    def __init__(self, walk: Walk, poll: float = 1.0, theme: str = "textual-dark"):
        super().__init__()
        self.walk = walk
        self.poll = poll
        self.selected: str | None = None
        self.busy = False
        self._theme_name = theme
        self._pending_whatif = None
        self.last_whatif = ""

    # layout ------------------------------------------------------------------------------
    def compose(self) -> ComposeResult:
        with Vertical(id="top"):
            yield Static(views.identity(self.walk), id="identity", markup=False)
            yield Static(views.glance(self.walk, busy=True), id="glance", markup=False)
            yield Static("", id="caution", markup=False)
        yield Static("", id="problems", markup=False)
        with Horizontal(id="body"):
            yield FindingList(id="findings")
            with TabbedContent(id="tabs", initial="finding"):
                with TabPane("1 Finding", id="finding"):
                    yield Detail(id="detail")
                with TabPane("2 Timing", id="timing"):
                    yield Picture(id="timing-picture")
                with TabPane("3 Spectrum", id="spectrum"):
                    yield Picture(id="spectrum-picture")
                with TabPane("4 Changes", id="changes"):
                    yield Detail(id="changes-detail")
        yield Footer()

    def on_mount(self) -> None:
        self.theme = self._theme_name
        self.query_one("#problems").display = False
        self.query_one("#caution").display = False
        self.query_one("#findings").focus()
        self.review_again()
        if self.poll > 0:
            self.set_interval(self.poll, self.watch_files)

    # reviewing in the background -----------------------------------------------------------
    def review_again(self) -> None:
        self.busy = True
        self.query_one("#glance", Static).update(views.glance(self.walk, busy=True))
        self._review()

    @work(thread=True, exclusive=True, group="review")
    def _review(self) -> None:
        snap = self.walk.refresh()
        if not get_current_worker().is_cancelled:
            self.call_from_thread(self.installed, snap)

    def installed(self, snap: Snapshot) -> None:
        first = not self.walk.snapshot.ok
        if self.walk.install(snap):
            self.review_again()  # the record changed while this review ran
            return
        self.busy = False
        if self._pending_whatif is not None:
            self._whatif_done()
        if first and self.selected is None:  # start on the first item that needs a decision
            self.selected = self.walk.next_undecided(None)
        self.show_all()

    def watch_files(self) -> None:
        if self.busy:
            return
        design, record = self.walk.changed_on_disk()
        if record:
            try:
                self.walk.reload_record()
            except InputError as e:
                self.notify("\n".join(str(p) for p in e.problems), title="Record file",
                            severity="error")
                return
        if design or record:
            if design:
                self.notify("The design file changed: reviewing it again.")
            self.review_again()

    # showing -------------------------------------------------------------------------------
    def show_all(self) -> None:
        walk = self.walk
        self.query_one("#identity", Static).update(views.identity(walk))
        self.query_one("#glance", Static).update(views.glance(walk, self.busy))
        caution = views.caution(walk)
        c = self.query_one("#caution", Static)
        c.display = caution is not None
        if caution is not None:
            c.update(caution)
        bad = not walk.snapshot.ok and walk.snapshot.problems
        problems = self.query_one("#problems", Static)
        problems.display = bool(bad)
        body = self.query_one("#body")
        reshown = not bad and not body.display
        body.display = not bad
        if reshown:  # widths are known only after the next layout: fit everything then
            self.call_after_refresh(self.relayout)
        if bad:
            problems.update(views.problems(list(walk.snapshot.problems),
                                           "The design file did not load:"))
            return
        self.selected = self.query_one(FindingList).show(walk, self.selected)
        self.show_selected()
        self.show_pictures()

    def show_selected(self) -> None:
        self.query_one("#detail", Detail).show(views.detail(self.walk, self.walk.item(self.selected)))
        self.query_one("#changes-detail", Detail).show(views.proposals(self.walk, self.last_whatif))

    def show_pictures(self) -> None:
        r = self.walk.review
        if r is None:
            return
        pane = self.query_one("#tabs").size.width - 3  # room for the scroll bar
        self.query_one("#timing-picture", Picture).show(
            "\n".join(pictures.timing_picture(r.sheet, max(20, pane - pictures.LEAD),
                                              r.findings)))
        self.query_one("#spectrum-picture", Picture).show(
            "\n".join(pictures.spectrum_picture(r.sheet, max(20, pane - 10))))

    def on_resize(self) -> None:
        if self.walk.snapshot.ok:
            self.call_after_refresh(self.relayout)

    def relayout(self) -> None:
        """Fit the list and the pictures to the widths they have now (after a resize, or when
        the body is shown again once a broken design file has been fixed)."""
        if not self.walk.snapshot.ok or not self.query_one("#body").display:
            return
        self.selected = self.query_one(FindingList).show(self.walk, self.selected)
        self.show_pictures()

    @on(OptionList.OptionHighlighted, "#findings")
    def _highlighted(self, event: OptionList.OptionHighlighted) -> None:
        key = self.query_one(FindingList).key
        if key is not None and key != self.selected:
            self.selected = key
            self.show_selected()

    @on(OptionList.OptionSelected, "#findings")
    def _selected(self) -> None:
        self.action_decide()

    # actions -------------------------------------------------------------------------------
    def _item(self):
        return self.walk.item(self.selected)

    def _after_record(self) -> None:
        self.show_all()

    def action_next_undecided(self) -> None:
        key = self.walk.next_undecided(self.selected)
        if key is None:
            self.notify("Every finding has a decision and every question an answer.")
            return
        self.selected = key
        self.query_one(FindingList).go(key)
        self.show_selected()

    def action_decide(self) -> None:
        item = self._item()
        if item is None:
            return
        if item.is_question:
            self._answer(item)
        else:
            d = self.walk.decision(item.key)
            self._decision(item, d.kind if d else None, focus_note=False)

    def action_quick(self, kind: str) -> None:
        item = self._item()
        if item is None:
            return
        if item.is_question:
            self.notify("This is a checklist question: press d or Enter to answer it.")
            return
        if kind in NEEDS_REASON:
            self._decision(item, kind, focus_note=True)
            return
        d = self.walk.decision(item.key)
        self._record(lambda: self.walk.decide(item.key, kind, d.reason if d else "",
                                              d.accepted_by if d else ""))

    def _record(self, do) -> str | None:
        """Run a record change; an error message for a dialog, or None after saving."""
        try:
            do()
        except DecisionError as e:
            return plain_words(str(e))
        except OSError as e:
            return f"the record could not be saved: {e}"
        self._after_record()
        return None

    def _decision(self, item, kind: str | None, focus_note: bool) -> None:
        d = self.walk.decision(item.key)

        def apply(value: str, note: str, who: str) -> str | None:
            return self._record(lambda: self.walk.decide(item.key, value, note, who))

        self.push_screen(ChoiceDialog(
            f"Decision on {item.key}", finding_title(item.finding), DECISIONS, apply,
            preset=kind, note=d.reason if d else "",
            note_label="Why (needed to accept or to say it does not apply)",
            focus_note=focus_note, who_for=lambda v: self.walk.needs_acceptor(item.key, v),
            who=d.accepted_by if d else ""))

    def _answer(self, item) -> None:
        current = self.walk.answer_of(item)
        question = item.finding.rule_id

        def apply(value: str, note: str, _who: str) -> str | None:
            error = self._record(lambda: self.walk.answer(question, value, note))
            if error is None:
                self.review_again()
                clash = self.walk.answer_conflicts(question, value)
                if clash:
                    self.notify("\n".join(c.text() for c in clash),
                                title="Answer contradicts the design file", severity="warning")
            return error

        def warn(value: str) -> str:
            return "\n".join("≠ " + c.text() for c in self.walk.answer_conflicts(question, value))

        self.push_screen(ChoiceDialog(
            f"Answer {question}", item.finding.question, ANSWERS, apply,
            preset=current[0] if current else None, note=current[1] if current else "",
            warn=warn))

    def action_note(self) -> None:
        item = self._item()
        if item is None:
            return
        if item.is_question:
            self._answer(item)
            return
        d = self.walk.decision(item.key)

        def apply(_: str, note: str, _who: str) -> str | None:
            return self._record(lambda: self.walk.note(item.key, note))

        self.push_screen(ChoiceDialog(f"Note on {item.key}", finding_title(item.finding), [],
                                      apply, note=d.reason if d else ""))

    def action_whatif(self) -> None:
        if not self.walk.snapshot.ok:
            self.notify("The design did not load: fix the file first.", severity="warning")
            return
        item = self._item()
        field, value = "", ""
        if item is not None:
            f = item.finding
            field = f.pass_field or (f.fields[0] if f.fields else "")
            if f.pass_field and f.pass_value is not None:
                from reviewer.report.common import num

                value = num(f.pass_value, f.pass_unit)

        key = item.key if item is not None else None

        def apply(field_path: str, value_text: str, note: str) -> str | None:
            problems = self.walk.check_proposal(field_path, value_text)
            if problems:
                return "\n".join(f"{p.path or field_path}: {p.message}" for p in problems)
            before = self.walk.review
            error = self._record(lambda: self.walk.propose(field_path, value_text, note))
            if error is None:
                self._pending_whatif = (key, field_path, value_text, before)
                self.review_again()
            return error

        self.push_screen(WhatIfDialog(self.walk.design_fields(), self.walk.field_value, apply,
                                      field, value, hint=self.walk.field_hint))

    def _whatif_done(self) -> None:
        """Say plainly what the last what-if change did (or that it had no effect)."""
        pending, self._pending_whatif = self._pending_whatif, None
        if pending is None or self.walk.review is None:
            return
        key, field_path, value_text, before = pending
        text = views.whatif_result(before, self.walk.review, key, field_path, value_text)
        self.last_whatif = text
        self.notify(text, title="What-if", timeout=12)
        self.show_selected()

    def action_withdraw(self) -> None:
        props = self.walk.record.proposals
        if not props:
            self.notify("There is no proposed change to withdraw.")
            return

        def done(field_path: str | None) -> None:
            if field_path:
                if self._record(lambda: self.walk.withdraw(field_path)) is None:
                    self.review_again()

        self.push_screen(PickDialog("Withdraw which proposed change?",
                                    [(k, f"{k} = {p.value}") for k, p in sorted(props.items())]),
                         done)

    def action_tab(self, pane: str) -> None:
        self.query_one("#tabs", TabbedContent).active = pane

    def action_toggle_passed(self) -> None:
        self.walk.show_passed = not self.walk.show_passed
        self.show_all()

    def action_export(self) -> None:
        if not self.walk.snapshot.ok:  # refuse early: there is nothing to report
            self.notify("The design did not load, so there is no report to export: fix the "
                        "file first.", severity="warning")
            return

        def apply(target: str) -> str | None:
            try:
                path = self.walk.export(Path(target))
            except InputError as e:
                return "\n".join(str(p) for p in e.problems)
            except OSError as e:
                return f"cannot write {target}: {e}"
            self.notify(f"Wrote the Markdown report (pictures beside it) to {path}")
            return None

        self.push_screen(PathDialog("Export the Markdown report to", str(self.walk.default_export()),
                                    apply))

    def action_deck(self) -> None:
        from reviewer.deck import DeckError, write_deck

        review, item = self.walk.review, self._item()
        if review is None:
            self.notify("No review to write a deck from", severity="warning")
            return

        def apply(target: str) -> str | None:
            try:
                deck = write_deck(review, Path(target), item.finding if item else "worst")
            except DeckError as e:
                return str(e)
            except OSError as e:
                return f"cannot write {target}: {e}"
            self.notify(f"Wrote the SPICE deck to {target} ({deck.corner.describe()})")
            return None

        self.push_screen(PathDialog("Write the SPICE deck of the leg at this finding's corner to",
                                    str(self.walk.path.with_suffix(".cir")), apply))

    def action_rereview(self) -> None:
        self.review_again()

    def action_help(self) -> None:
        self.push_screen(KeysScreen())

    async def action_quit(self) -> None:
        self.exit(0)

    # palette -------------------------------------------------------------------------------
    def get_system_commands(self, screen: Screen) -> Iterable[SystemCommand]:
        for a in ACTIONS:
            yield SystemCommand(a.title, a.help, self._palette_callback(a.action))
        yield from super().get_system_commands(screen)

    def _palette_callback(self, action: str):
        async def run() -> None:
            await self.run_action(action)
        return run
