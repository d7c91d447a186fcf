"""A session as an absorbing Markov chain over bankroll values (and a plan's level).

Everything is kept in whole grid steps. The betting unit (money) is split into ``scale`` grid
steps, where ``scale`` is the common denominator of the round's net results, so a bet of ``c``
units moves the bankroll by ``net * scale * c`` whole steps for every outcome: payouts such as
3 to 2 or 6 to 5 need no rounding. Transient states are the bankroll values strictly between
the floor and the goal that can still cover the minimum bet, once per plan level; they form one
contiguous run ``low .. goal - 1``, so a state's index is ``(value - low) * levels + level``
(value-major, which keeps the system banded for the sparse LU).
Everything else a round can reach is absorbing: at or past the goal, at or below a stop-loss
floor, or short of the minimum bet (ruin). Construction is vectorised with numpy so a chain of
10^6 states builds in well under a second; exact rows are produced only on request.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, is_integer, numerator, text, to_int

GOAL, RUIN, FLOOR = 0, 1, 2
KIND_NAMES = ("goal", "ruin", "floor")
MAX_GRID = 50_000_000


@dataclass(frozen=True)
class BankrollGrid:
    """Session limits in grid steps; ``step`` is the money value of one step."""

    unit: Rational
    scale: int
    start: int
    goal: int
    floor: int
    min_bet: int
    max_bet: int | None
    cover: Rational

    @property
    def step(self) -> Rational:
        return self.unit / self.scale

    def money(self, steps: int) -> Rational:
        return self.step * steps

    def coverable(self, values: np.ndarray) -> np.ndarray:
        """Largest bet (betting units) each bankroll can cover for the round's worst case."""
        top, bottom = numerator(self.cover), denominator(self.cover)
        return (np.asarray(values, dtype=np.int64) * bottom) // (top * self.scale)

    @property
    def low(self) -> int:
        """Smallest bankroll that still plays: above the floor and able to cover the minimum bet."""
        cover_min = -((-self.min_bet * self.scale * numerator(self.cover)) // denominator(self.cover))
        return max(self.floor + 1, cover_min, 1)

    @property
    def width(self) -> int:
        return max(self.goal - self.low, 0)

    def kind_of(self, values: np.ndarray) -> np.ndarray:
        """Absorbing kind of bankroll values outside the playing run."""
        values = np.asarray(values)
        kinds = np.full(values.shape, RUIN, dtype=np.int8)
        if self.floor > 0:
            kinds[values <= self.floor] = FLOOR
        kinds[values >= self.goal] = GOAL
        return kinds


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


def make_grid(
    distribution: RoundDistribution,
    bankroll: Rational,
    goal: Rational,
    floor: Rational | None = None,
    min_bet: Rational | None = None,
    max_bet: Rational | None = None,
    unit: Rational | None = None,
) -> BankrollGrid:
    """Check the money amounts and express them in grid steps (one clear line per problem)."""
    floor = QQ(0) if floor is None else floor
    if unit is None:
        unit = QQ(1) if min_bet is None or is_integer(min_bet) else min_bet
    if unit <= 0:
        raise OddsbenchError(f"betting unit must be more than 0, got {text(unit)}")
    min_bet = min_bet if min_bet is not None else unit
    scale = distribution.net_denominator

    def steps(name: str, value: Rational) -> int:
        return grid_steps(f"session {name}", value, unit, scale)

    def units(name: str, value: Rational) -> int:
        count = value / unit
        if not is_integer(count) or count < 1:
            raise OddsbenchError(f"session {name} {text(value)} must be a whole, positive number of betting units")
        return to_int(count)

    if bankroll < 0:
        raise OddsbenchError(f"session bankroll must be at least 0, got {text(bankroll)}")
    if floor < 0:
        raise OddsbenchError(f"session floor must be at least 0, got {text(floor)}")
    if goal <= bankroll:
        raise OddsbenchError(f"session goal {text(goal)} must be above the bankroll {text(bankroll)}")
    if floor >= bankroll and bankroll > 0:
        raise OddsbenchError(f"session floor {text(floor)} must be below the bankroll {text(bankroll)}")
    low_bet = units("min_bet", min_bet)
    high_bet = units("max_bet", max_bet) if max_bet is not None else None
    if high_bet is not None and high_bet < low_bet:
        raise OddsbenchError(f"session max_bet {text(max_bet)} is below min_bet {text(min_bet)}")
    grid = BankrollGrid(
        unit=unit,
        scale=scale,
        start=steps("bankroll", bankroll),
        goal=steps("goal", goal),
        floor=steps("floor", floor),
        min_bet=low_bet,
        max_bet=high_bet,
        cover=distribution.cover,
    )
    if grid.goal > MAX_GRID:
        raise OddsbenchError(f"session goal is {grid.goal:,} grid steps; the limit is {MAX_GRID:,}")
    return grid


@dataclass(frozen=True)
class BankrollChain:
    """Transient states, their bets, and where each outcome leads.

    ``target[i, k]`` is the next state after outcome ``k`` from transient state ``i``: a transient
    index when >= 0, else absorbing state ``-1 - target``, whose value and kind are
    ``absorbing_values`` and ``absorbing_kinds``.
    """

    grid: BankrollGrid
    distribution: RoundDistribution
    levels: int
    values: np.ndarray
    level_of: np.ndarray
    bets: np.ndarray
    target: np.ndarray
    absorbing_values: np.ndarray
    absorbing_kinds: np.ndarray

    @property
    def size(self) -> int:
        return len(self.values)

    @property
    def start(self) -> int:
        """Start state: transient index, or ``-1 - absorbing index`` when the session cannot start."""
        grid = self.grid
        if grid.low <= grid.start < grid.goal:
            return (grid.start - grid.low) * self.levels
        where = np.searchsorted(self.absorbing_values, grid.start)
        return -1 - int(where)

    def probabilities(self) -> np.ndarray:
        return np.array([_float(o.prob) for o in self.distribution.outcomes])

    def q_matrix(self):
        """Transient-to-transient probabilities as a scipy CSR matrix (equal targets added)."""
        from scipy.sparse import csr_matrix

        n, k = self.target.shape
        probs = np.broadcast_to(self.probabilities(), (n, k))
        keep = self.target >= 0
        rows = np.broadcast_to(np.arange(n)[:, None], (n, k))[keep]
        return csr_matrix((probs[keep], (rows, self.target[keep])), shape=(n, n))

    def r_matrix(self):
        """Transient-to-absorbing probabilities as a scipy CSR matrix."""
        from scipy.sparse import csr_matrix

        n, k = self.target.shape
        probs = np.broadcast_to(self.probabilities(), (n, k))
        out = self.target < 0
        rows = np.broadcast_to(np.arange(n)[:, None], (n, k))[out]
        return csr_matrix((probs[out], (rows, -1 - self.target[out])), shape=(n, len(self.absorbing_values)))

    def exact_rows(self) -> tuple[list[dict[int, Rational]], list[dict[int, Rational]]]:
        """(Q rows, R rows) with exact probabilities, for the exact engine."""
        probs = [o.prob for o in self.distribution.outcomes]
        q_rows: list[dict[int, Rational]] = []
        r_rows: list[dict[int, Rational]] = []
        for row in self.target.tolist():
            q: dict[int, Rational] = {}
            r: dict[int, Rational] = {}
            for j, prob in zip(row, probs):
                if j >= 0:
                    q[j] = q.get(j, QQ(0)) + prob
                else:
                    r[-1 - j] = r.get(-1 - j, QQ(0)) + prob
            q_rows.append(q)
            r_rows.append(r)
        return q_rows, r_rows


def _float(value: Rational) -> float:
    return numerator(value) / denominator(value)


def build_bankroll_chain(
    distribution: RoundDistribution,
    grid: BankrollGrid,
    planned: np.ndarray,
    next_level: np.ndarray,
) -> BankrollChain:
    """The chain of a session under planned bets.

    ``planned[level, value - low]`` is the bet (betting units) the plan asks for; it is raised to
    the minimum bet and cut to the maximum bet and to what the bankroll can cover.
    ``next_level[level, k]`` is the plan's level after outcome ``k``.
    """
    low, width = grid.low, grid.width
    levels = planned.shape[0] if width else 1
    values_one = np.arange(low, low + width, dtype=np.int64)
    cap = grid.coverable(values_one)
    if grid.max_bet is not None:
        cap = np.minimum(cap, grid.max_bet)
    bets = np.clip(np.asarray(planned, dtype=np.int64).reshape(levels, width), grid.min_bet, None)
    bets = np.minimum(bets, cap[None, :]).T.reshape(-1)
    values = np.repeat(values_one, levels)
    level_of = np.tile(np.arange(levels, dtype=np.int64), width)
    steps = np.array([to_int(o.net * grid.scale) for o in distribution.outcomes], dtype=np.int64)
    landing = values[:, None] + bets[:, None] * steps[None, :]
    inside = (landing >= low) & (landing < grid.goal)
    nxt = np.asarray(next_level, dtype=np.int64)[level_of]
    target = np.where(inside, (landing - low) * levels + nxt, 0)
    outside_values = np.unique(landing[~inside])
    if low <= grid.start < grid.goal:
        starts = outside_values
    else:
        starts = np.union1d(outside_values, [grid.start])
    absorbing_values = np.asarray(starts, dtype=np.int64)
    absorbing_index = np.searchsorted(absorbing_values, landing)
    target = np.where(inside, target, -1 - absorbing_index)
    return BankrollChain(
        grid=grid,
        distribution=distribution,
        levels=levels,
        values=values,
        level_of=level_of,
        bets=bets,
        target=target,
        absorbing_values=absorbing_values,
        absorbing_kinds=grid.kind_of(absorbing_values),
    )
