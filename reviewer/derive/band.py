"""Voltage band of the bus and the output (IEC 61140), judged on what the design produces.

The bus peak is the highest mean bus plus the ripple the tool computes: the 2·f_out ripple split
between source and capacitors by their impedances (all of it in the capacitors when the source
impedance is not given, or for a rectifier), plus half the switching-frequency ripple. Only when
neither a ripple figure nor bulk capacitance is given does it fall back on a stated assumption.
Every module that needs the bus peak reads ``band.bus_peak``.

The output is classed on the largest RMS the design can produce: open loop, the computed output
at the highest bus with the load removed (filter peaking included); closed loop, the upper end of
the output tolerance.
"""

from __future__ import annotations

import math

import numpy as np

from reviewer.derive.bus import power_factor
from reviewer.derive.paths import each
from reviewer.physics import band, bus, wire
from reviewer.physics.arrays import or_default, out
from reviewer.context import Ctx, NeedsData, declare

QUANTITIES = declare(
    ("band.bus_ripple", "%", "RMS ripple of the DC bus over its lowest mean"),
    ("band.bus_ripple_2f", "V", "RMS bus ripple at twice the output frequency"),
    ("band.bus_ripple_switching", "V", "Peak-to-peak bus ripple at the switching frequency"),
    ("band.source_resistance", "Ω", "Source resistance up to the bus capacitors (internal and leads)"),
    ("band.bus_peak", "V", "Highest bus voltage including ripple"),
    ("band.bus_limit", "V", "Extra-low-voltage limit for this bus (IEC 61140)"),
    ("band.output_max", "V", "Largest RMS output the design can produce"),
    ("band.output_limit", "V", "Extra-low-voltage limit for an AC output, RMS (IEC 61140)"),
    ("band.beyond_elv", "", "Bus or output beyond extra-low voltage", "flag"),
    ("band.bus_beyond_elv", "", "The DC bus itself is beyond extra-low voltage", "flag"),
)

UNFILTERED_RECTIFIER_RIPPLE = 0.48
"""Rms ripple over the mean of an unfiltered full-wave rectifier, √(π²/8 − 1) ≈ 0.483 [unitless]
(Fourier series of |sin|; Mohan, Undeland & Robbins 2003, ch. 5)."""

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""

PWM_KINDS = ("spwm_bipolar", "spwm_unipolar", "spwm_level_shifted")


def source_resistance(ctx: Ctx) -> float | None:
    """Internal resistance plus the supply leads (out and back), or None when not given [Ω]."""
    r = ctx.v("source.r_internal")
    if r is None:
        return None
    length, area = ctx.v("wiring.length"), ctx.v("wiring.size")
    if length is not None and area is not None:
        r = r + wire.conductor_resistance(2 * length, area)
    return r


