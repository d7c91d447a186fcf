"""The target action of the workbench: a parameter tuned from the keyboard, applied, undone."""

from __future__ import annotations

from textual.widgets import OptionList, Static

from oddsbench.tui.screens.tune_dialog import TuneDialog
from tests.tui.helpers import app_on, copy_ruleset, go_to_entry, settle


async def open_target_on(pilot, param: str) -> TuneDialog:
    await go_to_entry(pilot, "params:")
    table = pilot.app.workbench.query_one("#params-table")
    table.focus()
    names = [str(table.get_row_at(i)[0]) for i in range(table.row_count)]
    table.move_cursor(row=names.index(param))
    await pilot.pause()
    await pilot.press("t")
    await settle(pilot)
    assert isinstance(pilot.app.screen, TuneDialog)
    return pilot.app.screen


async def test_a_target_house_edge_shows_the_formula_and_applies_the_payout_with_undo(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        text = app.workbench.session.text
        dialog = await open_target_on(pilot, "payout")
        await pilot.press("end", "ctrl+u", *"house_edge=1.5%", "enter")
        await settle(pilot)
        answer = str(dialog.query_one("#tune-answer", Static).render())
        # (19 - 18 x)/37 = 3/200 at x = 3689/3600 (first principles)
        assert "house_edge(payout) = (19 - 18*payout)/37" in answer
        assert "3689/3600" in answer and "not advice" in str(dialog.query_one(".cautions-text").render())
        # the cautions once, on their one line (F9 the full text), not again as a block in the answer
        assert "Cautions:" not in answer and "not advice" not in answer
        await pilot.press("f9")
        await pilot.pause()
        from oddsbench.tui.widgets.cautions import CautionsScreen

        assert isinstance(app.screen, CautionsScreen)
        await pilot.press("escape")
        await pilot.pause()
        assert app.screen is dialog
        choices = dialog.query_one("#tune-choices", OptionList)
        choices.focus()
        choices.highlighted = 0
        await pilot.press("enter")
        await settle(pilot)
        assert not isinstance(app.screen, TuneDialog)
        assert (
            'payout = "3689/3600"' in app.workbench.session.text or "payout = 3689/3600" in app.workbench.session.text
        )
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert app.workbench.session.text == text


async def test_a_bad_target_is_one_inline_line_and_escape_closes_without_a_change(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        text = app.workbench.session.text
        dialog = await open_target_on(pilot, "payout")
        await pilot.press("end", "ctrl+u", *"house_take=1", "enter")
        await settle(pilot)
        message = dialog.query_one("#tune-message", Static)
        assert "no figure 'house_take'" in str(message.render()) and message.has_class("-error")
        await pilot.press("escape")
        await settle(pilot)
        assert not isinstance(app.screen, TuneDialog) and app.workbench.session.text == text
