"""The walkthrough's dialogs: a choice with a note, a what-if change, withdraw, export, keys.

Each dialog is handed an ``apply`` callable that does the work and returns an error message (or
None); the dialog shows the message in place and stays open, so a refused entry (an acceptance
without a reason, a proposal that does not validate) is corrected where it was typed.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

from rich.text import Text
from textual import on
from textual.app import ComposeResult
from textual.binding import Binding
from textual.containers import Vertical, VerticalScroll
from textual.screen import ModalScreen
from textual.suggester import SuggestFromList
from textual.widgets import Input, OptionList, Static
from textual.widgets.option_list import Option

from reviewer.tui.keys import ACTIONS, DIALOG_KEYS, key_text

Apply = Callable[[str, str, str], "str | None"]
"""apply(choice, note, who) -> an error message, or None once saved."""


class ChoiceDialog(ModalScreen[bool]):
    """Choose one of a few values by its letter (or the arrows), add a note, press Enter.

    Nothing is chosen until the reviewer chooses: with no ``preset`` no entry is highlighted,
    and Enter without a choice is refused in place, so two Enters never record anything.
    ``warn(choice)`` gives a line shown at once when a choice is highlighted (e.g. an answer
    the design file contradicts); ``who_for(choice)`` says whether the choice also needs the
    name of the person who takes it (accepting a hazard).
    """

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, title: str, subject: str, choices: Sequence[tuple[str, str, str]],
                 apply: Apply, preset: str | None = None, note: str = "",
                 note_label: str = "Note", focus_note: bool = False,
                 warn: Callable[[str], str] | None = None,
                 who_for: Callable[[str], bool] | None = None, who: str = ""):
        super().__init__()
        self.title_text, self.subject = title, subject
        self.choices = list(choices)  # (letter, value, words)
        self.apply = apply
        self.preset = preset
        self.note = note
        self.note_label = note_label
        self.focus_note = focus_note
        self.warn = warn
        self.who_for = who_for
        self.who = who

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.title_text, classes="title", markup=False)
            yield Static(self.subject, classes="subject", markup=False)
            if self.choices:
                yield OptionList(*[Option(f"{k}  {words}", id=v) for k, v, words in self.choices],
                                 id="choice")
                yield Static("", classes="chosen", id="chosen", markup=False)
                yield Static("", classes="warning", id="warning", markup=False)
            yield Static(self.note_label, classes="label", markup=False)
            yield Input(self.note, placeholder="type here; Enter saves", id="note")
            yield Static("Who accepts it (name and role): the person answerable for the hazard",
                         classes="label", id="who-label", markup=False)
            yield Input(self.who, placeholder="who accepts it, e.g. A. Person, lead engineer",
                        id="who")
            yield Static("", classes="error", id="error", markup=False)
            yield Static(("letter or ↑↓ to choose · " if self.choices else "")
                         + "Tab to the note · Enter save · Esc close", classes="hint")

    def on_mount(self) -> None:
        if self.choices:
            ol = self.query_one("#choice", OptionList)
            values = [v for _, v, _ in self.choices]
            ol.highlighted = values.index(self.preset) if self.preset in values else None
            (self.query_one("#note") if self.focus_note else ol).focus()
        else:
            self.query_one("#note").focus()
        self._follow()

    @property
    def value(self) -> str | None:
        """The chosen value; None while nothing is chosen ("" for a dialog without choices)."""
        if not self.choices:
            return ""
        h = self.query_one("#choice", OptionList).highlighted
        return None if h is None else self.choices[h][1]

    def _needs_who(self) -> bool:
        v = self.value
        return bool(v and self.who_for and self.who_for(v))

    def _follow(self) -> None:
        """Show the warning and the who-accepts box that the current choice calls for."""
        v = self.value
        if self.choices:
            words = next((w for _, c, w in self.choices if c == v), None)
            self.query_one("#chosen", Static).update(
                f"Chosen: {words}" if words else "Nothing chosen yet: press a letter or ↑↓ and "
                "Enter")
            text = self.warn(v) if (v and self.warn) else ""
            w = self.query_one("#warning", Static)
            w.update(text)
            w.display = bool(text)
        need = self._needs_who()
        self.query_one("#who").display = need
        self.query_one("#who-label").display = need

    @on(OptionList.OptionHighlighted, "#choice")
    def _moved(self) -> None:
        self._follow()

    def on_key(self, event) -> None:
        if isinstance(self.focused, Input) or not event.character:
            return
        for i, (k, _, _) in enumerate(self.choices):
            if event.character == k:
                self.query_one("#choice", OptionList).highlighted = i
                self._follow()
                self.query_one("#note").focus()
                event.stop()
                return

    @on(OptionList.OptionSelected, "#choice")
    def _chosen(self) -> None:
        self._follow()
        self.query_one("#note").focus()

    @on(Input.Submitted, "#note")
    def _note_done(self) -> None:
        if (self._needs_who() and not self.query_one("#who", Input).value.strip()
                and self.query_one("#note", Input).value.strip()):
            self.query_one("#who").focus()
            return
        self._submit()

    @on(Input.Submitted, "#who")
    def _who_done(self) -> None:
        self._submit()

    def _submit(self) -> None:
        value = self.value
        if value is None:
            words = " · ".join(f"{k} {w}" for k, _, w in self.choices)
            self.query_one("#error", Static).update(f"nothing chosen yet: choose one ({words})")
            self.query_one("#choice").focus()
            return
        who = self.query_one("#who", Input).value if self._needs_who() else ""
        error = self.apply(value, self.query_one("#note", Input).value, who)
        if error:
            self.query_one("#error", Static).update(error)
        else:
            self.dismiss(True)

    def action_cancel(self) -> None:
        self.dismiss(False)


class WhatIfDialog(ModalScreen[bool]):
    """A design field and the value to try, and why; checked before it is kept.

    Focus starts on the field; Enter moves to the value, then to "why", then tries it. The value
    and the hint follow the field: choosing another field puts that field's value in (unless
    the value was typed by hand) and says what the field holds now."""

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, fields: list[str], current: Callable[[str], str],
                 apply: Callable[[str, str, str], "str | None"],
                 field: str = "", value: str = "", hint: Callable[[str], str] | None = None):
        super().__init__()
        self.fields, self.current, self.apply = fields, current, apply
        self.field, self.preset_value = field, value
        self.hint_of = hint or (lambda f: "")
        self._filled = ""  # the value last put in by the dialog (not typed by the user)

    def _value_for(self, field: str) -> str:
        if field == self.field and self.preset_value:
            return self.preset_value
        return self.current(field) if field else ""

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static("What if… (a proposal: the design file is not changed)", classes="title", markup=False)
            yield Static("Design field, e.g. timing.dead_time", classes="label", markup=False)
            yield Input(self.field, placeholder="field", id="field",
                        suggester=SuggestFromList(self.fields, case_sensitive=False))
            yield Static("", classes="subject", id="field-hint", markup=False)
            yield Static("Value to try, as in the design file (with its unit)", classes="label",
                         markup=False)
            self._filled = self._value_for(self.field)
            yield Input(self._filled, placeholder="value", id="value")
            yield Static("Why (a note kept with the proposal)", classes="label", markup=False)
            yield Input("", placeholder="why (optional)", id="why")
            yield Static("", classes="error", id="error", markup=False)
            yield Static("→ accepts a suggestion · Enter next · Enter in why tries it · Esc close",
                         classes="hint")

    def on_mount(self) -> None:
        self.query_one("#field").focus()
        self._hint(self.field)

    def _hint(self, field: str) -> None:
        text = self.hint_of(field) if field else ""
        self.query_one("#field-hint", Static).update(text)

    @on(Input.Changed, "#field")
    def _field_changed(self, event: Input.Changed) -> None:
        field = event.value.strip()
        self._hint(field)
        value = self.query_one("#value", Input)
        if value.value == self._filled:  # not typed by hand: follow the field
            self._filled = self._value_for(field) if field in self.fields else ""
            with self.prevent(Input.Changed):
                value.value = self._filled

    @on(Input.Submitted, "#field")
    def _field(self, event: Input.Submitted) -> None:
        self.query_one("#value", Input).focus()

    @on(Input.Submitted, "#value")
    def _value(self) -> None:
        self.query_one("#why", Input).focus()

    @on(Input.Submitted, "#why")
    def _try(self) -> None:
        field = self.query_one("#field", Input).value.strip()
        value = self.query_one("#value", Input).value.strip()
        if not field or not value:
            self.query_one("#error", Static).update("give a field and a value")
            self.query_one("#field" if not field else "#value").focus()
            return
        error = self.apply(field, value, self.query_one("#why", Input).value)
        if error:
            self.query_one("#error", Static).update(error)
        else:
            self.dismiss(True)

    def action_cancel(self) -> None:
        self.dismiss(False)


class PickDialog(ModalScreen[str | None]):
    """Pick one entry of a list (a proposal to withdraw)."""

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, title: str, entries: Sequence[tuple[str, str]]):
        super().__init__()
        self.title_text, self.entries = title, list(entries)

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.title_text, classes="title", markup=False)
            yield OptionList(*[Option(label, id=key) for key, label in self.entries], id="pick")
            yield Static("Enter choose · Esc close", classes="hint")

    def on_mount(self) -> None:
        self.query_one("#pick").focus()

    @on(OptionList.OptionSelected, "#pick")
    def _picked(self, event: OptionList.OptionSelected) -> None:
        self.dismiss(event.option_id)

    def action_cancel(self) -> None:
        self.dismiss(None)


class PathDialog(ModalScreen[bool]):
    """A file name to write to (the Markdown export)."""

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, title: str, default: str, apply: Callable[[str], "str | None"]):
        super().__init__()
        self.title_text, self.default, self.apply = title, default, apply

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.title_text, classes="title", markup=False)
            yield Input(self.default, id="path")
            yield Static("", classes="error", id="error", markup=False)
            yield Static("Enter write · Esc close", classes="hint")

    def on_mount(self) -> None:
        self.query_one("#path").focus()

    @on(Input.Submitted, "#path")
    def _write(self, event: Input.Submitted) -> None:
        error = self.apply(event.value.strip())
        if error:
            self.query_one("#error", Static).update(error)
        else:
            self.dismiss(True)

    def action_cancel(self) -> None:
        self.dismiss(False)


class KeysScreen(ModalScreen[None]):
    """Every key of the walkthrough, made from the same table as the bindings."""

    BINDINGS = [Binding("escape,q,question_mark,h", "close", "Close")]

    def compose(self) -> ComposeResult:
        t = Text()
        t.append("Keys of the walkthrough\n\n", style="bold")
        for a in ACTIONS:
            t.append(f"  {key_text(a):<16}", style="bold")
            t.append(f"{a.help}\n")
        t.append("\nIn dialogs and lists\n\n", style="bold")
        for where, keys, what in DIALOG_KEYS:
            t.append(f"  {keys:<16}", style="bold")
            t.append(f"{what}  ({where.lower()})\n")
        t.append("\nEvery decision, note, answer and proposal is saved to the record file at once. "
                 "The design file is only ever read.\n", style="italic")
        with Vertical(classes="dialog", id="keys-dialog"):
            with VerticalScroll():
                yield Static(t, id="keys")
            yield Static("Esc close", classes="hint")

    def action_close(self) -> None:
        self.dismiss(None)
