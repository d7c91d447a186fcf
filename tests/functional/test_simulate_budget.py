"""A simulation of rounds that almost never end stops with one line instead of running for hours."""

from __future__ import annotations

from conftest import ROOT, run_cli

from oddsbench.simulate import round_sim


def test_simulating_a_sticky_chain_stops_at_the_step_budget_with_exit_2(monkeypatch, capsys):
    monkeypatch.setattr(round_sim, "STEP_BUDGET", 2_000_000)
    code, _, err = run_cli(
        capsys, "simulate", ROOT / "tests/hostile/cases/numeric-sticky.toml", "--trials", "100000", "--seed", "1"
    )
    assert code == 2
    assert err.strip().startswith("oddsbench: simulation stopped: over 2,000,000 simulated steps in all")
    assert err.strip().endswith(
        "play fewer trials or cap each round at fewer steps (change with --trials, --max-steps)"
    )
    assert len(err.strip().splitlines()) == 1


def test_the_workbench_names_its_trials_field_for_the_same_stop():
    from oddsbench.tui.setting_ways import WAYS, problem_line

    stop = round_sim.StepBudgetExceeded("simulation stopped: over 9 simulated steps in all", "trials", "max_steps")
    assert problem_line(stop) == f"simulation stopped: over 9 simulated steps in all ({WAYS['trials']})"


def test_ordinary_games_stay_far_inside_the_budget(capsys):
    code, out, _ = run_cli(capsys, "simulate", ROOT / "rulesets/pass-line.toml", "--trials", "200000", "--seed", "3")
    assert code == 0 and "7/495" in out
