"""The layer and terminal-library contracts hold, kept by import-linter (``[tool.importlinter]`` in
pyproject.toml), and a deliberate violation breaks them; the core imports without textual."""

from __future__ import annotations

import os
import shutil
import subprocess
import sys

import pytest
from conftest import ROOT

# lint-imports as the venv installs it, without relying on the script being on PATH.
LINT_IMPORTS = [
    sys.executable,
    "-c",
    "import sys; from importlinter.cli import lint_imports_command; sys.exit(lint_imports_command())",
]
HANG_GUARD = 300  # seconds: only against a hang on a loaded machine; a run takes about a second


def lint_imports(folder, *args: str) -> subprocess.CompletedProcess[str]:
    """Run lint-imports on the pyproject.toml in ``folder`` (which is first on the import path)."""
    return subprocess.run(
        [*LINT_IMPORTS, "--no-cache", "--no-logo", *args],
        cwd=folder,
        capture_output=True,
        text=True,
        env={**os.environ, "PYTHONPATH": str(folder)},
        timeout=HANG_GUARD,
    )


@pytest.fixture
def package_copy(tmp_path):
    """A copy of the package and the project's contracts, to add an offending module to."""
    shutil.copytree(ROOT / "oddsbench", tmp_path / "oddsbench", ignore=shutil.ignore_patterns("__pycache__"))
    shutil.copy(ROOT / "pyproject.toml", tmp_path / "pyproject.toml")
    return tmp_path


def test_the_project_keeps_every_import_contract():
    run = lint_imports(ROOT)
    assert run.returncode == 0, run.stdout + run.stderr
    assert " 0 broken" in run.stdout and "BROKEN" not in run.stdout


@pytest.mark.parametrize(
    ("module", "text", "contract", "reported"),
    [
        (
            "solve/probe_terminal.py",
            "import textual\n",
            "terminal-libraries",
            "oddsbench.solve.probe_terminal -> textual",
        ),
        ("report/probe_rich.py", "import rich.console\n", "terminal-libraries", "oddsbench.report.probe_rich -> rich"),
        (
            "model/probe_upward.py",
            "from oddsbench.report import cautions\n",
            "layers",
            "oddsbench.model.probe_upward -> oddsbench.report.cautions",
        ),
        (
            "solve/probe_upward.py",
            "from oddsbench.strategy import plans\n",
            "layers",
            "oddsbench.solve.probe_upward -> oddsbench.strategy.plans",
        ),
        ("cli/probe_direct.py", "import textual.app\n", "textual-in-tui", "oddsbench.cli.probe_direct -> textual"),
        (
            "tui/probe_engine.py",
            "from oddsbench.chain import round_chain\n",
            "front-ends-ask-the-core",
            "oddsbench.tui.probe_engine -> oddsbench.chain.round_chain",
        ),
        (
            "report/probe_solving.py",
            "from oddsbench.solve import round\n",
            "report-formats-only",
            "oddsbench.report.probe_solving -> oddsbench.solve.round",
        ),
        (
            "cli/probe_engine.py",
            "from oddsbench.strategy import compare\n",
            "front-ends-ask-the-core",
            "oddsbench.cli.probe_engine -> oddsbench.strategy.compare",
        ),
        (
            "core/probe_upward.py",
            "from oddsbench.report import round_report\n",
            "layers",
            "oddsbench.core.probe_upward -> oddsbench.report.round_report",
        ),
        (
            "core/probe_terminal.py",
            "import textual\n",
            "terminal-libraries",
            "oddsbench.core.probe_terminal -> textual",
        ),
    ],
)
def test_a_deliberate_violation_breaks_its_contract(package_copy, module, text, contract, reported):
    # A copy of the package with one offending module, checked against the project's own contracts.
    (package_copy / "oddsbench" / module).write_text(text)
    run = lint_imports(package_copy, "--contract", contract)
    assert run.returncode == 1, run.stdout + run.stderr
    assert "BROKEN" in run.stdout and reported in run.stdout


def test_the_same_copy_without_the_offending_module_keeps_its_contracts(package_copy):
    # The control for the test above: the copy itself is clean, so the probe module is what broke it.
    run = lint_imports(package_copy)
    assert run.returncode == 0, run.stdout + run.stderr


def test_the_core_imports_without_textual():
    code = (
        "import sys\n"
        "import oddsbench.model.load, oddsbench.model.document, oddsbench.model.history, oddsbench.chain.round_chain\n"
        "import oddsbench.solve.round, oddsbench.report.round_report, oddsbench.strategy, oddsbench.api\n"
        "import oddsbench.core.game, oddsbench.core.rounds, oddsbench.core.session, oddsbench.core.simulation\n"
        "import oddsbench.core.sweeps, oddsbench.core.reports, oddsbench.core.results\n"
        "import oddsbench.tui.analysis, oddsbench.tui.editing, oddsbench.cli.main\n"
        "bad = sorted(m for m in sys.modules if m == 'textual' or m.startswith('textual.'))\n"
        "print(bad)\n"
        "sys.exit(1 if bad else 0)\n"
    )
    run = subprocess.run(
        [sys.executable, "-c", code],
        cwd=ROOT,
        capture_output=True,
        text=True,
        env={**os.environ, "PYTHONPATH": str(ROOT)},
    )
    assert run.returncode == 0, run.stdout + run.stderr
