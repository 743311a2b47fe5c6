"""Isolation from what a person can touch: the grade each boundary needs and the creepage,
clearance and test voltage for it (§3.10, IEC 60664-1 and IEC 61140).

The grade follows the protective class the design declares: class I (protective earth), basic
insulation between hazardous live parts and *earthed* accessible parts, double or reinforced to
accessible parts that are not earthed; class II, double or reinforced throughout; not declared,
class II is assumed. The working and system voltages are the largest the design can produce
(``band.output_max``, ``band.bus_peak``), never less than a working voltage the design states.
"""

from __future__ import annotations

import numpy as np

from reviewer.derive.paths import each, one_path
from reviewer.physics import spacing
from reviewer.physics.arrays import or_default, out
from reviewer.context import Ctx, NeedsData, declare

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`;
points on either side of the extra-low-voltage band are evaluated in groups (:func:`one_path`)."""

QUANTITIES = declare(
    ("isolation.protective_class", "", "Protective class used (IEC 61140)", "text"),
    ("isolation.required", "", "Insulation grade a touchable part needs from the power side", "text"),
    ("isolation.required_to_earthed", "", "Grade between hazardous parts and earthed accessible parts", "text"),
    ("isolation.required_to_unearthed", "", "Grade between hazardous parts and unearthed accessible parts", "text"),
    ("isolation.grade_ok", "", "The insulation provided is at least the grade needed", "flag"),
    ("isolation.class_consistent", "", "The declared protective class fits the design", "flag"),
    ("isolation.working_voltage", "V", "Working voltage across the barrier, rms or DC"),
    ("isolation.system_voltage", "V", "Voltage of the hazardous circuit for the impulse category"),
    ("isolation.rated_impulse", "V", "Rated impulse voltage for the overvoltage category (Table F.1)"),
    ("isolation.clearance_needed", "m", "Clearance the barrier needs (IEC 60664-1 Table F.2)"),
    ("isolation.creepage_needed", "m", "Creepage the barrier needs (IEC 60664-1 Table F.4)"),
    ("isolation.test_voltage_needed", "V", "AC test voltage of the barrier for its grade (IEC 60664-1, from memory)"),
    ("isolation.shunt_crosses", "", "A current shunt on a hazardous bus feeds the controller", "flag"),
)


def derive(ctx: Ctx) -> None:
    beyond = bool(one_path(ctx.q("band.beyond_elv")))
    declared = ctx.v("isolation.protective_class")
    pclass = declared or "II"
    ctx.publish("isolation.protective_class", pclass,
                "as declared" if declared else "not declared: class II (double or reinforced "
                "insulation throughout) assumed")
    earth = bool(ctx.v("grounding.protective_earth"))
    consistent = not (pclass == "III" and beyond) and not (pclass == "I" and beyond and not earth)
    ctx.publish("isolation.class_consistent", consistent)
    earthed = pclass == "I" and earth and bool(ctx.v("isolation.touchable_earthed"))
    required = spacing.required_insulation(beyond, earthed=earthed)
    # per boundary: class I asks basic to earthed parts, class II double or reinforced throughout
    ctx.publish("isolation.required_to_earthed",
                spacing.required_insulation(beyond, earthed=pclass == "I" and earth))
    ctx.publish("isolation.required_to_unearthed", spacing.required_insulation(beyond))
    ctx.publish("isolation.required", required,
                "within extra-low voltage" if not beyond else
                "class I: basic to earthed accessible parts" if earthed else
                f"class {pclass}: double or reinforced to accessible parts that are not earthed")
    ctx.publish("isolation.grade_ok",
                spacing.insulation_sufficient(ctx.v("isolation.insulation"), required))
    ctx.publish("isolation.shunt_crosses", bool(one_path(ctx.q("band.bus_beyond_elv")))
                and ctx.v("grounding.shunt") in ("low_side", "high_side"))
    if not beyond:
        return

    given = ctx.v("isolation.working_voltage")
    produced = out(np.maximum(ctx.q("band.output_max"), ctx.q("band.bus_peak")))
    working = produced if given is None else out(np.maximum(given, produced))
    ctx.publish("isolation.working_voltage", working,
                "the larger of the largest output rms and the bus peak" if given is None else
                each(lambda g, p: "as given" if g >= p else "the design produces more than the "
                     "given working voltage: the larger is used", given, produced))
    system = produced
    ctx.publish("isolation.system_voltage", system,
                "the largest output (or bus) voltage taken as the system voltage for Table F.1")
    grade = "reinforced" if required == "reinforced" else "basic"
    on_board = bool(ctx.v("isolation.barrier_on_board"))
    coated = bool(ctx.v("isolation.coating")) and on_board
    category = ctx.v("isolation.overvoltage_category")
    pd = ctx.v("isolation.pollution_degree")
    pd_used = 1 if coated else pd
    coat_note = ("; coated board: pollution degree 1 under the coating (IEC 60664-3 type 1 "
                 "protection, from memory)" if coated else "")
    # beyond the tables (more than 1 kV) no spacing is computed: said, never extrapolated; the
    # points of an array call on either side are evaluated in groups
    system_tabled = bool(one_path(system <= spacing.highest_system_voltage()))
    working_tabled = bool(one_path(working <= spacing.highest_working_voltage()))
    clearance = None
    with ctx.section("isolation.rated_impulse", "isolation.clearance_needed",
                     "isolation.test_voltage_needed"):
        if not system_tabled:
            raise NeedsData(beyond_tables(spacing.highest_system_voltage(), "system", "F.1"))
        ctx.publish("isolation.rated_impulse", spacing.rated_impulse_voltage(system, category))
        clearance = spacing.clearance_required(system, category, pd_used, grade,
                                               or_default(ctx.v("isolation.altitude"), 0.0))
        ctx.publish("isolation.clearance_needed", clearance,
                    f"{grade} insulation, overvoltage category {category}, pollution degree "
                    f"{pd_used}{coat_note}")
        ctx.publish("isolation.test_voltage_needed",
                    spacing.ac_test_voltage(system, grade),
                    f"{grade}: U_n + 1200 V for basic, twice that for reinforced (IEC 60664-1 "
                    "5.3.3.2.3 and 6.1.3.4, from memory)")
    with ctx.section("isolation.creepage_needed"):
        if not working_tabled:
            raise NeedsData(beyond_tables(spacing.highest_working_voltage(), "working", "F.4"))
        if clearance is None:
            raise NeedsData(beyond_tables(spacing.highest_system_voltage(), "system", "F.1"))
        creepage = spacing.creepage_required(working, min(pd_used, 3),
                                             ctx.v("isolation.material_group"),
                                             printed_wiring=on_board, insulation=grade)
        where = ("the printed-wiring columns: the barrier lies on the board only" if on_board
                 else "the general (not printed-wiring) columns: the barrier may cross parts "
                 "other than the board")
        ctx.publish("isolation.creepage_needed", spacing.creepage_needed(creepage, clearance),
                    f"{grade}, {where}; never less than the clearance{coat_note}")


def beyond_tables(top: float, which: str, table: str) -> str:
    """What a design beyond the spacing tables needs, as the needs-data text says it."""
    return (f"the value from IEC 60664-1 itself: the {which} voltage is above the {top:g} V "
            f"that its Table {table} covers here (this tool reviews low-voltage designs); "
            "follow your local codes and have the design examined by a qualified person")
