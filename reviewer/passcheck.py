"""Pass values that pass when entered: solve, round toward passing, then re-review to confirm.

A failing finding's pass value comes out of the rule's ``pass`` expression, solved at the worst
corner. That solution is only as good as the formula behind it, and a designer enters the value
as it is shown (three significant figures), so here every pass value is checked the way the
designer would use it:

1. the solved value is moved by a small margin (:data:`MARGIN`, 0.5 %) away from the limit and
   rounded toward passing at the precision shown (up where the field has to grow, down where it
   has to shrink; whole numbers for counts);
2. the design is rebuilt with that value in the pass field (validated again like the file; a
   toleranced field keeps its relative tolerance) and the rule is judged again on the new
   calculation sheet at its worst corner;
3. if the finding does not then pass, the field is searched: stepped further in the same direction
   until the finding passes, then bisected back toward the first failing value;
4. if the pass field has no effect at all, the settings that override it are tried: another field
   of the same unit among the rule's ``fields`` (a pull resistor where it is a switch's only
   turn-off path), or a flag among them switched off (one shared signal makes the dead time
   inert). If nothing passes, the finding says that no single-field change was found.

The result is written into the finding: ``pass_value`` and ``pass_field`` are the verified ones,
``fix`` lists the field changes as the text a designer would enter, and the mitigation text shows
the verified value.
"""

from __future__ import annotations

import math
import re
from dataclasses import dataclass, replace
from decimal import ROUND_CEILING, ROUND_FLOOR, Decimal
from typing import Any

from reviewer.findings import Finding

OVERRIDES = {"timing.dead_time": ("drive.shared_signal",)}
"""Flags that, when true, make a field inert: one signal and its inverse feeding a leg leave no
dead time whatever ``timing.dead_time`` says (see :func:`reviewer.derive.switching._dead_time`)."""
MARGIN = 0.005
"""Relative margin added to a solved pass value before rounding [ratio]."""
DIGITS = 3
"""Significant figures a value is shown with (see :func:`reviewer.units.render`)."""
STEPS = 8
"""Most outward steps when the first candidate does not pass."""
BISECT = 14
"""Most bisection steps between the last failing and the first passing value."""
CLOSE = 0.02
"""Bisection stops where the passing and the failing value lie this close [ratio]."""
OVERSHOOT = 0.05
"""Relative margin beyond which a passing value found by the secant is bisected back toward the
last failing one (the secant aims at :data:`MARGIN`)."""


@dataclass(frozen=True)
class Fix:
    """A verified change: field path -> value (SI or a flag), and what the designer types."""

    changes: tuple[tuple[str, Any, str], ...]
    """(path, value as stored in the design, text to enter)."""
    value: float | None
    field: str
    note: str = ""


def round_toward(x: float, up: bool, digits: int = DIGITS) -> float:
    """``x`` rounded to ``digits`` significant figures, up or down (toward passing).

    Parameters
    ----------
    x : float
        The value [any unit].
    up : bool
        Round toward +∞ (True) or −∞ (False).
    digits : int
        Significant figures kept.

    Returns
    -------
    float
        A value with an exact short decimal form, so that it renders and parses back unchanged.
    """
    if x == 0 or not math.isfinite(x):
        return x
    d = Decimal(repr(x))
    exp = d.adjusted() - (digits - 1)
    q = Decimal(1).scaleb(exp)
    return float(d.quantize(q, rounding=ROUND_CEILING if up else ROUND_FLOOR))


# --- building the modified design -------------------------------------------------------------

def _fields_of(model: Any) -> dict[str, Any]:
    """A model's given fields; sub-tables stay model instances (pydantic takes them as they are)."""
    return {k: getattr(model, k) for k in type(model).model_fields if getattr(model, k) is not None}


