"""The walkthrough writes the deck for the focused finding (key ``s``): the file on disk is the
deck of that finding's corner, as ``reviewer deck --corner KEY`` writes it."""

from __future__ import annotations

import shutil

from reviewer.deck import build_deck
from reviewer.review import review_file
from reviewer.tui.app import WalkApp
from reviewer.tui.session import Walk
from tests.conftest import example


async def test_s_writes_the_deck_of_the_focused_finding(tmp_path):
    design = tmp_path / "bench.toml"
    shutil.copy(example("naive_bench_pchannel"), design)
    app = WalkApp(Walk.open(design, reviewer="tester"), poll=0)
    target = tmp_path / "focused.cir"
    async with app.run_test(size=(120, 40)) as pilot:
        await app.workers.wait_for_complete()
        await pilot.pause()
        key = "timing.shoot-through[high]"
        app.selected = key
        app.show_selected()
        await pilot.press("s")
        await pilot.pause()
        app.screen.query_one("#path").value = str(target)
        await pilot.press("enter")
        await pilot.pause()
    text = target.read_text(encoding="ascii")
    review = review_file(design)
    want = build_deck(review, review.finding(key)).text
    assert text == want
    assert f"finding {key}" in " ".join(ln.lstrip("* ") for ln in text.splitlines()[:4])
