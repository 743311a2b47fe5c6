"""Voltage stress on each switch: drain-source peak and gate-source voltage both ways."""

from __future__ import annotations

from reviewer.physics import stress
from reviewer.quantities import SIDES, Ctx, declare

QUANTITIES = declare(
    ("stress.{side}.overshoot", "V", "Drain-source overshoot at turn-off, L_loop · di/dt"),
    ("stress.{side}.vds_peak", "V", "Peak drain-source voltage: highest bus plus overshoot"),
    ("stress.{side}.vgs_on", "V", "Gate-source voltage when on, at the highest bus (enhancement direction)"),
    ("stress.{side}.vgs_off", "V", "Gate-source voltage when off, at the highest bus (enhancement direction)"),
    ("stress.{side}.vgs_peak", "V", "Largest gate-source voltage magnitude, after any zener clamp"),
)


def _level(ctx: Ctx, path: str, v_bus: float) -> float:
    level = ctx.v(path)
    return v_bus if level == "bus" else level


def derive(ctx: Ctx) -> None:
    v_max = ctx.q("op.bus_max")
    for side in SIDES:
        sw, dr = f"switch.{side}", f"drive.{side}"
        polarity = ctx.v(f"{sw}.polarity")
        frm = ctx.v(f"{dr}.levels_from")
        zener = ctx.v(f"{dr}.zener")
        on = stress.gate_source(_level(ctx, f"{dr}.on_level", v_max), frm, side, polarity, True, v_max)
        off = stress.gate_source(_level(ctx, f"{dr}.off_level", v_max), frm, side, polarity, False, v_max)
        on, off = stress.clamp(on, zener), stress.clamp(off, zener)
        ctx.publish(f"stress.{side}.vgs_on", on)
        ctx.publish(f"stress.{side}.vgs_off", off)
        ctx.publish(f"stress.{side}.vgs_peak", max(abs(on), abs(off)))

        loop = ctx.v("grounding.loop_inductance")
        fall = f"switching.{side}.fall_time"
        if loop is not None and ctx.has(fall) and ctx.has("op.load_current_peak"):
            dv = stress.overshoot(loop, ctx.q("op.load_current_peak"), ctx.q(fall))
            ctx.publish(f"stress.{side}.overshoot", dv)
            ctx.publish(f"stress.{side}.vds_peak", v_max + dv)
        else:
            ctx.publish(f"stress.{side}.vds_peak", v_max,
                        "no overshoot estimate: give grounding.loop_inductance (and the "
                        "switching times must be computable)")
