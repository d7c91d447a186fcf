"""What the workbench shows for one version of the text: problems, then the figures, as report text.

Pure functions run in the screen's thread workers: each asks the core (``oddsbench.core``) and
turns its result into rows with the report layer's own text, so the workbench does no arithmetic
and no number formatting. ``should_stop`` is the worker's cancel check; the core raises
``Cancelled`` when it says stop.
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

SUMMARY_FIGURES = ("house_edge", "return_to_player", "expected_steps")
LENGTH_POINTS = 12
SolveCancelled = Cancelled  # what the workers catch when a solve was cancelled

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
    """One round's figures as text rows, ready to show."""

    heading: str
    rows: tuple[tuple[str, str, str], ...]
    summary: tuple[tuple[str, str, str], ...]
    notes: tuple[str, ...]
    strategy: str | None


@dataclass(frozen=True)
class RoundFailure:
    """The ruleset is valid but this question cannot be answered (for example an undecided state)."""

    message: str


def read(text: str, source: str) -> Reading:
    result = read_ruleset_text(text, source)
    return Reading(result.ruleset, result.problems, result.members, result.member_tables)


def _game(ruleset: Ruleset) -> Game:
    return Game(ruleset.source, ruleset=ruleset)


def _work(should_stop: Callable[[], bool] | None) -> Work:
    return Work(should_stop=should_stop) if should_stop is not None else Work()


def _played(ruleset: Ruleset, strategy: str | None) -> tuple[str, ...]:
    """The strategy to play, for a game with decisions (a game without plays as written)."""
    return (strategy,) if strategy is not None and ruleset.has_decisions else ()


def solve_round_text(
    ruleset: Ruleset, strategy: str | None, should_stop: Callable[[], bool] | None = None
) -> RoundResult | RoundFailure:
    """The round's figures under ``strategy``; raises ``SolveCancelled`` when ``should_stop`` says so."""
    from oddsbench.core.rounds import round_figures
    from oddsbench.report.round_report import PERCENT_FIGURES, figure_cells, figure_label, round_rows

    try:
        results = round_figures(_game(ruleset), Settings(strategies=_played(ruleset, strategy)), _work(should_stop))
    except OddsbenchError as error:
        return RoundFailure(str(error))
    figures = results.columns[0].figures
    summary = tuple(
        (figure_label(name), *figure_cells(figures.figures[name], name in PERCENT_FIGURES, width=24))
        for name in SUMMARY_FIGURES
        if name in figures.figures
    )
    heading = f"{figures.title}: one round from {figures.start!r} ({figures.states} states)"
    if strategy and ruleset.has_decisions:
        heading += f", strategy {strategy!r}"
    return RoundResult(heading, tuple(round_rows(figures)), summary, figures.notes, strategy)


@dataclass(frozen=True)
class StrategiesResult:
    """The named strategies side by side (``exact | decimal`` cells) and the best play with its certificate."""

    heading: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    best: str
    goal: str


def strategies_text(
    ruleset: Ruleset, goal: str, should_stop: Callable[[], bool] | None = None
) -> StrategiesResult | RoundFailure:
    """``oddsbench solve`` under every named strategy and ``oddsbench best`` for ``goal``, as report text."""
    from oddsbench.core.rounds import best_play, round_figures
    from oddsbench.report.cautions import caution_block
    from oddsbench.report.strategy_report import best_text, comparison_rows

    if not ruleset.has_decisions:
        return RoundFailure(
            "this game has no decision states, so there is no play to choose: "
            "open one with choices (pig-turn.toml, lamplighter-ladder.toml, a dealer's game)"
        )
    headers: tuple[str, ...] = ()
    rows: tuple[tuple[str, ...], ...] = ()
    heading = f"{ruleset.title}: no named strategies in the file ([strategies] table)"
    game, work = _game(ruleset), _work(should_stop)
    try:
        if ruleset.strategies:
            comparison = round_figures(game, Settings(), work)
            names, table = comparison_rows(comparison)
            headers, rows = tuple(names), tuple(tuple(row) for row in table)
            heading = (
                f"{ruleset.title}: one round from {comparison.start!r} under each of "
                f"{len(comparison.columns)} named strategies (cells: exact | decimal)"
            )
        best = best_text(best_play(game, Settings(best_goal=goal), work).best)
    except OddsbenchError as error:
        return RoundFailure(str(error))
    block = caution_block()
    if best.endswith(block):  # the cautions are on screen already, below every view
        best = best[: -len(block)].rstrip()
    return StrategiesResult(heading, headers, rows, best, goal)


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
    """Bankroll plans side by side (``exact | decimal`` cells) and the series for the two charts
    (none with no goal: such play only ends at ruin)."""

    heading: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    series: tuple[PlanSeries, ...]
    notes: tuple[str, ...]


