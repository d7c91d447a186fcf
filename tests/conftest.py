"""Shared test helpers: bundled ruleset paths, in-process solving and CLI runs."""

from __future__ import annotations

from pathlib import Path

import pytest

ROOT = Path(__file__).resolve().parent.parent
RULESETS = ROOT / "rulesets"
# Every named betting plan once, with amounts that fit small bankrolls (session unit and property tests).
NAMED_PLANS = ("timid", "bold", "flat:2", "fraction:1/3", "kelly", "kelly:1/2", "martingale:1:3", "paroli:1:2")


@pytest.fixture(autouse=True)
def recovery_folder(tmp_path_factory, monkeypatch) -> Path:
    """Workbench recovery copies of every test go to a fresh folder, never the home folder."""
    folder = tmp_path_factory.mktemp("recovery")
    monkeypatch.setenv("ODDSBENCH_RECOVERY_DIR", str(folder))
    return folder


@pytest.fixture
def rulesets_dir() -> Path:
    return RULESETS


def solve_text(text: str, rounds: int | None = None, policy: dict | None = None):
    """Read ruleset text and solve one round (raises RulesetError on bad text)."""
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset_text
    from oddsbench.solve.round import solve_round

    return solve_round(build_round_chain(load_ruleset_text(text, "test.toml"), policy), rounds=rounds)


def solve_file(name: str, rounds: int | None = None):
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.model.load import load_ruleset
    from oddsbench.solve.round import solve_round

    return solve_round(build_round_chain(load_ruleset(RULESETS / name)), rounds=rounds)


def run_cli(capsys, *args: str) -> tuple[int, str, str]:
    """Run the command line in-process: (exit code, stdout, stderr)."""
    from oddsbench.cli.main import main

    code = main([str(arg) for arg in args])
    captured = capsys.readouterr()
    return code, captured.out, captured.err


# An invented two-action game for the strategies-compared section.
CHOICE_GAME = """
[ruleset]
title = "Coin with a second chance"
start = "first"

[states.first]
outcomes = [{ to = "won", prob = "1/2", pay = 1 }, { to = "offer", prob = "1/2" }]

[states.offer.choices]
accept = [{ to = "won", prob = "1/3", pay = 1 }, { to = "lost", pay = -1 }]
refuse = [{ to = "lost", pay = -1 }]

[states.won]
result = "win"

[states.lost]
result = "loss"

[strategies.eager]
offer = "accept"

[strategies.careful]
offer = "refuse"
"""


@pytest.fixture
def choice_game(tmp_path):
    """The invented coin game as a file."""
    path = tmp_path / "coin.toml"
    path.write_text(CHOICE_GAME)
    return path


# ----- walks for the ruin engines (unit and property tests of play with no goal) -----


def scaled(law, units):
    """A law of whole-unit jumps, each jump times ``units`` (a bet of ``units`` units)."""
    return {jump * units: chance for jump, chance in law.items()}


def levels_problem(tail, bottom, bankroll):
    """The cut-bet walk as the cut-bet ruin engine states it: its own law at each low level, ``tail`` above."""
    from oddsbench.solve.ruin import CutBetWalk
    from oddsbench.solve.ruin.law import normalise_law

    return CutBetWalk(normalise_law(tail), tuple(normalise_law(law) for law in bottom), bankroll)


def expected_rounds_by_truncation(problem, bankroll, size=4_000):
    """Expected rounds to ruin by first-step analysis on levels 1..size (float, scipy sparse LU)."""
    import numpy as np
    import scipy.sparse as sp
    from scipy.sparse.linalg import spsolve

    rows, cols, vals = [], [], []
    for k in range(1, size + 1):
        rows.append(k - 1), cols.append(k - 1), vals.append(1.0)
        for jump, chance in problem.law_at(k):
            if 1 <= k + jump <= size:
                rows.append(k - 1), cols.append(k + jump - 1), vals.append(-float(chance))
    return spsolve(sp.csc_matrix((vals, (rows, cols)), shape=(size, size)), np.ones(size))[bankroll - 1]


def pytest_sessionfinish(session) -> None:
    """Collect this process's garbage now and freeze what is left.

    pytest collects garbage five times in its last clean-up, after an xdist worker has told the
    controller it finished; execnet gives a worker 5 s from then and sends it SIGINT after that,
    which a loaded machine reached inside those collections (a KeyboardInterrupt in hypothesis's
    GC callback at the end of full runs). Here, before the worker reports, the same collections
    run (their unraisable exceptions are still reported), and the survivors are frozen out of
    the later ones.
    """
    import gc

    for _ in range(3):
        if gc.collect() == 0:
            break
    gc.freeze()
