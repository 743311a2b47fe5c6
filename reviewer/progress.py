"""A progress bar for long work (a batch of designs, many yield samples): on standard error,
drawn only when standard error is a terminal, silent when piped and in CI."""

from __future__ import annotations

import os
import sys
from contextlib import contextmanager
from typing import Callable, Iterator

MIN_STEPS = 20
"""Fewer steps than this draw no bar: they end before a bar would help."""


def wanted(total: int) -> bool:
    return (total >= MIN_STEPS and sys.stderr.isatty() and not os.environ.get("CI"))


@contextmanager
def progress(description: str, total: int) -> Iterator[Callable[[], None]]:
    """Yield a function to call once per step; draws a rich bar only on a terminal."""
    if not wanted(total):
        yield lambda: None
        return
    from rich.console import Console
    from rich.progress import BarColumn, MofNCompleteColumn, Progress, TextColumn, \
        TimeRemainingColumn

    with Progress(TextColumn("{task.description}"), BarColumn(), MofNCompleteColumn(),
                  TimeRemainingColumn(), console=Console(stderr=True), transient=True) as bar:
        task = bar.add_task(description, total=total)
        yield lambda: bar.advance(task)
