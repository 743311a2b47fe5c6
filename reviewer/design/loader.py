"""Load a design file: TOML text in, a validated :class:`Design` out, or every problem located.

Every input file the tool reads (designs, review records, rule files) comes through
:func:`read_file` and :func:`read_toml`, which bound it before any physics: at most
:data:`MAX_BYTES` of UTF-8, nesting at most :data:`MAX_DEPTH` levels deep, at most
:data:`MAX_ENTRIES` entries in any one table or array. Each file kind is recognised by its marker
(:func:`kind_of`): a design has a ``[design]`` table (and may say ``format =
"bridge-reviewer/design"``), a review record says ``format = "bridge-reviewer/record"``, a rule
file has ``[[rule]]``, ``[[override]]`` or ``[[disable]]`` tables (and may say ``format =
"bridge-reviewer/rules"``); a file of one kind given where another is expected is named as what
it is (:class:`WrongKind`).
"""

from __future__ import annotations

import re
import tomllib
from pathlib import Path
from typing import Any

from pydantic import BaseModel, ValidationError

from reviewer.design.model import Design
from reviewer.design.tomlpos import key_lines, line_of
from reviewer.errors import InputError, Problem, suggest


MAX_BYTES = 1 << 20
"""Largest input file read [bytes] (1 MiB; the bundled designs are under 10 kB and the largest
rule file under 40 kB)."""
MAX_DEPTH = 16
"""Deepest nesting of tables, inline tables and arrays in an input file [levels]."""
MAX_ENTRIES = 2000
"""Most entries in one table or one array of an input file."""

DESIGN_FORMAT = "bridge-reviewer/design"
RECORD_FORMAT = "bridge-reviewer/record"
RULES_FORMAT = "bridge-reviewer/rules"
KINDS = {DESIGN_FORMAT: "design", RECORD_FORMAT: "record", RULES_FORMAT: "rules"}
WHAT = {"design": "a design", "record": "a review record", "rules": "a rule file"}


class WrongKind(InputError):
    """A file of another kind (a record or a rule file given as a design, ...): ``kind`` says
    what it is, ``want`` what was expected, ``note`` says it in a sentence the command can print
    instead of an error."""

    def __init__(self, problems: list[Problem], kind: str, note: str, want: str = ""):
        super().__init__(problems)
        self.kind = kind
        self.note = note
        self.want = want


def kind_of(data: dict[str, Any]) -> str | None:
    """The kind of a parsed input file by its marker: ``"design"``, ``"record"``, ``"rules"``,
    or None when it has none of them."""
    marker = data.get("format")
    if isinstance(marker, str) and marker in KINDS:
        return KINDS[marker]
    if isinstance(data.get("design"), dict):
        return "design"
    if any(k in data for k in ("rule", "override", "disable")):
        return "rules"
    return None


def expect_kind(data: dict[str, Any], want: str, text: str, name: str) -> None:
    """Raise :class:`WrongKind` when ``data`` is marked as another kind of file than ``want``;
    drop a matching ``format`` marker so that the model never sees it."""
    kind = kind_of(data)
    if kind is not None and kind != want:
        lines = key_lines(text)
        where = line_of(lines, ("format",)) or line_of(lines, ("design",)) or 1
        what = WHAT[kind]
        if kind == "record" and isinstance(data.get("design"), str) and data["design"]:
            what = f"the review record of {data['design']}"
        note = f"{name} is {what}"
        message = f"this is {what}, not {WHAT[want]}"
        raise WrongKind([Problem(name, where, "", message)], kind, note, want)
    marker = data.get("format")
    if want != "record" and isinstance(marker, str) and KINDS.get(marker) == want:
        del data["format"]


def load_design(path: str | Path) -> Design:
    """Read and validate the design file at ``path``; raise :class:`InputError` on any problem."""
    return parse_design(read_file(path), str(path))


