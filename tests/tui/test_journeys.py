"""Whole journeys through the forms, from the keyboard only (no Source view), checked on the figures,
on the saved file and against the command line run on that file.

The designer starts from the template, builds a game, tunes a pay, saves, reopens, and ``oddsbench
solve FILE --json`` gives the workbench's figures. The analyst adds an action and a strategy and
compares them with the best play in the Strategies view. The games are invented demos; their
figures are worked by hand below.
"""

from __future__ import annotations

import json
import subprocess
import sys

from conftest import CHOICE_GAME, ROOT

from oddsbench.model.load import read_ruleset_text
from tests.tui.helpers import app_on, figure, go_to_entry, go_to_state, settle

LABELS = {"house edge": "house_edge", "expected net": "expected_net", "expected steps": "expected_steps"}


def solve_json(path) -> dict:
    """``oddsbench solve FILE --json`` run as a user would, in a subprocess."""
    done = subprocess.run(
        [sys.executable, "-m", "oddsbench", "solve", str(path), "--json"],
        capture_output=True,
        text=True,
        cwd=ROOT,
        timeout=120,
        check=True,
    )
    return json.loads(done.stdout)


def best_json(path) -> dict:
    done = subprocess.run(
        [sys.executable, "-m", "oddsbench", "best", str(path), "--json"],
        capture_output=True,
        text=True,
        cwd=ROOT,
        timeout=120,
        check=True,
    )
    return json.loads(done.stdout)


async def type_field(pilot, text: str) -> None:
    """Type into the focused field (its text selected on entry, so typing replaces it), then Enter."""
    await pilot.press(*text, "enter")
    await settle(pilot)


