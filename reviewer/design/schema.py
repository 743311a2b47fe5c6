"""The JSON Schema of the design file, for TOML editors that validate against JSON Schema."""

from __future__ import annotations

from typing import Any


def design_schema() -> dict[str, Any]:
    from reviewer.design.model import Design

    schema = Design.model_json_schema(mode="validation")
    schema["$schema"] = "https://json-schema.org/draft/2020-12/schema"
    schema["title"] = "Bridge Reviewer design file"
    schema["description"] = ("An H-bridge or inverter design. Quantities take engineering "
                             "notation with units ('4.7 kΩ', '100 nF'), bare SI numbers, or "
                             "tolerances ('10k ± 5%', {min, typ, max}).")
    return schema
