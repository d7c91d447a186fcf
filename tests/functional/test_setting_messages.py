"""A wrong setting is said once by the core, in the setting's own words, and each front end adds
its own way to change it: the command line its option, the workbench its field or key
(``model/errors.py``, ``SettingProblem``, ``cli/options.py``, ``tui/setting_ways.py``)."""

from __future__ import annotations

import ast
from pathlib import Path

import pytest
from conftest import RULESETS, run_cli

import oddsbench
from oddsbench.model.errors import SettingProblem
from oddsbench.tui.setting_ways import WAYS, problem_line
from oddsbench.tui.tuning import tune_view

CORE = Path(oddsbench.__file__).parent / "core"


def test_no_core_message_names_a_command_line_option():
    # every string the core writes, checked in its source: options are the command line's words
    found = []
    for path in sorted(CORE.glob("*.py")):
        tree = ast.parse(path.read_text(encoding="utf-8"))
        docstrings = {
            id(node.body[0].value)
            for node in ast.walk(tree)
            if isinstance(node, (ast.Module, ast.FunctionDef, ast.ClassDef, ast.AsyncFunctionDef))
            and node.body
            and isinstance(node.body[0], ast.Expr)
        }
        for node in ast.walk(tree):
            if isinstance(node, ast.Constant) and isinstance(node.value, str) and id(node) not in docstrings:
                if "--" in node.value:
                    found.append(f"{path.name}:{node.lineno}: {node.value!r}")
    assert not found, found


@pytest.mark.parametrize(
    ("args", "said", "way"),
    [
        (["session", "--round", "1:1/2,-1:1/2", "--bankroll", "5", "--goal", "none", "--rounds", "3"],
         "a number of rounds needs a goal; with no goal", "(change with --rounds, --goal)"),
        (["session", "--round", "1:1/2,-1:1/2", "--bankroll", "5", "--goal", "10", "--strategy", "x"],
         "a strategy needs a ruleset file", "(change with --strategy)"),
        (["session", "--round", "1:1/2,-1:1/2", "--bankroll", "5x", "--goal", "10"],
         "bankroll '5x'", "(change with --bankroll)"),
        (["tune", str(RULESETS / "single-zero-wheel.toml"), "--vary", "payout", "--tolerance", "0"],
         "tolerance 0: must be above 0", "(change with --tolerance)"),
        (["tune", str(RULESETS / "single-zero-wheel.toml"), "--vary", "payout", "--target", "house_edge"],
         "target 'house_edge': expected FIGURE=VALUE", "(change with --target)"),
    ],
    ids=["rounds-without-goal", "strategy-inline", "bankroll", "tolerance", "target"],
)  # fmt: skip
def test_the_command_line_names_its_option_after_the_cores_words(capsys, args, said, way):
    code, _out, err = run_cli(capsys, *args)
    line = err.strip()
    assert code == 2 and "\n" not in line
    assert said in line and line.endswith(way)


def test_the_python_api_gets_the_cores_words_and_the_setting_keys():
    game = oddsbench.inline_round("1:1/2,-1:1/2")
    with pytest.raises(SettingProblem) as problem:
        oddsbench.sessions(game, bankroll="5", goal="none", rounds=3)
    assert problem.value.settings == ("rounds", "goal") and "--" not in str(problem.value)


def test_the_workbench_names_its_field_where_the_command_line_names_an_option():
    text = (RULESETS / "single-zero-wheel.toml").read_text(encoding="utf-8")
    said = tune_view(text, "wheel.toml", "payout", "house_edge", None)
    assert said.startswith("target 'house_edge': expected FIGURE=VALUE") and said.endswith("(the target field)")
    goal = problem_line(SettingProblem("simulated sessions need a goal", "goal"))
    assert goal == f"simulated sessions need a goal ({WAYS['goal']})" and "--" not in goal


def test_a_setting_the_workbench_cannot_change_is_said_as_the_core_said_it():
    assert problem_line(SettingProblem("tolerance 0: must be above 0", "tolerance")) == "tolerance 0: must be above 0"
