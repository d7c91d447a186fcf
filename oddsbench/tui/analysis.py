"""What the workbench shows for one version of the text: problems, then the figures, as report text.

Pure functions run in the screen's thread workers: each asks the core (``oddsbench.core``) and
turns its result into tables with the report layer's own text (``report/figure_table.py``), so
the workbench does no arithmetic and no number formatting. ``should_stop`` is the worker's cancel
check; the core raises ``Cancelled`` when it says stop.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass, field
from typing import Any

from oddsbench.core.game import Game
from oddsbench.core.settings import SessionRequest, Settings
from oddsbench.core.work import Cancelled, Work
from oddsbench.model.defaults import DEFAULT_PLANS
from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.families import FamilyMember
from oddsbench.model.load import read_ruleset_text
from oddsbench.model.ruleset import Ruleset
from oddsbench.report.figure_table import FigureTable
from oddsbench.tui.setting_ways import problem_line

SolveCancelled = Cancelled  # what the workers catch when a solve was cancelled
LENGTH_POINTS = 12  # points of the "still playing" chart

__all__ = ["DEFAULT_PLANS", "SolveCancelled"]


@dataclass(frozen=True)
class Reading:
    """The text read as ``oddsbench check`` reads a file: the ruleset (None if any error) and every
    problem; the family members and their tables for the family forms."""

    ruleset: Ruleset | None
    problems: tuple[Problem, ...]
    members: Mapping[str, FamilyMember] = field(default_factory=dict)
    member_tables: Mapping[str, Mapping[str, Any]] = field(default_factory=dict)


@dataclass(frozen=True)
class RoundResult:
    """One round's figures as a table of text, the one-line summary, the notes, and the return
    table: the net law and each paying step's share of the expected net, with their headings."""

    heading: str
    table: FigureTable
    summary: tuple[tuple[str, str, str], ...]
    notes: tuple[str, ...]
    strategy: str | None
    law_heading: str = ""
    law: FigureTable | None = None
    shares_heading: str = ""
    shares: FigureTable | None = None


@dataclass(frozen=True)
class RoundFailure:
    """The ruleset is valid but this question cannot be answered (for example an undecided state)."""

    message: str


def read(text: str, source: str) -> Reading:
    result = read_ruleset_text(text, source)
    return Reading(result.ruleset, result.problems, result.members, result.member_tables)


def _game(ruleset: Ruleset) -> Game:
    return Game(ruleset.source, ruleset=ruleset)


def _work(should_stop: Callable[[], bool] | None, progress: Callable[[int, int], None] | None = None) -> Work:
    if progress is None:
        return Work(should_stop=should_stop) if should_stop is not None else Work()
    return Work(should_stop=should_stop or (lambda: False), progress=progress)


def strategy_to_play(ruleset: Ruleset, strategy: str | None) -> str | None:
    """The strategy the views play: the one selected (``s``), else the file's first where the game has
    decisions and the selected one is not (or no longer) in the file."""
    if ruleset.has_decisions and strategy not in {s.name for s in ruleset.strategies}:
        return ruleset.strategies[0].name if ruleset.strategies else None
    return strategy


def _played(ruleset: Ruleset, strategy: str | None) -> tuple[str, ...]:
    """The strategy to play, for a game with decisions (a game without plays as written)."""
    return (strategy,) if strategy is not None and ruleset.has_decisions else ()


def solve_round_text(
    ruleset: Ruleset, strategy: str | None, should_stop: Callable[[], bool] | None = None
) -> RoundResult | RoundFailure:
    """The round's figures under ``strategy``; raises ``SolveCancelled`` when ``should_stop`` says so."""
    from oddsbench.core.rounds import round_figures
    from oddsbench.report.figure_table import net_law_table, round_table, shares_table
    from oddsbench.report.return_table_report import SHARES_TITLE, law_title
    from oddsbench.report.round_report import round_heading, summary_items

    try:
        results = round_figures(_game(ruleset), Settings(strategies=_played(ruleset, strategy)), _work(should_stop))
    except OddsbenchError as error:
        return RoundFailure(problem_line(error))
    figures = results.columns[0].figures
    played = strategy if strategy and ruleset.has_decisions else None
    summary = tuple(summary_items(figures, played))
    shares = shares_table(figures)
    return RoundResult(
        round_heading(figures, played),
        round_table(figures),
        summary,
        figures.notes,
        strategy,
        law_title(figures),
        net_law_table(figures),
        SHARES_TITLE if shares else "",
        shares,
    )


