"""Output waveform and filter: the bridge spectrum, through the LC filter into the load.

Every voltage in the bridge model is the bus voltage times a switching function and the filter
and load are linear, so the spectrum is synthesised once per set of modulation inputs for a
1 V bus (cached) and scaled to each bus voltage. The load is reflected to the bridge side of an
output transformer (taken as ideal) by the square of its ratio; a load given by power and power
factor is modelled as a series R-L with that power factor at the output frequency.
"""

from __future__ import annotations

import math
from functools import lru_cache
from typing import Any

from reviewer.physics import filter as flt
from reviewer.physics import waveform as wf
from reviewer.context import Ctx, declare

QUANTITIES = declare(
    ("waveform.pwm", "", "Carrier-based (sine-triangle) modulation", "flag"),
    ("waveform.filtered", "", "An LC output filter is given", "flag"),
    ("waveform.window_periods", "", "Output periods in the synthesised window (carrier not a multiple of the output)"),
    ("waveform.carrier_used", "Hz", "Carrier frequency synthesised (nearest ratio p/q with q ≤ 8)"),
    ("waveform.current_lag", "rad", "Lag of the bridge current's fundamental behind the bridge voltage"),
    ("waveform.bridge_fundamental", "V", "RMS fundamental of the bridge voltage at the nominal bus"),
    ("waveform.bridge_rms", "V", "RMS of the bridge voltage (full band)"),
    ("waveform.bridge_thd", "%", "Distortion of the bridge voltage, full band"),
    ("waveform.output_fundamental", "V", "RMS fundamental at the load, nominal bus, open loop"),
    ("waveform.output_rms", "V", "RMS voltage at the load, nominal bus, open loop"),
    ("waveform.output_thd", "%", "Distortion at the load after the filter (all resolved components)"),
    ("waveform.output_thd_40", "%", "Distortion at the load, harmonics to the 40th (EN 50160)"),
    ("waveform.output_thd_no_load", "%", "Distortion at the output with the load removed"),
    ("waveform.largest_harmonic", "%", "Largest single component at the load over the fundamental"),
    ("waveform.largest_harmonic_order", "", "Order (f / f_out) of that component"),
    ("waveform.output_at_bus_min", "V", "RMS at the load at the lowest bus, open loop"),
    ("waveform.output_at_bus_max", "V", "RMS at the load at the highest bus, open loop"),
    ("waveform.output_at_bus_max_no_load", "V", "RMS at the output at the highest bus with the load removed, open loop"),
    ("waveform.output_low_limit", "V", "Lowest RMS output the tolerance allows"),
    ("waveform.output_high_limit", "V", "Highest RMS output the tolerance allows"),
    ("waveform.output_gain", "", "Gain from the bridge to the load at the output frequency, loaded (1 without a filter)"),
    ("waveform.ripple_frequency", "Hz", "Frequency of the inductor ripple (first carrier group)"),
    ("waveform.short_pulse_fraction", "%", "Share of the commanded pulses shorter than the minimum pulse"),
    ("waveform.index_limit_min_pulse", "", "Largest index whose pulses all exceed the minimum pulse"),
    ("waveform.carrier_for_thd", "Hz", "Lowest carrier at which this filter meets the THD target"),
    ("waveform.bridge_current_rms", "A", "RMS bridge (inductor) current from the harmonics, at the target output"),
    ("waveform.load_current_rms", "A", "RMS load current from the harmonics, at the target output"),
    ("filter.corner", "Hz", "LC corner 1/(2π√(LC))"),
    ("filter.corner_to_output", "", "Corner over the output frequency"),
    ("filter.group_to_corner", "", "First carrier group over the corner"),
    ("filter.q_full_load", "", "Quality factor at full load, R·√(C/L)"),
    ("filter.peak_gain_no_load", "", "Largest gain of the filter with the load removed"),
    ("filter.ripple_pp", "A", "Largest peak-to-peak inductor ripple, highest bus"),
    ("filter.inductor_peak", "A", "Peak inductor current, fundamental plus ripple, loaded or unloaded"),
    ("filter.inductor_peak_loaded", "A", "Peak inductor current at full load"),
    ("filter.inductor_peak_no_load", "A", "Peak inductor current with the load removed"),
    ("filter.inductor_dcr", "Ω", "Inductor winding resistance used (given, or from an assumed Q)"),
    ("filter.capacitor_esr", "Ω", "Filter capacitor ESR used (given, or from an assumed Q)"),
    ("filter.gain_at_output", "", "Filter gain |H| at the output frequency, loaded"),
    ("filter.gain_at_corner", "", "Filter gain |H| at the LC corner, loaded"),
    ("filter.gain_at_carrier", "", "Filter gain |H| at the first carrier group, loaded"),
    ("filter.capacitor_current_max", "A", "Largest RMS filter-capacitor current, loaded or unloaded"),
    ("filter.capacitor_peak", "V", "Peak capacitor voltage, loaded or unloaded"),
    ("filter.capacitor_current_rms", "A", "RMS capacitor current at the target output"),
    ("filter.l_for_thd", "H", "Inductance meeting the THD target (characteristic impedance held)"),
    ("filter.c_for_thd", "F", "Capacitance meeting the THD target (characteristic impedance held)"),
)

