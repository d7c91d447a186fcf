"""Stopping the program never costs a user's work: Ctrl-C ends a long solve with exit 130 and
one line, and a process killed in the middle of saving leaves the old file whole.

The command line's writers all go through ``oddsbench/model/atomic_write.py``; the kill tests
drive ``oddsbench report --output`` in a subprocess that stops itself at the moment of writing
(its ``os.fsync`` or ``os.replace`` waits to be killed), then SIGKILL it there.
"""

from __future__ import annotations

import os
import select
import signal
import subprocess
import sys
from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parents[2]
PASS_LINE = ROOT / "rulesets" / "pass-line.toml"
OLD_REPORT = "# an earlier report\n" + "a line the user wants to keep\n" * 2000


def _env() -> dict[str, str]:
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    env.pop("ODDSBENCH_DEBUG", None)
    return env


# The program as the user runs it, saying on stdout the moment its round solve begins: the test
# presses Ctrl-C then, not after a guessed number of seconds (startup is slow on a loaded machine).
SAY_WHEN_SOLVING = """
import sys
import oddsbench.solve.round as solving

real = solving.solve_round

def said(*args, **kwargs):
    print("solving", flush=True)
    return real(*args, **kwargs)

solving.solve_round = said
from oddsbench.cli.main import entry
entry()
"""
HANG_GUARD = 120  # seconds: only a guard against a hang on a loaded machine, never the thing tested


def first_line(process: subprocess.Popen, seconds: float) -> str:
    """The child's first line of stdout, or "" if it said nothing within ``seconds``."""
    ready, _, _ = select.select([process.stdout], [], [], seconds)
    return process.stdout.readline() if ready else ""


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")
def test_ctrl_c_during_a_long_solve_exits_130_with_one_line(tmp_path):
    process = subprocess.Popen(
        [sys.executable, "-c", SAY_WHEN_SOLVING, "solve", str(PASS_LINE), "--rounds", "50000000"],
        cwd=tmp_path,
        env=_env(),
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    assert first_line(process, HANG_GUARD) == "solving\n"  # inside the step-by-step loop's solve, for minutes
    assert process.poll() is None, "the solve ended before it could be interrupted"
    process.send_signal(signal.SIGINT)
    out, err = process.communicate(timeout=60)
    assert process.returncode == 130
    assert err == "oddsbench: interrupted\n"
    assert out == ""


KILL_AT = """
import os, sys, time
from oddsbench.cli.main import main

real = getattr(os, sys.argv[1])

def wait_to_be_killed(*args, **kwargs):
    print("at-write", flush=True)
    time.sleep(120)
    return real(*args, **kwargs)

setattr(os, sys.argv[1], wait_to_be_killed)
main(sys.argv[2:])
"""


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")
@pytest.mark.parametrize("moment", ["fsync", "replace"])
def test_a_process_killed_while_saving_leaves_the_old_file_whole(moment, tmp_path):
    target = tmp_path / "report.md"
    target.write_text(OLD_REPORT, encoding="utf-8")
    command = ["report", str(PASS_LINE), "--output", str(target), "--force"]
    process = subprocess.Popen(
        [sys.executable, "-c", KILL_AT, moment, *command],
        cwd=tmp_path,
        env=_env(),
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    try:
        assert process.stdout.readline() == "at-write\n", process.stderr.read()
    finally:
        process.kill()
        process.communicate(timeout=30)
    assert process.returncode == -signal.SIGKILL
    assert target.read_text(encoding="utf-8") == OLD_REPORT
    leftovers = [path.name for path in tmp_path.iterdir() if path != target]
    assert all(name.startswith(".report.md.") and name.endswith(".tmp") for name in leftovers), leftovers

    # The next save, not killed, replaces the old file with a whole new report.
    finished = subprocess.run(
        [sys.executable, "-m", "oddsbench", *command], cwd=tmp_path, env=_env(), capture_output=True, text=True
    )
    assert finished.returncode == 0, finished.stderr
    printed = subprocess.run(
        [sys.executable, "-m", "oddsbench", "report", str(PASS_LINE)],
        cwd=tmp_path,
        env=_env(),
        capture_output=True,
        text=True,
    )
    written = target.read_text(encoding="utf-8")
    assert "Pass line" in written
    assert written.strip() == printed.stdout.strip()  # the whole report, as printed to the terminal


SAVE_AT = """
import os, sys, time
from oddsbench.model.atomic_write import write_text_atomically

real = getattr(os, sys.argv[1])

def wait_to_be_killed(*args, **kwargs):
    print("at-write", flush=True)
    time.sleep(120)
    return real(*args, **kwargs)

setattr(os, sys.argv[1], wait_to_be_killed)
write_text_atomically(sys.argv[2], "new text\\n" * 100000)
"""


@pytest.mark.skipif(sys.platform == "win32", reason="POSIX signals")
@pytest.mark.parametrize("moment", ["fsync", "replace"])
def test_a_workbench_save_killed_midway_leaves_the_old_ruleset_whole(moment, tmp_path):
    target = tmp_path / "mine.toml"
    old = (PASS_LINE).read_text(encoding="utf-8")
    target.write_text(old, encoding="utf-8")
    process = subprocess.Popen(
        [sys.executable, "-c", SAVE_AT, moment, str(target)],
        cwd=tmp_path,
        env=_env(),
        stdout=subprocess.PIPE,
        stderr=subprocess.PIPE,
        text=True,
    )
    try:
        assert process.stdout.readline() == "at-write\n", process.stderr.read()
    finally:
        process.kill()
        process.communicate(timeout=30)
    assert process.returncode == -signal.SIGKILL
    assert target.read_text(encoding="utf-8") == old
