"""Ruleset data: a game of chance as states and outcomes, with exact values."""

from __future__ import annotations

from dataclasses import dataclass, field
from typing import Any

from oddsbench.model.numbers import Rational


@dataclass(frozen=True)
class Outcome:
    """One possible step out of a state: where it goes, how likely, and what it pays."""

    to: str
    prob: Rational
    pay: Rational
    stake: Rational
    note: str = ""
    prob_given: bool = True


@dataclass(frozen=True)
class State:
    """A state moves on by ``outcomes``, by the player's ``choices``, or ends the round."""

    name: str
    outcomes: tuple[Outcome, ...] = ()
    choices: tuple[tuple[str, tuple[Outcome, ...]], ...] = ()
    result: str | None = None

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
