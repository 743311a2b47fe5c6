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

Apply = Callable[[str, str], "str | None"]



class ChoiceDialog(ModalScreen[bool]):
    """Choose one of a few values by its letter (or the arrows), add a note, press Enter."""

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, title: str, subject: str, choices: Sequence[tuple[str, str, str]],
                 apply: Apply, preset: str | None = None, note: str = "",
                 note_label: str = "Note", focus_note: bool = False):
        super().__init__()
        self.title_text, self.subject = title, subject
        self.choices = list(choices)  # (letter, value, words)
        self.apply = apply
        self.preset = preset
        self.note = note
        self.note_label = note_label
        self.focus_note = focus_note

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static(self.title_text, classes="title", markup=False)
            yield Static(self.subject, classes="subject", markup=False)
            if self.choices:
                yield OptionList(*[Option(f"{k}  {words}", id=v) for k, v, words in self.choices],
                                 id="choice")
            yield Input(self.note, placeholder=f"{self.note_label} (Enter to save)", id="note")
            yield Static("", classes="error", id="error", markup=False)
            yield Static(("letter or ↑↓ to choose · " if self.choices else "")
                         + "Tab to the note · Enter save · Esc close", classes="hint")

    def on_mount(self) -> None:
        if self.choices:
            ol = self.query_one("#choice", OptionList)
            values = [v for _, v, _ in self.choices]
            ol.highlighted = values.index(self.preset) if self.preset in values else 0
            (self.query_one("#note") if self.focus_note else ol).focus()
        else:
            self.query_one("#note").focus()

    @property
    def value(self) -> str:
        if not self.choices:
            return ""
        ol = self.query_one("#choice", OptionList)
        return self.choices[ol.highlighted or 0][1]

    def on_key(self, event) -> None:
        if isinstance(self.focused, Input) or not event.character:
            return
        for i, (k, _, _) in enumerate(self.choices):
            if event.character == k:
                self.query_one("#choice", OptionList).highlighted = i
                self.query_one("#note").focus()
                event.stop()
                return

    @on(OptionList.OptionSelected, "#choice")
    def _chosen(self) -> None:
        self.query_one("#note").focus()

    @on(Input.Submitted, "#note")
    def _submit(self) -> None:
        error = self.apply(self.value, self.query_one("#note", Input).value)
        if error:
            self.query_one("#error", Static).update(error)
        else:
            self.dismiss(True)

    def action_cancel(self) -> None:
        self.dismiss(False)


class WhatIfDialog(ModalScreen[bool]):
    """A design field and the value to try; checked before it is kept."""

    BINDINGS = [Binding("escape", "cancel", "Close")]

    def __init__(self, fields: list[str], current: Callable[[str], str], apply: Callable[[str, str, str], "str | None"],
                 field: str = "", value: str = ""):
        super().__init__()
        self.fields, self.current, self.apply = fields, current, apply
        self.field, self.preset_value = field, value

    def compose(self) -> ComposeResult:
        with Vertical(classes="dialog"):
            yield Static("What if… (a proposal: the design file is not changed)", classes="title", markup=False)
            yield Static("Design field, e.g. timing.dead_time", classes="subject", markup=False)
            yield Input(self.field, placeholder="field", id="field",
                        suggester=SuggestFromList(self.fields, case_sensitive=False))
            yield Static("Value to try, as in the design file, e.g. 800 ns", classes="subject", markup=False)
            yield Input(self.preset_value or (self.current(self.field) if self.field else ""),
                        placeholder="value", id="value")
            yield Input("", placeholder="why (optional note)", id="why")
            yield Static("", classes="error", id="error", markup=False)
            yield Static("→ accepts a suggestion · Enter next / try it · Esc close", classes="hint")

    def on_mount(self) -> None:
        self.query_one("#value" if self.field else "#field").focus()

    @on(Input.Submitted, "#field")
    def _field(self, event: Input.Submitted) -> None:
        value = self.query_one("#value", Input)
        if not value.value:
            value.value = self.current(event.value.strip())
        value.focus()

    @on(Input.Submitted, "#value")
    @on(Input.Submitted, "#why")
    def _try(self) -> None:
        field = self.query_one("#field", Input).value.strip()
        value = self.query_one("#value", Input).value.strip()
        if not field or not value:
            self.query_one("#error", Static).update("give a field and a value")
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
