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
6. ``--samples`` yield samples of the careful example, and the time that rate gives for 10,000;
7. a what-if re-review of each bundled example (one proposed field, as the walkthrough makes it:
   the design as filed already reviewed), and the walkthrough's launch to its first screen (a
   fresh interpreter, headless; ``--no-walk`` leaves it out).

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
    ap.add_argument("--no-walk", action="store_true", help="leave out the walkthrough launch")
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

    print("what-if re-review (one proposed field; the design as filed reviewed before)")
    whatif(book, a.repeats)
    if not a.no_walk:
        walk_launch(a.repeats)

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


WHATIF = {"naive_bench_pchannel": ("timing.dead_time", "800 ns"),
          "careful_12v_sine": ("timing.dead_time", "800 ns"),
          "mains_output_transformer": ("output.v_rms", "48 V"),
          "nchannel_bootstrap_quasi": ("timing.dead_time", "800 ns")}
"""The field each example's what-if proposes, and the value (as the walkthrough benchmark)."""


def whatif(book, repeats: int) -> None:
    """The walkthrough's what-if path in-process: the proposal applied to the file's text and
    the changed design reviewed, sharing the filed review's runs where the checkout can."""
    import inspect

    from reviewer.review import review_design, review_file
    from reviewer.whatif import apply_to_text

    shares = "like" in inspect.signature(review_design).parameters
    for path in sorted((ROOT / "example_designs").glob("*.toml")):
        field, value = WHATIF.get(path.stem, ("timing.dead_time", "800 ns"))
        text = path.read_text(encoding="utf-8")
        filed = review_file(path, book=book)
        kw = {"like": filed} if shares else {}

        tried = iter(range(1, 1000))

        def once() -> None:  # a new value each time (a value tried before would replay whole)
            number, unit = value.split(" ", 1)
            design = apply_to_text(text, str(path),
                                   {field: f"{float(number) * (1 + next(tried) / 100):g} {unit}"})
            review_design(design, str(path), book, **kw)

        row(f"what-if {path.stem} ({field} = {value})", median_of(once, repeats))


def walk_launch(repeats: int) -> None:
    """Spawn → the walkthrough's first screen for the careful example (benchmarks/tui_bench)."""
    try:
        sys.path.insert(0, str(ROOT / "benchmarks"))
        from tui_bench import launch
    except ImportError:
        return
    try:
        wall, first = launch(CAREFUL, repeats)
    except subprocess.CalledProcessError:
        print("  (the walkthrough could not be launched headless here)")
        return
    row("walkthrough launch → first screen (careful_12v_sine)", wall,
        f"{first * 1e3:.0f} ms of it from the interpreter's first line")


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
