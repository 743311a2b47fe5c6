"""The review as SARIF 2.1.0 (OASIS Static Analysis Results Interchange Format), for CI systems.

One run for all the designs reviewed. Each failing finding is a result:

- ``ruleId`` the rule id; the rule (``tool.driver.rules``) carries the title, why it matters and
  the source as its help text, its severity as the default level;
- ``level``: hazard -> ``error``, risk -> ``warning``, advice -> ``note``;
- ``locations``: the design file, at the line of the first design field the finding is about
  (``Finding.fields``; the nearest written parent table when the field itself is not written,
  e.g. a value left to its default); the other fields as ``relatedLocations``;
- ``suppressions``: a finding settled by a current accepted / not-applicable decision is
  suppressed (``external``, ``accepted``, with the reason as justification); one whose decision
  awaits re-confirmation carries an ``underReview`` suppression, which does not suppress it;
- ``partialFingerprints["designFindingKey/v1"]``: the design file's URI and the finding key
  (``"boards/bridge.toml#stress.vds-rating[high]"``), stable across revisions of the design and
  distinct for the same finding in two designs.

Checks that could not run for lack of data are results of kind ``open`` (the tool could not say
pass or fail), and unanswered checklist questions results of kind ``review`` (a person must
judge); SARIF 2.1.0 §3.27.10 requires the level ``none`` for any kind but ``fail``, so they are
notes that never fail a build. Artifact URIs are relative to the working folder (or the folder
given as ``base``), with the base id ``SRCROOT``; the output holds no time or absolute path, so
the same input gives the same bytes.
"""

from __future__ import annotations

import json
import os
from pathlib import Path
from typing import Any

from reviewer import __version__
from reviewer import record as rec
from reviewer.findings import Finding
from reviewer.report import common
from reviewer.report.json import relation
from reviewer.review import Review
from reviewer.spread import spread_properties

SCHEMA = "https://docs.oasis-open.org/sarif/sarif/v2.1.0/errata01/os/schemas/sarif-schema-2.1.0.json"
LEVEL = {"hazard": "error", "risk": "warning", "advice": "note"}
BASE_ID = "SRCROOT"
NOTE_KINDS = {"needs_data": "open", "open": "review"}
"""Outcomes reported as notes (level ``none``), by the SARIF result kind they take."""


def _uri(path: str, base: str | Path | None = None) -> str:
    """``path`` as a URI reference relative to ``base`` (default: the working folder), with
    ``..`` when it lies outside; an absolute ``file:`` URI only where no relative path exists
    (another drive)."""
    from urllib.parse import quote

    p = Path(path)
    root = Path(base) if base is not None else Path.cwd()
    try:
        rel = os.path.relpath(p.resolve(), root.resolve())
    except ValueError:
        return p.resolve().as_uri()
    return quote(Path(rel).as_posix(), safe="/.-_~")


def _lines(path: str) -> dict[tuple[str, ...], int]:
    from reviewer.design.tomlpos import key_lines

    try:
        return key_lines(Path(path).read_text(encoding="utf-8"))
    except OSError:
        return {}


def _location(index: int, uri: str, line: int | None, text: str = "") -> dict[str, Any]:
    phys: dict[str, Any] = {"artifactLocation": {"uri": uri, "uriBaseId": BASE_ID,
                                                 "index": index}}
    if line is not None:
        phys["region"] = {"startLine": line}
    loc: dict[str, Any] = {"physicalLocation": phys}
    if text:
        loc["message"] = {"text": text}
    return loc


def _message(f: Finding) -> str:
    if f.outcome == "needs_data":
        return (f"{common.title(f)}: not checked, needs data: give "
                f"{common.needs(f) or 'the missing values'}.")
    if f.outcome == "open":
        return f"{common.title(f)}: open question, not yet answered: {f.question}"
    parts = [f"{common.label(f)}: {common.title(f)}"]
    if f.value is not None:
        parts.append(f"computed {common.computed(f)}, limit {common.limit(f)}, "
                     f"margin {common.margin(f)}")
    if f.question:
        parts.append(f"question: {f.question}" + (f" (answered no: {f.answer_note})"
                                                    if f.answer_note else ""))
    if f.mitigation:
        parts.append(f.mitigation)
    text = ". ".join(p.rstrip(".") for p in parts) + "."
    return text


