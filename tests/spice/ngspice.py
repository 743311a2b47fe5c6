"""Running ngspice in batch mode on a deck and reading its raw file, for the cross-check tests.

ngspice is an outside reference here: the tool never needs it. Tests that use it are marked with
:data:`needs_ngspice` and skip, saying why, where it is not installed (``.ci/run`` installs it).
"""

from __future__ import annotations

import os
import shutil
import subprocess
from dataclasses import dataclass
from pathlib import Path

import numpy as np
import pytest

NGSPICE = shutil.which("ngspice")
REQUIRED = bool(os.environ.get("REVIEWER_REQUIRE_NGSPICE"))
"""Set by ``.ci/run``: there a missing ngspice fails these tests instead of skipping them."""

needs_ngspice = pytest.mark.skipif(
    NGSPICE is None and not REQUIRED,
    reason="ngspice is not installed: these tests cross-check the review against it "
           "(Debian: apt-get install ngspice; .ci/run installs it so CI runs them)")


@dataclass
class Plot:
    """One analysis in a raw file: its name and every vector by lower-case name."""

    name: str
    vectors: dict[str, np.ndarray]

    def __getitem__(self, key: str) -> np.ndarray:
        return self.vectors[key.lower()]

    def v(self, node: str) -> np.ndarray:
        """The voltage of ``node`` from ground (ground itself is zero)."""
        if node == "0":
            return np.zeros_like(np.real(next(iter(self.vectors.values()))))
        return self.vectors[f"v({node.lower()})"]


def read_raw(path: Path) -> list[Plot]:
    """Every plot of an ngspice binary raw file (real and complex, several analyses)."""
    data = path.read_bytes()
    plots: list[Plot] = []
    pos = 0
    while pos < len(data):
        head_end = data.index(b"Binary:\n", pos)
        header = data[pos:head_end].decode("ascii", "replace").splitlines()
        pos = head_end + len(b"Binary:\n")
        fields: dict[str, str] = {}
        names: list[str] = []
        in_vars = False
        for line in header:
            if in_vars and line.startswith(("\t", " ")):
                parts = line.split()
                names.append(parts[1].lower())
                continue
            in_vars = False
            key, _, value = line.partition(":")
            fields[key.strip().lower()] = value.strip()
            if key.strip().lower() == "variables":
                in_vars = True
        n_vars = int(fields["no. variables"])
        n_points = int(fields["no. points"])
        complex_ = "complex" in fields.get("flags", "")
        width = 2 if complex_ else 1
        count = n_vars * n_points * width
        arr = np.frombuffer(data, dtype="<f8", count=count, offset=pos)
        pos += count * 8
        arr = arr.reshape(n_points, n_vars * width)
        if complex_:
            arr = arr[:, 0::2] + 1j * arr[:, 1::2]
        plots.append(Plot(fields.get("plotname", ""), {n: arr[:, i].copy() for i, n in enumerate(names)}))
        while pos < len(data) and data[pos:pos + 1] in (b"\n", b"\r"):
            pos += 1
    return plots


def simulate(deck: str, folder: Path, name: str = "deck") -> list[Plot]:
    """Write ``deck`` to ``folder`` unchanged, run ``ngspice -b`` on it, return its plots."""
    assert NGSPICE is not None, "ngspice is required (REVIEWER_REQUIRE_NGSPICE is set) but not installed"
    cir = folder / f"{name}.cir"
    raw = folder / f"{name}.raw"
    cir.write_text(deck, encoding="ascii")
    done = subprocess.run([NGSPICE, "-b", "-r", str(raw), str(cir)], capture_output=True,
                          text=True, timeout=120, cwd=folder)
    log = done.stdout + done.stderr
    assert done.returncode == 0, f"ngspice failed ({done.returncode}):\n{log[-3000:]}"
    for bad in ("error", "singular", "timestep too small"):
        assert bad not in log.lower(), f"ngspice reported {bad!r}:\n{log[-3000:]}"
    return read_raw(raw)


def crossing(t: np.ndarray, y: np.ndarray, level: float, after: float, rising: bool) -> float:
    """The first time after ``after`` at which ``y`` crosses ``level`` in the given direction,
    by linear interpolation between the simulator's points [s]."""
    sel = np.flatnonzero(t >= after)
    tt, yy = t[sel], y[sel]
    d = yy - level if rising else level - yy
    idx = np.flatnonzero((d[:-1] < 0) & (d[1:] >= 0))
    if idx.size == 0:
        raise AssertionError(f"no {'rising' if rising else 'falling'} crossing of {level} V "
                             f"after {after} s")
    i = idx[0]
    return float(tt[i] + (tt[i + 1] - tt[i]) * (-d[i]) / (d[i + 1] - d[i]))
