"""Start-up hygiene: the check path imports no user-interface or test-only library, and the
derive step has no import circle (the module registry is one list that nothing below reaches)."""

from __future__ import annotations

import ast
import json
import subprocess
import sys
from pathlib import Path

from tests.conftest import EXAMPLES, ROOT

HEAVY = ("textual", "scipy", "matplotlib")


def test_check_path_imports_nothing_heavy():
    code = (
        "import io, contextlib, json, sys\n"
        "import reviewer\n"
        "first = sorted(m for m in sys.modules if m.split('.')[0] in %r)\n"
        "from reviewer.cli import main\n"
        "with contextlib.redirect_stdout(io.StringIO()):\n"
        "    main(['check', %r, '--format', 'json'])\n"
        "    main(['check', %r, '--format', 'sarif', '--samples', '3'])\n"
        "print(json.dumps([first, sorted(m for m in sys.modules if m.split('.')[0] in %r)]))\n"
    ) % (HEAVY, str(EXAMPLES / "careful_12v_sine.toml"), str(EXAMPLES / "naive_bench_pchannel.toml"),
         HEAVY)
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True,
                         cwd=ROOT)
    on_import, on_check = json.loads(out.stdout.strip().splitlines()[-1])
    assert on_import == [] and on_check == []


def imports_of(path: Path) -> set[str]:
    """Every reviewer module a file imports, at the top or inside a function."""
    found: set[str] = set()
    for node in ast.walk(ast.parse(path.read_text(encoding="utf-8"))):
        if isinstance(node, ast.ImportFrom) and node.module and node.module.startswith("reviewer"):
            found.add(node.module)
            found.update(f"{node.module}.{a.name}" for a in node.names)
        elif isinstance(node, ast.Import):
            found.update(a.name for a in node.names if a.name.startswith("reviewer"))
    return found


def module_files() -> dict[str, Path]:
    out = {}
    for p in (ROOT / "reviewer").rglob("*.py"):
        rel = p.relative_to(ROOT).with_suffix("")
        parts = list(rel.parts)
        if parts[-1] == "__init__":
            parts = parts[:-1]
        out[".".join(parts)] = p
    return out


def test_no_import_circle_in_the_derive_step():
    files = module_files()
    scope = {m for m in files if m.startswith("reviewer.derive") or m in (
        "reviewer.context", "reviewer.quantities", "reviewer.margins", "reviewer.worstcase",
        "reviewer.engine", "reviewer.sampling", "reviewer.sensitivity", "reviewer.spread")}
    graph = {m: {x for x in imports_of(files[m]) if x in scope and x != m} for m in scope}

    def reach(start: str) -> set[str]:
        seen, todo = set(), [start]
        while todo:
            for nxt in graph[todo.pop()]:
                if nxt not in seen:
                    seen.add(nxt)
                    todo.append(nxt)
        return seen

    circles = sorted(m for m in scope if m in reach(m))
    assert circles == [], circles


def test_derive_modules_do_not_import_the_runner():
    files = module_files()
    bad = sorted(m for m, p in files.items() if m.startswith("reviewer.derive.")
                 and any(x.startswith("reviewer.quantities") for x in imports_of(p)))
    assert bad == []
