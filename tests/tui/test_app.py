"""The walkthrough driven by keys, as a user would: assertions are on the record file and the
exported Markdown on disk, not only on what the widgets show. Check values are the tests' own
inputs read back, and the example's documented faults (no dead time, no fuse)."""

from __future__ import annotations

import os

import pytest

from reviewer import record as rec
from reviewer.tui.app import WalkApp
from reviewer.tui.dialogs import ChoiceDialog
from reviewer.tui.keys import ACTIONS
from reviewer.tui.session import Walk


def make(path, **kw) -> WalkApp:
    return WalkApp(Walk.open(path, reviewer="tester"), poll=kw.pop("poll", 0), **kw)


async def settle(app, pilot) -> None:
    await app.workers.wait_for_complete()
    await pilot.pause()


async def type_text(pilot, text: str) -> None:
    await pilot.press(*[{" ": "space"}.get(ch, ch) for ch in text])


def on_disk(path) -> rec.Record:
    return rec.load(rec.record_path(path))


async def test_full_walk(naive, tmp_path):
    before = naive.read_bytes()
    app = make(naive)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(app, pilot)
        walk = app.walk
        # navigate: n goes to the first item that needs a decision; arrows move
        await pilot.press("n")
        first = app.selected
        assert walk.needs_decision(walk.item(first))
        await pilot.press("down")
        assert app.selected != first
        await pilot.press("up")
        assert app.selected == first
        # decide with one key: will change (no reason needed)
        await pilot.press("c")
        assert on_disk(naive).decisions[first].kind == "will_change"
        # next undecided, accept with a reason typed in the dialog
        await pilot.press("n")
        second = app.selected
        assert second != first
        await pilot.press("a")
        await pilot.pause()
        await pilot.press("enter")  # no reason: refused in place, the dialog stays
        await pilot.pause()
        assert "needs a reason" in str(app.screen.query_one("#error").content)
        await type_text(pilot, "bench only")
        await pilot.press("enter")
        await pilot.pause()
        if walk.needs_acceptor(second, "accepted"):  # a hazard: who accepts it, as well as why
            assert isinstance(app.screen, ChoiceDialog)
            assert app.screen.focused.id == "who"
            await type_text(pilot, "A. Lead")
            await pilot.press("enter")
            await pilot.pause()
        d = on_disk(naive).decisions[second]
        assert (d.kind, d.reason, d.reviewer) == ("accepted", "bench only", "tester")
        # a note on the first decision
        app.query_one("#findings").go(first)
        await pilot.pause()
        await pilot.press("m")
        await pilot.pause()
        await type_text(pilot, "add a fuse")
        await pilot.press("enter")
        await pilot.pause()
        assert on_disk(naive).decisions[first].reason == "add a fuse"
        # answer a checklist question: walk with n until one is selected
        for _ in range(60):
            await pilot.press("n")
            if walk.item(app.selected).is_question:
                break
        question = walk.item(app.selected).finding.rule_id
        await pilot.press("d")
        await pilot.pause()
        await pilot.press("y")
        await type_text(pilot, "checked")
        await pilot.press("enter")
        await settle(app, pilot)
        a = on_disk(naive).answers[question]
        assert (a.answer, a.note) == ("yes", "checked")
        assert walk.review.finding(question).outcome == "answered"
        # what-if: two proposals, findings update, the design file is untouched
        for field, value in (("drive.shared_signal", "false"), ("timing.dead_time", "800 ns")):
            await pilot.press("w")
            await pilot.pause()
            assert app.screen.focused.id == "field"  # focus starts on the field
            app.screen.query_one("#field").value = field
            app.screen.query_one("#value").value = value
            app.screen.query_one("#value").focus()
            await pilot.press("enter")  # Enter in the value moves to "why"
            await pilot.pause()
            assert app.screen.focused.id == "why"
            await pilot.press("enter")
            await settle(app, pilot)
        proposals = on_disk(naive).proposals
        assert proposals["timing.dead_time"].value == "800 ns"
        assert proposals["drive.shared_signal"].value == "false"
        item = walk.item("timing.no-dead-time")
        assert (item.filed.outcome, item.current.outcome) == ("fail", "pass")
        assert "WHAT-IF" in str(app.query_one("#glance").content)
        # a proposal that does not validate is refused in the dialog
        await pilot.press("w")
        await pilot.pause()
        app.screen.query_one("#field").value = "timing.dead_time"
        app.screen.query_one("#value").value = "800 nF"
        app.screen.query_one("#why").focus()
        await pilot.press("enter")
        await pilot.pause()
        assert "800 nF" in str(app.screen.query_one("#error").content)
        await pilot.press("escape")
        await pilot.pause()
        assert on_disk(naive).proposals["timing.dead_time"].value == "800 ns"
        # export from inside
        await pilot.press("e")
        await pilot.pause()
        target = tmp_path / "exported.md"
        app.screen.query_one("#path").value = str(target)
        await pilot.press("enter")
        await pilot.pause()
    assert naive.read_bytes() == before
    text = target.read_text(encoding="utf-8")
    assert "# " in text and "First bench inverter, 24 V" in text
    assert "timing.dead_time" in text and "800 ns" in text and "propos" in text.lower()
    # the report is of the file as filed; the what-if section says what the proposals change
    assert "| `timing.no-dead-time` | fail | pass |" in text
    assert "what-if" in text


