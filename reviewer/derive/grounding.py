"""Grounding: ground bounce on a shared return against the logic's noise margin (§3.10)."""

from __future__ import annotations

from reviewer.physics import grounding
from reviewer.context import SIDES, Ctx, NeedsData, declare

QUANTITIES = declare(
    ("grounding.edge_time", "s", "Fastest current edge of the bridge (shortest rise or fall)"),
    ("grounding.bounce", "V", "Ground bounce on the shared return, L_common · di/dt"),
    ("grounding.common_inductance_max", "H", "Largest shared ground inductance within the noise margin"),
)


def _edge(ctx: Ctx) -> float:
    # The current itself changes in the turn-off tail (plateau to threshold); without it, the
    # drain-voltage transitions bound the edge from above.
    times = [ctx.q(f"switching.{s}.tail") for s in SIDES if ctx.has(f"switching.{s}.tail")]
    times = times or [ctx.q(f"switching.{s}.{k}") for s in SIDES for k in ("rise_time", "fall_time")
                      if ctx.has(f"switching.{s}.{k}")]
    if not times:
        raise NeedsData("switch.high.qgd", "switch.low.qgd")
    return min(times)


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
