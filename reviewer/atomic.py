"""Files the tool writes are written atomically: a temporary file, fsync, then rename."""

from __future__ import annotations

import os
import tempfile
from pathlib import Path


def write_text(path: str | Path, text: str) -> None:
    """Replace ``path`` with ``text`` so that a reader sees the old file or the new, never half."""
    p = Path(path)
    fd, tmp = tempfile.mkstemp(prefix=f".{p.name}.", suffix=".tmp", dir=p.parent or ".")
    try:
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