@dataclass(frozen=True)
class StrategyVerdict:
    """One named strategy held against the best play: a sentence, and where it loses (a table)."""

    strategy: str
    summary: str
    table: FigureTable
    notes: tuple[str, ...]


@dataclass(frozen=True)
class StrategiesResult:
    """Every named strategy side by side with the best play, the best play's certificate, and each
    strategy held against the best play."""

    heading: str
    table: FigureTable
    best: str
    goal: str
    checks: tuple[StrategyVerdict, ...] = ()

    def check_of(self, strategy: str | None) -> StrategyVerdict | None:
        for verdict in self.checks:
            if verdict.strategy == strategy:
                return verdict
        return self.checks[0] if self.checks else None


def strategies_text(
    ruleset: Ruleset, goal: str, should_stop: Callable[[], bool] | None = None
) -> StrategiesResult | RoundFailure:
    """``oddsbench solve`` under every named strategy, ``oddsbench best`` for ``goal`` and
    ``oddsbench best --check-strategy`` for each named strategy, as report text."""
    from oddsbench.core.rounds import best_play, check_strategy, round_figures
    from oddsbench.report.figure_table import side_by_side
    from oddsbench.report.strategy_report import best_summary, check_summary, improvement_table

    if not ruleset.has_decisions:
        return RoundFailure(
            "this game has no decision states, so there is no play to choose: "
            "open one with choices (pig-turn.toml, lamplighter-ladder.toml, a dealer's game)"
        )
    game, work = _game(ruleset), _work(should_stop)
    settings = Settings(best_goal=goal)
    try:
        best = best_play(game, settings, work).best
        columns = []
        if ruleset.strategies:
            comparison = round_figures(game, Settings(), work)
            columns = [(column.strategy or "as written", column.figures) for column in comparison.columns]
        if best.figures is not None:
            columns.append((f"best ({goal})", best.figures))
        checks = []
        for strategy in ruleset.strategies:
            check = check_strategy(game, strategy.name, settings, work).checks[0]
            checks.append(StrategyVerdict(strategy.name, check_summary(check), improvement_table(check), check.notes))
    except OddsbenchError as error:
        return RoundFailure(problem_line(error))
    named = len(ruleset.strategies)
    heading = (
        f"{ruleset.title}: one round from {best.start!r} under each of {named} named strateg"
        f"{'y' if named == 1 else 'ies'} and the best play for {goal}"
        if named
        else f"{ruleset.title}: no named strategies in the file ([strategies] table); the best play for {goal}"
    )
    return StrategiesResult(heading, side_by_side(columns), best_summary(best), goal, tuple(checks))


@dataclass(frozen=True)
class PlanSeries:
    """What the charts draw for one plan: the core's own decimals, nothing derived here."""

    plan: str
    bankrolls: tuple[float, ...]
    goal_chance: tuple[float, ...]
    rounds: tuple[int, ...]
    still_playing: tuple[float, ...]


@dataclass(frozen=True)
class SessionsResult:
    """Bankroll plans side by side as a table of text, the series for the two charts (none with no
    goal: such play only ends at ruin), the chart ticks, and the notes."""

    heading: str
    table: FigureTable
    series: tuple[PlanSeries, ...]
    notes: tuple[str, ...]
    bankroll: float | None = None
    bankroll_text: str = ""
    bankroll_ticks: tuple[tuple[float, str], ...] = ()
    round_ticks: tuple[tuple[float, str], ...] = ()

    @property
    def plans(self) -> tuple[str, ...]:
        return self.table.columns


def parse_plans(text: str) -> tuple[str, ...]:
    """Plans typed as ``timid, bold, flat:2``, read by the one plan grammar, in the workbench's words."""
    from oddsbench.core.plans import parse_plans as read_plans

    return tuple(plan.spelling for plan in read_plans(text))


NO_BANKROLL = "no bankroll yet: set bankroll (and goal, or none) under Session in the Edit view (F2)"


def session_settings_of(ruleset: Ruleset):
    """The file's ``[session]`` table as settings (raises OddsbenchError naming the field)."""
    from oddsbench.core.session import session_settings

    return session_settings(_game(ruleset), None)