SQUARE_KINDS = ("square", "quasi_square")
HARMONIC_ORDERS = 15
"""Harmonics published one by one at the load (orders 1 to 15)."""
CARRIER_GROUPS = 4
"""Carrier sideband groups published at the load."""

QUANTITIES += declare(
    *[row for n in range(1, HARMONIC_ORDERS + 1) for row in (
        (f"spectrum.h{n}.frequency", "Hz", f"Frequency of harmonic {n} at the load"),
        (f"spectrum.h{n}.amplitude", "V", f"RMS of harmonic {n} at the load, nominal bus"),
        (f"spectrum.h{n}.relative", "%", f"Harmonic {n} at the load over the fundamental"),
        (f"spectrum.h{n}.phase", "rad", f"Phase of harmonic {n} at the load"))],
    *[row for m in range(1, CARRIER_GROUPS + 1) for row in (
        (f"spectrum.group{m}.frequency", "Hz", f"Frequency of the largest component of carrier group {m}"),
        (f"spectrum.group{m}.amplitude", "V", f"RMS of carrier group {m} at the load, nominal bus"),
        (f"spectrum.group{m}.relative", "%", f"Carrier group {m} at the load over the fundamental"),
        (f"spectrum.group{m}.phase", "rad", f"Phase of the largest component of carrier group {m}"))],
    ("waveform.output_thd_judged", "%", "Distortion at the load over the orders the target counts"),
    ("waveform.bridge_dc_offset", "V", "DC (mean) of the bridge voltage at the highest bus: a volt-second imbalance"),
    ("waveform.dc_offset_relative", "%", "Bridge DC offset over its RMS fundamental"),
    ("waveform.transformer_dc_current", "A", "DC current the offset drives through the transformer winding"),
    ("waveform.transformer_flux", "T", "Peak flux density of the transformer core at the largest output (bound)"),
)


@lru_cache(maxsize=256)
def spectrum(kind: str, f0: float, index: float | None, carrier: float | None, notch: float,
             dead_high: float, dead_low: float, lag: float, min_pulse: float,
             zero_state: str = "low_sides") -> wf.Spectrum:
    """The bridge spectrum for a 1 V bus, cached on its inputs (corners repeat them)."""
    return wf.synthesise(kind, 1.0, f0, index=index, carrier=carrier, notch=notch,  # type: ignore[arg-type]
                         zero_state=zero_state,  # type: ignore[arg-type]
                         dead_time_high=dead_high, dead_time_low=dead_low, current_lag=lag,
                         min_pulse=min_pulse)


