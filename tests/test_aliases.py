"""Renamed rules keep their old ids as aliases: a record or a house rule file written before the
area "band" became "voltage class" still applies to the same rules. The check values are the
mains example's own numbers (230 V output, beyond extra-low voltage)."""

from __future__ import annotations

import shutil

from reviewer import record as rec
from reviewer.aliases import RENAMED, current_key
from reviewer.report import markdown
from reviewer.review import review_file
from reviewer.rulebook.loader import load_rulebook
from tests.conftest import example


def test_old_ids_map_to_rules_that_exist():
    book = load_rulebook()
    for old, new in RENAMED.items():
        assert book.get(new) is not None and book.get(old) is book.get(new)
    assert current_key("band.output-elv") == "voltage-class.output-elv"
    assert current_key("stress.vgs-rating[high]") == "stress.vgs-rating[high]"


def test_a_record_under_the_old_id_still_decides_the_finding(tmp_path):
    design = tmp_path / "mains.toml"
    shutil.copy(example("mains_output_transformer"), design)
    r = review_file(design, use_record=False)
    f = r.finding("voltage-class.output-elv")
    assert f is not None and f.outcome == "fail" and f.area == "voltage-class"
    old = rec.decide(rec.Record(design="mains.toml"), f, "will_change", "", "ana")
    d = old.decisions[f.key]
    from dataclasses import replace

    stale = rec.Record("mains.toml", {"band.output-elv": replace(d, key="band.output-elv")})
    rec.save(stale, rec.record_path(design))
    r = review_file(design)
    assert r.state("voltage-class.output-elv") == "current" and not r.orphans


def test_a_house_rule_under_the_old_id_still_applies(tmp_path):
    house = tmp_path / "house.toml"
    house.write_text('[[disable]]\nid = "band.bus-elv"\nreason = "bench supply only"\n',
                     encoding="utf-8")
    book = load_rulebook([house])
    assert book.get("voltage-class.bus-elv") is None
    assert book.disabled_rule("voltage-class.bus-elv") is not None


def test_views_say_voltage_class():
    r = review_file(example("mains_output_transformer"), use_record=False)
    md = markdown.render([r])
    assert "| voltage class |" in md and "area voltage class" in md
    assert "| band |" not in md