def with_fields(design: Any, changes: dict[str, Any]) -> Any:
    """The design with ``changes`` (dotted path -> value) applied and validated again.

    Every table on the way to a changed field is validated again with all its fields (so its
    own checks run); the other tables are kept as they are. Raises
    :class:`pydantic.ValidationError` when the changed design is not valid.
    """
    from pydantic import BaseModel

    data = _fields_of(design)
    for path, value in changes.items():
        node = data
        parts = path.split(".")
        for part in parts[:-1]:
            child = node.get(part)
            if isinstance(child, BaseModel):
                child = _fields_of(child)
            elif not isinstance(child, dict):
                child = {}
            node[part] = child
            node = child
        node[parts[-1]] = value
    out = type(design).model_validate(data)
    from reviewer.design.ranges import check

    problems = check(out)  # the ranges and cross-field limits the loader applies
    if problems:
        raise ValueError("; ".join(message for _, message in problems))
    return out


def _stored(current: Any, new: float) -> tuple[Any, str]:
    """The value to store for ``new`` given the field's current value, and the note on tolerance."""
    from reviewer.units import Span

    if isinstance(current, Span) and not current.exact and current.typ:
        lo, hi = current.lo / current.typ, current.hi / current.typ
        return Span(new * lo, new, new * hi), "keeps the field's relative tolerance"
    if isinstance(current, bool):
        return bool(new), ""
    if isinstance(current, int):
        return int(round(new)), ""
    return Span(new, new, new), ""


def _as_input(path: str, value: Any, unit: str) -> Any:
    """A stored value as the field's validator takes it (a wire size as text in mm²)."""
    from reviewer.units import Span

    if unit == "m²" and isinstance(value, Span):
        return f"{value.typ * 1e6!r} mm²"
    return value


def _entered(path: str, value: Any, unit: str) -> str:
    """The text a designer would enter for ``value`` in field ``path``."""
    from reviewer.units import Span, render

    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, int):
        return str(value)
    if isinstance(value, Span):
        typ = _plain(render(value.typ, unit), unit)
        if value.exact:
            return typ
        if value.typ and math.isclose(value.hi - value.typ, value.typ - value.lo, rel_tol=1e-6):
            pct = (value.hi - value.typ) / abs(value.typ) * 100
            return f"{typ} ± {pct:.6g}%"
        return ("{ " + ", ".join(f'{k} = {v!r}' for k, v in
                                 (("min", value.lo), ("typ", value.typ), ("max", value.hi))) + " }")
    return str(value)


def _plain(text: str, unit: str) -> str:
    """Rendered text as a design field takes it (a ratio shown bare stays bare)."""
    return text.replace("−", "-")


# --- judging the modified design --------------------------------------------------------------

