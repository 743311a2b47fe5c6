"""Pictures drawn with characters: the gate timing of a leg, and the output spectrum.

Pure functions of the calculation sheet: they read published quantities and picture data and
return lines of text that read without colour (levels are block characters, the shoot-through
overlap is drawn with its own character and named in words). They scale and place what the
derive step computed; they compute no physics.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from reviewer.quantities import Sheet
from reviewer.report.timing import (OTHER, SHOOT_THROUGH, Edge, corner_text, edge, typical,
                                     worst_run)
from reviewer.units import render

ON, OFF, EDGE, OVERLAP = "█", "▁", "▒", "▓"


def _nice_step(span: float, ticks: int) -> float:
    raw = span / max(ticks, 1)
    mag = 10 ** math.floor(math.log10(raw))
    for m in (1, 2, 5, 10):
        if raw <= m * mag:
            return m * mag
    return 10 * mag


def _axis(t0: float, t1: float, width: int, lead: str) -> list[str]:
    step = _nice_step(t1 - t0, max(2, width // 14))
    ticks = [k * step for k in range(math.ceil(t0 / step), math.floor(t1 / step) + 1)]
    marks = [" "] * width
    labels = [" "] * width
    for t in ticks:
        c = round((t - t0) / (t1 - t0) * (width - 1))
        if not 0 <= c < width:
            continue
        marks[c] = "┴"
        text = "0" if t == 0 else render(t, "s")
        start = max(0, min(c - len(text) // 2, width - len(text)))
        if all(ch == " " for ch in labels[max(0, start - 1):start + len(text) + 1]):
            labels[start:start + len(text)] = list(text)
    pad = " " * len(lead)
    return [lead + "".join(marks).replace(" ", "─"), pad + "".join(labels)]


_DRAWN = set(ON + OFF + EDGE + OVERLAP + "┴─├┤┃▌┗")


def wrap_text(lines: list[str], total: int) -> list[str]:
    """Wrap the sentences among ``lines`` to ``total`` columns; drawn rows are kept as they are
    (they are made to fit)."""
    import textwrap

    out: list[str] = []
    for line in lines:
        if len(line) <= total or any(ch in _DRAWN for ch in line):
            out.append(line)
            continue
        indent = len(line) - len(line.lstrip(" "))
        out += textwrap.wrap(line, max(total, 20), subsequent_indent=" " * (indent + 2),
                             break_on_hyphens=False) or [""]
    return out


LEAD = 14
"""Columns of a timing diagram's row labels."""


def _t_end(e: Edge) -> float:
    dead = e.dead or 0.0
    if e.has_switching:
        ends = [dead, e.off_total, dead + e.td_on + e.rise]
    else:
        ends = [dead]
    return max(ends) * 1.2 if max(ends) > 0 else 200e-9


def timing_lines(e: Edge, width: int = 60, t_end: float | None = None,
                 heading: str | None = None) -> list[str]:
    """Lines of a timing diagram for one edge; ``width`` is the plot's width in columns and
    ``t_end`` the end of its time axis [s] (to draw two corners on one scale)."""
    width = max(width, 20)
    dead = e.dead or 0.0
    lead_w = 14
    if e.has_switching:
        on_start = dead + e.td_on
        on_full = on_start + e.rise
    t_end = t_end or _t_end(e)
    t0, t1 = -0.12 * t_end, t_end
    span = t1 - t0

    def col(t: float) -> int:
        return max(0, min(width - 1, round((t - t0) / span * (width - 1))))

    def trace(segments: list[tuple[float, float, str]], base: str = OFF) -> str:
        row = [base] * width
        for a, b, ch in segments:
            for c in range(col(a), col(b) + (1 if b >= t1 else 0)):
                row[c] = ch
            if b > a and col(a) == col(b):
                row[col(a)] = ch
        return "".join(row)

    inc, out = e.incoming, e.outgoing
    lines = [heading or f"outgoing {out} side off, then incoming {inc} side on", ""]
    lines.append(f"{(out + ' gate cmd'):<{lead_w}}" + trace([(t0, 0.0, ON)]))
    if e.has_switching:
        lines.append(f"{(out + ' channel'):<{lead_w}}" +
                     trace([(t0, e.td_off, ON), (e.td_off, e.off_total, EDGE)]))
    lines.append(f"{(inc + ' gate cmd'):<{lead_w}}" + trace([(dead, t1, ON)]))
    if e.has_switching:
        lines.append(f"{(inc + ' channel'):<{lead_w}}" +
                     trace([(on_start, on_full, EDGE), (on_full, t1, ON)]))
    # dead time span
    row = [" "] * width
    a, b = col(0.0), col(dead)
    if b > a:
        row[a], row[b] = "├", "┤"
        for c in range(a + 1, b):
            row[c] = "─"
    else:
        row[a] = "┃"
    lines.append(f"{'dead time':<{lead_w}}" + "".join(row))
    summary = f"dead time {render(dead, 's')}"
    if e.has_switching:
        overlap = e.overlap if e.overlap is not None else max(0.0, e.off_total - on_start)
        if overlap > 0:
            row = [" "] * width
            for c in range(col(on_start), max(col(on_start + overlap), col(on_start) + 1)):
                row[c] = OVERLAP
            lines.append(f"{'BOTH ON':<{lead_w}}" + "".join(row))
            summary += f" · SHOOT-THROUGH: both on for {render(overlap, 's')}"
        else:
            gap = on_start - e.off_total
            summary += f" · both on: never (margin {render(gap, 's')})"
    lines += _axis(t0, t1, width, " " * lead_w)
    lines.append(" " * lead_w + f"from the {out} command; full width {render(span, 's')}")
    lines.append(summary)
    if e.has_switching:
        lines.append(f"{out}: turn-off delay {render(e.td_off, 's')}, off after "
                     f"{render(e.off_total, 's')} (estimated)")
        lines.append(f"{inc}: turn-on delay {render(e.td_on, 's')}, rise "
                     f"{render(e.rise, 's')} (estimated)")
    elif e.needs:
        lines.append("Switching transitions not estimated: give " + ", ".join(e.needs))
    else:
        lines.append("Switching transitions not estimated for this design.")
    return lines


