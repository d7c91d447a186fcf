"""One round under one or several ways of playing, side by side: named strategies or start states.

``solve_rounds`` is the one loop: each column is a start state and a play (a named strategy, or
none for a game without decisions), solved by the round solver with the same settings. The result
says what is compared (strategies, start states, or nothing: one round), so every front end
shows the same columns.
"""

from __future__ import annotations

import dataclasses
import time
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from oddsbench.chain.deal import dealt, single_draw
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model import budget
from oddsbench.model.defaults import DEFAULT_EXACT_BITS, DEFAULT_MAX_STATES, ROUND_EXACT_LIMIT
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset, Strategy
from oddsbench.solve.round import RoundFigures, solve_round


@dataclass(frozen=True)
class RoundColumn:
    """One round: where it starts, the strategy played (None: no decisions) and every figure."""

    start: str
    strategy: str | None
    policy: dict[str, str]
    figures: RoundFigures


@dataclass(frozen=True)
class RoundResults:
    """Rounds side by side; ``compared`` is "strategies", "starts", or None for a single round."""

    title: str
    columns: tuple[RoundColumn, ...]
    compared: str | None = None

    @property
    def figures(self) -> tuple[RoundFigures, ...]:
        return tuple(column.figures for column in self.columns)

    @property
    def names(self) -> tuple[str, ...]:
        """Column headings: the strategy names, or the start states."""
        if self.compared == "starts":
            return tuple(column.start for column in self.columns)
        return tuple(column.strategy or "as written" for column in self.columns)

    @property
    def start(self) -> str:
        return self.columns[0].start

    @property
    def strategy(self) -> str | None:
        """The one strategy every column plays (None when columns differ or there are no decisions)."""
        played = {column.strategy for column in self.columns}
        return played.pop() if len(played) == 1 else None

    def of(self, name: str) -> RoundFigures:
        return self.columns[self.names.index(name)].figures

    def figure(self, name: str, column: int = 0):
        """One figure of one column (``house_edge``, ``expected_steps``...), exact beside decimal."""
        figures = self.columns[column].figures
        if name in figures.figures:
            return figures.figures[name]
        known = ", ".join(figures.figures)
        raise KeyError(f"no figure {name!r} in this round (figures: {known})")


def strategy_policy(ruleset: Ruleset, strategy: Strategy) -> dict[str, str]:
    """The action a strategy takes in every decision state (validated when the file was read)."""
    return {state.name: strategy.action_for(state) for state in ruleset.states if state.is_decision}


def named_strategy(ruleset: Ruleset, name: str) -> Strategy:
    try:
        return ruleset.strategy(name)
    except KeyError:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(f"{ruleset.source}: unknown strategy {name!r} (known: {known})") from None


def policy_of(ruleset: Ruleset, name: str | None) -> dict[str, str]:
    """The actions of a named strategy (empty for None: a game without decisions plays as written)."""
    return strategy_policy(ruleset, named_strategy(ruleset, name)) if name is not None else {}


def starting_at(ruleset: Ruleset, state: str | None, max_states: int | None = DEFAULT_MAX_STATES) -> Ruleset:
    """The ruleset of a round started in ``state`` (None keeps the file's start), as plain states:
    a deck game is dealt out from there (``chain/deal.py``; the round is then over (state, hands))."""
    return dealt(_started(ruleset, state), max_states)


def _started(ruleset: Ruleset, state: str | None) -> Ruleset:
    if state is None or state == ruleset.start:
        return ruleset
    if state not in ruleset.state_names:
        import difflib

        close = difflib.get_close_matches(state, ruleset.state_names, n=1)
        hint = f" (did you mean {close[0]!r}?)" if close else ""
        raise OddsbenchError(f"{ruleset.source}: no state {state!r} to start from{hint}")
    return dataclasses.replace(ruleset, start=state)


def _shared_deal(ruleset: Ruleset, starts: Sequence[str], max_states: int | None) -> Callable[[str], Ruleset | None]:
    """Several start states of one deck game (``--from 'up-*'``): deal once from the file's start and
    start each round there when that deal already holds the state with nothing dealt (hands after it
    are shared: the dealer's 6 then 10 is the same state whatever the upcard was). None: deal apart."""
    if ruleset.deck is None or len(set(starts)) < 2:
        return lambda start: None
    try:
        whole = dealt(ruleset, max_states)
    except OddsbenchError:
        return lambda start: None  # the file's own start may break where these starts do not
    names = set(whole.state_names)
    return lambda start: dataclasses.replace(whole, start=start) if start in names else None


