"""The Simulation view (F7) runs on Enter from either of its fields, as its hint says ("Enter or
Ctrl+R runs"); Tab moves between them. A seeded run repeats to the digit."""

from __future__ import annotations

from tests.tui.helpers import app_on, copy_ruleset, settle


def heading(app) -> str:
    return str(app.workbench.query_one("#sim-heading").render())


async def run_keys(tmp_path, *keys: str) -> str:
    path = copy_ruleset("lantern-dice.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("f7")
        await settle(pilot)
        assert "Nothing simulated yet" in heading(app)
        await pilot.press(*keys)
        await settle(pilot)
        return heading(app)


async def test_enter_in_the_trials_field_runs_the_simulation(tmp_path):
    shown = await run_keys(tmp_path, *"4000", "enter")
    assert "4,000 simulated rounds" in shown


async def test_enter_in_the_seed_field_runs_it_with_that_seed(tmp_path):
    shown = await run_keys(tmp_path, *"3000", "tab", *"11", "enter")
    assert "3,000 simulated rounds" in shown and "seed 11" in shown
