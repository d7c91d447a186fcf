"""Deck games: the [deck] table, draws, outcomes chosen by the cards, and how they compose with
choices, strategies, best play, families and parameters. Invented demo games are checked against
values worked out here by hand or by an independent recursion (no published source)."""

from __future__ import annotations

from functools import cache
from math import comb

import pytest

from oddsbench.chain.deal import dealt, single_draw
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError, RulesetError
from oddsbench.model.load import load_ruleset_text, read_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round
from oddsbench.strategy.best_policy import best_policy
from oddsbench.strategy.compare import policy_of, starting_at


def ends_of(text: str, start: str | None = None, strategy: str | None = None) -> dict[str, QQ]:
    played = starting_at(load_ruleset_text(text, "game.toml"), start)
    figures = solve_round(build_round_chain(played, policy_of(played, strategy)))
    return {name: figure.exact for name, figure in figures.end_probability.items()}


def problems(text: str) -> list[str]:
    return [str(problem) for problem in read_ruleset_text(text, "game.toml").errors]


def one_draw(deck: str, draw: str, cases: str, ends: str = "") -> str:
    names = ends or "[states.yes]\n[states.no]\n"
    return (
        f'[ruleset]\ntitle = "t"\nstart = "deal"\n{deck}\n[states.deal]\ndraw = {draw}\noutcomes = [{cases}]\n{names}'
    )


# -- the deck ---------------------------------------------------------------------------------


def test_an_empty_deck_table_is_the_standard_52_cards():
    ruleset = load_ruleset_text(one_draw("[deck]", "1", '{ to = "yes" }'))
    assert ruleset.deck.size == 52
    assert ruleset.deck.describe() == "52 cards (13 ranks x 4 suits)"


def test_removing_a_rank_or_one_card():
    text = one_draw('[deck]\ncopies = 2\nremove = ["10", "A of spades"]', "1", '{ to = "yes" }')
    deck = load_ruleset_text(text).deck
    assert deck.size == 104 - 8 - 1


def test_an_urn_of_items_draws_by_label():
    # hypergeometric law: P(both red) = C(3, 2) / C(5, 2)
    text = one_draw(
        "[deck]\nitems = { red = 3, blue = 2 }",
        "2",
        '{ when = "count(hand, red) == 2", to = "yes" }, { to = "no" }',
    )
    assert ends_of(text)["yes"] == QQ(comb(3, 2), comb(5, 2))


@pytest.mark.parametrize(
    ("ace", "wheel", "top"),
    [("both", QQ(2, 15), QQ(2, 15)), ("high", QQ(0), QQ(2, 15)), ("low", QQ(2, 15), QQ(0))],
)
def test_how_an_ace_counts_in_a_straight(ace, wheel, top):
    # first principles: ranks 2, 3, 4, A in four suits, two cards (120 hands); A-2 is a straight with
    # the ace low, 4-A with the ace high, 16 hands each
    deck = f'[deck]\nranks = ["2", "3", "4", "A"]\nace = "{ace}"'
    cases = (
        '{ when = "straight(hand) and count(hand, 2) == 1 and count(hand, A) == 1", to = "wheel" }, '
        '{ when = "straight(hand) and count(hand, 4) == 1 and count(hand, A) == 1", to = "top" }, { to = "no" }'
    )
    law = ends_of(one_draw(deck, "2", cases, "[states.wheel]\n[states.top]\n[states.no]\n"))
    assert (law.get("wheel", QQ(0)), law.get("top", QQ(0))) == (wheel, top)


def test_a_soft_total_counts_one_ace_as_eleven():
    deck = '[deck]\nranks = ["A", "5", "9"]\nsuits = ["x"]'
    cases = '{ when = "total(hand) == 16 and soft(hand)", to = "yes" }, { to = "no" }'
    # first principles: of the three two-card hands, only A-5 is a soft 16
    assert ends_of(one_draw(deck, "2", cases))["yes"] == QQ(1, 3)


