"""Median time to review each example design, and the command-line start-up time.

Run: .venv/bin/python benchmarks/review_bench.py [repeats]
"""

from __future__ import annotations

import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))


def main() -> None:
    repeats = int(sys.argv[1]) if len(sys.argv) > 1 else 20
    from reviewer.review import review_file
    from reviewer.rulebook import load_rulebook

    t = time.perf_counter()
    book = load_rulebook()
    print(f"load built-in rules: {(time.perf_counter() - t) * 1e3:.1f} ms ({len(book.compiled)} rule-subjects)")
    for path in sorted((ROOT / "example_designs").glob("*.toml")):
        times = []
        for _ in range(repeats):
            t = time.perf_counter()
            r = review_file(path, book=book)
            times.append(time.perf_counter() - t)
        print(f"review {path.stem:<32} median {statistics.median(times) * 1e3:7.1f} ms "
              f"({r.sheet.run_count} corner runs, {len(r.findings)} findings)")
    cmd = [sys.executable, "-m", "reviewer.cli", "check", str(ROOT / "example_designs" / "careful_12v_sine.toml")]
    starts = []
    for _ in range(5):
        t = time.perf_counter()
        subprocess.run(cmd, capture_output=True, check=True)
        starts.append(time.perf_counter() - t)
    print(f"reviewer check (whole process) median {statistics.median(starts) * 1e3:.0f} ms")


if __name__ == "__main__":
    main()
