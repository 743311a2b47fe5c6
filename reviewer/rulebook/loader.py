"""Load rule files: validate the format, layer house files, compile and type-check every expression.

The built-in files come first; then each house file in order of precedence (see
:mod:`reviewer.rulebook.discover`): a later file may add rules, change a rule defined before it
(``[[override]]``) or switch one off (``[[disable]]``, with a reason that every report shows).
Files that name a ``profile`` are applied only when that profile (or one that extends it) is
chosen, after the profiles it extends.

Errors name the file, the line, the key and what was expected, before any design is loaded:
unknown keys and quantities (with a "did you mean"), a limit whose unit does not fit the value,
an expression that mixes kinds (a flag in arithmetic, a number compared with a text) or
dimensions, and duplicate ids.
"""

from __future__ import annotations

from dataclasses import dataclass, field
from functools import lru_cache
from pathlib import Path
from typing import Any

from reviewer.design.loader import expect_kind, read_file, read_toml, validate
from reviewer.design.tomlpos import key_lines, line_of
from reviewer.errors import InputError, Problem, suggest
from reviewer.expr import (NODIM, Expr, ExprError, Type, compile_expr, dimension_of, infer,
                           parse_quantity, sample, type_of_unit, unit_name)
from reviewer.rulebook.model import Rule, RuleFile
from reviewer.units import UnitError

SPECIAL = {"value", "limit"}
DEFAULT_PROFILE = "default"


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
    fail_title: str = ""
    cases: tuple[tuple[Expr | None, str | None, str], ...] = ()
    """(condition, absent quantity, text) for each of the rule's mitigation cases, in order."""


@dataclass(frozen=True)
class Source:
    """A rule file to load and where it was found: built-in, user, project or command line."""

    path: Path
    kind: str = "command line"


@dataclass(frozen=True)
class Disabled:
    """A rule switched off, the reason given, and the file that switched it off."""

    rule_id: str
    title: str
    reason: str
    origin: str


@dataclass
class Layer:
    """What one loaded file did: rules added, changed (with the keys) and switched off."""

    file: str
    kind: str
    profile: str
    applied: bool = True
    added: list[str] = field(default_factory=list)
    changed: list[tuple[str, tuple[str, ...], str]] = field(default_factory=list)
    disabled: list[tuple[str, str]] = field(default_factory=list)


@dataclass
class Rulebook:
    rules: list[Rule] = field(default_factory=list)
    compiled: list[Compiled] = field(default_factory=list)
    files: list[str] = field(default_factory=list)
    disabled: list[Disabled] = field(default_factory=list)
    layers: list[Layer] = field(default_factory=list)
    profile: str = DEFAULT_PROFILE
    profiles: dict[str, str | None] = field(default_factory=lambda: {DEFAULT_PROFILE: None})
    history: dict[str, list[str]] = field(default_factory=dict)
    """For each rule id, what happened to it, in order ("defined in X", "limit changed by Y")."""

    def get(self, rule_id: str) -> Rule | None:
        from reviewer.aliases import current_id

        rule_id = current_id(rule_id)
        return next((r for r in self.rules if r.id == rule_id), None)

    def disabled_rule(self, rule_id: str) -> Disabled | None:
        return next((d for d in self.disabled if d.rule_id == rule_id), None)


# --- names a rule may read --------------------------------------------------------------------

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


@lru_cache(maxsize=1)
def known_types() -> dict[str, Type]:
    """The kind (number, flag, text), dimension and allowed texts of every name a rule may read."""
    from reviewer.design.model import Design
    from reviewer.quantities import catalogue

    out: dict[str, Type] = {}
    _walk_types(Design, "design.", out)
    for n, d in catalogue().items():
        out[n] = type_of_unit(d.unit, d.kind)
    return out


