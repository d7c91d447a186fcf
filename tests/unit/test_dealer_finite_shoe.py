"""The dealer's drawing rules from a finite shoe against an independent brute-force recursion.

The recursion below walks the shoe card by card (counts per value, the upcard removed first), with
its own soft-total rule and no memory: every ordered sequence of cards the dealer can draw. It
shares nothing with the dealer engine (chain/deal.py) but the rules of the game: stand on 17 or
more, soft 17 included; a natural is an ace and a ten-valued card as the first two cards (common
practice, no source). One deck and six.
"""

from __future__ import annotations

import dataclasses

import pytest
from conftest import RULESETS

from oddsbench.chain.deal import dealt
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

FINALS = ("stand-17", "stand-18", "stand-19", "stand-20", "stand-21", "blackjack", "bust")


def brute_force(upcard: int, decks: int) -> dict[str, QQ]:
    """Final totals by walking every sequence of cards from the shoe (1 = ace, 10 = ten-valued)."""
    shoe = {value: 4 * decks * (4 if value == 10 else 1) for value in range(1, 11)}
    first = 1 if upcard == 11 else upcard
    shoe[first] -= 1
    row = dict.fromkeys(FINALS, QQ(0))

    def walk(cards: list[int], chance) -> None:
        hard = sum(cards)
        soft = 1 in cards and hard + 10 <= 21
        total = hard + 10 if soft else hard
        if len(cards) == 2 and total == 21:
            row["blackjack"] += chance
            return
        if hard > 21:
            row["bust"] += chance
            return
        if total >= 17 and len(cards) >= 2:
            row[f"stand-{total}"] += chance
            return
        left = sum(shoe.values())
        for value in range(1, 11):
            if shoe[value]:
                weight = chance * QQ(shoe[value], left)
                shoe[value] -= 1
                walk([*cards, value], weight)
                shoe[value] += 1

    walk([first], QQ(1))
    return row


def engine(upcard: int, decks: int) -> dict[str, QQ]:
    ruleset = load_ruleset(RULESETS / "dealer-six-decks-stands-soft-17.toml", {"decks": QQ(decks)})
    figures = solve_round(build_round_chain(dealt(dataclasses.replace(ruleset, start=f"up-{upcard}"))))
    return {name: figures.end_probability[name].exact if name in figures.end_probability else QQ(0) for name in FINALS}


@pytest.mark.parametrize("decks", [1, 6])
@pytest.mark.parametrize("upcard", [2, 6, 7, 10, 11])
def test_every_final_total_matches_the_brute_force_walk(upcard, decks):
    assert engine(upcard, decks) == brute_force(upcard, decks)


def test_each_row_sums_to_one_exactly():
    for upcard in range(2, 12):
        assert sum(engine(upcard, 6).values()) == 1


def test_the_upcard_leaves_the_shoe():
    # first principles: with a 10 up, a natural needs one of the 24 aces among the 311 cards left
    assert engine(10, 6)["blackjack"] == QQ(24, 311)
    assert engine(11, 6)["blackjack"] == QQ(96, 311)  # all 96 ten-valued cards are still in the shoe


def test_several_upcards_side_by_side_share_one_deal_and_agree_with_the_walk():
    from oddsbench.core import load_game, make_settings, round_figures

    game = load_game(RULESETS / "dealer-six-decks-stands-soft-17.toml", {"decks": 1})
    columns = round_figures(game, make_settings(starts="up-2,up-6,up-11")).columns
    for column in columns:
        upcard = int(column.start.removeprefix("up-"))
        row = {name: column.figures.end_probability[name].exact for name in column.figures.end_probability}
        assert row == {name: value for name, value in brute_force(upcard, 1).items() if value}
