"""Inputs used or reported: a design field the designer gave that no check read is a notice.

A review reads design fields in two ways: the derive modules read them while computing the
calculation sheet (:attr:`reviewer.quantities.Sheet.read_fields`), and rules name them as
``design.<path>``. A field given in the file that neither reads, and that is not descriptive
(the design's identity, the checklist answers), is reported, so that a value the designer took
the trouble to enter is never silently ignored.
"""

from __future__ import annotations

from typing import Any

DESCRIPTIVE: dict[str, str] = {
    "design.title": "identity", "design.revision": "identity", "design.author": "identity",
    "design.date": "identity", "design.notes": "identity",
    "checklist": "answers to the checklist questions, read by the question rules by id",
    "isolation.touchable": "listed in the reports beside the insulation finding",
}
"""Fields that describe the design rather than feed a check, and why."""


def given_fields(model: Any, prefix: str = "") -> list[str]:
    """Dotted paths of every field the design file gave (defaults left out)."""
    from pydantic import BaseModel

    out: list[str] = []
    for name in sorted(getattr(model, "model_fields_set", ())):
        value = getattr(model, name)
        path = f"{prefix}{name}"
        if isinstance(value, BaseModel):
            out.extend(given_fields(value, path + "."))
        elif value is not None:
            out.append(path)
    return out


def rule_fields(book: Any) -> frozenset[str]:
    """Design field paths the rules name (``design.<path>``) in any expression or text."""
    from reviewer.expr import compile_expr
    from reviewer.rulebook.loader import placeholders

    names: set[str] = set()
    for c in book.compiled:
        for e in (c.value, c.limit, c.fails_when, c.applies, c.pass_value):
            if e is not None:
                names |= e.names
        for when, absent, text in getattr(c, "cases", ()):
            if when is not None:
                names |= when.names
            for expr, _unit, _raw in placeholders(text):
                names |= _names(compile_expr, expr)
        for expr, _unit, _raw in placeholders(c.mitigation):
            names |= _names(compile_expr, expr)
    return frozenset(n.removeprefix("design.") for n in names if n.startswith("design."))


def _names(compile_expr: Any, expr: str) -> set[str]:
    try:
        return set(compile_expr(expr).names)
    except ValueError:
        return set()


def _descriptive(path: str) -> bool:
    return any(path == d or path.startswith(d + ".") for d in DESCRIPTIVE)


def unused(design: Any, sheet: Any, book: Any) -> tuple[str, ...]:
    """Fields given in the design that no derive module read and no rule names."""
    used = sheet.read_fields | rule_fields(book)
    return tuple(p for p in given_fields(design) if p not in used and not _descriptive(p))


def notices(design: Any, sheet: Any, book: Any) -> tuple[str, ...]:
    """One sentence per unused field, for the views."""
    return tuple(f"{p} is given but not used by any check yet: it does not change this review."
                 for p in unused(design, sheet, book))
