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
