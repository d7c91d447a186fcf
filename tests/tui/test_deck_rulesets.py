"""The workbench on deck games: the core deals them, the Round view counts the hands of a single draw.

Three cards from 52: 22,100 hands, 1,096 of them flushes (standard combinatorics, first principles).
"""

from __future__ import annotations

from math import comb

from textual.coordinate import Coordinate

from oddsbench.model.numbers import QQ
from tests.tui.helpers import app_on, copy_ruleset, edit_field, figure, go_to_entry, go_to_state, settle


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


def cell(app, row: int, column: int) -> str:
    return str(app.workbench.query_one("#deck-counts").get_cell_at(Coordinate(row, column)))


async def type_into(pilot, field_id: str, text: str) -> None:
    """Focus one field of the deck or draw forms and retype it from the keyboard."""
    pilot.app.workbench.query_one(f"#{field_id}").focus()
    await pilot.press("end", "ctrl+u", *text)
    await settle(pilot)


async def test_the_deck_shows_how_many_of_each_card_and_copies_make_a_shoe(tmp_path):
    app = app_on(copy_ruleset("three-card-hands.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        assert "52 cards (13 ranks x 4 suits)" in str(app.workbench.query_one("#deck-summary").render())
        assert app.workbench.query_one("#deck-counts").row_count == 13
        assert (cell(app, 12, 0), cell(app, 12, 4), cell(app, 12, 5)) == ("A", "1", "4")
        await type_into(pilot, "field-deck-copies", "2")
        assert "copies = 2" in app.workbench.session.text
        assert cell(app, 12, 5) == "8"
        await pilot.press("f3")
        await settle(pilot)
        # standard combinatorics: C(104, 3) = 182,104 hands of three from two decks
        assert figure(app, "hands of 3 from 104 cards") == ("182,104", "all equally likely")


async def test_minus_takes_the_highlighted_card_out_and_plus_puts_it_back(tmp_path):
    app = app_on(copy_ruleset("three-card-hands.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        table = app.workbench.query_one("#deck-counts")
        table.focus()
        await pilot.press(*["down"] * 12, *["right"] * 3)  # from the 2 of clubs to the A of spades
        await pilot.press("minus")
        await settle(pilot)
        assert 'remove = ["A of spades"]' in app.workbench.session.text
        assert (cell(app, 12, 4), cell(app, 12, 5)) == ("0", "3")
        await pilot.press("f3")
        await settle(pilot)
        # standard combinatorics: C(51, 3) = 20,825 hands; a flush is 3 of one suit: 3 C(13, 3) + C(12, 3)
        assert figure(app, "hands of 3 from 51 cards") == ("20,825", "all equally likely")
        await pilot.press("f2")
        await settle(pilot)
        table.focus()
        await pilot.press("plus")
        await settle(pilot)
        assert "remove" not in app.workbench.session.text.split("[states")[0]
        assert cell(app, 12, 4) == "1"


async def test_a_deck_of_items_edits_each_count_and_the_draw_its_size(tmp_path):
    app = app_on(copy_ruleset("keno-pick-5.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        table = app.workbench.query_one("#deck-counts")
        assert [str(c) for c in table.get_row_at(1)] == ["other", "80 - picks", "75"]
        table.focus()
        await pilot.press("down", "enter")
        await pilot.press("end", "ctrl+u", *"70")
        await settle(pilot)
        assert 'items = { pick = "picks", other = 70 }' in app.workbench.session.text
        await go_to_state(pilot, "draw")
        assert app.workbench.query_one("#field-draw-count").value == "20"
        await type_into(pilot, "field-draw-count", "10")
        assert "draw = 10" in app.workbench.session.text
        await pilot.press("f3")
        await settle(pilot)
        # hypergeometric law: P(catch 5) = C(5, 5) C(70, 5) / C(75, 10), ten balls from 75
        exact = QQ(comb(70, 5), comb(75, 10))
        assert figure(app, "ends in 'catch-5' (win)")[0] == f"{exact.numerator}/{exact.denominator}"


async def test_a_game_without_a_deck_is_offered_one(tmp_path):
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        assert "not dealt from a deck" in str(app.workbench.query_one("#deck-summary").render())
        app.workbench.query_one("#deck-editor").focus()
        await pilot.press("c")
        await settle(pilot)
        text = app.workbench.session.text
        assert "[deck]\ncopies = 1" in text and text.index("[deck]") < text.index("[states")
        assert "52 cards (13 ranks x 4 suits)" in str(app.workbench.query_one("#deck-summary").render())


async def test_a_problem_of_the_draw_shows_beside_its_field(tmp_path):
    app = app_on(copy_ruleset("pair-side-bet-six-decks.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "second")
        await type_into(pilot, "field-draw-take", "Z")
        assert 'draw = { count = 1, take = ["Z"] }' in app.workbench.session.text
        row = app.workbench.query_one("#field-draw-take").parent
        assert "'Z'" in str(row.query_one(".field-message").render())


async def test_a_and_d_add_and_delete_items_from_the_keyboard(tmp_path):
    app = app_on(copy_ruleset("keno-pick-5.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        app.workbench.query_one("#deck-counts").focus()
        await pilot.press("a", *"bonus", "enter")
        await settle(pilot)
        assert 'items = { pick = "picks", other = "80 - picks", bonus = 1 }' in app.workbench.session.text
        assert app.workbench.query_one("#deck-counts").row_count == 3
        app.workbench.query_one("#deck-counts").focus()
        await pilot.press("down", "down", "d")
        await settle(pilot)
        assert 'items = { pick = "picks", other = "80 - picks" }' in app.workbench.session.text


async def test_a_deck_of_items_has_copies_too(tmp_path):
    app = app_on(copy_ruleset("keno-pick-5.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        assert not app.workbench.query_one("#field-deck-ranks").parent.display
        await type_into(pilot, "field-deck-copies", "2")
        assert "160 items (pick 10, other 150)" in str(app.workbench.query_one("#deck-summary").render())
        await type_into(pilot, "field-deck-copies", "0")
        row = app.workbench.query_one("#field-deck-copies").parent
        assert "whole number from 1" in str(row.query_one(".field-message").render())


async def test_text_the_deck_cannot_take_is_refused_in_one_line_and_nothing_is_lost(tmp_path):
    app = app_on(copy_ruleset("three-card-hands.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await go_to_entry(pilot, "deck:")
        before = app.workbench.session.text
        await type_into(pilot, "field-deck-values", "A 11")  # no '=': the edit is refused, the file kept
        assert app.workbench.session.text == before
        assert any("write name = value" in n.message for n in app._notifications)
        await type_into(pilot, "field-deck-ranks", "2, 3, [bold]x")  # read as a name, never as markup
        row = app.workbench.query_one("#field-deck-ranks").parent
        assert "not a usable label" in str(row.query_one(".field-message").render())
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert app.workbench.session.text == before  # the ranks typed were one step
