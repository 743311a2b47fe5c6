"""Load a design file: TOML text in, a validated :class:`Design` out, or every problem located."""

from __future__ import annotations

import tomllib
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from reviewer.design.model import Design
from reviewer.design.tomlpos import key_lines, line_of
from reviewer.errors import InputError, Problem, suggest


def load_design(path: str | Path) -> Design:
    """Read and validate the design file at ``path``; raise :class:`InputError` on any problem."""
    return parse_design(read_file(path), str(path))


def read_file(path: str | Path) -> str:
    """The text of an input file, or an :class:`InputError` naming it and what went wrong."""
    p = Path(path)
    try:
        return p.read_text(encoding="utf-8")
    except FileNotFoundError:
        raise InputError([Problem(str(p), None, "", "no such file")]) from None
    except (OSError, UnicodeDecodeError) as e:
        raise InputError([Problem(str(p), None, "", f"cannot be read: {e}")]) from None


def read_toml(text: str, name: str) -> dict[str, Any]:
    """Parse TOML, turning a syntax error into a located :class:`InputError`."""
    try:
        return tomllib.loads(text)
    except tomllib.TOMLDecodeError as e:
        import re

        line = getattr(e, "lineno", None)
        message = getattr(e, "msg", str(e))
        where = re.search(r"\(at line (\d+), column (\d+)\)", message)
        if where:
            line = line or int(where.group(1))
            message = message[: where.start()].strip() + f" (column {where.group(2)})"
        elif "(at end of document)" in message:
            message = message.replace("(at end of document)", "").strip() + " (at the end of the file)"
        raise InputError([Problem(name, line, "", f"TOML syntax: {message}")]) from None


def parse_design(text: str, name: str = "<design>") -> Design:
    """Validate a design from its TOML ``text``; ``name`` is used in error messages."""
    data = read_toml(text, name)
    return validate(Design, data, text, name)


def validate(model: type[BaseModel], data: dict[str, Any], text: str, name: str):
    """Validate ``data`` against ``model``; every problem names file, line and dotted field."""
    try:
        return model.model_validate(data)
    except ValidationError as e:
        lines = key_lines(text)
        problems = [_problem(err, model, data, lines, name) for err in e.errors()]
        raise InputError(sorted(set(problems), key=lambda p: (p.line or 0, p.path))) from None


def _problem(err: dict, model: type[BaseModel], data: Any, lines, name: str) -> Problem:
    loc = tuple(str(x) for x in err["loc"] if not _is_union_tag(x))
    path = ".".join(loc)
    line = line_of(lines, loc)
    kind = err["type"]
    found = err.get("input")
    if kind == "extra_forbidden":
        allowed = _allowed_keys(model, loc[:-1])
        msg = f"unknown key {loc[-1]!r}{suggest(loc[-1], allowed)}"
        if allowed:
            msg += f"; this table takes: {', '.join(sorted(allowed))}"
        return Problem(name, line, path, msg)
    if kind == "missing":
        return Problem(name, line_of(lines, loc[:-1]), path, "required, but not given")
    message = err["msg"].removeprefix("Value error, ")
    if kind in ("literal_error", "enum"):
        message = f"expected one of {err.get('ctx', {}).get('expected', '?')}, found {found!r}"
    elif kind not in ("value_error",) and found is not None and not isinstance(found, dict):
        message = f"{message}, found {found!r}"
    return Problem(name, line, path, message)


def _is_union_tag(x: Any) -> bool:
    """pydantic puts union member names into error locations; they are not keys of the file."""
    return isinstance(x, str) and (x.startswith("function-") or x in ("Answer", "literal['yes','no','not_applicable']")
                                   or x.startswith("literal["))


def _allowed_keys(model: type[BaseModel], loc: tuple[str, ...]) -> set[str]:
    """The field names of the table at ``loc`` in ``model``, for a "did you mean" hint."""
    current: Any = model
    for part in loc:
        fields = getattr(current, "model_fields", None)
        if fields is None or part not in fields:
            return set()
        current = _model_of(fields[part].annotation)
        if current is None:
            return set()
    fields = getattr(current, "model_fields", None)
    return set(fields) if fields else set()


def _model_of(annotation: Any) -> type[BaseModel] | None:
    import typing

    if isinstance(annotation, type) and issubclass(annotation, BaseModel):
        return annotation
    for arg in typing.get_args(annotation):
        found = _model_of(arg)
        if found is not None:
            return found
    return None
