"""Files the tool writes are written atomically: a temporary file, fsync, then rename."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path


def _mode_for(p: Path) -> int:
    """Keep an existing file's permissions; a new file gets what the umask allows (as open does)."""
    try:
        return p.stat().st_mode & 0o7777
    except OSError:
        umask = os.umask(0)
        os.umask(umask)
        return 0o666 & ~umask


def write_text(path: str | Path, text: str) -> None:
    """Replace ``path`` with ``text`` so that a reader sees the old file or the new, never half."""
    p = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=p.parent or ".")
    try:
        os.chmod(tmp, _mode_for(p))
        with os.fdopen(fd, "w", encoding="utf-8", newline="") as fh:
            fh.write(text)
            fh.flush()
            os.fsync(fh.fileno())
        os.replace(tmp, p)
    except BaseException:
        try:
            os.unlink(tmp)
        except OSError:
            pass
        raise
    try:  # make the rename itself durable where the platform allows
        dfd = os.open(p.parent or ".", os.O_RDONLY)
        try:
            os.fsync(dfd)
        finally:
            os.close(dfd)
    except OSError:
        pass
