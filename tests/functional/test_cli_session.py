"""``oddsbench session``: the issue's done-criterion command, JSON shape, help and bad input."""

from __future__ import annotations

import json

import pytest
from conftest import RULESETS, run_cli

WHEEL = RULESETS / "single-zero-wheel.toml"


def test_wheel_session_prints_flat_and_bold_columns_exact_and_decimal(capsys):
    code, out, _ = run_cli(
        capsys, "session", WHEEL, "--bankroll", "100", "--goal", "200", "--plan", "flat:1", "--plan", "bold"
    )
    assert code == 0
    header = next(line for line in out.splitlines() if line.startswith("quantity"))
    assert "flat:1" in header and "bold" in header
    assert "18/37 | 0.486486" in out  # bold play from 100 to 200 wins one even-money spin
    assert "| 0.00446628" in out
    assert "Cautions:" in out and "not advice" in out


def test_ruleset_session_table_supplies_defaults(capsys):
    # single-zero-wheel.toml has [session] bankroll = 100, goal = 200
    code, out, _ = run_cli(capsys, "session", WHEEL, "--plan", "bold")
    assert code == 0 and "bankroll 100, goal 200" in out


def test_session_json_has_exact_and_decimal_pairs(capsys):
    code, out, _ = run_cli(
        capsys,
        "session",
        "--round",
        "1:18/37,-1:19/37",
        "--bankroll",
        "10",
        "--goal",
        "20",
        "--plan",
        "bold",
        "--plan",
        "kelly:1/2",
        "--json",
        "--series",
    )
    assert code == 0
    body = json.loads(out)
    assert [plan["plan"] for plan in body["plans"]] == ["bold", "kelly:1/2"]
    bold = body["plans"][0]
    assert bold["goal"] == "bounded"
    for name in (
        "goal_probability",
        "ruin_probability",
        "expected_rounds",
        "rounds_variance",
        "expected_staked",
        "expected_final_bankroll",
    ):
        assert set(bold["figures"][name]) == {"exact", "decimal", "log10"}
    assert bold["figures"]["goal_probability"]["exact"] is not None
    assert len(bold["goal_probability_by_bankroll"]) == 21
    assert body["cautions"]


def test_series_csv_has_a_line_per_bankroll(capsys, tmp_path):
    target = tmp_path / "series.csv"
    code, _, _ = run_cli(
        capsys,
        "session",
        "--round",
        "1:1/2,-1:1/2",
        "--bankroll",
        "5",
        "--goal",
        "10",
        "--plan",
        "timid",
        "--series-csv",
        target,
    )
    assert code == 0
    lines = target.read_text().splitlines()
    assert lines[0] == "bankroll,timid" and len(lines) == 12 and lines[6] == "5,0.5"


def test_help_documents_every_plan(capsys):
    from oddsbench.cli.main import main
    from oddsbench.strategy.plans import PLAN_HELP

    with pytest.raises(SystemExit) as ended:  # what a user types: ``oddsbench session --help``
        main(["session", "--help"])
    assert ended.value.code == 0
    text = capsys.readouterr().out
    for spelling, _ in PLAN_HELP:
        assert spelling in text


def test_bad_plan_is_one_line_and_exit_2(capsys):
    code, out, err = run_cli(capsys, "session", WHEEL, "--plan", "double-up")
    assert code == 2 and "unknown plan" in err and len(err.strip().splitlines()) == 1


def test_bad_round_is_one_line_and_exit_2(capsys):
    code, _, err = run_cli(capsys, "session", "--round", "1:1/2,-1:1/4", "--bankroll", "1", "--goal", "2")
    assert code == 2 and "sum to 3/4" in err


def test_missing_goal_names_the_option(capsys):
    code, _, err = run_cli(capsys, "session", "--round", "1:1/2,-1:1/2", "--bankroll", "5")
    assert code == 2 and "--goal" in err


def test_file_and_round_together_are_refused(capsys):
    code, _, err = run_cli(capsys, "session", WHEEL, "--round", "1:1/2,-1:1/2")
    assert code == 2 and "not both" in err