def _walk_types(cls: Any, prefix: str, out: dict[str, Type]) -> None:
    from reviewer.quantities import _submodel

    for name, info in cls.model_fields.items():
        sub = _submodel(cls, name, info.annotation)
        if sub is not None:
            _walk_types(sub, f"{prefix}{name}.", out)
            continue
        t = _field_type(info.annotation, info.metadata)
        if t is not None:
            out[f"{prefix}{name}"] = t


def _field_type(annotation: Any, metadata: list[Any]) -> Type | None:
    import typing

    from reviewer.design.fields import UnitTag
    from reviewer.quantities import _unit_in_annotation

    tag = next((m for m in metadata if isinstance(m, UnitTag)), None) or _unit_in_annotation(annotation)
    literals: set[str] = set()
    plain: set[type] = set()

    def walk(a: Any) -> None:
        origin = typing.get_origin(a)
        if origin is typing.Literal:
            literals.update(str(x) for x in typing.get_args(a))
        elif origin in (typing.Union, typing.Annotated) or str(origin) == "<class 'types.UnionType'>":
            for x in typing.get_args(a):
                walk(x)
        elif isinstance(a, type):
            plain.add(a)
        elif origin is not None:
            plain.add(origin)

    walk(annotation)
    plain.discard(type(None))
    if plain & {list, dict, tuple, set}:
        return None
    if tag is not None:
        if literals:  # a gate level: a voltage or "bus"
            return Type(None, dimension_of(tag.unit), frozenset(literals))
        return Type("number", dimension_of(tag.unit))
    if bool in plain:
        return Type("flag")
    if literals and not plain - {str}:
        return Type("text", choices=frozenset(literals))
    if plain & {int, float}:
        return Type("number", NODIM)
    if str in plain:
        return Type("text")
    return None


# --- reading files ------------------------------------------------------------------------------

def rule_files(folder: Path) -> list[Path]:
    return sorted(p for p in folder.glob("*.toml") if p.is_file())


@dataclass
class _Read:
    source: Source
    parsed: RuleFile
    lines: dict[tuple[str, ...], int]
    profile: str


def _read(source: Source) -> _Read:
    path = source.path
    text = read_file(path)
    data = read_toml(text, str(path))
    expect_kind(data, "rules", text, str(path))
    area = data.get("area", "")
    origin = "built-in" if source.kind == "built-in" else str(path)
    for r in data.get("rule", []) if isinstance(data.get("rule"), list) else []:
        if isinstance(r, dict):
            r.setdefault("area", area or (str(r.get("id", "")).split(".")[0]))
            r["origin"] = origin
    parsed: RuleFile = validate(RuleFile, data, text, str(path))
    return _Read(source, parsed, key_lines(text), parsed.profile or DEFAULT_PROFILE)


def read_rule_file(path: Path, origin: str | None = None) -> list[tuple[Rule, int | None]]:
    """Read one rule file on its own; every new rule checked and compiled, or every problem located."""
    kind = "built-in" if _is_builtin(path) else "command line"
    f = _read(Source(path, kind))
    problems: list[Problem] = []
    out = []
    for i, rule in enumerate(f.parsed.rule):
        if origin is not None:
            rule = rule.model_copy(update={"origin": origin})
        problems.extend(_locate(str(path), f.lines, ("rule", str(i)), rule.id, check_rule(rule)))
        out.append((rule, line_of(f.lines, ("rule", str(i)))))
    if problems:
        raise InputError(problems)
    return out


def _is_builtin(path: Path) -> bool:
    from reviewer.paths import builtin_rules_dir

    try:
        return path.resolve().parent == builtin_rules_dir().resolve()
    except OSError:
        return False


def builtin_sources() -> list[Source]:
    from reviewer.paths import builtin_rules_dir

    return [Source(p, "built-in") for p in rule_files(builtin_rules_dir())]


def _locate(file: str, lines: dict, where: tuple[str, ...], rule_id: str,
            found: list[tuple[str, str]]) -> list[Problem]:
    out = []
    for message, key in found:
        path = where + ((key,) if key else ())
        label = f"{where[0]}[{where[1]}] ({rule_id})" + (f".{key}" if key else "")
        out.append(Problem(file, line_of(lines, path) or 1, label, message))
    return out


