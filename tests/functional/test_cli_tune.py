"""``oddsbench tune`` as a user runs it: text, ``--json`` against its schema, and bad input."""

from __future__ import annotations

import json

import pytest
from conftest import RULESETS, run_cli
from jsonschema import Draft202012Validator

from oddsbench.schemas import schema

WHEEL = RULESETS / "single-zero-wheel.toml"


def test_break_even_of_the_wheel_payout_is_19_18_with_the_formula(capsys):
    # edge(payout) = (19 - 18 payout)/37 for 18 of 37 pockets paying `payout` (first principles)
    code, out, _ = run_cli(capsys, "tune", WHEEL, "--vary", "payout")
    assert code == 0
    assert "house_edge(payout) = (19 - 18*payout)/37" in out
    assert "19/18" in out and "gives the target exactly" in out
    assert "not advice" in out


def test_a_percent_target_gives_the_exact_payout(capsys):
    # (19 - 18 x)/37 = 2/100: x = (1900 - 74)/1800 = 913/900 (first principles)
    code, out, _ = run_cli(capsys, "tune", WHEEL, "--vary", "payout", "--target", "house_edge=2%")
    assert code == 0 and "913/900" in out


def test_tune_json_validates_with_a_formula_with_algebraic_values_and_with_brackets(capsys, tmp_path):
    validator = Draft202012Validator(schema("tune"))
    code, out, _ = run_cli(capsys, "tune", WHEEL, "--vary", "payout", "--json")
    document = json.loads(out)
    validator.validate(document)
    assert code == 0 and document["formula"]["text"] == "(19 - 18*payout)/37"
    assert [s["exact"] for s in document["solutions"]] == ["19/18"]
    assert document["target"]["exact"] == "0" and document["target_given"] is False

    deuce = RULESETS / "deuce-game.toml"
    code, out, _ = run_cli(capsys, "tune", deuce, "--vary", "p", "--target", "end:won=3/4", "--json")
    document = json.loads(out)
    validator.validate(document)
    valid = [s for s in document["solutions"] if s["valid"]]
    assert code == 0 and len(valid) == 1 and valid[0]["exact"] is None
    assert valid[0]["decimal"].startswith("0.60693052172768331528922963892")  # Newton-Keller formula, mpmath

    code, out, _ = run_cli(capsys, "tune", WHEEL, "--vary", "pockets", "--json", "--tolerance", "1e-6")
    document = json.loads(out)
    validator.validate(document)
    assert code == 0 and document["kind"] == "not-polynomial" and document["formula"] is None
    bracket = document["brackets"][0]
    assert bracket["low"]["decimal"] <= 36 <= bracket["high"]["decimal"]  # 18/pockets = 1/2 at 36 pockets


def test_between_keeps_the_values_in_range(capsys):
    deuce = RULESETS / "deuce-game.toml"
    code, out, _ = run_cli(
        capsys, "tune", deuce, "--vary", "p", "--target", "end:won=3/4", "--between", "0,1", "--json"
    )
    assert code == 0 and len(json.loads(out)["solutions"]) == 1


ONLY_ONE_VALUE = """[ruleset]
title = "valid at one value only"
start = "s"
[params]
p = "1/2"
[states.s]
outcomes = [{ to = "a", prob = "p", pay = 1 }, { to = "b", prob = "1/2", pay = -1 }]
[states.a]
[states.b]
"""


@pytest.mark.parametrize(
    ("args", "fragment"),
    [
        (["--vary", "nope"], "no such parameter"),
        (["--vary", "payout", "--target", "house_take=1%"], "no figure 'house_take'"),
        (["--vary", "payout", "--target", "house_edge=abc"], "not an exact value"),
        (["--vary", "payout", "--target", "house_edge=__import__('os')"], "not an exact value"),
        (["--vary", "payout", "--target", "house_edge"], "expected FIGURE=VALUE"),
        (["--vary", "payout", "--tolerance", "0"], "must be above 0"),
        (["--vary", "payout", "--tolerance", "x"], "not an exact value"),
        (["--vary", "payout", "--between", "3,1"], "must be below"),
        (["--vary", "payout", "--between", "3"], "expected LO,HI"),
        (["--vary", "payout", "--target", "net_sd=-1"], "never reached"),
        (["--vary", "payout", "--target", "end:nowhere=1/2"], "no figure"),
    ],
    ids=[
        "name",
        "figure",
        "value",
        "code",
        "no-value",
        "tolerance",
        "tolerance-text",
        "between",
        "between-one",
        "sd",
        "end-state",
    ],
)
def test_bad_tune_input_is_one_line_and_exit_2(capsys, args, fragment):
    try:
        code, out, err = run_cli(capsys, "tune", WHEEL, *args)
    except SystemExit as stop:  # refused while reading the options
        code, (out, err) = stop.code, capsys.readouterr()
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and fragment in err


def test_a_parameter_that_leaves_the_file_invalid_everywhere_else_is_one_line(capsys, tmp_path):
    path = tmp_path / "one.toml"
    path.write_text(ONLY_ONE_VALUE)
    code, out, err = run_cli(capsys, "tune", path, "--vary", "p")
    assert code == 2 and out == "" and len(err.strip().splitlines()) == 1
    assert "valid at only 1 of" in err


def test_a_game_with_decisions_needs_one_strategy(capsys):
    code, _, err = run_cli(capsys, "tune", RULESETS / "lamplighter-ladder.toml", "--vary", "nope")
    assert code == 2 and len(err.strip().splitlines()) == 1
