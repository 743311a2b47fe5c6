"""Helpers for the record and export tests: a small design and house rules copied to a tmp dir."""

from __future__ import annotations

from pathlib import Path

DATA = Path(__file__).resolve().parents[1] / "data"
SMALL = DATA / "record_small.toml"
HOUSE = DATA / "record_house_rules.toml"


def write_design(folder: Path, name: str = "bridge.toml", **replace: tuple[str, str]) -> Path:
    """Copy the small design into ``folder``; each keyword is (old text, new text) to swap."""
    text = SMALL.read_text(encoding="utf-8")
    for old, new in replace.values():
        assert old in text, old
        text = text.replace(old, new, 1)
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path


def write_rules(folder: Path, rename: dict[str, str] | None = None) -> Path:
    """Copy the house rules into ``folder``, renaming rule ids as asked."""
    text = HOUSE.read_text(encoding="utf-8")
    for old, new in (rename or {}).items():
        text = text.replace(f'id = "{old}"', f'id = "{new}"')
    path = folder / "house.toml"
    path.write_text(text, encoding="utf-8")
    return path