@lru_cache(maxsize=256)
def response(spec: wf.Spectrum, circuit: tuple[float, float, float, float | None, float,
                                                float | None, float | None, float]) -> flt.FilterResponse:
    """The filter response to a cached spectrum (1 V bus), cached on the circuit values."""
    l_, c_, dcr, r, l_load, rd, cd, esr = circuit
    return flt.respond(spec.freq, spec.amp, l_, c_, dcr=dcr, load_resistance=r,
                       load_inductance=l_load, damping_resistance=rd, damping_capacitance=cd,
                       esr=esr)


@lru_cache(maxsize=64)
def _corner_for_thd(spec: wf.Spectrum, target: float, z0: float, r: float | None,
                    l_load: float) -> tuple[float, float, float]:
    return flt.corner_for_thd(spec.freq, spec.amp, spec.f0, target, z0, load_resistance=r,
                              load_inductance=l_load)


@lru_cache(maxsize=64)
def _carrier_for_thd(spec: wf.Spectrum, target: float,
                     circuit: tuple[float, float, float, float | None, float, float | None,
                                    float | None, float]) -> float:
    l_, c_, dcr, r, l_load, rd, cd, _esr = circuit
    return flt.carrier_for_thd(spec.freq, spec.amp, spec.f0, spec.carrier, target, l_, c_,
                               dcr=dcr, load_resistance=r, load_inductance=l_load,
                               damping_resistance=rd, damping_capacitance=cd)


def _load_at_bridge(ctx: Ctx, f0: float, ratio: float) -> tuple[float, float]:
    """Load resistance and series inductance seen at the bridge side [Ω, H]."""
    v_out = ctx.q("op.output_rms")
    kind = ctx.v("load.kind")
    if kind == "resistive":
        r = ctx.v("load.resistance")
        if r is None:
            r = v_out ** 2 / ctx.need("load.power")
        l_ = 0.0
    elif kind == "r_l":
        r, l_ = ctx.need("load.resistance", "load.inductance")
    else:
        p, pf = ctx.need("load.power", "load.power_factor")
        z = v_out ** 2 * pf / p
        r = z * pf
        l_ = z * math.sqrt(max(1 - pf * pf, 0.0)) / (2 * math.pi * f0)
    return r / ratio ** 2, l_ / ratio ** 2


def _ripple_frequency(kind: str, f0: float, carrier: float | None) -> float:
    if kind == "spwm_unipolar":
        return 2 * carrier  # type: ignore[operator]
    if kind in SQUARE_KINDS:
        return f0
    return carrier  # type: ignore[return-value]


def dead_times(ctx: Ctx) -> tuple[Any, Any]:
    """Dead time before a high-side and a low-side switch turns on [s] (array-safe)."""
    dead = ctx.v("timing.dead_time")
    dead = 0.0 if dead is None else dead
    dh = ctx.v("timing.dead_time_high")
    dl = ctx.v("timing.dead_time_low")
    if ctx.v("drive.shared_signal"):
        return 0.0, 0.0  # one signal and its inverse feed the leg: timing.dead_time has no effect
    return (dead if dh is None else dh), (dead if dl is None else dl)


def derive(ctx: Ctx) -> None:
    names = [d.pattern for d in QUANTITIES]
    with ctx.section(*names):
        _derive(ctx)


