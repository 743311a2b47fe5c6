"""The built wheel works in a fresh virtual environment: bundled rules and examples included."""

import os
import subprocess
import sys
import venv
from pathlib import Path

import pytest

from tests.conftest import ROOT


@pytest.mark.slow
def test_wheel_installs_and_reviews_a_bundled_example(tmp_path):
    dist = tmp_path / "dist"
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist),
                    str(ROOT)], check=True, timeout=600)
    (wheel,) = dist.glob("*.whl")
    env_dir = tmp_path / "env"
    venv.create(env_dir, with_pip=True)
    bindir = env_dir / ("Scripts" if os.name == "nt" else "bin")
    subprocess.run([str(bindir / "python"), "-m", "pip", "install", "-q", str(wheel)],
                   check=True, timeout=900)
    examples = subprocess.run([str(bindir / "reviewer"), "examples"], capture_output=True,
                              text=True, check=True, cwd=tmp_path).stdout.split()
    assert examples and all("_data" in e for e in examples)
    careful = next(e for e in examples if "careful" in e)
    p = subprocess.run([str(bindir / "reviewer"), "check", careful, "--color", "never"],
                       capture_output=True, text=True, cwd=tmp_path)
    assert p.returncode == 0, p.stderr
    assert "Battery lamp-and-pump inverter" in p.stdout and "PASS" in p.stdout
    assert Path(careful).is_file()


@pytest.mark.slow
def test_wheel_never_packs_records_or_exports(tmp_path):
    """A checkout where someone walked an example and exported its report: the wheel still
    holds only the package, the rules and the example designs."""
    import shutil
    import zipfile

    src = tmp_path / "src"
    shutil.copytree(ROOT, src, ignore=shutil.ignore_patterns(".venv", ".git", "__pycache__",
                                                             "dist", "build", "*.egg-info"))
    ex = src / "example_designs"
    for stray in ("naive_bench_pchannel.review.toml", "review.md", "review.timing.svg",
                  "review.json", "review.sarif", ".naive_bench_pchannel.review.toml.x.tmp"):
        (ex / stray).write_text("stray\n")
    (src / "snapshot_report.html").write_text("stray\n")
    dist = tmp_path / "dist"
    subprocess.run([sys.executable, "-m", "pip", "wheel", "--no-deps", "-q", "-w", str(dist),
                    str(src)], check=True, timeout=600)
    (wheel,) = dist.glob("*.whl")
    names = zipfile.ZipFile(wheel).namelist()
    data = sorted(n for n in names if n.startswith("reviewer/_data/example_designs/"))
    assert data == sorted(f"reviewer/_data/example_designs/{p.relative_to(ROOT / 'example_designs').as_posix()}"
                          for p in (ROOT / "example_designs").rglob("*.toml")
                          if ".review." not in p.name)
    assert not [n for n in names if ".review." in n or n.endswith((".md", ".svg", ".html",
                                                                    ".sarif", ".tmp"))]
    assert any(n.startswith("reviewer/_data/rules/") for n in names)