class _Judge:
    """Judges one compiled rule on designs that differ from the reviewed one in a few fields."""

    def __init__(self, design: Any, c: Any, answers: dict[str, Any],
                 trees: list[Any] | None = None):
        self.design = design
        self.c = c
        self.answers = answers
        self.focus = frozenset(n for e in (c.value, c.limit, c.fails_when) if e is not None
                               for n in e.names)
        self.modules = _modules_for(c)
        self.cache: dict[tuple, Finding | None] = {}
        self.sheets: dict[tuple, Any] = {}
        # replay trees shared by the re-reviews (one field differs), and with the review itself
        # where its runner keys every read (a module that does not read the field replays)
        self.trees: list[Any] = [] if trees is None else trees[:len(self.modules)]
        self.runs = 0

    def _sheet(self, key: tuple, changes: dict[str, Any]) -> Any:
        """The calculation sheet (typical run) of the design with ``changes``; None when that
        design is not valid or the physics cannot take it (a zero rating, say)."""
        from pydantic import ValidationError

        from reviewer.quantities import compute

        if key not in self.sheets:
            try:
                d2 = with_fields(self.design, changes)
            except (ValidationError, ValueError, TypeError):
                self.sheets[key] = None
                return None
            self.runs += 1
            try:
                self.sheets[key] = compute(d2, focus=self.focus, combined=False, ends=False,
                                           trees=self.trees, modules=self.modules)
            except (ArithmeticError, ValueError):
                self.sheets[key] = None
        return self.sheets[key]

    def judged(self, changes: dict[str, Any]) -> Finding | None:
        """The finding on the design with ``changes``; None when that design is not valid."""
        from reviewer.engine import judge

        key = tuple(sorted((k, repr(v)) for k, v in changes.items()))
        if key not in self.cache:
            sheet = self._sheet(key, changes)
            try:
                self.cache[key] = None if sheet is None else judge(self.c, sheet, self.answers,
                                                                   sensitivity=False)
            except (ArithmeticError, ValueError):  # a value the physics cannot take
                self.cache[key] = None
        return self.cache[key]

    def passes(self, changes: dict[str, Any]) -> bool:
        """Whether the finding passes on the design with ``changes``. Stops early: a run among
        the typical, the one-at-a-time ends and the vertices that already fails the rule means
        the finding fails (its worst run is at least as bad), with no further search."""
        return self.trial(changes)[0]

    def trial(self, changes: dict[str, Any]) -> tuple[bool, float | None]:
        """:meth:`passes`, and the relative margin (margin over the limit's size) it was judged
        on: the finding's where it was judged whole, else the worst of the early stop's runs (no
        better than the finding's: a guide for where to try next, not a verdict); None where
        there is no margin (a flag rule, a design that is not valid)."""
        key = tuple(sorted((k, repr(v)) for k, v in changes.items()))
        if key not in self.cache:
            sheet = self._sheet(key, changes)
            if sheet is None:
                return False, None
            try:
                early = _fails_somewhere(self.c, sheet.runner)
            except (ArithmeticError, ValueError):
                return False, None
            if early is not None:
                return False, early
        got = self.judged(changes)
        return got is not None and got.outcome == "pass", _relative(got)


def _fails_somewhere(c: Any, runner: Any) -> float | None:
    """Whether rule ``c`` fails in a run of the first stage of its worst-case search (the
    typical run, the one-at-a-time ends and, for few inputs, every vertex): then it fails, and
    the relative margin of the worst of those runs is returned (NaN for a flag rule); None where
    none of them fails."""
    import itertools

    from reviewer.margins import margins, rule_names
    from reviewer.worstcase import ENDS, VERTEX_INPUTS

    deps = runner.deps(rule_names(c))
    wanted = [((p, e),) for p in deps for e in ENDS]
    if len(deps) <= VERTEX_INPUTS:
        wanted += [tuple(zip(deps, combo)) for combo in itertools.product(ENDS, repeat=len(deps))]
    runs = [runner.typical, *runner.corners_at(wanted)]
    m = margins(c, runs)
    failed = [i for i in range(len(runs)) if m.failed(i)]
    if not failed:
        return None
    if m.limit is None:
        return math.nan
    worst = min(failed, key=lambda i: float(m.margin[i]))
    size = abs(float(m.limit[worst]))
    return float(m.margin[worst]) / size if size and math.isfinite(size) else math.nan


def _modules_for(c: Any) -> list[Any]:
    """The derive modules the verdict of rule ``c`` can depend on: those in order up to the last
    one that publishes a name the rule reads (a module reads only what earlier ones published,
    so the later ones cannot change it)."""
    from reviewer.derive import MODULES
    from reviewer.margins import rule_names

    names = rule_names(c)
    last = -1
    for i, m in enumerate(MODULES):
        if any(n in names for d in m.QUANTITIES for n in d.names()):
            last = i
    return list(MODULES[:last + 1])


def _field_values(design: Any) -> tuple[dict[str, Any], dict[str, str]]:
    """Path -> the stored value (Span, bool, int, str or None), and path -> unit."""
    from reviewer.quantities import design_values

    values, spans, units = design_values(design)
    out = dict(values)
    out.update(spans)
    return out, units