async def test_the_designer_builds_a_game_from_the_template_with_the_forms_and_the_command_line_agrees(tmp_path):
    path = tmp_path / "second-toss.toml"
    app = app_on(None, tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        # Ctrl+N: a new ruleset from the template (a fair coin: toss -> won | lost), at a path typed in.
        await pilot.press("ctrl+n", "ctrl+u", *str(path), "enter")
        await settle(pilot)
        assert app.workbench.session.path == path
        # A second toss after tails: a state "again", and an end state "tie".
        await go_to_state(pilot, "toss")
        await pilot.press("a", "p", *"again", "enter")
        await settle(pilot)
        await pilot.press("e", *"tie", "enter")
        await settle(pilot)
        await pilot.press("enter")  # into the end state's result field
        await type_field(pilot, "push")
        # The outcomes of "again": heads is a tie, tails loses the stake.
        await go_to_state(pilot, "again")
        await pilot.press("enter", "a")  # into the (empty) table, a new outcome
        await settle(pilot)
        await pilot.press("enter")
        await type_field(pilot, "tie")  # to
        await type_field(pilot, "1/2")  # prob
        await pilot.press("escape", "a")
        await settle(pilot)
        await pilot.press("enter")
        await type_field(pilot, "lost")  # to
        await type_field(pilot, "1/2")  # prob (the new outcome's 0, replaced)
        await type_field(pilot, "-1")  # pay
        # Tails in "toss" now goes to the second toss, not straight to "lost", and loses nothing there.
        await go_to_state(pilot, "toss")
        await pilot.press("enter", "down", "enter")  # the outcome table, outcome 2, its first field (prob)
        assert app.focused.id == "field-prob"
        await pilot.press("shift+tab", *"again", "tab", "tab", "backspace")  # to = again; pay emptied
        await settle(pilot)
        # Worked by hand: heads (1/2) pays 1; tails (1/2) then a tie (1/4, pay 0) or a loss (1/4, pay -1):
        # expected net 1/2 - 1/4 = 1/4, house edge -1/4.
        assert figure(app, "house edge")[0] == "-1/4"
        # Tune the pay of heads to 2/5: expected net 1/5 - 1/4 = -1/20, house edge 1/20.
        await pilot.press("escape", "up", "enter", "tab")
        assert app.focused.id == "field-pay"
        await pilot.press(*"2/5")
        await settle(pilot)
        assert figure(app, "house edge")[0] == "1/20"
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert not app.workbench.session.dirty
        saved = path.read_text()
        assert app.workbench.query_one("#views").current == "edit"  # the Source view was never opened
    # The saved file keeps the template's comments and reads as the game built.
    assert "# A new game for oddsbench." in saved
    ruleset = read_ruleset_text(saved, path.name).ruleset
    assert ruleset is not None
    assert {state.name for state in ruleset.states} == {"toss", "won", "lost", "again", "tie"}
    assert ruleset.state("tie").result == "push"
    assert [(o.to, str(o.prob), str(o.pay)) for o in ruleset.state("toss").outcomes] == [
        ("won", "1/2", "2/5"),
        ("again", "1/2", "0"),
    ]
    reopened = app_on(path, tmp_path)
    async with reopened.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        shown = {label: figure(reopened, label)[0] for label in ("house edge", "expected net", "expected steps")}
        assert reopened.workbench.session.text == saved
    # By hand: steps 1 + 1/2 = 3/2 (a second toss half the time).
    assert shown == {"house edge": "1/20", "expected net": "-1/20", "expected steps": "3/2"}
    figures = solve_json(path)["results"][0]["figures"]
    assert {label: figures[key]["exact"] for label, key in LABELS.items()} == shown


async def test_the_analyst_adds_an_action_and_a_strategy_and_compares_them_with_the_best_play(tmp_path):
    path = tmp_path / "coin.toml"
    path.write_text(CHOICE_GAME)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        # A third action at the offer: "double", which wins 2 with chance 1/2 and else loses the stake.
        await go_to_state(pilot, "offer")
        await pilot.press("enter", "c", *"double", "enter")
        await settle(pilot)
        table = app.workbench.query_one("#outcomes")
        actions = [str(table.get_row_at(row)[0]) for row in range(table.row_count)]
        assert actions == ["accept", "accept", "refuse", "double"]  # every action's outcomes in one table
        table.move_cursor(row=3)
        await pilot.press("enter")
        await type_field(pilot, "won")
        await type_field(pilot, "1/2")
        await type_field(pilot, "2")
        await pilot.press("escape", "a")
        await settle(pilot)
        await pilot.press("enter")
        await type_field(pilot, "lost")
        await type_field(pilot, "1/2")
        await type_field(pilot, "-1")
        # A strategy "daring" (a copy of "careful"), choosing "double" at the offer.
        await go_to_entry(pilot, "strategy:careful")
        await pilot.press("a", "s", *"daring", "enter")
        await settle(pilot)
        assert app.workbench.query_one("#navigator").current_entry == "strategy:daring"
        await pilot.press("enter")  # the strategy's table: default, then the decision state "offer"
        strategy_table = app.workbench.query_one("#strategy-table")
        strategy_table.move_cursor(row=1)
        await pilot.press("enter")
        await pilot.press(*"double")
        await settle(pilot)
        assert read_ruleset_text(app.workbench.session.text, "x").ruleset is not None
        # The Strategies view: every strategy side by side, and the best play.
        await pilot.press("f4")
        await settle(pilot)
        result = app.workbench.strategies_result
        assert result.table.columns[:3] == ("eager", "careful", "daring")
        net = next(row for row in result.table.rows if row.label == "expected net")
        # By hand: heads (1/2) pays 1; at the offer accept gives 1/3 - 2/3, refuse -1, double 1 - 1/2.
        # eager 1/2 - 1/6 = 1/3, careful 1/2 - 1/2 = 0, daring 1/2 + 1/4 = 3/4.
        assert [cell.exact for cell in net.cells[:3]] == ["1/3", "0", "3/4"]
        assert "double" in result.best and "3/4" in result.best
        await pilot.press("ctrl+s")
        await settle(pilot)
    best = best_json(path)
    assert best["best"]["policy"] == {"offer": "double"}
    assert best["best"]["value"]["exact"] == "3/4"
    saved = read_ruleset_text(path.read_text(), "coin.toml").ruleset
    assert saved is not None and saved.strategy("daring").action_for(saved.state("offer")) == "double"
