"""Losses and junction temperature of each switch, R_DS(on) solved together with T_j.

The load current is the fundamental estimate of :mod:`reviewer.derive.operating` (a sinusoid
at the output frequency, lagging by the load's angle) until a waveform module publishes the
harmonics; every loss figure carries that assumption in its note.

Evaluates arrays (``VECTOR = True``, see :meth:`reviewer.quantities.Runner.batch`): where the
points differ in whether a steady junction temperature exists, or whether its peak passes
T_j,max, the module asks for the points in groups (:class:`reviewer.context.SplitPoints`), as
those points publish different quantities.
"""

from __future__ import annotations

import math
from typing import Any, Callable

import numpy as np

from reviewer.physics import pattern
from reviewer.physics import thermal as tp
from reviewer.physics.arrays import arr, is_array, out
from reviewer.context import SIDES, Ctx, NeedsData, SplitPoints, declare
from reviewer.units import render

VECTOR = True

TJ_MARGIN = 25.0
"""Margin below T_j,max the heatsink figure is solved for [°C]; the rule's default margin."""

FUNDAMENTAL = "from the load current's fundamental (harmonics not yet included)"
HARMONICS = ("the fundamental's per-switch split, scaled to the bridge current's true RMS "
             "from the harmonic spectrum (waveform.bridge_current_rms)")

QUANTITIES = declare(
    ("thermal.load_angle", "rad", "Load current lag behind the bridge voltage's fundamental"),
    ("thermal.{side}.device_rms", "A", "RMS channel current of the most loaded device"),
    ("thermal.{side}.device_switched", "A", "Mean current the most loaded device hard-switches "
     "per edge (I_pk/π for sine PWM; the edge current for a square wave)"),
    ("thermal.{side}.conduction_loss", "W", "Conduction loss per device at the solved T_j"),
    ("thermal.{side}.switching_loss", "W", "Switching loss per device: the four overlap "
     "intervals, C_oss and the other diode's reverse recovery"),
    ("thermal.{side}.recovery_loss", "W", "Reverse-recovery loss Q_rr·V·f_sw per device, in "
     "this (incoming) switch"),
    ("thermal.{side}.diode_loss", "W", "Body-diode loss in dead time per device"),
    ("thermal.{side}.power", "W", "Total loss per device at the solved T_j"),
    ("thermal.{side}.rth", "K/W", "Junction-to-ambient thermal resistance per device"),
    ("thermal.{side}.tj", "°C", "Junction temperature; not shown where no steady state at or "
     "below T_j,max exists"),
    ("thermal.{side}.verdict", "", "What the electro-thermal solution says", "text"),
    ("thermal.{side}.tj_peak", "°C", "Peak junction temperature over the output cycle: the "
     "mean plus the swing of a single-pole Z_th,jc while the device conducts"),
    ("thermal.{side}.rds_hot", "Ω", "R_DS(on) at the solved junction temperature"),
    ("thermal.{side}.runaway", "", "No steady junction temperature at or below T_j,max: "
     "thermal runaway or destruction", "flag"),
    ("thermal.{side}.rth_total_max", "K/W", "Largest junction-to-ambient resistance keeping "
     "T_j ≤ T_j,max − 25 °C"),
    ("thermal.{side}.rth_sa_max", "K/W", "Largest sink-to-ambient resistance keeping "
     "T_j ≤ T_j,max − 25 °C"),
)


def _each(fn: Callable[..., Any], *xs: Any) -> Any:
    """``fn`` (a function of floats) of every element of ``xs``: a float for scalars, else an
    array; a ``math`` function so gives, element by element, the scalar result to the last bit
    (numpy's arctan2 and arccos differ from the C library's in the last bit)."""
    if not is_array(*xs):
        return fn(*(float(x) for x in xs))
    given = np.broadcast_arrays(*(arr(x) for x in xs))
    return np.array([fn(*v) for v in zip(*(g.ravel().tolist() for g in given))],
                    dtype=float).reshape(given[0].shape)


