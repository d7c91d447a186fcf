"""Every ``--json`` output validates against its shipped JSON Schema, whatever was asked.

Real outputs of each command (one and several plans, strategies and start states; bounded and
no-goal sessions) are validated with the ``jsonschema`` library, and the shapes that must not
change with the question (the top-level keys) are compared directly.
"""

from __future__ import annotations

import json
import math

import pytest
from conftest import RULESETS, run_cli
from jsonschema import Draft202012Validator

from oddsbench.cli.main import main
from oddsbench.schemas import COMMANDS, schema

PIG = RULESETS / "pig-turn.toml"
DEALER = RULESETS / "dealer-hits-soft-17.toml"
WHEEL = RULESETS / "single-zero-wheel.toml"
EVEN_51 = "1:51/100,-1:49/100"


def strict_loads(text: str):
    """Parse as a strict parser would: NaN and Infinity are not JSON."""

    def refuse(constant: str):
        raise ValueError(f"{constant} is not JSON")

    return json.loads(text, parse_constant=refuse)


def validated(command: str, out: str) -> dict:
    document = strict_loads(out)
    Draft202012Validator(schema(command)).validate(document)
    assert document["command"] == command and document["version"] == 2
    return document


@pytest.mark.parametrize("command", COMMANDS)
def test_every_schema_is_a_valid_draft_2020_12_schema(command):
    Draft202012Validator.check_schema(schema(command))


@pytest.mark.parametrize(
    "args",
    [
        ["solve", RULESETS / "pass-line.toml"],
        ["solve", RULESETS / "pass-line.toml", "--rounds", "3"],
        ["solve", PIG],
        ["solve", PIG, "--strategy", "hold-at-20"],
        ["solve", DEALER, "--from", "up-6,up-11"],
        ["solve", RULESETS / "field.toml", "--exact-limit", "0"],
    ],
    ids=["one-round", "by-step", "strategies", "one-strategy", "starts", "decimals-only"],
)
def test_solve_json_validates_for_one_round_strategies_and_starts(capsys, args):
    code, out, _ = run_cli(capsys, *args, "--json")
    assert code == 0
    document = validated("solve", out)
    assert document["results"]


@pytest.mark.parametrize(
    "args",
    [["best", PIG], ["best", PIG, "--goal", "max-win"], ["best", PIG, "--check-strategy", "hold-at-25"]],
    ids=["best", "max-win", "check"],
)
def test_best_json_validates_for_best_play_and_a_strategy_check(capsys, args):
    code, out, _ = run_cli(capsys, *args, "--json")
    assert code == 0
    validated("best", out)


SESSIONS = {
    "one-plan": ["session", "--round", "1:18/37,-1:19/37", "--bankroll", "10", "--goal", "20", "--plan", "bold"],
    "two-plans": [
        "session",
        WHEEL,
        "--bankroll",
        "10",
        "--goal",
        "20",
        "--plan",
        "flat:1",
        "--plan",
        "kelly:1/2",
        "--rounds",
        "5",
        "--series",
    ],
    "no-goal": ["session", "--round", EVEN_51, "--bankroll", "20", "--goal", "none", "--plan", "flat:1"],
    "no-goal-two-plans": [
        "session",
        "--round",
        EVEN_51,
        "--bankroll",
        "20",
        "--goal",
        "none",
        "--plan",
        "timid",
        "--plan",
        "martingale:1:3",
    ],
    "no-goal-certain": ["session", "--round", "1:18/37,-1:19/37", "--bankroll", "5", "--goal", "none"],
}


def test_session_json_has_the_same_top_level_keys_for_one_plan_two_plans_a_goal_and_none(capsys):
    keys = {}
    for name, args in SESSIONS.items():
        code, out, err = run_cli(capsys, *args, "--json")
        assert code == 0, err
        document = validated("session", out)
        keys[name] = list(document)
        goals = {plan["goal"] for plan in document["plans"]}
        assert goals == ({"none"} if name.startswith("no-goal") else {"bounded"})
    assert len({tuple(k) for k in keys.values()}) == 1, keys


def test_simulate_json_validates_for_rounds_and_for_sessions(capsys):
    code, out, _ = run_cli(capsys, "simulate", RULESETS / "pass-line.toml", "--trials", "2000", "--seed", "1", "--json")
    rounds = validated("simulate", out)
    assert code == 0 and rounds["rounds"] is not None and rounds["sessions"] is None
    args = ["simulate", WHEEL, "--bankroll", "5", "--goal", "10", "--plan", "flat:1", "--plan", "bold"]
    code, out, _ = run_cli(capsys, *args, "--trials", "2000", "--seed", "1", "--json")
    sessions = validated("simulate", out)
    assert code == 0 and sessions["rounds"] is None and len(sessions["sessions"]["plans"]) == 2
    assert list(rounds) == list(sessions)


def test_sweep_json_validates(tmp_path, capsys):
    spec = tmp_path / "spec.toml"
    spec.write_text(
        f'[sweep]\ntitle = "t"\nruleset = "{WHEEL.as_posix()}"\n[params]\npayout = [34, 35]\n'
        '[session]\nbankroll = 5\ngoal = 10\nplan = ["flat:1", "bold"]\n'
    )
    target = tmp_path / "out.json"
    assert main(["sweep", str(spec), "--workers", "1", "--no-progress", "--json", str(target)]) == 0
    capsys.readouterr()
    document = validated("sweep", target.read_text())
    assert len(document["points"]) == 4


@pytest.mark.parametrize(
    "extra",
    [
        [],
        ["--bankroll", "5", "--goal", "10", "--plan", "bold", "--plan", "timid"],
        ["--goal", "none", "--plan", "flat:1"],
    ],
    ids=["rounds", "sessions", "no-goal-sessions"],
)
def test_report_json_validates_with_and_without_sessions(tmp_path, extra):
    target = tmp_path / "report.json"
    assert main(["report", str(WHEEL), *extra, "-o", str(target)]) == 0
    document = validated("report", target.read_text())
    assert (document["sessions"] is None) == (not extra)


def test_report_json_of_strategies_validates(tmp_path):
    target = tmp_path / "pig.json"
    assert main(["report", str(PIG), "-o", str(target)]) == 0
    document = validated("report", target.read_text())
    assert document["strategies_compared"]["columns"][0] == "quantity"


def test_a_decimal_beyond_the_float_range_is_null_with_its_log10_never_infinity(capsys, tmp_path):
    # a payout of 10^400 has an exact expected net, but its decimal overflows a float
    path = tmp_path / "huge.toml"
    path.write_text(
        '[ruleset]\ntitle = "Huge payout"\nstart = "bet"\n[states.bet]\noutcomes = [\n'
        '  { to = "won", prob = "1/2", pay = "10^400" },\n  { to = "lost", prob = "1/2", pay = -1 },\n]\n'
        '[states.won]\nresult = "win"\n[states.lost]\nresult = "loss"\n'
    )
    code, out, _ = run_cli(capsys, "solve", path, "--json")
    assert code == 0 and "Infinity" not in out and "NaN" not in out
    document = validated("solve", out)
    net = document["results"][0]["figures"]["expected_net"]
    assert net["decimal"] is None and net["exact"] == f"{10**400 - 1}/2"  # (10^400 - 1) / 2, exactly
    assert abs(net["log10"] - (400 - math.log10(2))) < 1e-12
