"""A simulation deck of one bridge leg and the output filter, at the corner the review judged.

:func:`build_deck` writes a plain SPICE3-syntax netlist (it runs unmodified in ``ngspice -b``)
from a :class:`reviewer.review.Review`: every element value is read from the review's published
quantities and design fields at one run of the sheet (:mod:`reviewer.deck.corner`), and a comment
line above each element names where it came from. Nothing here recomputes the review's physics;
the circuit is assembled from the values the review used.

What the deck holds
-------------------
- the bus: a DC source at the highest bus (the bus the switching and V_DS figures are at), its
  internal resistance, the bulk capacitor with its ESR and the local capacitor;
- one leg: each switch as a square-law (SPICE level 1) MOSFET with the design's threshold, sized
  to the review's Miller plateau at the peak load current and to R_DS(on) hot, with a body
  diode (sized to the given forward voltage), C_gd = C_rss, C_ds = C_oss − C_rss and C_gs making
  up the input capacitance the review's switching times use below and above the plateau; its
  gate drive as the design describes it: on and off levels, the stage's output resistances (or
  its current limits), the series gate resistors, the internal gate resistance and the pull
  resistor to the rail it ties to; the command of each switch with the dead time at this corner;
  the peak load current on the switch node, out of the leg for one commutation each way and into
  it for a second;
- the output filter and load, driven by the bridge voltage as a piecewise-linear source: the
  waveform the review's spectrum was computed from (:mod:`reviewer.deck.bridge`).

One analysis is active (``leg``: a transient over two commutations each way; ``filter``: a
transient of the PWL bridge voltage over whole output periods after settling; ``ac``: the
filter's frequency response); the other two are in the deck as comment lines.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Any

from reviewer.deck.bridge import BridgeEdges, bridge_edges, pwl_points, ramp_half_width
from reviewer.deck.corner import Corner, DeckError, Values, choose_corner

__all__ = ["ANALYSES", "Deck", "DeckError", "build_deck", "choose_corner", "write_deck"]

ANALYSES = ("leg", "filter", "ac")
SIDES = ("high", "low")
_SUFFIX = {"high": "h", "low": "l"}
_VT = 0.025865  # thermal voltage kT/q at 300.15 K [V]
_CLAMP_IS, _CLAMP_N = 1e-12, 0.3


def _clamp_drop(current: float) -> float:
    """Forward drop of the clamp diode model at ``current`` [A], in [V].

    References
    ----------
    The ideal-diode (Shockley) equation I = I_S·(exp(V / (N·V_T)) − 1), as SPICE's diode model
    uses it (Horowitz & Hill, *The Art of Electronics*, 3rd ed., §2.2.6; from memory).
    """
    return _CLAMP_N * _VT * math.log(current / _CLAMP_IS + 1)
_WIDTH = 96


@dataclass(frozen=True)
class Deck:
    """A written deck and what a reader (or a test) needs to find its way around it."""

    text: str
    corner: Corner
    analysis: str
    nodes: dict[str, str]
    """Roles to node names: ``high.gate`` (the internal gate), ``high.source``, ``high.pin``,
    ``low.gate``, ``low.source``, ``low.pin``, ``switch``, ``bus``, ``bridge``, ``out``."""
    edges: dict[str, float] = field(default_factory=dict)
    """Command edges of the leg analysis [s]: ``pos.low.off``, ``pos.high.on``, ``pos.high.off``,
    ``pos.low.on`` at the positive current peak, the same with ``neg.`` at the negative one."""
    measure: tuple[float, float] = (0.0, 0.0)
    """The filter analysis's whole output periods after settling: (start, stop) [s]."""
    f_out: float = 0.0
    """Output frequency [Hz]."""


def num(x: float) -> str:
    """A number as SPICE reads it: plain exponent notation, never a scale suffix."""
    if x == 0:
        return "0"
    return f"{x:.6g}"


def tnum(x: float) -> str:
    """A time in a PWL list, with enough digits for nanosecond edges over many milliseconds."""
    if x == 0:
        return "0"
    return f"{x:.12g}"


def _ascii(text: str) -> str:
    table = {"Ω": "ohm", "µ": "u", "μ": "u", "°": "deg", "±": "+/-", "≤": "<=", "≥": ">=",
             "−": "-", "·": "*", "²": "^2", "√": "sqrt", "…": "...", "–": "-", "—": "-"}
    out = "".join(table.get(ch, ch) for ch in str(text))
    return out.encode("ascii", "replace").decode("ascii")


class _Lines:
    """Netlist lines: full-line ``*`` comments (SPICE3 has no other kind) and elements."""

    def __init__(self) -> None:
        self.lines: list[str] = []

    def comment(self, text: str = "") -> None:
        words = _ascii(text).split()
        if not words:
            self.lines.append("*")
            return
        line, room = "*", _WIDTH
        for w in words:
            if len(line) + 1 + len(w) > room and line not in ("*", "*  "):
                self.lines.append(line)
                line = "*  "
            line += " " + w
        self.lines.append(line)

    def element(self, line: str, note: str = "") -> None:
        if note:
            self.comment(note)
        self.lines.append(_ascii(line))

    def continued(self, head: str, items: list[str], per_line: int = 8) -> None:
        """A long element (a PWL list) over continuation lines."""
        self.lines.append(_ascii(head))
        for i in range(0, len(items), per_line):
            self.lines.append("+ " + " ".join(items[i:i + per_line]))

    def blank(self) -> None:
        self.lines.append("")

    def text(self) -> str:
        return "\n".join(self.lines) + "\n"


_PREFIXES = ((1e9, "G"), (1e6, "M"), (1e3, "k"), (1.0, ""), (1e-3, "m"), (1e-6, "u"),
             (1e-9, "n"), (1e-12, "p"), (1e-15, "f"))
_UNITS = {"Ω": "ohm"}


