"""A cache of compiled rulebooks, so that a command does not compile the rule files on every start.

The key is a SHA-256 over the package version, the Python version, the source of the modules
that compile rules (the rule-file format, the expression compiler, the design model) and, for
every rule file in order, its path, its kind (built-in, user, project, command line) and its
bytes, with the chosen profile. A changed rule file or a new version therefore misses the cache
and compiles afresh. The compiled book is kept with :mod:`pickle` in the per-user cache folder
(platformdirs: ``~/.cache/bridge-reviewer/rulebooks`` on Linux), written by this user's own
process (mode 0600, replaced atomically); a file is read only when this user owns it and nobody
else may write to it. A file that is corrupt, stale or unreadable is rebuilt silently, and a
cache folder that cannot be written leaves the rules compiled in memory: the cache only ever
saves time, it never changes a result.
"""

from __future__ import annotations

import hashlib
import os
import pickle
import stat
import sys
import tempfile
from pathlib import Path
from typing import Any, Callable

APP = "bridge-reviewer"
FORMAT = b"rulebook-cache/1"
_COMPILER = ("rulebook/loader.py", "rulebook/model.py", "expr.py", "design/model.py",
             "design/fields.py", "context.py", "units.py")
ENV = "BRIDGE_REVIEWER_CACHE"
"""Set to a folder to keep the cache there, or to "off" to compile every time."""


def cache_dir() -> Path | None:
    """The folder of cached rulebooks, or None when caching is off."""
    chosen = os.environ.get(ENV)
    if chosen == "off":
        return None
    if chosen:
        return Path(chosen)
    from platformdirs import user_cache_dir

    return Path(user_cache_dir(APP, appauthor=False)) / "rulebooks"


def version() -> str:
    from reviewer import __version__

    return __version__


def key(sources: list[Any], profile: str, names: tuple[str, ...] = ()) -> str | None:
    """The cache key of a rulebook built from ``sources``; None when a file cannot be read
    (the loader then reports it with its location)."""
    h = hashlib.sha256(FORMAT)
    h.update(f"{version()}|{sys.version_info[:3]}|{profile}".encode())
    root = Path(__file__).resolve().parents[1]
    for rel in _COMPILER:
        try:
            h.update((root / rel).read_bytes())
        except OSError:
            h.update(rel.encode())
    for n in names:  # the quantity catalogue: names and units a rule may read
        h.update(n.encode() + b"\0")
    for s in sources:
        try:
            data = Path(s.path).read_bytes()
        except OSError:
            return None
        h.update(f"\0{Path(s.path).resolve()}\0{s.kind}\0".encode())
        h.update(hashlib.sha256(data).digest())
    return h.hexdigest()


def _trusted(path: Path) -> bool:
    try:
        st = path.stat()
    except OSError:
        return False
    mine = not hasattr(os, "getuid") or st.st_uid == os.getuid()
    return mine and not st.st_mode & (stat.S_IWGRP | stat.S_IWOTH)


def load(k: str, folder: Path) -> Any | None:
    """The cached book under key ``k``, or None (absent, corrupt, stale or not trusted)."""
    path = folder / f"{k}.pickle"
    if not _trusted(path):
        return None
    try:
        with open(path, "rb") as fh:
            if fh.read(len(FORMAT)) != FORMAT:
                return None
            book = pickle.load(fh)
    except Exception:  # any damage to a cache file: rebuild, never fail a review on it
        return None
    from reviewer.rulebook.loader import Rulebook

    return book if isinstance(book, Rulebook) else None


def store(k: str, folder: Path, book: Any) -> bool:
    """Keep ``book`` under key ``k``; False (silently) when the folder cannot be written."""
    try:
        folder.mkdir(parents=True, exist_ok=True)
        fd, tmp = tempfile.mkstemp(dir=folder, prefix=".rulebook-", suffix=".tmp")
        try:
            with os.fdopen(fd, "wb") as fh:
                fh.write(FORMAT)
                pickle.dump(book, fh, protocol=pickle.HIGHEST_PROTOCOL)
            os.chmod(tmp, 0o600)
            os.replace(tmp, folder / f"{k}.pickle")
        except BaseException:
            try:
                os.unlink(tmp)
            except OSError:
                pass
            raise
    except (OSError, pickle.PicklingError, TypeError, AttributeError):
        return False
    return True


def cached(sources: list[Any], profile: str, build: Callable[[], Any]) -> Any:
    """The rulebook for ``sources`` from the cache, or ``build()`` kept for next time."""
    folder = cache_dir()
    if folder is None:
        return build()
    from reviewer.quantities import catalogue

    names = tuple(f"{n}:{d.unit}:{d.kind}" for n, d in sorted(catalogue().items()))
    k = key(sources, profile, names)
    if k is None:
        return build()
    book = load(k, folder)
    if book is not None:
        return book
    book = build()
    store(k, folder, book)
    return book
