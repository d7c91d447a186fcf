"""Endless play with a flat bet: the round's results turned into a walk in grid units.

A session without a goal only stops at ruin. With a flat bet (timid play is the flat bet of the
smallest unit) every round moves the bankroll by the same law, so the bankroll is a random walk
and ``solve.unbounded_ruin`` answers it. The player is ruined when the bankroll can no longer
cover the next bet (``cover`` x bet: the most one round can take or tie up), which we turn into
"the walk at 0 or below" by shifting the bankroll.
"""

from __future__ import annotations

import math
from collections.abc import Iterable
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text
from oddsbench.solve.unbounded_ruin import DEFAULT_DIGITS, UnboundedRuin, solve_unbounded_ruin


@dataclass(frozen=True)
class EndlessWalk:
    """The bankroll walk of endless flat betting, in grid units (exact)."""

    bet: Rational  # betting units per round
    bankroll: Rational  # betting units
    cover: Rational  # bankroll needed per unit bet to play a round
    grid: Rational  # one grid unit, in betting units
    jumps: tuple[tuple[int, Rational], ...]  # net result per round in grid units -> chance
    bankroll_grid: int  # bankroll in grid units
    need_grid: int  # bankroll (grid units) needed to play one more round
    level: int  # bankroll_grid - need_grid + 1: ruin is this walk at 0 or below


@dataclass(frozen=True)
class EndlessPlayFigures:
    """The walk and its ruin figures: what the report and the TUI show."""

    walk: EndlessWalk
    ruin: UnboundedRuin
    round_text: str  # the round as "net:chance" pairs

    def ruin_from(self, bankroll: Rational, digits: int | None = None):
        """Ruin chance from another starting bankroll (betting units), same round and bet."""
        walk = self.walk
        scaled = QQ(bankroll) / walk.grid
        grid_bankroll = numerator(scaled) // denominator(scaled)
        return self.ruin.ruin_from(grid_bankroll - walk.need_grid + 1, digits)


def endless_flat_walk(
    outcomes: Iterable[tuple[Rational, Rational]], bet: Rational, bankroll: Rational, cover: Rational | None = None
) -> EndlessWalk:
    """The walk of a flat bet: ``outcomes`` are (net per unit bet, chance) pairs, exact."""
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    bet, bankroll = QQ(bet), QQ(bankroll)
    if bet <= 0:
        raise OddsbenchError(f"the bet must be positive (got {text(bet)})")
    if bankroll <= 0:
        raise OddsbenchError(f"the bankroll must be positive (got {text(bankroll)})")
    if not pairs:
        raise OddsbenchError("the round has no results")
    if cover is None:
        cover = max([QQ(1)] + [-net for net, _ in pairs])
    cover = QQ(cover)
    values = [net * bet for net, _ in pairs] + [bet * cover, bankroll]
    grid_denominator = 1
    for value in values:
        grid_denominator = math.lcm(grid_denominator, denominator(value))
    grid = QQ(1, grid_denominator)
    jumps: dict[int, Rational] = {}
    for net, chance in pairs:
        jump = net * bet * grid_denominator
        jumps[numerator(jump)] = jumps.get(numerator(jump), QQ(0)) + chance
    need = numerator(bet * cover * grid_denominator)
    held = numerator(bankroll * grid_denominator)
    if held < need:
        raise OddsbenchError(
            f"a bankroll of {text(bankroll)} cannot cover one bet of {text(bet)} (it needs {text(bet * cover)})"
        )
    return EndlessWalk(
        bet=bet, bankroll=bankroll, cover=cover, grid=grid, jumps=tuple(sorted(jumps.items())),
        bankroll_grid=held, need_grid=need, level=held - need + 1,
    )


def solve_endless_play(
    outcomes: Iterable[tuple[Rational, Rational]],
    bet: Rational,
    bankroll: Rational,
    cover: Rational | None = None,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
) -> EndlessPlayFigures:
    """Ruin figures of endless flat betting: the walk, then ``solve_unbounded_ruin`` on it."""
    pairs = [(QQ(net), QQ(chance)) for net, chance in outcomes]
    walk = endless_flat_walk(pairs, bet, bankroll, cover)
    ruin = solve_unbounded_ruin(dict(walk.jumps), walk.level, digits=digits, check=check, unit=walk.grid)
    shown = ", ".join(f"{text(net)}:{text(chance)}" for net, chance in sorted(pairs))
    return EndlessPlayFigures(walk, ruin, shown)
