"""``oddsbench session ... --goal none`` end to end (the issue's acceptance command and its neighbours)."""

from __future__ import annotations

import json

from conftest import RULESETS, run_cli

from oddsbench.report.cautions import CAUTIONS

EVEN_51 = "1:51/100,-1:49/100"


def test_acceptance_command_prints_exact_power_decimal_bound_approximation_and_cautions(capsys):
    code, out, err = run_cli(
        capsys, "session", "--round", EVEN_51, "--bankroll", "20", "--goal", "none", "--plan", "flat:1"
    )
    assert code == 0, err
    assert "(49/51)^20" in out and "0.44928102674559246400" in out  # (49/51)^20 to 20 digits
    assert "Lundberg upper bound" in out and "diffusion approximation" in out
    assert "approximation, not a bound" in out
    assert all(caution in out for caution in CAUTIONS)


def test_subfair_round_with_no_goal_is_certain_ruin_in_740_rounds(capsys):
    # single-zero even-money bet: edge 1/37, ruin certain, E[rounds] = 20 / (1/37) (Wald)
    code, out, _ = run_cli(
        capsys, "session", "--round", "1:18/37,-1:19/37", "--bankroll", "20", "--goal", "none", "--plan", "timid"
    )
    assert code == 0
    assert "Ruin is certain: probability exactly 1" in out and "740" in out


def test_goal_none_in_the_session_table_of_a_file(capsys, tmp_path):
    text = (RULESETS / "single-zero-wheel.toml").read_text().replace("goal = 200", 'goal = "none"')
    path = tmp_path / "wheel-no-goal.toml"
    path.write_text(text)
    code, out, err = run_cli(capsys, "session", str(path), "--plan", "flat:1", "--bankroll", "20")
    assert code == 0, err
    assert "Ruin is certain: probability exactly 1" in out


def test_json_of_no_goal(capsys):
    code, out, _ = run_cli(
        capsys, "session", "--round", EVEN_51, "--bankroll", "20", "--goal", "none", "--plan", "flat:1", "--json"
    )
    body = json.loads(out)
    (plan,) = body["plans"]
    assert code == 0 and plan["ruin"]["closed_form"] == "(49/51)^20" and plan["plan"] == "flat:1"
    assert plan["goal"] == "none" and body["settings"]["goal"] == "none"


def test_bold_play_with_no_goal_is_refused_in_one_line(capsys):
    code, _, err = run_cli(
        capsys, "session", "--round", EVEN_51, "--bankroll", "20", "--goal", "none", "--plan", "bold"
    )
    assert code == 2 and "bet must stay bounded" in err and len(err.strip().splitlines()) == 1


def test_digits_option_gives_more_proved_digits(capsys):
    code, out, _ = run_cli(
        capsys,
        "session",
        "--round",
        EVEN_51,
        "--bankroll",
        "20",
        "--goal",
        "none",
        "--plan",
        "flat:1",
        "--digits",
        "40",
    )
    assert code == 0 and "0.4492810267455924639962977056298622755981" in out