def _unit(x: float, unit: str) -> str:
    """A value in engineering notation for a comment line, in ASCII (``4.7 kohm``, ``10 uF``)."""
    u = _UNITS.get(unit, unit)
    if x is None:
        return "not given"
    if not math.isfinite(x):
        return "infinite" if x > 0 else "minus infinite"
    if x == 0:
        return f"0 {u}".strip()
    for scale, prefix in _PREFIXES:
        if abs(x) >= scale * 0.9995:
            break
    return f"{x / scale:.3g} {prefix}{u}".strip()


# ------------------------------------------------------------------------------------------
# pieces of the circuit
# ------------------------------------------------------------------------------------------

def _bus(out: _Lines, v: Values) -> float:
    v_bus = v.need("op.bus_max", "the bus source")
    out.comment("--- DC bus " + "-" * 60)
    r_int = v.design("source.r_internal")
    if r_int:
        out.element(f"Vbus bat 0 DC {num(v_bus)}",
                    f"Bus source at op.bus_max = {_unit(v_bus, 'V')} (the highest bus: the "
                    "switching times and V_DS peak are judged there).")
        out.element(f"Rsrc bat bus {num(r_int)}",
                    f"Source internal resistance, source.r_internal = {_unit(r_int, 'Ω')}.")
    else:
        out.element(f"Vbus bus 0 DC {num(v_bus)}",
                    f"Bus source at op.bus_max = {_unit(v_bus, 'V')} (the highest bus: the "
                    "switching times and V_DS peak are judged there); no source.r_internal "
                    "given, so the source is ideal.")
    bulk, esr, local = (v.design("capacitors.bulk"), v.design("capacitors.esr"),
                        v.design("capacitors.local"))
    if bulk:
        if esr:
            out.element(f"Cbulk bus cbk {num(bulk)}",
                        f"Bulk capacitor, capacitors.bulk = {_unit(bulk, 'F')}, in series with "
                        f"its ESR, capacitors.esr = {_unit(esr, 'Ω')}.")
            out.element(f"Rbulk cbk 0 {num(esr)}")
        else:
            out.element(f"Cbulk bus 0 {num(bulk)}",
                        f"Bulk capacitor, capacitors.bulk = {_unit(bulk, 'F')} (no ESR given).")
    else:
        out.comment("No capacitors.bulk given: no bulk capacitor.")
    if local:
        out.element(f"Cloc bus 0 {num(local)}",
                    f"Local capacitor across the leg, capacitors.local = {_unit(local, 'F')} "
                    "(ideal: no ESR or ESL).")
    else:
        out.comment("No capacitors.local given: no local capacitor across the leg.")
    return v_bus


def _gate_capacitances(v: Values, side: str, n: int, v_drive: float,
                       v_bus: float) -> tuple[float, float, float, list[str]]:
    sw = f"switch.{side}"
    notes: list[str] = []
    ciss, crss, coss = v.design(f"{sw}.ciss"), v.design(f"{sw}.crss"), v.design(f"{sw}.coss")
    if ciss is None:
        qg = v.design(f"{sw}.qg")
        if qg is None or not v_drive:
            raise DeckError(f"the deck needs {sw}.ciss (or {sw}.qg) for the gate capacitance",
                            f"{sw}.ciss")
        ciss = qg / v_drive
        notes.append(f"C_iss not given: Q_g / V_GS(on) = {_unit(qg, 'C')} / "
                     f"{_unit(v_drive, 'V')}, an equivalent capacitance that moves the whole "
                     "gate charge over the drive swing")
    if crss is None:
        qgd = v.design(f"{sw}.qgd")
        if qgd is not None and v_bus:
            crss = qgd / v_bus
            notes.append(f"C_rss not given: Q_gd / V_bus = {_unit(qgd, 'C')} / "
                         f"{_unit(v_bus, 'V')}, the average over the drain swing")
        else:
            crss = 0.0
            notes.append("C_rss and Q_gd not given: no gate-drain capacitance")
    crss = min(crss, ciss)
    coss = coss if coss is not None else crss
    if v.design(f"{sw}.coss") is None:
        notes.append("C_oss not given: C_ds = 0")
    return ciss * n, crss * n, max(coss - crss, 0.0) * n, notes


def _split_capacitance(v: Values, side: str, ciss1: float) -> tuple[float, float, str]:
    """The input capacitance below and above the plateau that the review's switching times use
    (per device) [F], and a note.

    Where the review sizes its intervals from the gate charges
    (``reviewer.physics.switching.charge_capacitances``), the deck asks that same function with
    the same inputs; otherwise both are C_iss.
    """
    from reviewer.physics import switching as sp

    split = getattr(sp, "charge_capacitances", None)
    vpl = v.get(f"switching.{side}.v_plateau")
    if split is None or vpl is None:
        return ciss1, ciss1, "C_iss below and above the plateau, as the review's switching times"
    sw = f"switch.{side}"
    v_qg = v.design(f"{sw}.qg_vgs")
    v_qg = v.design(f"{sw}.rds_on_vgs") if v_qg is None else v_qg
    lo, hi = split(ciss1, v.design(f"{sw}.qg"), v.design(f"{sw}.qgs"), v.design(f"{sw}.qgd"),
                   vpl, v_qg)
    return float(lo), float(hi), ("the review's charge-based input capacitances "
                                  "(reviewer.physics.switching.charge_capacitances: Q_gs / V_pl "
                                  "below the plateau, (Q_g - Q_gs - Q_gd) / (V_Qg - V_pl) above "
                                  "it, C_iss where the charges are not given)")


def _switch_node_names(side: str, polarity: str) -> tuple[str, str]:
    """(drain, source) node names of a switch position."""
    if side == "low":
        return "sw", "0"
    return ("bus", "sw") if polarity == "n" else ("sw", "bus")


