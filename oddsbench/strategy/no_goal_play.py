"""Play with no goal: a plan's bets turned into a walk in grid steps, then the ruin engines on it.

A session without a goal only stops at ruin (or at a stop-loss floor). With a flat bet (timid
play is the flat bet of the minimum) every round moves the bankroll by one law once the bankroll
covers the bet; below that the bet is cut to what the bankroll covers, down to the minimum bet,
and the player is ruined when even the minimum cannot be covered ("cover" is the most one round
can take or tie up per unit bet). These are the same rules as bounded sessions, so the answer is
the limit of theirs as the goal goes to infinity.

Grid: one step is the betting unit divided by the common denominator of the net results, so
every bet of whole units moves the bankroll by whole steps. Levels count steps above the ruin
line (level = bankroll - lowest playing bankroll + 1); ``solve.ruin`` solves the walk (its
``cut_bets`` module for flat bets, ``progressions`` for martingale and paroli).
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass, replace

from oddsbench.chain.bankroll import grid_steps
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, is_integer, numerator, text, to_int
from oddsbench.solve.ruin import DEFAULT_DIGITS, Law, NoGoalRuin, solve_cut_bet_ruin, solve_progression_ruin


@dataclass(frozen=True)
class NoGoalWalk:
    """The bankroll walk of a flat bet played with no goal, in grid steps (exact)."""

    bet: Rational  # the plan's bet, money
    bankroll: Rational  # money
    unit: Rational  # betting unit, money: bets are whole units
    min_bet: Rational
    cover: Rational  # bankroll needed per unit bet to play a round
    floor: Rational  # stop-loss floor, money (0: none)
    grid: Rational  # one grid step, money
    jumps: Law  # net result per round at the full bet, in steps -> chance
    bottom: tuple[tuple[Rational, Law], ...]  # cut bets (money) and their laws, lowest level first
    bankroll_grid: int  # bankroll in steps
    low: int  # lowest bankroll (steps) that still plays
    level: int  # bankroll_grid - low + 1: ruin is this walk at 0 or below

    @property
    def need_grid(self) -> int:
        """Bankroll (steps) needed to play one more round: the ruin line is just below it."""
        return self.low

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


def _whole_units(name: str, value: Rational, unit: Rational) -> int:
    count = value / unit
    if not is_integer(count) or count < 1:
        raise OddsbenchError(f"{name} {text(value)} must be a whole, positive number of betting units ({text(unit)})")
    return to_int(count)


def no_goal_walk(
    outcomes: Iterable[tuple[Rational, Rational]],
    bet: Rational,
    bankroll: Rational,
    cover: Rational | None = None,
    unit: Rational | None = None,
    min_bet: Rational | None = None,
    floor: Rational = 0,
    max_bet: Rational | None = None,
) -> NoGoalWalk:
    """The walk of a flat bet: ``outcomes`` are (net per unit bet, chance) pairs, exact."""
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    if not pairs:
        raise OddsbenchError("the round has no results")
    bet, bankroll, floor = QQ(bet), QQ(bankroll), QQ(floor)
    if bet <= 0:
        raise OddsbenchError(f"the bet must be positive (got {text(bet)})")
    unit = QQ(unit) if unit is not None else (QQ(min_bet) if min_bet is not None else min(QQ(1), bet))
    min_bet = QQ(min_bet) if min_bet is not None else unit
    if unit <= 0:
        raise OddsbenchError(f"the betting unit must be positive (got {text(unit)})")
    bet_units = _whole_units("the bet", bet, unit)
    min_units = _whole_units("the minimum bet", min_bet, unit)
    if max_bet is not None:
        max_units = _whole_units("the maximum bet", QQ(max_bet), unit)
        if max_units < min_units:
            raise OddsbenchError(f"the maximum bet {text(QQ(max_bet))} is below the minimum bet {text(min_bet)}")
        bet_units = min(bet_units, max_units)  # the table maximum cuts the plan's bet, as in sessions
    bet_units = max(bet_units, min_units)  # and the table minimum raises it
    if cover is None:
        cover = max([QQ(1)] + [-net for net, _ in pairs])
    cover = QQ(cover)
    scale = 1
    for net, _ in pairs:
        scale = math.lcm(scale, denominator(net))
    grid = unit / scale

    def steps(name: str, value: Rational) -> int:
        return grid_steps(name, value, unit, scale)

    held = steps("the bankroll", bankroll)
    floor_steps = steps("the floor", floor) if floor else 0
    if floor < 0 or (floor and floor >= bankroll):
        raise OddsbenchError(f"the floor {text(floor)} must be at least 0 and below the bankroll {text(bankroll)}")

    def covers(units: int) -> int:  # steps needed to cover a bet of ``units`` units
        needed = QQ(units * scale) * cover
        return -((-numerator(needed)) // denominator(needed))

    low = max(floor_steps + 1, covers(min_units), 1)
    if held < low:
        raise OddsbenchError(
            f"a bankroll of {text(bankroll)} cannot cover the minimum bet of {text(min_bet)} "
            f"(it needs {text(covers(min_units) * grid)})"
        )

    def law_of(units: int) -> Law:
        law: dict[int, Rational] = {}
        for net, chance in pairs:
            jump = to_int(net * scale * units)
            law[jump] = law.get(jump, QQ(0)) + chance
        return tuple(sorted(law.items()))

    full_from = max(low, covers(bet_units))
    bottom = []
    for value in range(low, full_from):
        cap = (value * denominator(cover)) // (numerator(cover) * scale)  # whole units the bankroll covers
        units = max(min(bet_units, cap), min_units)
        bottom.append((units * unit, law_of(units)))
    return NoGoalWalk(
        bet=bet,
        bankroll=bankroll,
        unit=unit,
        min_bet=min_bet,
        cover=cover,
        floor=floor,
        grid=grid,
        jumps=law_of(bet_units),
        bottom=tuple(bottom),
        bankroll_grid=held,
        low=low,
        level=held - low + 1,
    )


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
    """Ruin figures of a flat bet played with no goal: the walk, then the cut-bet ruin engine on it."""
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
    shown = ", ".join(f"{text(net)}:{text(chance)}" for net, chance in sorted(pairs, reverse=True))
    return NoGoalFigures(walk, ruin, shown)


PROGRESSIONS = ("martingale", "paroli")


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
    top_bet = QQ(base) * 2 ** (series - 1)
    walk = no_goal_walk(pairs, top_bet, bankroll, cover, unit=unit, min_bet=min_bet, floor=floor, max_bet=max_bet)
    scale = numerator(walk.unit / walk.grid)
    base_units = _whole_units("the base bet", QQ(base), walk.unit)
    min_units = to_int(walk.min_bet / walk.unit)
    max_units = to_int(QQ(max_bet) / walk.unit) if max_bet is not None else None
    cover_q = walk.cover

    def units_at(level: int, state: int) -> int:
        value = level + walk.low - 1
        cap = (value * denominator(cover_q)) // (numerator(cover_q) * scale)
        planned = base_units * 2**state
        if max_units is not None:
            planned = min(planned, max_units)
        return max(min(max(planned, min_units), cap), min_units)

    def moves_at(level: int, state: int):
        units = units_at(level, state)
        moves = []
        for net, chance in pairs:
            raising = net < 0 if kind == "martingale" else net > 0
            if net == 0:
                nxt = state
            elif raising:
                nxt = state + 1 if state + 1 < series else 0
            else:
                nxt = 0
            moves.append((to_int(net * scale * units), chance, nxt))
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
            f"{kind}: base {text(QQ(base))}, at most {series} bets in a series; the plan's place in the series "
            "is part of the state (a modulated walk)",
        ),
        should_stop=should_stop,
    )
    shown = ", ".join(f"{text(net)}:{text(chance)}" for net, chance in sorted(pairs, reverse=True))
    return NoGoalFigures(replace(walk, bet=QQ(base)), ruin, shown, f"{kind}:{text(QQ(base))}:{series}")
