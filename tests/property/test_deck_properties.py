"""Properties of dealing without replacement on random small decks (hypothesis).

* The same hand drawn at once or one card at a time gives the identical law of where the round ends.
* Counting by pattern agrees with listing every hand card by card (itertools.combinations over the
  physical cards), classified by a reference written here from the definitions of the functions.
* As the shoe grows, the dealer's final totals approach the infinite-deck ruleset (the distance
  shrinks with every added deck, like 1/decks).
"""

from __future__ import annotations

import dataclasses
import itertools
import os
from math import comb

from conftest import RULESETS
from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.deal import dealt
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset, load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

EXAMPLES = int(os.environ.get("ODDSBENCH_HEAVY_EXAMPLES", "25"))
RANKS = ("2", "3", "4", "5", "6", "A")
SUITS = ("s", "h", "d")


@dataclasses.dataclass(frozen=True)
class Game:
    ranks: tuple[str, ...]
    suits: tuple[str, ...]
    copies: int
    ace: str
    draw: int
    conditions: tuple[str, ...]

    @property
    def cards(self) -> list[tuple[str, str]]:
        """Every physical card, copies apart (so combinations list hands card by card)."""
        return [(rank, suit) for rank in self.ranks for suit in self.suits for _ in range(self.copies)]

    def deck(self) -> str:
        ranks = ", ".join(f'"{r}"' for r in self.ranks)
        suits = ", ".join(f'"{s}"' for s in self.suits)
        return f'[deck]\nranks = [{ranks}]\nsuits = [{suits}]\ncopies = {self.copies}\nace = "{self.ace}"\n'

    def cases(self) -> str:
        lines = [f'  {{ when = "{c}", to = "e{i}" }},' for i, c in enumerate(self.conditions)]
        return "outcomes = [\n" + "\n".join(lines) + f'\n  {{ to = "e{len(self.conditions)}" }},\n]\n'

    def ends(self) -> str:
        return "".join(f"[states.e{i}]\n" for i in range(len(self.conditions) + 1))

    def at_once(self) -> str:
        head = '[ruleset]\ntitle = "at once"\nstart = "deal"\n'
        return head + self.deck() + f"[states.deal]\ndraw = {self.draw}\n" + self.cases() + self.ends()

    def one_by_one(self) -> str:
        text = '[ruleset]\ntitle = "one by one"\nstart = "d1"\n' + self.deck()
        for i in range(1, self.draw):
            text += f'[states.d{i}]\ndraw = 1\noutcomes = [{{ to = "d{i + 1}" }}]\n'
        return text + f"[states.d{self.draw}]\ndraw = 1\n" + self.cases() + self.ends()


# Conditions in the expression language, each with a reference classifier over physical cards.
def _places(game: Game, hand, low: bool) -> list[int]:
    return sorted(-1 if (low and r == "A") else game.ranks.index(r) for r, _ in hand)


def _straight(game: Game, hand) -> bool:
    ranks = [r for r, _ in hand]
    if len(hand) < 2 or len(set(ranks)) != len(ranks):
        return False
    ways = {"both": (False, True), "high": (False,), "low": (True,)}[game.ace]
    return any(p[-1] - p[0] == len(p) - 1 for p in (_places(game, hand, low) for low in ways))


def _total(hand) -> int:
    hard = sum(1 if r == "A" else int(r) for r, _ in hand)
    return hard + 10 if any(r == "A" for r, _ in hand) and hard + 10 <= 21 else hard


REFERENCE = {
    "flush(hand)": lambda g, h: len({s for _, s in h}) == 1,
    "straight(hand)": _straight,
    "straight(hand) and flush(hand)": lambda g, h: _straight(g, h) and len({s for _, s in h}) == 1,
    "most(hand) >= 2": lambda g, h: max(sum(1 for r, _ in h if r == x) for x, _ in h) >= 2,
    "pairs(hand) == 1": lambda g, h: sum(1 for x in g.ranks if sum(1 for r, _ in h if r == x) == 2) == 1,
    "kinds(hand) == 1": lambda g, h: len({r for r, _ in h}) == 1,
    "most_suit(hand) >= 2": lambda g, h: max(sum(1 for _, s in h if s == x) for _, x in h) >= 2,
    "count(hand, s) >= 1": lambda g, h: any(s == "s" for _, s in h),
    "total(hand) >= 9": lambda g, h: _total(h) >= 9,
    "soft(hand)": lambda g, h: any(r == "A" for r, _ in h) and sum(1 if r == "A" else int(r) for r, _ in h) <= 11,
    "high(hand) >= 3": lambda g, h: (
        max((0 if (g.ace == "low" and r == "A") else g.ranks.index(r) + 1) for r, _ in h) >= 3
    ),
    "left() >= 4": lambda g, h: len(g.cards) - len(h) >= 4,
    "cards(hand) == 2 or hard(hand) > 7": lambda g, h: len(h) == 2 or sum(1 if r == "A" else int(r) for r, _ in h) > 7,
}


