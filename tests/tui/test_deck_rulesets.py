"""The workbench on deck games: the core deals them, the Round view counts the hands of a single draw.

Three cards from 52: 22,100 hands, 1,096 of them flushes (standard combinatorics, first principles).
"""

from __future__ import annotations

from tests.tui.helpers import app_on, copy_ruleset, edit_field, figure, go_to_state, settle


async def test_the_round_view_shows_counts_of_hands_beside_the_chances(tmp_path):
    app = app_on(copy_ruleset("three-card-hands.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await pilot.press("f3")
        await settle(pilot)
        assert figure(app, "ends in 'flush' (win)") == ("274/5525", "0.0495928 (4.959 %)")
        assert figure(app, "hands of 3 from 52 cards") == ("22,100", "all equally likely")
        assert figure(app, "  hands ending in 'flush'") == ("1,096", "1,096 of 22,100")


async def test_editing_a_pay_in_a_deck_game_solves_again(tmp_path):
    app = app_on(copy_ruleset("pair-side-bet-six-decks.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "second")
        await edit_field(pilot, 0, "pay", "11")
        await pilot.press("f3")
        await settle(pilot)
        # first principles: a pair comes with chance 23/311; paying 11 to 1 the edge is 1 - 12 x 23/311
        assert figure(app, "house edge")[0] == "35/311"
        assert 'when = "most(hand) == 2", to = "pair", pay = 11' in app.workbench.session.text
