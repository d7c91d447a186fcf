"""Long native calls run where they can be abandoned, and nothing outlives the command.

SuperLU's factorisations and flint's root finding do not return to Python for Ctrl-C, so long
ones run in a forked child (``solve/detached.py``) that the caller kills on Ctrl-C, a cancelled
worker, the deadline or the memory guard; sweeps run on workers that end with the command on
Ctrl-C and SIGTERM. Subprocess tests wait for the child they want to interrupt to exist, then
signal; the bounds on how long the end takes are generous ceilings, not timings.
"""

from __future__ import annotations

import multiprocessing
import os
import signal
import subprocess
import sys
import time
from pathlib import Path

import numpy as np
import pytest
from hostile import attack_files as files

from oddsbench.model import budget
from oddsbench.model.budget import Budget, OverBudget
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.detached import run_detached
from oddsbench.solve.linear import DetachedFactors, factor_float

ROOT = Path(__file__).resolve().parents[2]
POSIX = pytest.mark.skipif(sys.platform == "win32", reason="POSIX processes and signals")
CEILING = 60  # seconds for a stopped command to end: generous for a loaded 2-core machine


def _sleep(seconds: float) -> str:
    time.sleep(seconds)
    return "woke"


def _allocate(megabytes: int) -> int:
    return int(np.ones(megabytes * 1024 * 1024 // 8).sum())


def _fail() -> None:
    raise ValueError("from the child")


def _no_children_left() -> bool:
    deadline = time.monotonic() + CEILING
    while multiprocessing.active_children():
        if time.monotonic() > deadline:
            return False
        time.sleep(0.05)
    return True


@POSIX
def test_a_detached_call_returns_its_value_and_raises_its_error():
    assert run_detached(_sleep, (0,), "a nap") == "woke"
    with pytest.raises(ValueError, match="from the child"):
        run_detached(_fail, (), "a failure")
    assert _no_children_left()


@POSIX
def test_a_cancelled_worker_abandons_the_detached_call_at_once():
    asked = time.monotonic()
    with pytest.raises(SolveCancelled):
        run_detached(_sleep, (600,), "a long nap", should_stop=lambda: time.monotonic() - asked > 0.3)
    assert _no_children_left()


@POSIX
def test_the_deadline_ends_a_detached_call_with_one_line():
    with budget.scope(Budget(0.5)), pytest.raises(OverBudget, match="a long nap: over the time budget"):
        run_detached(_sleep, (600,), "a long nap")
    assert _no_children_left()


@POSIX
def test_a_detached_call_past_the_memory_budget_ends_naming_the_option():
    # The child may hold no more data than the budget: a 2 GB array fails in the child, not here.
    held = budget.memory_in_use() // budget.MB
    with budget.scope(Budget(60, held + 300)), pytest.raises(OverBudget, match=r"--memory MB"):
        run_detached(_allocate, (2_048,), "a large array")
    assert _no_children_left()


@POSIX
def test_a_large_float_factorisation_is_made_and_kept_in_a_child_and_gives_the_same_solves():
    from scipy.sparse import diags
    from scipy.sparse.linalg import splu

    size = 60_000
    system = diags([np.full(size - 1, -0.49), np.ones(size), np.full(size - 1, -0.5)], [-1, 0, 1], format="csc")
    factors = factor_float(system, order="from-top")
    assert isinstance(factors, DetachedFactors)
    rhs = np.linspace(0, 1, size)
    here = splu(system.tocsc())
    assert np.allclose(factors.solve(rhs), here.solve(rhs), rtol=1e-10, atol=1e-12)
    assert np.allclose(factors.solve_transposed(rhs), here.solve(rhs, trans="T"), rtol=1e-10, atol=1e-12)
    factors.close()
    assert _no_children_left()


@POSIX
def test_a_cancelled_workbench_question_ends_its_detached_root_finding(tmp_path):
    # The workbench hands the core Work(should_stop=worker.is_cancelled): the same check reaches the
    # wait on a detached root finding, which kills the child.
    from oddsbench.core import Cancelled, Work, inline_round, make_settings, sessions

    game = inline_round(files.wide_round(100))
    settings = make_settings(bankroll=1000, goal="none")
    seen: list[int] = []

    def cancelled_once_a_child_runs() -> bool:
        children = multiprocessing.active_children()
        seen.extend(child.pid for child in children)
        return bool(children)

    with pytest.raises(Cancelled):
        sessions(game, settings, Work(should_stop=cancelled_once_a_child_runs))
    assert seen and _no_children_left()


def _env() -> dict[str, str]:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    env.pop("ODDSBENCH_DEBUG", None)
    return env


def _descendants(pid: int) -> list[int]:
    found = subprocess.run(["pgrep", "-P", str(pid)], capture_output=True, text=True).stdout.split()
    children = [int(child) for child in found]
    return children + [grandchild for child in children for grandchild in _descendants(child)]


def _alive(pid: int) -> bool:
    try:
        with open(f"/proc/{pid}/stat") as stat:
            return stat.read().split(") ", 1)[1][0] != "Z"
    except (OSError, IndexError):
        return False


def _signal_once_children_run(command: list[str], sig: int, children: int, cwd: Path):
    """Start the command, wait until it has ``children`` processes of its own, send ``sig``; return
    (exit code, stderr, the children it had)."""
    process = subprocess.Popen(
        [sys.executable, "-m", "oddsbench", *command],
        cwd=cwd,
        env=_env(),
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
        text=True,
    )
    deadline = time.monotonic() + CEILING
    kids: list[int] = []
    while len(kids) < children and process.poll() is None and time.monotonic() < deadline:
        time.sleep(0.05)
        kids = _descendants(process.pid)
    assert process.poll() is None and len(kids) >= children, "the command ended before it could be signalled"
    process.send_signal(sig)
    try:
        _, err = process.communicate(timeout=CEILING)
    except subprocess.TimeoutExpired:
        process.kill()
        process.communicate()
        for kid in kids:
            if _alive(kid):
                os.kill(kid, signal.SIGKILL)
        pytest.fail(f"the command did not end within {CEILING} s of the signal")
    return process.returncode, err, kids


def _ended(pids: list[int]) -> bool:
    deadline = time.monotonic() + CEILING
    while any(_alive(pid) for pid in pids):
        if time.monotonic() > deadline:
            return False
        time.sleep(0.05)
    return True


@POSIX
def test_ctrl_c_stops_flint_root_finding_in_its_child(tmp_path):
    command = ["session", f"--round={files.wide_round(100)}", "--bankroll", "1000", "--goal", "none", "--budget", "600"]
    code, err, kids = _signal_once_children_run(command, signal.SIGINT, 1, tmp_path)
    assert code == 130 and err == "oddsbench: interrupted\n"
    assert _ended(kids)


def _heavy_sweep(folder: Path) -> Path:
    files.write(folder, "walk.toml", files.walk(800, "18/37"))
    return files.write(
        folder,
        "sweep.toml",
        '[sweep]\ntitle = "heavy"\nruleset = "walk.toml"\nfigures = ["expected_steps"]\n'
        '[params]\np = { from = "40/100", to = "49/100", step = "1/1000" }\n',
    )


@POSIX
@pytest.mark.parametrize(
    ("sig", "code", "line"), [(signal.SIGINT, 130, "interrupted"), (signal.SIGTERM, 143, "terminated")]
)
def test_a_sweep_on_local_processes_ends_its_workers_on_ctrl_c_and_sigterm(sig, code, line, tmp_path):
    spec = _heavy_sweep(tmp_path)
    command = ["sweep", str(spec), "--workers", "2", "--no-progress", "--budget", "600"]
    returned, err, kids = _signal_once_children_run(command, sig, 2, tmp_path)
    assert returned == code and err == f"oddsbench: {line}\n"
    assert _ended(kids), "a sweep worker outlived the command"