def _or(x: Any, default: float) -> Any:
    """``x or default`` of the scalar code, element by element: ``default`` where ``x`` is None
    or 0."""
    if x is None:
        return default
    if is_array(x):
        return np.where(x == 0, default, x)
    return x or default


def _texts(fn: Callable[..., str], *xs: Any) -> Any:
    """The text ``fn`` makes of the values ``xs``: one text when no value differs between the
    points, else a list of texts, one per point (as a note may be)."""
    if not is_array(*xs):
        return fn(*xs)
    given = np.broadcast_arrays(*(arr(x) for x in xs))
    return [fn(*v) for v in zip(*(g.ravel().tolist() for g in given))]


def _text_value(texts: Any) -> Any:
    """A text quantity's value from :func:`_texts`: per-point texts as an array of texts."""
    return np.array(texts, dtype=str) if isinstance(texts, list) else texts


def _split(mask: Any) -> bool:
    """``mask`` as one bool when it is the same at every point; else ask for the points in
    groups (:class:`SplitPoints`): the two groups publish different quantities."""
    m = np.asarray(mask, dtype=bool)
    if m.ndim and m.any() and not m.all():
        raise SplitPoints(m)
    return bool(m.all()) if m.ndim else bool(m)


def load_angle(ctx: Ctx) -> Any:
    kind = ctx.v("load.kind")
    if kind == "r_l":
        r, l_ = ctx.need("load.resistance", "load.inductance")
        return out(_each(math.atan2, 2 * math.pi * ctx.need("output.frequency") * l_, r))
    if kind == "power_factor":
        return out(_each(math.acos, np.minimum(np.maximum(ctx.need("load.power_factor"), 0.0),
                                               1.0)))
    return 0.0


