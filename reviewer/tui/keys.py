"""Every action of the walkthrough, once: its key, its name, what it does.

The key bindings, the help screen and the command palette are all made from :data:`ACTIONS`,
so none of them can miss an action.
"""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Action:
    keys: str          # Textual key names, comma-separated
    action: str        # the App's action_<name>
    title: str         # the palette's title and the footer's label
    help: str
    footer: bool = True
    shown: str = ""    # how the help screen writes the key, when not the key's name


ACTIONS: tuple[Action, ...] = (
    Action("n", "next_undecided", "Next", "Go to the next finding or question that needs a decision"),
    Action("enter,d", "decide", "Decide", "Record a decision (or answer the question) on the selected item",
           shown="Enter / d"),
    Action("c", "quick('will_change')", "Will change", "Decide: the design will be changed",
           footer=False),
    Action("a", "quick('accepted')", "Accept", "Decide: accept as it stands (asks why, and who for a hazard)",
           footer=False),
    Action("x", "quick('not_applicable')", "Does not apply",
           "Decide: the finding does not apply to this design (asks why)", footer=False),
    Action("u", "quick('undecided')", "Undecided", "Set the selected finding back to undecided",
           footer=False),
    Action("m", "note", "Note", "Write or change the note on the selected finding's decision"),
    Action("w", "whatif", "What-if", "Try a change to a design field (kept as a proposal)"),
    Action("W", "withdraw", "Withdraw", "Withdraw a proposed change", footer=False,
           shown="Shift+w"),
    Action("1", "tab('finding')", "Finding", "Show the selected finding's details", footer=False),
    Action("2", "tab('timing')", "Timing", "Show the gate timing diagram of a leg", footer=False),
    Action("3", "tab('spectrum')", "Spectrum", "Show the harmonic spectrum before and after the filter",
           footer=False),
    Action("4", "tab('changes')", "Changes", "Show the proposed changes and kept decisions",
           footer=False),
    Action("p", "toggle_passed", "Passed", "Show or hide the checks that passed", footer=False),
    Action("e", "export", "Export", "Export the Markdown report"),
    Action("s", "deck", "SPICE deck", "Write a SPICE deck of one leg and the filter at the "
           "selected finding's corner", footer=False),
    Action("r", "rereview", "Re-review", "Read the design file again and review it", footer=False),
    Action("question_mark,h", "help", "Keys", "List every key", shown="? / h"),
    Action("q", "quit", "Quit", "Leave the walkthrough (everything is already saved)"),
)

DIALOG_KEYS = (
    ("Decision dialog", "c / a / x / u", "will change · accept · does not apply · undecided; "
     "then type the note and press Enter"),
    ("Decision dialog", "Enter", "nothing is chosen until you choose; accepting a hazard then "
     "asks who accepts it"),
    ("Answer dialog", "y / n / x", "yes · no · does not apply; then the note and Enter"),
    ("What-if dialog", "Enter", "field → value → why → try it"),
    ("Any dialog", "Tab", "move between the choice and the note"),
    ("Any dialog", "Escape", "close without saving"),
    ("Lists", "↑ ↓ PgUp PgDn Home End", "move through the findings"),
    ("Anywhere", "Ctrl+p", "command palette: every action by name"),
)


def key_text(a: Action) -> str:
    return a.shown or " / ".join(k for k in a.keys.split(","))
