"""Questions about one round: its figures (any start states, any strategy), the best play, a strategy check.

Entry points: ``round_figures(game, settings, work) -> RoundResults``, ``best_play(game, settings,
work) -> BestResults``, ``check_strategy(game, name, settings, work) -> BestResults``.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import TYPE_CHECKING

from oddsbench.core.game import Game
from oddsbench.core.settings import DEFAULTS, Settings
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.ruleset import Ruleset
from oddsbench.strategy.compare import (
    RoundResults,
    matching_states,
    names_several,
    plays_to_compare,
    policy_of,
    solve_rounds,
    starting_at,
)

if TYPE_CHECKING:
    from oddsbench.strategy.best_policy import BestPolicy, StrategyCheck


@dataclass(frozen=True)
class BestResults:
    """The best play for a goal (None when only strategies were checked) and each strategy held against it."""

    title: str
    start: str
    goal: str
    best: BestPolicy | None
    checks: tuple[StrategyCheck, ...] = ()


@budgeted
def round_figures(game: Game, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> RoundResults:
    """Every figure of one round; side by side for several start states or several strategies.

    ``settings.starts`` may name several states (``up-*``, ``a,b``): one column each, under the one
    strategy named (decisions need one). A game with decisions and no strategy named is solved
    under each of the file's strategies; several named strategies are compared too.
    """
    ruleset = game.need_ruleset("solving a round")
    options = dict(
        rounds=settings.rounds,
        exact_limit=settings.round_exact_limit,
        should_stop=work.should_stop,
        max_states=settings.max_states,
        exact_bits=settings.exact_bits,
    )
    if names_several(settings.starts):
        strategy = _one_strategy(ruleset, settings, "to compare start states")
        starts = matching_states(ruleset, settings.starts)
        return solve_rounds(ruleset, [(start, strategy) for start in starts], "starts", **options)
    start = starting_at(ruleset, settings.starts, settings.max_states).start
    if len(settings.strategies) == 1 or not ruleset.has_decisions:
        strategy = settings.strategies[0] if settings.strategies else None
        return solve_rounds(ruleset, [(start, strategy)], None, **options)
    plays = [(start, name) for name in plays_to_compare(ruleset, settings.strategies)]
    return solve_rounds(ruleset, plays, "strategies", **options)


def _one_strategy(ruleset: Ruleset, settings: Settings, why: str) -> str | None:
    if len(settings.strategies) > 1:
        raise OddsbenchError(f"{ruleset.source}: name one strategy {why}, not {len(settings.strategies)}")
    strategy = settings.strategies[0] if settings.strategies else None
    if strategy is None and ruleset.has_decisions:
        raise OddsbenchError(f"{ruleset.source}: has decision states: choose a strategy {why}")
    return strategy


def one_play(ruleset: Ruleset, settings: Settings, question: str) -> str | None:
    """The one strategy a question repeating one round plays (None: a game without decisions), or one
    line saying a game with decisions needs one, and one start state."""
    if names_several(settings.starts):
        raise OddsbenchError(f"{ruleset.source}: {question} repeats one round: name one start state, not several")
    if ruleset.has_decisions and len(settings.strategies) != 1:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise SettingProblem(f"{ruleset.source}: has decision states: choose one strategy (known: {known})", "strategy")
    return settings.strategies[0] if settings.strategies else None


@budgeted
def best_play(game: Game, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> BestResults:
    """The best action in every decision state for ``settings.best_goal``, its value and certificate."""
    from oddsbench.strategy.best_policy import best_policy

    ruleset = starting_at(game.need_ruleset("best play"), settings.starts, settings.max_states)
    best = best_policy(ruleset, settings.best_goal, settings.round_exact_limit, work.should_stop)
    return BestResults(ruleset.title, ruleset.start, best.goal, best)


@budgeted
def check_strategy(game: Game, name: str, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> BestResults:
    """Hold a named strategy against ``settings.best_goal``: every state where one change of action does better."""
    from oddsbench.strategy.best_policy import check_strategy as held_against

    ruleset = starting_at(game.need_ruleset("checking a strategy"), settings.starts, settings.max_states)
    check = held_against(ruleset, name, settings.best_goal, settings.round_exact_limit, work.should_stop)
    return BestResults(ruleset.title, ruleset.start, check.goal, None, (check,))


def round_play(ruleset: Ruleset, settings: Settings, work: Work = NO_WORK) -> tuple[dict[str, str], str | None]:
    """The policy a simulation or a session plays, and its label: a named strategy, the best play, or none."""
    if settings.strategies:
        name = _one_strategy(ruleset, settings, "to play")
        return policy_of(ruleset, name), name
    if settings.play_best:
        from oddsbench.strategy.best_policy import best_policy

        best = best_policy(ruleset, settings.best_goal, settings.round_exact_limit, work.should_stop)
        return dict(best.policy), f"best for {settings.best_goal}"
    if ruleset.has_decisions:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise SettingProblem(
            f"{ruleset.source}: has decision states: choose a strategy (known: {known}) or the best play for a goal",
            "strategy",
            "best",
        )
    return {}, None
