"""Rule files: their format (:mod:`.model`) and their loader (:mod:`.loader`)."""

from reviewer.rulebook.loader import load_rulebook
from reviewer.rulebook.model import Rule

__all__ = ["Rule", "load_rulebook"]
