"""The DC bus: ripple current in the bus capacitors, voltage ripple, local capacitance (§3.7)."""

from __future__ import annotations

import functools
import math

import numpy as np

from reviewer.physics import bus
from reviewer.physics.arrays import hypot, or_default, out
from reviewer.context import SIDES, Ctx, NeedsData, declare

QUANTITIES = declare(
    ("bus.power_factor", "", "Displacement power factor of the load at the bridge"),
    ("bus.ripple_2f", "A", "Bus ripple current at twice the output frequency, rms"),
    ("bus.ripple_switching", "A", "Bus capacitor ripple at the switching frequency, rms"),
    ("bus.ripple_current", "A", "Total bus capacitor ripple current, rms"),
    ("bus.voltage_ripple", "V", "Bus voltage ripple at twice the output frequency, peak to peak"),
    ("bus.pwm", "", "The bridge is pulse-width modulated (sine-triangle)", "flag"),
    ("bus.switching_voltage_ripple", "V", "Bus ripple at the switching frequency on all the bus capacitance, peak to peak"),
    ("bus.edge_time", "s", "Longest switching edge of the bridge"),
    ("bus.local_ripple", "V", "Dip across the local capacitor through one switching edge"),
)

VECTOR = True
"""Array-safe: evaluated once for many points by :meth:`reviewer.quantities.Runner.batch`."""

PWM_KINDS = {"spwm_bipolar": "bipolar", "spwm_unipolar": "unipolar",
             "spwm_level_shifted": "unipolar"}


def power_factor(ctx: Ctx) -> float:
    """Displacement power factor of the load at the output frequency [unitless]."""
    kind = ctx.v("load.kind")
    if kind == "power_factor":
        return ctx.need("load.power_factor")
    if kind == "r_l":
        r, l_ = ctx.need("load.resistance", "load.inductance")
        return r / hypot(r, 2 * math.pi * ctx.need("output.frequency") * l_)
    return 1.0


def derive(ctx: Ctx) -> None:
    kind = ctx.v("modulation.kind")
    pwm = kind in PWM_KINDS
    ctx.publish("bus.pwm", pwm)
    with ctx.section("bus.power_factor", "bus.ripple_2f", "bus.ripple_switching",
                     "bus.ripple_current", "bus.voltage_ripple"):
        pf = power_factor(ctx)
        ctx.publish("bus.power_factor", pf)
        i_dc = ctx.q("op.input_current")
        i_2f = bus.ripple_current_2f(i_dc, pf)
        ctx.publish("bus.ripple_2f", i_2f,
                    "I_dc / (√2 · cos φ) at the lowest bus, for a sinusoidal output current"
                    + ("" if pwm else "; an estimate for a stepped wave"))
        if pwm:
            m = ctx.need("modulation.index")
            i_sw = bus.ripple_current_switching(ctx.q("op.load_current_rms"), m, pf,
                                                PWM_KINDS[kind])
            note = ("sine-triangle PWM, carrier far above the output frequency"
                    + ("; level-shifted carriers taken as three-level"
                       if kind == "spwm_level_shifted" else ""))
        else:
            i_sw, note = 0.0, "a stepped wave switches at the output frequency: all ripple is low-frequency"
        ctx.publish("bus.ripple_switching", i_sw, note)
        ctx.publish("bus.ripple_current", bus.capacitor_ripple_rms(i_2f, i_sw))
        ctx.need("capacitors.bulk")
        ctx.publish("bus.voltage_ripple", bus.peak_to_peak(ctx.q("band.bus_ripple_2f")),
                    "the 2·f ripple of the band module (one bus figure): " +
                    ("carried by the capacitors alone" if ctx.v("source.kind") == "rectified_mains"
                     else "shared with the source by impedance"))
    if pwm:
        with ctx.section("bus.switching_voltage_ripple"):
            c = ctx.need("capacitors.bulk") + or_default(ctx.v("capacitors.local"), 0.0)
            ctx.publish("bus.switching_voltage_ripple",
                        bus.local_voltage_step(ctx.q("op.load_current_peak"),
                                               ctx.q("op.switching_frequency"), c),
                        "charge balance at duty ½, the worst case")
    with ctx.section("bus.edge_time", "bus.local_ripple"):
        edges = [ctx.q(f"switching.{s}.{k}") for s in SIDES
                 for k in ("rise_time", "fall_time", "tail") if ctx.has(f"switching.{s}.{k}")]
        if not edges:
            raise NeedsData("switch.high.qgd", "switch.low.qgd")
        t_edge = out(functools.reduce(np.maximum, edges))  # the longest, per point
        ctx.publish("bus.edge_time", t_edge)
        ctx.publish("bus.local_ripple",
                    bus.edge_voltage_step(ctx.q("op.load_current_peak"), t_edge,
                                          ctx.need("capacitors.local")),
                    "the peak load current drawn from the local capacitor through the longest edge")
