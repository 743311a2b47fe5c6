"""Fuzzing every input: the harness runs the command line in-process and judges each outcome.

The bounded run (every ``pytest``) tries :data:`EXAMPLES` examples per property, derandomised so
that CI is reproducible. The long run is one command::

    REVIEWER_FUZZ_EXAMPLES=2000 .venv/bin/python -m pytest -q -m fuzz -p no:cacheprovider

(random seeds; a failing example is printed with the seed that reproduces it).
"""

from __future__ import annotations

import contextlib
import io
import json
import os
import re
import time
import traceback
from dataclasses import dataclass

import pytest
from hypothesis import HealthCheck, settings

EXAMPLES = int(os.environ.get("REVIEWER_FUZZ_EXAMPLES", "0") or 0)
LONG = EXAMPLES > 0
TIME_LIMIT = 10.0
"""No one command may take longer than this [s] on an idle machine (a review takes under 1 s).
On a busy one the limit is five times the time of a plain review measured in the same session
(:func:`time_limit`), so that the bound still catches a run away from the rest."""
_BASELINE: list[float] = []


def time_limit(factor: float = 5.0) -> float:
    """The time one run may take: ``factor`` times a plain review of the careful example on this
    machine (so a loaded machine does not fail it), and never less than TIME_LIMIT."""
    if not _BASELINE:
        from tests.conftest import example

        start = time.perf_counter()
        run("check", str(example("careful_12v_sine")), "--format", "json", "--no-house-rules")
        _BASELINE.append(time.perf_counter() - start)
    return max(TIME_LIMIT, factor * _BASELINE[0])

settings.register_profile(
    "fuzz", max_examples=EXAMPLES or 12, deadline=None, derandomize=not LONG,
    database=None, print_blob=True,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large,
                           HealthCheck.function_scoped_fixture, HealthCheck.filter_too_much])

LOCATED = re.compile(r"^error: .+?:\d+: ")
"""An error line that names its file and line: ``error: FILE:LINE: [field:] message``."""


@dataclass
class Outcome:
    code: int
    out: str
    err: str
    seconds: float
    args: list[str]

    def describe(self) -> str:
        return (f"reviewer {' '.join(self.args)} -> exit {self.code} in {self.seconds:.1f} s\n"
                f"--- stderr ---\n{self.err[-3000:]}\n--- stdout ---\n{self.out[:1000]}")


def run(*args: str) -> Outcome:
    """``reviewer ARGS`` in this process: exit status, outputs and time. A traceback fails."""
    from reviewer.cli import main

    out, err = io.StringIO(), io.StringIO()
    start = time.perf_counter()
    try:
        with contextlib.redirect_stdout(out), contextlib.redirect_stderr(err):
            code = main(list(args))
    except SystemExit as e:  # argparse
        code = int(e.code or 0)
    except BaseException:  # noqa: BLE001 - any escape is the bug this suite looks for
        pytest.fail(f"traceback from reviewer {' '.join(args)}:\n{traceback.format_exc()}")
    return Outcome(code, out.getvalue(), err.getvalue(), time.perf_counter() - start, list(args))


def judge(o: Outcome, located: bool = True, fmt: str | None = None, factor: float = 5.0) -> None:
    """A review (0 or 1) or a clear error (2, every line ``error: FILE:LINE: ...``), in time."""
    assert o.seconds < time_limit(factor), o.describe()
    assert o.code in (0, 1, 2), o.describe()
    if o.code == 2:
        lines = o.err.splitlines()
        assert lines, o.describe()
        for line in lines:
            assert line.startswith("error: "), o.describe()
            if located:
                assert LOCATED.match(line), "an error without a line:\n" + o.describe()
    elif fmt in ("json", "sarif"):
        json.loads(o.out)
