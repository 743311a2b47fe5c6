"""Errors about what a user gave us: each names the file, line, field, what was found and expected."""

from __future__ import annotations

from dataclasses import dataclass


@dataclass(frozen=True)
class Problem:
    """One thing wrong in an input file."""

    file: str
    line: int | None
    path: str
    message: str

    def __str__(self) -> str:
        where = f"{self.file}:{self.line}" if self.line else self.file
        field = f" {self.path}:" if self.path else ""
        return one_line(f"{where}:{field} {self.message}")


def one_line(text: str) -> str:
    """``text`` with line breaks and other control characters escaped (``\\x1e``), so that an
    error about a strange key is still one line starting ``error:``."""
    if text.isprintable():
        return text
    return "".join(c if c.isprintable() else repr(c)[1:-1] for c in text)


class InputError(Exception):
    """Bad input: one or more problems, reported together. The command line exits with 2."""

    def __init__(self, problems: list[Problem]):
        self.problems = list(problems)
        super().__init__("\n".join(str(p) for p in self.problems))


def suggest(word: str, choices: list[str] | set[str]) -> str:
    """A " (did you mean 'x'?)" suffix, or nothing when no choice is close."""
    import difflib

    close = difflib.get_close_matches(word, sorted(choices), n=1, cutoff=0.6)
    return f" (did you mean {close[0]!r}?)" if close else ""
