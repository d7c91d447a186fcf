"""Esc in any field of the edit view leaves the field for its table (or the list) and never ends the app.

Issue 12, item 1: Esc in an outcome or parameter field ended the app with an AttributeError.
Every test drives real key presses and asserts that the app still runs, where the focus went,
and that Esc changed nothing in the document.
"""

from __future__ import annotations

from conftest import CHOICE_GAME

from tests.tui.helpers import app_on, copy_ruleset, go_to_entry, go_to_state, settle

OUTCOME_FIELDS = ("to", "prob", "pay", "stake", "note")
SETUP_FIELDS = ("title", "about", "start", "stake")


async def tab_to(pilot, field_id: str) -> None:
    """Press Tab until the field with this id has focus (a bounded number of presses)."""
    for _ in range(20):
        if pilot.app.focused is not None and pilot.app.focused.id == field_id:
            break
        await pilot.press("tab")
    assert pilot.app.focused is not None and pilot.app.focused.id == field_id


async def escape_from_each(pilot, fields, back_to: str, start) -> None:
    """For each field: ``start`` (keys that reach the editor), Tab to the field, Esc; check the focus."""
    app = pilot.app
    text = app.workbench.session.text
    for field in fields:
        await start()
        await tab_to(pilot, f"field-{field}")
        await pilot.press("escape")
        await pilot.pause()
        assert app.return_code is None, f"Esc in {field} ended the app"
        assert app.focused is not None and app.focused.id == back_to, (field, app.focused)
    assert app.workbench.session.text == text


async def test_enter_enter_esc_from_the_demo_returns_to_the_outcome_table(tmp_path):
    # The issue's own keys: oddsbench, Enter (outcome table), Enter (a field), Esc.
    app = app_on(None, tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("enter")
        await pilot.pause()
        assert app.focused.id == "outcomes"
        await pilot.press("enter")
        await pilot.pause()
        assert app.focused.id == "field-prob"
        await pilot.press("escape")
        await pilot.pause()
        assert app.return_code is None
        assert app.focused.id == "outcomes"
        await pilot.press("escape")
        await pilot.pause()
        assert app.return_code is None and app.focused.id == "navigator"
        await pilot.press("escape")  # Esc in the list stays in the list
        await pilot.pause()
        assert app.return_code is None and app.focused.id == "navigator"


async def test_esc_in_every_outcome_field_returns_to_the_outcome_table(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)

        async def start():
            await go_to_state(pilot, "point-4")
            await pilot.press("enter")

        await escape_from_each(pilot, OUTCOME_FIELDS, "outcomes", start)


async def test_esc_in_the_fields_of_a_decision_returns_to_its_outcome_table(tmp_path):
    path = tmp_path / "coin.toml"
    path.write_text(CHOICE_GAME)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        for switch in ("", "right_square_bracket"):  # the first choice, then the second

            async def start(switch=switch):
                await go_to_state(pilot, "offer")
                await pilot.press("enter")
                if switch:
                    await pilot.press(switch)

            await escape_from_each(pilot, OUTCOME_FIELDS, "outcomes", start)


async def test_esc_in_the_result_of_an_end_state_returns_to_the_list(tmp_path):
    # An end state has no outcome table: the list takes the focus back.
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)

        async def start():
            await go_to_state(pilot, "won")
            await pilot.press("enter")

        await escape_from_each(pilot, ("result",), "navigator", start)


async def test_enter_enter_esc_in_parameters_returns_to_the_parameter_table(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        text = app.workbench.session.text
        await go_to_entry(pilot, "params:")
        await pilot.press("enter")
        await pilot.pause()
        assert app.focused.id == "params-table"
        for _ in range(app.focused.row_count):
            await pilot.press("enter")
            await pilot.pause()
            assert app.focused.id == "field-param-value"
            await pilot.press("escape")
            await pilot.pause()
            assert app.return_code is None
            assert app.focused.id == "params-table"
            await pilot.press("down")
        assert app.workbench.session.text == text


async def test_esc_in_every_setup_field_returns_to_the_list(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)

        async def start():
            await go_to_entry(pilot, "setup:")
            await pilot.press("enter")

        await escape_from_each(pilot, SETUP_FIELDS, "navigator", start)


async def test_esc_in_every_session_field_returns_to_the_list(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)

        async def start():
            await go_to_entry(pilot, "session:")
            await pilot.press("enter")

        fields = [row.field for row in app.workbench.query("#session-editor FieldRow")]
        assert len(fields) == 7 and fields[:2] == ["bankroll", "goal"]  # every setting of [session]
        await escape_from_each(pilot, fields, "navigator", start)
