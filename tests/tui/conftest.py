"""Fixtures for the walkthrough tests: a copy of an example design in a temporary folder, so the
record file the walkthrough writes lands there."""

from __future__ import annotations

import shutil
from pathlib import Path

import pytest

from tests.conftest import example


@pytest.fixture
def naive(tmp_path: Path) -> Path:
    """The naive bench example (many failing checks, open questions), copied."""
    target = tmp_path / "bench.toml"
    shutil.copy(example("naive_bench_pchannel"), target)
    return target


@pytest.fixture
def mains(tmp_path: Path) -> Path:
    """The 230 V output example (beyond extra-low voltage), copied."""
    target = tmp_path / "mains.toml"
    shutil.copy(example("mains_output_transformer"), target)
    return target


@pytest.fixture
def broken(tmp_path: Path) -> Path:
    """A design whose switch rating has the wrong unit, on a known line."""
    text = example("careful_12v_sine").read_text(encoding="utf-8")
    lines = text.splitlines()
    i = next(n for n, line in enumerate(lines) if line.startswith("vds_rating"))
    lines[i] = 'vds_rating = "100 nF"'
    target = tmp_path / "broken.toml"
    target.write_text("\n".join(lines) + "\n", encoding="utf-8")
    target.with_suffix(".line").write_text(str(i + 1))
    return target