# --- layering -----------------------------------------------------------------------------------

def load_rulebook(extra: list[Path] | None = None, *, sources: list[Source] | None = None,
                  profile: str = DEFAULT_PROFILE) -> Rulebook:
    """The built-in rules, then every house file in order (later wins), for ``profile``.

    ``extra`` are files given on the command line (kept for callers that have only those);
    ``sources`` is the full ordered list of house files (see
    :func:`reviewer.rulebook.discover.house_sources`), placed after the built-in ones.
    """
    house = list(sources or []) + [Source(p, "command line") for p in (extra or [])]
    from reviewer.rulebook.cache import cached

    return cached(builtin_sources() + house, profile, lambda: _build(house, profile))


def _build(house: list[Source], profile: str) -> Rulebook:
    """Read, layer and compile the built-in rules and ``house`` (uncached)."""
    reads: list[_Read] = []
    problems: list[Problem] = []
    for source in builtin_sources() + house:
        try:
            reads.append(_read(source))
        except InputError as e:
            problems.extend(e.problems)
    if problems:
        raise InputError(problems)
    book = Rulebook(profile=profile)
    chain = _profile_chain(reads, profile, book, problems)
    if problems:
        raise InputError(problems)
    order = {name: i for i, name in enumerate(chain)}
    applied = sorted((f for f in reads if f.profile in order),
                     key=lambda f: (order[f.profile], f.source.kind != "built-in"))
    for f in reads:
        if f.profile not in order:
            book.layers.append(Layer(str(f.source.path), f.source.kind, f.profile, applied=False))
    _apply(book, applied, problems)
    if problems:
        raise InputError(problems)
    return book


def _profile_chain(reads: list[_Read], profile: str, book: Rulebook,
                   problems: list[Problem]) -> list[str]:
    """The profiles to apply, the root (default) first and ``profile`` last."""
    declared: dict[str, tuple[str, str]] = {}  # profile -> (extends, file that said so)
    for f in reads:
        p = f.parsed
        if p.profile is None or p.profile == DEFAULT_PROFILE:
            continue
        parent = p.extends or DEFAULT_PROFILE
        seen = declared.get(p.profile)
        if seen is None or (p.extends is not None and seen[1] == ""):
            declared[p.profile] = (parent, str(f.source.path) if p.extends else "")
        elif p.extends is not None and seen[0] != parent:
            problems.append(Problem(str(f.source.path), line_of(f.lines, ("extends",)), "extends",
                                    f"profile {p.profile!r} extends {seen[0]!r} in {seen[1]}, "
                                    f"but {parent!r} here"))
    book.profiles = {DEFAULT_PROFILE: None, **{k: v[0] for k, v in declared.items()}}
    for name, (parent, where) in declared.items():
        if parent not in book.profiles:
            problems.append(Problem(where or "rules", None, "extends",
                                    f"profile {name!r} extends {parent!r}, which no file defines"
                                    f"{suggest(parent, set(book.profiles))}"))
    if profile not in book.profiles:
        problems.append(Problem("--profile", None, "", f"no profile {profile!r}"
                                f"{suggest(profile, set(book.profiles))}; profiles: "
                                f"{', '.join(sorted(book.profiles))}"))
        return []
    chain = [profile]
    while book.profiles.get(chain[-1]) is not None:
        parent = book.profiles[chain[-1]]
        if parent in chain:
            problems.append(Problem("rules", None, "extends", "profiles extend each other in a "
                                    f"circle: {' -> '.join(chain + [parent])}"))
            return []
        if parent not in book.profiles:
            return []
        chain.append(parent)
    return list(reversed(chain))


