"""Where house rules are found, and in what order they apply (later wins).

1. the built-in rules (``rules/`` in a checkout, ``reviewer/_data/rules`` when installed);
2. the **user** folder: ``house-rules/`` in the platform's per-user configuration folder for
   ``bridge-reviewer`` (``~/.config/bridge-reviewer/house-rules`` on Linux);
3. the **project** folders: every ``house-rules/`` folder from the design's own folder up to
   the root of its git work tree (the first folder holding ``.git``) or the filesystem root,
   the outermost first, so that a folder nearer the design wins;
4. every ``--rules PATH`` (a file, or a folder of ``*.toml``), in the order given.

Within a folder, files apply in name order. :func:`rulebook_for` is the one function every
command that reviews a design calls.
"""

from __future__ import annotations

from pathlib import Path

from reviewer.errors import InputError, Problem
from reviewer.rulebook.loader import DEFAULT_PROFILE, Rulebook, Source, load_rulebook, rule_files

APP = "bridge-reviewer"
FOLDER = "house-rules"


def user_rules_dir() -> Path:
    """The per-user house-rules folder (it need not exist)."""
    from platformdirs import user_config_dir

    return Path(user_config_dir(APP, appauthor=False)) / FOLDER


def project_rules_dirs(start: Path) -> list[Path]:
    """Every ``house-rules/`` folder from ``start`` (a design file or folder) up to the git root
    or the filesystem root, outermost first."""
    here = start.resolve()
    if not here.is_dir():
        here = here.parent
    found: list[Path] = []
    for folder in [here, *here.parents]:
        candidate = folder / FOLDER
        if candidate.is_dir():
            found.append(candidate)
        if (folder / ".git").exists():
            break
    return list(reversed(found))


def given_files(paths: list[Path]) -> list[Path]:
    """The files named by ``--rules``: a file as it is, a folder's ``*.toml`` in name order."""
    out: list[Path] = []
    for p in paths:
        if p.is_dir():
            out.extend(rule_files(p))
        elif p.is_file():
            out.append(p)
        else:
            raise InputError([Problem(str(p), None, "", "no such rule file or folder")])
    return out


def house_sources(start: Path | None, given: list[Path] | None = None,
                  house: bool = True) -> list[Source]:
    """The house files for a design at ``start``, in the order they apply.

    ``house=False`` leaves out the user and project folders (only ``given`` files apply).
    """
    sources: list[Source] = []
    seen: set[Path] = set()

    def add(path: Path, kind: str) -> None:
        key = path.resolve()
        if key not in seen:
            seen.add(key)
            sources.append(Source(path, kind))

    if house:
        user = user_rules_dir()
        if user.is_dir():
            for p in rule_files(user):
                add(p, "user")
        if start is not None:
            for folder in project_rules_dirs(start):
                for p in rule_files(folder):
                    add(p, "project")
    for p in given_files(list(given or [])):
        add(p, "command line")
    return sources


def rulebook_for(design: Path | None, given: list[Path] | None = None,
                 profile: str = DEFAULT_PROFILE, house: bool = True,
                 _cache: dict | None = None) -> Rulebook:
    """The rulebook that applies to the design at ``design``: built-in, user, project, given.

    Designs in the same folder share one rulebook when ``_cache`` (a dict) is passed.
    """
    sources = house_sources(design, given, house)
    key = (tuple((str(s.path), s.kind) for s in sources), profile)
    if _cache is not None and key in _cache:
        return _cache[key]
    book = load_rulebook(sources=sources, profile=profile)
    if _cache is not None:
        _cache[key] = book
    return book
