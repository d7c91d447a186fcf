"""Betting plans: how much to stake in each bankroll state (and plan level).

Spellings on the command line (``--plan``), all amounts in money, exact:

- ``flat:B``     the same bet B every round.
- ``timid``      always the table minimum (the smallest steps: longest sessions).
- ``bold``       stake what reaches the goal with one win, or everything if less (Dubins and
                 Savage's bold play).
- ``fraction:F`` a fixed fraction F of the current bankroll (proportional betting), rounded down
                 to the betting unit.
- ``kelly``      the growth-optimal fraction of the game (Kelly criterion); ``kelly:F`` bets F
                 times that fraction (``kelly:1/2`` is half Kelly).
- ``martingale:B:K`` start at B, double after each loss, at most K bets in a series; a win, or
                 a K-th loss, starts a new series at B. Pushes keep the bet.
- ``paroli:B:K`` start at B, double after each win, at most K bets in a run; a loss, or a K-th
                 win, returns to B. Pushes keep the bet.
- ``best``       the bet in every state that maximises the chance of reaching the goal
                 (policy iteration, ``strategy.bet_optimiser``).

With no goal (``--goal none``) only plans whose bet stays bounded are played: flat, timid and
the two capped progressions; ``timid`` takes no value anywhere (``timid:1/2`` is refused in the
same line by every command: the table minimum is a session setting, ``--min-bet``).

Every bet is then raised to the table minimum and cut to the table maximum and to what the
bankroll can cover for the round's worst case; a bankroll that cannot cover the minimum is ruin.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass

import numpy as np

from oddsbench.chain.bankroll import BankrollGrid
from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, is_integer, numerator, text, to_int

PLAN_HELP = (
    ("flat:B", "the same bet B every round"),
    ("timid", "always the table minimum bet"),
    ("bold", "stake what reaches the goal with one win, or everything if less (Dubins and Savage)"),
    ("fraction:F", "a fixed fraction F of the current bankroll, rounded down to the betting unit"),
    ("kelly", "the growth-optimal (Kelly) fraction of the bankroll; kelly:F bets F times it"),
    ("martingale:B:K", "double after a loss, from B, at most K bets in a series"),
    ("paroli:B:K", "double after a win, from B, at most K bets in a run"),
    ("best", "the bet in each state that maximises the chance of the goal (optimiser)"),
)
MAX_SERIES = 30
PROGRESSIONS = ("martingale", "paroli")
NO_GOAL_KINDS = ("flat", "timid", *PROGRESSIONS)  # plans whose bet stays bounded as the bankroll grows
NO_GOAL_PLANS = (
    "flat:B (a fixed bet of B), timid (always the table minimum), or a capped progression martingale:B:K / paroli:B:K"
)


@dataclass(frozen=True)
class Plan:
    """A parsed plan: its kind, an amount (bet or fraction) and a series length for progressions."""

    spelling: str
    kind: str
    amount: Rational | None = None
    series: int = 1

    @property
    def levels(self) -> int:
        return self.series if self.kind in PROGRESSIONS else 1

    @property
    def plays_without_goal(self) -> bool:
        """Whether the bet stays bounded however far the bankroll grows, so play with no goal is defined."""
        return self.kind in NO_GOAL_KINDS

    @property
    def fixed_amounts(self) -> tuple[Rational, ...]:
        """The money amounts the plan bets by itself (flat B, a progression's base B): the default unit follows them."""
        return (self.amount,) if self.kind in ("flat", *PROGRESSIONS) else ()


def parse_plan(spelling: str, no_goal: bool = False) -> Plan:
    """``flat:2``, ``kelly:1/2``, ``martingale:1:6``...: one clear line when it is not a plan.

    The one reader of plan text for every command and the workbench. With ``no_goal`` the plans
    whose bet grows with the bankroll (or that aim at a goal) are refused in one line.
    """
    from oddsbench.model.expr import ExpressionError, evaluate_text

    parts = [part.strip() for part in spelling.strip().split(":")]
    kind, args = parts[0].lower(), parts[1:]
    known = ", ".join(name for name, _ in PLAN_HELP)

    def value(field: str, what: str) -> Rational:
        try:
            number = evaluate_text(field)
        except ExpressionError as error:
            raise OddsbenchError(f"--plan {spelling!r}: {what}: {error}") from None
        if number <= 0:
            raise OddsbenchError(f"--plan {spelling!r}: {what} must be more than 0, got {text(number)}")
        return number

    def expect(count: int) -> None:
        if len(args) != count:
            raise OddsbenchError(f"--plan {spelling!r}: {kind} takes {count} value(s) after ':' (plans: {known})")

    if kind == "timid" and args:
        raise OddsbenchError(
            f"--plan {spelling!r}: timid takes no value: it always bets the table minimum "
            "(set that with --min-bet, or use flat:B for a fixed bet of B)"
        )
    if kind in ("timid", "bold", "best"):
        expect(0)
        plan = Plan(spelling, kind)
    elif kind == "kelly":
        if len(args) > 1:
            expect(1)
        plan = Plan(spelling, kind, value(args[0], "Kelly multiple") if args else QQ(1))
    elif kind == "flat":
        expect(1)
        plan = Plan(spelling, kind, value(args[0], "bet"))
    elif kind == "fraction":
        expect(1)
        fraction = value(args[0], "fraction")
        if fraction > 1:
            raise OddsbenchError(f"--plan {spelling!r}: fraction must be at most 1, got {text(fraction)}")
        plan = Plan(spelling, kind, fraction)
    elif kind in PROGRESSIONS:
        expect(2)
        series = value(args[1], "series length")
        if not is_integer(series) or series > MAX_SERIES:
            raise OddsbenchError(f"--plan {spelling!r}: series length must be a whole number from 1 to {MAX_SERIES}")
        plan = Plan(spelling, kind, value(args[0], "base bet"), to_int(series))
    else:
        raise OddsbenchError(f"--plan {spelling!r}: unknown plan (plans: {known})")
    if no_goal and not plan.plays_without_goal:
        raise OddsbenchError(
            f"--plan {spelling!r}: with no goal the bet must stay bounded; use {NO_GOAL_PLANS}"
            + (" (bold play needs a goal to aim at)" if kind == "bold" else "")
        )
    return plan


def parse_plans(spellings: str | Iterable[str], no_goal: bool = False) -> tuple[Plan, ...]:
    """Several plans: a list, or one text such as ``timid, bold, flat:2`` (the workbench's field)."""
    if isinstance(spellings, str):
        spellings = spellings.replace(";", ",").split(",")
    return tuple(parse_plan(part.strip(), no_goal) for part in spellings if part.strip())


def _units(plan: Plan, amount: Rational, grid: BankrollGrid) -> int:
    count = amount / grid.unit
    if not is_integer(count):
        raise OddsbenchError(
            f"--plan {plan.spelling!r}: bet {text(amount)} is not a whole number of betting units of {text(grid.unit)}"
        )
    return to_int(count)


def _floor_times(values: np.ndarray, fraction: Rational, grid: BankrollGrid) -> np.ndarray:
    """floor(fraction * bankroll / unit) in betting units, in exact integer arithmetic."""
    top = numerator(fraction)
    bottom = denominator(fraction) * grid.scale
    if top * int(values.max(initial=0)) < 2**62:
        return (values * top) // bottom
    return np.array([v * top // bottom for v in values.tolist()], dtype=np.int64)


def planned_bets(
    plan: Plan, distribution: RoundDistribution, grid: BankrollGrid
) -> tuple[np.ndarray, np.ndarray, tuple[str, ...]]:
    """(bets[level, value - low] in betting units, next_level[level, outcome], notes) of a plan."""
    width = grid.width
    values = np.arange(grid.low, grid.low + width, dtype=np.int64)
    outcomes = len(distribution.outcomes)
    stay = np.zeros((1, outcomes), dtype=np.int64)
    notes: list[str] = []
    if plan.kind == "flat":
        return np.full((1, width), _units(plan, plan.amount, grid)), stay, ()
    if plan.kind == "timid":
        return np.full((1, width), grid.min_bet), stay, ()
    if plan.kind == "bold":
        best = distribution.best_net * grid.scale
        if best <= 0:
            notes.append(f"{plan.spelling}: no outcome wins, so no bet reaches the goal; bold play stakes everything")
            return np.full((1, width), np.iinfo(np.int64).max // 4), stay, tuple(notes)
        need = grid.goal - values
        top, bottom = numerator(best), denominator(best)
        return np.array([-((-need * bottom) // top)]), stay, ()
    if plan.kind == "fraction":
        return _floor_times(values, plan.amount, grid)[None, :], stay, ()
    if plan.kind == "kelly":
        from oddsbench.strategy.kelly import kelly_bet

        bet = kelly_bet(distribution, plan.amount)
        if bet.fraction.decimal <= 0:
            notes.append(
                f"{plan.spelling}: the game has no positive expectation, so Kelly bets nothing; "
                "the plan bets the table minimum instead"
            )
        if bet.fraction.exact is not None:
            bets = _floor_times(values, bet.fraction.exact, grid)
        else:
            bets = np.floor(values * bet.fraction.decimal / grid.scale).astype(np.int64)
        return bets[None, :], stay, tuple(notes)
    if plan.kind in PROGRESSIONS:
        base = _units(plan, plan.amount, grid)
        levels = plan.series
        bets = np.array([[base * 2**level] * width for level in range(levels)], dtype=np.int64).reshape(levels, width)
        nets = [o.net for o in distribution.outcomes]
        step = np.zeros((levels, outcomes), dtype=np.int64)
        for level in range(levels):
            for k, net in enumerate(nets):
                raising = net < 0 if plan.kind == "martingale" else net > 0
                if net == 0:
                    step[level, k] = level
                elif raising:
                    step[level, k] = level + 1 if level + 1 < levels else 0
                else:
                    step[level, k] = 0
        return bets, step, ()
    raise OddsbenchError(f"plan {plan.spelling!r} is chosen by the optimiser, not by a rule")
