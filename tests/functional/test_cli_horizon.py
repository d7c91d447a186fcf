"""``oddsbench horizon`` as a user runs it: text, ``--json`` against its schema, and bad input."""

from __future__ import annotations

import json

import pytest
from conftest import RULESETS, run_cli
from jsonschema import Draft202012Validator

from oddsbench.schemas import schema


def test_horizon_text_summarises_then_details_each_number_of_rounds(capsys):
    code, out, _ = run_cli(capsys, "horizon", RULESETS / "single-zero-wheel.toml", "--rounds", "10,1000")
    assert code == 0
    assert "1655010535112064/4808584372417849" in out  # ahead after 10 spins (binomial, first principles)
    assert "After 1,000 round(s): exact law" in out
    assert "normal approximation" in out
    assert "converges on the house edge" in out  # the horizon caution beside the usual ones


def test_horizon_json_validates_and_keeps_the_documented_keys(capsys):
    code, out, _ = run_cli(capsys, "horizon", RULESETS / "pass-line.toml", "--rounds", "1,10,100,10000", "--json")
    assert code == 0
    document = json.loads(out)
    Draft202012Validator(schema("horizon")).validate(document)
    first, *_, last = document["horizons"]
    assert [h["rounds"] for h in document["horizons"]] == [1, 10, 100, 10000]
    assert first["ahead"]["exact"] == "244/495" and first["even"]["exact"] == "0"
    assert set(first["quantiles"]) == {"1", "5", "25", "50", "75", "95", "99"}
    assert set(first["rtp_range"]) == {"90", "95", "99"}
    assert last["method"] == "float" and last["ahead"]["exact"] is None and last["mean"]["exact"] == "-14000/99"


def test_horizon_of_an_inline_round_and_of_a_strategy(capsys):
    code, out, _ = run_cli(capsys, "horizon", "--round", "1:18/37,-1:19/37", "--rounds", "10", "--json")
    assert code == 0 and json.loads(out)["horizons"][0]["even"]["exact"] == "1179046873678464/4808584372417849"
    code, out, _ = run_cli(capsys, "horizon", RULESETS / "pig-turn.toml", "--strategy", "hold-at-20", "--rounds", "2")
    assert code == 0 and "hold-at-20" in out


@pytest.mark.parametrize(
    ("args", "fragment"),
    [
        (["--rounds", "0"], "at least 1"),
        (["--rounds", "ten"], "expected whole numbers"),
        (["--rounds", "1,,x"], "expected whole numbers"),
        (["--rounds", "99999999999"], "from 1 to"),
        (["--rounds", "5000000"], "over the limit"),
        (["--rounds", "10", "--round", "1:1/2,-1:1/2"], "not both"),
    ],
    ids=["zero", "words", "junk", "huge", "too-wide", "file-and-round"],
)
def test_bad_horizon_input_is_one_line_and_exit_2(capsys, args, fragment):
    try:
        code, out, err = run_cli(capsys, "horizon", RULESETS / "pass-line.toml", *args)
    except SystemExit as stop:  # refused while reading the options
        code, (out, err) = stop.code, capsys.readouterr()
    assert code == 2 and out == ""
    assert len(err.strip().splitlines()) == 1 and fragment in err


def test_a_game_with_decisions_and_no_strategy_is_refused_in_one_line(capsys):
    code, _, err = run_cli(capsys, "horizon", RULESETS / "pig-turn.toml", "--rounds", "2")
    assert (
        code == 2
        and "choose one strategy" in err
        and err.strip().endswith("(change with --strategy)")
        and len(err.strip().splitlines()) == 1
    )
