"""reviewer sheet: print the calculation sheet of a design."""

from __future__ import annotations

import argparse
from pathlib import Path


def register(sub) -> None:
    s = sub.add_parser("sheet", help="print the calculation sheet of a design")
    s.add_argument("design", type=Path, metavar="DESIGN")
    s.add_argument("--format", choices=("text", "json"), default="text")


def run(args: argparse.Namespace) -> int:
    from reviewer.review import review_file

    r = review_file(args.design)
    if args.format == "json":
        import json

        from reviewer.report.json import to_data

        print(json.dumps(to_data(r)["sheet"], indent=2, ensure_ascii=False))
        return 0
    from reviewer.report.common import num

    rows = sorted(r.sheet.quantities.values(), key=lambda q: q.name)
    width = max(len(q.name) for q in rows)
    for q in rows:
        if q.kind == "number":
            span = "" if not q.toleranced else f"   [{num(q.lo, q.unit)} … {num(q.hi, q.unit)}]"
            value = num(q.typ, q.unit) + span
        else:
            value = str(q.typ)
        note = f"   ({q.note})" if q.note else ""
        print(f"{q.name:<{width}}  {value}{note}")
    for m in sorted(r.sheet.missing.values(), key=lambda m: m.name):
        if not m.name.startswith("design."):
            print(f"{m.name:<{width}}  not computed: give {', '.join(m.needs)}")
    return 0
