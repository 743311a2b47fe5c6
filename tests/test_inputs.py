"""Every input is used or reported: a field the design gives that no check reads is a notice,
and every field of the design model is read by a derive module or a rule, is descriptive, or is
one of the fields known not to be used yet (the notice names them)."""

from __future__ import annotations

from reviewer import inputs
from tests.variants import EXAMPLE_NAMES, VARIANT_NAMES, _book, example_review, variant_review

NOT_USED_YET = {
    # the low-side driver's reference is ground: the switch node's negative swing meets only
    # the high-side driver's reference pin (common practice), so no check reads the low one
    "drive.low.reference_negative_limit",
    "drive.low.uvlo", "filter.capacitor_kind", "grounding.shunt",
    "protection.thermal_shutdown", "source.chemistry", "timing.enforced_in",
}
"""Design fields that no check reads yet. A check that starts reading one must take it off."""


def test_every_design_field_is_read_described_or_reported():
    from reviewer.rulebook.loader import known_names

    _, paths = known_names()
    read = set()
    for n in EXAMPLE_NAMES:
        read |= example_review(n).sheet.read_fields
    for n in VARIANT_NAMES:
        read |= variant_review(n).sheet.read_fields
    used = read | inputs.rule_fields(_book())
    rest = {p for p in paths if p not in used and not inputs._descriptive(p)}
    assert rest == NOT_USED_YET, (sorted(rest - NOT_USED_YET), sorted(NOT_USED_YET - rest))


def test_a_given_field_no_check_reads_is_a_notice():
    from reviewer.review import review_design
    from tests.variants import variant_design

    design = variant_design("careful_12v_sine", {"drive.low.reference_negative_limit": "5 V",
                                                 "switch.high.diode_qrr": "60 nC"})
    r = review_design(design, "ref.toml", _book())
    assert ("drive.low.reference_negative_limit is given but not used by any check yet: it does "
            "not change this review.") in r.notices
    # the recovery charge is read by the stress and thermal checks: no notice
    assert not any(n.startswith("switch.high.diode_qrr ") for n in r.notices)
    # a field that is read is never reported, nor an identity field
    assert not any(n.startswith(("switch.high.rds_on ", "design.title ")) for n in r.notices)


def test_notices_reach_the_text_markdown_and_json_views():
    from reviewer.report import json as report_json
    from reviewer.report import markdown, text

    r = example_review("naive_bench_pchannel")
    note = "timing.enforced_in is given but not used by any check yet"
    assert any(n.startswith(note) for n in r.notices)
    assert note in text.render([r], width=200)
    assert note in markdown.render([r], review_date="2026-12-03")
    assert any(n.startswith(note) for n in report_json.to_data(r)["notices"])


def test_given_fields_leave_defaults_out():
    from tests.variants import variant_design

    d = variant_design("naive_bench_pchannel", {})
    given = inputs.given_fields(d)
    assert "timing.dead_time" in given
    assert "isolation.pollution_degree" not in given  # a default, not given in the file