def _apply(book: Rulebook, reads: list[_Read], problems: list[Problem]) -> None:
    rules: dict[str, Rule] = {}
    where: dict[str, dict[str, tuple[str, dict, tuple[str, ...]]]] = {}
    defined_at: dict[str, str] = {}
    for f in reads:
        file = str(f.source.path)
        shown = "built-in" if f.source.kind == "built-in" else file
        layer = Layer(file, f.source.kind, f.profile)
        book.layers.append(layer)
        book.files.append(file)
        for i, rule in enumerate(f.parsed.rule):
            loc = ("rule", str(i))
            line = line_of(f.lines, loc)
            if rule.id in rules or book.disabled_rule(rule.id):
                problems.append(Problem(file, line, f"rule[{i}].id",
                                        f"duplicate rule id {rule.id!r}: already defined in "
                                        f"{defined_at[rule.id]}; change it with [[override]] "
                                        "instead"))
                continue
            rules[rule.id] = rule
            defined_at[rule.id] = f"{file}:{line}" if line else file
            where[rule.id] = {"": (file, f.lines, loc)}
            book.history[rule.id] = [f"defined in {shown}"]
            layer.added.append(rule.id)
            if not rule.enabled:
                book.disabled.append(Disabled(rule.id, rule.title, "enabled = false in its file",
                                              shown))
        for i, ov in enumerate(f.parsed.override):
            ov = _current(ov)  # an old (renamed) rule id still names its rule
            loc = ("override", str(i))
            line = line_of(f.lines, loc)
            target = rules.get(ov.id)
            if target is None:
                gone = book.disabled_rule(ov.id)
                msg = (f"rule {ov.id!r} is switched off (by {gone.origin})" if gone else
                       f"no rule {ov.id!r} to change{suggest(ov.id, set(rules))}")
                problems.append(Problem(file, line, f"override[{i}].id", msg))
                continue
            found = _override_problems(target, ov)
            if found:
                problems.extend(_locate(file, f.lines, loc, ov.id, found))
                continue
            changes = ov.changes()
            data = target.model_dump(by_alias=True)
            if "params" in changes:
                changes["params"] = {**target.params, **changes["params"]}  # type: ignore[dict-item]
            data.update(changes)
            if target.origin == "built-in" or "changed by" not in target.origin:
                data["origin"] = f"{target.origin}; changed by {shown}"
            else:
                data["origin"] = f"{target.origin}, {shown}"
            rules[ov.id] = Rule.model_validate(data)
            keys = tuple(sorted(ov.changes()))
            for k in keys:
                where[ov.id][k] = (file, f.lines, loc)
            layer.changed.append((ov.id, keys, ov.note))
            book.history[ov.id].append(f"{', '.join(keys)} changed by {shown}"
                                       + (f" ({ov.note})" if ov.note else ""))
        for i, d in enumerate(f.parsed.disable):
            d = _current(d)
            loc = ("disable", str(i))
            if d.id not in rules:
                gone = book.disabled_rule(d.id)
                msg = (f"rule {d.id!r} is already switched off (by {gone.origin})" if gone else
                       f"no rule {d.id!r} to switch off{suggest(d.id, set(rules))}")
                problems.append(Problem(file, line_of(f.lines, loc), f"disable[{i}].id", msg))
                continue
            rule = rules.pop(d.id)
            book.disabled.append(Disabled(d.id, rule.title, d.reason, shown))
            book.history[d.id].append(f"switched off by {shown}: {d.reason}")
            layer.disabled.append((d.id, d.reason))
    if problems:
        return
    for rule in rules.values():
        if not rule.enabled:
            continue
        try:
            compiled = compile_rule(rule)
        except _RuleProblem as e:
            locs = where[rule.id]
            for message, key in e.problems:
                top = key.split(".")[0]
                file, lines, loc = locs.get(top) or locs[""]
                if top not in locs and "params" in locs:  # the parameters changed here broke it
                    file, lines, loc = locs["params"]
                    message, key = f"{message} (with the parameters set here)", "params"
                problems.extend(_locate(file, lines, loc, rule.id, [(message, key)]))
            continue
        book.rules.append(rule)
        book.compiled.extend(compiled)
    book.rules.sort(key=lambda r: list(rules).index(r.id))


