"""Cards and balls drawn without replacement: the bundled deck rulesets against published counts.

Sources, beside each check: the hand counts of three and five cards from 52 are standard
combinatorics (first principles; the five-card table is in Feller, An Introduction to Probability
Theory and Its Applications, vol. I, ch. II); keno's catches follow the hypergeometric law
P(catch j) = C(5, j) C(75, 20 - j) / C(80, 20); the pair chance on two cards of six decks is first
principles (23 matching cards among the 311 left).
"""

from __future__ import annotations

from math import comb

import pytest
from conftest import RULESETS

from oddsbench.chain.deal import dealt, single_draw
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round


def ends(name: str, **params):
    ruleset = load_ruleset(RULESETS / name, {key: QQ(value) for key, value in params.items()} or None)
    figures = solve_round(build_round_chain(dealt(ruleset)))
    return ruleset, figures


def hands_per_end(name: str) -> dict[str, int]:
    ruleset, figures = ends(name)
    total = single_draw(ruleset).hands
    counts = {end: figure.exact * total for end, figure in figures.end_probability.items()}
    assert all(count.denominator == 1 for count in counts.values())
    return {end: int(count) for end, count in counts.items()}


def test_three_cards_from_52_are_counted_exactly():
    # standard combinatorics, first principles: 22,100 hands
    assert single_draw(load_ruleset(RULESETS / "three-card-hands.toml")).hands == 22_100
    assert hands_per_end("three-card-hands.toml") == {
        "straight-flush": 48,
        "three-of-a-kind": 52,
        "straight": 720,
        "flush": 1_096,
        "pair": 3_744,
        "high-card": 16_440,
    }


def test_five_cards_from_52_are_counted_exactly():
    # standard combinatorics (Feller vol. I ch. II; first principles): 2,598,960 hands
    assert single_draw(load_ruleset(RULESETS / "five-card-hands.toml")).hands == 2_598_960
    assert hands_per_end("five-card-hands.toml") == {
        "straight-flush": 40,
        "four-of-a-kind": 624,
        "full-house": 3_744,
        "flush": 5_108,
        "straight": 10_200,
        "three-of-a-kind": 54_912,
        "two-pair": 123_552,
        "pair": 1_098_240,
        "high-card": 1_302_540,
    }


@pytest.mark.parametrize("catch", range(6))
def test_keno_catches_follow_the_hypergeometric_law(catch):
    # hypergeometric law: P(catch j) = C(5, j) C(75, 20 - j) / C(80, 20)
    _, figures = ends("keno-pick-5.toml")
    expected = QQ(comb(5, catch) * comb(75, 20 - catch), comb(80, 20))
    assert figures.end_probability[f"catch-{catch}"].exact == expected


def test_keno_extremes_are_the_published_fractions():
    # hypergeometric law: catch 5 = 51/79079, catch 0 = 5133/22594
    _, figures = ends("keno-pick-5.toml")
    assert figures.end_probability["catch-5"].exact == QQ(51, 79079)
    assert figures.end_probability["catch-0"].exact == QQ(5133, 22594)


def test_a_pair_on_the_first_two_cards_of_six_decks_is_23_in_311():
    # first principles: 6 x 4 - 1 = 23 cards of the first card's rank among the 311 left
    _, figures = ends("pair-side-bet-six-decks.toml")
    assert figures.end_probability["pair"].exact == QQ(23, 311)
    assert figures.figures["house_edge"].exact == QQ(12, 311)  # pays 12 to 1: 1 - 13 x 23/311


@pytest.mark.parametrize(("decks", "pair"), [(1, QQ(3, 51)), (2, QQ(7, 103)), (8, QQ(31, 415))])
def test_the_pair_chance_follows_the_number_of_decks(decks, pair):
    # first principles: (4 d - 1) / (52 d - 1)
    _, figures = ends("pair-side-bet-six-decks.toml", decks=decks)
    assert figures.end_probability["pair"].exact == pair


def test_a_natural_from_six_decks_is_192_in_4043():
    # first principles: 2 x (24/312) x (96/311), an ace and a ten-valued card in either order
    _, figures = ends("dealer-six-decks-stands-soft-17.toml")
    assert figures.end_probability["blackjack"].exact == QQ(192, 4043)


# The bundled paytables (invented; pays as the files' comment blocks list them) against the published
# counts above: the house edge is minus the expected net, sum(pay x hands) / all hands.
THREE_CARD_PAYS = {"straight-flush": 40, "three-of-a-kind": 30, "straight": 6, "flush": 4, "pair": 1, "high-card": -1}
FIVE_CARD_PAYS = {
    "straight-flush": 200,
    "four-of-a-kind": 50,
    "full-house": 20,
    "flush": 12,
    "straight": 10,
    "three-of-a-kind": 8,
    "two-pair": 4,
    "pair": 0,
    "high-card": -1,
}
THREE_CARD_COUNTS = (48, 52, 720, 1_096, 3_744, 16_440)  # standard combinatorics, first principles
FIVE_CARD_COUNTS = (40, 624, 3_744, 5_108, 10_200, 54_912, 123_552, 1_098_240, 1_302_540)  # Feller vol. I ch. II


@pytest.mark.parametrize(
    ("name", "pays", "counts", "hands"),
    [
        ("three-card-hands.toml", THREE_CARD_PAYS, THREE_CARD_COUNTS, 22_100),
        ("five-card-hands.toml", FIVE_CARD_PAYS, FIVE_CARD_COUNTS, 2_598_960),
    ],
)
def test_the_house_edge_is_the_paytable_over_the_published_counts(name, pays, counts, hands):
    ruleset, figures = ends(name)
    assert {o.to: o.pay for o in ruleset.state(ruleset.start).outcomes} == pays
    expected_net = QQ(sum(pay * count for pay, count in zip(pays.values(), counts)), hands)
    assert figures.figures["house_edge"].exact == -expected_net


def test_keno_house_edge_is_the_paytable_over_the_hypergeometric_law():
    # hypergeometric law; pays 600, 20, 2 to 1 on catches 5, 4, 3 (the file's invented paytable)
    pays = {5: 600, 4: 20, 3: 2, 2: -1, 1: -1, 0: -1}
    law = {j: QQ(comb(5, j) * comb(75, 20 - j), comb(80, 20)) for j in range(6)}
    _, figures = ends("keno-pick-5.toml")
    assert figures.figures["house_edge"].exact == -sum(pays[j] * law[j] for j in range(6))
    assert figures.figures["house_edge"].exact == QQ(3067, 28756)  # the README's table


def test_a_natural_from_one_deck_is_32_in_663():
    # first principles: 2 x (4/52) x (16/51), an ace and a ten-valued card in either order
    _, figures = ends("dealer-six-decks-stands-soft-17.toml", decks=1)
    assert figures.end_probability["blackjack"].exact == QQ(32, 663)


@pytest.mark.parametrize(
    ("name", "edge"), [("three-card-hands.toml", QQ(128, 5525)), ("five-card-hands.toml", QQ(4583, 129948))]
)
def test_the_readme_table_of_bundled_rulesets_gives_these_edges(name, edge):
    _, figures = ends(name)
    assert figures.figures["house_edge"].exact == edge
