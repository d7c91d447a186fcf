"""The workbench's workflows, driven from the keyboard with Textual's Pilot."""

from __future__ import annotations

import io

import pytest
from rich.console import Console
from textual.widgets import Static

from oddsbench.model.load import read_ruleset_text
from oddsbench.tui.screens.dialogs import Choose
from tests.tui.helpers import app_on, cell, copy_ruleset, edit_field, figure, go_to_state, settle

# Pass line: house edge 7/495 (Epstein, The Theory of Gambling and Statistical Logic, ch. on dice (from memory)).
PASS_LINE_EDGE = "7/495"
POINT_4_WIN = '{ to = "won",     prob = "3/36", pay = 1,  note = "4 again" }'
POINT_4_AGAIN = '{ to = "point-4", prob = "27/36", note = "any other total: roll again" }'


async def test_opening_a_bundled_game_shows_its_house_edge(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE
        assert figure(app, "house edge")[1].startswith("0.0141414")


async def test_no_file_opens_the_bundled_demo(tmp_path):
    app = app_on(None, tmp_path)
    async with app.run_test() as pilot:
        await settle(pilot)
        assert app.workbench.session.path.name == "lantern-dice.toml"
        assert figure(app, "house edge")[0] == "1/30"  # the demo file's own comment gives 1/30


async def test_changing_probabilities_updates_the_exact_house_edge_and_saves_keeping_comments(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "prob", "6/36")
        await edit_field(pilot, 2, "prob", "24/36")
        # With the point of 4 made with chance 1/2 instead of 1/3, P(win) rises by (3/36)(1/6) = 1/72,
        # so the edge 1 - 2 P(win) falls by 1/36: 7/495 - 1/36 = -3/220 (worked by hand).
        assert figure(app, "house edge")[0] == "-3/220"
        assert app.workbench.session.dirty
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert not app.workbench.session.dirty
    expected = original.replace(POINT_4_WIN, POINT_4_WIN.replace('"3/36"', '"6/36"')).replace(
        POINT_4_AGAIN, POINT_4_AGAIN.replace('"27/36"', '"24/36"')
    )
    assert path.read_text() == expected
    assert "# Come-out roll: 7 or 11 wins even money" in path.read_text()
    reopened = app_on(path, tmp_path)
    async with reopened.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert figure(reopened, "house edge")[0] == "-3/220"
        assert reopened.workbench.session.text == expected


async def test_a_bad_expression_shows_the_check_message_beside_the_field_and_keeps_the_last_figures(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "prob", "3/(")
        session = app.workbench.session
        expected = [str(p) for p in read_ruleset_text(session.text, "pass-line.toml").problems if p.is_error]
        assert expected, "the edit should be invalid"
        message = app.workbench.query_one("#field-prob").parent.query_one(".field-message")
        assert str(message.render()) == "\n".join(expected)
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE
        assert "last good figures" in str(app.workbench.query_one("#summary").render())
        assert 'prob = "3/("' in session.text  # the edit is kept, not lost


async def test_quitting_with_unsaved_changes_asks_first(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "note", "four again")
        await pilot.press("ctrl+q")
        await pilot.pause()
        assert isinstance(app.screen, Choose)
        await pilot.press("c")
        await pilot.pause()
        assert app.return_code is None and not isinstance(app.screen, Choose)
        await pilot.press("ctrl+q")
        await pilot.pause()
        await pilot.press("d")
        await pilot.pause()
        assert app.return_code is not None  # the app was told to exit
    assert "four again" not in path.read_text()


async def test_quitting_without_changes_does_not_ask(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test() as pilot:
        await settle(pilot)
        await pilot.press("ctrl+q")
        await pilot.pause()
        assert app.return_code is not None  # the app was told to exit


async def test_undo_restores_the_text_and_the_figures_and_redo_reapplies(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "come-out")
        await edit_field(pilot, 0, "pay", "2")
        changed = app.workbench.session.text
        assert figure(app, "house edge")[0] != PASS_LINE_EDGE
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert app.workbench.session.text == original
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE
        assert app.workbench.query_one("#field-pay").value == "1"
        await pilot.press("ctrl+y")
        await settle(pilot)
        assert app.workbench.session.text == changed


async def test_adding_and_deleting_an_outcome_from_the_table(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        app.workbench.query_one("#outcomes").focus()
        await pilot.press("a")
        await settle(pilot)
        where = app.workbench.query_one("#state-outcomes").current.where
        assert len(app.workbench.session.document.outcomes(where)) == 4
        await pilot.press("d")
        await settle(pilot)
        assert len(app.workbench.session.document.outcomes(where)) == 3


async def test_renaming_a_state_from_the_list_renames_its_references(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "won")
        await pilot.press("r", "ctrl+u", *"player-won", "enter")
        await settle(pilot)
        text = app.workbench.session.text
        assert "[states.player-won]" in text and '"won"' not in text
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE


async def test_saving_a_bundled_game_asks_for_a_copy_in_the_current_folder(tmp_path):
    app = app_on(None, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("ctrl+s")
        await pilot.pause()
        field = app.screen.query_one("#ask-name")
        assert field.value == str(tmp_path / "lantern-dice.toml")
        await pilot.press("enter")
        await settle(pilot)
        text = app.workbench.session.text
        assert app.workbench.session.path == tmp_path / "lantern-dice.toml"
    assert (tmp_path / "lantern-dice.toml").read_text() == text


async def test_opening_a_missing_file_offers_to_create_it(tmp_path):
    path = tmp_path / "mine.toml"
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(app.screen, Choose)
        await pilot.press("c")
        await settle(pilot)
        assert path.exists() and app.workbench.session.path == path
        assert figure(app, "house edge")[0] == "0"  # the template is a fair coin


async def test_help_lists_the_keys(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("f1")
        await pilot.pause()
        console = Console(width=100, record=True, color_system=None, file=io.StringIO())
        for widget in app.screen.query(Static):
            console.print(widget.content)
        shown = console.export_text()
        for words in ("Ctrl+S", "Save", "Ctrl+Z", "Undo", "Add outcome", "Rename", "F3", "Rule earlier"):
            assert words in shown


async def test_a_refresh_while_typing_never_overwrites_newer_keystrokes(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "come-out")
        field = app.workbench.query_one("#field-note")
        field.focus()
        await pilot.pause()
        field.value = "typed ahead"  # newer than the document while its Changed message waits
        app.workbench.refresh_document()
        assert field.value == "typed ahead"
        await settle(pilot)
        assert 'note = "typed ahead"' in app.workbench.session.text


async def test_sessions_compare_two_plans_side_by_side(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await pilot.press("f5")
        await settle(pilot)
        result = app.workbench.sessions_result
        assert result.plans == ("timid", "bold")
        # Bold play from 100 to 200 at even money is one bet of 100: the chance of the goal is the
        # chance of one win, 18/37 (Dubins and Savage, How to Gamble If You Must, bold play (from memory)).
        assert cell(result.table, "reach the goal", column=1)[0] == "18/37"
        table = app.workbench.query_one("#sessions-table")
        assert table.row_count == len(result.table.rows) and len(table.columns) == 3
        assert [series.plan for series in result.series] == ["timid", "bold"]


async def test_a_bad_plan_shows_the_sessions_message_and_keeps_the_figures(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await pilot.press("f5")
        await settle(pilot)
        before = app.workbench.sessions_result
        await pilot.press("end", *", flat:")
        await settle(pilot)
        message = str(app.workbench.query_one("#plans-message").render())
        assert "flat:" in message
        assert app.workbench.sessions_result is before
        await pilot.press(*"2")
        await settle(pilot)
        assert app.workbench.sessions_result.plans == ("timid", "bold", "flat:2")


async def test_session_settings_are_edited_in_the_file(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        navigator = app.workbench.query_one("#navigator")
        navigator.highlighted = [navigator.get_option_at_index(i).id for i in range(navigator.option_count)].index(
            "session:"
        )
        await settle(pilot)
        app.workbench.query_one("#field-goal").focus()
        await pilot.press("end", "ctrl+u", *"150")
        await settle(pilot)
        assert "goal = 150" in app.workbench.session.text
        await pilot.press("f5")
        await settle(pilot)
        assert "to goal 150" in app.workbench.sessions_result.heading


HANG_GUARD = 120  # seconds: only a guard against a hang on a loaded machine, never the thing tested


def long_walk(states: int) -> str:
    """An invented subfair walk, long enough that its exact solve takes seconds."""
    lines = ["[ruleset]", 'title = "Long walk"', f'start = "s{states // 2}"', "[states.s0]", 'result = "loss"']
    lines += [f"[states.s{states}]", 'result = "win"']
    for i in range(1, states):
        lines.append(f"[states.s{i}]")
        lines.append(f'outcomes = [{{ to = "s{i + 1}", prob = "18/37", pay = 1 }}, {{ to = "s{i - 1}", pay = -1 }}]')
    return "\n".join(lines) + "\n"


@pytest.mark.parametrize("held_in", ["factorisation", "solve"])
async def test_escape_cancels_a_long_solve_and_keeps_the_workbench_responsive(tmp_path, monkeypatch, held_in):
    """Esc stops the exact engine in its factorisation or, once factored, in its solves (the rows of
    a solve ask too), and nothing half-solved is shown."""
    import asyncio
    import threading

    from oddsbench.solve.linear import IntegerLU
    from oddsbench.tui import analysis
    from oddsbench.tui.analysis import SolveCancelled

    asked, released, ended, outcome = threading.Event(), threading.Event(), threading.Event(), []
    solve = analysis.solve_round_text
    solving = threading.Event()
    exact_solve = IntegerLU.solve_transposed_scaled  # the exact round's first solve (expected visits)

    def noted_solve(self, rhs):
        solving.set()
        return exact_solve(self, rhs)

    monkeypatch.setattr(IntegerLU, "solve_transposed_scaled", noted_solve)

    def held_solve(ruleset, strategy, should_stop=None):
        """The workbench's round solve, held at the engine's first cancellation check (in the phase
        ``held_in``) until Esc is pressed, recording whether it stopped by cancellation or ran to its end."""

        def held_check() -> bool:
            if held_in == "solve" and not solving.is_set():
                return should_stop()
            asked.set()
            released.wait(HANG_GUARD)
            return should_stop()

        try:
            result = solve(ruleset, strategy, should_stop=held_check)
        except SolveCancelled:
            outcome.append("cancelled")
            raise
        finally:
            ended.set()
        outcome.append("finished")
        return result

    monkeypatch.setattr(analysis, "solve_round_text", held_solve)
    path = tmp_path / "walk.toml"
    # held at its first check, the engine needs no size to be cancelled there; a long factorisation
    # could give way to decimals on a loaded machine (the work budget) and never reach a solve
    path.write_text(long_walk(3000 if held_in == "factorisation" else 300))
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        assert await asyncio.to_thread(asked.wait, HANG_GUARD)  # the engine is inside the solve
        await pilot.pause()
        assert app.workbench.solving
        await pilot.press("escape")
        released.set()
        assert await asyncio.to_thread(ended.wait, HANG_GUARD)
        await app.workers.wait_for_complete()
        await pilot.pause()
        assert outcome == ["cancelled"]  # the engine stopped at its check, not at the end of the solve
        assert not app.workbench.solving
        assert "cancelled" in app.workbench.status_note
        assert app.workbench.result is None  # nothing half-solved is shown
        await pilot.press("f3")  # the workbench answers the next key
        await pilot.pause()
        assert app.workbench.query_one("#views").current == "round" and app.return_code is None


async def test_an_unexpected_error_in_a_solve_is_shown_in_place_and_the_workbench_stays(tmp_path, monkeypatch):
    from oddsbench.tui import analysis

    def broken_solve(ruleset, strategy, should_stop=None):
        raise RuntimeError("a bug in the engine")

    monkeypatch.setattr(analysis, "solve_round_text", broken_solve)
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert app.return_code is None and not app.workbench.solving
        assert app.workbench.status_note == "the round could not be solved: a bug in the engine"
        assert app.workbench.result is None
        await pilot.press("f3")  # the workbench answers the next key
        await pilot.pause()
        assert app.workbench.query_one("#views").current == "round"


async def test_every_field_of_a_short_form_sits_on_its_own_row_and_shows_what_is_typed(tmp_path):
    # "a" then "d" asks for a new decision state: a "state name" field, then "actions". The name
    # field once took the one-line question's style (same id), slid below its row and hid the typing.
    app = app_on(None, tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("a", "d")
        await pilot.pause()
        await pilot.press(*"offer")
        await pilot.pause()
        for field in app.screen.query(".ask-field"):
            row = field.parent.region
            assert field.region.y == row.y and field.region.height == 1, field.id
        assert app.screen.query_one("#ask-field-name").value == "offer"
        await pilot.press("enter", "enter")
        await settle(pilot)
        assert "[states.offer]" in app.workbench.session.text
