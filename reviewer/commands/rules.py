"""reviewer rules: list the rules in force, show where they came from, explain one, lint a file.

``reviewer rules`` lists every rule that a review started here would apply (built-in, the user's
and the project's house rules, ``--rules``, for ``--profile``); ``--where`` lists the files in
the order they were applied and what each added, changed or switched off; ``explain ID`` shows
one rule in full with its history; ``lint FILE...`` checks house files before any design is
loaded (exit 2 with every problem located by file, line and key).
"""

from __future__ import annotations

import argparse
import sys
from pathlib import Path

from reviewer.commands._common import add_rule_options


def register(sub) -> None:
    r = sub.add_parser(
        "rules", help="list, explain and lint rules (built-in and house rules)",
        description="List the rules a review here would apply; 'explain ID' shows one in full; "
                    "'lint FILE...' checks house rule files on their own.")
    r.add_argument("action", nargs="?", choices=("list", "explain", "lint"), default="list")
    r.add_argument("targets", nargs="*", metavar="ID|FILE")
    r.add_argument("--where", action="store_true",
                   help="list the rule files in the order they apply and what each changed")
    r.add_argument("--at", type=Path, default=None, metavar="DIR",
                   help="find project house rules from this folder or design (default: here)")
    add_rule_options(r)


def run(args: argparse.Namespace) -> int:
    from reviewer.commands._common import rulebook
    from reviewer.errors import InputError, Problem

    start = args.at if args.at is not None else Path.cwd()
    if args.action == "lint":
        if not args.targets:
            raise InputError([Problem("rules lint", None, "", "name at least one rule file")])
        return _lint(args, start)
    book = rulebook(args, start)
    if args.where:
        _where(book)
        return 0
    if args.action == "explain":
        if len(args.targets) != 1:
            raise InputError([Problem("rules explain", None, "", "name one rule id")])
        return _explain(book, args.targets[0])
    _list(book)
    return 0


def _limit(rule) -> str:
    if rule.kind == "limit":
        text = f"{rule.value} {rule.relation} {rule.limit_text}"
    elif rule.kind == "flag":
        text = f"fails when {rule.fails_when}"
    else:
        text = f"asks: {' '.join((rule.ask or '').split())}"
    if rule.params:
        text += "  (" + ", ".join(f"{k} = {v}" for k, v in rule.params.items()) + ")"
    return text


def _list(book) -> None:
    out = sys.stdout
    out.write(f"profile: {book.profile}; {len(book.rules)} rules in force, "
              f"{len(book.disabled)} switched off\n\n")
    for rule in sorted(book.rules, key=lambda r: (r.area, r.id)):
        each = f" [{', '.join(rule.each)}]" if rule.each else ""
        out.write(f"{rule.id}{each}  ({rule.area}, {rule.severity})\n")
        if rule.applies:
            out.write(f"    when    {rule.applies}\n")
        out.write(f"    judges  {_limit(rule)}\n")
        out.write(f"    from    {rule.origin}\n")
        if rule.reference:
            out.write(f"    source  {rule.reference}\n")
    if book.disabled:
        out.write("\nswitched off:\n")
        for d in book.disabled:
            out.write(f"  {d.rule_id}: {d.title}\n    reason  {d.reason}\n    by      {d.origin}\n")


def _where(book) -> None:
    out = sys.stdout
    chain = [book.profile]
    while book.profiles.get(chain[-1]):
        chain.append(book.profiles[chain[-1]])
    out.write(f"profile: {' -> '.join(reversed(chain))}\n")
    out.write("files, in the order they apply (later wins):\n")
    builtins = [layer for layer in book.layers if layer.kind == "built-in" and layer.applied]
    if builtins:
        added = sum(len(layer.added) for layer in builtins)
        out.write(f"  built-in  {len(builtins)} files, {added} rules "
                  f"({', '.join(Path(layer.file).stem for layer in builtins)})\n")
    n = 0
    for layer in book.layers:
        if layer.kind == "built-in" or not layer.applied:
            continue
        n += 1
        prof = f"  [profile {layer.profile}]" if layer.profile != "default" else ""
        out.write(f"  {n}. {layer.kind:<12} {layer.file}{prof}\n")
        if layer.added:
            out.write(f"       adds          {', '.join(layer.added)}\n")
        for rule_id, keys, note in layer.changed:
            out.write(f"       changes       {rule_id} ({', '.join(keys)})"
                      + (f": {note}" if note else "") + "\n")
        for rule_id, reason in layer.disabled:
            out.write(f"       switches off  {rule_id}: {reason}\n")
        if not (layer.added or layer.changed or layer.disabled):
            out.write("       (nothing)\n")
    if n == 0:
        out.write("  no house rule files found (user folder, project folders, --rules)\n")
    skipped = [layer for layer in book.layers if not layer.applied]
    if skipped:
        out.write("not applied (their profile is not chosen):\n")
        for layer in skipped:
            out.write(f"  {layer.kind:<12} {layer.file}  [profile {layer.profile}]\n")
    from reviewer.rulebook.discover import user_rules_dir

    out.write(f"user folder: {user_rules_dir()}\n")


