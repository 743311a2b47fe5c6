"""Shared test helpers: example paths, reviewing a design text, asserting exactly which rules fire."""

from __future__ import annotations

import os
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]
EXAMPLES = ROOT / "example_designs"

os.environ.pop("NO_COLOR", None)


def example(name: str) -> Path:
    return EXAMPLES / f"{name}.toml"


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
