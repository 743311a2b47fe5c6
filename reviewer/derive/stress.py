"""Voltage stress on each switch: drain-source peak and gate-source voltage both ways."""

from __future__ import annotations

from reviewer.physics import gate, grounding
from reviewer.context import SIDES, Ctx, declare

QUANTITIES = declare(
    ("stress.{side}.overshoot", "V", "Drain-source overshoot at turn-off, L_loop · di/dt"),
    ("stress.{side}.vds_peak", "V", "Peak drain-source voltage: highest bus plus overshoot"),
    ("stress.{side}.vgs_on", "V", "Gate-source voltage when on, at the highest bus (enhancement direction)"),
    ("stress.{side}.vgs_off", "V", "Gate-source voltage when off, at the highest bus (enhancement direction, the most reverse)"),
    ("stress.{side}.vgs_peak", "V", "Largest gate-source voltage magnitude, after any zener clamp"),
)


def gate_source_range(ctx: Ctx, side: str, which: str, v_bus: float) -> tuple[float, float]:
    """Signed V_GS range of ``side``'s gate at drive level ``which`` ("on_level"/"off_level").

    Levels given from the source are taken as enhancement-direction V_GS (V_SG for P-channel);
    levels given from ground are turned into V_GS from where the source sits. A gate-source
    zener, when fitted, clamps the result.
    """
    polarity = ctx.v(f"switch.{side}.polarity")
    dr = f"drive.{side}"
    level = ctx.v(f"{dr}.{which}")
    level = v_bus if level == "bus" else level
    if ctx.v(f"{dr}.levels_from") == "source":
        signed = level if polarity == "n" else -level
        lo = hi = signed
    else:
        lo, hi = gate.vgs_from_gate_node(level, polarity, side, v_bus, which == "on_level")
    zener = ctx.v(f"{dr}.zener")
    if zener is not None:
        lo, hi = (gate.zener_clamped_vgs(v, zener, polarity) for v in (lo, hi))
    return lo, hi


def derive(ctx: Ctx) -> None:
    v_max = ctx.q("op.bus_max")
    for side in SIDES:
        polarity = ctx.v(f"switch.{side}.polarity")
        on = gate_source_range(ctx, side, "on_level", v_max)
        off = gate_source_range(ctx, side, "off_level", v_max)
        enh_on = [gate.enhancement(v, polarity) for v in on]
        enh_off = [gate.enhancement(v, polarity) for v in off]
        ctx.publish(f"stress.{side}.vgs_on", min(enh_on))
        ctx.publish(f"stress.{side}.vgs_off", min(enh_off))
        ctx.publish(f"stress.{side}.vgs_peak", max(abs(v) for v in (*on, *off)))

        loop = ctx.v("grounding.loop_inductance")
        fall = f"switching.{side}.fall_time"
        if loop is not None and ctx.has(fall) and ctx.has("op.load_current_peak"):
            dv = grounding.switching_overshoot(loop, ctx.q("op.load_current_peak"), ctx.q(fall))
            ctx.publish(f"stress.{side}.overshoot", float(dv))
            ctx.publish(f"stress.{side}.vds_peak", v_max + float(dv))
        else:
            ctx.publish(f"stress.{side}.vds_peak", v_max,
                        "no overshoot estimate: give grounding.loop_inductance (and the "
                        "switching times must be computable)")
