"""One call for a whole bounded session: a round's distribution, the session settings and a plan.

``analyse_session(distribution, settings, plan) -> SessionFigures`` solves it;
``session_chain(distribution, settings, plan)`` is the one builder of the chain it solves (the
simulation plays the same chain). The settings (``SessionSettings``) also say when there is no
goal; the core sends those plans to the no-goal engines instead.
"""

from __future__ import annotations

from collections.abc import Callable, Mapping
from dataclasses import dataclass, field, replace
from typing import Any, NoReturn

import numpy as np

from oddsbench.chain.bankroll import BankrollChain, BankrollGrid, build_bankroll_chain, make_grid
from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.model.defaults import NO_GOAL, SESSION_EXACT_LIMIT, SESSION_SETTING_NAMES, is_no_goal
from oddsbench.model.errors import OddsbenchError, SettingError
from oddsbench.model.figure import Figure
from oddsbench.model.float_series import FloatSeries
from oddsbench.model.numbers import QQ, Rational, is_integer, text, to_float, to_int
from oddsbench.solve.session import FinalValue, solve_session
from oddsbench.strategy.plan_bets import planned_bets
from oddsbench.strategy.plans import Plan, parse_plan

SETTING_NAMES = SESSION_SETTING_NAMES
MONEY_NAMES = ("bankroll", "goal", "floor", "min_bet", "max_bet", "unit")


@dataclass(frozen=True)
class SessionSettings:
    """Money amounts are exact; ``goal`` None is play with no goal (until ruin); ``unit`` is the
    betting unit (None: the default unit of the session rules)."""

    bankroll: Rational
    goal: Rational | None
    floor: Rational = QQ(0)
    min_bet: Rational | None = None
    max_bet: Rational | None = None
    unit: Rational | None = None
    max_rounds: int | None = None

    @property
    def no_goal(self) -> bool:
        return self.goal is None

    def grid(self, distribution: RoundDistribution) -> BankrollGrid:
        if self.goal is None:
            raise OddsbenchError("a session with no goal has no bankroll grid: it is solved as a walk until ruin")
        return make_grid(distribution, self.bankroll, self.goal, self.floor, self.min_bet, self.max_bet, self.unit)


@dataclass(frozen=True)
class SessionFigures:
    """Every figure of one plan's session; ``goal_series[k]`` is the goal chance from bankroll k * step."""

    plan: str
    figures: dict[str, Figure]
    final: tuple[FinalValue, ...]
    goal_series: FloatSeries  # read-only decimals, one per bankroll step (a sequence of floats)
    goal_series_exact: tuple[Rational, ...] | None
    step: Rational
    states: int
    after_rounds: tuple[FinalValue, ...] = ()
    rounds: int | None = None
    notes: tuple[str, ...] = field(default=())
    goal_series_log10: np.ndarray | None = field(default=None, compare=False)  # log10 of each value (-inf: 0)

    @property
    def exact(self) -> bool:
        return all(f.exact is not None for f in self.figures.values())

    def series_bankrolls(self) -> list[Rational]:
        return [self.step * k for k in range(len(self.goal_series))]

    def series_figure(self, k: int) -> Figure:
        """The goal chance from bankroll k * step as a figure: exact where known, its log10 where the
        decimal is below the float range (0.0 in ``goal_series``)."""
        exact = self.goal_series_exact[k] if self.goal_series_exact is not None else None
        decimal = self.goal_series[k]
        log10 = None
        if exact is None and decimal == 0 and self.goal_series_log10 is not None:
            value = float(self.goal_series_log10[k])
            log10 = value if value != float("-inf") else None
        return Figure(exact, decimal, log10)


def settings_from_table(table: Mapping[str, Any], source: str) -> dict:
    """Exact values from a ruleset's raw ``[session]`` table (one clear line per bad field);
    ``goal = "none"`` stays the word ``none``."""
    from oddsbench.model.expr import ExpressionError, evaluate_text

    values: dict[str, Any] = {}
    for name, raw in table.items():
        if name not in SETTING_NAMES:
            _refuse(source, name, f"unknown setting (known: {', '.join(SETTING_NAMES)})")
        if name == "goal" and is_no_goal(raw):
            values[name] = NO_GOAL
            continue
        if isinstance(raw, bool) or not isinstance(raw, (int, float, str)):
            _refuse(source, name, f"expected a number, got {raw!r}")
        try:
            value = evaluate_text(raw if isinstance(raw, str) else repr(raw))
        except ExpressionError as error:
            _refuse(source, name, str(error))
        if name == "max_rounds":
            if not is_integer(value) or value < 1:
                _refuse(source, name, "expected a whole number of at least 1")
            value = to_int(value)
        values[name] = value
    return values


def _refuse(source: str, name: str, reason: str) -> NoReturn:
    raise SettingError(f"{source}: [session], {name}: {reason}", name, reason) from None