async def test_small_terminal_without_colour(naive, monkeypatch):
    monkeypatch.setenv("NO_COLOR", "1")
    app = make(naive)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        await pilot.press("n", "c", "n")
        assert on_disk(naive).decisions
        glance = str(app.query_one("#glance").content)
        assert "hazard" in glance and "decided 1/" in glance
        # words, not only colour, in the list
        prompt = str(app.query_one("#findings").get_option_at_index(1).prompt)
        assert any(w in prompt for w in ("HAZARD", "RISK", "ADVICE", "OPEN"))
        await pilot.press("2")
        await pilot.pause()
        assert "gate cmd" in app.query_one("#timing-picture").text


async def test_caution_is_visible_beyond_elv(mains):
    app = make(mains)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(app, pilot)
        caution = app.query_one("#caution")
        assert caution.display and "BEYOND EXTRA-LOW VOLTAGE" in str(caution.content)
        assert caution.region.y < app.query_one("#findings").region.y


async def test_bad_design_shows_file_and_line(broken):
    line = broken.with_suffix(".line").read_text()
    app = make(broken)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(app, pilot)
        shown = str(app.query_one("#problems").content)
        assert f"{broken}:{line}" in shown and "switch.high.vds_rating" in shown
        assert not app.query_one("#body").display
        await pilot.press("w")  # nothing to change: said, not a crash
        await pilot.press("q")


async def test_design_change_on_disk_is_reviewed(broken):
    app = make(broken, poll=0.05)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(app, pilot)
        assert not app.walk.snapshot.ok
        text = broken.read_text(encoding="utf-8").replace('vds_rating = "100 nF"', 'vds_rating = "60 V"')
        broken.write_text(text, encoding="utf-8")
        st = broken.stat()
        os.utime(broken, (st.st_atime, st.st_mtime + 2))
        for _ in range(40):
            await pilot.pause(0.05)
            await app.workers.wait_for_complete()
            if app.walk.snapshot.ok:
                break
        assert app.walk.snapshot.ok and app.query_one("#body").display


async def test_help_lists_every_key_and_palette_every_action(naive):
    app = make(naive)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(app, pilot)
        await pilot.press("question_mark")
        await pilot.pause()
        shown = str(app.screen.query_one("#keys").content)
        for a in ACTIONS:
            assert a.help in shown
        await pilot.press("escape")
        await pilot.pause()
        titles = {c.title for c in app.get_system_commands(app.screen)}
        assert {a.title for a in ACTIONS} <= titles


async def test_palette_runs_an_action(naive):
    app = make(naive)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(app, pilot)
        cmd = next(c for c in app.get_system_commands(app.screen) if c.title == "Passed")
        await cmd.callback()
        await pilot.pause()
        assert app.walk.show_passed


@pytest.mark.parametrize("key", ["2", "3", "4", "1"])
async def test_tabs(naive, key):
    app = make(naive)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(app, pilot)
        await pilot.press(key)
        await pilot.pause()
        assert app.query_one("#tabs").active == {"1": "finding", "2": "timing", "3": "spectrum",
                                                 "4": "changes"}[key]
