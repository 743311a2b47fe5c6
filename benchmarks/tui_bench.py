"""Walkthrough timings: launch to first screen, to the review shown, and a what-if re-review.

Prints medians over several runs for each example design:
- launch: from spawning a fresh interpreter to the first screen being up (headless, the same
  code path as ``reviewer walk``), and the same from the interpreter's first line (imports and
  start-up of the interface only);
- review shown: from the app's start to the findings being on screen (the review runs in a
  worker while the first screen is already up);
- what-if: from storing a proposal to the updated findings being installed (the design as filed
  is reused from the cache; only the changed design is reviewed).

Run: .venv/bin/python benchmarks/tui_bench.py
"""

from __future__ import annotations

import asyncio
import statistics
import subprocess
import sys
import time
from pathlib import Path

ROOT = Path(__file__).resolve().parents[1]
sys.path.insert(0, str(ROOT))

LAUNCH = """
import time, asyncio
t0 = time.perf_counter()
from reviewer.tui.app import WalkApp
from reviewer.tui.session import Walk
class First(WalkApp):
    def on_mount(self):
        super().on_mount()
        self.first = time.perf_counter()
        self.first_wall = time.time()
async def main():
    app = First(Walk.open({path!r}, reviewer="bench"), poll=0)
    async with app.run_test(size=(100, 30)) as pilot:
        await pilot.pause()
        print(app.first_wall, app.first - t0)
        await app.workers.wait_for_complete()
asyncio.run(main())
"""

WHATIF = {"naive_bench_pchannel": ("timing.dead_time", "800 ns"),
          "careful_12v_sine": ("timing.dead_time", "800 ns"),
          "mains_output_transformer": ("output.v_rms", "48 V"),
          "nchannel_bootstrap_quasi": ("timing.dead_time", "800 ns")}


def launch(path: Path, runs: int) -> tuple[float, float]:
    walls, firsts = [], []
    for _ in range(runs):
        t = time.time()
        out = subprocess.run([sys.executable, "-c", LAUNCH.format(path=str(path))], cwd=ROOT,
                             capture_output=True, text=True, check=True)
        wall, first = out.stdout.strip().splitlines()[-1].split()
        walls.append(float(wall) - t)
        firsts.append(float(first))
    return statistics.median(walls), statistics.median(firsts)


async def in_app(path: Path, runs: int) -> tuple[float, float]:
    import shutil
    import tempfile

    from reviewer.tui.app import WalkApp
    from reviewer.tui.session import Walk

    shown, whatif = [], []
    field, value = WHATIF.get(path.stem, ("timing.dead_time", "800 ns"))
    for i in range(runs):
        with tempfile.TemporaryDirectory() as tmp:
            copy = Path(tmp) / path.name
            shutil.copy(path, copy)
            t = time.perf_counter()
            app = WalkApp(Walk.open(copy, reviewer="bench"), poll=0)
            async with app.run_test(size=(100, 30)) as pilot:
                await app.workers.wait_for_complete()
                await pilot.pause()
                shown.append(time.perf_counter() - t)
                t = time.perf_counter()
                app.walk.propose(field, f"{value}" if i % 2 == 0 else value.replace("800", "900"))
                app.review_again()
                await app.workers.wait_for_complete()
                whatif.append(time.perf_counter() - t)
    return statistics.median(shown), statistics.median(whatif)


def main() -> None:
    runs = 5
    print(f"{'design':<28}{'spawn→first screen':>20}{'(in-process)':>14}{'→review shown':>15}"
          f"{'what-if':>10}   [s, medians of {runs}]")
    for path in sorted((ROOT / "example_designs").glob("*.toml")):
        if path.name.endswith(".review.toml"):
            continue
        wall, first = launch(path, runs)
        shown, whatif = asyncio.run(in_app(path, runs))
        print(f"{path.stem:<28}{wall:>20.3f}{first:>14.3f}{shown:>15.3f}{whatif:>10.3f}")


if __name__ == "__main__":
    main()