def _gate(out: _Lines, v: Values, side: str, v_bus: float, i_load: float,
          cmd: str) -> dict[str, str]:
    s, sw, dr = _SUFFIX[side], f"switch.{side}", f"drive.{side}"
    polarity = v.design(f"{sw}.polarity") or "n"
    sign = 1.0 if polarity == "n" else -1.0
    n = int(v.design(f"{sw}.count") or 1)
    own = bool(v.design(f"{sw}.own_gate_resistor", True)) and n > 1
    drain, source = _switch_node_names(side, polarity)
    v_on = v.need(f"switching.{side}.v_drive", f"the {side}-side on level")
    v_off = v.get(f"switching.{side}.v_off", 0.0) or 0.0
    vth = v.need(f"design.{sw}.vth", f"the {side}-side switch threshold")
    ciss, crss, cds, cnotes = _gate_capacitances(v, side, n, v_on, v_bus)
    r_used = v.get(f"switching.{side}.rg_internal_used")
    r_int = (r_used if r_used is not None else (v.design(f"{sw}.rg_internal") or 0.0)) / n
    rg = (v.design(f"{dr}.r_gate") or 0.0) / (n if own else 1)
    rg_off = v.design(f"{dr}.r_gate_off")
    rg_off = rg if rg_off is None else rg_off / (n if own else 1)
    r_src, r_snk = v.design(f"{dr}.r_source"), v.design(f"{dr}.r_sink")
    i_src, i_snk = v.design(f"{dr}.source_current"), v.design(f"{dr}.sink_current")
    pull_to = v.design(f"{dr}.pull_to") or "source"
    pull = v.design(f"{dr}.pull_resistor") if pull_to != "none" else None
    kind = v.design(f"{dr}.kind") or "stage"
    word = "N" if polarity == "n" else "P"

    out.blank()
    out.comment(f"--- {side} side: {word}-channel switch and its gate drive ({kind}) " + "-" * 20)
    est = []
    for q, label in (("td_on", "t_d(on)"), ("td_off", "t_d(off)"), ("tail", "current-fall tail"),
                     ("turn_off_time", "turn-off until cut-off"), ("v_plateau", "plateau")):
        x = v.get(f"switching.{side}.{q}")
        if x is not None:
            est.append(f"{label} {_unit(x, 'V' if q == 'v_plateau' else 's')}")
    if est:
        out.comment(f"The review's estimates for this switch at this corner: {', '.join(est)}.")
    levels = "source-referenced" if v.design(f"{dr}.levels_from") != "ground" else \
        "given from ground in the design, here as the V_GS they make (switching.*.v_drive, v_off)"
    gpin, gint = f"gp_{s}", f"gi_{s}"
    out.element(f"Von_{s} von_{s} {source} DC {num(sign * v_on)}",
                f"On level: V_GS = {_unit(sign * v_on, 'V')} (switching.{side}.v_drive at the "
                f"highest bus; {levels}).")
    out.element(f"Voff_{s} voff_{s} {source} DC {num(sign * v_off)}",
                f"Off level: V_GS = {_unit(sign * v_off, 'V')} (switching.{side}.v_off).")

    # turn-on path: the stage's source side, then the series gate resistor
    if r_src is not None:
        out.element(f"Son_{s} von_{s} ron_{s} {cmd} 0 SCMD",
                    "The stage's turn-on side, closed while the command is high.")
        _chain(out, f"ron_{s}", gpin, [
            (f"Rsrc_{s}", r_src, f"stage output resistance turning on, {dr}.r_source"),
            (f"Rg_{s}", rg, f"series gate resistor, {dr}.r_gate"
             + (f" / {n} (each device has its own)" if own else "")),
        ])
        if i_src is not None:
            out.comment(f"The stage's source current limit ({dr}.source_current = "
                        f"{_unit(i_src, 'A')}) is not modelled: the resistance above sets the "
                        "current (the review takes the slower of the two estimates).")
    elif i_src is not None:
        node = f"ion_{s}"
        a, b = (source, node) if sign > 0 else (node, source)
        out.element(f"Gon_{s} {a} {b} {cmd} 0 {num(i_src)}",
                    f"Current-limited turn-on: {dr}.source_current = {_unit(i_src, 'A')} out of "
                    "the stage while the command is high (no output resistance given), clamped at "
                    "the on level by a diode, then through the series gate resistor.")
        drop = _clamp_drop(i_src)
        out.element(f"Vclon_{s} clon_{s} {source} DC {num(sign * (v_on - drop))}",
                    f"The clamp's reference: the on level less the clamp diode's drop at "
                    f"{_unit(i_src, 'A')} ({_unit(drop, 'V')}), so that the stage stops at the on "
                    "level.")
        ca, cb = (node, f"clon_{s}") if sign > 0 else (f"clon_{s}", node)
        out.element(f"Dcon_{s} {ca} {cb} DCLAMP")
        _chain(out, node, gpin, [(f"Rg_{s}", rg, f"series gate resistor, {dr}.r_gate"
                                  + (f" / {n} (each device has its own)" if own else ""))])
    else:
        raise DeckError(f"the deck needs {dr}.r_source or {dr}.source_current for the turn-on "
                        "path", f"{dr}.r_source")

    # turn-off path
    if r_snk is not None:
        out.element(f"Soff_{s} voff_{s} rof_{s} 0 {cmd} SCMDN",
                    "The stage's turn-off side, closed while the command is low.")
        _chain(out, f"rof_{s}", gpin, [
            (f"Rsnk_{s}", r_snk, f"stage output resistance turning off, {dr}.r_sink"),
            (f"Rgo_{s}", rg_off, f"turn-off gate resistor, {dr}."
             + ("r_gate_off" if v.design(f"{dr}.r_gate_off") is not None else "r_gate")
             + (f" / {n}" if own else "")),
        ])
        if i_snk is not None:
            out.comment(f"The stage's sink current limit ({dr}.sink_current = "
                        f"{_unit(i_snk, 'A')}) is not modelled: the resistance above sets the "
                        "current.")
    elif i_snk is not None:
        node = f"iof_{s}"
        a, b = (node, source) if sign > 0 else (source, node)
        out.element(f"Goff_{s} {a} {b} one {cmd} {num(i_snk)}",
                    f"Current-limited turn-off: {dr}.sink_current = {_unit(i_snk, 'A')} into the "
                    "stage while the command is low (no output resistance given), clamped at the "
                    "off level by a diode, through the turn-off gate resistor.")
        drop = _clamp_drop(i_snk)
        out.element(f"Vcloff_{s} cloff_{s} {source} DC {num(sign * (v_off + drop))}",
                    f"The clamp's reference: the off level plus the clamp diode's drop at "
                    f"{_unit(i_snk, 'A')} ({_unit(drop, 'V')}).")
        ca, cb = (f"cloff_{s}", node) if sign > 0 else (node, f"cloff_{s}")
        out.element(f"Dcoff_{s} {ca} {cb} DCLAMP")
        _chain(out, node, gpin, [(f"Rgo_{s}", rg_off, f"turn-off gate resistor, {dr}."
                                  + ("r_gate_off" if v.design(f"{dr}.r_gate_off") is not None
                                     else "r_gate") + (f" / {n}" if own else ""))])
    else:
        out.comment("The stage has no turn-off side (no r_sink or sink_current): when the command "
                    "falls the stage lets go and the pull resistor alone discharges the gate.")

    if pull:
        target = {"source": source, "ground": "0", "bus": "bus"}[pull_to]
        out.element(f"Rpull_{s} {gpin} {target} {num(pull)}",
                    f"Pull resistor, {dr}.pull_resistor = {_unit(pull, 'Ω')}, to its "
                    f"{pull_to} ({dr}.pull_to), at the gate pin.")
    else:
        out.comment("No pull resistor: nothing holds the gate when the stage lets go.")
    r_name = (f"switching.{side}.rg_internal_used (the value the review's times use)"
              if r_used is not None else f"{sw}.rg_internal")
    _chain(out, gpin, gint, [(f"Rgi_{s}", r_int, f"internal gate resistance, {r_name}"
                              + (f" / {n}" if n > 1 else ""))])
    many = f" x {n} devices in parallel" if n > 1 else ""
    for note in cnotes:
        out.comment(note + ".")
    c_lo, c_hi, c_note = _split_capacitance(v, side, ciss / n)
    c_lo, c_hi = max(c_lo * n, crss), max(c_hi * n, crss)
    vpl = v.get(f"switching.{side}.v_plateau")
    base = min(c_lo, c_hi)
    out.element(f"Cgs_{s} {gint} {source} {num(base - crss)}",
                f"C_gs = C_in - C_rss{many}, with C_in = {_unit(c_lo, 'F')} below the plateau "
                f"and {_unit(c_hi, 'F')} above it: {c_note} (linear pieces: the real capacitance "
                "varies with voltage).")
    if vpl is not None and abs(c_hi - c_lo) > 1e-6 * base:
        above = c_hi > c_lo
        extra = abs(c_hi - c_lo)
        on_ctl = (f"{gint} {source}" if sign > 0 else f"{source} {gint}") if above else \
            (f"{source} {gint}" if sign > 0 else f"{gint} {source}")
        vt = vpl if above else -vpl
        out.element(f"Sxc_{s} {gint} xc_{s} {on_ctl} SXC_{s.upper()}",
                    f"The other {_unit(extra, 'F')} of C_gs, switched in while V_GS is "
                    f"{'above' if above else 'below'} the plateau "
                    f"(switching.{side}.v_plateau = {_unit(vpl, 'V')}); while out it is held at "
                    "the plateau, so it joins without a jump of charge.")
        # 1 mV of hysteresis: a gate that crosses the plateau slowly (a pull resistor alone)
        # would otherwise make the switch chatter and stop the transient ("timestep too small")
        out.element(f".model SXC_{s.upper()} SW(VT={num(vt)} VH=1e-3 RON=1e-3 ROFF=1e12)",
                    "1 mV of hysteresis about the plateau, for the simulator's sake.")
        out.element(f"Cxc_{s} xc_{s} {source} {num(extra)}")
        out.element(f"Rxc_{s} xc_{s} xr_{s} 1e8")
        out.element(f"Vxc_{s} xr_{s} {source} DC {num(sign * vpl)}")
    if crss > 0:
        out.element(f"Cgd_{s} {gint} {drain} {num(crss)}", f"C_gd = C_rss{many}, {sw}.crss.")
    if cds > 0:
        out.element(f"Cds_{s} {drain} {source} {num(cds)}",
                    f"C_ds = C_oss - C_rss{many}, from {sw}.coss.")

    rds = v.get(f"thermal.{side}.rds_hot")
    rds_note = f"thermal.{side}.rds_hot = {_unit(rds, 'Ω')} (hot)" if rds else ""
    if not rds:
        rds = v.design(f"{sw}.rds_on")
        rds_note = f"{sw}.rds_on = {_unit(rds, 'Ω')}" if rds else ""
    if not rds:
        rds, rds_note = 1e-3, "no R_DS(on) given: 1 mOhm assumed"
    rds /= n
    vpl = v.get(f"switching.{side}.v_plateau")
    i_ch = max(abs(i_load), 1e-3)
    if vpl is not None and vpl > vth:
        k = 2 * i_ch / (vpl - vth) ** 2
        k_note = (f"sized so that it carries the peak load current {_unit(i_ch, 'A')} at the "
                  f"review's Miller plateau, switching.{side}.v_plateau = {_unit(vpl, 'V')}")
    else:
        k = 2.0 / (rds * max(v_on - vth, 1e-3))
        k_note = "no plateau published: sized so that half of R_DS(on) is the channel"
    rd = rds - 1 / (k * max(v_on - vth, 1e-3))
    if rd < 0:
        rd = 0.0
        k_note += "; at the on level its channel is below R_DS(on), so no series resistance"
    mtype = "NMOS" if sign > 0 else "PMOS"
    name = f"MCH_{s.upper()}"
    out.element(f"M{s}ch {drain} {gint} {source} {source} {name} L=1e-06 W=1e-06",
                f"The channel: a square-law (SPICE level 1) {mtype} with V_th = {_unit(vth, 'V')} "
                f"({sw}.vth at this corner), {k_note}, and R_DS(on) = {rds_note}"
                + (f" / {n}" if n > 1 else "") + " at the on level (the rest as drain "
                "resistance). It makes a plateau where the real part would, but it is not a "
                "datasheet model: its capacitances are the linear ones above, so the plateau "
                f"lasts C_rss x V_bus of charge rather than Q_gd.")
    vto = vth if sign > 0 else -vth
    out.element(f".model {name} {mtype}(LEVEL=1 VTO={num(vto)} KP={num(k)} RD={num(rd)} "
                "LAMBDA=0 IS=1e-30)")
    vf = v.design(f"{sw}.diode_vf")
    i_ref = max(abs(i_load) / n, 1e-3)
    if vf:
        is_ = i_ref / math.exp(vf / _VT)
        dnote = (f"Body diode: {sw}.diode_vf = {_unit(vf, 'V')} at the peak load current "
                 f"{_unit(i_ref, 'A')} per device (an exponential diode, no reverse recovery).")
    else:
        is_ = 1e-14
        dnote = "Body diode: no diode_vf given, a generic diode (no reverse recovery)."
    da, dc = (source, drain) if sign > 0 else (drain, source)
    out.element(f"Dbd_{s} {da} {dc} DBODY_{s.upper()}", dnote)
    out.element(f".model DBODY_{s.upper()} D(IS={num(is_ * n)} N=1)")
    return {f"{side}.gate": gint, f"{side}.pin": gpin, f"{side}.source": source,
            f"{side}.drain": drain}


