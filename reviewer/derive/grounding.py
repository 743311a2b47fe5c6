"""Grounding: ground bounce on a shared return against the logic's noise margin (§3.10)."""

from __future__ import annotations

import functools

import numpy as np

from reviewer.physics import grounding
from reviewer.physics.arrays import out
from reviewer.context import SIDES, Ctx, NeedsData, declare

QUANTITIES = declare(
    ("grounding.edge_time", "s", "Fastest current edge of the bridge (shortest current rise or fall, the same edges as the turn-off overshoot)"),
    ("grounding.bounce", "V", "Ground bounce on the shared return, L_common · di/dt"),
    ("grounding.common_inductance_max", "H", "Largest shared ground inductance within the noise margin"),
)

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""


def _edge(ctx: Ctx) -> float:
    # One definition of the current edge, shared with the turn-off overshoot: the current-rise
    # and current-fall intervals the switching module publishes (datasheet t_f, or the gate-charge
    # intervals bounded by the common-source inductance); the fastest of the bridge.
    times, needs = [], []
    for s in SIDES:
        for k in ("current_rise", "current_fall"):
            name = f"switching.{s}.{k}"
            if ctx.has(name):
                times.append(ctx.q(name))
            else:
                needs.extend(ctx.missing.get(name, ()))
    if needs or not times:
        raise NeedsData(*(needs or ("switch.high.qgd", "switch.low.qgd")))
    return out(functools.reduce(np.minimum, times))  # the fastest, per point


def derive(ctx: Ctx) -> None:
    with ctx.section("grounding.edge_time", "grounding.bounce", "grounding.common_inductance_max"):
        i_peak = ctx.q("op.load_current_peak")
        t = _edge(ctx)
        ctx.publish("grounding.edge_time", t)
        l_common = ctx.need("grounding.common_inductance")
        ctx.publish("grounding.bounce", grounding.ground_bounce(l_common, i_peak, t),
                    "the peak load current switched in the fastest edge")
        margin = ctx.need("grounding.logic_noise_margin")
        ctx.publish("grounding.common_inductance_max", grounding.max_inductance(margin, i_peak, t))
