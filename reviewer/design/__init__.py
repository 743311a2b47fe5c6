"""The design file: its model (pydantic, immutable) and its loader with located errors."""

from reviewer.design.loader import load_design, parse_design
from reviewer.design.model import Design

__all__ = ["Design", "load_design", "parse_design"]
