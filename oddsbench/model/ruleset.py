"""Ruleset data: a game of chance as states and outcomes, with exact values."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import TYPE_CHECKING, Any

from oddsbench.model.numbers import Rational

if TYPE_CHECKING:
    from oddsbench.model.deck import Deck
    from oddsbench.model.expr import Node


@dataclass(frozen=True)
class Outcome:
    """One possible step out of a state: where it goes, how likely, and what it pays."""

    to: str
    prob: Rational
    pay: Rational
    stake: Rational
    note: str = ""
    prob_given: bool = True
    # A game with a [deck] only: a condition on the hands that picks this outcome (the first
    # outcome whose condition holds is taken), and fields whose value depends on the hands
    # (("pay", tree), ...), evaluated for every hand when the deal is expanded (chain/deal.py).
    when: Node | None = None
    by_hand: tuple[tuple[str, Node], ...] = ()

    def rule(self, field_name: str) -> Node | None:
        """The expression of a field that depends on the hands, or None when its value is fixed."""
        for name, node in self.by_hand:
            if name == field_name:
                return node
        return None

    @property
    def reads_hands(self) -> bool:
        return self.when is not None or bool(self.by_hand)


@dataclass(frozen=True)
class Draw:
    """Cards (or items) a state deals into a hand: the named ones in ``take``, then ``count`` at random."""

    hand: str
    count: int
    take: tuple[str, ...] = ()


@dataclass(frozen=True)
class State:
    """A state moves on by ``outcomes``, by the player's ``choices``, or ends the round."""

    name: str
    outcomes: tuple[Outcome, ...] = ()
    choices: tuple[tuple[str, tuple[Outcome, ...]], ...] = ()
    result: str | None = None
    draw: Draw | None = None

    def by_cards(self, outcomes: tuple[Outcome, ...]) -> bool:
        """Whether these outcomes are chosen by the cards (a draw, or conditions on the hands):
        their chances come from the deal, so they are checked hand by hand, not summed here."""
        return self.draw is not None or any(o.when is not None or o.rule("prob") is not None for o in outcomes)

    @property
    def is_end(self) -> bool:
        return not self.outcomes and not self.choices

    @property
    def is_decision(self) -> bool:
        return bool(self.choices)

    @property
    def actions(self) -> tuple[str, ...]:
        return tuple(action for action, _ in self.choices)

    def choice(self, action: str) -> tuple[Outcome, ...]:
        for name, outcomes in self.choices:
            if name == action:
                return outcomes
        raise KeyError(action)


@dataclass(frozen=True)
class Strategy:
    """A named way of playing: an action for each decision state, with a fallback."""

    name: str
    actions: tuple[tuple[str, str], ...] = ()
    default: str | None = None
    # A game with a [deck] only: (state, condition on the hands or None, action), tried in order.
    by_hand: tuple[tuple[str, Node | None, str], ...] = ()

    def action_for(self, state: State) -> str | None:
        for name, action in self.actions:
            if name == state.name:
                return action
        return self.default


@dataclass(frozen=True)
class Ruleset:
    """A whole game as read from a file. ``session`` holds the raw ``[session]`` defaults."""

    title: str
    start: str
    stake: Rational
    states: tuple[State, ...]
    source: str = "<text>"
    about: str = ""
    params: tuple[tuple[str, Rational], ...] = ()
    strategies: tuple[Strategy, ...] = ()
    session: dict[str, Any] = field(default_factory=dict, hash=False, compare=False)
    deck: Deck | None = None  # a game dealt from a deck; chain/deal.py expands it into plain states

    def state(self, name: str) -> State:
        for state in self.states:
            if state.name == name:
                return state
        raise KeyError(name)

    @property
    def state_names(self) -> tuple[str, ...]:
        return tuple(state.name for state in self.states)

    @property
    def has_decisions(self) -> bool:
        return any(state.is_decision for state in self.states)

    def strategy(self, name: str) -> Strategy:
        for strategy in self.strategies:
            if strategy.name == name:
                return strategy
        raise KeyError(name)
