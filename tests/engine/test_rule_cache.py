"""The compiled-rulebook cache: a hit gives the same book; a changed rule file or package
version misses; a corrupt file is rebuilt silently; a read-only folder still works."""

from __future__ import annotations

import os
import stat
import sys

import pytest

from reviewer.rulebook import cache, load_rulebook

RULE = """
[[rule]]
id = "test.cache"
title = "Bus at most {limit}"
severity = "advice"
value = "op.bus_max"
at_most = "LIMIT"
why = "test"
"""


@pytest.fixture
def folder(tmp_path, monkeypatch):
    where = tmp_path / "cache"
    monkeypatch.setenv(cache.ENV, str(where))
    return where


def house(tmp_path, limit="14 V"):
    p = tmp_path / "house.toml"
    p.write_text(RULE.replace("LIMIT", limit).replace("{limit}", limit))
    return p


def limit_of(book):
    return next(c for c in book.compiled if c.rule.id == "test.cache").limit_const


def files(folder):
    return sorted(p.name for p in folder.glob("*.pickle")) if folder.exists() else []


def test_hit_gives_the_same_book(tmp_path, folder):
    rules = house(tmp_path)
    first = load_rulebook([rules])
    assert len(files(folder)) == 1
    again = load_rulebook([rules])
    assert [c.rule.id for c in again.compiled] == [c.rule.id for c in first.compiled]
    assert limit_of(again) == 14.0 and again.history == first.history


def test_changed_rule_file_misses(tmp_path, folder):
    rules = house(tmp_path)
    assert limit_of(load_rulebook([rules])) == 14.0
    house(tmp_path, "15 V")
    assert limit_of(load_rulebook([rules])) == 15.0
    assert len(files(folder)) == 2


def test_changed_version_misses(tmp_path, folder, monkeypatch):
    rules = house(tmp_path)
    load_rulebook([rules])
    monkeypatch.setattr(cache, "version", lambda: "999.0")
    load_rulebook([rules])
    assert len(files(folder)) == 2


def test_corrupt_file_is_rebuilt_silently(tmp_path, folder):
    rules = house(tmp_path)
    load_rulebook([rules])
    (path,) = folder.glob("*.pickle")
    path.write_bytes(b"rulebook-cache/1 this is not a pickle")
    assert limit_of(load_rulebook([rules])) == 14.0
    assert cache.load(path.stem, folder) is not None        # rewritten whole


def test_foreign_format_is_ignored(tmp_path, folder):
    rules = house(tmp_path)
    load_rulebook([rules])
    (path,) = folder.glob("*.pickle")
    path.write_bytes(b"\x80\x04N.")                         # a valid pickle of None, no header
    assert limit_of(load_rulebook([rules])) == 14.0


@pytest.mark.skipif(sys.platform == "win32" or os.geteuid() == 0,
                    reason="file modes do not bind the superuser")
def test_read_only_folder_still_works(tmp_path, folder):
    folder.mkdir()
    folder.chmod(stat.S_IRUSR | stat.S_IXUSR)
    try:
        assert limit_of(load_rulebook([house(tmp_path)])) == 14.0
        assert files(folder) == []
    finally:
        folder.chmod(stat.S_IRWXU)


def test_unwritable_folder_still_works(tmp_path, monkeypatch):
    # a "folder" that is a file: nothing can be written under it, whoever runs the test
    blocker = tmp_path / "blocker"
    blocker.write_text("")
    monkeypatch.setenv(cache.ENV, str(blocker / "cache"))
    assert limit_of(load_rulebook([house(tmp_path)])) == 14.0


def test_group_writable_file_is_not_trusted(tmp_path, folder):
    rules = house(tmp_path)
    load_rulebook([rules])
    (path,) = folder.glob("*.pickle")
    path.chmod(0o660)
    assert cache.load(path.stem, folder) is None
    assert limit_of(load_rulebook([rules])) == 14.0
