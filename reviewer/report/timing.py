"""The timing of a leg's two commutations, read from the calculation sheet.

Shared by the pictures of every view (the walkthrough's character drawing, the report's SVG):
it reads published quantities and computes nothing. Each edge can be read at the typical run or
at any run of the corner analysis; :func:`worst_run` gives the run the shoot-through finding of
that edge was judged at, so that a picture shows the same overlap the finding states.
"""

from __future__ import annotations

from dataclasses import dataclass

from reviewer.quantities import Sheet

OTHER = {"high": "low", "low": "high"}


def typical(sheet: Sheet, name: str) -> float | None:
    """The typical value of a numeric quantity, or None when it is absent or not a number."""
    q = sheet.get(name)
    if q is None or isinstance(q.typ, bool) or not isinstance(q.typ, (int, float)):
        return None
    return float(q.typ)


def at_run(sheet: Sheet, name: str, run: int | None) -> float | None:
    """The value of a numeric quantity in corner run ``run`` (typical when None)."""
    if run is None:
        return typical(sheet, name)
    q = sheet.get(name)
    if q is None or not 0 <= run < len(q.runs):
        return typical(sheet, name)
    v = q.runs[run]
    if isinstance(v, bool) or not isinstance(v, (int, float)):
        return None
    return float(v)


SHOOT_THROUGH = "timing.shoot-through"
"""The rule whose finding a timing picture must agree with."""


def worst_run(sheet: Sheet, incoming: str, findings=()) -> int | None:
    """The corner run of the edge where ``incoming`` turns on that its shoot-through finding was
    judged at; without such a finding, the run with the longest overlap (or turn-off need).
    None when the sheet has no corner runs (nothing is toleranced)."""
    if len(sheet.corners) <= 1:
        return None
    for f in findings:
        if f.rule_id == SHOOT_THROUGH and f.subject == incoming and f.corner:
            want = set(f.corner)
            for i, c in enumerate(sheet.corners):
                if set(c) == want:
                    return i
    for name in (f"timing.{incoming}.overlap", f"timing.{incoming}.needed"):
        q = sheet.get(name)
        if q is not None and q.kind == "number" and q.runs:
            values = [v if isinstance(v, (int, float)) and not isinstance(v, bool) else -1e300
                      for v in q.runs]
            i = max(range(len(values)), key=values.__getitem__)
            return i if values[i] > -1e300 else None
    return None


def corner_text(sheet: Sheet, run: int | None) -> str:
    """'switch.high.vth at min, switch.low.vth at min' for a run; 'typical values' for none."""
    if run is None or not 0 <= run < len(sheet.corners) or not sheet.corners[run]:
        return "typical values"
    return ", ".join(f"{p} at {e}" for p, e in sheet.corners[run])


@dataclass(frozen=True)
class Edge:
    """One commutation of a leg: ``outgoing`` turns off, then ``incoming`` turns on [s]."""

    incoming: str
    dead: float | None
    td_off: float | None = None
    fall: float | None = None
    off_total: float | None = None
    td_on: float | None = None
    rise: float | None = None
    overlap: float | None = None
    needs: tuple[str, ...] = ()

    @property
    def outgoing(self) -> str:
        return OTHER[self.incoming]

    @property
    def has_switching(self) -> bool:
        return None not in (self.td_off, self.off_total, self.td_on, self.rise)


def edge(sheet: Sheet, incoming: str, run: int | None = None) -> Edge:
    """The timing of the edge where ``incoming`` ("high"/"low") turns on, at corner run ``run``
    (the typical run when None)."""
    out = OTHER[incoming]

    def v(name: str) -> float | None:
        return at_run(sheet, name, run)

    dead = v(f"timing.{incoming}.dead_time")
    if dead is None:
        dead = v(f"design.timing.dead_time_{incoming}")
    if dead is None:
        dead = v("design.timing.dead_time")
    if dead is None and sheet.value("design.drive.shared_signal", False):
        dead = 0.0
    needs: tuple[str, ...] = ()
    for name in (f"switching.{incoming}.td_on", f"switching.{out}.td_off",
                 f"timing.{incoming}.outgoing_turn_off"):
        m = sheet.missing.get(name)
        if m is not None:
            needs += tuple(n for n in m.needs if n not in needs)
    return Edge(
        incoming, dead,
        td_off=v(f"switching.{out}.td_off"),
        fall=v(f"switching.{out}.fall_time"),
        off_total=v(f"timing.{incoming}.outgoing_turn_off") or v(f"switching.{out}.turn_off_time"),
        td_on=v(f"timing.{incoming}.incoming_delay") or v(f"switching.{incoming}.td_on"),
        rise=v(f"switching.{incoming}.rise_time"),
        overlap=v(f"timing.{incoming}.overlap"), needs=needs)
