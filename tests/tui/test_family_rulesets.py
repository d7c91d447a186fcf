"""The workbench on rulesets whose states come partly from families (the dealer rulesets)."""

from __future__ import annotations

from oddsbench.model.load import read_ruleset_text
from tests.tui.helpers import app_on, copy_ruleset, go_to_state, settle

DEALER = "dealer-stands-soft-17.toml"


async def test_adding_an_end_state_to_a_family_backed_ruleset_keeps_the_app_and_the_families(tmp_path):
    app = app_on(copy_ruleset(DEALER, tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "bust")
        await pilot.press("e", *"insured", "enter")
        await settle(pilot)
        assert app.is_running
        text = app.workbench.session.text
        assert text.rstrip().endswith('[states.insured]\nresult = "win"')
        assert "[families.up]" in text and app.workbench.session.dirty
        result = read_ruleset_text(text, "x")
        assert result.ruleset is not None and "insured" in [state.name for state in result.ruleset.states]


async def test_adding_then_renaming_a_state_in_a_family_backed_ruleset(tmp_path):
    app = app_on(copy_ruleset(DEALER, tmp_path), tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "deal")
        await pilot.press("a", "p", *"extra", "enter")  # a asks which kind: p, a plain state
        await settle(pilot)
        await go_to_state(pilot, "blackjack")
        await pilot.press("r", "ctrl+u", *"natural-21", "enter")
        await settle(pilot)
        assert app.is_running
        text = app.workbench.session.text
        assert "[states.extra]" in text and "[states.natural-21]" in text and 'to = "blackjack"' not in text


def test_an_edit_that_tomlkit_cannot_make_is_refused_in_one_line_and_changes_nothing(tmp_path):
    from oddsbench.tui.editing import EditSession

    path = copy_ruleset(DEALER, tmp_path)
    session = EditSession.open(path)

    def breaks_half_way(document):
        document.add_state("half-made", "end")
        raise AttributeError("'OutOfOrderTableProxy' object has no attribute 'append'")

    outcome = session.apply(breaks_half_way, "broken edit")
    assert not outcome.changed and "Source view" in outcome.refused and "\n" not in outcome.refused
    assert session.text == path.read_text() and "half-made" not in session.document.text()
    assert not session.history.can_undo
