"""Every class of bad ruleset through the CLI: exit code 2 and one line naming file, state, field."""

from __future__ import annotations

import pytest
from conftest import RULESETS, run_cli

HEAD = '[ruleset]\ntitle = "bad"\nstart = "a"\n'

CASES = {
    "division-by-zero": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = "1/2" }, { to = "b", prob = "1/0" } ]\n[states.b]\n',
        "division-by-zero.toml: state 'a', outcome 2, prob \"1/0\": division by zero",
    ),
    "prob-above-one": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = "3/2" } ]\n[states.b]\n',
        "prob-above-one.toml: state 'a', outcome 1, prob \"3/2\": must be between 0 and 1, got 3/2",
    ),
    "prob-below-zero": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = "-1/2" }, { to = "b" } ]\n[states.b]\n',
        "prob-below-zero.toml: state 'a', outcome 1, prob \"-1/2\": must be between 0 and 1, got -1/2",
    ),
    "sum-not-one": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = "1/2" }, { to = "b", prob = "1/3" } ]\n[states.b]\n',
        "sum-not-one.toml: state 'a': probabilities sum to 5/6, not 1",
    ),
    "unknown-target": (
        HEAD + '[states.a]\noutcomes = [ { to = "nowhere" } ]\n[states.b]\n',
        "unknown-target.toml: state 'a', outcome 1, to: unknown state 'nowhere'",
    ),
    "unknown-parameter": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = "p" } ]\n[states.b]\n',
        "unknown-parameter.toml: state 'a', outcome 1, prob \"p\": unknown parameter 'p'",
    ),
    "missing-start": (
        '[ruleset]\ntitle = "bad"\n[states.a]\n',
        "missing-start.toml: [ruleset]: missing required field 'start'",
    ),
    "unknown-start": (
        '[ruleset]\ntitle = "bad"\nstart = "b"\n[states.a]\n',
        "unknown-start.toml: [ruleset], start: unknown state 'b'",
    ),
    "no-states": (
        HEAD,
        "no-states.toml: [states]: no states: a ruleset needs at least one state",
    ),
    "trapped": (
        HEAD + '[states.a]\noutcomes = [ { to = "b" }, { to = "c" } ]\n'
        '[states.b]\noutcomes = [ { to = "d" } ]\n[states.d]\noutcomes = [ { to = "b" } ]\n[states.c]\n',
        "trapped.toml: state 'b': the round can never end from here: trapped in {'b', 'd'}",
    ),
    "malformed-toml": (
        "[ruleset\ntitle = 1\n",
        "malformed-toml.toml: not valid TOML:",
    ),
    "wrong-type": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", pay = true } ]\n[states.b]\n',
        "wrong-type.toml: state 'a', outcome 1, pay True: must be a number or an expression in quotes, not true/false",
    ),
    "float-not-exact": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", prob = 0.5 }, { to = "b" } ]\n[states.b]\n',
        "float-not-exact.toml: state 'a', outcome 1, prob 0.5: write decimals in quotes (\"0.5\") so they stay exact",
    ),
    "empty": ("", "empty.toml: file is empty"),
    "huge-power": (
        HEAD + '[states.a]\noutcomes = [ { to = "b", pay = "10^10^10" } ]\n[states.b]\n',
        "huge-power.toml: state 'a', outcome 1, pay \"10^10^10\": exponent 10000000000 is beyond the limit",
    ),
}


@pytest.mark.parametrize("case", sorted(CASES))
def test_bad_ruleset_exits_2_with_one_line_naming_the_place(case, tmp_path, capsys):
    text, expected = CASES[case]
    path = tmp_path / f"{case}.toml"
    path.write_text(text, encoding="utf-8")
    code, out, err = run_cli(capsys, "check", path)
    assert code == 2
    lines = err.strip().splitlines()
    assert lines and lines[0].startswith(expected), err
    assert "Traceback" not in out + err


def test_solve_refuses_the_same_bad_file_with_exit_2(tmp_path, capsys):
    path = tmp_path / "sum-not-one.toml"
    path.write_text(CASES["sum-not-one"][0])
    code, _, err = run_cli(capsys, "solve", path)
    assert code == 2
    assert err.strip() == CASES["sum-not-one"][1]


def test_missing_file_is_one_line(tmp_path, capsys):
    code, _, err = run_cli(capsys, "check", tmp_path / "absent.toml")
    assert (code, err.strip()) == (2, "absent.toml: no such file")


def test_not_utf8_is_one_line(tmp_path, capsys):
    path = tmp_path / "latin.toml"
    path.write_bytes(b'[ruleset]\ntitle = "caf\xe9"\n')
    code, _, err = run_cli(capsys, "check", path)
    assert code == 2
    assert err.strip().startswith("latin.toml: is not UTF-8 text")


def test_unreachable_state_is_a_warning_and_the_file_stays_valid(tmp_path, capsys):
    path = tmp_path / "spare.toml"
    path.write_text(HEAD + '[states.a]\noutcomes = [ { to = "b" } ]\n[states.b]\n[states.spare]\n')
    code, out, _ = run_cli(capsys, "check", path)
    assert code == 0
    assert "spare.toml: warning: unreachable from start 'a': 'spare'" in out


def test_valid_bundled_file_checks_clean(capsys):
    code, out, err = run_cli(capsys, "check", RULESETS / "pass-line.toml")
    assert code == 0 and err == ""
    assert out.strip() == "pass-line.toml: valid: 9 states, 2 end states"


def test_unknown_strategy_is_one_line(capsys):
    code, _, err = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--strategy", "nope")
    assert code == 2
    assert err.strip() == "oddsbench: pass-line.toml: unknown strategy 'nope' (known: none defined)"


def test_every_ruleset_command_prints_the_files_warnings(tmp_path, capsys):
    path = tmp_path / "spare.toml"
    path.write_text(HEAD + '[states.a]\noutcomes = [ { to = "b", pay = -1 } ]\n[states.b]\n[states.spare]\n')
    for command in (["solve", path], ["best", path], ["session", path, "--bankroll", "3", "--goal", "6"]):
        code, _, err = run_cli(capsys, *command)
        assert code == 0, (command, err)
        assert "spare.toml: warning: unreachable from start 'a': 'spare'" in err, command