def merge_settings(defaults: Mapping[str, Any], overrides: Mapping[str, Any], source: str) -> SessionSettings:
    """Given values over the ruleset's defaults; a bankroll is required, and a goal (or ``none``)."""
    merged = {**defaults, **{k: v for k, v in overrides.items() if v is not None}}
    if "bankroll" not in merged:
        raise SettingError(
            f"{source}: a session needs a bankroll (or bankroll in the [session] table)",
            "bankroll",
            "needed: the money a session starts with",
        )
    if "goal" not in merged:
        raise SettingError(
            f"{source}: a session needs a goal (or goal in the [session] table)",
            "goal",
            'needed: the amount that ends a session, or "none" to play until ruin',
        )
    if is_no_goal(merged["goal"]):
        if merged.get("max_rounds") is not None:
            raise SettingError(
                f"{source}: with no goal play goes on until ruin; a time cap (max_rounds) needs a goal, or ask, with "
                "a goal, for the chance of ruin within a number of rounds",
                "max_rounds",
                'with goal "none" play goes on until ruin: a cap on rounds needs a goal amount',
            )
        merged["goal"] = None
    return SessionSettings(**merged)


@dataclass(frozen=True)
class PlannedChain:
    """The bankroll chain of one plan, the grid it lives on, and what choosing its bets found."""

    chain: BankrollChain
    grid: BankrollGrid
    notes: tuple[str, ...]


def session_chain(
    distribution: RoundDistribution,
    settings: SessionSettings,
    plan: Plan | str,
    exact_limit: int = SESSION_EXACT_LIMIT,
) -> PlannedChain:
    """The one builder of a plan's bankroll chain: solved by ``analyse_session``, played by the simulation."""
    plan = parse_plan(plan) if isinstance(plan, str) else plan
    grid = settings.grid(distribution)
    _require_room(grid, plan, distribution)
    notes: list[str] = []
    if plan.kind == "best":
        from oddsbench.strategy.bet_optimiser import optimise_bets

        bold, _, _ = planned_bets(replace(plan, kind="bold"), distribution, grid)
        bets, certificate = optimise_bets(distribution, grid, bold[0], exact_limit)
        planned = bets[None, :]
        next_level = np.zeros((1, len(distribution.outcomes)), dtype=np.int64)
        notes.append(certificate.note())
        if settings.max_rounds is not None:
            notes.append("best: bets are chosen for the session without a time cap, then evaluated with it")
    else:
        planned, next_level, plan_notes = planned_bets(plan, distribution, grid)
        notes.extend(plan_notes)
    return PlannedChain(build_bankroll_chain(distribution, grid, planned, next_level), grid, tuple(notes))


# Measured peak while building a bankroll chain (numpy temporaries included).
CHAIN_BYTES_PER_EDGE = 48
CHAIN_BYTES_PER_STATE = 60


def _require_room(grid: BankrollGrid, plan: Plan, distribution: RoundDistribution) -> None:
    """Refuse, before building it, a bankroll chain that would not fit the memory budget."""
    from oddsbench.model import budget

    states = grid.width * plan.levels
    edges = states * len(distribution.outcomes)
    budget.require(
        f"the bankroll chain of {states:,} states ({plan.spelling})",
        memory=CHAIN_BYTES_PER_EDGE * edges + CHAIN_BYTES_PER_STATE * states,
    )


def analyse_session(
    distribution: RoundDistribution,
    settings: SessionSettings,
    plan: Plan | str,
    exact_limit: int = SESSION_EXACT_LIMIT,
    rounds: int | None = None,
    should_stop: Callable[[], bool] | None = None,
    planned: PlannedChain | None = None,
) -> SessionFigures:
    """Build the session chain for a plan (or take the one ``session_chain`` built), solve it, and add
    the plan's own figures."""
    plan = parse_plan(plan) if isinstance(plan, str) else plan
    planned = planned or session_chain(distribution, settings, plan, exact_limit)
    chain, grid = planned.chain, planned.grid
    notes = list(planned.notes)
    extra: dict[str, Figure] = {}
    if plan.kind == "kelly":
        from oddsbench.strategy.kelly import kelly_bet

        bet = kelly_bet(distribution, plan.amount)
        extra["bet_fraction"] = bet.fraction
        extra["growth_rate_bits"] = Figure(None, bet.growth_bits)
    solution = solve_session(chain, settings.max_rounds, rounds, exact_limit, should_stop)
    figures = dict(solution.figures)
    if chain.start >= 0:
        first = grid.unit * int(chain.bets[chain.start])
        figures["first_bet"] = Figure(first, to_float(first))
    figures.update(extra)
    edge = distribution.house_edge
    figures["house_edge"] = Figure(edge, to_float(edge))
    _identity_note(figures, notes)
    return SessionFigures(
        plan=plan.spelling,
        figures=figures,
        final=solution.final,
        goal_series=solution.goal_series,
        goal_series_exact=solution.goal_series_exact,
        step=grid.step,
        states=chain.size,
        after_rounds=solution.after_rounds,
        rounds=rounds,
        notes=tuple(notes) + solution.notes,
        goal_series_log10=solution.goal_series_log10,
    )


def _identity_note(figures: dict[str, Figure], notes: list[str]) -> None:
    """Optional stopping: E[final] - start = -(house edge) x E[staked]; say so if it fails."""
    left, right = figures["expected_net"], figures["edge_times_staked"]
    if left.exact is not None and right.exact is not None:
        if left.exact != right.exact:
            notes.append(
                f"check failed: expected net {text(left.exact)} differs from -(house edge) x staked {text(right.exact)}"
            )
        return
    scale = max(1.0, abs(left.decimal), abs(right.decimal))
    if abs(left.decimal - right.decimal) > 1e-6 * scale:
        notes.append(
            f"check: expected net {left.decimal:.10g} and -(house edge) x staked {right.decimal:.10g} differ "
            "by more than float rounding"
        )
