"""The code is lint-clean by the project's own ruff configuration ([tool.ruff] in pyproject.toml).

Source: the team's agreed style (common practice: pyflakes for unused or undefined names,
pycodestyle, sorted imports). A finding prints as ``path:line:col: code message``.
"""

import shutil
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[1]


def _ruff():
    beside = Path(sys.executable).with_name("ruff")
    return str(beside) if beside.exists() else shutil.which("ruff")


def test_ruff_is_clean():
    ruff = _ruff()
    if ruff is None:
        pytest.fail("ruff is not installed: it is in the test extra of pyproject.toml (pip install -e '.[test]')")
    done = subprocess.run([ruff, "check", "--output-format", "concise", "workbook", "tests", "benchmarks"],
                          cwd=ROOT, capture_output=True, text=True, timeout=120)
    assert done.returncode == 0, done.stdout + done.stderr


def test_ruff_catches_an_unused_import(tmp_path):
    # the check itself can fail: a file with an unused import is a finding
    bad = tmp_path / "bad.py"
    bad.write_text("import os\n", encoding="utf-8")
    done = subprocess.run([_ruff() or "ruff", "check", "--no-cache", "--isolated", "--select", "F", str(bad)],
                          capture_output=True, text=True, timeout=60)
    assert done.returncode == 1 and "F401" in done.stdout