def timing_picture(sheet: Sheet, width: int = 60, findings=()) -> list[str]:
    """Both edges of a leg, each at the corner its shoot-through finding was judged at, with
    the typical values drawn below it on the same time scale. Both legs of the bridge use the
    same parts and timing."""
    lines = [f"Key: {ON} on  {EDGE} switching (estimated)  {OFF} off",
             f"     {OVERLAP} both switches on (shoot-through)", ""]
    for incoming in ("high", "low"):
        run = worst_run(sheet, incoming, findings)
        worst = edge(sheet, incoming, run)
        typ = edge(sheet, incoming)
        out = OTHER[incoming]
        name = f"{SHOOT_THROUGH}[{incoming}]"
        lines.append(f"━━ {incoming.upper()} SIDE TURNS ON: outgoing {out} side, incoming "
                     f"{incoming} side ({name})")
        if run is None:
            lines += timing_lines(typ, width, heading="at typical values (no toleranced input "
                                  "moves this edge)")
        else:
            t_end = max(_t_end(worst), _t_end(typ))
            lines += timing_lines(worst, width, t_end, heading="AT THE WORST CORNER, as the "
                                  f"finding is judged: {corner_text(sheet, run)}")
            lines.append("")
            lines += timing_lines(typ, width, t_end, heading="at typical values, on the same "
                                  "time scale")
        lines.append("")
    lines.append("Both legs use the same parts and dead time: this diagram holds for each leg.")
    return wrap_text(lines, LEAD + max(width, 20))


# spectrum ----------------------------------------------------------------------------------
@dataclass(frozen=True)
class Spectrum:
    """Harmonic amplitudes before (bridge) and after the filter (load) [Hz], [V]."""

    freq: Any
    before: Any
    after: Any | None
    f0: float
    thd_before: float | None
    thd_after: float | None
    target: float | None


_FREQ = ("freq", "frequency", "frequencies", "f", "hz")
_BEFORE = ("bridge", "before", "v_bridge", "input", "unfiltered", "amp", "amplitude")
_AFTER = ("output", "after", "load", "v_out", "v_load", "filtered")


def _pick(d: dict, names: tuple[str, ...]) -> Any:
    for n in names:
        if n in d and d[n] is not None:
            return d[n]
    return None


def _find_thd(sheet: Sheet, *hints: str) -> float | None:
    for name, q in sorted(sheet.quantities.items()):
        if q.origin == "design" or "thd" not in name:
            continue
        if any(h in name for h in hints) and isinstance(q.typ, (int, float)) \
                and not isinstance(q.typ, bool):
            return float(q.typ)
    return None


def spectrum_data(sheet: Sheet) -> Spectrum | None:
    """The spectrum picture data published by the waveform checks, if they published any.

    Accepted: a ``sheet.series`` entry whose key mentions "spectrum" holding a mapping with a
    frequency array and amplitude arrays before and (optionally) after the filter.
    """
    import numpy as np

    for key, data in sorted(sheet.series.items()):
        if "spectrum" not in key and "harmonic" not in key:
            continue
        if not isinstance(data, dict):
            d = getattr(data, "__dict__", None)
            if d is None:
                continue
            data = d
        freq, before = _pick(data, _FREQ), _pick(data, _BEFORE)
        if freq is None or before is None:
            continue
        after = _pick(data, _AFTER)
        f0 = typical(sheet, "design.output.frequency") or float(data.get("f0", 0.0) or 0.0)
        return Spectrum(np.abs(np.asarray(freq, dtype=float)), np.abs(np.asarray(before)),
                        None if after is None else np.abs(np.asarray(after)), f0,
                        typical(sheet, "waveform.bridge_thd")
                        or _find_thd(sheet, "bridge", "before", "unfiltered"),
                        typical(sheet, "waveform.output_thd") or _find_thd(sheet, "output", "after", "load"),
                        typical(sheet, "design.output.thd_target"))
    return None


