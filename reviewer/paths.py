"""Where the bundled data lives: inside the wheel (``reviewer/_data``) or beside a checkout."""

from __future__ import annotations

from pathlib import Path

_PACKAGE = Path(__file__).resolve().parent


def data_dir(name: str) -> Path:
    """The folder of bundled ``rules`` or ``example_designs``, installed or from a checkout."""
    installed = _PACKAGE / "_data" / name
    if installed.is_dir():
        return installed
    return _PACKAGE.parent / name


def builtin_rules_dir() -> Path:
    return data_dir("rules")


def examples_dir() -> Path:
    return data_dir("example_designs")