def test_what_is_left_in_the_deck_can_be_read():
    deck = "[deck]\nitems = { red = 2, blue = 2 }"
    cases = '{ when = "left(red) == 0", to = "yes" }, { to = "no" }'
    # first principles: both reds among the two drawn: 1 of C(4, 2) = 6
    assert ends_of(one_draw(deck, "2", cases))["yes"] == QQ(1, 6)


def test_drawn_is_the_latest_draw_and_hand_the_whole_hand():
    text = """
[ruleset]
title = "two draws"
start = "a"
[deck]
items = { red = 1, blue = 1 }
[states.a]
draw = 1
outcomes = [{ to = "b" }]
[states.b]
draw = 1
outcomes = [{ when = "count(drawn, red) == 1", to = "red-last" }, { to = "blue-last" }]
[states.red-last]
[states.blue-last]
"""
    assert ends_of(text) == {"red-last": QQ(1, 2), "blue-last": QQ(1, 2)}


def test_a_single_draw_is_counted_in_hands():
    ruleset = load_ruleset_text(one_draw("[deck]", "5", '{ to = "yes" }'))
    assert single_draw(ruleset).hands == 2_598_960
    two_steps = '[ruleset]\ntitle="t"\nstart="a"\n[deck]\n[states.a]\ndraw=1\noutcomes=[{to="b"}]\n[states.b]\ndraw=1\n'
    assert single_draw(load_ruleset_text(two_steps + 'outcomes=[{to="c"}]\n[states.c]\n')) is None


# -- misuse, one line each ---------------------------------------------------------------------


@pytest.mark.parametrize(
    ("text", "message"),
    [
        (one_draw("", "1", '{ to = "yes" }'), "state 'deal', draw: a state can draw only in a ruleset with a [deck]"),
        (one_draw("[deck]\ncopies = 0", "1", '{ to = "yes" }'), "[deck], copies: must be a whole number from 1"),
        (one_draw('[deck]\nsuits = ["x", "x"]', "1", '{ to = "yes" }'), "[deck], suits: names 'x' twice"),
        (one_draw("[deck]\ncolour = 1", "1", '{ to = "yes" }'), "[deck]: unknown field 'colour'"),
        (one_draw('[deck]\nremove = ["Z"]', "1", '{ to = "yes" }'), "'Z' is not a card of this deck"),
        (one_draw("[deck]", "53", '{ to = "yes" }'), "state 'deal', draw: draws 53 cards from a deck of 52"),
        (
            one_draw('[deck]\nitems = { red = 2 }\nsuits = ["a"]', "1", '{ to = "yes" }'),
            "[deck]: 'suits' belongs to a deck of cards: a deck of items gives every count in 'items'",
        ),
        (one_draw('[deck]\ncopies = "1/2"', "1", '{ to = "yes" }'), "[deck], copies: must be a whole number from 1"),
        (one_draw("[deck]", '{ take = ["Z"] }', '{ to = "yes" }'), "state 'deal', draw, take: 'Z' is not a card"),
        (
            one_draw("[deck]", "2", '{ when = "flush(player)", to = "yes" }, { to = "no" }'),
            "state 'deal', outcome 1, when: flush(): 'player' is not a hand (hands: hand, drawn)",
        ),
        (
            one_draw("[deck]", "2", '{ when = "count(hand, Z) > 0", to = "yes" }, { to = "no" }'),
            "count(): the deck has no 'Z'",
        ),
        (
            one_draw("[deck]\nitems = { a = 2 }", "1", '{ when = "flush(hand)", to = "yes" }, { to = "no" }'),
            "flush() needs suits, and a deck of items has none",
        ),
        (
            one_draw("[deck]", "2", '{ to = "yes" }, { when = "flush(hand)", to = "no" }'),
            "state 'deal', outcome 2: is never taken: outcome 1 has no 'when'",
        ),
        (
            one_draw("[deck]", "2", '{ when = "flush(hand)", to = "yes", prob = "1/2" }, { to = "no" }'),
            "outcome 1, prob: outcomes chosen by the cards take no 'prob' (the draw gives the chance)",
        ),
        (
            '[ruleset]\ntitle="t"\nstart="a"\n[states.a]\noutcomes=[{ to = "b", pay = "cards(hand)" }]\n[states.b]\n',
            "state 'a', outcome 1, pay: cards() reads the cards dealt: the ruleset needs a [deck] table",
        ),
    ],
)
def test_misuse_of_deck_and_draw_is_one_line_naming_the_place(text, message):
    found = problems(text)
    assert len(found) == 1, found
    assert message in found[0]