def _chain(out: _Lines, a: str, b: str, parts: list[tuple[str, float, str]]) -> None:
    """Resistors in series from node ``a`` to node ``b``; zero ones are left out (and said)."""
    live = [(name, r, note) for name, r, note in parts if r and r > 0]
    for name, r, note in parts:
        if not (r and r > 0):
            out.comment(f"No {note} (0 Ohm).")
    if not live:
        out.element(f"R0_{a} {a} {b} 1e-6", "A wire (1 uOhm) where every resistor is 0.")
        return
    nodes = [a] + [f"{a}_{i}" for i in range(1, len(live))] + [b]
    for (name, r, note), x, y in zip(live, nodes, nodes[1:]):
        out.element(f"{name} {x} {y} {num(r)}", f"{note[0].upper()}{note[1:]} = {_unit(r, 'Ω')}.")


def _pwl_steps(level0: int, steps: list[float], ramp: float,
               dense: dict[int, tuple[float, float]] | None = None) -> list[str]:
    """A 0/1 V command starting at ``level0`` and toggling at each time of ``steps``.

    ``dense`` maps the level an edge goes to (1 or 0) to (spacing, length): after such an
    edge, points of unchanged value every ``spacing`` for ``length``. Each PWL point is a
    breakpoint for the simulator, so this keeps its time step fine where a current-limited
    stage charges a gate along a straight line (no curvature, so nothing else would).
    """
    h = ramp / 2
    pts, level = [(0.0, level0)], level0
    for i, t in enumerate(steps):
        pts += [(t - h, level), (t + h, 1 - level)]
        level = 1 - level
        if dense and level in dense:
            spacing, length = dense[level]
            end = min(t + length, steps[i + 1] - ramp) if i + 1 < len(steps) else t + length
            k = 1
            while t + h + k * spacing < end:
                pts.append((t + h + k * spacing, level))
                k += 1
    return [f"{tnum(t)} {x}" for t, x in pts]


