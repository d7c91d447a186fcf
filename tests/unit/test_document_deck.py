"""Editing the deck and the draws in place: comments and order survive, the text reads back valid.

Every edit here is the workbench's own (``model/document_deck.py``); the figures of the edited
text are the reader's and the engines' (the counts are standard combinatorics, first principles).
"""

from __future__ import annotations

import pytest
from conftest import RULESETS

from oddsbench.model.document import DocumentError, RulesetDocument
from oddsbench.model.document_deck import DeckDocument
from oddsbench.model.load import read_ruleset_text

SIDE_BET = """\
# a two-card side bet (a comment that must survive)
[ruleset]
title = "Two cards"
start = "deal"

[params]
decks = 2

[states.deal]
draw = 2   # two at once
outcomes = [
  { when = "most(hand) == 2", to = "pair", pay = 10 },
  { to = "other", pay = -1 },
]

[states.pair]
result = "win"
[states.other]
result = "loss"
"""


def deck_of(text: str) -> tuple[RulesetDocument, DeckDocument]:
    document = RulesetDocument.from_text(text)
    return document, DeckDocument(document)


def read(document: RulesetDocument):
    result = read_ruleset_text(document.text(), "edited.toml")
    assert not [p for p in result.problems if p.is_error], result.problems
    return result.ruleset


def test_a_deck_added_goes_before_the_states_and_keeps_every_comment():
    document, deck = deck_of(SIDE_BET)
    deck.add_deck()
    text = document.text()
    assert text.index("[deck]") < text.index("[states.deal]")
    assert "# a two-card side bet (a comment that must survive)" in text and "draw = 2   # two at once" in text
    assert read(document).deck.size == 52
    with pytest.raises(DocumentError, match="already has a"):
        deck.add_deck()


def test_fields_of_a_deck_of_cards_are_written_as_the_reader_reads_them():
    document, deck = deck_of(SIDE_BET)
    deck.add_deck()
    deck.set_field("copies", "decks")
    deck.set_field("ranks", "9, 10, J, Q, K, A")
    deck.set_field("remove", "10, A of spades")
    deck.set_field("values", "A = 11, K = 10")
    deck.set_field("ace", "high")
    assert deck.fields() == {
        "copies": "decks",
        "ranks": "9, 10, J, Q, K, A",
        "suits": "",
        "remove": "10, A of spades",
        "values": "A = 11, K = 10",
        "ace": "high",
    }
    ruleset = read(document)
    # first principles: 6 ranks x 4 suits x 2 decks, less the eight 10s and one A of spades
    assert ruleset.deck.size == 48 - 8 - 1
    deck.set_field("remove", "")
    assert "remove" not in document.text()
    with pytest.raises(DocumentError, match="name = value"):
        deck.set_field("values", "A 11")


def test_a_card_taken_out_comes_back_and_the_last_copy_goes_first():
    document, deck = deck_of(SIDE_BET)
    deck.add_deck()
    deck.remove_card("A", "spades")
    deck.remove_card("K", "hearts")
    deck.remove_card("A", "spades")
    assert deck.fields()["remove"] == "A of spades, K of hearts, A of spades"
    deck.return_card("A", "spades")
    assert deck.fields()["remove"] == "A of spades, K of hearts"
    assert read(document).deck.size == 50
    deck.return_card("A", "spades")
    deck.return_card("K", "hearts")
    assert "remove" not in document.text()
    with pytest.raises(DocumentError, match="raise copies"):
        deck.return_card("K", "hearts")
    deck.set_field("remove", "Q")
    with pytest.raises(DocumentError, match="every Q is removed"):
        deck.return_card("Q", "clubs")


def test_items_are_added_counted_and_deleted_but_never_all():
    document, deck = deck_of((RULESETS / "keno-pick-5.toml").read_text())
    assert deck.is_items() and deck.items() == [("pick", "picks"), ("other", "80 - picks")]
    deck.set_item("other", "70")
    deck.add_item("bonus", "2")
    assert deck.items() == [("pick", "picks"), ("other", "70"), ("bonus", "2")]
    assert read(document).deck.size == 77
    deck.delete_item("bonus")
    deck.delete_item("other")
    with pytest.raises(DocumentError, match="at least one"):
        deck.delete_item("pick")
    with pytest.raises(DocumentError, match="items"):
        deck.set_field("ranks", "2, 3")
    assert "# Keno with five picks" in document.text()


def test_a_draw_is_a_number_until_it_names_a_hand_or_takes_cards():
    document, deck = deck_of(SIDE_BET)
    deck.add_deck()
    assert deck.draw("deal") == {"count": "2", "hand": "", "take": ""}
    deck.set_draw("deal", "take", "A")
    assert 'draw = { count = 2, take = ["A"] }' in document.text()
    assert read(document) is not None
    deck.set_draw("deal", "take", "")
    assert "draw = 2" in document.text()
    deck.set_draw("deal", "hand", "player")
    assert deck.draw("deal") == {"count": "2", "hand": "player", "take": ""}
    assert 'draw = { hand = "player", count = 2 }' in document.text()
    deck.set_draw("deal", "hand", "")
    deck.set_draw("deal", "count", "")
    assert "draw" not in document.text().split("[states.deal]")[1].split("outcomes")[0]


def test_a_deck_edit_without_a_deck_is_refused_in_one_line():
    _, deck = deck_of(SIDE_BET)
    with pytest.raises(DocumentError, match="no \\[deck\\]: add one first"):
        deck.set_field("copies", "2")


def test_taking_a_card_out_of_a_remove_that_is_not_a_list_is_refused_and_changes_nothing():
    document, deck = deck_of(SIDE_BET.replace("[states.deal]", '[deck]\nremove = "A"\n\n[states.deal]'))
    before = document.text()
    with pytest.raises(DocumentError, match="remove is not a list"):
        deck.remove_card("K", "hearts")
    assert document.text() == before
