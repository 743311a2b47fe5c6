"""Decisions that cannot be made by accident: the dialogs preselect nothing, an answer the
design file contradicts is flagged at once, and accepting a hazard asks who accepts it.

The naive bench example's own file says ``timing.enforced_in = "none"`` and
``drive.shared_signal = true``: a "yes" to "is the dead time enforced in hardware" contradicts
it (the design file is the check value here)."""

from __future__ import annotations

from reviewer import record as rec
from reviewer.report import markdown, text
from reviewer.report.conflicts import conflicts
from reviewer.tui.app import WalkApp
from reviewer.tui.dialogs import ChoiceDialog
from reviewer.tui.session import Walk

QUESTION = "checklist.dead-time-enforced"


def make(path) -> WalkApp:
    return WalkApp(Walk.open(path, reviewer="tester"), poll=0)


async def settle(app, pilot) -> None:
    await app.workers.wait_for_complete()
    await pilot.pause()


async def select(app, pilot, key: str) -> None:
    app.query_one("#findings").go(key)
    await pilot.pause()
    assert app.selected == key


async def test_two_enters_record_no_answer(naive):
    app = make(naive)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await select(app, pilot, QUESTION)
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ChoiceDialog)
        assert app.screen.value is None  # nothing preselected
        await pilot.press("enter", "enter")
        await pilot.pause()
        await pilot.press("tab", "enter")
        await pilot.pause()
        assert isinstance(app.screen, ChoiceDialog)  # still open: refused in place
        assert "nothing chosen" in str(app.screen.query_one("#error").content)
    assert not rec.record_path(naive).exists() or QUESTION not in rec.load(
        rec.record_path(naive)).answers


async def test_two_enters_record_no_decision(naive):
    app = make(naive)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await pilot.press("n")
        key = app.selected
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, ChoiceDialog) and app.screen.value is None
        await pilot.press("enter", "enter")
        await pilot.pause()
    assert not rec.record_path(naive).exists() or key not in rec.load(
        rec.record_path(naive)).decisions


async def test_a_single_click_does_not_open_the_dialog(naive):
    app = make(naive)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        before = app.selected
        await pilot.click("#findings", offset=(5, 4))
        await pilot.pause()
        assert not isinstance(app.screen, ChoiceDialog)
        assert app.selected is not None and app.selected != "" and before is not None


async def test_contradicting_answer_is_flagged_at_once_and_everywhere(naive):
    app = make(naive)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await select(app, pilot, QUESTION)
        await pilot.press("enter")
        await pilot.pause()
        await pilot.press("y")
        await pilot.pause()
        warning = str(app.screen.query_one("#warning").content)
        assert "timing.enforced_in" in warning and "contradicts" in warning  # before saving
        await pilot.press("enter")
        await settle(app, pilot)
        walk = app.walk
        item = walk.item(QUESTION)
        assert item is not None, "a contradicted answer stays in the list"
        assert walk.needs_decision(item)
        assert "CONTRADICTS" in app.query_one("#detail").text
        assert walk.tally()["conflicts"] >= 1
    review = walk.review
    assert {c.field for c in conflicts(review)} >= {"timing.enforced_in"}
    md = markdown.render([review])
    assert "contradict" in md and "`timing.enforced_in`" in md
    assert "contradict" in text.render([review], color=False)


def test_no_conflict_where_the_design_agrees():
    from reviewer.review import review_file
    from tests.conftest import example

    r = review_file(example("careful_12v_sine"), use_record=False)  # enforced_in = "hardware"
    from reviewer.report.conflicts import answer_conflicts

    assert answer_conflicts(r.sheet, QUESTION, "yes") == []
    assert answer_conflicts(r.sheet, QUESTION, "no") == []


def test_accepting_a_hazard_shows_who_in_the_reports(naive):
    walk = Walk.open(naive, reviewer="tester")
    walk.install(walk.refresh())
    hazard = next(i for i in walk.items() if i.outcome == "fail"
                  and i.finding.severity == "hazard")
    walk.decide(hazard.key, "accepted", "bench supply limited to 1 A", "A. Lead, design owner")
    walk.install(walk.refresh())
    md = markdown.render([walk.review])
    assert "accepted by A. Lead, design owner" in md
    assert "accepted by A. Lead, design owner" in text.render([walk.review], color=False)


def test_walkthrough_export_and_check_o_write_the_same_markdown(naive, tmp_path, capsys):
    """One writer: the same record gives the same Markdown (and the same pictures) from the
    walkthrough's export and from ``reviewer check --format markdown -o``."""
    from reviewer.cli import main

    walk = Walk.open(naive, reviewer="tester")
    walk.install(walk.refresh())
    key = walk.next_undecided(None)
    walk.decide(key, "will_change", "")
    walk.answer("checklist.gate-loop", "yes", "checked on the layout draft")
    walk.install(walk.refresh())
    a = tmp_path / "a" / "review.md"
    b = tmp_path / "b" / "review.md"
    walk.export(a)
    b.parent.mkdir()
    assert main(["check", str(naive), "--format", "markdown", "-o", str(b)]) == 0
    # the review date is today's in both; the design path is the same file
    assert a.read_text(encoding="utf-8") == b.read_text(encoding="utf-8")
    assert sorted(p.name for p in a.parent.iterdir()) == sorted(p.name for p in b.parent.iterdir())
    assert "](review.timing.svg)" in a.read_text(encoding="utf-8")


def test_default_export_is_a_reviews_folder_never_a_packaged_example(naive):
    from pathlib import Path

    from reviewer.paths import examples_dir

    assert Walk.open(naive).default_export() == naive.parent / "reviews" / "bench.review.md"
    packaged = Walk.open(examples_dir() / "naive_bench_pchannel.toml").default_export()
    assert examples_dir().resolve() not in packaged.resolve().parents
    assert packaged.parent.name == "reviews" and packaged.parent.parent == Path.cwd()


async def test_export_refused_early_when_the_design_does_not_load(broken):
    app = make(broken)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await pilot.press("e")
        await pilot.pause()
        from reviewer.tui.dialogs import PathDialog

        assert not isinstance(app.screen, PathDialog)


async def test_every_entry_distinguishable_at_80_by_24(naive, mains):
    for path in (naive, mains):
        app = make(path)
        async with app.run_test(size=(80, 24)) as pilot:
            await settle(app, pilot)
            app.walk.show_passed = True  # the longest list
            app.show_all()
            await pilot.pause()
            ol = app.query_one("#findings")
            shown = [ol.get_option_at_index(i).prompt.plain for i in range(ol.option_count)
                     if not ol.get_option_at_index(i).disabled]
            assert len(shown) == len(set(shown)), [s for s in shown if shown.count(s) > 1]
            width = ol.scrollable_content_region.width
            assert all(len(line) <= width for s in shown for line in s.splitlines())


async def test_whatif_unknown_field_gets_a_suggestion(naive):
    app = make(naive)
    async with app.run_test(size=(100, 32)) as pilot:
        await settle(app, pilot)
        await pilot.press("w")
        await pilot.pause()
        d = app.screen
        d.query_one("#field").value = "timing.dead_tim"
        d.query_one("#value").value = "800 ns"
        d.query_one("#why").focus()
        await pilot.press("enter")
        await pilot.pause()
        assert "did you mean" in str(d.query_one("#error").content)