def _explain(book, rule_id: str) -> int:
    from reviewer.errors import InputError, Problem, suggest
    from reviewer.findings import BASES

    rule = book.get(rule_id)
    gone = book.disabled_rule(rule_id)
    if rule is None and gone is None:
        known = {r.id for r in book.rules} | {d.rule_id for d in book.disabled}
        raise InputError([Problem("rules explain", None, "", f"no rule {rule_id!r}"
                                  f"{suggest(rule_id, known)}")])
    out = sys.stdout
    if rule is None:
        out.write(f"{rule_id}: {gone.title}\nswitched off by {gone.origin}: {gone.reason}\n")
    else:
        out.write(f"{rule.id}: {rule.title}\n")
        rows = [("when failing", rule.fail_title or f"Not met: {rule.title}"),
                ("area", rule.area), ("severity", rule.severity), ("kind", rule.kind),
                ("for each", ", ".join(rule.each)), ("applies when", rule.applies or ""),
                ("judges", _limit(rule)),
                ("passes at", f"{rule.pass_.value} [{rule.pass_.unit}] for {rule.pass_.field}"
                 if rule.pass_ else ""),
                ("fields", ", ".join(rule.fields)), ("from", rule.origin),
                ("source", f"{rule.reference} ({BASES.get(rule.basis, rule.basis)})")]
        for k, v in rows:
            if v:
                out.write(f"  {k:<13} {v}\n")
        out.write(f"\nwhy\n  {' '.join(rule.why.split())}\n")
        if rule.mitigation:
            out.write(f"\nwhat to do\n  {' '.join(rule.mitigation.split())}\n")
    out.write("\nhistory\n")
    for line in book.history.get(rule_id, []):
        out.write(f"  {line}\n")
    return 0


def _lint(args: argparse.Namespace, start: Path) -> int:
    from reviewer.rulebook.discover import house_sources
    from reviewer.rulebook.loader import Source, _read, load_rulebook

    for target in args.targets:
        path = Path(target)
        if not path.is_file():
            from reviewer.errors import InputError, Problem

            raise InputError([Problem(str(path), None, "", "no such rule file")])
        own = _read(Source(path, "command line"))  # syntax and format first, located
        context = [s for s in house_sources(start, list(args.rules),
                                            house=not args.no_house_rules)
                   if s.path.resolve() != path.resolve()]
        profile = own.parsed.profile or args.profile
        book = load_rulebook(sources=context + [Source(path, "command line")], profile=profile)
        layer = next(x for x in book.layers if Path(x.file).resolve() == path.resolve())
        print(f"{path}: ok (profile {own.profile}: adds {len(layer.added)}, changes "
              f"{len(layer.changed)}, switches off {len(layer.disabled)})")
        for rule in own.parsed.rule:
            for note in rule_notes(rule):
                print(f"  {rule.id}: {note}")
    return 0


CLAUSE = r"(§|\bclause\b|\btable\b|\bsection\b|\bannex\b|\bart(icle)?\.?\s|\bfig(ure)?\.?\s|\beq(uation)?\.?\s)"


def rule_notes(rule) -> list[str]:
    """What a rule lacks that a reader needs: a failing title, a source, a clause for a standard.

    Notes, not errors: a house rule with one title is headed "Not met: <title>" when it fails.
    """
    import re

    notes = []
    if not rule.fail_title:
        notes.append(f"no fail_title: a failing finding is headed 'Not met: {rule.title}'")
    elif rule.fail_title.strip().lower() == rule.title.strip().lower():
        notes.append("fail_title is the same as title: state the problem instead")
    if not rule.reference.strip():
        notes.append("no reference: name the work, edition and section, or the practice")
    elif rule.basis == "standard" and not re.search(CLAUSE, rule.reference, re.IGNORECASE):
        notes.append("basis 'standard' without a clause or table in the reference")
    return notes
