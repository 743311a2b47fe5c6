"""The what-if dialog as a user drives it: focus on the field, Enter to "why", the value and the
hint following the field, and a result that says what changed. Check values are the naive
example's own fields (``timing.dead_time = "0 ns"``, one shared drive signal)."""

from __future__ import annotations

from reviewer.tui.app import WalkApp
from reviewer.tui.dialogs import WhatIfDialog
from reviewer.tui.session import Walk


async def settle(app, pilot) -> None:
    await app.workers.wait_for_complete()
    await pilot.pause()


async def test_value_and_hint_follow_the_field(naive):
    app = WalkApp(Walk.open(naive, reviewer="tester"), poll=0)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await pilot.press("w")
        await pilot.pause()
        d = app.screen
        assert isinstance(d, WhatIfDialog) and d.focused.id == "field"
        d.query_one("#field").value = "drive.shared_signal"
        await pilot.pause()
        assert d.query_one("#value").value == "true"
        assert "now true" in str(d.query_one("#field-hint").content)
        d.query_one("#field").value = "timing.dead_time"
        await pilot.pause()
        assert d.query_one("#value").value == "0 s"  # followed; not the old field's "true"
        assert "now 0 s" in str(d.query_one("#field-hint").content)
        d.query_one("#value").value = "2 µs"  # typed by hand: kept when the field changes
        d.query_one("#field").value = "timing.dead_tim"
        await pilot.pause()
        assert d.query_one("#value").value == "2 µs"


async def test_result_says_when_the_change_has_no_effect(naive):
    app = WalkApp(Walk.open(naive, reviewer="tester"), poll=0)
    key = "timing.shoot-through[high]"
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        app.query_one("#findings").go(key)
        await pilot.pause()
        await pilot.press("w")
        await pilot.pause()
        d = app.screen
        d.query_one("#field").value = "timing.dead_time"
        d.query_one("#value").value = "800 ns"
        d.query_one("#value").focus()
        await pilot.press("enter", "enter")
        await settle(app, pilot)
        result = app.last_whatif
        # one signal feeds both switches: the dead time field changes nothing at this edge
        f = app.walk.review.finding(key)
        if f is not None and f.outcome == "fail" and f.value == app.walk.snapshot.filed.finding(key).value:
            assert "timing.shoot-through [high]: still fails — the change has no effect" in result
        assert result.startswith("timing.dead_time = 800 ns:")
        assert "What-if" not in result and result in app.query_one("#changes-detail").text
