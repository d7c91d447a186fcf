"""The session rules, one copy: bounded sessions and play with no goal both take them from here.

* The betting unit: bets are whole multiples of it. ``default_unit(min_bet, amounts)``: 1, or
  the minimum bet when that is not whole; refined to the rational gcd with the plan's own fixed
  amounts (flat B, a progression's base B) only when one of them is not a whole multiple of it,
  so a half-unit flat bet with no unit or minimum set is played as asked.
* The grid: one grid step is the unit split by the common denominator of the round's net results
  (``grid_scale``), so a bet of whole units moves the bankroll by whole steps for every outcome
  (payouts such as 3 to 2 or 6 to 5 need no rounding). Money becomes steps by ``grid_steps``.
* The cover: the bankroll one unit bet needs, the most one round can take or tie up per unit
  staked (the worst loss, extra stakes included): ``cover_of``.
* Cut bets: a planned bet is raised to the table minimum, cut to the table maximum and to what
  the bankroll covers (``TableRules.placed``); the minimum is never cut.
* The ruin level: the lowest bankroll that still plays, above the stop-loss floor and able to
  cover the minimum bet (``TableRules.low``); below it the session is over (ruin, or the floor).
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from math import gcd, lcm
from typing import TYPE_CHECKING

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, is_integer, numerator, text, to_int

if TYPE_CHECKING:
    import numpy as np


def rational_gcd(values: Iterable[Rational]) -> Rational:
    """The largest rational g with every value a whole multiple of g (values positive)."""
    values = list(values)
    common = lcm(*(denominator(value) for value in values))
    top = 0
    for value in values:
        top = gcd(top, numerator(value) * (common // denominator(value)))
    return QQ(top, common)


def default_unit(min_bet: Rational | None, amounts: Iterable[Rational] = ()) -> Rational:
    """The betting unit when none is set: 1, or the minimum bet when that is not whole, refined to
    the rational gcd with the plan's own fixed ``amounts`` only when one is not a whole multiple."""
    unit = QQ(1) if min_bet is None or is_integer(min_bet) else QQ(min_bet)
    amounts = [QQ(amount) for amount in amounts if amount is not None and amount > 0]
    if any(not is_integer(amount / unit) for amount in amounts):
        unit = rational_gcd([unit, *amounts])
    return unit


def grid_scale(nets: Iterable[Rational]) -> int:
    """Grid steps per betting unit: the common denominator of the round's net results."""
    return lcm(*(denominator(net) for net in nets))


def cover_of(outcomes: Iterable[tuple[Rational, Rational]]) -> Rational:
    """Bankroll needed per unit bet: the most one round can take or tie up, from (net, extra stake) pairs."""
    return max(max(1 + extra, -net) for net, extra in outcomes)


MACHINE_BET = 2**62  # the largest bet (betting units) kept in a 64-bit array; larger planned bets are cut to it


