"""The command line: parses arguments, runs one command, returns 0, 1 or 2.

0: done, nothing at or above ``--fail-on``; 1: findings at or above it; 2: bad input (every
problem printed with file, line and field, never a traceback). Commands live one per module in
:mod:`reviewer.commands`.
"""

from __future__ import annotations

import argparse
import importlib
import sys

from reviewer import __version__
from reviewer.commands import NAMES


HELP = {
    # help for arguments a command module registers without one, by destination
    "design": "the design file (TOML)",
    "designs": "one or more design files (TOML)",
    "format": "the output's format",
    "color": "colour: auto (on a terminal, unless NO_COLOR is set), always or never",
    "file": "the design file to write (never overwritten)",
    "key": "the finding key as the reports show it: rule id and subject, e.g. "
           "timing.shoot-through[high] or, without brackets, timing.shoot-through.high",
    "question": "the checklist question's id, e.g. checklist.gate-loop",
    "answer": "the answer: yes, no or not_applicable (needs --note)",
    "old": "the earlier revision of the design (TOML)",
    "new": "the later revision of the design (TOML)",
    "action": "what to do: explain one rule, lint a house rule file; none lists the rules",
    "targets": "the rule id (explain) or the rule files (lint)",
}


def _fill_help(sub) -> None:
    """Every command and argument has a help text: fill those a module left without."""
    for name, sp in sub.choices.items():
        for a in sp._actions:
            if a.help is None and a.dest in HELP:
                a.help = HELP[a.dest]


def _parser() -> tuple[argparse.ArgumentParser, dict]:
    p = argparse.ArgumentParser(
        prog="reviewer",
        description="Review an H-bridge or inverter design described in a TOML file.",
        epilog="Run 'reviewer COMMAND --help' for a command's arguments.",
    )
    p.add_argument("--version", action="version", version=f"reviewer {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    modules = {}
    for name in NAMES:
        module = importlib.import_module(f"reviewer.commands.{name}")
        module.register(sub)
        modules[name] = module
    _fill_help(sub)
    return p, modules


def _mistyped(argv: list[str]) -> str | None:
    """'no command "chek" (did you mean "check"?)' for an unknown first word, else None."""
    import difflib

    first = next((a for a in argv if not a.startswith("-")), None)
    if first is None or first in NAMES:
        return None
    close = difflib.get_close_matches(first, NAMES, n=2, cutoff=0.5)
    hint = f" (did you mean {' or '.join(repr(c) for c in close)}?)" if close else ""
    return f"reviewer: no command {first!r}{hint}; the commands are {', '.join(NAMES)}"


def main(argv: list[str] | None = None) -> int:
    argv = sys.argv[1:] if argv is None else list(argv)
    parser, modules = _parser()
    if not argv:  # a bare 'reviewer': say how to use it, as a usage error
        parser.print_help(sys.stderr)
        return 2
    if not argv[0].startswith("-"):
        wrong = _mistyped(argv[:1])
        if wrong:
            parser.print_usage(sys.stderr)
            print(wrong, file=sys.stderr)
            return 2
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help(sys.stderr)
        return 2
    from reviewer.errors import InputError

    try:
        return modules[args.command].run(args)
    except InputError as e:
        for problem in e.problems:
            print(f"error: {problem}", file=sys.stderr)
        return 2
    except KeyboardInterrupt:
        return 130
    except BrokenPipeError:
        return 0


if __name__ == "__main__":  # pragma: no cover
    sys.exit(main())
