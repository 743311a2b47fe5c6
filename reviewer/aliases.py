"""Rule ids that were renamed, and the old ids they still answer to.

A record file or a house rule file written before a rename keeps working: its decisions,
overrides and switches-off under an old id apply to the rule's new id. The area once called
"band" is the *voltage class* (extra-low voltage or beyond), a name a reader understands.
"""

from __future__ import annotations

RENAMED: dict[str, str] = {
    "band.bus-elv": "voltage-class.bus-elv",
    "band.output-elv": "voltage-class.output-elv",
}
"""Old rule id -> current rule id."""


def current_id(rule_id: str) -> str:
    """The current id of a rule given by a current or an old id."""
    return RENAMED.get(rule_id, rule_id)


def current_key(key: str) -> str:
    """A finding key (``rule id[subject]``) with its rule id made current."""
    rule_id, bracket, rest = key.partition("[")
    return current_id(rule_id) + bracket + rest
