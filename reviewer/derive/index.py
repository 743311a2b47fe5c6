"""The modulation index the target output needs at each end of the bus range.

Solved on the bridge pattern itself (dead time set by the current's direction, short pulses
dropped, over-modulation), through the filter's gain at the output frequency; see
:func:`reviewer.physics.waveform.indices_for_fundamental`. Array-safe: the yield samples and
corners of one review are solved side by side.
"""

from __future__ import annotations

import math
from typing import Any

import numpy as np

from reviewer.physics import waveform as wf
from reviewer.physics.arrays import is_array
from reviewer.context import Ctx, SplitPoints, declare
from reviewer.derive.waveform import SQUARE_KINDS, dead_times

QUANTITIES = declare(
    ("waveform.index_needed_bus_min", "", "Modulation index for the target output at the lowest bus"),
    ("waveform.index_needed_bus_max", "", "Modulation index for the target output at the highest bus"),
)

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""

UNREACHABLE = "the target cannot be reached even over-modulated"


_SOLVED: dict[tuple, tuple[float, float]] = {}
"""Indices solved so far, by their inputs: corners and pass-value re-reviews repeat them."""
_KEEP = 4096
"""Entries kept before the store is emptied (samples never come again)."""


def _indices(kind: str, f0: float, carrier: float, min_pulse: float, *columns: Any) -> Any:
    """Both indices for each point: ``columns`` are the target peak, the lowest and highest
    bus, the gain, the two dead times and the current lag (floats or arrays). Points with equal
    inputs are solved once, and a point solved before is not solved again."""
    cols = np.broadcast_arrays(*(np.atleast_1d(np.asarray(c, dtype=float)) for c in columns))
    rows, where = np.unique(np.stack(cols, axis=1), axis=0, return_inverse=True)
    keys = [(kind, f0, carrier, min_pulse, *r) for r in rows.tolist()]
    got = np.empty((len(keys), 2))
    todo = []
    for k, key in enumerate(keys):
        hit = _SOLVED.get(key)
        if hit is None:
            todo.append(k)
        else:
            got[k] = hit
    if todo:
        u = rows[todo]
        lo, hi = wf.indices_for_fundamental(u[:, 0], kind, (u[:, 1], u[:, 2]), f0,  # type: ignore[arg-type]
                                            carrier=carrier, gain=u[:, 3],
                                            dead_time_high=u[:, 4], dead_time_low=u[:, 5],
                                            current_lag=u[:, 6], min_pulse=min_pulse)
        if len(_SOLVED) + len(todo) > _KEEP:
            _SOLVED.clear()
        for j, k in enumerate(todo):
            got[k] = (lo[j], hi[j])
            _SOLVED[keys[k]] = (float(lo[j]), float(hi[j]))
    return got[where.reshape(-1)]


def derive(ctx: Ctx) -> None:
    kind = ctx.v("modulation.kind")
    target = ctx.v("output.v_rms")
    if kind in SQUARE_KINDS or target is None:
        return
    names = ("waveform.index_needed_bus_min", "waveform.index_needed_bus_max")
    with ctx.section(*names):
        f0 = ctx.need("output.frequency")
        carrier = ctx.q("waveform.carrier_used")
        dh, dl = dead_times(ctx)
        min_pulse = ctx.v("modulation.min_pulse")
        min_pulse = 0.0 if min_pulse is None else min_pulse
        want = math.sqrt(2) * target / ctx.q("op.transformer_ratio")
        buses = (ctx.q("op.bus_min"), ctx.q("op.bus_max"))
        columns = (want, *buses, ctx.q("waveform.output_gain"), dh, dl,
                   ctx.q("waveform.current_lag"))
        if is_array(carrier, min_pulse, f0):  # one window per call: group the points
            n = max(np.size(c) for c in (carrier, min_pulse, f0, *columns))
            keys = np.stack([np.broadcast_to(np.asarray(x, dtype=float), (n,))
                             for x in (carrier, min_pulse, f0)], axis=1)
            raise SplitPoints(np.unique(keys, axis=0, return_inverse=True)[1].reshape(-1))
        got = _indices(kind, float(f0), float(carrier), float(min_pulse), *columns)
        needed = (got[:, 0], got[:, 1]) if is_array(*columns) else (float(got[0, 0]),
                                                                      float(got[0, 1]))
        for name, m in zip(names, needed):
            if np.ndim(m) == 0:
                ctx.publish(name, m, "" if math.isfinite(m) else UNREACHABLE)
            else:
                ctx.publish(name, m, [UNREACHABLE if not math.isfinite(x) else ""
                                      for x in m.tolist()]
                            if not np.all(np.isfinite(m)) else "")