def find_fix(design: Any, c: Any, f: Finding, answers: dict[str, Any],
             fields: tuple[dict[str, Any], dict[str, str]] | None = None,
             trees: list[Any] | None = None) -> Fix | None:
    """A verified single-field change that makes finding ``f`` pass, or None when none is found.

    Parameters
    ----------
    design : Design
        The reviewed design.
    c : Compiled
        The compiled rule (one subject) that gave ``f``.
    f : Finding
        A failing finding with a finite ``pass_value`` and a ``pass_field``.
    answers : dict
        Checklist answers, as for :func:`reviewer.engine.judge`.
    fields : tuple, optional
        The design's field values and units (:func:`_field_values`), when known.
    trees : list, optional
        Replay trees that key every read (:attr:`reviewer.quantities.Runner.shared_trees` of
        the review's runner) to share.
    """
    values, units = fields or _field_values(design)
    j = _Judge(design, c, answers, trees)
    field = f.pass_field
    if field not in values:
        return None
    # probe with the first value the search will test (the solved one, moved by the margin and
    # rounded toward passing) where there is a direction to take: the search then finds that
    # design's sheet made
    probe = f.pass_value
    cur = _number(values[field])
    if cur is not None and f.pass_value is not None and f.pass_value != cur:
        first = _first(values[field], f.pass_value, f.pass_value >= cur)
        if first != cur and first > 0:
            probe = first
    start = _stored(values[field], probe)[0]
    if not _moves(j, f, {field: _as_input(field, start, units.get(field, ""))}):
        # The field is inert here: look for the setting that overrides it.
        for other in (*OVERRIDES.get(field, ()), *c.fields):
            if other == field or other not in values:
                continue
            cur = values[other]
            if cur is True:  # a flag that overrides the field: switch it off with the change
                fix = _search(j, values, units, field, f.pass_value, {other: False})
                if fix is not None:
                    return fix
            elif units.get(other) == units.get(field) and units.get(field):
                fix = _search(j, values, units, other, f.pass_value, {})
                if fix is not None:
                    return fix
        return None
    return _search(j, values, units, field, f.pass_value, {})


def _moves(j: _Judge, f: Finding, changes: dict[str, Any]) -> bool:
    """Whether the change moves the rule's value, limit or outcome at all (False: inert here)."""
    got = j.judged(changes)
    if got is None:
        return True
    return got.outcome != f.outcome or got.value != f.value or got.limit != f.limit


def _search(j: _Judge, values: dict[str, Any], units: dict[str, str], field: str,
            solved: float | None, extra: dict[str, Any]) -> Fix | None:
    from reviewer.units import Span

    if field not in values or solved is None or not math.isfinite(solved):
        return None
    current = values[field]
    unit = units.get(field, "")
    cur = _number(current)
    directions = [solved >= cur] if cur is not None and solved != cur else [True, False]

    def candidate(x: float, up: bool, digits: int = DIGITS) -> float:
        return _rounded(current, x, up, digits)

    def judged(x: float) -> Finding | None:
        if x <= 0:  # every field a pass value is for is a positive size, rating or time
            return None
        stored, _ = _stored(current, x)
        return j.judged({**extra, field: _as_input(field, stored, unit)})

    def test(x: float) -> bool:
        if x <= 0:
            return False
        stored, _ = _stored(current, x)
        return j.passes({**extra, field: _as_input(field, stored, unit)})

    def trial(x: float) -> tuple[bool, float | None]:
        if x <= 0:
            return False, None
        stored, _ = _stored(current, x)
        return j.trial({**extra, field: _as_input(field, stored, unit)})

    def back(fail_x: float, pass_x: float, up: bool) -> float | None:
        """Close in from a passing value on the last failing one, to within :data:`CLOSE`
        (see :func:`_closer`), then round."""
        sign = 1.0 if up else -1.0
        fail_x, pass_x = _closer(trial, fail_x, pass_x)
        for digits in (DIGITS, DIGITS + 1, DIGITS + 2, 8):
            x = candidate(pass_x * (1 + sign * MARGIN), up, digits)
            if test(x):
                return x
        return None

    def settled(x: float, fail_x: float | None, up: bool) -> Fix:
        """The fix for passing value ``x``; where it passes by far more than the margin aimed
        at (a pass formula that overshoots, a secant that leapt across a flat margin), the value
        nearest the design that passes, bisected back toward the failing ``fail_x``."""
        m = _relative(judged(x))
        if fail_x is not None and m is not None and m > OVERSHOOT:
            x = back(fail_x, x, up) or x
        return _fix(field, x, current, unit, extra)

    firsts = {up: _first(current, solved, up) for up in directions}
    for up in directions:
        if test(firsts[up]):
            return settled(firsts[up], cur, up)
    if len(directions) == 2:  # no present value: go the way the margin grows
        m = {up: _relative(judged(firsts[up])) for up in directions}
        if m[True] is not None and m[False] is not None and m[False] > m[True]:
            directions = [False, True]
    for up in directions:
        sign = 1.0 if up else -1.0
        first = firsts[up]
        # a limit rule: aim at a small positive margin along the secant through the last two
        # points (in log x for positive values), rounding each guess toward passing
        start = [cur] if cur is not None else [firsts[not up]]
        found = _secant(judged, [*start, first], sign, lambda x: candidate(x, up))
        if found is not None:
            return settled(found[0], found[1], up)
        # otherwise step outward until it passes, then bisect back
        fail_x, pass_x = first, None
        step = 0.05
        for _ in range(STEPS):
            x = fail_x * (1 + step) ** sign if fail_x > 0 else fail_x + sign * step * abs(solved or 1)
            if test(x):
                pass_x = x
                break
            fail_x, step = x, step * 2
        if pass_x is None:
            continue
        x = back(fail_x, pass_x, up)
        if x is not None:
            return _fix(field, x, current, unit, extra)
    return None


