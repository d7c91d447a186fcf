"""How a deck game tells its cards apart: kinds of card, and the suits that can be exchanged.

A hand is a count per kind of card. A kind is a rank class (ranks no expression tells apart, as a
shoe's 10, J, Q and K when only totals are read, are one class) with its suit where an expression
asks about suits, and without one otherwise. Where suits are told apart but none is ever named
(flushes only), hands equal up to a renaming of the suits are one state: ``canonical`` picks the
representative.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from oddsbench.model.deck import Deck
from oddsbench.model.hands import SUIT_FUNCTIONS, RankClasses, Resolved

Hands = tuple[tuple[int, ...], ...]  # per hand, a count per kind of card
Summary = tuple[tuple[int, ...], tuple[int, ...] | None]  # counts per rank class, per suit (None: suits not told)


@dataclass(frozen=True)
class Kinds:
    """How the dealer tells cards apart in this game: rank classes, with or without suits."""

    classes: RankClasses
    suited: bool
    of_kind: tuple[tuple[int, int | None], ...]  # kind -> (rank class, suit or None)
    counts: tuple[int, ...]  # kind -> how many in the full deck
    suits: int
    labels: tuple[str, ...]
    items: bool

    @staticmethod
    def of(deck: Deck, calls: Sequence[Resolved]) -> Kinds:
        suited = bool(deck.suits) and any(
            call.function in SUIT_FUNCTIONS or (call.label is not None and call.label[0] == "suit") for call in calls
        )
        told_apart = any(
            call.function not in ("cards", "hard", "total", "soft", "left", "count")
            or (call.label is not None and call.label[0] == "rank")
            for call in calls
            if call.function not in SUIT_FUNCTIONS
        )
        classes = RankClasses.of(deck, merge=not told_apart)
        totals: dict[tuple[int, int | None], int] = {}
        for rank, row in enumerate(deck.counts):
            for suit, count in enumerate(row):
                key = (classes.of_rank[rank], suit if suited else None)
                totals[key] = totals.get(key, 0) + count
        kinds = tuple(key for key in sorted(totals, key=lambda k: (k[0], -1 if k[1] is None else k[1])) if totals[key])
        labels = tuple(
            classes.labels[c] if s is None or deck.items else f"{classes.labels[c]} of {deck.suits[s]}"
            for c, s in kinds
        )
        return Kinds(classes, suited, kinds, tuple(totals[k] for k in kinds), len(deck.suits), labels, deck.items)

    def summary(self, hand: Sequence[int]) -> Summary:
        ranks = [0] * len(self.classes.labels)
        suits = [0] * self.suits if self.suited else None
        for kind, count in enumerate(hand):
            if count:
                rank, suit = self.of_kind[kind]
                ranks[rank] += count
                if suits is not None:
                    suits[suit] += count
        return tuple(ranks), (tuple(suits) if suits is not None else None)

    def matching(self, deck: Deck, name: str) -> list[int]:
        """The kinds a card named in ``take`` can be: one rank (any suit), or one card."""
        rank, suit = deck.card(name)  # type: ignore[misc]
        wanted_class = self.classes.of_rank[rank]
        return [
            kind
            for kind, (c, s) in enumerate(self.of_kind)
            if c == wanted_class and (suit is None or not self.suited or s == suit)
        ]

    def spelled(self, hand: Sequence[int]) -> str:
        if self.items:
            return ", ".join(f"{count} {self.labels[kind]}" for kind, count in enumerate(hand) if count)
        joiner = ", " if self.suited else " "  # "A of spades, K of hearts" or "10 6"
        return joiner.join(self.labels[kind] for kind, count in enumerate(hand) for _ in range(count))

    def exchangeable_suits(self, named_suit: bool, takes_a_suit: bool) -> list[list[int]] | None:
        """Where the suits are told apart but none is ever named (flushes only) and the deck holds the same
        cards in every suit, hands equal up to a renaming of the suits are one state: the layout of kinds
        per rank class and suit that ``canonical`` permutes; None when the suits cannot be exchanged."""
        kinds = self
        if not kinds.suited or named_suit or takes_a_suit:
            return None
        place = {key: kind for kind, key in enumerate(kinds.of_kind)}
        layout = []
        for rank_class in range(len(kinds.classes.labels)):
            row = [place.get((rank_class, suit)) for suit in range(kinds.suits)]
            if all(kind is None for kind in row):
                continue
            if any(kind is None for kind in row) or len({kinds.counts[k] for k in row}) != 1:  # type: ignore[index]
                return None
            layout.append(row)
        return layout  # type: ignore[return-value]

    def canonical(self, hands: Hands, layout: list[list[int]]) -> Hands:
        """The hands with the suits renamed so that their columns (every hand's cards of that suit) are in
        sorted order: one representative for all hands that differ only by the names of the suits."""
        columns = [tuple(hand[row[suit]] for hand in hands for row in layout) for suit in range(self.suits)]
        order = sorted(range(self.suits), key=columns.__getitem__)
        if order == sorted(order):
            return hands
        renamed = []
        for hand in hands:
            cards = list(hand)
            for row in layout:
                for new, old in enumerate(order):
                    cards[row[new]] = hand[row[old]]
            renamed.append(tuple(cards))
        return tuple(renamed)
