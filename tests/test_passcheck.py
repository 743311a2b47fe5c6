"""Pass values that pass when entered: every failing finding's verified fix, applied the way a
designer enters it (the what-if path: text parsed and validated like the file), makes that
finding pass at its worst corner, on the bundled examples and on variant designs."""

from __future__ import annotations

import math

import pytest

from reviewer import passcheck
from tests.variants import (EXAMPLE_NAMES, VARIANT_NAMES, VARIANTS, _book, example_review,
                            variant_review, variant_text)
from tests.conftest import EXAMPLES


def _judge_again(design, f, book):
    from reviewer.engine import judge
    from reviewer.quantities import compute

    c = next(c for c in book.compiled if c.rule.id == f.rule_id and c.subject == f.subject)
    focus = frozenset(n for e in (c.value, c.limit, c.fails_when) if e is not None for n in e.names)
    return judge(c, compute(design, focus=focus), {})


def _entered(source, changes: dict[str, str]):
    """The design with ``changes`` typed in: the example file through the what-if path, or a
    variant's data with the same parsing and validation."""
    from reviewer import whatif
    from reviewer.design import Design
    from reviewer.design.loader import validate

    if isinstance(source, str):
        return whatif.apply(EXAMPLES / f"{source}.toml", changes)
    example, variant = source
    data, text = variant_text(example, variant)
    for path, value in changes.items():
        data = whatif.set_field(data, path, whatif.parse_value(value))
    return validate(Design, data, text, "variant")


def _round_trip(review, source) -> int:
    from reviewer.report.common import num

    book = _book()
    checked = 0
    for f in review.findings:
        if f.outcome != "fail" or not f.pass_field:
            continue
        if not f.fix:  # no verified value: none is shown, and the text says so
            assert f.pass_value is None, f.key
            assert f"No value of {f.pass_field}" in f.mitigation, (f.key, f.mitigation)
            continue
        assert dict(f.fix)[f.pass_field], f.key
        again = _judge_again(_entered(source, dict(f.fix)), f, book)
        assert again.outcome == "pass", (f.key, f.fix, again.value, again.limit)
        if len(f.fix) == 1:  # the value the what-if dialog offers, typed without a tolerance
            typed = num(f.pass_value, f.pass_unit)
            again = _judge_again(_entered(source, {f.pass_field: typed}), f, book)
            assert again.outcome == "pass", (f.key, typed, again.value, again.limit)
        checked += 1
    return checked


@pytest.mark.parametrize("name", EXAMPLE_NAMES)
def test_every_pass_value_of_an_example_passes_when_entered(name):
    review = example_review(name)
    assert _round_trip(review, name) >= 1 or name == "careful_12v_sine"


@pytest.mark.parametrize("name", VARIANT_NAMES)
def test_every_pass_value_of_a_variant_passes_when_entered(name):
    _, example, changes = next(v for v in VARIANTS if v[0] == name)
    _round_trip(variant_review(name), (example, changes))


def test_the_round_trip_covers_many_findings():
    total = sum(_round_trip(example_review(n), n) for n in EXAMPLE_NAMES)
    assert total >= 20


def test_a_shared_signal_points_at_the_signal_not_the_inert_dead_time():
    f = example_review("naive_bench_pchannel").finding("timing.shoot-through[high]")
    fix = dict(f.fix)
    assert fix["drive.shared_signal"] == "false"
    assert "timing.dead_time" in fix
    assert "has no effect on this check while drive.shared_signal is true" in f.mitigation


def test_a_pull_only_turn_off_points_at_the_pull_resistor():
    # the naive P-channel high side turns off through its pull resistor alone: r_gate is inert
    f = example_review("naive_bench_pchannel").finding("timing.dvdt-turn-on[high]")
    assert f.pass_field == "drive.high.pull_resistor"
    assert "drive.high.r_gate has no effect" in f.mitigation


def test_a_tolerance_is_kept_and_said():
    # the careful example's source.v_min is exact; its dead time has ± 10 %: take a variant
    # whose failing pass field is toleranced
    design = _entered(("careful_12v_sine", {}), {"filter.capacitor_voltage": "8 V ± 10%"})
    from reviewer.review import review_design

    r = review_design(design, "tol.toml", _book())
    f = r.finding("waveform.capacitor-voltage")
    assert f.outcome == "fail"
    text = dict(f.fix)["filter.capacitor_voltage"]
    assert text.endswith("± 10%"), text
    assert "keeps the field's relative tolerance" in f.mitigation


# --- rounding, checked against decimal arithmetic (Python's decimal module, IEEE 854 rounding) ---

@pytest.mark.parametrize("x, up, expected", [
    (19.664038, False, 19.6), (19.664038, True, 19.7), (5.4514708, True, 5.46),
    (60.2185, True, 60.3), (0.00015537454, True, 0.000156), (2.339189e-06, True, 2.34e-06),
    (1000.0, True, 1000.0), (999.5, True, 1000.0), (12500.0, True, 12500.0),
])
def test_round_toward_passing(x, up, expected):
    assert passcheck.round_toward(x, up) == expected


def test_rounded_values_render_and_parse_back_unchanged():
    from reviewer.units import parse_number, render

    for x, unit in ((19.6, "K/W"), (0.000156, "s"), (5.46, "A"), (2.34e-06, "F"), (12600.0, "Ω")):
        assert math.isclose(parse_number(render(x, unit), unit), x, rel_tol=1e-12)


