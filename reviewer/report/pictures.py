"""Pictures for the Markdown report, drawn with matplotlib (the "export" extra) as SVG files.

- the timing of a leg: gate commands, dead time, the estimated conduction of each switch through
  its delay and transitions, and any overlap (shoot-through), for both commutations of the leg
  (both legs use the same parts, so one picture serves both). It reads the published quantities
  ``timing.{side}.dead_time``, ``switching.{side}.td_on``, ``.rise_time``, ``.td_off``,
  ``.fall_time``, ``.turn_off_time`` and ``timing.{side}.overlap``; with the switching times
  absent it draws the gate commands and the dead time alone, and with no dead time at all no
  picture.
- the harmonic spectrum at the bridge (before the filter) and at the load (after it), each in dB
  relative to its own fundamental (so a transformer's ratio does not lift one series over the
  other), with the computed total distortions and the target stated as totals.
  It reads the plot data ``waveform.spectrum`` (frequency [Hz], bridge and output magnitudes
  [V rms], f0 [Hz]) kept by the waveform derive module, and ``design.output.thd_target``.

matplotlib is imported inside the functions, with the non-interactive "Agg" backend, so that the
rest of the program never pays for it. Nothing here computes a result that a rule judges; the
conduction traces are straight-line sketches between the published instants.
"""

from __future__ import annotations

from pathlib import Path
from typing import Any

from reviewer.review import Review
from reviewer.units import render

from reviewer.report.timing import OTHER


class PicturesUnavailable(RuntimeError):
    """matplotlib is not installed (the "export" extra)."""


def _plt() -> Any:
    try:
        import matplotlib
    except ImportError as e:  # pragma: no cover - exercised only without the extra
        raise PicturesUnavailable(
            "pictures need matplotlib: pip install 'bridge-reviewer[export]'") from e
    matplotlib.use("Agg", force=True)
    import matplotlib.pyplot as plt

    plt.rcParams["svg.hashsalt"] = "bridge-reviewer"  # stable element ids from run to run
    plt.rcParams["svg.fonttype"] = "none"  # text stays text: smaller, searchable files
    return plt


def _save(fig: Any, path: Path) -> None:
    from io import StringIO

    from reviewer.atomic import write_text

    buf = StringIO()
    fig.savefig(buf, format="svg", metadata={"Date": None}, bbox_inches="tight")
    write_text(path, buf.getvalue())


def _v(r: Review, name: str) -> float | None:
    q = r.sheet.get(name)
    if q is None or q.kind != "number" or q.typ is None:
        return None
    return float(q.typ)


# timing -----------------------------------------------------------------------------------------
def leg_timing(r: Review, worst: bool = True) -> dict[str, dict[str, float | None]] | None:
    """The instants of both commutations of a leg, from the sheet [s].

    With ``worst`` each edge is read at the corner its shoot-through finding was judged at
    (:func:`reviewer.report.timing.worst_run`), otherwise at typical values. For each side
    turning on: ``dead`` (its dead time), the outgoing switch's ``td_off`` and ``off`` (delay
    plus fall plus tail: until its channel is off), the incoming switch's ``td_on`` and
    ``rise``, and ``overlap`` as published. None when no dead time is known.
    """
    from reviewer.report.timing import edge, worst_run

    out: dict[str, dict[str, float | None]] = {}
    for side in ("high", "low"):
        run = worst_run(r.sheet, side, r.findings) if worst else None
        e = edge(r.sheet, side, run)
        if e.dead is None:
            return None
        out[side] = {"dead": e.dead, "td_off": e.td_off, "off": e.off_total, "td_on": e.td_on,
                     "rise": e.rise, "overlap": e.overlap, "run": run}
    return out