def parse_plans(text: str) -> tuple[str, ...]:
    """Plans typed as ``timid, bold, flat:2``, read by the one plan grammar (its messages are the CLI's)."""
    from oddsbench.core.plans import parse_plans as read_plans

    return tuple(plan.spelling for plan in read_plans(text))


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
    """Every plan's session figures (with the file's goal, or none), its goal-chance series and its chance
    of still playing after n rounds."""
    from oddsbench.core.session import sessions, still_playing

    if not plans:
        return RoundFailure("type one or more plans to compare, e.g. timid, bold, flat:2, martingale:1:6")
    work = _work(should_stop)
    settings = Settings(strategies=_played(ruleset, strategy), session=SessionRequest(plans=tuple(plans)))
    try:
        results = sessions(_game(ruleset), settings, work)
        if results.no_goal:
            return _no_goal_result(results)
        series = []
        for result in results.bounded:
            # sample points for the chart only (decimals for a picture: the exact figures are in the table)
            horizon = max(1, int(result.figures["expected_rounds"].decimal * 3))
            points = sorted({max(1, horizon * k // (LENGTH_POINTS - 1)) for k in range(LENGTH_POINTS)})
            playing = still_playing(results, result.plan, points, work)
            bankrolls = tuple(float(b) for b in _floats(result.series_bankrolls()))
            series.append(PlanSeries(result.plan, bankrolls, result.goal_series, (0, *points), (1.0, *playing)))
    except OddsbenchError as error:
        return RoundFailure(str(error))
    from oddsbench.report.session_report import session_rows

    rows = tuple(tuple(row) for row in session_rows(results.bounded))
    settings_now = results.settings
    heading = (
        f"{ruleset.title}: sessions from bankroll {shown_money(settings_now.bankroll)} to goal "
        f"{shown_money(settings_now.goal)}, {len(plans)} plan(s) (cells: exact | decimal)"
    )
    notes = tuple(f"{r.plan}: {note}" for r in results.bounded for note in r.notes)
    return SessionsResult(heading, ("quantity", *plans), rows, tuple(series), notes)


def _no_goal_result(results) -> SessionsResult:
    """Play with no goal: each plan's ruin figures side by side, one ``exact | decimal`` cell each."""
    from oddsbench.report.no_goal_report import no_goal_rows

    labels: list[str] = []
    cells: list[dict[str, str]] = []
    for plan in results.plans:
        by_label = {}
        for label, exact, decimal in no_goal_rows(plan.no_goal):
            by_label[label] = " | ".join(part for part in (exact, decimal) if part)
            if label not in labels:
                labels.append(label)
        cells.append(by_label)
    rows = tuple((label, *(column.get(label, "-") for column in cells)) for label in labels)
    heading = (
        f"{results.title}: play with no goal from bankroll {shown_money(results.settings.bankroll)}, "
        f"until ruin, {len(results.plans)} plan(s) (cells: exact | decimal; no charts: play only ends at ruin)"
    )
    notes = tuple(f"{plan.plan}: {note}" for plan in results.plans for note in plan.notes)
    return SessionsResult(heading, ("quantity", *(plan.plan for plan in results.plans)), rows, (), notes)


def shown_money(value) -> str:
    from oddsbench.report.numbers_text import exact_text

    return exact_text(value)


def _floats(values) -> list[float]:
    from oddsbench.model.numbers import to_float

    return [to_float(value) for value in values]