def read_file(path: str | Path) -> str:
    """The text of an input file, or an :class:`InputError` naming it and what went wrong.

    A file above :data:`MAX_BYTES` is refused before it is read whole.
    """
    p = Path(path)
    try:
        with p.open("rb") as fh:
            raw = fh.read(MAX_BYTES + 1)
    except FileNotFoundError:
        raise InputError([Problem(str(p), None, "", "no such file")]) from None
    except IsADirectoryError:
        raise InputError([Problem(str(p), None, "", "is a folder, not a file")]) from None
    except OSError as e:
        raise InputError([Problem(str(p), None, "", f"cannot be read: {e.strerror or e}")]
                         ) from None
    if len(raw) > MAX_BYTES:
        line = raw[:MAX_BYTES].count(b"\n") + 1
        raise InputError([Problem(str(p), line, "", f"the file is larger than {MAX_BYTES} bytes "
                                  "(1 MiB), more than any design, record or rule file needs; "
                                  "refused")])
    try:
        return raw.decode("utf-8")
    except UnicodeDecodeError as e:
        line = raw[: e.start].count(b"\n") + 1
        column = e.start - (raw.rfind(b"\n", 0, e.start) + 1) + 1
        raise InputError([Problem(str(p), line, "", f"not UTF-8 text: byte 0x{raw[e.start]:02x} "
                                  f"(column {column}) cannot be decoded; save the file as "
                                  "UTF-8")]) from None


def read_toml(text: str, name: str) -> dict[str, Any]:
    """Parse TOML, turning a syntax error into a located :class:`InputError`; refuse text beyond
    the size, depth and entry bounds (:data:`MAX_BYTES`, :data:`MAX_DEPTH`, :data:`MAX_ENTRIES`)."""
    if len(text) > MAX_BYTES:
        raise InputError([Problem(name, text[:MAX_BYTES].count("\n") + 1, "",
                                  f"the text is longer than {MAX_BYTES} characters; refused")])
    refused = _prescan(text, name)
    if refused is not None:
        raise InputError([refused])
    try:
        data = tomllib.loads(text)
    except tomllib.TOMLDecodeError as e:
        raise InputError([_syntax(e, name)]) from None
    except (RecursionError, MemoryError):
        raise InputError([Problem(name, 1, "", "too deeply nested or too large to read; "
                                  "refused")]) from None
    _bounded(data, text, name)
    return data


_TOKENS = re.compile(
    r'"""(?:[^\\]|\\.)*?"""' r"|'''.*?'''"  # multi-line strings
    r'|"(?:[^"\\\n]|\\.)*"' r"|'[^'\n]*'"  # one-line strings
    r'|#[^\n]*|[\[\]{}]',  # comments, brackets
    re.DOTALL)


_DOTTED = re.compile(r"""(?m)^[ \t]*\[*[ \t]*((?:[A-Za-z0-9_-]+|"[^"\n]*"|'[^'\n]*')"""
                     r"""(?:[ \t]*\.[ \t]*(?:[A-Za-z0-9_-]+|"[^"\n]*"|'[^'\n]*'))+)""")


def _prescan(text: str, name: str) -> Problem | None:
    """A quick scan ahead of the parser (which is recursive, and quadratic in dotted keys): the
    first place where keys or brackets outside strings and comments nest beyond
    :data:`MAX_DEPTH`, or where more than ``2 × MAX_ENTRIES`` arrays and tables are opened, as a
    located problem; None when there is none. The parser still judges the syntax."""
    def at(pos: int) -> int:
        return text.count("\n", 0, pos) + 1

    deep = f"nested more than {MAX_DEPTH} levels deep"
    if text.count(".") > MAX_DEPTH:
        for m in _DOTTED.finditer(text):
            if m.group(1).count(".") >= MAX_DEPTH:
                return Problem(name, at(m.start()), "", f"{deep} (a dotted key or table name of "
                               f"{m.group(1).count('.') + 1} parts); refused")
    if text.count("[") + text.count("{") <= MAX_DEPTH:
        return None
    depth = opened = 0
    for m in _TOKENS.finditer(text):
        tok = m.group()
        if tok in ("[", "{"):
            depth += 1
            opened += 1
            if depth > MAX_DEPTH:
                return Problem(name, at(m.start()), "", f"{deep} (arrays or inline tables "
                               "within each other); refused")
            if opened > 2 * MAX_ENTRIES:
                return Problem(name, at(m.start()), "", f"more than {2 * MAX_ENTRIES} arrays and "
                               "tables in one file; refused")
        elif tok in ("]", "}"):
            depth = max(0, depth - 1)
    return None


