"""Bankroll sessions: one entry for a bounded goal and for no goal, every plan side by side.

``sessions(game, settings, work) -> SessionResults``. The round is the game's inline round or the
ruleset's round under a named strategy; the session settings are ``settings.session`` over the
ruleset's ``[session]`` table. With a goal each plan's bankroll chain is solved
(``strategy.session``); with ``goal = "none"`` each plan is played until ruin on the bankroll
walk (only plans whose bet stays bounded). Each plan's result says which.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass
from typing import TYPE_CHECKING

from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.core.game import Game
from oddsbench.core.settings import DEFAULTS, SessionRequest, Settings
from oddsbench.core.work import NO_WORK, Work, budgeted
from oddsbench.model import budget as budgets
from oddsbench.model.defaults import DEFAULT_PLANS, NO_GOAL_DEFAULT_PLANS
from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.ruleset import Ruleset
from oddsbench.strategy.plans import Plan, parse_plan
from oddsbench.strategy.session import SessionFigures, SessionSettings, merge_settings, settings_from_table

if TYPE_CHECKING:
    from oddsbench.strategy.no_goal_play import NoGoalFigures

BOUNDED = "bounded"
NO_GOAL_KIND = "none"


@dataclass(frozen=True)
class PlanResult:
    """One plan's session: ``bounded`` figures when there is a goal, ``no_goal`` figures when play runs until ruin."""

    plan: str
    bounded: SessionFigures | None = None
    no_goal: NoGoalFigures | None = None

    @property
    def goal(self) -> str:
        """``"bounded"`` (a goal to reach) or ``"none"`` (play until ruin)."""
        return BOUNDED if self.bounded is not None else NO_GOAL_KIND

    @property
    def notes(self) -> tuple[str, ...]:
        if self.bounded is not None:
            return self.bounded.notes
        return tuple(self.no_goal.ruin.notes) if self.no_goal is not None else ()


@dataclass(frozen=True)
class SessionResults:
    """Every plan's session from one round and one set of settings (``settings.goal`` None: no goal)."""

    title: str
    source: str
    distribution: RoundDistribution
    settings: SessionSettings
    plans: tuple[PlanResult, ...]
    strategy: str | None = None
    rounds: int | None = None

    @property
    def no_goal(self) -> bool:
        return self.settings.no_goal

    @property
    def bounded(self) -> list[SessionFigures]:
        """The figures of every plan with a goal (empty with no goal)."""
        return [plan.bounded for plan in self.plans if plan.bounded is not None]

    def of(self, plan: str) -> PlanResult:
        for result in self.plans:
            if result.plan == plan:
                return result
        raise KeyError(f"no plan {plan!r} (plans: {', '.join(p.plan for p in self.plans)})")


def session_settings(game: Game, request: SessionRequest | None) -> SessionSettings:
    """The request's amounts over the ruleset's ``[session]`` table; bankroll and goal (or ``none``) required."""
    table = dict(game.ruleset.session) if game.ruleset is not None else {}
    defaults = settings_from_table(table, game.source)
    return merge_settings(defaults, (request or SessionRequest()).overrides(), game.source)


def session_round(game: Game, strategy: str | None, max_states: int | None = None) -> RoundDistribution:
    """The round a session repeats: the inline round, or the ruleset's round under a named strategy."""
    if game.round is not None:
        if strategy is not None:
            raise SettingProblem(
                f"{game.source}: a strategy needs a ruleset file; an inline round has no decisions", "strategy"
            )
        return game.round
    from oddsbench.strategy.compare import policy_of, starting_at

    played = starting_at(game.ruleset, None, max_states)
    return repeated_round(played, policy_of(played, strategy))


def repeated_round(ruleset: Ruleset, policy: dict[str, str]) -> RoundDistribution:
    """The exact round distribution a session repeats, from the ruleset's start under ``policy``.
    Sessions have no decimal stand-in for it, so it is a part of its own with its own piece of
    exact arithmetic's time (``exact_part``): the time spent reading the file never starves it."""
    from oddsbench.solve.round_distribution import round_distribution_of

    with budgets.exact_part(1):
        return round_distribution_of(ruleset, policy)