def _closer(trial: Any, fail_x: float, pass_x: float) -> tuple[float, float]:
    """Shrink the bracket from the failing ``fail_x`` to the passing ``pass_x`` until the two
    lie within :data:`CLOSE` of each other (or :data:`BISECT` trials are spent); the new
    bracket. ``trial(x)`` says whether ``x`` passes and its relative margin (or None).

    Brent's root finder on the margin (R. P. Brent, *Algorithms for Minimization without
    Derivatives*, 1973, ch. 4, procedure *zero*): inverse quadratic interpolation or the secant
    where they behave, bisection where they do not, and never a step shorter than the
    tolerance, so the last steps land just either side of the root. It works in log x for
    positive values (sizes and times: a margin that goes with a power of the value is smoother
    there). A passing trial counts as a positive margin and a failing one as negative, whatever
    the margin says (an early stop's margin is only an upper bound); without a margin (a flag
    rule) it is ±1, and the steps are bisections."""
    logs = fail_x > 0 and pass_x > 0
    to_u = math.log if logs else (lambda v: v)
    from_u = math.exp if logs else (lambda v: v)
    tiny = 1e-12

    def f(x: float) -> float:
        ok, m = trial(x)
        if m is None or not math.isfinite(m):
            m = 1.0 if ok else -1.0
        return max(m, tiny) if ok else min(m, -tiny)

    def close(x: float, y: float) -> bool:
        return abs(x - y) <= CLOSE * max(abs(x), abs(y))

    a, b = to_u(fail_x), to_u(pass_x)
    fa, fb = f(fail_x), f(pass_x)
    c, fc = a, fa
    d = e = b - a
    for _ in range(BISECT + 1):
        if (fb > 0) == (fc > 0):
            c, fc = a, fa
            d = e = b - a
        if abs(fc) < abs(fb):
            a, b, c = b, c, b
            fa, fb, fc = fb, fc, fb
        xb, xc = from_u(b), from_u(c)
        if close(xb, xc):
            break
        tol = 0.45 * CLOSE * (1.0 if logs else abs(b))
        m = 0.5 * (c - b)
        if abs(e) >= tol and abs(fa) > abs(fb):
            s = fb / fa
            if a == c:  # the secant
                p, q = 2 * m * s, 1 - s
            else:  # inverse quadratic interpolation
                q, r = fa / fc, fb / fc
                p = s * (2 * m * q * (q - r) - (b - a) * (r - 1))
                q = (q - 1) * (r - 1) * (s - 1)
            if p > 0:
                q = -q
            p = abs(p)
            if 2 * p < min(3 * m * q - abs(tol * q), abs(e * q)):
                e, d = d, p / q
            else:
                d = e = m
        else:
            d = e = m
        a, fa = b, fb
        b += d if abs(d) > tol else math.copysign(tol, m)
        fb = f(from_u(b))
    x1, x2 = from_u(b), from_u(c)
    return (x2, x1) if fb > 0 else (x1, x2)