def timing_picture(r: Review, path: Path) -> bool:
    """Draw the leg timing to ``path`` (SVG); False when the sheet has no dead time.

    The top row is each edge at the corner its shoot-through finding was judged at, the bottom
    row the same edge at typical values, on the same time scale."""
    from reviewer.report.timing import SHOOT_THROUGH, corner_text

    worst, typ = leg_timing(r, worst=True), leg_timing(r, worst=False)
    if worst is None or typ is None:
        return False
    plt = _plt()
    both = [*worst.values(), *typ.values()]
    known = [x for e in both for k, x in e.items() if k != "run" and x is not None and x > 0]
    span = 1.6 * max(e["dead"] + (e["td_on"] or 0) + (e["rise"] or 0) for e in both)
    span = max(span, 1.3 * max(known, default=1e-6))
    scale, unit = (1e6, "µs") if span > 5e-6 else (1e9, "ns")
    fig, axes = plt.subplots(2, 2, figsize=(10, 7.6), sharey=True)
    for col, side in enumerate(("high", "low")):
        run = worst[side]["run"]
        where = ("at the worst corner: " + corner_text(r.sheet, run)) if run is not None else \
            "no toleranced input moves this edge"
        _commutation(axes[0][col], side, worst[side], span, scale, unit,
                     f"{SHOOT_THROUGH}[{side}]\n{where}")
        _commutation(axes[1][col], side, typ[side], span, scale, unit,
                     f"{SHOOT_THROUGH}[{side}]\nat typical values")
    for row in axes:
        row[0].set_yticks([3.5, 2.5, 1.5, 0.5])
        row[0].set_yticklabels(["high-side command", "low-side command", "high-side channel",
                                "low-side channel"])
    title = r.design.design.title
    fig.suptitle(f"Leg timing, worst corner (top) and typical (bottom); both legs alike: {title}",
                 fontsize=10)
    fig.tight_layout()
    _save(fig, path)
    plt.close(fig)
    return True


def _commutation(ax: Any, side: str, e: dict[str, float | None], span: float, ns: float,
                 unit: str, note: str = "") -> None:
    other = OTHER[side]
    dead = e["dead"] or 0.0
    row = {"high": (3, 1), "low": (2, 0)}  # (command row, channel row), each row 0..1 high
    # commands: the outgoing switch's command falls at 0, the incoming one's rises after dead
    cmd_out = ([-0.2 * span, 0, 0, span], [1, 1, 0, 0])
    cmd_in = ([-0.2 * span, dead, dead, span], [0, 0, 1, 1])
    for s, (xs, ys) in ((other, cmd_out), (side, cmd_in)):
        base = row[s][0]
        ax.plot([x * ns for x in xs], [base + 0.1 + 0.8 * y for y in ys], color="black", lw=1.4)
    ax.annotate("", xy=(dead * ns, row[side][0] + 0.5), xytext=(0, row[side][0] + 0.5),
                arrowprops={"arrowstyle": "<->", "color": "tab:blue"})
    ax.text(dead * ns / 2, row[side][0] + 0.55, f"dead {render(dead, 's')}", ha="center",
            va="bottom", fontsize=8, color="tab:blue")
    if None in (e["td_off"], e["off"], e["td_on"], e["rise"]):
        ax.text(span * ns / 2, 1.0, "switching times not computed:\ngate commands only",
                ha="center", va="center", fontsize=8, color="gray")
    else:
        off_start, off_end = e["td_off"], e["off"]
        on_start, on_end = dead + e["td_on"], dead + e["td_on"] + e["rise"]
        out_xs = [-0.2 * span, off_start, max(off_end, off_start), span]
        in_xs = [-0.2 * span, on_start, on_end, span]
        for s, xs, ys, c in ((other, out_xs, [1, 1, 0, 0], "tab:orange"),
                             (side, in_xs, [0, 0, 1, 1], "tab:green")):
            base = row[s][1]
            ax.plot([x * ns for x in xs], [base + 0.1 + 0.8 * y for y in ys], color=c, lw=1.6)
        overlap = e["overlap"] or 0.0
        if overlap > 0:
            ax.axvspan(on_start * ns, (on_start + overlap) * ns, color="red", alpha=0.25)
            ax.text((on_start + overlap / 2) * ns, 2.0, f"overlap {render(overlap, 's')}",
                    ha="center", va="center", fontsize=8, color="red",
                    bbox={"facecolor": "white", "edgecolor": "red", "pad": 2})
        else:
            ax.text(span * ns * 0.98, 0.5, "no overlap", ha="right", va="center", fontsize=8,
                    color="tab:green")
    ax.set_xlim(-0.2 * span * ns, span * ns)
    ax.set_ylim(0, 4)
    ax.set_xlabel(f"time from the outgoing command [{unit}]")
    ax.set_title(f"outgoing {other} side off, incoming {side} side on"
                 + (f"\n{note}" if note else ""), fontsize=8)
    for y in (1, 2, 3):
        ax.axhline(y, color="0.85", lw=0.6)
    ax.grid(axis="x", color="0.92")


