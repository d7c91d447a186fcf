"""Functions of the hands: what an outcome of a deck game may ask about the cards dealt.

Each function reads one hand (a hand a state draws into, or ``drawn``: the cards of the draw just
made) and gives a number; conditions are numbers too (1 true, 0 false)::

    cards(h)       how many cards (items) h holds
    count(h, L)    how many of rank, suit or item L      count(hand, A), count(hand, hearts), count(hand, pick)
    most(h)        the most cards of one rank ("four of a kind": most(h) == 4)
    pairs(h)       how many ranks h holds exactly twice ("two pair": pairs(h) == 2)
    kinds(h)       how many different ranks
    flush(h)       1 when every card of h has the same suit
    most_suit(h)   the most cards of one suit
    straight(h)    1 when h holds two or more cards of different, consecutive ranks, in the deck's order
                   (the A high after K, low before 2, or both: [deck] ace; never round the corner)
    high(h)        the place of h's highest rank in the deck's order (2 is 1 ... A is 13; an A that
                   only counts low is 0)
    hard(h)        the sum of the card values, every A counting 1
    total(h)       hard(h), plus 10 when h holds an A and that keeps it at most 21 (a soft total)
    soft(h)        1 when total(h) counts an A as 11
    left(L), left()   how many of rank, suit or item L (or of everything) are still in the deck

``check_call`` checks a call against the deck and the hands when the file is read (one line per
problem); ``hand_value`` computes a value from a hand's counts per rank class and per suit, which is
all the dealer keeps (chain/deal.py). The two lists below are the one place the functions live.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from operator import mul

from oddsbench.model.deck import ACE, Deck
from oddsbench.model.expr import HAND_FUNCTIONS, Call, Name, Number
from oddsbench.model.numbers import Rational, is_integer, to_int

DRAWN = "drawn"  # the cards of the draw just made, in the outcomes of a drawing state
DEFAULT_HAND = "hand"
SOFT_LIMIT = 21  # total() counts an A as 11 when the total stays at most this
SOFT_EXTRA = 10

# name -> (arguments, what the deck must have): "hand" a hand name, "label" a rank, suit or item,
# "label?" an optional one.
SIGNATURES: dict[str, tuple[tuple[str, ...], str]] = {
    "cards": (("hand",), ""),
    "count": (("hand", "label"), ""),
    "most": (("hand",), "ranks"),
    "pairs": (("hand",), "ranks"),
    "kinds": (("hand",), "ranks"),
    "flush": (("hand",), "suits"),
    "most_suit": (("hand",), "suits"),
    "straight": (("hand",), "ranks"),
    "high": (("hand",), "ranks"),
    "hard": (("hand",), "values"),
    "total": (("hand",), "values"),
    "soft": (("hand",), "values"),
    "left": (("label?",), ""),
}
SUIT_FUNCTIONS = frozenset({"flush", "most_suit"})
RANK_FUNCTIONS = frozenset({"most", "pairs", "kinds", "straight", "high"})  # they tell every rank apart
assert set(SIGNATURES) == HAND_FUNCTIONS


@dataclass(frozen=True)
class Resolved:
    """A call read against the deck: the function, the hand (None for ``left``), and the label as
    ``("rank", i)`` or ``("suit", i)`` (None when there is none)."""

    function: str
    hand: str | None
    label: tuple[str, int] | None


def label_text(node: object) -> str | None:
    """The label an argument spells: a name, or a whole number (``count(hand, 10)``)."""
    if isinstance(node, Name):
        return node.name
    if isinstance(node, Number) and is_integer(node.value) and node.value > 0:
        return str(to_int(node.value))
    return None


def check_call(call: Call, deck: Deck, hands: Sequence[str], drawn: bool) -> Resolved | str:
    """The call resolved, or one line saying what is wrong with it."""
    shape, needs = SIGNATURES[call.function]
    shown = f"{call.function}()"
    low = sum(1 for kind in shape if not kind.endswith("?"))
    if not low <= len(call.args) <= len(shape):
        wanted = {"hand": "a hand", "label": "a rank, suit or item", "label?": "an optional rank, suit or item"}
        spelled = ", ".join(wanted[kind] for kind in shape)
        return f"{shown} takes {spelled} ({len(call.args)} given)"
    if needs == "suits" and not deck.suits:
        return f"{shown} needs suits, and a deck of items has none"
    if needs == "values":
        missing = [rank for rank, value in zip(deck.ranks, deck.values) if value is None]
        if missing:
            return f"{shown} needs a value for every rank: give {missing[0]!r} one in [deck] values"
    hand = None
    label = None
    for kind, node in zip(shape, call.args):
        spelled = label_text(node)
        if kind == "hand":
            known = [*hands, DRAWN] if drawn else list(hands)
            if not isinstance(node, Name) or node.name not in known:
                listed = ", ".join(known) or "none: no state draws"
                what = "a hand's name" if spelled is None else f"{spelled!r}"
                extra = "; 'drawn' only in the outcomes of a state that draws" if spelled == DRAWN else ""
                return f"{shown}: {what} is not a hand (hands: {listed}){extra}"
            hand = node.name
        else:
            label = deck.label(spelled) if spelled is not None else None
            if label is None:
                return f"{shown}: {_unknown(spelled, deck)}"
    return Resolved(call.function, hand, label)


def _unknown(spelled: str | None, deck: Deck) -> str:
    what = "a rank, a suit or an item" if not deck.items else "an item"
    if spelled is None:
        return f"the second argument must name {what}"
    known = ", ".join(deck.ranks[:15]) + (", ..." if len(deck.ranks) > 15 else "")
    if deck.suits:
        known = f"ranks {known}; suits {', '.join(deck.suits)}"
    return f"the deck has no {spelled!r} ({known})"


@dataclass(frozen=True)
class RankClasses:
    """The ranks as the dealer counts them. Where no expression tells two ranks apart (only values
    are asked: ``total``, ``cards``), ranks of equal value are one class, so a shoe's 10, J, Q and K
    are counted together; otherwise each rank is its own class."""

    of_rank: tuple[int, ...]  # rank index -> class index
    labels: tuple[str, ...]
    values: tuple[Rational | None, ...]
    aces: tuple[bool, ...]
    places: tuple[int, ...]  # 1-based place in the deck's rank order (straights, high)
    ace_rule: str
    whole_values: tuple[int, ...] | None = None  # the values as ints, when every one is whole
    ace_classes: tuple[int, ...] = ()  # the classes of aces (total() may count one as 11)

    @staticmethod
    def of(deck: Deck, merge: bool) -> RankClasses:
        keys: dict[object, int] = {}
        of_rank = []
        members: list[list[int]] = []
        for rank, name in enumerate(deck.ranks):
            key = (deck.values[rank], name == ACE) if merge else rank
            if key not in keys:
                keys[key] = len(members)
                members.append([])
            members[keys[key]].append(rank)
            of_rank.append(keys[key])
        return RankClasses(
            of_rank=tuple(of_rank),
            labels=tuple("/".join(deck.ranks[r] for r in group) for group in members),
            values=tuple(deck.values[group[0]] for group in members),
            aces=tuple(deck.ranks[group[0]] == ACE for group in members),
            places=tuple(group[0] + 1 for group in members),
            ace_rule=deck.ace,
            whole_values=_whole_values(tuple(deck.values[group[0]] for group in members)),
            ace_classes=tuple(i for i, group in enumerate(members) if deck.ranks[group[0]] == ACE),
        )


def _whole_values(values: tuple[Rational | None, ...]) -> tuple[int, ...] | None:
    if any(value is None or not is_integer(value) for value in values):
        return None
    return tuple(to_int(value) for value in values)


def hand_value(
    function: str,
    ranks: Sequence[int],
    suits: Sequence[int] | None,
    label: tuple[str, int] | None,
    classes: RankClasses,
) -> int | Rational:
    """The value of a hand function on a hand given by its counts per rank class and per suit: a
    Python ``int`` (quick to compare and hash; the caller makes it exact) or, for values that are
    not whole, an exact rational."""
    if function == "cards":
        return sum(ranks)
    if function == "count":
        kind, index = label  # type: ignore[misc]
        if kind == "suit":
            return suits[index] if suits is not None else 0
        return ranks[classes.of_rank[index]]
    if function == "most":
        return max(ranks, default=0)
    if function == "pairs":
        return ranks.count(2) if isinstance(ranks, tuple) else sum(1 for count in ranks if count == 2)
    if function == "kinds":
        return sum(1 for count in ranks if count)
    if function == "flush":
        held = sum(ranks)
        return 1 if held and suits is not None and max(suits) == held else 0
    if function == "most_suit":
        return max(suits, default=0) if suits is not None else 0
    if function == "straight":
        return 1 if _straight(ranks, classes) else 0
    if function == "high":
        held = [_place(i, classes, low=classes.ace_rule == "low") for i, count in enumerate(ranks) if count]
        return max(held, default=0)
    values = classes.whole_values or classes.values
    hard = sum(map(mul, values, ranks))  # type: ignore[arg-type]
    if function == "hard":
        return hard
    soft = hard + SOFT_EXTRA <= SOFT_LIMIT and any(ranks[i] for i in classes.ace_classes)
    if function == "soft":
        return 1 if soft else 0
    if function == "total":
        return hard + SOFT_EXTRA if soft else hard
    raise ValueError(function)


def _place(index: int, classes: RankClasses, low: bool) -> int:
    return 0 if low and classes.aces[index] else classes.places[index]


def _straight(ranks: Sequence[int], classes: RankClasses) -> bool:
    held = [i for i, count in enumerate(ranks) if count]
    if len(held) < 2 or any(ranks[i] > 1 for i in held):
        return False
    rule = classes.ace_rule
    ways = [rule != "low"] + [rule != "high"]  # the A counted high, then low
    for low, allowed in zip((False, True), ways):
        if allowed:
            places = sorted(_place(i, classes, low) for i in held)
            if places[-1] - places[0] == len(places) - 1:
                return True
    return False