def _current(entry: Any) -> Any:
    """An override or disable entry with a renamed rule's old id changed to the current one."""
    from reviewer.aliases import current_id

    new = current_id(entry.id)
    return entry if new == entry.id else entry.model_copy(update={"id": new})


def _override_problems(rule: Rule, ov: Any) -> list[tuple[str, str]]:
    out = []
    if ov.at_most is not None and rule.at_most is None:
        out.append((f"rule {rule.id!r} is an at_least rule; give at_least", "at_most"))
    if ov.at_least is not None and rule.at_least is None:
        out.append((f"rule {rule.id!r} is an at_most rule; give at_most", "at_least"))
    if ov.params and ov.at_most is None and ov.at_least is None and ov.applies is None \
            and ov.pass_ is None:
        for key in ov.params:
            if key not in rule.params:
                have = ", ".join(sorted(rule.params)) or "none"
                out.append((f"rule {rule.id!r} has no parameter {key!r}"
                            f"{suggest(key, set(rule.params))}; its parameters: {have}", "params"))
    return out


# --- compiling one rule -------------------------------------------------------------------------

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
    types = known_types()
    problems: list[tuple[str, str]] = []
    params: dict[str, float] = {}
    param_units: dict[str, str] = {}
    param_types: dict[str, Type] = {}
    for key, text in rule.params.items():
        try:
            params[key], param_units[key] = parse_quantity(text)
        except UnitError as e:
            problems.append((f"parameter {key!r}: {e}", "params"))
            continue
        bare = param_units[key] == ""  # a bare number is in the SI unit of whatever it meets
        param_types[key] = Type("number", dimension_of(param_units[key]), loose=bare)
    out: list[Compiled] = []
    limit_key = "at_most" if rule.at_most is not None else "at_least"
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
            unknown = sorted(e.names - allowed - set(names))
            for n in unknown:
                problems.append((f"unknown quantity {n!r}{suggest(n, set(names) | allowed)}", key))
            return None if unknown else e

        local: dict[str, Type] = dict(param_types)

        def typed(e: Expr | None, key: str, want: str | None) -> Type | None:
            if e is None:
                return None
            try:
                t = infer(e, lambda n: local.get(n) or types.get(n))
                if want and t.kind and t.kind != want:
                    what = {"flag": "a condition (a comparison or a flag)",
                            "number": "a number"}[want]
                    raise ExprError(f"{e.text!r} gives a {t.kind}; {key} needs {what}")
                _sample_eval(e, local, types)
            except ExprError as err:
                problems.append((str(err), key))
                return None
            return t

        applies = comp(rule.applies, "applies")
        value = comp(rule.value, "value")
        fails = comp(rule.fails_when, "fails_when")
        typed(applies, "applies", "flag")
        typed(fails, "fails_when", "flag")
        vt = typed(value, "value", "number")
        unit = rule.unit if rule.unit is not None else ""
        if value is not None and rule.unit is None:
            single = sub(rule.value or "").strip()
            if single in names:
                unit = names[single]
        declared = dimension_of(unit) if unit or rule.unit is not None else None
        if vt is not None and vt.dim is not None and declared is not None and not vt.loose \
                and vt.dim != declared and rule.unit is not None:
            problems.append((f"the value is in {unit_name(vt.dim)}, but unit = {rule.unit!r}", "unit"))
        value_dim = declared if declared is not None else (vt.dim if vt is not None else None)
        value_type = Type("number", value_dim)
        local.update({"value": value_type, "limit": value_type, "margin": value_type,
                      "subject": Type("text")})
        limit = None
        limit_const = None
        lt = rule.limit_text
        if lt is not None:
            try:
                limit_const, limit_unit = parse_quantity(lt)
                ld = dimension_of(limit_unit)
                if isinstance(lt, str) and limit_unit and ld is not None and value_dim is not None \
                        and ld != value_dim:
                    problems.append((f"limit {lt!r} is in {unit_name(ld)}, but the value "
                                     f"({sub(rule.value or '')}) is in {unit_name(value_dim)}",
                                     limit_key))
            except UnitError:
                limit = comp(str(lt), limit_key, {"value"})
                lim_t = typed(limit, limit_key, "number")
                if lim_t is not None and lim_t.dim is not None and value_dim is not None \
                        and not lim_t.loose and lim_t.dim != value_dim:
                    problems.append((f"the limit {sub(str(lt))!r} is in {unit_name(lim_t.dim)}, "
                                     f"but the value ({sub(rule.value or '')}) is in "
                                     f"{unit_name(value_dim)}", limit_key))
        pass_value = comp(rule.pass_.value, "pass", SPECIAL) if rule.pass_ else None
        pt = typed(pass_value, "pass", "number")
        if rule.pass_ is not None and pt is not None and pt.dim is not None and not pt.loose:
            pd = dimension_of(rule.pass_.unit)
            if pd is not None and pd != pt.dim:
                problems.append((f"the pass value {rule.pass_.value!r} is in {unit_name(pt.dim)}, "
                                 f"but its unit is {rule.pass_.unit or 'none'!r}", "pass"))
        local["pass_value"] = Type("number", dimension_of(rule.pass_.unit) if rule.pass_ else None)
        for f in rule.fields + ([rule.pass_.field] if rule.pass_ and rule.pass_.field else []):
            if sub(f) not in design_paths:
                problems.append((f"unknown design field {sub(f)!r}{suggest(sub(f), design_paths)}", "fields"))
        if rule.pass_ is not None and rule.pass_.field and sub(rule.pass_.field) in design_paths:
            field_unit = names.get(f"design.{sub(rule.pass_.field)}", "")
            if dimension_of(field_unit) != dimension_of(rule.pass_.unit):
                problems.append((f"the pass value is in {rule.pass_.unit or 'no unit'!r}, but its "
                                 f"field {sub(rule.pass_.field)!r} is in {field_unit or 'no unit'!r}: "
                                 "a pass value is a value for its field", "pass"))
        cases = []
        for k, case in enumerate(rule.cases):
            key = f"cases.{k}"
            when = comp(case.when, key, SPECIAL | {"margin"})
            typed(when, key, "flag")
            absent = sub(case.absent) if case.absent is not None else None
            if absent is not None and absent not in names:
                problems.append((f"unknown quantity {absent!r}{suggest(absent, set(names))}", key))
            cases.append((when, absent, sub(case.text)))
        texts = [("mitigation", rule.mitigation), ("why", rule.why), ("title", rule.title),
                 ("fail_title", rule.fail_title)]
        texts += [(f"cases.{k}", case.text) for k, case in enumerate(rule.cases)]
        for key, text in texts:
            for ph in placeholders(sub(text)):
                e = comp(ph[0], key, SPECIAL | {"pass_value", "margin", "subject"})
                if e is not None:
                    try:
                        infer(e, lambda n: local.get(n) or types.get(n))
                    except ExprError as err:
                        problems.append((f"in {{{ph[0]}}}: {err}", key))
        out.append(Compiled(rule, subject, applies, value, limit, limit_const, fails, pass_value,
                            params, param_units, unit, tuple(sub(f) for f in rule.fields), sub(rule.mitigation),
                            sub(rule.why), sub(rule.title), sub(rule.fail_title), tuple(cases)))
    if problems:
        raise _RuleProblem(list(dict.fromkeys(problems)))
    return out


def _sample_eval(e: Expr, local: dict[str, Type], types: dict[str, Type]) -> None:
    """Evaluate once on sample values of the right kinds, before any design: kind errors show."""
    env = {}
    for n in e.names:
        t = local.get(n) or types.get(n)
        env[n] = sample(t) if t is not None else sample(Type("number"))
    try:
        e.evaluate(env)
    except ExprError as err:
        if "division by zero" in str(err):
            return  # a zero only in the sample values; a design's own values decide
        raise


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
