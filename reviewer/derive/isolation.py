"""Isolation from what a person can touch: the grade needed and the creepage and clearance for it
(§3.10, IEC 60664-1 and IEC 61140)."""

from __future__ import annotations

from reviewer.physics import spacing
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("isolation.required", "", "Insulation grade a touchable part needs from the power side", "text"),
    ("isolation.grade_ok", "", "The insulation provided is at least the grade needed", "flag"),
    ("isolation.working_voltage", "V", "Working voltage across the barrier, rms or DC"),
    ("isolation.system_voltage", "V", "Voltage of the hazardous circuit for the impulse category"),
    ("isolation.rated_impulse", "V", "Rated impulse voltage for the overvoltage category (Table F.1)"),
    ("isolation.clearance_needed", "m", "Clearance the barrier needs (IEC 60664-1 Table F.2)"),
    ("isolation.creepage_needed", "m", "Creepage the barrier needs (IEC 60664-1 Table F.4)"),
)


def derive(ctx: Ctx) -> None:
    beyond = bool(ctx.q("band.beyond_elv"))
    earthed_only = False  # a list of touchable parts never proves that all of them are earthed metal
    required = spacing.required_insulation(beyond, earthed=earthed_only)
    ctx.publish("isolation.required", required,
                "beyond extra-low voltage: double or reinforced insulation for unearthed parts"
                if beyond else "within extra-low voltage")
    ctx.publish("isolation.grade_ok",
                spacing.insulation_sufficient(ctx.v("isolation.insulation"), required))
    if not beyond:
        return

    given = ctx.v("isolation.working_voltage")
    out_rms, bus_max = ctx.q("op.output_rms"), ctx.q("op.bus_max")
    working = given if given is not None else max(out_rms, bus_max)
    ctx.publish("isolation.working_voltage", working,
                "as given" if given is not None else "the larger of the output rms and the highest bus")
    system = max(out_rms, bus_max)
    ctx.publish("isolation.system_voltage", system,
                "the output (or bus) voltage taken as the system voltage to earth for Table F.1")
    grade = "reinforced" if required == "reinforced" else "basic"
    with ctx.section("isolation.rated_impulse", "isolation.clearance_needed",
                     "isolation.creepage_needed"):
        category = ctx.v("isolation.overvoltage_category")
        pd = ctx.v("isolation.pollution_degree")
        ctx.publish("isolation.rated_impulse", spacing.rated_impulse_voltage(system, category))
        clearance = spacing.clearance_required(system, category, pd, grade,
                                               ctx.v("isolation.altitude") or 0.0)
        ctx.publish("isolation.clearance_needed", clearance,
                    f"{grade} insulation, overvoltage category {category}, pollution degree {pd}")
        creepage = spacing.creepage_required(working, min(pd, 3), ctx.v("isolation.material_group"),
                                             printed_wiring=False, insulation=grade)
        ctx.publish("isolation.creepage_needed", spacing.creepage_needed(creepage, clearance),
                    f"{grade}, the general (not printed-wiring) columns: the barrier may cross "
                    "parts other than the board; never less than the clearance")
