"""Sources a reader can find: every rule names its source; a standard basis names a clause or
table; a book reference names the work, edition or year, and the chapter or section (or says it
is from memory); a limit borrowed from a standard that does not cover this equipment says so and
is labelled practice."""

from __future__ import annotations

import re

from reviewer.commands.rules import CLAUSE, rule_notes

BOOKS = ("Mohan", "Holmes", "Erickson", "Johnson")


def test_every_rule_has_a_reference(book):
    for rule in book.rules:
        assert rule.reference.strip(), rule.id


def test_a_standard_basis_names_a_clause_or_table(book):
    for rule in book.rules:
        if rule.basis == "standard":
            assert re.search(CLAUSE, rule.reference, re.IGNORECASE), (rule.id, rule.reference)


def test_a_book_is_named_with_its_year_and_chapter(book):
    for rule in book.rules:
        if any(b in rule.reference for b in BOOKS):
            assert re.search(r"\((19|20)\d\d\)|\b(19|20)\d\d\b", rule.reference), rule.id
            assert re.search(r"\bch\. \d+|§|chapter|section", rule.reference), rule.id
        if rule.basis == "book":
            assert any(b in rule.reference for b in BOOKS), (rule.id, rule.reference)


def test_borrowed_limits_are_practice(book):
    for rule in book.rules:
        if "borrowed from" in rule.reference.lower():
            assert rule.basis == "practice", rule.id
    # installation, network and boat codes never stand as the standard for this equipment
    for rule in book.rules:
        if re.search(r"NEC|NFPA|ABYC|EN 50160|IEEE 519", rule.reference):
            assert rule.basis != "standard" and "borrowed from" in rule.reference.lower(), rule.id


def test_lint_notes_what_a_house_rule_lacks():
    from reviewer.rulebook.model import Rule

    r = Rule(id="house.x", title="Bus at most 30 V", severity="risk", value="op.bus_max",
             at_most="30 V", why="w", basis="standard", reference="Some standard")
    notes = rule_notes(r)
    assert any("Not met: Bus at most 30 V" in n for n in notes)
    assert any("without a clause or table" in n for n in notes)
    ok = Rule(id="house.y", title="T", fail_title="F", severity="risk", value="op.bus_max",
              at_most="30 V", why="w", basis="standard", reference="IEC 60664-1:2007 Table F.4")
    assert rule_notes(ok) == []


def test_built_in_rules_pass_the_lint_notes(book):
    for rule in book.rules:
        assert rule_notes(rule) == [], (rule.id, rule_notes(rule))
