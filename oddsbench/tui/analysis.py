"""What the workbench shows for one version of the text: problems, then the round's figures.

Pure functions over the engines and the report layer, run in a worker thread by the app. The
figures are the report layer's own text (``round_rows``, ``figure_cells``): the workbench does
no arithmetic and no number formatting of its own.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.model.load import read_ruleset_text
from oddsbench.model.ruleset import Ruleset

SUMMARY_FIGURES = ("house_edge", "return_to_player", "expected_steps")


@dataclass(frozen=True)
class Reading:
    """The text read as ``oddsbench check`` reads a file: the ruleset (None if any error) and every problem."""

    ruleset: Ruleset | None
    problems: tuple[Problem, ...]


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
    """The ruleset is valid but this round cannot be solved (for example an undecided state)."""

    message: str


def read(text: str, source: str) -> Reading:
    result = read_ruleset_text(text, source)
    return Reading(result.ruleset, result.problems)


def policy_of(ruleset: Ruleset, strategy: str | None) -> dict[str, str]:
    """The actions a named strategy takes in each decision state (empty for a game without decisions)."""
    if strategy is None or not ruleset.has_decisions:
        return {}
    chosen = ruleset.strategy(strategy)
    return {state.name: action for state in ruleset.states if state.is_decision if (action := chosen.action_for(state))}


def solve_round_text(
    ruleset: Ruleset, strategy: str | None, should_stop: Callable[[], bool] | None = None
) -> RoundResult | RoundFailure:
    """Build and solve the round chain; raises SolveCancelled when ``should_stop`` says so."""
    from oddsbench.chain.round_chain import build_round_chain
    from oddsbench.report.round_report import PERCENT_FIGURES, figure_cells, figure_label, round_rows
    from oddsbench.solve.round import solve_round

    try:
        chain = build_round_chain(ruleset, policy_of(ruleset, strategy))
    except OddsbenchError as error:
        return RoundFailure(str(error))
    figures = solve_round(chain, should_stop=should_stop)
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
    from oddsbench.report.cautions import caution_block
    from oddsbench.report.strategy_report import best_text, comparison_rows
    from oddsbench.strategy.best_policy import best_policy
    from oddsbench.strategy.compare import compare_strategies

    if not ruleset.has_decisions:
        return RoundFailure(
            "this game has no decision states, so there is no play to choose: "
            "open one with choices (pig-turn.toml, lamplighter-ladder.toml, a dealer's game)"
        )
    headers: tuple[str, ...] = ()
    rows: tuple[tuple[str, ...], ...] = ()
    heading = f"{ruleset.title}: no named strategies in the file ([strategies] table)"
    try:
        if ruleset.strategies:
            comparison = compare_strategies(ruleset, should_stop=should_stop)
            names, table = comparison_rows(comparison)
            headers, rows = tuple(names), tuple(tuple(row) for row in table)
            heading = (
                f"{ruleset.title}: one round from {comparison.start!r} under each of "
                f"{len(comparison.strategies)} named strategies (cells: exact | decimal)"
            )
        best = best_text(best_policy(ruleset, goal, should_stop=should_stop))
    except OddsbenchError as error:
        return RoundFailure(str(error))
    block = caution_block()
    if best.endswith(block):  # the cautions are on screen already, below every view
        best = best[: -len(block)].rstrip()
    return StrategiesResult(heading, headers, rows, best, goal)


DEFAULT_PLANS = ("timid", "bold")
LENGTH_POINTS = 12


@dataclass(frozen=True)
class PlanSeries:
    """What the charts draw for one plan: the engines' own decimals, nothing derived here."""

    plan: str
    bankrolls: tuple[float, ...]
    goal_chance: tuple[float, ...]
    rounds: tuple[int, ...]
    still_playing: tuple[float, ...]


@dataclass(frozen=True)
class SessionsResult:
    """Bankroll plans side by side (``exact | decimal`` cells) and the series for the two charts."""

    heading: str
    headers: tuple[str, ...]
    rows: tuple[tuple[str, ...], ...]
    series: tuple[PlanSeries, ...]
    notes: tuple[str, ...]


def parse_plans(text: str) -> tuple[str, ...]:
    """Plans typed as ``timid, bold, flat:2``; each is checked by ``strategy.plans.parse_plan``."""
    from oddsbench.strategy.plans import parse_plan

    spellings = tuple(part.strip() for part in text.replace(";", ",").split(",") if part.strip())
    for spelling in spellings:
        parse_plan(spelling)  # raises OddsbenchError with the CLI's own message
    return spellings


def session_settings_of(ruleset: Ruleset):
    """The file's ``[session]`` table as settings (raises OddsbenchError naming the field)."""
    from oddsbench.strategy.session import merge_settings, settings_from_table

    return merge_settings(settings_from_table(ruleset.session, ruleset.source), {}, ruleset.source)


def sessions_text(
    ruleset: Ruleset,
    strategy: str | None,
    plans: tuple[str, ...],
    should_stop: Callable[[], bool] | None = None,
) -> SessionsResult | RoundFailure:
    """Every plan's session figures, its goal-chance series and its chance of still playing after n rounds."""
    from oddsbench.report.session_report import session_rows
    from oddsbench.solve.round_distribution import round_distribution_of
    from oddsbench.strategy.session import analyse_session

    if not plans:
        return RoundFailure("type one or more plans to compare, e.g. timid, bold, flat:2, martingale:1:6")
    try:
        settings = session_settings_of(ruleset)
        distribution = round_distribution_of(ruleset, policy_of(ruleset, strategy))
        results = [analyse_session(distribution, settings, plan, should_stop=should_stop) for plan in plans]
        series = []
        for result in results:
            # sample points for the chart only (decimals for a picture: the exact figures are in the table)
            horizon = max(1, int(result.figures["expected_rounds"].decimal * 3))
            points = sorted({max(1, horizon * k // (LENGTH_POINTS - 1)) for k in range(LENGTH_POINTS)})
            playing = [
                analyse_session(distribution, settings, result.plan, exact_limit=0, rounds=n, should_stop=should_stop)
                .figures["within_playing_probability"]
                .decimal
                for n in points
            ]
            series.append(
                PlanSeries(
                    result.plan,
                    tuple(float(b) for b in _floats(result.series_bankrolls())),
                    result.goal_series,
                    (0, *points),
                    (1.0, *playing),
                )
            )
    except OddsbenchError as error:
        return RoundFailure(str(error))
    rows = tuple(tuple(row) for row in session_rows(results))
    heading = (
        f"{ruleset.title}: sessions from bankroll {shown_money(settings.bankroll)} to goal "
        f"{shown_money(settings.goal)}, {len(plans)} plan(s) (cells: exact | decimal)"
    )
    notes = tuple(f"{r.plan}: {note}" for r in results for note in r.notes)
    return SessionsResult(heading, ("quantity", *plans), rows, tuple(series), notes)


def shown_money(value) -> str:
    from oddsbench.report.numbers_text import exact_text

    return exact_text(value)


def _floats(values) -> list[float]:
    from oddsbench.model.numbers import to_float

    return [to_float(value) for value in values]