def _syntax(e: tomllib.TOMLDecodeError, name: str) -> Problem:
    line = getattr(e, "lineno", None)
    message = getattr(e, "msg", str(e))
    where = re.search(r"\(at line (\d+), column (\d+)\)", message)
    if where:
        line = line or int(where.group(1))
        message = message[: where.start()].strip() + f" (column {where.group(2)})"
    elif "(at end of document)" in message:
        message = message.replace("(at end of document)", "").strip() + " (at the end of the file)"
    return Problem(name, line or 1, "", f"TOML syntax: {message}")


def _bounded(data: dict[str, Any], text: str, name: str) -> None:
    """Refuse parsed data nested deeper than :data:`MAX_DEPTH` (dotted keys and table headers
    count) or with a table or array of more than :data:`MAX_ENTRIES` entries. Iterative, so no
    input can exhaust the stack here."""
    stack: list[tuple[tuple[str, ...], Any]] = [((), data)]
    while stack:
        path, node = stack.pop()
        if isinstance(node, dict):
            children = [(path + (str(k),), v) for k, v in node.items()]
        elif isinstance(node, list):
            children = [(path + (str(i),), v) for i, v in enumerate(node)]
        else:
            continue
        if len(path) > MAX_DEPTH:
            raise InputError([Problem(name, line_of(key_lines(text), path) or 1,
                                      ".".join(path[:MAX_DEPTH]) + "…",
                                      f"nested more than {MAX_DEPTH} levels deep; refused")])
        if len(children) > MAX_ENTRIES:
            raise InputError([Problem(name, line_of(key_lines(text), path) or 1, ".".join(path),
                                      f"{len(children)} entries, more than the {MAX_ENTRIES} one "
                                      "table or array may hold; refused")])
        stack.extend(children)


def parse_design(text: str, name: str = "<design>") -> Design:
    """Validate a design from its TOML ``text``; ``name`` is used in error messages."""
    data = read_toml(text, name)
    return validate(Design, data, text, name)


def validate(model: type[BaseModel], data: dict[str, Any], text: str, name: str):
    """Validate ``data`` against ``model``; every problem names file, line and dotted field.

    A design is also checked against its physical ranges and dependent limits
    (:mod:`reviewer.design.ranges`) before anything computes with it.
    """
    if model is Design:
        expect_kind(data, "design", text, name)
    try:
        out = model.model_validate(data)
    except ValidationError as e:
        lines = key_lines(text)
        problems = [_problem(err, model, data, lines, name) for err in e.errors()]
        raise InputError(sorted(set(problems), key=lambda p: (p.line or 0, p.path))) from None
    except (RecursionError, MemoryError):
        raise InputError([Problem(name, 1, "", "too deeply nested or too large to "
                                  "validate; refused")]) from None
    if isinstance(out, Design):
        from reviewer.design import ranges

        broken = ranges.check(out)
        if broken:
            lines = key_lines(text)
            raise InputError([Problem(name, line_of(lines, path) or 1, ".".join(path), message)
                              for path, message in broken])
    return out


def _problem(err: dict, model: type[BaseModel], data: Any, lines, name: str) -> Problem:
    loc = tuple(str(x) for x in err["loc"] if not _is_union_tag(x))
    path = ".".join(loc)
    line = line_of(lines, loc) or 1  # a table not written at all: the file's first line
    kind = err["type"]
    found = err.get("input")
    if kind == "extra_forbidden":
        allowed = _allowed_keys(model, loc[:-1])
        msg = f"unknown key {loc[-1]!r}{suggest(loc[-1], allowed)}"
        if allowed:
            msg += f"; this table takes: {', '.join(sorted(allowed))}"
        return Problem(name, line, path, msg)
    if kind == "missing":
        return Problem(name, line_of(lines, loc[:-1]) or 1, path, "required, but not given")
    message = err["msg"].removeprefix("Value error, ")
    if kind == "value_error" and RANGE_WORDS in message:
        from reviewer.design import ranges

        if ranges.narrowed(path):  # name the field's own range, not only its unit's
            message = message.split(RANGE_WORDS)[0] + RANGE_WORDS + ranges.for_path(path, "").text()
    if kind in ("literal_error", "enum"):
        message = f"expected one of {err.get('ctx', {}).get('expected', '?')}, found {found!r}"
    elif kind not in ("value_error",) and found is not None and not isinstance(found, dict):
        message = f"{message}, found {found!r}"
    return Problem(name, line, path, message)


RANGE_WORDS = " is out of range: allowed "


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