def test_a_hand_no_case_fits_is_refused_naming_the_hands():
    text = one_draw("[deck]\nitems = { red = 1, blue = 1 }", "1", '{ when = "count(hand, red) == 1", to = "yes" }')
    with pytest.raises(OddsbenchError, match=r"state 'deal': no outcome's 'when' holds \(with hand: 1 blue\)"):
        ends_of(text)


def test_drawing_more_than_is_left_is_refused():
    text = """
[ruleset]
title = "t"
start = "a"
[deck]
items = { red = 2 }
[states.a]
draw = 1
outcomes = [{ when = "cards(hand) == 3", to = "b" }, { to = "a" }]
[states.b]
"""
    with pytest.raises(OddsbenchError, match=r"draws 1 item\(s\), but only 0 are left"):
        ends_of(text)


def test_the_state_limit_refuses_a_deal_too_large():
    text = one_draw("[deck]", "1", '{ to = "b" }', '[states.b]\ndraw = 1\noutcomes = [{ to = "no" }]\n[states.no]\n')
    with pytest.raises(OddsbenchError, match=r"reaches more than 5 states, over the state limit"):
        dealt(load_ruleset_text(text), max_states=5)


# -- composition -------------------------------------------------------------------------------

DRAW_TO_SEVEN = """
[ruleset]
title = "Draw to seven (demo)"
start = "first"

[deck]
ranks = ["1", "2", "3"]
suits = ["a", "b"]

[states.first]
draw = 1
outcomes = [{ to = "decide" }]

[states.decide.choices]
hit = [{ to = "hit" }]
stand = [{ when = "total(hand) >= 6", to = "won", pay = 1 }, { to = "lost", pay = -1 }]

[states.hit]
draw = 1
outcomes = [{ when = "total(hand) > 7", to = "bust", pay = -1 }, { to = "decide" }]

[states.won]
result = "win"
[states.lost]
result = "loss"
[states.bust]
result = "loss"

[strategies.hit-below-5]
default = "stand"
rules = [{ state = "decide", when = "total(hand) < 5", action = "hit" }]
"""


def best_by_recursion() -> QQ:
    """Expectimax over the cards left: stand or draw one more, for the best expected pay."""

    @cache
    def value(left: tuple[int, ...], total: int) -> QQ:
        stand = QQ(1) if total >= 6 else QQ(-1)
        remaining = sum(left)
        if remaining == 0:
            return stand
        hit = QQ(0)
        for card, count in enumerate(left, start=1):
            if count:
                after = total + card
                fewer = tuple(c - (i == card - 1) for i, c in enumerate(left))
                hit += QQ(count, remaining) * (QQ(-1) if after > 7 else value(fewer, after))
        return max(stand, hit)

    full = (2, 2, 2)
    return sum(
        (QQ(2, 6) * value(tuple(c - (i == card) for i, c in enumerate(full)), card + 1) for card in range(3)), QQ(0)
    )


def test_best_play_in_a_deck_game_matches_an_independent_recursion():
    ruleset = starting_at(load_ruleset_text(DRAW_TO_SEVEN, "seven.toml"), None)
    best = best_policy(ruleset)
    assert best.certified
    assert best.value.exact == best_by_recursion()


