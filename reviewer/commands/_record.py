"""Helpers for the commands that read and write the review record (decide, answer, record)."""

from __future__ import annotations

from pathlib import Path


def load_review(design: Path, args):
    """The review of ``design`` with its record (``NAME.review.toml`` beside it), under the
    command's rule options (the same rules check applies)."""
    from reviewer.commands._common import rulebook
    from reviewer.review import review_file

    return review_file(design, book=rulebook(args, design))


def unknown(path: Path, what: str, given: str, choices: list[str]) -> Exception:
    """An InputError for an unknown finding key or question id, with a "did you mean"."""
    import difflib

    from reviewer.errors import InputError, Problem

    close = difflib.get_close_matches(given, choices, n=3, cutoff=0.5)
    hint = f" (did you mean {', '.join(repr(c) for c in close)}?)" if close else ""
    if not choices:
        hint = f"; this review has no {what}s"
    return InputError([Problem(str(path), None, given, f"no {what} {given!r}{hint}")])


def finding_for(review, design: Path, key: str):
    """The finding with ``key``; a bare rule id names its one finding. InputError otherwise."""
    from reviewer.errors import InputError, Problem

    f = review.finding(key)
    if f is not None:
        return f
    same = [x for x in review.findings if x.rule_id == key]
    if len(same) == 1:
        return same[0]
    if same:
        raise InputError([Problem(str(design), None, key,
                                  f"{key!r} has several subjects: give one of "
                                  f"{', '.join(x.key for x in same)}")])
    raise unknown(design, "finding", key, [x.key for x in review.findings])


def save(review, design: Path, record) -> Path:
    """Write ``record`` beside ``design``, merged with any change another writer made to the
    file since ``review`` read it; a conflict or a failed write is an InputError (exit 2)."""
    from reviewer import record as rec
    from reviewer.errors import InputError, Problem

    path = rec.record_path(design)
    try:
        rec.save(record, path, base=review.record)
    except rec.RecordConflict as e:
        raise InputError([Problem(str(path), None, "", str(e))]) from None
    except OSError as e:
        raise InputError([Problem(str(path), None, "", f"cannot write the record: "
                                  f"{e.strerror or e}; the previous file is kept")]) from None
    return path
