"""Deleting from the list on the left and saving: the file on disk reads as a careful hand would
have left it (no blank line where the strategy was, none at the end of the file, no comment of a
deleted state left behind), and the Source view shows the same text."""

from __future__ import annotations

from oddsbench.model.visible import visible
from tests.tui.helpers import app_on, copy_ruleset, go_to_entry, settle

RULE_25 = '{ family = "turn", when = "t >= 25", action = "hold" }'


async def test_deleting_the_last_strategy_and_saving_leaves_no_blank_line(tmp_path):
    path = copy_ruleset("pig-turn.toml", tmp_path)
    original = path.read_text(encoding="utf-8")
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "strategy:hold-at-25")
        await pilot.press("d")
        await settle(pilot)
        await pilot.press("ctrl+s")
        await settle(pilot)
        saved = path.read_text(encoding="utf-8")
        assert saved == original.replace(f'\n[strategies.hold-at-25]\ndefault = "roll"\nrules = [{RULE_25}]\n', "")
        assert saved.endswith(" }]\n")
        await pilot.press("f6")
        await settle(pilot)
        assert app.workbench.query_one("#source-text").text == visible(saved, multiline=True)


async def test_adding_then_deleting_a_strategy_in_the_forms_gives_back_the_file(tmp_path):
    path = copy_ruleset("pig-turn.toml", tmp_path)
    original = path.read_text(encoding="utf-8")
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        app.workbench.session.apply(lambda doc: doc.add_strategy("careful", default="hold"), "new strategy careful")
        app.workbench.refresh_document("strategy:careful")
        await settle(pilot)
        assert app.workbench.session.text.endswith('[strategies.careful]\ndefault = "hold"\n')
        await go_to_entry(pilot, "strategy:careful")
        await pilot.press("d")
        await settle(pilot)
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert path.read_text(encoding="utf-8") == original


async def test_deleting_a_commented_state_takes_its_comment_and_keeps_the_next_ones(tmp_path):
    path = tmp_path / "two-rolls.toml"
    path.write_text(
        '[ruleset]\ntitle = "Two rolls"\nstart = "roll"\n\n'
        '[states.roll]\noutcomes = [\n  { to = "win", prob = "1/2", pay = 1 },\n  { to = "lose", prob = "1/2" },\n]\n\n'
        '# a win pays\n[states.win]\nresult = "win"\n'
        '# a loss costs the stake\n[states.lose]\nresult = "loss"\n\n'
        '# spare, never reached\n[states.spare]\nresult = "win"\n',
        encoding="utf-8",
    )
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "state:spare")
        await pilot.press("d")
        await settle(pilot)
        await pilot.press("ctrl+s")
        await settle(pilot)
        saved = path.read_text(encoding="utf-8")
        assert "spare" not in saved
        assert saved.endswith('# a loss costs the stake\n[states.lose]\nresult = "loss"\n')