@budgeted
def sessions(game: Game, settings: Settings = DEFAULTS, work: Work = NO_WORK) -> SessionResults:
    """Every plan of ``settings.session`` (default timid and bold), with a goal or with none."""
    request = settings.session or SessionRequest()
    session = session_settings(game, request)
    strategy = _session_strategy(game, settings)
    distribution = session_round(game, strategy, settings.max_states)
    return solve_plans(game, distribution, session, settings, work, strategy)


def _session_strategy(game: Game, settings: Settings) -> str | None:
    if len(settings.strategies) > 1:
        raise OddsbenchError(f"{game.source}: sessions play one strategy in each round, not {len(settings.strategies)}")
    return settings.strategies[0] if settings.strategies else None


def solve_plans(
    game: Game,
    distribution: RoundDistribution,
    session: SessionSettings,
    settings: Settings,
    work: Work = NO_WORK,
    strategy: str | None = None,
) -> SessionResults:
    """Solve each plan on one round distribution (the report and the simulation bring their own round)."""
    request = settings.session or SessionRequest()
    spellings = request.plans or (NO_GOAL_DEFAULT_PLANS if session.no_goal else DEFAULT_PLANS)
    plans = [parse_plan(spelling, no_goal=session.no_goal) for spelling in spellings]
    if session.no_goal and settings.rounds is not None:
        raise SettingProblem(
            f"{game.source}: a number of rounds needs a goal; with no goal the session only ends at ruin",
            "rounds",
            "goal",
        )
    results = []
    for done, plan in enumerate(plans):
        work.check()
        with budgets.exact_part(len(plans)):  # each plan its own piece of exact arithmetic's time
            results.append(_one_plan(distribution, session, plan, settings, request, work))
        work.done(done + 1, len(plans))
    return SessionResults(game.title, game.source, distribution, session, tuple(results), strategy, settings.rounds)


def _one_plan(
    distribution: RoundDistribution,
    session: SessionSettings,
    plan: Plan,
    settings: Settings,
    request: SessionRequest,
    work: Work,
) -> PlanResult:
    played = for_plan(session, plan)
    if session.no_goal:
        return PlanResult(plan.spelling, no_goal=_no_goal(distribution, played, plan, request, work))
    from oddsbench.strategy.session import analyse_session

    figures = analyse_session(
        distribution, played, plan, settings.session_exact_limit, settings.rounds, work.should_stop
    )
    return PlanResult(plan.spelling, bounded=figures)


def for_plan(session: SessionSettings, plan: Plan) -> SessionSettings:
    """The settings one plan is played with: with no unit set, the session rules' default unit for
    this plan's own amounts (so ``flat:1/2`` bets halves; per plan: another plan never changes it)."""
    if session.unit is not None:
        return session
    from dataclasses import replace

    from oddsbench.chain.session_rules import default_unit

    return replace(session, unit=default_unit(session.min_bet, plan.fixed_amounts))


def _no_goal(
    distribution: RoundDistribution, session: SessionSettings, plan: Plan, request: SessionRequest, work: Work
) -> NoGoalFigures:
    """One plan played until ruin, with the session rules (cut bets, the ruin level, table limits)."""
    from oddsbench.strategy.no_goal_play import solve_no_goal

    return solve_no_goal(
        distribution,
        plan,
        session.bankroll,
        floor=session.floor or 0,
        min_bet=session.min_bet,
        max_bet=session.max_bet,
        unit=session.unit,
        digits=request.digits,
        check=request.check,
        should_stop=work.should_stop,
    )


@budgeted
def still_playing(results: SessionResults, plan: str, rounds: Sequence[int], work: Work = NO_WORK) -> tuple[float, ...]:
    """The chance that a plan's session is still going after each number of rounds (decimals: for a chart).

    Each is the session solved in floating point with a horizon of n rounds (``within_playing_probability``).
    """
    from oddsbench.strategy.session import analyse_session

    if results.no_goal:
        raise OddsbenchError(f"{results.source}: with no goal a session only ends at ruin: no length distribution")
    parsed = parse_plan(plan)
    played = for_plan(results.settings, parsed)
    chances = []
    for n in rounds:
        work.check()
        figures = analyse_session(results.distribution, played, parsed, 0, n, work.should_stop)
        chances.append(figures.figures["within_playing_probability"].decimal)
    return tuple(chances)
