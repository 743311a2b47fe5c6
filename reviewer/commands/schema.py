"""reviewer schema: print the JSON Schema of the design file format."""

from __future__ import annotations

import argparse


def register(sub) -> None:
    sub.add_parser("schema", help="print the JSON Schema of the design file format")


def run(args: argparse.Namespace) -> int:
    import json

    from reviewer.design.schema import design_schema

    print(json.dumps(design_schema(), indent=2, ensure_ascii=False))
    return 0
