"""What walking every view pressed (Enter, Esc, Tab, Shift+Tab and each widget's own keys, from
every focus, at 80x24 and 120x40) found, each replayed with the same keys."""

from __future__ import annotations

from textual.widgets import Button

from tests.tui.helpers import app_on, copy_ruleset, go_to_entry, settle


async def tab_to(pilot, matches, limit: int = 40) -> None:
    """Press Tab until the focused widget is the one wanted (as a user moves through a form)."""
    for _ in range(limit):
        if matches(pilot.app.focused):
            return
        await pilot.press("tab")
    raise AssertionError(f"Tab never reached it; the focus is on {pilot.app.focused!r}")


async def test_enter_on_a_familys_add_index_button_adds_a_row_and_keeps_the_app(tmp_path):
    """The new rows were filled while the old ones were still being removed: a removed row had no
    message line left, and the query for it ended the app (80x24, pig-turn, family 'turn')."""
    app = app_on(copy_ruleset("pig-turn.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "family:turn")
        await pilot.press("enter")
        await tab_to(pilot, lambda widget: isinstance(widget, Button) and str(widget.label) == "+ index")
        await pilot.press("enter")
        await settle(pilot)
        assert app.is_running
        document = app.workbench.session.document
        assert len(document.family_part("turn", "index")) == 2
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert app.is_running and len(app.workbench.session.document.family_part("turn", "index")) == 1
