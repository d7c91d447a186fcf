"""The ``[deck]`` table: what a round is dealt from, card by card, without putting anything back.

Two forms, one data type. Cards by rank and suit::

    [deck]                       # with nothing else: the 52 cards, 2 ... 10, J, Q, K, A in four suits
    copies = 6                   # six of each card: a six-deck shoe
    remove = ["10", "A of spades"]   # every 10; one ace of spades
    values = { A = 1 }           # what total() counts (number ranks count their number, J Q K 10, A 1)
    ace = "both"                 # straights: the A is high (after K), low (before 2) or both

or labelled items with counts (an urn, keno balls, coloured tokens)::

    [deck]
    items = { pick = 5, other = 75 }

Labels are plain names or whole numbers, so expressions can name them (``count(hand, A)``,
``count(hand, 10)``, ``count(hand, hearts)``, ``left(pick)``). ``Deck.counts[r][s]`` is how many of
rank ``r`` in suit ``s`` (items: one column). Reading reports problems through the ruleset reader.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any, Protocol

from oddsbench.model.errors import shown_name, type_name
from oddsbench.model.numbers import QQ, Rational, is_integer, text, to_int

STANDARD_RANKS = ("2", "3", "4", "5", "6", "7", "8", "9", "10", "J", "Q", "K", "A")
STANDARD_SUITS = ("clubs", "diamonds", "hearts", "spades")
STANDARD_VALUES = {"J": 10, "Q": 10, "K": 10, "A": 1}
ACE = "A"  # the rank that counts 1 or 11 in total() and high or low in straights
ACE_RULES = ("both", "high", "low")
DECK_KEYS = frozenset({"ranks", "suits", "copies", "remove", "values", "ace", "items"})
MAX_LABELS = 100  # ranks, suits or items
MAX_DECK_SIZE = 100_000  # cards or items in all
MAX_LABEL_LENGTH = 40
_LABEL = re.compile(r"[A-Za-z_][A-Za-z0-9_]*|[1-9][0-9]*")


class _Reader(Protocol):
    def error(self, where: str, message: str) -> None: ...

    def value(self, raw: Any, where: str) -> Rational | None: ...


@dataclass(frozen=True)
class Deck:
    """Ranks in order (items are ranks with no suits), suits, how many of each, values, the ace rule."""

    ranks: tuple[str, ...]
    suits: tuple[str, ...]
    counts: tuple[tuple[int, ...], ...]
    values: tuple[Rational | None, ...]
    ace: str = "both"
    items: bool = False

    @property
    def size(self) -> int:
        return sum(sum(row) for row in self.counts)

    def rank_total(self, rank: int) -> int:
        return sum(self.counts[rank])

    def suit_total(self, suit: int) -> int:
        return sum(row[suit] for row in self.counts)

    def label(self, name: str) -> tuple[str, int] | None:
        """What a label names: ``("rank", i)`` (items too) or ``("suit", i)``; None if nothing."""
        if name in self.ranks:
            return ("rank", self.ranks.index(name))
        if name in self.suits:
            return ("suit", self.suits.index(name))
        return None

    def card(self, name: str) -> tuple[int, int | None] | None:
        """A card named in ``take`` or ``remove``: ``"A"`` (rank, any suit) or ``"A of spades"``."""
        rank, _, suit = name.partition(" of ")
        rank = rank.strip()
        if rank not in self.ranks:
            return None
        if not suit:
            return (self.ranks.index(rank), None)
        suit = suit.strip()
        if suit not in self.suits:
            return None
        return (self.ranks.index(rank), self.suits.index(suit))

    @property
    def kind(self) -> str:
        return "item" if self.items else "card"

    def describe(self) -> str:
        """One line for summaries: ``52 cards (13 ranks x 4 suits)`` or ``80 items (pick 5, other 75)``."""
        if self.items:
            shown = ", ".join(f"{rank} {row[0]}" for rank, row in zip(self.ranks, self.counts))
            return f"{self.size:,} items ({shown})"
        return f"{self.size:,} cards ({len(self.ranks)} ranks x {len(self.suits)} suits)"


def _labels(reader: _Reader, raw: Any, where: str, default: tuple[str, ...]) -> tuple[str, ...] | None:
    if raw is None:
        return default
    if not isinstance(raw, list) or not raw:
        reader.error(where, f"must be a list of names, not {type_name(raw) if raw != [] else 'an empty list'}")
        return None
    if len(raw) > MAX_LABELS:
        reader.error(where, f"has {len(raw)} names, over the limit of {MAX_LABELS}")
        return None
    for name in raw:
        if not _usable_label(reader, name, where):
            return None
    if len(set(raw)) != len(raw):
        twice = next(name for name in raw if raw.count(name) > 1)
        reader.error(where, f"names {shown_name(twice)} twice")
        return None
    return tuple(raw)


def _usable_label(reader: _Reader, name: Any, where: str) -> bool:
    if not isinstance(name, str):
        reader.error(where, f"names must be text in quotes, not {type_name(name)}")
        return False
    if len(name) > MAX_LABEL_LENGTH or not _LABEL.fullmatch(name) or name.startswith("__"):
        reader.error(
            where,
            f"{shown_name(name)} is not a usable label: letters, digits and _ (not starting with a digit), "
            "or a whole number, so that expressions can name it",
        )
        return False
    return True


def _whole(reader: _Reader, raw: Any, where: str, low: int) -> int | None:
    value = reader.value(raw, where)
    if value is None:
        return None
    if not is_integer(value) or value < low or value > MAX_DECK_SIZE:
        reader.error(where, f"must be a whole number from {low} to {MAX_DECK_SIZE:,}, got {text(value)}")
        return None
    return to_int(value)


def read_deck(raw: Any, reader: _Reader) -> Deck | None:
    """The ``[deck]`` table, or None after reporting every problem (one line each)."""
    where = "[deck]"
    if not isinstance(raw, dict):
        reader.error(where, f"must be a table, not {type_name(raw)}")
        return None
    for key in raw:
        if key not in DECK_KEYS:
            known = ", ".join(sorted(DECK_KEYS))
            reader.error(where, f"unknown field {shown_name(key)} (a deck has {known})")
            return None
    copies = _whole(reader, raw.get("copies", 1), f"{where}, copies", 1)
    ace = raw.get("ace", "both")
    if ace not in ACE_RULES:
        reader.error(f"{where}, ace", f"must be one of {', '.join(map(repr, ACE_RULES))}, not {shown_name(ace)}")
        return None
    if "items" in raw:
        return _item_deck(raw, reader, copies, ace)
    ranks = _labels(reader, raw.get("ranks"), f"{where}, ranks", STANDARD_RANKS)
    suits = _labels(reader, raw.get("suits"), f"{where}, suits", STANDARD_SUITS)
    if ranks is None or suits is None or copies is None:
        return None
    clash = sorted(set(ranks) & set(suits))
    if clash:
        reader.error(where, f"{shown_name(clash[0])} is both a rank and a suit: give them different names")
        return None
    counts = [[copies] * len(suits) for _ in ranks]
    deck = Deck(ranks, suits, (), (), ace)
    removed = raw.get("remove", [])
    if not isinstance(removed, list):
        reader.error(f"{where}, remove", f'must be a list such as ["10", "A of spades"], not {type_name(removed)}')
        return None
    for name in removed:
        card = deck.card(name) if isinstance(name, str) else None
        if card is None:
            reader.error(
                f"{where}, remove",
                f"{describe(name)} is not a card of this deck: write a rank (every card of it) or 'RANK of SUIT' "
                f'(one of them), e.g. "{ranks[-1]}" or "{ranks[-1]} of {suits[-1]}"',
            )
            return None
        rank, suit = card
        if suit is None:
            counts[rank] = [0] * len(suits)
        elif counts[rank][suit] == 0:
            reader.error(f"{where}, remove", f"{describe(name)}: none of that card is left to remove")
            return None
        else:
            counts[rank][suit] -= 1
    values = _values(raw.get("values"), reader, ranks)
    if values is None:
        return None
    return _sized(reader, Deck(ranks, suits, tuple(map(tuple, counts)), values, ace))


def _item_deck(raw: dict[str, Any], reader: _Reader, copies: int | None, ace: str) -> Deck | None:
    where = "[deck]"
    misplaced = sorted(key for key in ("ranks", "suits", "remove") if key in raw)
    if misplaced:
        reader.error(
            where, f"'{misplaced[0]}' belongs to a deck of cards: a deck of items gives every count in 'items'"
        )
        return None
    items = raw["items"]
    if not isinstance(items, dict) or not items:
        reader.error(f"{where}, items", "must be a table of label = count, e.g. { pick = 5, other = 75 }")
        return None
    if len(items) > MAX_LABELS:
        reader.error(f"{where}, items", f"has {len(items)} labels, over the limit of {MAX_LABELS}")
        return None
    labels = []
    counts = []
    for label, count in items.items():
        if not _usable_label(reader, label, f"{where}, items"):
            return None
        number = _whole(reader, count, f"{where}, items, {label}", 0)
        if number is None or copies is None:
            return None
        labels.append(label)
        counts.append((number * copies,))
    values = _values(raw.get("values"), reader, tuple(labels))
    if values is None:
        return None
    return _sized(reader, Deck(tuple(labels), (), tuple(counts), values, ace, items=True))


def _values(raw: Any, reader: _Reader, ranks: tuple[str, ...]) -> tuple[Rational | None, ...] | None:
    """What each rank counts in ``total()``: given, else a number rank its number, J Q K 10, A 1."""
    given: dict[str, Rational] = {}
    if raw is not None:
        if not isinstance(raw, dict):
            reader.error("[deck], values", f"must be a table of rank = value, not {type_name(raw)}")
            return None
        for rank, value in raw.items():
            if rank not in ranks:
                reader.error("[deck], values", f"{shown_name(rank)} is not a rank of this deck")
                return None
            exact = reader.value(value, f"[deck], values, {rank}")
            if exact is None:
                return None
            given[rank] = exact
    values = []
    for rank in ranks:
        if rank in given:
            values.append(given[rank])
        elif rank.isdigit():
            values.append(QQ(int(rank)))
        elif rank in STANDARD_VALUES:
            values.append(QQ(STANDARD_VALUES[rank]))
        else:
            values.append(None)
    return tuple(values)


def _sized(reader: _Reader, deck: Deck) -> Deck | None:
    if deck.size == 0:
        reader.error("[deck]", "is empty: nothing left to draw")
        return None
    if deck.size > MAX_DECK_SIZE:
        reader.error("[deck]", f"holds {deck.size:,} {deck.kind}s, over the limit of {MAX_DECK_SIZE:,}")
        return None
    return deck


def describe(value: Any) -> str:
    if isinstance(value, str):
        return shown_name(value)
    return type_name(value)
