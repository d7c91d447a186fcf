"""Play with no goal: a plan's bets turned into a walk in grid steps, then the ruin engines on it.

A session without a goal only stops at ruin (or at a stop-loss floor). The walk follows the
session rules of ``chain.session_rules``, the same copy bounded sessions use: the betting unit
and its default, the grid, the cover, bets raised to the table minimum and cut to the table
maximum and to what the bankroll covers, and ruin when even the minimum cannot be covered. So the
answer is the limit of the bounded sessions' as the goal goes to infinity.

Levels count grid steps above the ruin line (level = bankroll - lowest playing bankroll + 1);
``solve.ruin`` solves the walk (its ``cut_bets`` engine for flat and timid bets, ``progressions``
for martingale and paroli). ``solve_no_goal`` takes a parsed ``Plan`` (``strategy.plans``).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, replace

from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.chain.session_rules import (
    TableRules,
    checked_unit,
    cover_of,
    grid_scale,
    grid_steps,
    table_rules,
    whole_units,
)
from oddsbench.model import budget
from oddsbench.model.errors import OddsbenchError, SettingProblem
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text, to_int
from oddsbench.solve.ruin import DEFAULT_DIGITS, Law, NoGoalRuin, solve_cut_bet_ruin, solve_progression_ruin
from oddsbench.strategy.plans import Plan

PROGRESSIONS = ("martingale", "paroli")
NO_GOAL_KINDS = ("flat", "timid", *PROGRESSIONS)  # plans whose bet stays bounded as the bankroll grows


@dataclass(frozen=True)
class NoGoalWalk:
    """The bankroll walk of a bet played with no goal, in grid steps (exact)."""

    bet: Rational  # the plan's bet, money
    bankroll: Rational  # money
    unit: Rational  # betting unit, money: bets are whole units
    min_bet: Rational
    cover: Rational  # bankroll needed per unit bet to play a round
    floor: Rational  # stop-loss floor, money (0: none)
    grid: Rational  # one grid step, money
    jumps: Law  # net result per round at the full bet, in steps -> chance
    bottom: tuple[tuple[Rational, Law], ...]  # cut bets (money) and their laws, lowest level first
    low: int  # lowest bankroll (steps) that still plays: the ruin line is just below it
    level: int  # bankroll (steps) - low + 1: ruin is this walk at 0 or below
    rules: TableRules  # the session rules the walk was built with

    @property
    def full_bet_from(self) -> Rational:
        """Smallest bankroll (money) at which the full bet is placed."""
        return (self.low + len(self.bottom)) * self.grid


@dataclass(frozen=True)
class NoGoalFigures:
    """The walk and its ruin figures: what the report and the TUI show."""

    walk: NoGoalWalk
    ruin: NoGoalRuin
    round_text: str  # the round as "net:chance" pairs
    plan: str = ""  # the plan's spelling when it is not a flat bet (progressions)

    def ruin_from(self, bankroll: Rational, digits: int | None = None):
        """Ruin chance from another starting bankroll (money), same round and bet.

        Only for walks without cut bets (the root fit is the whole curve); others re-solve.
        """
        walk = self.walk
        steps = QQ(bankroll) / walk.grid
        level = numerator(steps) // denominator(steps) - walk.low + 1
        if walk.bottom:
            figures = solve_cut_bet_ruin(
                dict(walk.jumps),
                [dict(law) for _, law in walk.bottom],
                max(level, 1),
                digits=digits or self.ruin.digits,
                check=False,
            )
            return figures.ruin if level >= 1 else self.ruin.ruin_from(0)
        return self.ruin.ruin_from(level, digits)


def no_goal_walk(
    outcomes: Iterable[tuple[Rational, Rational]],
    bet: Rational,
    bankroll: Rational,
    cover: Rational | None = None,
    unit: Rational | None = None,
    min_bet: Rational | None = None,
    floor: Rational = 0,
    max_bet: Rational | None = None,
    amounts: Iterable[Rational] | None = None,
) -> NoGoalWalk:
    """The walk of a fixed bet: ``outcomes`` are (net per unit bet, chance) pairs, exact.

    ``amounts`` are the plan's own fixed amounts for the default unit (default: the bet itself).
    """
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    if not pairs:
        raise OddsbenchError("the round has no results")
    bet, bankroll, floor = QQ(bet), QQ(bankroll), QQ(floor)
    if bet <= 0:
        raise OddsbenchError(f"the bet must be positive (got {text(bet)})")
    unit = checked_unit(unit, min_bet, (bet,) if amounts is None else amounts)
    scale = grid_scale(net for net, _ in pairs)
    cover = QQ(cover) if cover is not None else cover_of((net, QQ(0)) for net, _ in pairs)
    rules = table_rules(unit, scale, cover, floor, min_bet, max_bet)
    bet_units = whole_units("the bet", bet, unit)
    held = grid_steps("session bankroll", bankroll, unit, scale)
    if floor and floor >= bankroll:
        raise OddsbenchError(f"session floor {text(floor)} must be below the bankroll {text(bankroll)}")
    low = rules.low
    min_money = rules.min_bet * unit
    if held < low:
        raise OddsbenchError(
            f"a bankroll of {text(bankroll)} cannot cover the minimum bet of {text(min_money)} "
            f"(it needs {text(rules.money(rules.cover_steps(rules.min_bet)))})"
        )

    def law_of(units: int) -> Law:
        law: dict[int, Rational] = {}
        for net, chance in pairs:
            jump = to_int(net * scale * units)
            law[jump] = law.get(jump, QQ(0)) + chance
        return tuple(sorted(law.items()))

    full = rules.table_bet(bet_units)
    _require_levels(max(low, rules.cover_steps(full)) - low, bet * full / bet_units)
    bottom = []
    for value in range(low, max(low, rules.cover_steps(full))):
        units = rules.placed(bet_units, value)  # the cut bet: what this bankroll covers
        bottom.append((units * unit, law_of(units)))
    return NoGoalWalk(
        bet=bet,
        bankroll=bankroll,
        unit=unit,
        min_bet=min_money,
        cover=cover,
        floor=floor,
        grid=rules.step,
        jumps=law_of(full),
        bottom=tuple(bottom),
        low=low,
        level=held - low + 1,
        rules=rules,
    )


# Measured: each bankroll level below the full bet (its cut bet and its law) takes about this long and this much.
LEVEL_SECONDS = 2e-5
LEVEL_BYTES = 600


def _require_levels(levels: int, full_bet: Rational) -> None:
    """Refuse, before building them, more levels below the full bet than the work budget allows."""
    budget.require(
        f"the {levels:,} bankroll levels that cannot cover the full bet of {text(full_bet)}",
        seconds=levels * LEVEL_SECONDS,
        memory=levels * LEVEL_BYTES,
    )


def _round_text(pairs) -> str:
    return ", ".join(f"{text(net)}:{text(chance)}" for net, chance in sorted(pairs, reverse=True))


def solve_no_goal_play(
    outcomes: Iterable[tuple[Rational, Rational]],
    bet: Rational,
    bankroll: Rational,
    cover: Rational | None = None,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    unit: Rational | None = None,
    min_bet: Rational | None = None,
    floor: Rational = 0,
    should_stop=None,
    max_bet: Rational | None = None,
) -> NoGoalFigures:
    """Ruin figures of a fixed bet played with no goal: the walk, then the cut-bet ruin engine on it."""
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    walk = no_goal_walk(pairs, bet, bankroll, cover, unit=unit, min_bet=min_bet, floor=floor, max_bet=max_bet)
    ruin = solve_cut_bet_ruin(
        dict(walk.jumps),
        [dict(law) for _, law in walk.bottom],
        walk.level,
        digits=digits,
        check=check,
        unit=walk.grid,
        should_stop=should_stop,
    )
    return NoGoalFigures(walk, ruin, _round_text(pairs))


def solve_no_goal_progression(
    outcomes: Iterable[tuple[Rational, Rational]],
    kind: str,
    base: Rational,
    series: int,
    bankroll: Rational,
    cover: Rational | None = None,
    digits: int = DEFAULT_DIGITS,
    unit: Rational | None = None,
    min_bet: Rational | None = None,
    floor: Rational = 0,
    max_bet: Rational | None = None,
    should_stop=None,
) -> NoGoalFigures:
    """martingale:B:K or paroli:B:K with no goal (the session rules: double after a loss / a win, at
    most K bets in a series; pushes keep the bet), solved as a modulated walk."""
    if kind not in PROGRESSIONS:
        raise OddsbenchError(f"unknown progression {kind!r}")
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    base = QQ(base)
    walk = no_goal_walk(
        pairs, base * 2 ** (series - 1), bankroll, cover, unit, min_bet, floor, max_bet, amounts=(base,)
    )
    rules = walk.rules
    base_units = whole_units("the base bet", base, walk.unit)

    def moves_at(level: int, state: int):
        units = rules.placed(base_units * 2**state, level + walk.low - 1)
        moves = []
        for net, chance in pairs:
            raising = net < 0 if kind == "martingale" else net > 0
            if net == 0:
                nxt = state
            elif raising:
                nxt = state + 1 if state + 1 < series else 0
            else:
                nxt = 0
            moves.append((to_int(net * rules.scale * units), chance, nxt))
        return tuple(moves)

    ruin = solve_progression_ruin(
        series,
        moves_at,
        len(walk.bottom) + 1,
        walk.level,
        walk.jumps,
        digits=digits,
        unit_name="grid step(s) of " + text(walk.grid),
        notes=(
            f"{kind}: base {text(base)}, at most {series} bets in a series; the plan's place in the series "
            "is part of the state (a modulated walk)",
        ),
        should_stop=should_stop,
    )
    return NoGoalFigures(replace(walk, bet=base), ruin, _round_text(pairs), f"{kind}:{text(base)}:{series}")


def solve_no_goal(
    distribution: RoundDistribution,
    plan: Plan,
    bankroll: Rational,
    floor: Rational = 0,
    min_bet: Rational | None = None,
    max_bet: Rational | None = None,
    unit: Rational | None = None,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    should_stop=None,
) -> NoGoalFigures:
    """One plan played with no goal, until ruin, on a round's distribution (the session rules throughout).

    Flat and timid bets are a walk with cut bets near the bottom; martingale and paroli a
    modulated walk. Plans whose bet grows with the bankroll, or that aim at a goal, are refused.
    """
    outcomes = [(o.net, o.prob) for o in distribution.outcomes]
    common = dict(
        cover=distribution.cover,
        digits=digits,
        unit=unit,
        min_bet=min_bet,
        max_bet=max_bet,
        floor=floor or 0,
        should_stop=should_stop,
    )
    if plan.kind in PROGRESSIONS:
        return solve_no_goal_progression(outcomes, plan.kind, plan.amount, plan.series, bankroll, **common)
    if plan.kind == "flat":
        bet = plan.amount
    elif plan.kind == "timid":  # always the table minimum
        bet = min_bet if min_bet is not None else checked_unit(unit, min_bet)
    else:
        raise SettingProblem(
            f"plan {plan.spelling!r}: with no goal the bet must stay bounded; use flat:B, timid, "
            "martingale:B:K or paroli:B:K",
            "plans",
        )
    return solve_no_goal_play(outcomes, bet, bankroll, check=check, **common)