def derive(ctx: Ctx) -> None:
    with ctx.section("thermal.load_angle"):
        ctx.publish("thermal.load_angle", load_angle(ctx), "load inductance only; a transformer's "
                    "magnetising current is not included")
    kind = ctx.v("modulation.kind")
    spwm = kind not in ("square", "quasi_square")
    # the switching-pattern figures depend on the leg, not on the side asking: each is made
    # once per call and shared by both sides (they are the costly part of this module)
    made: dict[Any, Any] = {}

    def once(key: Any, make: Callable[[], Any]) -> Any:
        if key not in made:
            made[key] = make()
        return made[key]

    for side in SIDES:
        sw = f"switch.{side}"
        names = [f"thermal.{side}.{k}" for k in (
            "device_rms", "device_switched", "conduction_loss", "switching_loss", "diode_loss",
            "recovery_loss", "power", "rth", "tj", "verdict", "rds_hot", "runaway",
            "rth_total_max", "rth_sa_max")]
        solved = None
        with ctx.section(*names):
            i_pk = ctx.q("op.load_current_peak")
            phi = ctx.q("thermal.load_angle")
            alpha = _or(ctx.v("modulation.notch_angle"), 0.0)
            index = _or(ctx.v("modulation.index"), 1.0)
            n = int(ctx.v(f"{sw}.count"))
            zero = ctx.v("modulation.zero_state")
            c = once("currents", lambda: tp.switch_currents(kind, i_pk, phi, notch_angle=alpha,
                                                           index=index, zero_state=zero))

            def hard(s: str) -> Any:
                return once(("hard", s), lambda: pattern.hard_switching(kind, i_pk, phi,
                                                                        index=index, side=s))

            def switched(s: str) -> Any:
                return once(("switched", s), lambda: tp.switched_current(
                    kind, i_pk, phi, alpha, index=index, side=s, hard=hard(s) if spwm else None))

            rms = c.high_rms if side == "high" else c.low_rms
            basis: Any = FUNDAMENTAL
            if ctx.has("waveform.bridge_current_rms"):
                i_fund = ctx.q("op.load_current_rms")
                harmonic = np.asarray(i_fund) > 0
                if harmonic.any():
                    # harmonics add heating: scale the conduction current by the true RMS over
                    # the fundamental's (the split between switches follows the fundamental)
                    rms = np.where(harmonic, rms * (ctx.q("waveform.bridge_current_rms") / i_fund),
                                   rms)
                    basis = _texts(lambda h: HARMONICS if h else FUNDAMENTAL, harmonic)
            i_dev = out(tp.device_current(rms, n))
            i_sw = out(tp.device_current(switched(side), n))
            ctx.publish(f"thermal.{side}.device_rms", i_dev, basis)
            ctx.publish(f"thermal.{side}.device_switched", i_sw, FUNDAMENTAL)

            rds, coss, vf = ctx.need(f"{sw}.rds_on", f"{sw}.coss", f"{sw}.diode_vf")
            f_sw = ctx.q("op.switching_frequency")
            v = ctx.q("op.bus_max")
            # all four intervals; the datasheet or inductance-bounded current fall where longer
            t_sum = ctx.q(f"switching.{side}.overlap_time")
            if ctx.has(f"switching.{side}.current_fall"):
                t_sum = t_sum + np.maximum(ctx.q(f"switching.{side}.current_fall")
                                           - ctx.q(f"switching.{side}.tail"), 0.0)
            other = "low" if side == "high" else "high"
            qrr = ctx.v(f"switch.{other}.diode_qrr")
            # sine PWM: a device turns on against the other's diode only in the carrier periods
            # it hard-switches (half of them for bipolar and unipolar)
            share = hard(side).fraction if spwm else 1.0
            no_qrr = f"switch.{other}.diode_qrr not given: no recovery loss counted"
            if qrr is None:
                p_rr, rr_note = 0.0, no_qrr
            else:
                p_rr = out(np.where(arr(qrr) != 0,
                                    arr(tp.recovery_loss(qrr, v, f_sw, share)) / n, 0.0))
                rr_note = _texts(lambda q: "" if q else no_qrr, qrr)
            p_sw = tp.switching_loss(v, i_sw, t_sum, 0.0, f_sw) + tp.coss_loss(coss, v, f_sw) + p_rr
            dead = np.maximum(*(ctx.q(f"timing.{s}.dead_time") for s in SIDES))
            # sine PWM: the device's diode carries I_pk/π on average over both dead intervals of
            # every carrier period; stepped waves: one dead interval per period at the edge current
            # a device's diode carries the dead times of the edges the other device of its leg
            # hard-switches (the same current for bipolar and unipolar; level-shifted legs load
            # the low side's diode with the high side's edges)
            i_fw = out(tp.device_current(switched(other), n)) if spwm else i_sw / 2
            p_d = tp.body_diode_loss(vf, i_fw, dead, f_sw)
            ctx.publish(f"thermal.{side}.recovery_loss", p_rr, rr_note)
            ctx.publish(f"thermal.{side}.switching_loss", p_sw, FUNDAMENTAL)
            ctx.publish(f"thermal.{side}.diode_loss", p_d, FUNDAMENTAL)

            try:
                rth = tp.thermal_resistance(ctx.v(f"{sw}.rth_jc"), ctx.v(f"{sw}.rth_cs"),
                                            ctx.v(f"{sw}.rth_sa"), ctx.v(f"{sw}.rth_ja"))
            except ValueError:
                raise NeedsData(f"{sw}.rth_ja", f"{sw}.rth_jc", f"{sw}.rth_sa") from None
            ctx.publish(f"thermal.{side}.rth", rth)
            model = dict(rds_ref=rds, t_ref=ctx.v(f"{sw}.rds_on_temp"),
                         hot_factor=ctx.v(f"{sw}.rds_hot_factor"), t_hot=ctx.v(f"{sw}.rds_hot_temp"))
            ta = ctx.v("environment.ambient")
            tj_max = ctx.v(f"{sw}.tj_max")
            # a fixed point above T_j,max is no operating point: the part is destroyed on the
            # way there, and the on-resistance model is not valid beyond it; stop the search at
            # T_j,max and never report a temperature beyond it
            sol = tp.solve_junction_temperature(ta, rth, i_dev, p_other=p_sw + p_d,
                                                t_ceiling=tj_max, **model)
            # points with and without a steady state publish different quantities: in groups
            converged = _split(sol.converged)
            ctx.publish(f"thermal.{side}.runaway", not converged)
            if converged:
                ctx.publish(f"thermal.{side}.tj", out(sol.t_j))
                ctx.publish(f"thermal.{side}.rds_hot", out(sol.rds_on))
                ctx.publish(f"thermal.{side}.conduction_loss", out(sol.power - p_sw - p_d),
                            FUNDAMENTAL)
                ctx.publish(f"thermal.{side}.power", out(sol.power), FUNDAMENTAL)
                ctx.publish(f"thermal.{side}.verdict", "a steady junction temperature exists")
                solved = (out(sol.t_j), out(sol.power), tj_max)
            else:
                ctx.publish(f"thermal.{side}.verdict", _text_value(_texts(
                    lambda t: f"no steady junction temperature at or below T_j,max "
                              f"({t:g} °C): the junction either runs away or would settle "
                              f"beyond its maximum, which destroys the part", tj_max)))
            t_lim = tj_max - TJ_MARGIN
            total = tp.largest_total_resistance(t_lim, ta, i_dev, p_other=p_sw + p_d, **model)
            ctx.publish(f"thermal.{side}.rth_total_max", total,
                        f"for T_j ≤ T_j,max − {TJ_MARGIN:g} °C")
            jc = ctx.v(f"{sw}.rth_jc")
            if jc is not None:
                ctx.publish(f"thermal.{side}.rth_sa_max",
                            out(total - jc - _or(ctx.v(f"{sw}.rth_cs"), 0.0)),
                            f"for T_j ≤ T_j,max − {TJ_MARGIN:g} °C")
        if solved is not None:
            with ctx.section(f"thermal.{side}.tj_peak"):
                _peak(ctx, side, kind, *solved)


