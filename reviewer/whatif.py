"""What-if changes: a design with proposed field values applied, never written back to its file.

A proposal (see :class:`reviewer.record.Proposal`) names a design field by its dotted path
(``timing.dead_time``) and the value the reviewer would like to try, as written (``"800 ns"``).
:func:`apply` reads the design file, sets each proposed field in the parsed TOML data and
validates the result through the same loader as the file itself, so a bad proposal is reported
like a bad file entry: which field, what was given, what was expected. The design file on disk is
never touched.
"""

from __future__ import annotations

import tomllib
from collections.abc import Mapping
from pathlib import Path
from typing import Any

from reviewer.design import Design
from reviewer.design.loader import read_toml, validate
from reviewer.errors import InputError, Problem


def parse_value(text: str) -> Any:
    """The TOML value a proposal's text stands for.

    Anything that is a TOML value on its own (``12``, ``true``, ``"800 ns"``,
    ``{ min = "1 V", max = "3 V" }``) is taken as such; anything else (``800 ns``, ``10k ± 5%``)
    is taken as a string, which is how quantities with units are written in a design file.

    Parameters
    ----------
    text : str
        The value as the reviewer wrote it [unitless].

    Returns
    -------
    Any
        A str, int, float, bool, list or dict, as the TOML parser gives it.

    References
    ----------
    TOML v1.0.0 specification, "Keys" and "Values" (toml.io).
    """
    stripped = text.strip()
    try:
        return tomllib.loads(f"v = {stripped}")["v"]
    except tomllib.TOMLDecodeError:
        return stripped


def set_field(data: dict[str, Any], path: str, value: Any) -> dict[str, Any]:
    """A copy of ``data`` with the dotted ``path`` set to ``value``, tables made as needed.

    Raises :class:`ValueError` when a part of the path is a value, not a table.
    """
    parts = [p for p in path.strip().split(".") if p]
    if not parts:
        raise ValueError("no field given")
    out = dict(data)
    node = out
    for i, part in enumerate(parts[:-1]):
        child = node.get(part, {})
        if not isinstance(child, dict):
            raise ValueError(f"{'.'.join(parts[: i + 1])} is a value, not a table")
        child = dict(child)
        node[part] = child
        node = child
    node[parts[-1]] = value
    return out


def apply_to_text(text: str, name: str, proposals: Mapping[str, str]) -> Design:
    """Validate the design in ``text`` with ``proposals`` (field path -> value text) applied.

    Raises
    ------
    InputError
        When the file itself is bad (problems located in the file), or a proposal is (problems
        naming the proposed field and value; the line is that of the field in the file when it
        is there, since that is the entry the proposal replaces).
    """
    data = read_toml(text, name)
    problems: list[Problem] = []
    for path, value in proposals.items():
        try:
            data = set_field(data, path, parse_value(value))
        except ValueError as e:
            problems.append(Problem(name, None, path, f"proposal {value!r}: {e}"))
    if problems:
        raise InputError(problems)
    try:
        return validate(Design, data, text, name)
    except InputError as e:
        raise InputError([_mark(p, proposals) for p in e.problems]) from None


def _mark(problem: Problem, proposals: Mapping[str, str]) -> Problem:
    for path, value in proposals.items():
        if problem.path == path or problem.path.startswith(path + "."):
            return Problem(problem.file, problem.line, problem.path,
                           f"proposed value {value!r}: {problem.message}")
    return problem


def apply(path: str | Path, proposals: Mapping[str, str]) -> Design:
    """The design at ``path`` with ``proposals`` applied; the file is read, never written."""
    from reviewer.design.loader import read_file

    return apply_to_text(read_file(path), str(path), proposals)


def proposals_of(record: Any) -> dict[str, str]:
    """Field path -> value text for every proposal in a :class:`reviewer.record.Record`."""
    return {k: p.value for k, p in sorted(record.proposals.items())}


def review_with_proposals(path: str | Path, book: Any, record: Any, filed: Any = None) -> Any:
    """Review the design at ``path`` with the record's proposals applied (a what-if review).

    The returned :class:`reviewer.review.Review` carries ``record`` (proposals included), so that
    a view or an export can say which changes it was computed with. ``filed``: the review of
    the design as filed, when there is one: the derive modules that read no proposed field
    replay from it (see :func:`reviewer.review.review_design`).
    """
    from reviewer.review import review_design

    design = apply(path, proposals_of(record))
    return review_design(design, str(path), book, record, like=filed)
