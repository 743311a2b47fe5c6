"""reviewer schema: print the JSON Schema of the design file format."""

from __future__ import annotations

import argparse


def register(sub) -> None:
    s = sub.add_parser("schema", help="print the JSON Schema of the design file format")
    s.add_argument("--of", choices=("design", "review"), default="design",
                   help="design: the design file format; review: the JSON report (check "
                        "--format json)")


def run(args: argparse.Namespace) -> int:
    import json

    if getattr(args, "of", "design") == "review":
        from reviewer.report.json import schema

        print(json.dumps(schema(), indent=2, ensure_ascii=False))
        return 0
    from reviewer.design.schema import design_schema

    print(json.dumps(design_schema(), indent=2, ensure_ascii=False))
    return 0