def floor_times(values, fraction: Rational):
    """floor(value x fraction) for a whole number or an array of them, exactly, without 64-bit overflow.

    numpy's int64 when every product fits, Python's integers otherwise (results past
    ``MACHINE_BET`` are cut to it: a bet no grid bankroll covers).
    """
    import numpy as np  # here, not at the top: reading a ruleset must not load numpy

    top, bottom = numerator(fraction), denominator(fraction)
    if isinstance(values, int):
        return (values * top) // bottom
    values = np.asarray(values, dtype=np.int64)
    largest = int(np.abs(values).max(initial=0))
    if largest * abs(top) < 2**62 and bottom < 2**62:
        return (values * top) // bottom
    return np.array([min(v * top // bottom, MACHINE_BET) for v in values.tolist()], dtype=np.int64)


def machine_bets(planned) -> np.ndarray:
    """Planned bets (betting units, whole numbers of any size) as an int64 array, each cut to ``MACHINE_BET``."""
    import numpy as np

    if isinstance(planned, np.ndarray) and planned.dtype != object:
        return planned.astype(np.int64)
    return np.vectorize(lambda bet: min(int(bet), MACHINE_BET), otypes=[np.int64])(np.asarray(planned, dtype=object))


def grid_steps(label: str, value: Rational, unit: Rational, scale: int) -> int:
    """``value`` in grid steps (the betting unit split by the payouts' common denominator ``scale``).

    A bankroll, goal or floor off the grid is refused in one line naming it.
    """
    step = unit / scale
    count = value / step
    if not is_integer(count):
        raise OddsbenchError(
            f"{label} {text(value)} is not a whole number of grid steps of {text(step)} "
            f"(betting unit {text(unit)} split by the payout denominator {scale})"
        )
    return to_int(count)


def whole_units(label: str, value: Rational, unit: Rational) -> int:
    """A bet amount in betting units: whole and at least one, or refused in one line."""
    count = value / unit
    if not is_integer(count) or count < 1:
        raise OddsbenchError(f"{label} {text(value)} must be a whole, positive number of betting units of {text(unit)}")
    return to_int(count)


def checked_unit(unit: Rational | None, min_bet: Rational | None, amounts: Iterable[Rational] = ()) -> Rational:
    """The unit to play in: the one given, else the default unit; it must be more than 0."""
    unit = default_unit(min_bet, amounts) if unit is None else QQ(unit)
    if unit <= 0:
        raise OddsbenchError(f"betting unit must be more than 0, got {text(unit)}")
    return unit


@dataclass(frozen=True)
class TableRules:
    """The table and bankroll rules in grid steps and betting units; ``step`` is one grid step in money."""

    unit: Rational
    scale: int
    cover: Rational
    min_bet: int  # betting units
    max_bet: int | None  # betting units
    floor: int  # grid steps (0: no stop-loss floor)

    @property
    def step(self) -> Rational:
        return self.unit / self.scale

    def money(self, steps: int) -> Rational:
        return self.step * steps

    def coverable(self, values):
        """Largest bet (betting units) each bankroll (grid steps) can cover for the round's worst case."""
        return floor_times(values, QQ(denominator(self.cover), numerator(self.cover) * self.scale))

    def cover_steps(self, units: int) -> int:
        """Grid steps a bet of ``units`` betting units needs: ceil(units x scale x cover)."""
        needed = QQ(units * self.scale) * self.cover
        return -((-numerator(needed)) // denominator(needed))

    @property
    def low(self) -> int:
        """The ruin level: the smallest bankroll that still plays (above the floor, covering the minimum bet)."""
        return max(self.floor + 1, self.cover_steps(self.min_bet), 1)

    def table_bet(self, planned):
        """A planned bet (betting units) raised to the table minimum and cut to the table maximum.

        For arrays the limits are cut to ``MACHINE_BET``: no bankroll on a grid covers that much, so
        the bet placed is the same, and a minimum of 10^60 units cannot overflow 64-bit integers.
        """
        import numpy as np

        if not isinstance(planned, np.ndarray):
            raised = max(planned, self.min_bet)
            return raised if self.max_bet is None else min(raised, self.max_bet)
        raised = np.maximum(planned, min(self.min_bet, MACHINE_BET))
        return raised if self.max_bet is None else np.minimum(raised, min(self.max_bet, MACHINE_BET))

    def largest_bet(self, values):
        """The largest bet each playing bankroll may place: what it covers, cut to the table maximum."""
        import numpy as np

        cap = self.coverable(values)
        if self.max_bet is None:
            return cap
        return np.minimum(cap, self.max_bet) if isinstance(cap, np.ndarray) else min(cap, self.max_bet)

    def placed(self, planned, values):
        """The bet actually placed: ``table_bet(planned)`` cut to what the bankroll covers (the cut bet)."""
        import numpy as np

        covered = self.coverable(values)
        bet = self.table_bet(planned)
        if isinstance(bet, np.ndarray) or isinstance(covered, np.ndarray):
            return np.minimum(bet, covered)
        return min(bet, covered)


def table_rules(
    unit: Rational,
    scale: int,
    cover: Rational,
    floor: Rational = 0,
    min_bet: Rational | None = None,
    max_bet: Rational | None = None,
    label: str = "session",
) -> TableRules:
    """Check the table amounts against the unit and express them in units and grid steps."""
    if floor < 0:
        raise OddsbenchError(f"{label} floor must be at least 0, got {text(floor)}")
    min_bet = min_bet if min_bet is not None else unit
    low_bet = whole_units(f"{label} min_bet", min_bet, unit)
    high_bet = whole_units(f"{label} max_bet", max_bet, unit) if max_bet is not None else None
    if high_bet is not None and high_bet < low_bet:
        raise OddsbenchError(f"{label} max_bet {text(max_bet)} is below min_bet {text(min_bet)}")
    return TableRules(
        unit=unit,
        scale=scale,
        cover=cover,
        min_bet=low_bet,
        max_bet=high_bet,
        floor=grid_steps(f"{label} floor", floor, unit, scale),
    )