def _derive(ctx: Ctx) -> None:  # noqa: C901 - one straight pass over the quantities
    import numpy as np

    kind = ctx.v("modulation.kind")
    f0 = ctx.need("output.frequency")
    pwm = kind not in SQUARE_KINDS
    ctx.publish("waveform.pwm", pwm)
    index = carrier = None
    notch = 0.0
    if pwm:
        index, carrier = ctx.need("modulation.index", "modulation.carrier")
    elif kind == "quasi_square":
        notch = ctx.need("modulation.notch_angle")
    dh, dl = dead_times(ctx)
    min_pulse = ctx.v("modulation.min_pulse") or 0.0
    ratio = ctx.q("op.transformer_ratio")
    v_nom, v_min, v_max = ctx.q("op.bus_nom"), ctx.q("op.bus_min"), ctx.q("op.bus_max")
    target = ctx.v("output.v_rms")
    r_b, l_b = _load_at_bridge(ctx, f0, ratio)

    l_f = ctx.v("filter.inductance") or 0.0
    c_f = ctx.v("filter.capacitance") or 0.0
    filtered = l_f > 0 and c_f > 0
    ctx.publish("waveform.filtered", filtered)
    dcr, esr = ctx.v("filter.inductor_dcr"), ctx.v("filter.capacitor_esr")
    loss_note = ""
    if filtered:
        assumed = []
        if dcr is None:
            dcr = flt.default_dcr(l_f, c_f)
            assumed.append(f"inductor Q {flt.DEFAULT_INDUCTOR_Q:g} at the corner (no "
                           "filter.inductor_dcr: undamped otherwise; give filter.inductor_dcr)")
        if esr is None:
            esr = flt.default_esr(l_f, c_f)
            assumed.append(f"capacitor Q {flt.DEFAULT_CAPACITOR_Q:g} at the corner (no "
                           "filter.capacitor_esr)")
        loss_note = ("losses assumed: " + "; ".join(assumed)) if assumed else ""
        ctx.publish("filter.inductor_dcr", float(dcr), loss_note if ctx.v("filter.inductor_dcr") is None else "as given")
        ctx.publish("filter.capacitor_esr", float(esr), loss_note if ctx.v("filter.capacitor_esr") is None else "as given")
    dcr = float(dcr or 0.0)
    esr = float(esr or 0.0)
    circuit = (l_f, c_f, dcr, r_b, l_b,
               ctx.v("filter.damping_resistance"), ctx.v("filter.damping_capacitance"), esr)
    no_load = circuit[:3] + (None, 0.0) + circuit[5:]
    yin = (flt.shunt_admittance(f0, c_f, load_resistance=r_b, load_inductance=l_b,
                                damping_resistance=circuit[5], damping_capacitance=circuit[6],
                                esr=esr)
           * flt.transfer(f0, l_f, c_f, dcr=circuit[2], load_resistance=r_b,
                          load_inductance=l_b, damping_resistance=circuit[5],
                          damping_capacitance=circuit[6], esr=esr))
    lag = round(-float(np.angle(yin)), 6)
    ctx.publish("waveform.current_lag", lag)

    spec = spectrum(kind, f0, index, carrier, notch, dh, dl, lag, min_pulse,
                    ctx.v("modulation.zero_state"))
    ctx.publish("waveform.window_periods", float(spec.periods))
    if pwm:
        ctx.publish("waveform.carrier_used", spec.carrier)
    ctx.publish("waveform.bridge_fundamental", v_nom * spec.fundamental_rms)
    ctx.publish("waveform.bridge_rms", v_nom * spec.v_rms)
    ctx.publish("waveform.bridge_thd", wf.thd_full(spec))

    resp = response(spec, circuit)
    k1 = spec.fundamental_bin
    v1 = abs(resp.v_out[k1])  # per volt of bus, bridge side
    out1_rms = v_nom * ratio * v1 / math.sqrt(2)
    ctx.publish("waveform.output_fundamental", out1_rms)
    ctx.publish("waveform.output_rms", v_nom * ratio * resp.v_out_rms)
    ctx.publish("waveform.output_thd", wf.thd_band(spec.freq, resp.v_out, f0))
    ctx.publish("waveform.output_thd_40", wf.thd_band(spec.freq, resp.v_out, f0, max_order=40))
    _spectrum_table(ctx, spec, resp, v_nom * ratio, kind)
    dc_frac = abs(spec.v_dc) + (ctx.v("output.dc_offset") or 0.0)
    offset = v_max * dc_frac
    ctx.publish("waveform.bridge_dc_offset", offset,
                "mean of the synthesised bridge voltage (dead time, minimum pulse) plus the "
                "controller's output.dc_offset, at the highest bus")
    if spec.fundamental_rms:
        ctx.publish("waveform.dc_offset_relative", dc_frac / spec.fundamental_rms)
    if ctx.v("output.transformer_ratio") is not None:
        with ctx.section("waveform.transformer_dc_current"):
            r_w = ctx.need("output.transformer_primary_resistance")
            r_dc = r_w + (ctx.v("filter.inductor_dcr") or 0.0)
            ctx.publish("waveform.transformer_dc_current", offset / r_dc,
                        "the DC offset over the winding and inductor resistance (the source of "
                        "a volt-second imbalance; the core saturates on its ampere-turns)")
    if ctx.v("output.thd_orders") == "40":
        ctx.publish("waveform.output_thd_judged", ctx.q("waveform.output_thd_40"),
                    "harmonics to the 40th, as the target counts them (EN 50160)")
    else:
        ctx.publish("waveform.output_thd_judged", ctx.q("waveform.output_thd"),
                    "every resolved component, inter-harmonics and carrier groups included")
    if ctx.v("output.transformer_ratio") is not None:
        with ctx.section("waveform.transformer_flux"):
            n, area = ctx.need("output.transformer_turns", "output.transformer_core_area")
            regulated = bool(ctx.v("modulation.regulated")) and target is not None
            if regulated and resp.v_out[spec.fundamental_bin]:
                # the controller may hold the output at the top of its tolerance
                hi = (1 + ctx.need("output.v_tolerance")) * target
                k = hi / (ratio * abs(resp.v_out[spec.fundamental_bin]) / math.sqrt(2))
                how = "regulated at the top of the output tolerance"
            else:
                k, how = v_max, "open loop at the highest bus"
            ctx.publish("waveform.transformer_flux",
                        wf.peak_flux_density(spec.freq, k * resp.v_out, n, area),
                        how + ", loaded; every component's flux added (an upper bound)")
    top = wf.largest_harmonics(spec.freq, resp.v_out, f0, count=1)
    if top:
        ctx.publish("waveform.largest_harmonic", top[0].relative)
        ctx.publish("waveform.largest_harmonic_order", top[0].order)
    ctx.publish("waveform.output_at_bus_min", v_min * ratio * resp.v_out_rms)
    ctx.publish("waveform.output_at_bus_max", v_max * ratio * resp.v_out_rms)
    resp0 = response(spec, no_load) if filtered else resp
    ctx.publish("waveform.output_at_bus_max_no_load", v_max * ratio * resp0.v_out_rms,
                "open loop, load removed" + (f"; {loss_note}" if loss_note else ""))
    if target is not None:
        tol = ctx.need("output.v_tolerance")
        ctx.publish("waveform.output_low_limit", (1 - tol) * target)
        ctx.publish("waveform.output_high_limit", (1 + tol) * target)
    ctx.publish("waveform.ripple_frequency", _ripple_frequency(kind, f0, spec.carrier))

    # the operating point: the target output (or the open-loop nominal one without a target)
    scale = v_nom if target is None else (target / (ratio * v1 / math.sqrt(2)) if v1 else v_nom)
    ctx.publish("waveform.bridge_current_rms", scale * resp.i_inductor_rms,
                "all harmonics through the filter and load, scaled to the target output")
    ctx.publish("waveform.load_current_rms", scale * resp.i_load_rms / ratio,
                "all harmonics through the filter and load, scaled to the target output")
    ctx.publish("filter.capacitor_current_rms", scale * resp.i_capacitor_rms)

    def gain_at(f: float) -> float:
        return abs(complex(flt.transfer(f, l_f, c_f, dcr=circuit[2], load_resistance=r_b,
                                        load_inductance=l_b, damping_resistance=circuit[5],
                                        damping_capacitance=circuit[6], esr=esr)))

    gain = gain_at(f0)
    ctx.publish("waveform.output_gain", gain, loss_note)

    if pwm:
        if min_pulse > 0:
            ctx.publish("waveform.short_pulse_fraction", wf.short_pulse_fraction(spec, min_pulse))
            if kind in ("spwm_bipolar", "spwm_unipolar"):
                # leg pulse T_c(1 ± m)/2 ≥ t_min for |m| ≤ M  ⇔  M ≤ 1 − 2·t_min·f_c
                ctx.publish("waveform.index_limit_min_pulse", 1 - 2 * min_pulse * spec.carrier)

    # the filter
    if filtered:
        f_lc = flt.corner_frequency(l_f, c_f)
        ctx.publish("filter.corner", f_lc)
        ctx.publish("filter.gain_at_output", gain, loss_note)
        ctx.publish("filter.gain_at_corner", gain_at(f_lc), loss_note)
        if pwm:
            ctx.publish("filter.gain_at_carrier",
                        gain_at(_ripple_frequency(kind, f0, spec.carrier)), loss_note)
        ctx.publish("filter.corner_to_output", f_lc / f0)
        if pwm:
            ctx.publish("filter.group_to_corner", _ripple_frequency(kind, f0, spec.carrier) / f_lc)
        ctx.publish("filter.q_full_load", flt.peaking_q(r_b, l_f, c_f)
                    if l_b == 0 else flt.peaking_q(r_b + (2 * math.pi * f_lc * l_b) ** 2 / r_b,
                                                   l_f, c_f),
                    "R-L load taken as its parallel equivalent at the corner")
        g, _ = flt.peak_gain(l_f, c_f, dcr=circuit[2], damping_resistance=circuit[5],
                             damping_capacitance=circuit[6], esr=esr)
        ctx.publish("filter.peak_gain_no_load", g, loss_note)
        ctx.publish("waveform.output_thd_no_load", wf.thd_band(spec.freq, resp0.v_out, f0))
        if pwm:
            ctx.publish("filter.ripple_pp", flt.ripple_pp(kind, v_max, l_f, spec.carrier,
                                                         min(index, 1.0)))
        regulated = bool(ctx.v("modulation.regulated")) and target is not None
        note = f"; {loss_note}" if loss_note else ""
        if regulated:
            # the controller holds the target, loaded or not: scale each response to it
            scale0 = scale * abs(resp.v_out[k1]) / abs(resp0.v_out[k1])
            if pwm:
                half = ctx.q("filter.ripple_pp") / 2
                loaded = scale * abs(resp.i_inductor[k1]) + half
                unloaded = scale0 * abs(resp0.i_inductor[k1]) + half
                how = ("regulated: fundamental at the target output plus half the ripple at the "
                       "highest bus")
            else:
                loaded = scale * resp.i_inductor_peak
                unloaded = scale0 * resp0.i_inductor_peak
                how = "regulated: at the target output, from all harmonics"
            ctx.publish("filter.capacitor_peak", max(scale * resp.v_out_peak,
                                                     scale0 * resp0.v_out_peak),
                        "at the target output, loaded or unloaded" + note)
            c_max = max(scale * resp.i_capacitor_rms, scale0 * resp0.i_capacitor_rms)
        else:
            loaded = v_max * resp.i_inductor_peak
            unloaded = v_max * resp0.i_inductor_peak
            how = "open loop at the highest bus, from all harmonics"
            ctx.publish("filter.capacitor_peak", v_max * max(resp.v_out_peak, resp0.v_out_peak),
                        "open loop at the highest bus, loaded or unloaded" + note)
            c_max = max(scale * resp.i_capacitor_rms, v_max * resp.i_capacitor_rms,
                        v_max * resp0.i_capacitor_rms)
        ctx.publish("filter.inductor_peak_loaded", loaded, how)
        ctx.publish("filter.inductor_peak_no_load", unloaded, how + "; load removed" + note)
        ctx.publish("filter.inductor_peak", max(loaded, unloaded),
                    how + ("; the unloaded case is the larger" if unloaded > loaded else
                           "; the loaded case is the larger") + note)
        ctx.publish("filter.capacitor_current_max", c_max,
                    ("regulated at the target" if regulated else
                     "open loop at the highest bus") + ", loaded or unloaded" + note)

    # mitigation values: solved at typical values only (each is a search over many filters)
    target_thd = ctx.v("output.thd_target")
    if ctx.typical and target_thd is not None and filtered and pwm:
        fc_need = _carrier_for_thd(spec, target_thd, circuit)
        if math.isfinite(fc_need):
            ctx.publish("waveform.carrier_for_thd", fc_need,
                        "at typical values; sidebands moved with the carrier; confirm by a new "
                        "review")
    if ctx.typical and target_thd is not None:
        z0 = math.sqrt(l_f / c_f) if filtered else r_b
        f_need, l_need, c_need = _corner_for_thd(spec, target_thd, z0, r_b, l_b)
        note = ("at typical values, the design's √(L/C) held" if filtered
                else "at typical values, √(L/C) taken equal to the full-load resistance (Q ≈ 1)")
        if not math.isfinite(f_need):
            # no corner above 1.2 × f_out passes: name the lowest one tried
            f_need = 1.2 * f0
            l_need, c_need = z0 / (2 * math.pi * f_need), 1 / (2 * math.pi * f_need * z0)
            note += "; no corner above 1.2 × the output frequency meets the target"
        ctx.publish("filter.l_for_thd", l_need, note)
        ctx.publish("filter.c_for_thd", c_need, note)

    if ctx.typical:
        _plot(ctx, spec, resp, v_nom, ratio)


