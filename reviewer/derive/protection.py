"""Protection and wiring: fuse loading on the RMS supply-lead current, ambient derating, breaking
capacity, wire coordination (NEC 240.4(D) small conductors included), inrush and fault I²t,
overcurrent threshold, lead drop (§3.8)."""

from __future__ import annotations

from typing import Any

import numpy as np

from reviewer.derive.band import source_resistance
from reviewer.derive.bus import power_factor
from reviewer.derive.paths import each, one_path
from reviewer.physics import bus, protection, wire
from reviewer.physics.arrays import or_default, out
from reviewer.context import SIDES, Ctx, NeedsData, declare

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`; the
table lookups are per element, and points on different rows of a table's branches (a conductor
inside or outside Table 310.16, say) are evaluated in groups (:func:`one_path`)."""

QUANTITIES = declare(
    ("protection.has_fuse", "", "A fuse is fitted in the supply lead", "flag"),
    ("protection.supply_current_rms", "A", "RMS current in the supply lead at the lowest bus"),
    ("protection.supply_ripple_share", "", "Share of the 2·f ripple current the source carries"),
    ("protection.fuse_loading", "", "RMS supply-lead current over the fuse rating"),
    ("protection.fuse_ambient_factor", "", "Rerating of the fuse at the design's ambient"),
    ("protection.fuse_limit", "", "Highest continuous loading the fuse's standard allows at the ambient"),
    ("protection.fuse_min", "A", "Smallest fuse rating that carries the supply-lead current"),
    ("protection.prospective_current", "A", "Prospective short-circuit current of the source"),
    ("protection.wire_ampacity", "A", "Ampacity of the supply conductor (NEC Table 310.16)"),
    ("protection.wire_max_fuse", "A", "Largest fuse rating that protects the supply conductor"),
    ("protection.wire_table", "", "How the supply conductor was rated", "text"),
    ("protection.small_conductor", "", "The supply conductor is 18 or 16 AWG (NEC 240.4(D))", "flag"),
    ("protection.small_conductor_continuous", "A", "Largest continuous load NEC 240.4(D) allows on it"),
    ("protection.wire_needed", "", "Smallest conductor the fitted fuse protects", "text"),
    ("protection.wire_needed_area", "m²", "Cross-section of the smallest conductor the fuse protects"),
    ("protection.wire_withstand", "A²s", "Adiabatic withstand k²S² of the supply conductor (IEC 60364-4-43)"),
    ("protection.wire_k", "", "k of the conductor and insulation (IEC 60364-4-43 Table 43A)"),
    ("protection.inrush_i2t", "A²s", "I²t of the inrush into the bus capacitors on connection"),
    ("protection.inrush_peak", "A", "Peak inrush current on connection"),
    ("protection.lead_resistance", "Ω", "Resistance of the supply leads, out and back"),
    ("protection.lead_drop", "V", "Drop in the supply leads at the lowest bus"),
    ("protection.fault_current_far", "A", "Fault current at the far end of the leads, lowest bus"),
    ("protection.clearing_multiple", "", "Multiple of its rating at which the fuse opens within about 0.1 s"),
    ("protection.normal_peak", "A", "Highest current in the bridge in normal service"),
    ("protection.overcurrent_delay", "s", "Overcurrent blanking plus response time"),
    ("protection.fault_current_at_trip", "A", "Current reached when the overcurrent protection has acted"),
    ("protection.{side}.pulse_rating", "A", "Pulsed drain current rating of the position (all in parallel)"),
    ("protection.has_tvs", "", "A TVS clamps the bus", "flag"),
    ("protection.has_clamp", "", "A TVS or snubber limits bus overvoltage", "flag"),
    ("protection.has_battery_uvlo", "", "The battery is protected against deep discharge", "flag"),
)


def derive(ctx: Ctx) -> None:  # noqa: C901 - one pass over the protection quantities
    has_fuse = ctx.v("fuse.rating") is not None
    ctx.publish("protection.has_fuse", has_fuse)
    ctx.publish("protection.has_tvs", ctx.v("protection.tvs_standoff") is not None
                or ctx.v("protection.tvs_clamp") is not None)
    ctx.publish("protection.has_clamp",
                ctx.v("protection.tvs_standoff") is not None or bool(ctx.v("protection.snubber")))
    ctx.publish("protection.has_battery_uvlo", ctx.v("protection.battery_uvlo") is not None)

    # the RMS current of the supply lead: the mean plus the source's share of the 2·f ripple
    with ctx.section("protection.supply_current_rms", "protection.supply_ripple_share"):
        i_dc = ctx.q("op.input_current")
        i_2f = bus.ripple_current_2f(i_dc, power_factor(ctx))
        r_s, c = source_resistance(ctx), ctx.v("capacitors.bulk")
        if r_s is None or c is None or ctx.v("source.kind") == "rectified_mains":
            share, note = 1.0, ("all of the 2·f ripple in the lead (no source.r_internal or no "
                                "capacitors.bulk to share it)")
            if ctx.v("source.kind") == "rectified_mains":
                note = ("all of the 2·f ripple in the lead; a rectifier's own charging pulses "
                        "load it more: check the AC-side current")
        else:
            c_total = c + or_default(ctx.v("capacitors.local"), 0.0)
            share = bus.source_share(r_s, 2 * ctx.need("output.frequency"), c_total,
                                     or_default(ctx.v("capacitors.esr"), 0.0))
            note = "the 2·f ripple split between source and capacitors by their impedances"
        ctx.publish("protection.supply_ripple_share", share, note)
        ctx.publish("protection.supply_current_rms", bus.supply_lead_rms(i_dc, share * i_2f),
                    "√(I_dc² + (share · I_2f)²) at the lowest bus; " + note)

    standard = ctx.v("fuse.standard") if has_fuse else "other"
    with ctx.section("protection.fuse_ambient_factor", "protection.fuse_limit",
                     "protection.fuse_min", "protection.fuse_loading"):
        given = ctx.v("fuse.ambient_factor") if has_fuse else None
        ambient = ctx.v("environment.ambient")
        if given is not None:
            factor, fnote = given, "the fuse maker's factor, as given"
        else:
            if not one_path(protection.fuse_ambient_covered(ambient)):
                raise NeedsData("fuse.ambient_factor")
            factor = protection.fuse_ambient_factor(standard, ambient)
            fnote = each(lambda a: f"typical rerating at {a:g} °C for '{standard}' fuses "
                         "(reviewer/tables/fuse_ambient.toml, from memory)", ambient)
        ctx.publish("protection.fuse_ambient_factor", factor, fnote)
        limit = protection.fuse_loading_limit(standard) * factor
        ctx.publish("protection.fuse_limit", limit, each(
            lambda f: f"the limit for fuse standard '{standard}' (reviewer/tables/fuse_loading.toml)"
                      f" × the ambient factor {f:.3g}", factor))
        i_rms = ctx.q("protection.supply_current_rms")
        ctx.publish("protection.fuse_min", i_rms / limit)
        rating = ctx.need("fuse.rating")
        ctx.publish("protection.fuse_loading", protection.fuse_loading(i_rms, rating),
                    "the RMS supply-lead current at the lowest bus, taken as continuous")

    with ctx.section("protection.prospective_current"):
        i_short = ctx.v("source.i_short")
        if i_short is not None:
            ctx.publish("protection.prospective_current", i_short, "as given")
        else:
            r = ctx.need("source.r_internal")
            ctx.publish("protection.prospective_current",
                        protection.prospective_short_circuit_current(ctx.q("op.bus_max"), r),
                        "highest bus over the internal resistance: a bolted fault at the terminals")

    _wire(ctx, has_fuse)
    _leads(ctx, has_fuse)
    _inrush(ctx, has_fuse)
    _overcurrent(ctx)


def _wire(ctx: Ctx, has_fuse: bool) -> None:
    temp = ctx.v("wiring.insulation_temp")
    ctx.publish("protection.small_conductor", False)
    with ctx.section("protection.wire_ampacity", "protection.wire_max_fuse",
                     "protection.wire_table", "protection.small_conductor_continuous"):
        area = ctx.need("wiring.size")
        amp = protection.wire_ampacity(area, temp)
        limit = protection.wire_max_protection(area, temp)
        # the branch each point takes (arrays give NaN where the scalar lookup gives None)
        listed = one_path(_given(amp) & _given(limit))
        small = one_path(protection.small_conductor_gauge(area)) if not listed else None
        if listed:
            ambient = ctx.v("environment.ambient")
            factor = protection.ampacity_ambient_factor(ambient, temp)
            if not one_path(_given(factor)):
                ctx.publish("protection.wire_table", "outside the table: the ambient is above "
                            "NEC Table 310.15(B)(1)(1)")
                raise NeedsData("environment.ambient")
            amp_c = amp * factor
            ctx.publish("protection.wire_ampacity", amp_c, each(
                lambda a, f, t: f"Table 310.16 {a:g} A × {f:g} for {t:g} °C ambient (Table "
                "310.15(B)(1)(1), from memory), up to three current-carrying conductors",
                amp, factor, ambient))
            ctx.publish("protection.wire_max_fuse", out(np.minimum(limit, amp_c)),
                        "its corrected ampacity, and NEC 240.4(D) for 14–10 AWG")
            ctx.publish("protection.wire_table", "NEC Table 310.16 and 240.4(D)")
        elif small is not None:
            max_fuse, continuous, conditions = protection.small_conductor(small)  # type: ignore[misc]
            ctx.publish("protection.small_conductor", True)
            ctx.publish("protection.wire_max_fuse", max_fuse,
                        f"NEC 240.4(D) for {small} AWG, provided: {conditions} (from memory)")
            ctx.publish("protection.small_conductor_continuous", continuous,
                        f"NEC 240.4(D) for {small} AWG (from memory)")
            ctx.publish("protection.wire_table", f"NEC 240.4(D) small conductor, {small} AWG")
        else:
            ctx.publish("protection.wire_table",
                        "outside the table: smaller than 18 AWG, or insulation rated below 60 °C; "
                        "NEC Table 310.16 and 240.4(D) give it no rating")
            raise NeedsData("wiring.size")
    with ctx.section("protection.wire_withstand", "protection.wire_k"):
        area = ctx.need("wiring.size")
        k = protection.adiabatic_k(temp)
        ctx.publish("protection.wire_k", k, each(
            lambda t: "copper, IEC 60364-4-43 Table 43A (from memory): "
            + ("thermosetting insulation" if t >= 90 else "thermoplastic insulation"), temp))
        ctx.publish("protection.wire_withstand", protection.wire_withstand_i2t(k, area))
    if has_fuse:
        found = protection.smallest_wire_for_fuse(ctx.v("fuse.rating"), temp)
        if isinstance(found, tuple) and isinstance(found[0], np.ndarray):  # an array call
            gauge = one_path(found[0])
            found = None if gauge is None else (gauge, float(found[1].reshape(-1)[0]))
        if found is not None:
            gauge, area = found
            mm2 = area * 1e6
            ctx.publish("protection.wire_needed", f"{gauge} AWG ({mm2:.3g} mm²)")
            ctx.publish("protection.wire_needed_area", area)
        else:
            ctx.publish("protection.wire_needed", "larger than 4/0 AWG: split the load or use a smaller fuse")


def _given(x: Any) -> Any:
    """Whether a table lookup gave a value: not None (scalar), not NaN (array elements)."""
    if isinstance(x, np.ndarray):
        return ~np.isnan(x)
    return x is not None


def _leads(ctx: Ctx, has_fuse: bool) -> None:
    with ctx.section("protection.lead_resistance", "protection.lead_drop",
                     "protection.fault_current_far", "protection.clearing_multiple"):
        length, area = ctx.need("wiring.length", "wiring.size")
        r_lead = wire.conductor_resistance(2 * length, area)
        ctx.publish("protection.lead_resistance", r_lead,
                    "copper at 20 °C (IEC 60028), out and back over wiring.length")
        ctx.publish("protection.lead_drop", ctx.q("protection.supply_current_rms") * r_lead,
                    "the RMS supply-lead current at the lowest bus (end of discharge)")
        if has_fuse:
            ctx.publish("protection.clearing_multiple",
                        protection.clearing_multiple(ctx.v("fuse.speed")),
                        "typical time-current curves (from memory); "
                        + ("fuse.speed not given: taken as time-delay" if ctx.v("fuse.speed") is None
                           else f"a {ctx.v('fuse.speed')} fuse"))
        r_int = ctx.need("source.r_internal")
        ctx.publish("protection.fault_current_far",
                    protection.prospective_short_circuit_current(ctx.q("op.bus_min"), r_int, r_lead),
                    "a bolted fault at the far end of the leads, at the lowest bus")


def _inrush(ctx: Ctx, has_fuse: bool) -> None:
    with ctx.section("protection.inrush_i2t", "protection.inrush_peak"):
        c = ctx.need("capacitors.bulk") + or_default(ctx.v("capacitors.local"), 0.0)
        r_s = source_resistance(ctx)
        pre = ctx.v("protection.precharge_resistance")
        parts = [x for x in (r_s, ctx.v("capacitors.esr"), pre) if x is not None]
        r_total = sum(parts)
        if one_path(r_total <= 0):
            raise NeedsData("source.r_internal", "protection.precharge_resistance")
        v = ctx.q("op.bus_max")
        ctx.publish("protection.inrush_i2t", protection.capacitor_inrush_i2t(v, c, r_total),
                    each(lambda p: "C·V²/(2R) at the highest bus, through "
                         + ("the pre-charge resistor, " if p else "no pre-charge, ")
                         + "source, leads and ESR as given", pre))
        ctx.publish("protection.inrush_peak", v / r_total)


def _overcurrent(ctx: Ctx) -> None:
    peak = ctx.q("filter.inductor_peak") if ctx.has("filter.inductor_peak") else None
    with ctx.section("protection.normal_peak"):
        if peak is None:
            peak = ctx.q("op.load_current_peak")
            ctx.publish("protection.normal_peak", peak, "the load current's fundamental peak")
        else:
            ctx.publish("protection.normal_peak", peak, "the filter inductor's peak, loaded or unloaded")
    for side in SIDES:
        with ctx.section(f"protection.{side}.pulse_rating"):
            ctx.publish(f"protection.{side}.pulse_rating",
                        ctx.need(f"switch.{side}.id_pulse") * ctx.v(f"switch.{side}.count"),
                        "the pulsed rating of one device times the devices in parallel")
    with ctx.section("protection.overcurrent_delay", "protection.fault_current_at_trip"):
        response = ctx.need("protection.overcurrent_response")
        delay = response + or_default(ctx.v("protection.overcurrent_blanking"), 0.0)
        ctx.publish("protection.overcurrent_delay", delay, "blanking plus response")
        threshold = ctx.need("protection.overcurrent_threshold")
        l_f = ctx.v("filter.inductance")
        if one_path(l_f != 0 if isinstance(l_f, np.ndarray) else bool(l_f)):
            ctx.publish("protection.fault_current_at_trip",
                        protection.fault_current_at_response(threshold, ctx.q("band.bus_peak"),
                                                             l_f, delay),
                        "an output short behind the filter inductor: the threshold plus "
                        "V_bus/L over the delay")
        else:
            ctx.publish("protection.fault_current_at_trip", threshold,
                        "no filter inductance: the rise during the delay is not estimated "
                        "(a short at the bridge rises far faster)")