def sessions_text(
    ruleset: Ruleset,
    strategy: str | None,
    plans: tuple[str, ...],
    should_stop: Callable[[], bool] | None = None,
) -> SessionsResult | RoundFailure:
    """Every plan's session figures (with the file's goal, or none), beside each plan's ruin chance
    with no goal where the plan can play without one; its goal-chance series and its chance of still
    playing after n rounds."""
    from oddsbench.core.session import sessions

    if not plans:
        return RoundFailure("type one or more plans to compare, e.g. timid, bold, flat:2, martingale:1:6")
    if "bankroll" not in (ruleset.session or {}):
        return RoundFailure(NO_BANKROLL)
    work = _work(should_stop)
    settings = Settings(strategies=_played(ruleset, strategy), session=SessionRequest(plans=tuple(plans)))
    try:
        results = sessions(_game(ruleset), settings, work)
        if results.no_goal:
            return _no_goal_result(results)
        without_goal = _without_goal(ruleset, strategy, plans, work)
        return _bounded_result(results, without_goal, work)
    except OddsbenchError as error:
        return RoundFailure(problem_line(error))


def _without_goal(ruleset: Ruleset, strategy: str | None, plans: tuple[str, ...], work: Work):
    """The same plans played with no goal (only those whose bet stays bounded), for the rows beside."""
    from oddsbench.core.plans import parse_plan
    from oddsbench.core.session import sessions

    playable = []
    for spelling in plans:
        try:
            parse_plan(spelling, no_goal=True)
        except OddsbenchError:
            continue
        playable.append(spelling)
    if not playable:
        return None
    request = SessionRequest(goal="none", plans=tuple(playable))
    try:
        return sessions(_game(ruleset), Settings(strategies=_played(ruleset, strategy), session=request), work)
    except OddsbenchError:
        return None  # the bounded figures stand alone: the rows beside say nothing then


def _bounded_result(results, without_goal, work: Work) -> SessionsResult:
    from oddsbench.core.session import still_playing
    from oddsbench.report.chart_ticks import nice_ticks
    from oddsbench.report.numbers_text import exact_text
    from oddsbench.report.session_report import no_goal_rows_beside, session_table

    table = session_table(results.bounded)
    if without_goal is not None:
        table = no_goal_rows_beside(table, without_goal)
    series = []
    longest = max(result.figures["expected_rounds"].decimal for result in results.bounded)
    round_ticks = nice_ticks(0, max(1.0, 3 * longest))
    top = int(round_ticks[-1][0])
    points = {max(1, top * k // (LENGTH_POINTS - 1)) for k in range(LENGTH_POINTS)}
    points = sorted(points | {int(t) for t, _ in round_ticks if t >= 1})
    for result in results.bounded:
        playing = still_playing(results, result.plan, points, work)
        bankrolls = tuple(_floats(result.series_bankrolls()))
        series.append(PlanSeries(result.plan, bankrolls, result.goal_series, (0, *points), (1.0, *playing)))
    settings = results.settings
    heading = (
        f"{results.title}: sessions from bankroll {exact_text(settings.bankroll)} to goal "
        f"{exact_text(settings.goal)}, {len(results.plans)} plan(s)"
    )
    notes = tuple(f"{r.plan}: {note}" for r in results.bounded for note in r.notes)
    bankroll = _floats([settings.bankroll])[0]
    goal_ticks = nice_ticks(0, _floats([settings.goal])[0])
    return SessionsResult(
        heading,
        table,
        tuple(series),
        notes,
        bankroll,
        exact_text(settings.bankroll),
        tuple(goal_ticks),
        tuple(round_ticks),
    )


def _no_goal_result(results) -> SessionsResult:
    """Play with no goal: each plan's ruin figures side by side."""
    from oddsbench.report.no_goal_report import no_goal_table
    from oddsbench.report.numbers_text import exact_text

    table = no_goal_table([(plan.plan, plan.no_goal) for plan in results.plans])
    heading = (
        f"{results.title}: play with no goal from bankroll {exact_text(results.settings.bankroll)}, until ruin, "
        f"{len(results.plans)} plan(s) (no charts: play only ends at ruin)"
    )
    notes = tuple(f"{plan.plan}: {note}" for plan in results.plans for note in plan.notes)
    return SessionsResult(heading, table, (), notes)


def _floats(values) -> list[float]:
    from oddsbench.model.numbers import to_float

    return [to_float(value) for value in values]
