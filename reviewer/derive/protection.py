"""Protection and wiring: fuse loading, breaking capacity, wire coordination (§3.8)."""

from __future__ import annotations

from reviewer.physics import protection
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("protection.has_fuse", "", "A fuse is fitted in the supply lead", "flag"),
    ("protection.fuse_loading", "", "Continuous input current over the fuse rating"),
    ("protection.fuse_limit", "", "Highest continuous loading the fuse's standard allows"),
    ("protection.fuse_min", "A", "Smallest fuse rating that carries the input current"),
    ("protection.prospective_current", "A", "Prospective short-circuit current of the source"),
    ("protection.wire_ampacity", "A", "Ampacity of the supply conductor (NEC Table 310.16)"),
    ("protection.wire_max_fuse", "A", "Largest fuse rating that protects the supply conductor"),
    ("protection.wire_needed", "", "Smallest conductor the fitted fuse protects", "text"),
    ("protection.wire_needed_area", "m²", "Cross-section of the smallest conductor the fuse protects"),
    ("protection.has_tvs", "", "A TVS clamps the bus", "flag"),
    ("protection.has_clamp", "", "A TVS or snubber limits bus overvoltage", "flag"),
    ("protection.has_battery_uvlo", "", "The battery is protected against deep discharge", "flag"),
)


def derive(ctx: Ctx) -> None:
    has_fuse = ctx.v("fuse.rating") is not None
    ctx.publish("protection.has_fuse", has_fuse)
    ctx.publish("protection.has_tvs", ctx.v("protection.tvs_standoff") is not None
                or ctx.v("protection.tvs_clamp") is not None)
    ctx.publish("protection.has_clamp",
                ctx.v("protection.tvs_standoff") is not None or bool(ctx.v("protection.snubber")))
    ctx.publish("protection.has_battery_uvlo", ctx.v("protection.battery_uvlo") is not None)

    standard = ctx.v("fuse.standard") if has_fuse else "other"
    ctx.publish("protection.fuse_limit", protection.fuse_loading_limit(standard),
                f"the limit for fuse standard '{standard}' (reviewer/tables/fuse_loading.toml)")
    with ctx.section("protection.fuse_min"):
        ctx.publish("protection.fuse_min",
                    protection.fuse_rating_min(ctx.q("op.input_current"), standard))
    with ctx.section("protection.fuse_loading"):
        rating = ctx.need("fuse.rating")
        ctx.publish("protection.fuse_loading",
                    protection.fuse_loading(ctx.q("op.input_current"), rating),
                    "the input current at the lowest bus, taken as continuous")

    with ctx.section("protection.prospective_current"):
        i_short = ctx.v("source.i_short")
        if i_short is not None:
            ctx.publish("protection.prospective_current", i_short, "as given")
        else:
            r = ctx.need("source.r_internal")
            ctx.publish("protection.prospective_current",
                        protection.prospective_short_circuit_current(ctx.q("op.bus_max"), r),
                        "highest bus over the internal resistance: a bolted fault at the terminals")

    temp = ctx.v("wiring.insulation_temp")
    with ctx.section("protection.wire_ampacity", "protection.wire_max_fuse"):
        area = ctx.need("wiring.size")
        amp = protection.wire_ampacity(area, temp)
        limit = protection.wire_max_protection(area, temp)
        note = "" if amp is not None else (
            "the conductor is below 14 AWG or its insulation below 60 °C: the table gives it no "
            "ampacity, taken as 0")
        ctx.publish("protection.wire_ampacity", amp or 0.0,
                    note or "30 °C ambient, up to three current-carrying conductors together")
        ctx.publish("protection.wire_max_fuse", limit or 0.0,
                    note or "its ampacity, and NEC 240.4(D) for 14–10 AWG")
    if has_fuse:
        found = protection.smallest_wire_for_fuse(ctx.v("fuse.rating"), temp)
        if found is not None:
            gauge, area = found
            mm2 = area * 1e6
            ctx.publish("protection.wire_needed", f"{gauge} AWG ({mm2:.3g} mm²)")
            ctx.publish("protection.wire_needed_area", area)
        else:
            ctx.publish("protection.wire_needed", "larger than 4/0 AWG: split the load or use a smaller fuse")
