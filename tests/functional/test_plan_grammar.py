"""One plan grammar: every command and the workbench read a plan text the same way, with a goal or none."""

from __future__ import annotations

import json

import pytest
from conftest import RULESETS, run_cli

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.load import load_ruleset, load_ruleset_text
from oddsbench.tui import analysis

WHEEL = RULESETS / "single-zero-wheel.toml"
BAD_PLANS = {
    "timid:1/2": "plan 'timid:1/2': timid takes no value: it always bets the table minimum",
    "double": "plan 'double': unknown plan",
    "martingale:1:31": "plan 'martingale:1:31': series length must be a whole number from 1 to 30",
    "flat:0": "plan 'flat:0': bet must be more than 0, got 0",
}


def command_error(capsys, *args) -> str:
    code, _, err = run_cli(capsys, *args)
    assert code == 2 and len(err.strip().splitlines()) == 1, err
    return err.strip()


@pytest.mark.parametrize("plan", sorted(BAD_PLANS))
def test_a_bad_plan_gets_the_same_line_from_every_command_and_the_workbench(capsys, tmp_path, plan):
    expected = BAD_PLANS[plan]
    lines = {
        "session": command_error(capsys, "session", WHEEL, "--plan", plan),
        "session, no goal": command_error(capsys, "session", WHEEL, "--goal", "none", "--plan", plan),
        "simulate": command_error(capsys, "simulate", WHEEL, "--plan", plan, "--trials", "10"),
        "report": command_error(capsys, "report", WHEEL, "--plan", plan),
    }
    spec = tmp_path / "spec.toml"
    spec.write_text(f'[sweep]\nruleset = "{WHEEL.as_posix()}"\n[session]\nplan = ["{plan}"]\n')
    lines["sweep"] = command_error(capsys, "sweep", spec, "--no-progress")
    with pytest.raises(OddsbenchError) as refused:
        analysis.parse_plans(f"bold, {plan}")
    lines["workbench"] = str(refused.value)
    for where, line in lines.items():
        assert expected in line, (where, line)
    # the same words everywhere; the command line adds its option (the workbench shows the line
    # beside its plans field)
    said = {where: line.removeprefix("oddsbench: ").split(" (change with --plan")[0] for where, line in lines.items()}
    assert len({text for where, text in said.items() if where != "sweep"}) == 1
    commands = [line for where, line in lines.items() if where not in ("sweep", "workbench")]
    assert all(line.endswith("--plan)") or line.endswith("--plan, --min-bet)") for line in commands), commands


def test_the_acceptance_half_unit_flat_bet_solves_with_a_goal_and_with_none(capsys):
    # issue 11: a half-unit flat bet with no unit or minimum given means a bet of 1/2
    common = ["session", "--round", "1:18/37,-1:19/37", "--bankroll", "5", "--plan", "flat:1/2"]
    code, bounded, err = run_cli(capsys, *common, "--goal", "10")
    assert code == 0, err
    code, no_goal, err = run_cli(capsys, *common, "--goal", "none")
    assert code == 0, err
    assert "reach the goal" in bounded and "Ruin is certain: probability exactly 1" in no_goal


def test_the_workbench_shows_play_with_no_goal_from_the_files_session_table():
    text = WHEEL.read_text().replace("goal = 200", 'goal = "none"')
    ruleset = load_ruleset_text(text, "wheel-no-goal.toml")
    result = analysis.sessions_text(ruleset, None, ("flat:1", "timid"))
    assert isinstance(result, analysis.SessionsResult), result
    assert result.plans == ("flat:1", "timid") and result.series == ()
    ruin = next(row for row in result.table.rows if row.label == "ruin chance (play never stops)")
    # single-zero wheel: subfair, so ruin is certain (Feller, vol. I, ch. XIV), exactly 1 with its proved decimal
    assert all(cell.exact == "1" and cell.decimal.startswith("1.000") for cell in ruin.cells)
    assert "play with no goal" in result.heading


def test_the_workbench_and_the_command_line_give_the_same_session_figures(capsys):
    result = analysis.sessions_text(load_ruleset(WHEEL), None, ("bold",))
    code, out, _ = run_cli(capsys, "session", WHEEL, "--plan", "bold")
    goal = next(row for row in result.table.rows if row.label == "reach the goal").cells[0]
    assert code == 0 and f"{goal.exact} | {goal.decimal}" in out and goal.exact == "18/37"


def test_the_workbench_charts_a_half_unit_flat_bet_too():
    # the default unit follows the plan's own amount in the charts' solves as in the table's
    text = WHEEL.read_text()
    result = analysis.sessions_text(load_ruleset_text(text, "wheel.toml"), None, ("flat:1/2", "bold"))
    assert isinstance(result, analysis.SessionsResult), result
    assert [series.plan for series in result.series] == ["flat:1/2", "bold"]
    assert all(series.still_playing[0] == 1.0 for series in result.series)


def test_adding_a_plan_never_changes_another_plans_figures(capsys):
    # the default unit is per plan: flat:1 alone and flat:1 beside flat:1/2 give the same figures
    common = ["session", "--round", "1:18/37,-1:19/37", "--bankroll", "5", "--goal", "10", "--json"]
    _, alone, _ = run_cli(capsys, *common, "--plan", "flat:1")
    _, beside, _ = run_cli(capsys, *common, "--plan", "flat:1", "--plan", "flat:1/2")
    first = json.loads(alone)["plans"][0]
    assert json.loads(beside)["plans"][0]["figures"] == first["figures"]


def test_the_workbench_says_where_to_set_a_bankroll_when_the_file_has_none():
    result = analysis.sessions_text(load_ruleset(RULESETS / "pig-turn.toml"), None, ("timid",))
    assert isinstance(result, analysis.RoundFailure)
    assert "under Session in the Edit view" in result.message and "--" not in result.message
