"""reviewer completion: print a shell completion script for the command line.

The script is generated once, from the same argument parser the program uses, by shtab (a
static script: pressing Tab never starts Python). shtab is imported here only, so it costs the
other commands nothing: measured on the development machine, ``import shtab`` takes about
75 ms, against about 0.33 s for ``reviewer --version``; argcomplete, the other choice, would run
the whole program (about 0.3 s) on every Tab and add its import to every start.
"""

from __future__ import annotations

import argparse

SHELLS = ("bash", "zsh", "tcsh")


def register(sub) -> None:
    c = sub.add_parser(
        "completion", help="print a shell completion script (bash, zsh or tcsh)",
        description="Print a completion script for SHELL. For bash: "
                    "reviewer completion bash > ~/.local/share/bash-completion/completions/reviewer")
    c.add_argument("shell", choices=SHELLS, metavar="SHELL",
                   help=f"the shell to complete in: {', '.join(SHELLS)}")


def run(args: argparse.Namespace) -> int:
    import sys

    from reviewer.errors import InputError, Problem

    try:
        import shtab
    except ImportError:  # pragma: no cover - a dependency; only a broken install lacks it
        raise InputError([Problem("reviewer completion", None, "",
                                  "needs the shtab package: pip install shtab")]) from None
    from reviewer.cli import _parser

    parser, _ = _parser()
    sys.stdout.write(shtab.complete(parser, shell=args.shell))
    return 0
