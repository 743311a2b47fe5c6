"""Load rule files: validate the format, compile every expression, check every name it reads.

Errors name the file, the line, the key and what was expected, before any design is loaded.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

from reviewer.design.loader import read_toml, validate
from reviewer.design.tomlpos import key_lines, line_of
from reviewer.errors import InputError, Problem, suggest
from reviewer.expr import Expr, ExprError, compile_expr
from reviewer.rulebook.model import Rule, RuleFile
from reviewer.units import UnitError, parse_with_unit, same_dimension

SPECIAL = {"value", "limit"}


@dataclass(frozen=True)
class Compiled:
    """One rule for one subject, its expressions compiled and its parameters in SI."""

    rule: Rule
    subject: str
    applies: Expr | None
    value: Expr | None
    limit: Expr | None
    limit_const: float | None
    fails_when: Expr | None
    pass_value: Expr | None
    params: dict[str, float]
    param_units: dict[str, str]
    unit: str
    fields: tuple[str, ...]
    mitigation: str
    why: str
    title: str


@dataclass
class Rulebook:
    rules: list[Rule] = field(default_factory=list)
    compiled: list[Compiled] = field(default_factory=list)
    files: list[str] = field(default_factory=list)

    def get(self, rule_id: str) -> Rule | None:
        return next((r for r in self.rules if r.id == rule_id), None)


@lru_cache(maxsize=1)
def known_names() -> tuple[dict[str, str], frozenset[str]]:
    """Every name a rule may read, with its unit; and the design field paths."""
    from reviewer.design.model import Design
    from reviewer.quantities import _none_fields, catalogue

    values: dict[str, Any] = {}
    units: dict[str, str] = {}
    _none_fields(Design, "", values, units)
    names = {f"design.{p}": units.get(p, "") for p in values}
    names.update({n: d.unit for n, d in catalogue().items()})
    return names, frozenset(values)


def rule_files(folder: Path) -> list[Path]:
    return sorted(p for p in folder.glob("*.toml") if p.is_file())


def load_rulebook(extra: list[Path] | None = None) -> Rulebook:
    """The built-in rules, then every file in ``extra`` (each rule id once)."""
    from reviewer.paths import builtin_rules_dir

    files = rule_files(builtin_rules_dir()) + list(extra or [])
    book = Rulebook()
    problems: list[Problem] = []
    for path in files:
        try:
            rules = read_rule_file(path)
        except InputError as e:
            problems.extend(e.problems)
            continue
        book.files.append(str(path))
        for rule, line in rules:
            if book.get(rule.id):
                problems.append(Problem(str(path), line, f"rule.{rule.id}",
                                        f"duplicate rule id {rule.id!r}"))
                continue
            book.rules.append(rule)
    if problems:
        raise InputError(problems)
    for rule in book.rules:
        if rule.enabled:
            book.compiled.extend(compile_rule(rule))
    return book


def read_rule_file(path: Path, origin: str | None = None) -> list[tuple[Rule, int | None]]:
    """Read one rule file; every rule checked and compiled, or every problem located."""
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as e:
        raise InputError([Problem(str(path), None, "", f"cannot be read: {e}")]) from None
    data = read_toml(text, str(path))
    area = data.get("area", "")
    for i, r in enumerate(data.get("rule", []) if isinstance(data.get("rule"), list) else []):
        if isinstance(r, dict):
            r.setdefault("area", area or (r.get("id", "").split(".")[0]))
            r["origin"] = origin or ("built-in" if _is_builtin(path) else str(path))
    parsed: RuleFile = validate(RuleFile, data, text, str(path))
    lines = key_lines(text)
    problems: list[Problem] = []
    out = []
    for i, rule in enumerate(parsed.rule):
        where = ("rule", str(i))
        for message, key in check_rule(rule):
            problems.append(Problem(str(path), line_of(lines, where + ((key,) if key else ())),
                                    f"rule[{i}] ({rule.id}).{key}" if key else f"rule[{i}] ({rule.id})",
                                    message))
        out.append((rule, line_of(lines, where)))
    if problems:
        raise InputError(problems)
    return out


def _is_builtin(path: Path) -> bool:
    from reviewer.paths import builtin_rules_dir

    try:
        return path.resolve().parent == builtin_rules_dir().resolve()
    except OSError:
        return False


def check_rule(rule: Rule) -> list[tuple[str, str]]:
    """Every problem with a rule: (message, key). Empty when the rule compiles for every subject."""
    try:
        compile_rule(rule)
    except _RuleProblem as e:
        return e.problems
    return []


class _RuleProblem(Exception):
    def __init__(self, problems: list[tuple[str, str]]):
        self.problems = problems


def compile_rule(rule: Rule) -> list[Compiled]:
    names, design_paths = known_names()
    problems: list[tuple[str, str]] = []
    params: dict[str, float] = {}
    param_units: dict[str, str] = {}
    for key, text in rule.params.items():
        try:
            params[key], param_units[key] = parse_with_unit(text)
        except UnitError as e:
            problems.append((f"parameter {key!r}: {e}", "params"))
    out: list[Compiled] = []
    for subject in rule.each or [""]:
        def sub(text: str) -> str:
            return text.replace("{each}", subject)

        def comp(text: str | None, key: str, extra: set[str] = set()) -> Expr | None:
            if text is None:
                return None
            try:
                e = compile_expr(sub(text))
            except ExprError as err:
                problems.append((str(err), key))
                return None
            allowed = set(params) | extra
            for n in sorted(e.names - allowed):
                if n not in names:
                    problems.append((f"unknown quantity {n!r}{suggest(n, set(names) | allowed)}", key))
            return e

        applies = comp(rule.applies, "applies")
        value = comp(rule.value, "value")
        fails = comp(rule.fails_when, "fails_when")
        unit = rule.unit if rule.unit is not None else ""
        if value is not None and rule.unit is None:
            single = sub(rule.value or "").strip()
            if single in names:
                unit = names[single]
        limit = None
        limit_const = None
        lt = rule.limit_text
        if lt is not None:
            try:
                limit_const, limit_unit = parse_with_unit(lt)
                if not same_dimension(limit_unit, unit) and limit_unit != "":
                    problems.append((f"limit {lt!r} is in {limit_unit or 'no unit'}, but the value "
                                     f"is in {unit or 'no unit'}", "at_most" if rule.at_most is not None else "at_least"))
            except UnitError:
                limit = comp(str(lt), "at_most" if rule.at_most is not None else "at_least", {"value"})
        pass_value = comp(rule.pass_.value, "pass", SPECIAL) if rule.pass_ else None
        for f in rule.fields + ([rule.pass_.field] if rule.pass_ and rule.pass_.field else []):
            if sub(f) not in design_paths:
                problems.append((f"unknown design field {sub(f)!r}{suggest(sub(f), design_paths)}", "fields"))
        for key, text in (("mitigation", rule.mitigation), ("why", rule.why), ("title", rule.title)):
            for ph in placeholders(sub(text)):
                comp(ph[0], key, SPECIAL | {"pass_value", "margin", "subject"})
        out.append(Compiled(rule, subject, applies, value, limit, limit_const, fails, pass_value,
                            params, param_units, unit, tuple(sub(f) for f in rule.fields), sub(rule.mitigation),
                            sub(rule.why), sub(rule.title)))
    if problems:
        raise _RuleProblem(list(dict.fromkeys(problems)))
    return out


def placeholders(text: str) -> list[tuple[str, str | None, str]]:
    """The ``{expression}`` or ``{expression | unit}`` placeholders of a text: (expr, unit, raw)."""
    out = []
    depth, start = 0, -1
    for i, ch in enumerate(text):
        if ch == "{":
            if depth == 0:
                start = i
            depth += 1
        elif ch == "}" and depth:
            depth -= 1
            if depth == 0:
                raw = text[start:i + 1]
                inner = raw[1:-1]
                expr, _, unit = inner.partition("|")
                out.append((expr.strip(), unit.strip() if _ else None, raw))
    return out