def _overshoots(review, source) -> list:
    """Single-field fixes where a value 15 % less demanding (toward the design's value, entered
    with the same tolerance) passes as well: the fix is then far from the least change."""
    from reviewer.passcheck import _entered as entered_text, _field_values, _stored

    book = _book()
    design = review.design
    values, units = _field_values(design)
    found = []
    for f in review.findings:
        if f.outcome != "fail" or not f.fix or len(f.fix) != 1 or f.pass_value is None:
            continue
        current = values.get(f.pass_field)
        cur = getattr(current, "typ", current)
        if isinstance(cur, bool) or not isinstance(cur, (int, float)):
            continue
        x = f.pass_value
        y = x * (1.15 if cur > x else 0.85)
        if (cur - y) * (x - y) >= 0 or isinstance(cur, int) and round(y) == round(x):
            continue  # the design's own value lies within 15 %: nothing between to try
        y = float(round(y)) if isinstance(cur, int) else y
        stored, _ = _stored(current, y)
        typed = str(stored) if isinstance(stored, int) else entered_text(f.pass_field, stored,
                                                                          units.get(f.pass_field, ""))
        again = _judge_again(_entered(source, {f.pass_field: typed}), f, book)
        if again.outcome == "pass":
            found.append((f.key, x, typed))
    return found


@pytest.mark.parametrize("name", EXAMPLE_NAMES + VARIANT_NAMES)
def test_a_pass_value_is_near_the_least_change_that_passes(name):
    # the fix asks for the value nearest the design that passes (bisected to within a few per
    # cent), not merely any passing one: a pass formula that overshoots, or a secant step that
    # leaps across a flat margin, is pulled back
    if name in EXAMPLE_NAMES:
        review, source = example_review(name), name
    else:
        _, example, changes = next(v for v in VARIANTS if v[0] == name)
        review, source = variant_review(name), (example, changes)
    assert _overshoots(review, source) == []


# --- closing in on the least change that passes (passcheck._closer) --------------------------

def _margin_trial(margin, guide=None):
    """A trial for :func:`passcheck._closer` from a margin function: passes where the margin is
    not negative; the margin it reports is ``guide(x)`` (the early stop's, say) or the margin
    itself, None for a flag rule. Counts its calls."""
    calls = []

    def trial(x):
        calls.append(x)
        m = margin(x)
        shown = None if guide is False else (guide or margin)(x)
        return m >= 0, shown
    return trial, calls


def _bisections(fail_x, pass_x):
    """Trials plain bisection in log x takes to bring the two within CLOSE."""
    n = 0
    while abs(pass_x - fail_x) > passcheck.CLOSE * abs(pass_x):
        mid = math.sqrt(fail_x * pass_x)
        fail_x, pass_x = (fail_x, mid) if n % 2 else (mid, pass_x)  # either side: same count
        n += 1
    return n


@pytest.mark.parametrize("case", [
    # (margin, fail_x, pass_x): increasing and decreasing, smooth, steep, stepped, kinked
    (lambda x: (x - 7.3) / 7.3, 1.0, 40.0),
    (lambda x: (2.1e-7 - x) / 2.1e-7, 9e-7, 1e-9),
    (lambda x: math.log(x / 0.52), 0.01, 3.0),
    (lambda x: (x / 5.0) ** 3 - 1, 2.0, 60.0),
    (lambda x: -0.5 if x < 4.4 else 0.5, 1.0, 9.0),
    (lambda x: -1.0 + 0.1 * x if x < 12.0 else 0.2, 2.0, 30.0),
    (lambda x: 1 / 0.3 - 1 / x, 0.05, 5.0),
    (lambda x: 0.3 - 1 / x, 5.0, 0.05),
])
def test_the_bracket_closes_on_the_root_a_root_finder_gives(case):
    # reference: scipy.optimize.brentq on the same margin (the least passing value is its root)
    from scipy.optimize import brentq

    margin, fail_x, pass_x = case
    trial, calls = _margin_trial(margin)
    lo, hi = passcheck._closer(trial, fail_x, pass_x)
    assert margin(lo) < 0 <= margin(hi)  # still a bracket: failing, passing
    assert abs(hi - lo) <= passcheck.CLOSE * abs(hi)
    a, b = sorted((fail_x, pass_x))
    root = brentq(margin, a, b, xtol=1e-14 * b) if margin(a) * margin(b) < 0 else None
    if root is not None and margin(root - 1e-12 * abs(root)) * margin(root + 1e-9 * abs(root)) < 0:
        assert min(lo, hi) - 1e-9 * abs(root) <= root <= max(lo, hi) + 1e-9 * abs(root)
    # never more trials than bisection takes, bar the two ends' margins
    assert len(calls) - 2 <= _bisections(fail_x, pass_x)


def test_a_smooth_margin_is_bracketed_in_fewer_trials_than_bisection_takes():
    for margin, a, b in (((lambda x: (x - 7.3) / 7.3), 1.0, 40.0),
                         ((lambda x: math.log(x / 0.52)), 0.01, 3.0)):
        trial, calls = _margin_trial(margin)
        passcheck._closer(trial, a, b)
        assert len(calls) - 2 <= 5 < _bisections(a, b)


def test_a_flag_rule_or_an_optimistic_guide_still_closes_the_bracket():
    def margin(x):
        return (x - 3.3) / 3.3
    for guide in (False, lambda x: margin(x) / 2 + (0.3 if x < 3.3 else 0.0)):
        trial, calls = _margin_trial(margin, guide)
        lo, hi = passcheck._closer(trial, 0.5, 20.0)
        assert margin(lo) < 0 <= margin(hi)
        assert abs(hi - lo) <= passcheck.CLOSE * abs(hi)
        assert len(calls) - 2 <= 2 * _bisections(0.5, 20.0)


def test_the_bracket_closes_across_zero_without_logarithms():
    trial, _ = _margin_trial(lambda x: x - 0.75)
    lo, hi = passcheck._closer(trial, -2.0, 6.0)
    assert lo < 0.75 <= hi and abs(hi - lo) <= passcheck.CLOSE * abs(hi)