def _number(current: Any) -> float | None:
    """A field's present value as a number (a toleranced one's typical), or None."""
    from reviewer.units import Span

    if isinstance(current, Span):
        return current.typ
    if isinstance(current, (int, float)) and not isinstance(current, bool):
        return float(current)
    return None


def _rounded(current: Any, x: float, up: bool, digits: int = DIGITS) -> float:
    """``x`` rounded toward passing as the field takes it: whole numbers for a count."""
    if isinstance(current, int) and not isinstance(current, bool):
        return float(math.ceil(x - 1e-9) if up else math.floor(x + 1e-9))
    return round_toward(x, up, digits)


def _first(current: Any, solved: float, up: bool) -> float:
    """The first value tried: the solved one moved by :data:`MARGIN` toward passing, rounded."""
    return _rounded(current, solved * (1 + (1 if up else -1) * MARGIN) if solved else solved, up)


def _relative(got: Finding | None) -> float | None:
    if got is None or got.margin is None or not got.limit or not math.isfinite(got.margin):
        return None
    return got.margin / abs(got.limit)


def _secant(judged: Any, start: list[float], sign: float, rounded: Any,
            tries: int = 8) -> tuple[float, float | None] | None:
    """A passing value found from the margins of a limit rule, or None (flags: no margin):
    ``(passing value, the last failing value tried or None)``."""
    pts: list[tuple[float, float]] = []
    for x in start:
        m = _relative(judged(x))
        if m is not None:
            pts.append((x, m))
    for _ in range(tries):
        if len(pts) < 2:
            return None
        (x0, m0), (x1, m1) = pts[-2], pts[-1]
        if m1 == m0 or x0 == x1:
            return None
        logs = x0 > 0 and x1 > 0
        u0, u1 = (math.log(x0), math.log(x1)) if logs else (x0, x1)
        u = u1 + (MARGIN - m1) * (u1 - u0) / (m1 - m0)
        x = math.exp(max(min(u, u1 + 3), u1 - 3)) if logs else u
        if (x - x1) * sign <= 0:  # the guess goes back: the margin is not monotonic here
            return None
        x = rounded(x)
        got = judged(x)
        if got is None:
            return None
        if got.outcome == "pass":
            fails = [x for x, m in pts if m < 0]
            return x, (fails[-1] if fails else None)
        m = _relative(got)
        if m is None:
            return None
        pts.append((x, m))
    return None


def _fix(field: str, x: float, current: Any, unit: str, extra: dict[str, Any]) -> Fix:
    stored, note = _stored(current, x)
    changes = [(p, v, _entered(p, v, "")) for p, v in extra.items()]
    changes.append((field, stored, _entered(field, stored, unit)))
    return Fix(tuple(changes), x, field, note)


# --- the review step --------------------------------------------------------------------------

def verify(findings: list[Finding], design: Any, book: Any, sheet: Any,
           answers: dict[str, Any]) -> list[Finding]:
    """Every failing finding with a pass field, its pass value verified by re-review.

    Findings that do not fail, or have no pass field, are returned unchanged.
    """
    compiled = {(c.rule.id, c.subject): c for c in book.compiled}
    fields = None
    runner = getattr(sheet, "runner", None)
    trees = runner.shared_trees if runner is not None else None
    out = []
    for f in findings:
        c = compiled.get((f.rule_id, f.subject))
        if f.outcome != "fail" or not f.pass_field or c is None or c.rule.pass_ is None:
            out.append(f if f.pass_value is None else replace(f, pass_solved=f.pass_value))
            continue
        if f.pass_value is None or not math.isfinite(f.pass_value) or f.pass_value <= 0:
            out.append(_no_fix(f, c, sheet, answers, solved=False))
            continue
        fields = fields or _field_values(design)
        fix = find_fix(design, c, f, answers, fields, trees)
        out.append(_with_fix(f, c, sheet, answers, fix) if fix else
                   _no_fix(f, c, sheet, answers, solved=True))
    return out