def _spectrum_table(ctx: Ctx, spec: wf.Spectrum, resp: flt.FilterResponse, scale: float,
                    kind: str) -> None:
    """Publish the first harmonics and the carrier groups at the load, RMS volts at the nominal
    bus (bridge side scaled by the transformer ratio)."""
    f, mag, ph = wf.harmonic_table(spec.freq, resp.v_out, spec.f0, HARMONIC_ORDERS)
    a1 = mag[0]
    for n in range(1, HARMONIC_ORDERS + 1):
        if not math.isfinite(f[n - 1]):
            break
        ctx.publish(f"spectrum.h{n}.frequency", float(f[n - 1]))
        ctx.publish(f"spectrum.h{n}.amplitude", float(scale * mag[n - 1] / math.sqrt(2)))
        ctx.publish(f"spectrum.h{n}.relative", float(mag[n - 1] / a1) if a1 else math.inf)
        ctx.publish(f"spectrum.h{n}.phase", float(ph[n - 1]))
    if kind in SQUARE_KINDS:
        return
    for m, (rms, fm, peak, phase) in enumerate(
            wf.carrier_groups(spec.freq, resp.v_out, _ripple_frequency(kind, spec.f0, spec.carrier),
                              CARRIER_GROUPS), start=1):
        ctx.publish(f"spectrum.group{m}.frequency", fm)
        ctx.publish(f"spectrum.group{m}.amplitude", scale * rms)
        ctx.publish(f"spectrum.group{m}.relative", rms * math.sqrt(2) / a1 if a1 else math.inf)
        ctx.publish(f"spectrum.group{m}.phase", phase)


def _plot(ctx: Ctx, spec: wf.Spectrum, resp: flt.FilterResponse, v_bus: float,
          ratio: float) -> None:
    """Spectrum for a picture: components above 10⁻⁴ of the fundamental, RMS volts."""
    import numpy as np

    k1 = spec.fundamental_bin
    top = 6 * (spec.carrier or 20 * spec.f0)
    mag_b = np.abs(spec.amp) * v_bus / math.sqrt(2)
    mag_o = np.abs(resp.v_out) * v_bus * ratio / math.sqrt(2)
    keep = (spec.freq > 0) & (spec.freq <= top) & (mag_b >= 1e-4 * mag_b[k1])
    data: dict[str, Any] = {
        "unit": "V rms",
        "f0": spec.f0,
        "frequency": [float(x) for x in spec.freq[keep]],
        "bridge": [float(x) for x in mag_b[keep]],
        "output": [float(x) for x in mag_o[keep]],
        "output_side": "load" if ratio == 1 else "load (after the transformer)",
    }
    ctx.plot("waveform.spectrum", data)