def _dense(v: Values, side: str) -> dict[int, tuple[float, float]]:
    """Where a current-limited stage needs a fine time step: after its on (1) or off (0) edges."""
    dr = f"drive.{side}"
    out: dict[int, tuple[float, float]] = {}

    def finite(*names: str) -> list[float]:
        xs = [v.get(f"switching.{side}.{n}") for n in names]
        return [x for x in xs if isinstance(x, (int, float)) and math.isfinite(x) and x > 0]

    if v.design(f"{dr}.r_source") is None and v.design(f"{dr}.source_current") is not None:
        short, whole = finite("td_on"), finite("turn_on_time")
        if short and whole:
            out[1] = (min(short) / 25, 3 * max(whole))
    if v.design(f"{dr}.r_sink") is None and v.design(f"{dr}.sink_current") is not None:
        short, whole = finite("td_off"), finite("turn_off_time")
        if short and whole:
            out[0] = (min(short) / 25, 3 * max(whole))
    return out


def _leg_timing(v: Values) -> dict[str, float]:
    """Command edges and the transient's length and step, from the review's own estimates.

    Two commutations each way: at the positive peak of the load current (out of the leg: the
    high side switches hard, the low side's body diode freewheels) and at the negative peak (the
    low side switches hard). Between them, while the low side is on, the current reverses.
    """
    times = [v.get(f"switching.{s}.{q}") for s in SIDES
             for q in ("turn_on_time", "turn_off_time", "td_on", "td_off", "tail")]
    finite = [t for t in times if isinstance(t, (int, float)) and math.isfinite(t) and t > 0]
    slow = max(finite) if finite else 10e-6
    fast = min(finite) if finite else 10e-9
    d_h = v.get("timing.high.dead_time") or 0.0
    d_l = v.get("timing.low.dead_time") or 0.0
    hold = max(3 * slow, 100e-9, 3 * max(d_h, d_l))
    lead = max(hold / 10, 20e-9)
    e: dict[str, float] = {}
    t = lead
    for half in ("pos", "neg"):
        e[f"{half}.low.off"] = t
        e[f"{half}.high.on"] = t + d_h
        e[f"{half}.high.off"] = e[f"{half}.high.on"] + hold
        e[f"{half}.low.on"] = e[f"{half}.high.off"] + d_l
        t = e[f"{half}.low.on"] + (3 * hold if half == "pos" else hold)
    e["reverse.start"] = e["pos.low.on"] + hold
    e["reverse.end"] = e["pos.low.on"] + 2 * hold
    step = max(fast / 20, t / 40000)
    delays = [x for x in (v.get(f"switching.{s}.{q}") for s in SIDES for q in ("td_on", "td_off"))
              if isinstance(x, (int, float)) and math.isfinite(x) and x > 0]
    ramp = min(1e-9, (min(delays) if delays else fast) / 50)
    return {**e, "stop": t, "step": step, "ramp": ramp, "hold": hold}


