"""Shared test helpers: example paths, reviewing a design text, asserting exactly which rules fire."""

from __future__ import annotations

import os
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
BUNDLED_EXAMPLES = ROOT / "example_designs"
"""The bundled examples in the checkout: read only by :func:`_pristine_examples`, so that a
record or an export a user left beside them (after a walkthrough) never reaches a test."""


def _pristine_examples() -> Path:
    """A copy of the bundled example designs (designs and house rules only, never a review
    record or an export) in a temporary folder of its own, removed when the tests end."""
    import atexit
    import shutil
    import tempfile

    top = Path(tempfile.mkdtemp(prefix="reviewer-tests-"))
    atexit.register(shutil.rmtree, top, ignore_errors=True)
    dest = top / "example_designs"

    def keep(folder: str, names: list[str]) -> list[str]:
        return [n for n in names if (Path(folder) / n).is_file()
                and (".review." in n or not n.endswith(".toml"))]

    shutil.copytree(BUNDLED_EXAMPLES, dest, ignore=keep)
    return dest


EXAMPLES = _pristine_examples()
"""The example designs the tests use: a pristine copy (see :func:`_pristine_examples`)."""

os.environ.pop("NO_COLOR", None)
# The tests never see the user's own house rules or data folder.
_HOME = EXAMPLES.parent / "home"
os.environ["XDG_CONFIG_HOME"] = str(_HOME / "config")
os.environ["XDG_DATA_HOME"] = str(_HOME / "data")


def example(name: str) -> Path:
    """The example design ``name`` (without ``.toml``) in the pristine copy."""
    return EXAMPLES / f"{name}.toml"


def designs_in(folder: Path) -> list[Path]:
    """The design files of a folder: ``*.toml`` without review records."""
    return sorted(p for p in folder.glob("*.toml") if ".review." not in p.name)


def review_text(text: str, name: str = "<test>"):
    """Review a design given as TOML text with the built-in rules."""
    from reviewer.design import parse_design
    from reviewer.review import review_design
    from reviewer.rulebook import load_rulebook

    return review_design(parse_design(text, name), name, load_rulebook())


def describe(review) -> str:
    lines = []
    for f in review.findings:
        lines.append(f"  {f.outcome:<14} {f.severity:<7} {f.key}  value={f.value} "
                     f"limit={f.limit} needs={list(f.needs)}")
    return "\n".join(lines)


def assert_fails(review, expected: set[str], area: str | None = None) -> None:
    """Assert exactly which finding keys fail (optionally within one area); print all otherwise."""
    got = {f.key for f in review.findings if f.outcome == "fail" and (area is None or f.area == area)}
    if got != set(expected):
        pytest.fail(
            f"failing findings differ{' in area ' + area if area else ''}:\n"
            f"  missing:    {sorted(set(expected) - got)}\n"
            f"  unexpected: {sorted(got - set(expected))}\n"
            f"all findings:\n{describe(review)}"
        )


def finding(review, key: str):
    for f in review.findings:
        if f.key == key:
            return f
    pytest.fail(f"no finding {key!r}; findings:\n{describe(review)}")


@pytest.fixture(scope="session")
def book():
    from reviewer.rulebook import load_rulebook

    return load_rulebook()
