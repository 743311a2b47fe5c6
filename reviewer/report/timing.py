"""The timing of a leg's two commutations, read from the calculation sheet (typical run).

Shared by the pictures of every view (the walkthrough's character drawing, the report's SVG):
it reads published quantities and computes nothing.
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


def edge(sheet: Sheet, incoming: str) -> Edge:
    """The typical-corner timing of the edge where ``incoming`` ("high"/"low") turns on."""
    out = OTHER[incoming]
    dead = typical(sheet, f"timing.{incoming}.dead_time")
    if dead is None:
        dead = typical(sheet, f"design.timing.dead_time_{incoming}")
    if dead is None:
        dead = typical(sheet, "design.timing.dead_time")
    if dead is None and sheet.value("design.drive.shared_signal", False):
        dead = 0.0
    needs: tuple[str, ...] = ()
    for name in (f"switching.{incoming}.td_on", f"switching.{out}.td_off",
                 f"timing.{incoming}.outgoing_turn_off"):
        m = sheet.missing.get(name)
        if m is not None:
            needs += tuple(n for n in m.needs if n not in needs)
    overlap = typical(sheet, f"timing.{incoming}.overlap")
    return Edge(
        incoming, dead,
        td_off=typical(sheet, f"switching.{out}.td_off"),
        fall=typical(sheet, f"switching.{out}.fall_time"),
        off_total=typical(sheet, f"timing.{incoming}.outgoing_turn_off")
        or typical(sheet, f"switching.{out}.turn_off_time"),
        td_on=typical(sheet, f"timing.{incoming}.incoming_delay") or typical(sheet, f"switching.{incoming}.td_on"),
        rise=typical(sheet, f"switching.{incoming}.rise_time"),
        overlap=overlap, needs=needs)


