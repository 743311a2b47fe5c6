"""Atomic writes keep permissions as a plain open() would (POSIX umask semantics)."""

import os
import stat

import pytest

from reviewer.atomic import write_text


@pytest.mark.skipif(os.name != "posix", reason="POSIX permissions")
def test_new_file_follows_umask_and_existing_mode_is_kept(tmp_path):
    old = os.umask(0o022)
    try:
        p = tmp_path / "r.md"
        write_text(p, "a")
        assert stat.S_IMODE(p.stat().st_mode) == 0o644
        os.chmod(p, 0o600)
        write_text(p, "b")
        assert stat.S_IMODE(p.stat().st_mode) == 0o600 and p.read_text() == "b"
    finally:
        os.umask(old)
