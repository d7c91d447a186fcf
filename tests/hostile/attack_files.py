"""Hostile files and runs for the work budget (issue 16, "Limits that do not bound the work"):
generated here, at any size, so the repository holds none of them.

``run_bounded`` runs the command line in a subprocess the way the attacks were first tried: under
a 4 GB address-space cap and a time ceiling, and reports the exit code, stderr, the wall time and
the peak resident memory of the command and everything it started.
"""

from __future__ import annotations

import os
import resource
import subprocess
import sys
import time
from dataclasses import dataclass
from pathlib import Path

ROOT = Path(__file__).resolve().parents[2]
ADDRESS_CAP = 4 * 1024**3  # the cap the attacks were first tried under
CEILING = 180  # seconds: a generous ceiling for a loaded 2-core machine (the goal is about a minute)
MEMORY_GOAL_MB = 2048  # every command on any file stays within 2 GB


@dataclass(frozen=True)
class Run:
    code: int
    out: str
    err: str
    seconds: float
    peak_mb: float

    @property
    def lines(self) -> list[str]:
        return [line for line in self.err.splitlines() if line.strip()]


def _cap() -> None:
    resource.setrlimit(resource.RLIMIT_AS, (ADDRESS_CAP, ADDRESS_CAP))


def run_bounded(*args: str, cwd: Path, ceiling: float = CEILING) -> Run:
    """``python -m oddsbench ARGS`` under the address cap; the peak memory is ``wait4``'s, children included."""
    env = dict(os.environ, PYTHONPATH=str(ROOT))
    env.pop("ODDSBENCH_DEBUG", None)
    out_path, err_path = cwd / "run.out", cwd / "run.err"
    began = time.monotonic()
    with open(out_path, "w") as out, open(err_path, "w") as err:
        process = subprocess.Popen(
            [sys.executable, "-m", "oddsbench", *args], cwd=cwd, env=env, stdout=out, stderr=err, preexec_fn=_cap
        )
        while True:
            pid, status, usage = os.wait4(process.pid, os.WNOHANG)
            if pid:
                break
            if time.monotonic() - began > ceiling:
                process.kill()
                _, status, usage = os.wait4(process.pid, 0)
                break
            time.sleep(0.05)
    process.returncode = os.waitstatus_to_exitcode(status)
    seconds = time.monotonic() - began
    return Run(
        process.returncode,
        out_path.read_text(errors="replace"),
        err_path.read_text(errors="replace"),
        seconds,
        usage.ru_maxrss / 1024,
    )


def _head(title: str, start: str, *tables: str) -> str:
    """The ``[ruleset]`` table (a stake of 1) and the plain end states every generated file starts with."""
    ends = "".join(f"[states.{name}]\n" for name in tables)
    return f'[ruleset]\ntitle = "{title}"\nstart = "{start}"\nstake = 1\n{ends}'


def walk(states: int, probability: str = "4/9 + 1/(10^59 + 7)") -> str:
    """A walk over ``states`` levels whose one probability may have a 60-digit denominator."""
    return f"""[ruleset]
title = "walk {states}"
start = "s-{states // 2}"
stake = 1
[params]
p = "{probability}"
[states.s-0]
result = "loss"
[states.s-{states}]
result = "win"
[families.s]
state = "s-{{t}}"
index = {{ t = [1, {states - 1}] }}
outcomes = [
  {{ to = "s-{{t + 1}}", prob = "p", pay = 1 }},
  {{ to = "s-{{t - 1}}", prob = "1 - p", pay = -1 }},
]
"""


def long_condition(length: int = 1977) -> str:
    """A valid condition of exactly ``length`` characters, heavy to evaluate and shallow to parse."""
    group = "(" + " + ".join(["a*b - b"] * 12) + ")"
    parts: list[str] = []
    while len(" + ".join([*parts, group])) + 8 < length:
        parts.append(group)
    text = " + ".join(parts)
    text += " + " + "1" * (length - len(text) - 8) + " >= 0"
    assert len(text) == length
    return text


def combinations(low: int = 0, high: int = 1413, condition: str | None = None) -> str:
    """A 2 KB family over (high - low + 1)^2 index combinations (2M by default) with a long ``when``."""
    condition = condition or long_condition()
    return (
        _head("combinations", "end", "end")
        + f"""[families.f]
state = "f-{{a}}-{{b}}"
index = {{ a = [{low}, {high}], b = [{low}, {high}] }}
when = "{condition}"
outcomes = [{{ to = "end" }}]
"""
    )


def many_lets(members: int = 100_000) -> str:
    """``members`` members, each with 8 ``let`` values."""
    lets = "\n".join(f'let.v{i} = "t * {i + 1} + 1/{i + 2}"' for i in range(8))
    return (
        _head("lets", "s-1", "end")
        + f"""[families.s]
state = "s-{{t}}"
index = {{ t = [1, {members}] }}
{lets}
outcomes = [{{ to = "end", pay = "v0 + v1 + v2 + v3 + v4 + v5 + v6 + v7" }}]
"""
    )


def star(branches: int) -> str:
    """A hub with ``branches`` branches, each ending in its own end state: 2 x branches + 2 states."""
    return (
        _head(f"star {branches}", "hub-0")
        + f"""[states.back]
result = "push"
[families.hub]
state = "hub-{{z}}"
index = {{ z = [0, 0] }}
outcomes = [{{ each = {{ i = [1, {branches}] }}, to = "b-{{i}}", prob = "1/{branches}" }}]
[families.b]
state = "b-{{i}}"
index = {{ i = [1, {branches}] }}
outcomes = [{{ to = "e-{{i}}", prob = "1/2", pay = 1 }}, {{ to = "back", pay = -1 }}]
[families.e]
state = "e-{{i}}"
index = {{ i = [1, {branches}] }}
result = "win"
"""
    )


def fan_out(outcomes: int = 1_000_000) -> str:
    """One state with ``outcomes`` outcomes."""
    return (
        _head("fan-out", "hub-0", "end")
        + f"""[families.hub]
state = "hub-{{z}}"
index = {{ z = [0, 0] }}
outcomes = [{{ each = {{ i = [1, {outcomes}] }}, to = "end", prob = "1/{outcomes}", pay = "i % 7 - 3" }}]
"""
    )


def dense(states: int = 500) -> str:
    """Every state reaches every state, each chance with its own denominator."""
    return (
        _head("dense", "s-1", "end")
        + f"""[families.s]
state = "s-{{i}}"
index = {{ i = [1, {states}] }}
outcomes = [
  {{ each = {{ j = [1, {states}] }}, to = "s-{{j}}", prob = "1/({states + 1} + i + j)" }},
  {{ to = "end", pay = 1 }},
]
"""
    )


def wide_round(half: int = 100) -> str:
    """An inline round with nets -half..half (2 x half + 1 outcomes) and a positive edge."""
    total = sum(range(1, 2 * half + 2))
    return ",".join(f"{k}:{k + half + 1}/{total}" for k in range(-half, half + 1))


def write(folder: Path, name: str, text: str) -> Path:
    path = folder / name
    path.write_text(text, encoding="utf-8")
    return path
