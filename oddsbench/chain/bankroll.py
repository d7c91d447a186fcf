"""A session as an absorbing Markov chain over bankroll values (and a plan's level).

Everything is kept in whole grid steps and betting units, by the session rules
(``chain.session_rules``: the unit, the grid, the cover, cut bets, the ruin level): a bet of
``c`` units moves the bankroll by ``net * scale * c`` whole steps for every outcome. Transient
states are the bankroll values strictly between the floor and the goal that can still cover the
minimum bet, once per plan level; they form one contiguous run ``low .. goal - 1``, so a state's
index is ``(value - low) * levels + level`` (value-major, which keeps the system banded).
Everything else a round can reach is absorbing: at or past the goal, at or below a stop-loss
floor, or short of the minimum bet (ruin). Construction is vectorised with numpy so a chain of
10^6 states builds in well under a second; exact rows are produced only on request.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass, fields

import numpy as np

from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.chain.session_rules import TableRules, checked_unit, grid_steps, machine_bets, table_rules
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, count_text, denominator, numerator, text, to_int

GOAL, RUIN, FLOOR = 0, 1, 2
KIND_NAMES = ("goal", "ruin", "floor")
MAX_GRID = 50_000_000


@dataclass(frozen=True)
class BankrollGrid(TableRules):
    """A bounded session in grid steps: the table rules plus the start and the goal."""

    start: int
    goal: int

    @property
    def low(self) -> int:
        """The ruin level, at most the goal: a minimum bet no bankroll below the goal covers leaves no
        playing state (the same chain as any larger level, and a number that fits 64-bit arrays)."""
        return min(TableRules.low.fget(self), self.goal)

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


def make_grid(
    distribution: RoundDistribution,
    bankroll: Rational,
    goal: Rational,
    floor: Rational | None = None,
    min_bet: Rational | None = None,
    max_bet: Rational | None = None,
    unit: Rational | None = None,
    amounts: Iterable[Rational] = (),
) -> BankrollGrid:
    """Check the money amounts and express them in grid steps (one clear line per problem).

    ``unit`` None is the default unit of the session rules for the plan's fixed ``amounts``.
    """
    floor = QQ(0) if floor is None else floor
    unit = checked_unit(unit, min_bet, amounts)
    scale = distribution.net_denominator
    if bankroll < 0:
        raise OddsbenchError(f"session bankroll must be at least 0, got {text(bankroll)}")
    if floor < 0:
        raise OddsbenchError(f"session floor must be at least 0, got {text(floor)}")
    if goal <= bankroll:
        raise OddsbenchError(f"session goal {text(goal)} must be above the bankroll {text(bankroll)}")
    if floor >= bankroll and bankroll > 0:
        raise OddsbenchError(f"session floor {text(floor)} must be below the bankroll {text(bankroll)}")
    rules = table_rules(unit, scale, distribution.cover, floor, min_bet, max_bet)
    grid = BankrollGrid(
        **{item.name: getattr(rules, item.name) for item in fields(TableRules)},
        start=grid_steps("session bankroll", bankroll, unit, scale),
        goal=grid_steps("session goal", goal, unit, scale),
    )
    if grid.goal > MAX_GRID:
        raise OddsbenchError(f"session goal is {count_text(grid.goal)} grid steps; the limit is {MAX_GRID:,}")
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


MACHINE_BANKROLL = 2**62  # bankroll values (grid steps) are kept in 64-bit integers


def _machine_steps(distribution: RoundDistribution, grid: BankrollGrid, largest_bet: int) -> np.ndarray:
    """Each outcome's move per betting unit in grid steps, as int64, refused in one line when the largest
    bet times the largest move would carry the bankroll past what 64-bit integers hold."""
    steps = [to_int(o.net * grid.scale) for o in distribution.outcomes]
    widest = max(abs(step) for step in steps)
    if widest * largest_bet + grid.goal >= MACHINE_BANKROLL:
        net = max(distribution.outcomes, key=lambda o: abs(o.net)).net
        raise OddsbenchError(
            f"a round's net result of {text(net)} per unit staked, at bets up to {count_text(largest_bet)} x "
            f"{text(grid.unit)}, moves the bankroll by {count_text(widest * largest_bet)} grid steps of "
            f"{text(grid.step)}; a session handles moves up to {count_text(MACHINE_BANKROLL)}"
        )
    return np.array(steps, dtype=np.int64)


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
    bets = grid.placed(machine_bets(planned).reshape(levels, width), values_one).T.reshape(-1)
    values = np.repeat(values_one, levels)
    level_of = np.tile(np.arange(levels, dtype=np.int64), width)
    steps = _machine_steps(distribution, grid, int(bets.max(initial=0)))
    landing = bets[:, None] * steps[None, :]
    landing += values[:, None]
    inside = (landing >= low) & (landing < grid.goal)
    target = landing - low
    if levels > 1:  # one plan level (flat bets, timid play) needs no level arithmetic
        target *= levels
        target += np.asarray(next_level, dtype=np.int64)[level_of]
    outside_values = np.unique(landing[~inside])
    if low <= grid.start < grid.goal:
        starts = outside_values
    else:
        starts = np.union1d(outside_values, [grid.start])
    absorbing_values = np.asarray(starts, dtype=np.int64)
    outside = ~inside
    target[outside] = -1 - np.searchsorted(absorbing_values, landing[outside])
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