def test_a_strategy_by_hand_is_played_and_never_beats_the_best():
    played = starting_at(load_ruleset_text(DRAW_TO_SEVEN, "seven.toml"), None)
    policy = policy_of(played, "hit-below-5")
    assert {action for state, action in policy.items() if "total" not in state} <= {"hit", "stand"}
    figures = solve_round(build_round_chain(played, policy))
    assert figures.figures["expected_net"].exact <= best_policy(played).value.exact


def test_families_draw_and_read_the_hands():
    text = """
[ruleset]
title = "families"
start = "up-2"
[deck]
ranks = ["2", "3"]
suits = ["x", "y"]
[families.up]
state = "up-{c}"
index = { c = [2, 3] }
draw = { hand = "h", take = ["{c}"] }
outcomes = [{ to = "more" }]
[states.more]
draw = { hand = "h" }
[[states.more.outcomes]]
let.t = "total(h)"
each = { n = [4, 6] }
when = "t == n"
to = "sum-{n}"
[families.sum]
state = "sum-{n}"
index = { n = [4, 6] }
"""
    # first principles: a 2 taken, then one of the three cards left: another 2 (1 of 3) or a 3 (2 of 3)
    assert ends_of(text) == {"sum-4": QQ(1, 3), "sum-5": QQ(2, 3)}
    assert ends_of(text, start="up-3") == {"sum-5": QQ(2, 3), "sum-6": QQ(1, 3)}


def test_parameters_reach_the_deck():
    text = one_draw(
        '[params]\nreds = 3\n[deck]\nitems = { red = "reds", blue = 1 }',
        "1",
        '{ when = "count(hand, red) == 1", to = "yes" }, { to = "no" }',
    )
    assert ends_of(text)["yes"] == QQ(3, 4)
    ruleset = load_ruleset_text(text, "t.toml", {"reds": QQ(1)})
    assert solve_round(build_round_chain(dealt(ruleset))).end_probability["yes"].exact == QQ(1, 2)


def test_pay_and_stake_may_read_the_hands():
    text = one_draw(
        "[deck]\nitems = { one = 1, two = 1 }",
        "1",
        '{ to = "yes", pay = "count(hand, two) + 1", stake = "count(hand, one)" }',
        "[states.yes]\n",
    )
    figures = solve_round(build_round_chain(dealt(load_ruleset_text(text))))
    assert figures.figures["expected_net"].exact == QQ(3, 2)
    assert figures.figures["expected_staked"].exact == QQ(3, 2)


def test_an_invalid_ruleset_stays_refused_before_dealing():
    with pytest.raises(RulesetError):
        load_ruleset_text(one_draw("[deck]", "1", '{ to = "nowhere" }'))


def test_hands_equal_up_to_the_names_of_the_suits_are_one_state():
    # first principles: two cards from 52 up to renaming the suits are 13 pairs, 78 suited and
    # 78 unsuited hands: 169 states after the deal (1,326 hands without the symmetry)
    text = one_draw(
        "[deck]",
        "2",
        '{ to = "look" }',
        '[states.look]\noutcomes = [{ when = "flush(hand) or most(hand) == 2", to = "yes" }, { to = "no" }]\n'
        "[states.yes]\n[states.no]\n",
    )
    played = dealt(load_ruleset_text(text))
    assert sum(1 for state in played.states if state.name.startswith("look [")) == 169
    figures = solve_round(build_round_chain(played))
    assert figures.end_probability["yes"].exact == QQ(15, 51)  # first principles: 12 + 3 of the 51 cards left


def test_naming_a_suit_keeps_the_suits_apart():
    text = one_draw(
        "[deck]",
        "2",
        '{ to = "look" }',
        '[states.look]\noutcomes = [{ when = "count(hand, hearts) == 2 and kinds(hand) == 2", to = "yes" }, '
        '{ to = "no" }]\n[states.yes]\n[states.no]\n',
    )
    played = dealt(load_ruleset_text(text))
    assert sum(1 for state in played.states if state.name.startswith("look [")) == 1_326
    assert solve_round(build_round_chain(played)).end_probability["yes"].exact == QQ(comb(13, 2), comb(52, 2))
