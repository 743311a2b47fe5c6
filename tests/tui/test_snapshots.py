"""Snapshots of the main screens, looked at by eye before they were frozen.

Regenerate with ``pytest tests/tui/test_snapshots.py --snapshot-update`` only after looking at
the report of the differences. Paths are relative to the project root so that the screens are the
same on every machine.
"""

from __future__ import annotations

import pytest

from tests.conftest import ROOT

pytest.importorskip("pytest_textual_snapshot")


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


def test_main_screen(snap_compare):
    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"),
                        terminal_size=(110, 32), run_before=reviewed)


def test_timing_picture(snap_compare):
    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"), press=["2"],
                        terminal_size=(110, 32), run_before=reviewed)


def test_spectrum_picture(snap_compare):
    assert snap_compare(app_for("example_designs/careful_12v_sine.toml"), press=["3"],
                        terminal_size=(110, 32), run_before=reviewed)


def test_caution_at_80_by_24(snap_compare):
    assert snap_compare(app_for("example_designs/mains_output_transformer.toml"),
                        terminal_size=(80, 24), run_before=reviewed)


def test_design_that_fails_to_load(snap_compare):
    assert snap_compare(app_for("tests/tui/data/wrong_unit.toml"), terminal_size=(80, 24),
                        run_before=reviewed)


def test_keys_screen(snap_compare):
    assert snap_compare(app_for("example_designs/naive_bench_pchannel.toml"),
                        press=["question_mark"], terminal_size=(100, 32), run_before=reviewed)