def _peak(ctx: Ctx, side: str, kind: str, t_mean: Any, power: Any, tj_max: Any) -> None:
    """Publish the peak junction temperature over the output cycle, where Z_th is given."""
    sw = f"switch.{side}"
    tau, jc = ctx.v(f"{sw}.zth_tau"), ctx.v(f"{sw}.rth_jc")
    if tau is None or jc is None:
        raise NeedsData(f"{sw}.zth_tau", f"{sw}.rth_jc")
    period = 1.0 / ctx.need("output.frequency")
    share = 0.5
    if kind == "quasi_square":
        # the device's on-share of the period, from the switching pattern
        on = pattern.on_share(kind, notch=_or(ctx.v("modulation.notch_angle"), 0.0),
                              zero_state=ctx.v("modulation.zero_state"))
        share = out(np.maximum(on[f"a_{side}"], on[f"b_{side}"]))
    # the whole loss taken as one pulse while the device conducts (conservative: a sinusoid's
    # loss is spread over the half cycle, and a quasi-square low side conducts in two parts)
    swing = out(tp.pulse_temperature_swing(power / share, jc, tau, share * period, period))
    peak = t_mean + swing
    # points whose peak passes T_j,max and points whose peak does not: in groups
    if _split(peak > tj_max):
        # never shown as a temperature: the part does not survive it
        ctx.publish(f"thermal.{side}.runaway", True)
        ctx.publish(f"thermal.{side}.verdict", _text_value(_texts(
            lambda t, z: f"a junction that peaks above T_j,max ({t:g} °C) in every output cycle "
                         f"(single-pole Z_th,jc, {render(z, 's')}), which destroys the part",
            tj_max, tau)))
        return
    ctx.publish(f"thermal.{side}.tj_peak", peak, _texts(
        lambda m, w, s: f"mean {m:.3g} °C plus {w:.3g} K swing over {s:.0%} of the period",
        t_mean, swing, share))