# spectrum ---------------------------------------------------------------------------------------
def db_of_fundamental(freq: list[float], mag: list[float], f0: float) -> list[float] | None:
    """Each component in dB relative to this series' own fundamental: 20·log10(|V_n| / |V_1|).

    Each side is referred to itself, so a transformer's ratio (bridge volts against load volts)
    does not put one series above the other. None when the fundamental is not in the series;
    a zero component is -inf dB.
    """
    import math

    ref = _fundamental(freq, mag, f0)
    if not ref:
        return None
    return [20 * math.log10(abs(m) / ref) if m else -math.inf for m in mag]


def spectrum_picture(r: Review, path: Path) -> bool:
    """Draw the spectrum before and after the filter to ``path`` (SVG); False without data.

    Both series in dB of their own fundamental; the distortion target is a total (THD), so it
    is stated in words beside the computed totals rather than drawn as a component level."""
    data = r.sheet.series.get("waveform.spectrum")
    if not data or not data.get("frequency"):
        return False
    f0 = float(data["f0"])
    freq = [float(x) for x in data["frequency"]]
    bridge = db_of_fundamental(freq, [float(x) for x in data["bridge"]], f0)
    out_raw = [float(x) for x in data.get("output") or []]
    output = db_of_fundamental(freq, out_raw, f0) if out_raw else None
    if bridge is None:
        return False
    plt = _plt()
    floor = -100.0
    fig, ax = plt.subplots(figsize=(10, 4.6))
    shown_b = [max(v, floor) for v in bridge]
    ax.vlines(freq, floor, shown_b, color="tab:orange", lw=0.8, alpha=0.7,
              label="at the bridge, before the filter")
    side = str(data.get("output_side", "load")).replace(" (after the transformer)", "")
    if output is not None:
        ax.plot(freq, [max(v, floor) for v in output], "o", ms=3, color="tab:blue",
                label=f"at the {side}, after the filter"
                + (" and the transformer" if "transformer" in str(data.get("output_side", ""))
                   else ""))
    ax.set_xscale("log")
    ax.set_ylim(floor, 5)
    ax.set_xlabel("frequency [Hz]")
    ax.set_ylabel("component [dB relative to that side's own fundamental]")
    ax.set_title(f"Harmonic spectrum, output {f0:g} Hz: {r.design.design.title}", fontsize=10)
    ax.grid(True, which="both", color="0.92")
    ax.legend(fontsize=8, loc="upper right", framealpha=0.9)
    lines = []
    for name, label in (("waveform.bridge_thd", "THD at the bridge"),
                        ("waveform.output_thd", f"THD at the {side}")):
        v = _v(r, name)
        if v is not None:
            lines.append(f"{label}: {v * 100:.1f} % (total of all harmonics)")
    target = _v(r, "design.output.thd_target")
    if target is not None:
        lines.append(f"target: total THD at the {side} at most {target * 100:g} %")
    if lines:
        ax.text(0.01, 0.02, "\n".join(lines), transform=ax.transAxes, fontsize=8, va="bottom",
                bbox={"facecolor": "white", "edgecolor": "0.7", "pad": 3})
    fig.tight_layout()
    _save(fig, path)
    plt.close(fig)
    return True


def _fundamental(freq: list[float], mag: list[float], f0: float) -> float | None:
    if not freq:
        return None
    i = min(range(len(freq)), key=lambda k: abs(freq[k] - f0))
    return mag[i] if abs(freq[i] - f0) <= 0.01 * f0 and i < len(mag) else None


# all pictures of a review -----------------------------------------------------------------------
def write_pictures(r: Review, directory: Path, stem: str) -> list[tuple[str, str]]:
    """Write every picture the review has data for into ``directory`` as ``STEM.KIND.svg``.

    Returns (caption, file name) for each picture written, in report order.
    """
    made = []
    for kind, caption, draw in (
        ("timing", "Leg timing at the worst corner and at typical values: gate commands, dead "
         "time, estimated transitions and any overlap",
         timing_picture),
        ("spectrum", "Harmonic spectrum before and after the output filter, each side in dB of "
         "its own fundamental, with the total distortion and its target", spectrum_picture),
    ):
        name = f"{stem}.{kind}.svg"
        if draw(r, directory / name):
            made.append((caption, name))
    return made
