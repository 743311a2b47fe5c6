"""Small widgets of the walkthrough; each shows one part of the walk's state."""

from __future__ import annotations

from rich.text import Text
from textual.containers import VerticalScroll
from textual.widgets import OptionList, Static
from textual.widgets.option_list import Option

from reviewer.tui import views
from reviewer.tui.session import Walk


class FindingList(OptionList):
    """Findings grouped by area (headers are disabled rows), worst first."""

    DEFAULT_CSS = """
    FindingList { width: 44%; min-width: 34; height: 1fr; border: round $primary; }
    FindingList:focus { border: round $accent; }
    """

    _keys: list[str] = []
    _drawn_width: int = 0

    def on_resize(self, event) -> None:
        """Redraw at the new width (the entries are fitted to it), once the size is known."""
        width = self.scrollable_content_region.width
        if width and width != self._drawn_width and hasattr(self.app, "relayout"):
            self.app.call_later(self.app.relayout)

    def show(self, walk: Walk, keep: str | None) -> str | None:
        """Rebuild from ``walk``; keep ``keep`` highlighted if still listed. Returns the key."""
        items = walk.items()
        self._drawn_width = self.scrollable_content_region.width
        spare = 1 if self.show_vertical_scrollbar else 3  # a scroll bar may yet appear
        width = max(24, (self.scrollable_content_region.width or 40) - spare)
        by_area: dict[str, list] = {}
        for i in items:
            by_area.setdefault(i.area, []).append(i)
        options: list[Option] = []
        room = max(8, width - 13)
        shown = [views.fit_item(i, room) for i in items]
        alike = {n for n in shown if shown.count(n) > 1}
        for area, group in by_area.items():
            options.append(Option(views.area_header(area, group, walk), id=f"area:{area}",
                                  disabled=True))
            options += [Option(views.item_prompt(
                walk, i, width, two_lines=views.fit_item(i, room) in alike),
                id=i.key) for i in group]
        if not items:
            options.append(Option(Text("Nothing to review here: no finding fails, asks or needs "
                                       "data. Press p to list the passed checks."),
                                  id="area:none", disabled=True))
        with self.prevent(OptionList.OptionHighlighted):
            self.set_options(options)
        keys = [i.key for i in items]
        if keep in keys or not keys:
            target = keep if keys else None
        else:  # the item left the list (it passed, or was answered): stay at the same place
            before = self._keys.index(keep) if keep in self._keys else 0
            target = keys[min(before, len(keys) - 1)]
        self._keys = keys
        if target is not None:
            self.highlighted = self.get_option_index(target)
        return target

    async def _on_click(self, event) -> None:
        """One click selects an entry; only a double click (or Enter) opens the decision."""
        event.prevent_default()  # the option list's own handler would open it on one click
        clicked = event.style.meta.get("option")
        if clicked is None or self._options[clicked].disabled:
            return
        self.highlighted = clicked
        if event.chain >= 2:
            self.action_select()

    @property
    def key(self) -> str | None:
        if self.highlighted is None:
            return None
        oid = self.get_option_at_index(self.highlighted).id
        return None if oid is None or oid.startswith("area:") else oid

    def go(self, key: str) -> None:
        self.highlighted = self.get_option_index(key)


class Picture(VerticalScroll):
    """A scrollable text picture that is never wrapped; drawn again when its width changes."""

    _drawn_width: int = 0

    def on_resize(self, event) -> None:
        if self.size.width and self.size.width != self._drawn_width \
                and hasattr(self.app, "relayout"):
            self._drawn_width = self.size.width
            self.app.call_later(self.app.relayout)

    DEFAULT_CSS = """
    Picture { height: 1fr; }
    Picture > Static { width: auto; }
    """

    def compose(self):
        yield Static("", markup=False)

    def show(self, content: Text | str) -> None:
        text = content if isinstance(content, Text) else Text(content)
        text.no_wrap = True
        self.query_one(Static).update(text)

    @property
    def text(self) -> str:
        c = self.query_one(Static).content
        return c.plain if isinstance(c, Text) else str(c)


class Detail(VerticalScroll):
    """The selected finding: numbers, why, what to do, source, decision (wrapped text)."""

    DEFAULT_CSS = "Detail { height: 1fr; padding: 0 1; }"

    def compose(self):
        yield Static("", markup=False)

    def show(self, content: Text) -> None:
        self.query_one(Static).update(content)

    @property
    def text(self) -> str:
        c = self.query_one(Static).content
        return c.plain if isinstance(c, Text) else str(c)
