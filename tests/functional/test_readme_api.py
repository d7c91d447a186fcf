"""The README's ``## Python API`` section: its first Python block runs as written from the project root."""

from __future__ import annotations

import re
import subprocess
import sys

from conftest import ROOT


def first_python_block() -> str:
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text[text.index("\n## Python API\n") :]
    found = re.search(r"```python\n(.*?)```", section, re.S)
    assert found, "the Python API section has no ```python block"
    return found.group(1)


def test_the_readme_python_api_block_runs_and_prints_the_pass_line_edge_7_of_495():
    done = subprocess.run(
        [sys.executable, "-c", first_python_block()], cwd=ROOT, capture_output=True, text=True, timeout=300
    )
    assert done.returncode == 0, done.stderr
    assert "7/495" in done.stdout  # pass line house edge (Ethier, The Doctrine of Chances)


def test_the_readme_shows_what_the_block_prints():
    text = (ROOT / "README.md").read_text(encoding="utf-8")
    section = text[text.index("\n## Python API\n") :]
    shown = re.search(r"prints\n\n```\n(.*?)```", section, re.S).group(1)
    done = subprocess.run(
        [sys.executable, "-c", first_python_block()], cwd=ROOT, capture_output=True, text=True, timeout=300
    )
    assert done.stdout == shown
