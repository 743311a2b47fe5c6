"""All review-speed figures side by side, in one run: medians and ratios.

Run from the project folder::

    .venv/bin/python benchmarks/run.py [--repeats 7] [--variants 40] [--samples 200]

It prints, each as a median over ``--repeats`` (wall clock, this machine):

1. the import floor: a fresh ``python -c "import <the libraries check uses>"``;
2. a whole ``reviewer check EXAMPLE --format json`` process, and its ratio to the floor
   (the compiled-rule cache warm, as after the first run);
3. loading the built-in rules in-process, from the cache and compiled afresh;
4. an in-process review of each bundled example (rules loaded once);
5. a batch of ``--variants`` toleranced variants of the careful example in one process, and the
   time that rate gives for 1,000;
6. ``--samples`` yield samples of the careful example, and the time that rate gives for 10,000.

Set ``PYTHONPATH`` to another checkout to measure it with the same script (figures a checkout
cannot produce are left out).
"""

from __future__ import annotations

import argparse
import os
import statistics
import subprocess
import sys
import tempfile
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
LIBRARIES = "numpy, pydantic, rich, quantiphy, simpleeval, platformdirs, tomli_w"
CAREFUL = ROOT / "example_designs" / "careful_12v_sine.toml"


def median_of(fn, repeats: int) -> float:
    times = []
    for _ in range(repeats):
        t = time.perf_counter()
        fn()
        times.append(time.perf_counter() - t)
    return statistics.median(times)


def process(args: list[str]) -> None:
    subprocess.run([sys.executable, *args], capture_output=True, check=True, cwd=ROOT,
                   env=os.environ.copy())


def row(label: str, seconds: float, note: str = "") -> None:
    print(f"  {label:<52} {seconds * 1e3:10.1f} ms  {note}")


def main() -> None:
    ap = argparse.ArgumentParser(description=__doc__.split("\n")[0])
    ap.add_argument("--repeats", type=int, default=7)
    ap.add_argument("--variants", type=int, default=40)
    ap.add_argument("--samples", type=int, default=200)
    a = ap.parse_args()
    import reviewer

    print(f"bridge-reviewer from {Path(reviewer.__file__).parent}; Python {sys.version.split()[0]}"
          f"; {os.cpu_count()} cores; medians of {a.repeats}")

    print("start-up")
    floor = median_of(lambda: process(["-c", f"import {LIBRARIES}"]), a.repeats)
    row(f"import floor (python -c 'import {LIBRARIES.split(',')[0]}, …')", floor)
    process(["-m", "reviewer.cli", "check", str(CAREFUL), "--format", "json"])  # warm the cache
    whole = median_of(lambda: process(["-m", "reviewer.cli", "check", str(CAREFUL), "--format",
                                       "json"]), a.repeats)
    row("reviewer check careful_12v_sine --format json", whole, f"{whole / floor:.2f} × floor")

    from reviewer.rulebook import load_rulebook

    book = load_rulebook()
    warm = median_of(load_rulebook, a.repeats)
    row("load built-in rules (cache as found)", warm, f"{len(book.compiled)} rule-subjects")
    try:
        from reviewer.rulebook import cache

        os.environ[cache.ENV] = "off"
        cold = median_of(load_rulebook, max(3, a.repeats // 2))
        row("load built-in rules (compiled afresh)", cold, f"{cold / warm:.1f} × cached")
        del os.environ[cache.ENV]
    except ImportError:
        pass

    print("in-process review (rules loaded once)")
    from reviewer.review import review_file

    for path in sorted((ROOT / "example_designs").glob("*.toml")):
        r = review_file(path, book=book)
        t = median_of(lambda: review_file(path, book=book), a.repeats)
        runner = getattr(r.sheet, "runner", None)
        runs = runner.made if runner is not None else r.sheet.run_count
        row(f"review {path.stem}", t, f"{runs} derive runs, {len(r.findings)} findings")

    print("batches")
    variants(a.variants, book)
    try:
        from reviewer.sampling import with_yield
    except ImportError:
        print("  (this checkout has no yield sampling)")
        return
    r = review_file(CAREFUL, book=book)
    t = time.perf_counter()
    with_yield(r, book, a.samples)
    t = time.perf_counter() - t
    row(f"{a.samples} yield samples of careful_12v_sine", t,
        f"→ {t / a.samples * 10000:.0f} s for 10,000 at this rate")


def variants(n: int, book) -> None:
    """``n`` copies of the careful example, each with its dead time and bus capacitance
    toleranced differently, reviewed in one process."""
    from reviewer.design import parse_design
    from reviewer.review import review_design

    text = CAREFUL.read_text(encoding="utf-8")
    designs = []
    for i in range(n):
        t = text.replace('dead_time = "500 ns ± 10%"',
                         f'dead_time = "{300 + 5 * i} ns ± {5 + i % 15}%"')
        t = t.replace('bulk = "4.7 mF"', f'bulk = "{4.7 + 0.01 * i:.2f} mF ± 20%"')
        designs.append(t)
    with tempfile.TemporaryDirectory():
        start = time.perf_counter()
        for i, t in enumerate(designs):
            review_design(parse_design(t, f"v{i}.toml"), f"v{i}.toml", book)
        took = time.perf_counter() - start
    row(f"{n} toleranced variants of careful_12v_sine", took,
        f"→ {took / n * 1000:.0f} s for 1,000 at this rate")


if __name__ == "__main__":
    main()