def derive(ctx: Ctx) -> None:
    v_max, v_min = ctx.q("op.bus_max"), ctx.q("op.bus_min")
    kind = ctx.v("source.kind")
    given = ctx.v("source.ripple")
    c = ctx.v("capacitors.bulk")
    r_s = source_resistance(ctx)
    if r_s is not None:
        ctx.publish("band.source_resistance", r_s)
    rms_2f = sw_pp = 0.0
    notes: list[str] = []
    if c is not None:
        c_total = c + or_default(ctx.v("capacitors.local"), 0.0)
        esr = or_default(ctx.v("capacitors.esr"), 0.0)
        rectifier = kind == "rectified_mains"
        r_split = math.inf if rectifier else (0.0 if r_s is None else r_s)
        try:
            i_2f = bus.ripple_current_2f(ctx.q("op.input_current"), power_factor(ctx))
            f_2 = 2 * ctx.need("output.frequency")
            rms_2f = bus.shared_bus_ripple(i_2f, r_split, f_2, c_total, esr)
            notes.append("2·f ripple at the lowest bus, " + (
                "carried by the capacitors alone (a rectifier conducts only near its crest)"
                if rectifier else "no source.r_internal: the source taken as stiff"
                if r_s is None else "shared between source and capacitors by impedance"))
        except NeedsData:
            notes.append("no load figures: no 2·f ripple computed")
        if ctx.v("modulation.kind") in PWM_KINDS:
            try:
                sw_pp = bus.local_voltage_step(ctx.q("op.load_current_peak"),
                                               ctx.q("op.switching_frequency"), c_total)
                notes.append("half the switching ripple")
            except NeedsData:
                pass
        ctx.publish("band.bus_ripple_2f", rms_2f, "; ".join(notes))
        ctx.publish("band.bus_ripple_switching", sw_pp)
    if given is not None:
        ripple, note = given, "as given (source.ripple)"
        peak, peak_note = band.dc_peak(v_max, ripple), "highest bus plus the crest of the given ripple"
        if c is not None:
            computed = band.bus_peak(v_max, rms_2f, sw_pp)
            more = computed > peak  # per point in an array call
            peak_note = each(lambda m: "highest bus + " + "; ".join(notes) + (
                " (more than the given source.ripple)") if m else peak_note, more)
            peak = out(np.where(more, computed, peak))
            total_rms = out(np.sqrt(rms_2f**2 + (sw_pp / (2 * math.sqrt(3))) ** 2))
            ripple = out(np.maximum(ripple, band.ripple_fraction(total_rms, v_min)))
            note = "the larger of the given source.ripple and the computed ripple"
    elif c is None:
        if kind in ("rectified_mains", "other"):
            ripple = UNFILTERED_RECTIFIER_RIPPLE
            note = ("no source.ripple and no capacitors.bulk: an unfiltered full-wave rectifier "
                    "assumed (48 %)")
        else:
            ripple, note = 0.0, ("no capacitors.bulk given: the battery or bench supply is "
                                 "taken as ripple-free")
        peak, peak_note = band.dc_peak(v_max, ripple), note
    else:
        total_rms = out(np.sqrt(rms_2f**2 + (sw_pp / (2 * math.sqrt(3))) ** 2))
        ripple = band.ripple_fraction(total_rms, v_min)
        note = "computed: " + "; ".join(notes)
        peak, peak_note = band.bus_peak(v_max, rms_2f, sw_pp), "highest bus + " + "; ".join(notes)
    ctx.publish("band.bus_ripple", ripple, note)
    limit = band.dc_band_limit(ripple)
    ctx.publish("band.bus_peak", peak, peak_note)
    ctx.publish("band.bus_limit", limit)
    ctx.publish("band.output_limit", band.ELV_AC_RMS)

    out_max, out_note = _output_max(ctx, v_max)
    ctx.publish("band.output_max", out_max, out_note)
    bus_beyond = _flag(peak > limit)
    ctx.publish("band.bus_beyond_elv", bus_beyond)
    ctx.publish("band.beyond_elv", _flag(np.logical_or(bus_beyond, out_max > band.ELV_AC_RMS)))


def _flag(x: object) -> object:
    """A flag: a bool, or an array of bools in an array call (one per point)."""
    a = np.asarray(x, dtype=bool)
    return bool(a) if a.ndim == 0 else a


def _output_max(ctx: Ctx, v_max: float) -> tuple[float, str]:
    """The largest RMS output the design can produce, and how it was found."""
    target = ctx.v("output.v_rms")
    if bool(ctx.v("modulation.regulated")) and target is not None:
        tol = or_default(ctx.v("output.v_tolerance"), 0.0)
        return (1 + tol) * target, "closed loop: the upper end of the output tolerance"
    if ctx.has("waveform.output_at_bus_max_no_load"):
        loaded = ctx.q("waveform.output_at_bus_max")
        return (out(np.maximum(loaded, ctx.q("waveform.output_at_bus_max_no_load"))),
                "open loop: computed at the highest bus, the larger of loaded and unloaded")
    ratio = ctx.q("op.transformer_ratio")
    return (v_max * ratio, "open loop, no spectrum computed: the bridge's largest RMS (a square "
            "wave at the highest bus) assumed; filter peaking not included")