_PASS = re.compile(r"\{\s*pass_value\s*(\|[^{}]*)?\}")
_WORD = re.compile(r"\bpass_value\b")


def _text_with(c: Any, f: Finding, sheet: Any, answers: dict[str, Any], shown: str | None,
               value: float | None = None) -> str:
    """The finding's mitigation (its case, if one holds) rendered with ``shown`` in place of
    ``{pass_value}``; with ``shown`` None, every sentence that gives the pass value is left out."""
    from reviewer import cases

    template = cases.template(c, f, sheet)
    if shown is None:
        template = " ".join(s for s in _sentences(template) if not _PASS.search(s))
    else:
        template = _PASS.sub(lambda m: shown.replace("{", "(").replace("}", ")"), template)
        if value is not None:  # the pass value inside a formula: the verified one too
            template = _WORD.sub(repr(float(value)), template)
    return cases.render(c, f, sheet, answers, template)


def _sentences(text: str) -> list[str]:
    """``text`` cut after each '. ' outside placeholders."""
    out, depth, start = [], 0, 0
    for i, ch in enumerate(text):
        depth += ch == "{"
        depth -= ch == "}"
        if ch == "." and depth == 0 and (i + 1 == len(text) or text[i + 1].isspace()):
            out.append(text[start:i + 1].strip())
            start = i + 1
    rest = text[start:].strip()
    return out + ([rest] if rest else [])


def _with_fix(f: Finding, c: Any, sheet: Any, answers: dict[str, Any], fix: Fix) -> Finding:
    from reviewer.units import render

    main = fix.changes[-1]
    unit = f.pass_unit
    shown = render(fix.value, unit) if fix.value is not None else main[2]
    extra = fix.changes[:-1]
    text = _text_with(c, f, sheet, answers, shown, fix.value)
    if fix.field != f.pass_field or extra:
        why = (f"{f.pass_field} has no effect on this check while "
               + ", ".join(f"{p} is {_entered(p, not v, '')}" for p, v, _ in extra)
               if extra else f"{f.pass_field} has no effect on this check here")
        text += f" Note: {why}."
        if any(p == "drive.shared_signal" for p, _, _ in extra):
            text += (" That means a separate signal for each switch of the leg, or a gate driver "
                     "that inserts its own dead time.")
    entered = " and ".join(f"{p} = {t}" for p, _, t in fix.changes)
    text += (f" Checked: reviewed again with {entered}"
             f"{' (' + fix.note + ')' if fix.note else ''}, this check passes at its worst corner "
             f"(the solved value plus a {MARGIN:.1%} margin, rounded toward passing).")
    return replace(f, pass_value=fix.value, pass_solved=f.pass_value, pass_field=fix.field,
                   mitigation=text,
                   fix=tuple((p, t) for p, _, t in fix.changes))


def _no_fix(f: Finding, c: Any, sheet: Any, answers: dict[str, Any], solved: bool) -> Finding:
    field = f.pass_field
    text = _text_with(c, f, sheet, answers, None)
    if solved:
        text += (f" No value of {field} alone was found that makes this check pass when the "
                 "design is reviewed again with it; the other levers named here remain.")
    else:
        text += (f" No value of {field} is offered: the calculation gives no positive, finite "
                 "value of it that meets the limit; the other levers named here remain.")
    return replace(f, pass_value=None, pass_solved=f.pass_value, mitigation=text, fix=())


__all__ = ["verify", "find_fix", "round_toward", "with_fields", "MARGIN", "Fix"]
