"""Snapshots of the main screens, looked at by eye before they were frozen.

Regenerate with ``pytest tests/tui/test_snapshots.py --snapshot-update`` only after looking at
the report of the differences. Paths are relative to the project root (or to a temporary folder
holding a copy named ``bench.toml``, for the screens that write a record) so that the screens
are the same on every machine. Each main screen is taken at 100×32 and 80×24, with colour and
under ``NO_COLOR`` (the monochrome style: hazard bold reverse, risk bold, advice plain, passed
dim).
"""

from __future__ import annotations

import shutil

import pytest

from tests.conftest import ROOT, example

pytest.importorskip("pytest_textual_snapshot")

SIZES = {"100x32": (100, 32), "80x24": (80, 24)}


def app_for(name: str):
    from reviewer.tui.app import WalkApp
    from reviewer.tui.session import Walk

    return WalkApp(Walk.open(name, reviewer="snapshot"), poll=0, theme="textual-dark")


async def reviewed(pilot) -> None:
    await pilot.app.workers.wait_for_complete()
    await pilot.pause()


@pytest.fixture(autouse=True)
def at_root(monkeypatch):
    monkeypatch.chdir(ROOT)
    monkeypatch.delenv("NO_COLOR", raising=False)


@pytest.fixture
def bench(tmp_path, monkeypatch) -> str:
    """The naive bench example copied to a temporary folder, as ``bench.toml`` there."""
    shutil.copy(example("naive_bench_pchannel"), tmp_path / "bench.toml")
    monkeypatch.chdir(tmp_path)
    return "bench.toml"


@pytest.fixture(params=["colour", "no-colour"])
def colour(request, monkeypatch) -> str:
    if request.param == "no-colour":
        monkeypatch.setenv("NO_COLOR", "1")
    return request.param


@pytest.mark.parametrize("size", SIZES)
def test_main_screen(snap_compare, size, colour):
    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"),
                        terminal_size=SIZES[size], run_before=reviewed)


def test_timing_picture_at_the_worst_corner(snap_compare):
    async def shoot_through(pilot) -> None:
        await reviewed(pilot)
        pilot.app.query_one("#findings").go("timing.shoot-through[high]")
        await pilot.press("2")
        await pilot.pause()

    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"),
                        terminal_size=(100, 32), run_before=shoot_through)


def test_spectrum_picture(snap_compare):
    assert snap_compare(app_for("example_designs/careful_12v_sine.toml"), press=["3"],
                        terminal_size=(100, 32), run_before=reviewed)


def test_caution_at_80_by_24(snap_compare):
    assert snap_compare(app_for("example_designs/mains_output_transformer.toml"),
                        terminal_size=(80, 24), run_before=reviewed)


def test_design_that_fails_to_load(snap_compare):
    assert snap_compare(app_for("tests/tui/data/wrong_unit.toml"), terminal_size=(80, 24),
                        run_before=reviewed)


def test_keys_screen(snap_compare):
    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"),
                        press=["question_mark"], terminal_size=(100, 32), run_before=reviewed)


@pytest.mark.parametrize("size", SIZES)
def test_answer_dialog_flags_a_contradiction(snap_compare, bench, size, colour):
    """The answer dialog with nothing preselected, then "y": the design file's
    ``enforced_in = "none"`` is flagged before anything is saved."""
    async def answer_yes(pilot) -> None:
        await reviewed(pilot)
        pilot.app.query_one("#findings").go("checklist.dead-time-enforced")
        await pilot.press("enter")
        await pilot.pause()
        await pilot.press("y")
        await pilot.pause()

    assert snap_compare(app_for(bench), terminal_size=SIZES[size], run_before=answer_yes)


def test_answer_dialog_preselects_nothing(snap_compare, bench):
    async def open_it(pilot) -> None:
        await reviewed(pilot)
        pilot.app.query_one("#findings").go("checklist.dead-time-enforced")
        await pilot.press("enter")
        await pilot.pause()

    assert snap_compare(app_for(bench), terminal_size=(100, 32), run_before=open_it)


def test_whatif_result(snap_compare, bench):
    async def try_dead_time(pilot) -> None:
        await reviewed(pilot)
        pilot.app.query_one("#findings").go("timing.shoot-through[high]")
        await pilot.press("w")
        await pilot.pause()
        d = pilot.app.screen
        d.query_one("#field").value = "timing.dead_time"
        d.query_one("#value").value = "800 ns"
        d.query_one("#value").focus()
        await pilot.press("enter", "enter")
        await reviewed(pilot)
        await pilot.press("4")
        await pilot.pause()
        pilot.app.clear_notifications()
        await pilot.pause()

    assert snap_compare(app_for(bench), terminal_size=(100, 32), run_before=try_dead_time)
