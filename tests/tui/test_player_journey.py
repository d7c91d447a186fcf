"""The player's journey, from the keyboard at 80x24: three betting plans side by side, then play
with no goal, each figure the workbench shows equal to what ``oddsbench session --json`` prints.

The game is the bundled single-zero wheel's even-money bet (18 of 37 pockets win), bankroll 100,
goal 200. The checks against the outside world are in the CLI's own tests; here the workbench and
the command line must agree to the last digit of every exact value.
"""

from __future__ import annotations

import json

from tests.conftest import run_cli
from tests.tui.helpers import app_on, copy_ruleset, settle

PLANS = ("timid", "bold", "flat:2")
GOAL_ROWS = {
    "session.goal_probability": "goal_probability",
    "session.ruin_probability": "ruin_probability",
    "session.expected_rounds": "expected_rounds",
    "session.expected_final_bankroll": "expected_final_bankroll",
}


def session_json(capsys, path, *options: str) -> list[dict]:
    code, out, err = run_cli(capsys, "session", path, *options, "--json")
    assert code == 0, err
    return json.loads(out)["plans"]


def rows_by_key(result) -> dict:
    return {row.key: row for row in result.table.rows}


async def type_plans(pilot, text: str) -> None:
    """F5 puts the cursor in the plans field; the plans are replaced by ``text``."""
    await pilot.press("f5")
    await settle(pilot)
    assert pilot.app.focused.id == "plans-field"
    await pilot.press("end", "ctrl+u", *text)
    await settle(pilot)


async def test_three_plans_then_play_with_no_goal_match_the_command_line(tmp_path, capsys):
    path = copy_ruleset("single-zero-wheel.toml", tmp_path)
    # the command line first: while the app runs, Textual holds the standard output
    cli = session_json(capsys, path, *[option for plan in PLANS for option in ("--plan", plan)])
    no_goal = session_json(capsys, path, "--goal", "none", "--plan", "timid", "--plan", "flat:2")
    app = app_on(path, tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)

        # 1. Three plans with the file's goal: every figure as the command line gives it.
        await type_plans(pilot, ", ".join(PLANS))
        result = app.workbench.sessions_result
        assert result.plans == PLANS and "to goal 200" in result.heading
        rows = rows_by_key(result)
        for key, name in GOAL_ROWS.items():
            for column, plan in enumerate(cli):
                cell = rows[key].cells[column]
                assert cell.exact == plan["figures"][name]["exact"], (key, plan["plan"])
        # bold play from 100 to 200 at even money is one bet of everything: the goal is one win
        assert rows["session.goal_probability"].cells[1].exact == "18/37"

        # 2. Beside the bounded plans, each plan's ruin if play never stopped at a goal (bold needs one).
        ruin = rows["no_goal.ruin"].cells
        assert (ruin[0].exact, ruin[2].exact) == (no_goal[0]["ruin"]["exact"], no_goal[1]["ruin"]["exact"])
        assert ruin[1].exact is None and "goal" in ruin[1].decimal
        # at 80 columns the table still shows the first plan's figures whole
        grid = app.workbench.query_one("#sessions-table")
        shown = dict(zip((row.key for row in result.table.rows), grid.fitted.rows, strict=True))
        assert rows["session.goal_probability"].cells[0].short_decimal in shown["session.goal_probability"][1]

        # 3. The goal set to none in the Session form (F2, the list, Tab to the goal), then saved.
        await pilot.press("f2")
        await settle(pilot)
        navigator = app.workbench.query_one("#navigator")
        await pilot.press("home")
        while navigator.get_option_at_index(navigator.highlighted).id != "session:":
            await pilot.press("down")
        await settle(pilot)
        await pilot.press("tab", "tab")
        assert app.focused.id == "field-goal"
        await pilot.press("end", "ctrl+u", *"none")
        await settle(pilot)
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert 'goal = "none"' in path.read_text(encoding="utf-8")

        # 4. Play with no goal: the plans' ruin and rounds to ruin, as the CLI reads the saved file.
        await type_plans(pilot, "flat:1, flat:2, timid")
        result = app.workbench.sessions_result
        assert result.plans == ("flat:1", "flat:2", "timid") and "play with no goal" in result.heading
        assert app.is_running
    cli = session_json(capsys, path, "--plan", "flat:1", "--plan", "flat:2", "--plan", "timid")
    ruin = next(row for row in result.table.rows if row.label == "ruin chance (play never stops)")
    assert [cell.exact for cell in ruin.cells] == [plan["ruin"]["exact"] for plan in cli]
    rounds = next(row for row in result.table.rows if "rounds to ruin" in row.label)
    assert [cell.exact for cell in rounds.cells] == [plan["expected_rounds_to_ruin"]["exact"] for plan in cli]
    # a subfair wheel ruins every plan for certain (Feller, vol. I, ch. XIV); a flat bet of B loses
    # B/37 a round on average, so ruin from 100 takes 100 / (B/37) rounds: 3700 and 1850 (Wald's identity)
    assert [cell.exact for cell in ruin.cells] == ["1", "1", "1"]
    assert [cell.exact for cell in rounds.cells][:2] == ["3700", "1850"]