def _load(v: Values) -> tuple[float | None, float]:
    """Load resistance and series inductance at the bridge side of any transformer [Ω, H]."""
    ratio = v.get("op.transformer_ratio") or 1.0
    kind = v.design("load.kind") or "resistive"
    f0 = v.need("design.output.frequency", "the output frequency")
    v_out = v.get("op.output_rms")
    if kind == "resistive":
        r = v.design("load.resistance")
        if r is None:
            p = v.design("load.power")
            if p is None or v_out is None:
                return None, 0.0
            r = v_out ** 2 / p
        l_ = 0.0
    elif kind == "r_l":
        r, l_ = v.design("load.resistance"), v.design("load.inductance") or 0.0
    else:
        p, pf = v.design("load.power"), v.design("load.power_factor")
        if p is None or pf is None or v_out is None:
            return None, 0.0
        z = v_out ** 2 * pf / p
        r, l_ = z * pf, z * math.sqrt(max(1 - pf * pf, 0.0)) / (2 * math.pi * f0)
    if r is None:
        return None, 0.0
    return r / ratio ** 2, l_ / ratio ** 2


def _edges(v: Values) -> BridgeEdges:
    kind = v.need("design.modulation.kind", "the modulation")
    dead = v.design("timing.dead_time") or 0.0
    dh, dl = v.design("timing.dead_time_high"), v.design("timing.dead_time_low")
    return bridge_edges(
        kind, v.need("design.output.frequency", "the output frequency"),
        index=v.design("modulation.index"), carrier=v.design("modulation.carrier"),
        notch=v.design("modulation.notch_angle") or 0.0,
        dead_time_high=dead if dh is None else dh, dead_time_low=dead if dl is None else dl,
        current_lag=v.get("waveform.current_lag", 0.0) or 0.0,
        min_pulse=v.design("modulation.min_pulse") or 0.0,
        zero_state=v.design("modulation.zero_state") or "low_sides")


def _slowest_time_constant(l_f: float, c_f: float, dcr: float, r_load: float | None,
                           l_load: float, rd: float | None, cd: float | None,
                           esr: float = 0.0) -> float | None:
    """The filter's slowest time constant, 1 / min |Re p| over the poles of v_out / v_ab [s].

    Analysis setup only (how long to let the transient settle), from the deck's own elements:
    H = 1 / (1 + Z_s·Y_p) with Z_s = r_L + sL and Y_p = sC / (1 + sC·ESR) + Y_d + Y_load
    written as polynomials in s.

    References
    ----------
    A pole s = σ + jω decays as exp(σt); Erickson & Maksimović, *Fundamentals of Power
    Electronics*, 2nd ed., 2001, ch. 8 (poles of second-order responses).
    """
    from numpy.polynomial import polynomial as P

    num, den = [0.0, c_f], [1.0, c_f * esr]  # Y_p = num / den, ascending powers of s

    def add(n2: list[float], d2: list[float]) -> None:
        nonlocal num, den
        num = P.polyadd(P.polymul(num, d2), P.polymul(n2, den))
        den = P.polymul(den, d2)

    if rd:
        add([0.0, cd], [1.0, cd * rd]) if cd else add([1.0], [rd])
    if r_load is not None:
        add([1.0], [r_load, l_load])
    poles = P.polyroots(P.polyadd(den, P.polymul([dcr, l_f], num)))
    rates = [abs(p.real) for p in poles if p.real < 0]
    return 1 / min(rates) if rates and len(rates) == len(poles) else None


def _filter(out: _Lines, v: Values, settling: bool) -> tuple[BridgeEdges, float]:
    out.blank()
    out.comment("--- Output filter and load, driven by the bridge voltage " + "-" * 30)
    edges = _edges(v)
    v_nom = v.need("op.bus_nom", "the bridge voltage's level")
    l_f, c_f = v.design("filter.inductance") or 0.0, v.design("filter.capacitance") or 0.0
    # the winding resistance and capacitor ESR the review used (it may assume them where the
    # design gives none), else the design's
    dcr_name = "filter.inductor_dcr" if v.get("filter.inductor_dcr") is not None \
        else "design.filter.inductor_dcr"
    dcr = v.get(dcr_name) or 0.0
    esr_name = "filter.capacitor_esr" if v.get("filter.capacitor_esr") is not None \
        else "design.filter.capacitor_esr"
    esr = v.get(esr_name) or 0.0
    rd, cd = v.design("filter.damping_resistance"), v.design("filter.damping_capacitance")
    r_load, l_load = _load(v)
    h = ramp_half_width(edges)
    kind = v.design("modulation.kind")
    m = v.design("modulation.index")
    what = f"{kind}" + (f", index {m:.4g}" if m is not None else "") + (
        f", carrier {_unit(edges.carrier, 'Hz')}" if edges.carrier else "")
    settle = 0.0
    if settling:
        tau = _slowest_time_constant(l_f, c_f, dcr, r_load, l_load, rd, cd, esr) if l_f and c_f \
            else None
        limit = 4 * edges.period
        settle = limit if tau is None else min(8 * tau, limit)
        span = (f"{_unit(settle, 's')} to settle (8 x the filter's slowest time constant, "
                f"{_unit(tau, 's')}" + (", capped at four windows" if 8 * tau > limit else "")
                + ")" if tau is not None else
                f"{_unit(settle, 's')} to settle (four windows: no decaying time constant found)")
        span += f", then one window of {edges.periods} output period(s) to measure"
    else:
        span = (f"one window of {edges.periods} output period(s); the filter starts from rest, "
                "so its first milliseconds are a start-up transient (`reviewer deck --analysis "
                "filter` writes the deck with time to settle first)")
    pts = pwl_points(edges, v_nom, settle, 1, h)
    out.comment(f"The bridge voltage v_ab the review's spectrum was computed from ({what}, at "
                f"op.bus_nom = {_unit(v_nom, 'V')}, dead time by the current's direction, "
                f"short pulses dropped): {span}. Each edge ramps over "
                f"{_unit(2 * h, 's')}, centred on it, so every pulse keeps its volt-seconds. The "
                "full-bridge output is drawn as one source to ground: the filter sees v_ab.")
    level = {x: num(x) for x in {x for _, x in pts}}
    out.continued("Vab ab 0 AC 1 PWL(", ["%.12g %s" % (t, level[x]) for t, x in pts] + [")"])
    if l_f:
        nxt = "lf" if dcr else "out"
        out.element(f"Lf ab {nxt} {num(l_f)}", f"Filter inductor, filter.inductance = "
                    f"{_unit(l_f, 'H')} (linear: no saturation).")
        if dcr:
            out.element(f"Rdcr lf out {num(dcr)}",
                        f"Its winding resistance, {dcr_name} = {_unit(dcr, 'Ω')}"
                        + (" (the value the review used)" if not dcr_name.startswith("design.")
                           else "") + ".")
    else:
        out.element("Rnof ab out 1e-6", "No filter.inductance: the output is the bridge voltage.")
    if c_f and esr:
        out.element(f"Cf out cesr {num(c_f)}",
                    f"Filter capacitor, filter.capacitance = {_unit(c_f, 'F')}, in series with "
                    f"its ESR, {esr_name} = {_unit(esr, 'Ω')}.")
        out.element(f"Resr cesr 0 {num(esr)}")
    elif c_f:
        out.element(f"Cf out 0 {num(c_f)}",
                    f"Filter capacitor, filter.capacitance = {_unit(c_f, 'F')} (no ESR).")
    if rd:
        if cd:
            out.element(f"Rd out dmp {num(rd)}", f"Damping branch: filter.damping_resistance = "
                        f"{_unit(rd, 'Ω')} in series with filter.damping_capacitance = "
                        f"{_unit(cd, 'F')}.")
            out.element(f"Cd dmp 0 {num(cd)}")
        else:
            out.element(f"Rd out 0 {num(rd)}",
                        f"Damping resistor, filter.damping_resistance = {_unit(rd, 'Ω')}.")
    ratio = v.get("op.transformer_ratio") or 1.0
    at = "" if ratio == 1 else f", referred to the bridge side of the transformer (ratio {ratio:.4g})"
    if r_load is None:
        out.comment("No load given: the output is open.")
    elif l_load:
        out.element(f"Rload out ld {num(r_load)}",
                    f"Load: {_unit(r_load, 'Ω')} in series with {_unit(l_load, 'H')} (from "
                    f"load.kind = {v.design('load.kind')} at op.output_rms){at}.")
        out.element(f"Lload ld 0 {num(l_load)}")
    else:
        out.element(f"Rload out 0 {num(r_load)}",
                    f"Load: {_unit(r_load, 'Ω')} (load.resistance, or op.output_rms^2 / "
                    f"load.power){at}.")
    return edges, settle


