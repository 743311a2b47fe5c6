"""One module per command. Each has ``register(subparsers)`` and ``run(args) -> int``.

Modules import nothing heavy at their top: the command line imports all of them to build its
argument parser, then runs one.
"""

NAMES = ["check", "sheet", "schema", "new", "examples", "decide", "answer", "record", "diff",
         "walk", "rules", "deck", "completion"]
