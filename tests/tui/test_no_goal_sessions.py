"""Play with no goal in the workbench: goal = "none" under Session, then the Sessions view (F5)."""

from __future__ import annotations

from tests.tui.helpers import app_on, copy_ruleset, settle


async def test_goal_none_in_the_session_form_shows_each_plans_risk_of_ruin(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        navigator = app.workbench.query_one("#navigator")
        ids = [navigator.get_option_at_index(i).id for i in range(navigator.option_count)]
        navigator.highlighted = ids.index("session:")
        await settle(pilot)
        app.workbench.query_one("#field-goal").focus()
        await pilot.press("end", "ctrl+u", *"none")
        await settle(pilot)
        assert 'goal = "none"' in app.workbench.session.text
        await pilot.press("f5")
        await settle(pilot)
        # the default plans are timid and bold: bold needs a goal, and the view says so in one line
        assert "bet must stay bounded" in app.workbench.sessions_result.message
        app.workbench.query_one("#plans-field").focus()
        await pilot.press("end", "ctrl+u", *"flat:1, timid")
        await settle(pilot)
        result = app.workbench.sessions_result
        assert result.plans == ("flat:1", "timid") and "play with no goal" in result.heading
        ruin = next(row for row in result.table.rows if row.label == "ruin chance (play never stops)")
        # single-zero even-money bets: subfair, so ruin is certain (Feller, vol. I, ch. XIV)
        assert all(cell.exact == "1" and cell.decimal.startswith("1.000") for cell in ruin.cells)
        table = app.workbench.query_one("#sessions-table")
        assert table.row_count == len(result.table.rows) and not app.workbench.query_one("#charts").display