def _rule(f: Finding) -> dict[str, Any]:
    help_text = f"{f.why}\n\nSource: {f.reference} ({common.basis(f)})."
    help_md = f"**Why it matters.** {f.why}\n\n*Source: {f.reference} ({common.basis(f)}).*"
    return {
        "id": f.rule_id,
        "shortDescription": {"text": f.title},
        "fullDescription": {"text": f.why or f.title},
        "help": {"text": help_text, "markdown": help_md},
        "defaultConfiguration": {"level": LEVEL[f.severity]},
        "properties": {"area": f.area, "severity": f.severity, "basis": f.basis,
                       "reference": f.reference, "origin": f.origin,
                       "tags": [f.area, f.severity]},
    }


def reported(r: Review) -> list[Finding]:
    """The findings that become results: failing ones (worst first), then those needing data
    and the open questions (as notes)."""
    notes = [f for f in r.findings if f.outcome in NOTE_KINDS]
    return r.failures + sorted(notes, key=lambda f: (f.outcome, f.area, f.rule_id, f.subject))


def to_data(reviews: list[Review], base: str | Path | None = None) -> dict[str, Any]:
    rules: dict[str, int] = {}
    rule_list: list[dict[str, Any]] = []
    artifacts: list[dict[str, Any]] = []
    results: list[dict[str, Any]] = []
    for r in reviews:
        index = len(artifacts)
        uri = _uri(r.path, base)
        artifacts.append({"location": {"uri": uri, "uriBaseId": BASE_ID},
                          "roles": ["analysisTarget"]})
        lines = _lines(r.path)
        from reviewer.design.tomlpos import line_of

        for f in reported(r):
            if f.rule_id not in rules:
                rules[f.rule_id] = len(rule_list)
                rule_list.append(_rule(f))
            fields = list(dict.fromkeys(f.fields)) or [""]
            located = [(x, line_of(lines, tuple(x.split("."))) if x else None) for x in fields]
            first, *others = located
            result: dict[str, Any] = {
                "ruleId": f.rule_id,
                "ruleIndex": rules[f.rule_id],
                "kind": NOTE_KINDS.get(f.outcome, "fail"),
                "level": "none" if f.outcome in NOTE_KINDS else LEVEL[f.severity],
                "message": {"text": _message(f)},
                "locations": [_location(index, uri, first[1])],
                "partialFingerprints": {"designFindingKey/v1": f"{uri}#{f.key}"},
                "properties": {"key": f.key, "subject": f.subject, "severity": f.severity,
                               "outcome": f.outcome, "field": first[0], "unit": f.unit,
                               "relation": relation(f.relation), "value": f.value,
                               "limit": f.limit, "margin": f.margin,
                               "needs": list(f.needs) or None, **spread_properties(f)},
            }
            if others:
                result["relatedLocations"] = [
                    dict(_location(index, uri, line, f"design field {x}"), id=i)
                    for i, (x, line) in enumerate(others, start=1)]
            d = r.decision(f.key) if f.outcome == "fail" else None
            if d is not None:
                st = r.state(f.key)
                result["properties"]["decision"] = {"kind": d.kind, "state": st,
                                                    "reason": d.reason, "reviewer": d.reviewer}
                if d.kind in rec.SETTLING:
                    result["suppressions"] = [{
                        "kind": "external",
                        "status": "accepted" if st == "current" else "underReview",
                        "justification": d.reason + ("" if st == "current" else
                                                     " (decided on numbers that have moved; "
                                                     "re-confirm)"),
                    }]
            results.append(_clean(result))
    return {
        "$schema": SCHEMA,
        "version": "2.1.0",
        "runs": [{
            "tool": {"driver": {"name": "bridge-reviewer", "version": __version__,
                                "rules": rule_list}},
            "originalUriBaseIds": {BASE_ID: {"description": {
                "text": "The folder the artifact URIs are relative to: the working folder of "
                        "the review, or the folder given with --base."}}},
            "artifacts": artifacts,
            "results": results,
            "columnKind": "unicodeCodePoints",
        }],
    }


def _clean(x: Any) -> Any:
    import math

    if isinstance(x, float) and (math.isnan(x) or math.isinf(x)):
        return None if math.isnan(x) else ("inf" if x > 0 else "-inf")
    if isinstance(x, dict):
        return {k: _clean(v) for k, v in x.items() if v is not None}
    if isinstance(x, list):
        return [_clean(v) for v in x]
    return x


def render(reviews: list[Review], base: str | Path | None = None) -> str:
    return json.dumps(to_data(reviews, base), indent=2, ensure_ascii=False) + "\n"