@st.composite
def games(draw) -> Game:
    ranks = tuple(r for r in RANKS if draw(st.booleans())) or ("2", "3")
    suits = SUITS[: draw(st.integers(1, 3))]
    copies = draw(st.integers(1, 2))
    size = len(ranks) * len(suits) * copies
    ace = draw(st.sampled_from(("both", "high", "low")))
    hand = draw(st.integers(1, min(4, size)))
    conditions = tuple(draw(st.lists(st.sampled_from(sorted(REFERENCE)), min_size=1, max_size=4, unique=True)))
    return Game(ranks, suits, copies, ace, hand, conditions)


def end_law(text: str) -> dict[str, QQ]:
    figures = solve_round(build_round_chain(dealt(load_ruleset_text(text, "random.toml"))))
    return {name: figure.exact for name, figure in figures.end_probability.items()}


@settings(max_examples=EXAMPLES, deadline=None)
@given(games())
def test_drawing_one_at_a_time_and_at_once_give_the_same_law(game):
    assert end_law(game.one_by_one()) == end_law(game.at_once())


@settings(max_examples=EXAMPLES, deadline=None)
@given(games())
def test_counting_by_pattern_agrees_with_listing_every_hand(game):
    counts = dict.fromkeys((f"e{i}" for i in range(len(game.conditions) + 1)), 0)
    for hand in itertools.combinations(game.cards, game.draw):
        first = next((i for i, c in enumerate(game.conditions) if REFERENCE[c](game, hand)), len(game.conditions))
        counts[f"e{first}"] += 1
    total = comb(len(game.cards), game.draw)
    expected = {name: QQ(count, total) for name, count in counts.items() if count}
    assert end_law(game.at_once()) == expected


@st.composite
def item_games(draw) -> tuple[dict[str, int], int, int]:
    counts = {label: draw(st.integers(0, 4)) for label in ("red", "blue", "green")}
    counts["red"] = max(counts["red"], 1)
    size = sum(counts.values())
    return counts, draw(st.integers(1, min(4, size))), draw(st.integers(0, 3))


@settings(max_examples=EXAMPLES, deadline=None)
@given(item_games())
def test_items_follow_the_multivariate_hypergeometric_law(game):
    # the law itself: P(x red) = C(R, x) C(N - R, k - x) / C(N, k)
    counts, hand, threshold = game
    items = ", ".join(f"{label} = {count}" for label, count in counts.items())
    text = (
        f'[ruleset]\ntitle = "urn"\nstart = "draw"\n[deck]\nitems = {{ {items} }}\n'
        f'[states.draw]\ndraw = {hand}\noutcomes = [{{ when = "count(hand, red) >= {threshold}", to = "many" }}, '
        '{ to = "few" }]\n[states.many]\n[states.few]\n'
    )
    red, size = counts["red"], sum(counts.values())
    many = sum(QQ(comb(red, x) * comb(size - red, hand - x), comb(size, hand)) for x in range(threshold, hand + 1))
    law = end_law(text)
    assert law.get("many", QQ(0)) == many


def _tv_to_infinite_deck(upcard: int, decks: int) -> QQ:
    infinite = load_ruleset(RULESETS / "dealer-stands-soft-17.toml")
    limit = solve_round(build_round_chain(dataclasses.replace(infinite, start=f"up-{upcard}"))).end_probability
    shoe = load_ruleset(RULESETS / "dealer-six-decks-stands-soft-17.toml", {"decks": QQ(decks)})
    finite = solve_round(build_round_chain(dealt(dataclasses.replace(shoe, start=f"up-{upcard}")))).end_probability
    zero = QQ(0)

    def chance(law, name):
        return law[name].exact if name in law else zero

    return sum((abs(chance(finite, n) - chance(limit, n)) for n in set(limit) | set(finite)), zero) / 2


@settings(max_examples=max(EXAMPLES // 3, 5), deadline=None)
@given(st.integers(2, 11), st.integers(1, 8), st.integers(1, 8))
def test_the_finite_shoe_approaches_the_infinite_deck_as_decks_grow(upcard, fewer, more):
    # property: total variation to the infinite-deck law falls as decks are added, about like 1/decks
    fewer, more = sorted((fewer, more + 8))
    near, far = _tv_to_infinite_deck(upcard, more), _tv_to_infinite_deck(upcard, fewer)
    assert near < far
    assert far * fewer < QQ(1, 50)
