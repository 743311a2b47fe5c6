"""The walk command on the command line, and the engine kept free of the interface."""

from __future__ import annotations

import subprocess
import sys

from reviewer.cli import main
from tests.conftest import ROOT


def test_missing_design_is_a_command_line_error(tmp_path, capsys):
    assert main(["walk", str(tmp_path / "absent.toml")]) == 2
    assert "no such design file" in capsys.readouterr().err


def test_engine_and_other_commands_do_not_load_textual():
    code = ("import sys, reviewer.cli, reviewer.review, reviewer.whatif, reviewer.report.markdown;"
            "from reviewer.cli import _parser; _parser();"
            "assert not [m for m in sys.modules if m.startswith(('textual', 'reviewer.tui'))]")
    subprocess.run([sys.executable, "-c", code], cwd=ROOT, check=True)


def test_engine_never_imports_the_interface():
    for path in (ROOT / "reviewer").rglob("*.py"):
        if "tui" in path.parts or path.name == "walk.py":
            continue
        assert "reviewer.tui" not in path.read_text(encoding="utf-8"), path


def test_quitting_says_where_the_record_is(naive, monkeypatch, capsys):
    import os

    from reviewer import record as rec
    from reviewer.tui.app import WalkApp

    seen = {}

    def run(self, *a, **k):  # the app itself is driven by the pilot tests
        seen["no_color"] = "NO_COLOR" in os.environ
        self.walk.install(self.walk.refresh())
        self.walk.decide(self.walk.next_undecided(None), "will_change")
        return 0

    monkeypatch.setattr(WalkApp, "run", run)
    monkeypatch.delenv("NO_COLOR", raising=False)
    assert main(["walk", str(naive), "--color", "never", "--reviewer", "ana"]) == 0
    assert seen["no_color"]
    assert f"Every decision and answer is in {rec.record_path(naive)}" in capsys.readouterr().err
    monkeypatch.delenv("NO_COLOR", raising=False)
