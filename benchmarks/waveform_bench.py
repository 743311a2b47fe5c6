"""Median cost of one bridge-spectrum synthesis and one pass through the output filter.

Run: .venv/bin/python benchmarks/waveform_bench.py
"""

from __future__ import annotations

import statistics
import sys
import time
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parents[1]))

from reviewer.physics import filter as flt  # noqa: E402
from reviewer.physics import waveform as wf  # noqa: E402

CASES = [
    ("square", {}),
    ("quasi_square", {"notch": 0.405}),
    ("spwm_bipolar", {"index": 0.9, "carrier": 20_000.0}),
    ("spwm_unipolar", {"index": 0.9, "carrier": 20_000.0}),
    ("spwm_unipolar", {"index": 0.9, "carrier": 19_700.0}),  # non-integer ratio: 3 periods
    ("spwm_level_shifted", {"index": 0.9, "carrier": 20_000.0}),
]


def main(repeat: int = 50) -> None:
    for kind, kw in CASES:
        synth, full = [], []
        for _ in range(repeat):
            t = time.perf_counter()
            s = wf.synthesise(kind, 12.0, 60.0, dead_time_high=300e-9, dead_time_low=300e-9,
                              current_lag=0.2, **kw)
            t1 = time.perf_counter()
            r = flt.respond(s.freq, s.amp, 470e-6, 10e-6, dcr=0.05, load_resistance=8.0,
                            load_inductance=5e-3)
            wf.thd_full(s)
            wf.thd_band(s.freq, r.v_out, 60.0)
            wf.largest_harmonics(s.freq, s.amp, 60.0)
            t2 = time.perf_counter()
            synth.append(t1 - t)
            full.append(t2 - t)
        print(f"{kind:20s} {str(kw):38s} samples {2 * len(s.freq):6d} periods {s.periods}  "
              f"synthesis median {statistics.median(synth) * 1e3:5.2f} ms, "
              f"with filter and figures {statistics.median(full) * 1e3:5.2f} ms")

if __name__ == "__main__":
    main()
