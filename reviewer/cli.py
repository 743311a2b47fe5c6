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


def _parser() -> tuple[argparse.ArgumentParser, dict]:
    p = argparse.ArgumentParser(
        prog="reviewer",
        description="Review an H-bridge or inverter design described in a TOML file.",
    )
    p.add_argument("--version", action="version", version=f"reviewer {__version__}")
    sub = p.add_subparsers(dest="command", metavar="COMMAND")
    modules = {}
    for name in NAMES:
        module = importlib.import_module(f"reviewer.commands.{name}")
        module.register(sub)
        modules[name] = module
    return p, modules


def main(argv: list[str] | None = None) -> int:
    parser, modules = _parser()
    args = parser.parse_args(argv)
    if args.command is None:
        parser.print_help()
        return 0
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
