"""reviewer deck: write one leg and the output filter as a SPICE netlist, at a judged corner."""

from __future__ import annotations

import argparse
from pathlib import Path

from reviewer.commands._common import add_rule_options


def register(sub) -> None:
    d = sub.add_parser(
        "deck", help="write one leg and the output filter as a SPICE netlist (for ngspice)",
        description="Write a plain SPICE3 netlist of one bridge leg (gate drives, switches, bus "
                    "and its capacitors) and the output filter and load, driven by the bridge "
                    "voltage the review analysed, with every value taken from the review at one "
                    "corner. It runs unmodified in 'ngspice -b'. It is for timing and filtering, "
                    "not device physics: the switches are simple models, not datasheet ones.")
    d.add_argument("design", type=Path, metavar="DESIGN")
    d.add_argument("--output", "-o", type=Path, metavar="FILE",
                   help="write the deck to FILE (atomically) instead of standard output")
    d.add_argument("--corner", default="worst", metavar="CORNER",
                   help="typical, worst (the corner of the worst shoot-through or V_DS finding; "
                        "the default) or a finding key, whose corner is taken")
    d.add_argument("--analysis", choices=("leg", "filter", "ac"), default="leg",
                   help="the active analysis: leg (one commutation each way, default), filter "
                        "(transient of the bridge voltage into the filter) or ac (the filter's "
                        "response); the other two are written as comments")
    add_rule_options(d)


def run(args: argparse.Namespace) -> int:
    import sys

    from reviewer.commands._record import finding_for, load_review
    from reviewer.deck import DeckError, build_deck, write_deck
    from reviewer.errors import InputError, Problem

    out: Path | None = args.output
    if out is not None and not out.parent.is_dir():
        raise InputError([Problem(str(out), None, "", f"no such folder {str(out.parent)!r} "
                                  "to write the deck into")])
    review = load_review(args.design, args)
    corner = args.corner
    if corner not in ("typical", "worst"):
        corner = finding_for(review, args.design, corner)
    try:
        if out is None:
            sys.stdout.write(build_deck(review, corner, args.analysis).text)
            return 0
        deck = write_deck(review, out, corner, args.analysis)
    except DeckError as e:
        raise InputError([Problem(str(args.design), None, e.field, str(e))]) from None
    print(f"wrote {out} ({deck.analysis} analysis; corner: {deck.corner.describe()})",
          file=sys.stderr)
    return 0