def play_chain(ruleset: Ruleset, start: str | None, strategy: str | None, max_states: int = DEFAULT_MAX_STATES):
    """The round chain of one play (a start state and a named strategy or none), dealt out when a deck game."""
    played = starting_at(ruleset, start, max_states)
    return build_round_chain(played, policy_of(played, strategy), max_states)


def with_hands(ruleset: Ruleset, figures: RoundFigures) -> RoundFigures:
    """A round dealt in one draw of k (a deck game): each end's chance also as a count of hands."""
    draw = single_draw(ruleset)
    if draw is None:
        return figures
    counted = draw.counted({name: figure.exact for name, figure in figures.end_probability.items()})
    return dataclasses.replace(figures, hands=counted) if counted is not None else figures


def names_several(starts: str | None) -> bool:
    """Whether a ``--from`` text names several start states (a list or a pattern) rather than one."""
    return starts is not None and ("," in starts or any(char in starts for char in "*?["))


def matching_states(ruleset: Ruleset, pattern: str) -> tuple[str, ...]:
    """States named by a comma-separated list of names or shell-style patterns (``up-*``), in file order."""
    from fnmatch import fnmatchcase

    chosen: list[str] = []
    for part in (piece.strip() for piece in pattern.split(",")):
        if not part:
            continue
        if any(char in part for char in "*?["):
            found = [name for name in ruleset.state_names if fnmatchcase(name, part)]
            if not found:
                raise OddsbenchError(f"{ruleset.source}: no state matches {part!r}")
        else:
            found = [_started(ruleset, part).start]
        chosen += [name for name in found if name not in chosen]
    if not chosen:
        raise OddsbenchError(f"{ruleset.source}: no start state given")
    return tuple(chosen)


def plays_to_compare(ruleset: Ruleset, strategies: Sequence[str] = ()) -> list[str | None]:
    """The strategies to solve: those named, else every one of the file's (a game with decisions),
    else None (a game without decisions plays as written)."""
    if strategies:
        return list(strategies)
    if not ruleset.has_decisions:
        return [None]
    if not ruleset.strategies:
        raise OddsbenchError(
            f"{ruleset.source}: has decision states but no [strategies] to compare "
            "(add one, or let `oddsbench best` find the best play)"
        )
    return [s.name for s in ruleset.strategies]


def solve_rounds(
    ruleset: Ruleset,
    plays: Sequence[tuple[str, str | None]],
    compared: str | None = None,
    rounds: int | None = None,
    exact_limit: int = ROUND_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
    max_states: int = DEFAULT_MAX_STATES,
    exact_bits: int | None = DEFAULT_EXACT_BITS,
) -> RoundResults:
    """Solve one round per (start state, strategy name or None), in order.

    The columns are timed as they go: as soon as the rest, at the pace so far, would not fit the
    time left in the work budget, they are refused in one line.
    """
    columns = []
    shared = _shared_deal(ruleset, [start for start, _ in plays], max_states)
    began = time.monotonic()
    for number, (start, strategy) in enumerate(plays, start=1):
        played = shared(start) or starting_at(ruleset, start, max_states)
        policy = policy_of(played, strategy)
        chain = build_round_chain(played, policy, max_states)
        figures = with_hands(_started(ruleset, start), solve_round(chain, rounds, exact_limit, should_stop, exact_bits))
        columns.append(RoundColumn(figures.start, strategy, policy, figures))
        _require_the_rest(len(plays) - number, (time.monotonic() - began) / number, compared)
    return RoundResults(ruleset.title, tuple(columns), compared)


def _require_the_rest(left: int, each: float, compared: str | None) -> None:
    if left > 0:
        what = "start states" if compared == "starts" else "plays"
        budget.require(
            f"solving {left:,} more {what} side by side ({budget.seconds_text(each)} each)", seconds=each * left
        )


def compare_strategies(
    ruleset: Ruleset,
    rounds: int | None = None,
    exact_limit: int = ROUND_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
    strategies: Sequence[str] = (),
) -> RoundResults:
    """Solve one round under each named strategy of the ruleset (or those given)."""
    plays = [(ruleset.start, name) for name in plays_to_compare(ruleset, strategies)]
    return solve_rounds(ruleset, plays, "strategies", rounds, exact_limit, should_stop)


def compare_starts(
    ruleset: Ruleset,
    starts: tuple[str, ...],
    strategy: str | None = None,
    rounds: int | None = None,
    exact_limit: int = ROUND_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> RoundResults:
    """Solve one round from each of several start states, under a named strategy if decisions need one."""
    if strategy is None and ruleset.has_decisions:
        raise OddsbenchError(f"{ruleset.source}: has decision states: choose a strategy to compare start states")
    return solve_rounds(ruleset, [(start, strategy) for start in starts], "starts", rounds, exact_limit, should_stop)
