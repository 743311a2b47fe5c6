"""The §3.11 checklist: one question per item, answered in the design's [checklist] table; an
unanswered question stays open and is never counted as passed."""

from __future__ import annotations

from reviewer.review import review_file
from tests.conftest import example, finding, review_text

IDS = {
    "checklist.gate-loop", "checklist.local-capacitor", "checklist.pwm-safe-in-reset",
    "checklist.dead-time-enforced", "checklist.startup-order", "checklist.heatsink-insulation",
    "checklist.output-guarded", "checklist.fault-latch", "checklist.first-power-up",
}
CAREFUL = example("careful_12v_sine").read_text(encoding="utf-8")


def test_every_question_is_asked_and_open_until_answered(book):
    assert IDS <= {r.id for r in book.rules if r.ask}
    r = review_file(example("careful_12v_sine"))
    for rid in IDS:
        f = finding(r, rid)
        assert f.outcome == "open" and f.question
    assert not any(f.outcome == "pass" for f in r.findings if f.area == "checklist")


def test_answers_yes_no_and_not_applicable():
    text = CAREFUL + """
[checklist]
"checklist.gate-loop" = "yes"
"checklist.local-capacitor" = "no"
"checklist.output-guarded" = { answer = "not_applicable", note = "no exposed terminals" }
"""
    r = review_text(text)
    assert finding(r, "checklist.gate-loop").outcome == "answered"
    no = finding(r, "checklist.local-capacitor")
    assert no.outcome == "fail" and no.mitigation
    na = finding(r, "checklist.output-guarded")
    assert na.outcome == "not_applicable" and na.answer_note == "no exposed terminals"
    assert finding(r, "checklist.fault-latch").outcome == "open"