def build_deck(review: Any, corner: str | Any = "worst", analysis: str = "leg") -> Deck:
    """The deck of one leg and the output filter at ``corner``.

    Parameters
    ----------
    review : reviewer.review.Review
        The review whose published quantities the deck is built from.
    corner : str or Finding
        ``"typical"``, ``"worst"`` or a finding (see :func:`reviewer.deck.corner.choose_corner`).
    analysis : str
        The active analysis: ``leg``, ``filter`` or ``ac`` (:data:`ANALYSES`).

    Returns
    -------
    Deck

    Raises
    ------
    DeckError
        When the design lacks a value the circuit needs (the message names the field).
    """
    if analysis not in ANALYSES:
        raise DeckError(f"unknown analysis {analysis!r}: expected one of {', '.join(ANALYSES)}")
    c = choose_corner(review, corner)
    v = Values(review.sheet, c.run)
    out = _Lines()
    d = review.design.design
    title = getattr(d, "title", "") or "design"
    rev = getattr(d, "revision", "")
    out.lines.append(_ascii(f"Bridge Reviewer deck: {title}" + (f", revision {rev}" if rev else "")))
    out.comment(f"Design file: {review.path}")
    out.comment(f"Corner: {c.label}.")
    out.comment(f"Inputs at this corner: {c.describe()}.")
    out.comment("Every value below is the review's own (a published quantity or a design field at "
                "this corner); the comment above each element names it.")
    out.comment()
    out.comment("What this deck is for: the timing of one leg's commutation (gate networks, dead "
                "time, shoot-through) and the output filter's response. It is not a device "
                "model. Simplifications:")
    for line in (
        "- each channel is a square-law (SPICE level 1) MOSFET with the design's V_th, sized to "
        "the review's Miller plateau at the peak load current and to R_DS(on) hot: not a "
        "datasheet model, and no temperature, subthreshold or breakdown behaviour",
        "- gate capacitances are linear (C_iss, C_rss and C_oss are small-signal figures)",
        "- body diodes are exponential diodes with no reverse recovery",
        "- no loop or common-source inductance, so no ringing (the review's "
        "stress.*.overshoot is the estimate)",
        "- each gate drive is referenced to its switch's source (a bootstrap or isolated "
        "supply, or a ground-referenced stage as the V_GS it makes); no bootstrap droop, "
        "no supply ripple",
        "- the leg's switch node carries the peak load current from a current source (over a "
        "commutation the filter inductor holds its current), out of the leg for the first "
        "pair of edges and into it for the second",
        "- the filter is fed by the bridge voltage as a PWL source (the review's waveform), "
        "not by the switching leg; magnetics are linear; the transformer, if any, is ideal",
    ):
        out.comment(line)
    out.comment()
    out.comment("Analyses: one is active, the other two are written as comments below (remove "
                "the leading '*' of one and add it to the other). `reviewer deck DESIGN "
                "--analysis leg|filter|ac` writes the deck with that one active.")
    out.blank()
    out.element("Vone one 0 DC 1", "A 1 V rail for the inverted commands of current-limited stages.")
    out.element(".model SCMD SW(VT=0.5 VH=0 RON=1e-3 ROFF=1e9)",
                "Command switches of the drive stages: 1 mOhm closed, 1 GOhm open.")
    out.element(".model SCMDN SW(VT=-0.5 VH=0 RON=1e-3 ROFF=1e9)")
    out.element(f".model DCLAMP D(IS={num(_CLAMP_IS)} N={num(_CLAMP_N)} CJO=1e-12)",
                "The clamp diode of current-limited stages (a soft exponential and 1 pF, for the "
                "simulator's sake; its drop is taken out of the clamp's reference).")
    out.blank()
    v_bus = _bus(out, v)
    i_load = v.get("op.load_current_peak") or 0.0
    t = _leg_timing(v)
    out.blank()
    out.comment("--- Commands: 1 V = on. Dead time before the high side turns on: "
                f"timing.high.dead_time = {_unit(t['pos.high.on'] - t['pos.low.off'], 's')}; "
                f"before the low side turns on: timing.low.dead_time = "
                f"{_unit(t['pos.low.on'] - t['pos.high.off'], 's')}"
                + ("; one signal and its inverse feed the leg (drive.shared_signal)"
                   if v.design("drive.shared_signal") else "") + ".")
    hi = [t[f"{h}.high.{x}"] for h in ("pos", "neg") for x in ("on", "off")]
    lo = [t[f"{h}.low.{x}"] for h in ("pos", "neg") for x in ("off", "on")]
    out.comment("High-side command: on at " + ", ".join(_unit(x, 's') for x in hi[::2])
                + "; off at " + ", ".join(_unit(x, 's') for x in hi[1::2]) + ".")
    out.continued("Vcmd_h cmd_h 0 PWL(", _pwl_steps(0, hi, t["ramp"], _dense(v, "high")) + [")"])
    out.comment("Low-side command: off at " + ", ".join(_unit(x, 's') for x in lo[::2])
                + "; on again at " + ", ".join(_unit(x, 's') for x in lo[1::2]) + ".")
    out.continued("Vcmd_l cmd_l 0 PWL(", _pwl_steps(1, lo, t["ramp"], _dense(v, "low")) + [")"])
    if _dense(v, "high") or _dense(v, "low"):
        out.comment("The extra points after some edges change nothing: each is a breakpoint that "
                    "keeps the simulator's step fine while a current-limited stage charges a gate "
                    "along a straight line.")
    nodes: dict[str, str] = {"switch": "sw", "bus": "bus", "bridge": "ab", "out": "out"}
    for side in SIDES:
        nodes.update(_gate(out, v, side, v_bus, i_load, f"cmd_{_SUFFIX[side]}"))
    out.blank()
    r0, r1 = t["reverse.start"], t["reverse.end"]
    out.element(f"Iload sw 0 PWL(0 {num(i_load)} {tnum(r0)} {num(i_load)} {tnum(r1)} "
                f"{num(-i_load)})",
                f"Load current out of the leg at its peak, op.load_current_peak = "
                f"{_unit(i_load, 'A')} (the current the review's plateau and overshoot use), for "
                "the first commutation each way (the high side switches hard); it reverses "
                f"between {_unit(r0, 's')} and {_unit(r1, 's')}, while the low side is on, for the "
                "second (the low side switches hard).")
    edges, settle = _filter(out, v, settling=analysis == "filter")
    f0 = v.need("design.output.frequency", "the output frequency")
    measure = (settle, settle + edges.period)

    out.blank()
    out.comment("--- Analyses " + "-" * 70)
    out.element(".options method=gear abstol=1e-9 noopiter",
                "Gear integration: the leg's picosecond time constants (milliohm channels across "
                "picofarads) make the trapezoidal rule ring and crawl. Current tolerance 1 nA "
                "(the default is 1 pA): the branch currents of the floating sources on the switch "
                "node (nearly zero, but computed from amperes) otherwise never settle to 1 pA, "
                "and the step shrinks until the run stops ('timestep too small'); the smallest "
                "current the deck means (a pull resistor's) is microamperes or more. The operating "
                "point goes straight to gmin stepping (noopiter): a direct solve finds the "
                "matrix singular at some corners before stepping recovers.")
    fc = edges.carrier or 100 * f0  # square waves: resolve harmonics to the 100th
    f_lc = v.get("filter.corner") or fc
    cards = {
        "leg": (f".tran {num(t['step'])} {num(t['stop'])} 0 {num(t['step'])}",
                "leg: two commutations each way (load current out of the leg, then into it), "
                "the high side turning on after the low side turns off, then back"),
        "filter": (f".tran {num(1 / (fc * 20))} {num(measure[1])} 0 {num(1 / (fc * 20))}",
                   "filter: the PWL bridge voltage into the filter and load; "
                   + (f"measure over {_unit(measure[0], 's')} .. {_unit(measure[1], 's')} (whole "
                      "output periods after settling)" if analysis == "filter" else
                      "this deck's source holds one window from rest; write the deck with "
                      "--analysis filter for one that settles first")),
        "ac": (f".ac dec 100 {num(f0 / 10)} {num(10 * max(fc, f_lc))}",
               "ac: the filter's response v(out) / v(ab) (the bridge source has AC 1)"),
    }
    for name in ANALYSES:
        card, note = cards[name]
        out.comment(note + ":")
        out.lines.append(card if name == analysis else "*" + card)
    out.lines.append(".end")
    return Deck(out.text(), c, analysis, nodes,
                {k: x for k, x in t.items() if k.startswith(("pos.", "neg."))}, measure, f0)



def write_deck(review: Any, path: Any, corner: str | Any = "worst", analysis: str = "leg") -> Deck:
    """Build the deck (see :func:`build_deck`) and write it to ``path`` atomically.

    A finding with no corner of its own (a flag, a question, a check that lacked data) gives the
    ``worst`` deck. Raises :class:`DeckError` for a design the deck cannot be built from, and
    ``OSError`` for a file that cannot be written.
    """
    from pathlib import Path

    from reviewer.atomic import write_text
    from reviewer.findings import Finding

    if isinstance(corner, Finding) and (corner.outcome not in ("fail", "pass") or
                                        corner.margin is None):
        corner = "worst"
    deck = build_deck(review, corner, analysis)
    target = Path(path)
    if not target.parent.is_dir():
        raise DeckError(f"no such folder {str(target.parent)!r} to write the deck into")
    write_text(target, deck.text)
    return deck