def _bar(value: float, scale: float, width: int) -> list[str]:
    n = max(0.0, min(value / scale, 1.0)) * width
    full = int(n)
    row = [ON] * full + [" "] * (width - full)
    if full < width and n - full >= 0.5:
        row[full] = "▌"
    return row


def spectrum_lines(s: Spectrum, width: int = 60, height: int = 8, floor_db: float = -60.0) -> list[str]:
    """A log-frequency bar chart in dB of the fundamental, and THD bars with the target marked."""
    import numpy as np

    width, lead = max(width, 20), 8
    def fundamental(amp: Any) -> float:
        near = np.abs(s.freq - s.f0) <= 0.5 * s.f0 if s.f0 > 0 else np.ones_like(s.freq, bool)
        return float(np.max(amp[near], initial=0.0)) or float(np.max(amp, initial=0.0)) or 1.0

    keep = s.freq > 0
    fmin = s.f0 * 0.8 if s.f0 > 0 else float(np.min(s.freq[keep]))
    fmax = float(np.max(s.freq[keep]))
    if fmax <= fmin:
        fmax = fmin * 10
    edges = np.geomspace(fmin, fmax * 1.0001, width + 1)

    def columns(amp: Any) -> list[float]:
        ref = fundamental(amp)  # each in dB of its own fundamental (a transformer scales one)
        out = []
        for a, b in zip(edges[:-1], edges[1:]):
            sel = (s.freq >= a) & (s.freq < b)
            peak = float(np.max(amp[sel])) if np.any(sel) else 0.0
            out.append(20 * math.log10(peak / ref) if peak > 0 else -math.inf)
        return out

    before = columns(s.before)
    after = columns(s.after) if s.after is not None else None
    lines = ([f"Key: {EDGE} before the filter (bridge)", f"     {ON} after the filter (load)"]
             if after is not None else [f"Key: {ON} bridge output (no filter data)", ""])
    for r in range(height):
        level = -(r + 0.5) * (-floor_db) / height  # dB at the middle of this row
        row = []
        for c in range(width):
            if after is not None and after[c] >= level:
                row.append(ON)
            elif before[c] >= level:
                row.append(EDGE if after is not None else ON)
            else:
                row.append(" ")
        top = -r * (-floor_db) / height
        label = f"{top:>4.0f} dB" if r % 2 == 0 else ""
        lines.append(f"{label:<{lead}}" + "".join(row))
    ticks = [" "] * width
    for f in (s.f0, *[10 ** k for k in range(0, 8)]):
        if f <= 0 or not fmin <= f <= fmax:
            continue
        c = int(np.searchsorted(edges, f) - 1)
        text = render(f, "Hz")
        c = max(0, min(c, width - len(text)))
        if all(ch == " " for ch in ticks[max(0, c - 1):c + len(text) + 1]):
            ticks[c:c + len(text)] = list(text)
    lines.append(" " * lead + "─" * width)
    lines.append(" " * lead + "".join(ticks))
    lines.append("")
    lines += thd_lines(s.thd_before, s.thd_after, s.target, max(10, width - 12))
    return lines


def thd_lines(before: float | None, after: float | None, target: float | None,
              width: int = 60) -> list[str]:
    """THD bars before and after the filter, with the target marked as │ in both."""
    values = [v for v in (before, after, target) if v is not None]
    if not values:
        return ["THD not computed for this design."]
    scale = max(values) * 1.1 or 1.0
    tcol = None if target is None else min(width - 1, round(target / scale * width))
    out = []
    for name, v in (("THD before", before), ("THD after", after)):
        if v is None:
            out.append(f"{name:<12}(not computed)")
            continue
        row = _bar(v, scale, width)
        if tcol is not None:
            row[tcol] = "┃"
        out.append(f"{name:<12}" + "".join(row) + f" {v * 100:.1f} %")
    if tcol is not None:
        out.append(" " * (12 + tcol) + f"┗ target {target * 100:.1f} %")
        if after is not None:
            out.append(f"After the filter: {after * 100:.1f} %, "
                       + ("within the target." if after <= target else "ABOVE THE TARGET."))
    return out


def spectrum_picture(sheet: Sheet, width: int = 60) -> list[str]:
    return wrap_text(_spectrum_picture(sheet, width), 8 + max(width, 20))


def _spectrum_picture(sheet: Sheet, width: int = 60) -> list[str]:
    s = spectrum_data(sheet)
    if s is None:
        target = typical(sheet, "design.output.thd_target")
        lines = ["No spectrum for this design yet: the waveform checks have not published one."]
        if target is not None:
            lines.append(f"Target THD after the filter: {target * 100:.1f} %.")
        return lines
    return spectrum_lines(s, width)
