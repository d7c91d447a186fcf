"""``oddsbench simulate``: estimate, interval and exact value side by side, for rounds and for sessions;
bad input exits 2."""

import json
from pathlib import Path

from oddsbench.cli.main import main
from oddsbench.report.cautions import CAUTIONS

RULESETS = Path(__file__).resolve().parents[2] / "rulesets"
PASS_LINE = str(RULESETS / "pass-line.toml")


def test_simulate_prints_the_estimate_its_interval_and_7_495(capsys):
    assert main(["simulate", PASS_LINE, "--trials", "100000", "--seed", "1"]) == 0
    out = capsys.readouterr().out
    house_edge = next(line for line in out.splitlines() if line.startswith("house edge"))
    assert "7/495" in house_edge and "[" in house_edge and "inside" in house_edge
    assert "rounds/s" in out and CAUTIONS[0] in out


def test_simulate_json_names_the_seed_and_no_value_outside(capsys):
    assert main(["simulate", PASS_LINE, "--trials", "50000", "--seed", "9", "--json"]) == 0
    body = json.loads(capsys.readouterr().out)
    assert body["command"] == "simulate" and body["sessions"] is None
    assert body["seed"] == 9 and body["rounds"]["trials"] == 50_000 and body["outside"] == []
    edge = next(item for item in body["rounds"]["estimates"] if item["name"] == "house_edge")
    assert edge["exact"] == "7/495" and edge["interval"][0] < edge["exact_decimal"] < edge["interval"][1]
    assert body["cautions"] == list(CAUTIONS)


def test_simulate_without_a_seed_prints_the_seed_it_drew(capsys):
    assert main(["simulate", PASS_LINE, "--trials", "1000"]) == 0
    assert ", seed " in capsys.readouterr().out.splitlines()[0]


def test_a_bad_confidence_level_exits_2(capsys):
    try:
        code = main(["simulate", PASS_LINE, "--confidence", "1.5"])
    except SystemExit as exit_:
        code = exit_.code
    assert code == 2
    assert "between 0 and 1" in capsys.readouterr().err


def test_an_unknown_strategy_exits_2_naming_the_file(capsys):
    assert main(["simulate", PASS_LINE, "--trials", "10", "--strategy", "bold"]) == 2
    assert "pass-line.toml: unknown strategy 'bold'" in capsys.readouterr().err


def test_a_game_with_decisions_needs_a_strategy_or_a_goal(capsys, rulesets_dir):
    assert main(["simulate", str(rulesets_dir / "pig-turn.toml"), "--trials", "10"]) == 2
    assert "choose a strategy (known: hold-at-10" in capsys.readouterr().err


def test_the_best_play_for_a_goal_is_simulated_against_its_exact_figures(capsys, rulesets_dir):
    pig = str(rulesets_dir / "pig-turn.toml")
    assert main(["simulate", pig, "--trials", "50000", "--seed", "2", "--best", "max-return", "--json"]) == 0
    body = json.loads(capsys.readouterr().out)
    assert body["outside"] == [] and body["rounds"]["policy"]
    names = {item["name"] for item in body["rounds"]["estimates"]}
    # a turn of Pig stakes nothing, so there is no house edge to estimate (as in `solve`)
    assert "house_edge" not in names and "expected_net" in names


def test_simulate_with_session_options_prints_each_plan_beside_the_solver(capsys):
    wheel = str(RULESETS / "single-zero-wheel.toml")
    args = ["simulate", wheel, "--bankroll", "5", "--goal", "10", "--plan", "flat:1", "--plan", "bold"]
    assert main(args + ["--trials", "20000", "--seed", "3"]) == 0
    out = capsys.readouterr().out
    assert "plan 'flat:1'" in out and "plan 'bold'" in out and "goal probability" in out
    # bold play from 5 to 10 at even money: one spin, goal chance 18/37 (Dubins and Savage; arithmetic)
    assert "18/37" in out and "OUTSIDE" not in out and CAUTIONS[0] in out


def test_simulate_sessions_as_json_lists_each_plan(capsys):
    wheel = str(RULESETS / "single-zero-wheel.toml")
    assert main(["simulate", wheel, "--session", "--plan", "bold", "--trials", "5000", "--seed", "1", "--json"]) == 0
    body = json.loads(capsys.readouterr().out)
    (plan,) = body["sessions"]["plans"]
    assert plan["plan"] == "bold" and plan["outside"] == [] and body["sessions"]["settings"]["bankroll"] == "100"
    assert body["rounds"] is None and body["outside"] == []


def test_sessions_need_a_bankroll_and_a_goal(capsys, tmp_path):
    assert main(["simulate", str(RULESETS / "pass-line.toml"), "--plan", "bold", "--trials", "10"]) == 2
    assert "a session needs a bankroll" in capsys.readouterr().err
