"""The progress bar draws only on a terminal: silent when standard error is piped or in CI."""

from __future__ import annotations

import io

from reviewer import progress as pg


def test_silent_when_piped(capsys):
    with pg.progress("sampling", 500) as step:
        for _ in range(500):
            step()
    assert capsys.readouterr().err == ""


def test_wanted_only_on_a_terminal(monkeypatch):
    class Tty(io.StringIO):
        def isatty(self) -> bool:
            return True

    monkeypatch.delenv("CI", raising=False)
    monkeypatch.setattr(pg.sys, "stderr", Tty())
    assert pg.wanted(500) and not pg.wanted(3)
    monkeypatch.setenv("CI", "true")
    assert not pg.wanted(500)
    monkeypatch.setattr(pg.sys, "stderr", io.StringIO())
    monkeypatch.delenv("CI")
    assert not pg.wanted(500)
