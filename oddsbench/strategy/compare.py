"""Named strategies of a ruleset solved side by side: every round figure under each."""

from __future__ import annotations

import dataclasses
from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.ruleset import Ruleset, Strategy
from oddsbench.solve.round import DEFAULT_EXACT_LIMIT, RoundFigures, solve_round


@dataclass(frozen=True)
class StrategyComparison:
    """One ``RoundFigures`` per named strategy, in the file's order."""

    title: str
    start: str
    strategies: tuple[str, ...]
    figures: tuple[RoundFigures, ...]

    def of(self, name: str) -> RoundFigures:
        return self.figures[self.strategies.index(name)]

    @property
    def columns(self) -> tuple[str, ...]:
        return self.strategies


@dataclass(frozen=True)
class StartComparison:
    """One ``RoundFigures`` per start state (e.g. each upcard of the dealer), under one play."""

    title: str
    starts: tuple[str, ...]
    figures: tuple[RoundFigures, ...]
    strategy: str | None = None

    def of(self, start: str) -> RoundFigures:
        return self.figures[self.starts.index(start)]

    @property
    def columns(self) -> tuple[str, ...]:
        return self.starts


def strategy_policy(ruleset: Ruleset, strategy: Strategy) -> dict[str, str]:
    """The action a strategy takes in every decision state (validated when the file was read)."""
    return {state.name: strategy.action_for(state) for state in ruleset.states if state.is_decision}


def named_strategy(ruleset: Ruleset, name: str) -> Strategy:
    try:
        return ruleset.strategy(name)
    except KeyError:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(f"{ruleset.source}: unknown strategy {name!r} (known: {known})") from None


def starting_at(ruleset: Ruleset, state: str | None) -> Ruleset:
    """The same ruleset with the round starting in ``state`` (None keeps the file's start)."""
    if state is None or state == ruleset.start:
        return ruleset
    if state not in ruleset.state_names:
        import difflib

        close = difflib.get_close_matches(state, ruleset.state_names, n=1)
        hint = f" (did you mean {close[0]!r}?)" if close else ""
        raise OddsbenchError(f"{ruleset.source}: no state {state!r} to start from{hint}")
    return dataclasses.replace(ruleset, start=state)


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
            found = [starting_at(ruleset, part).start]
        chosen += [name for name in found if name not in chosen]
    if not chosen:
        raise OddsbenchError(f"{ruleset.source}: no start state given")
    return tuple(chosen)


def compare_starts(
    ruleset: Ruleset,
    starts: tuple[str, ...],
    strategy: str | None = None,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> StartComparison:
    """Solve one round from each of several start states, under a named strategy if decisions need one."""
    policy = strategy_policy(ruleset, named_strategy(ruleset, strategy)) if strategy is not None else {}
    if strategy is None and ruleset.has_decisions:
        raise OddsbenchError(f"{ruleset.source}: has decision states: choose a strategy to compare start states")
    solved = []
    for start in starts:
        chain = build_round_chain(starting_at(ruleset, start), policy)
        solved.append(solve_round(chain, rounds=rounds, exact_limit=exact_limit, should_stop=should_stop))
    return StartComparison(ruleset.title, tuple(starts), tuple(solved), strategy)


def compare_strategies(
    ruleset: Ruleset,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> StrategyComparison:
    """Solve one round under each named strategy of the ruleset."""
    if not ruleset.strategies:
        raise OddsbenchError(
            f"{ruleset.source}: has decision states but no [strategies] to compare "
            "(add one, or let `oddsbench best` find the best play)"
        )
    solved = []
    for strategy in ruleset.strategies:
        chain = build_round_chain(ruleset, strategy_policy(ruleset, strategy))
        solved.append(solve_round(chain, rounds=rounds, exact_limit=exact_limit, should_stop=should_stop))
    return StrategyComparison(
        title=ruleset.title,
        start=ruleset.start,
        strategies=tuple(s.name for s in ruleset.strategies),
        figures=tuple(solved),
    )
