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
