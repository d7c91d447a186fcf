"""Elimination in whole numbers (fraction-free, after Bareiss 1968), for work that needs few values.

Rational elimination (``exact.ExactSparseLU``) reduces every number it makes by a gcd, and on a
2,000-state walk nearly all of a solve's time is those gcds (measured: a solve 0.26 s; the same
solve in whole numbers 0.04-0.1 s, and reducing its 2,000 results to lowest terms 0.2 s). Here
each row of I - Q is scaled to whole numbers, and every number stored is a minor of that matrix
(Bareiss), so all divisions are exact and nothing is reduced. A solve returns a ``ScaledVector``:
whole numerators over one common denominator. A caller that needs a handful of figures (the
exact round: expected visits, net and steps from every state, but figures only at the start)
combines them in whole numbers and reduces only the figures it shows.

Bareiss's entries: m(k)[i][j] = (p(k) m(k-1)[i][j] - m(k-1)[i][k] m(k-1)[k][j]) / p(k-1), with the
pivot p(k) = m(k-1)[k][k], the leading principal minor of order k + 1 (p(-1) = 1). A row that step
k leaves alone (its entry in column k is 0) is only scaled by p(k) / p(k-1), so each row is kept
at the level of the last step that touched it and the scalings telescope: a row at level s meets
step k as (p(k) row - row[k] U(k)) / p(s). The factors of the transpose are the same numbers read
the other way (L of the transpose is U, U of the transpose is L at full level), so one
factorisation serves both kinds of solve. No pivoting: I - Q of an absorbing chain is a
nonsingular M-matrix, every leading minor is nonzero.
"""

from __future__ import annotations

import heapq
from collections.abc import Callable, Sequence
from dataclasses import dataclass
from math import lcm

from flint import fmpq, fmpz

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational
from oddsbench.solve.linear.costs import POLL_OPERATIONS, POLL_ROWS, ExactClock, factor_bits, require_exact_seconds
from oddsbench.solve.linear.costs import fastest as _fastest

SOLVE_WORK_FACTOR = 1.5  # measured: a solve costs 1.5-2.5 timed multiply-and-divides per entry touched


@dataclass(frozen=True)
class ScaledVector:
    """Rationals ``numerators[i] / denominator`` kept unreduced: whole-number sums and products of
    them cost no gcd; ``value(i)`` reduces one."""

    numerators: tuple
    denominator: fmpz

    def __len__(self) -> int:
        return len(self.numerators)

    def value(self, index: int) -> Rational:
        return fmpq(self.numerators[index], self.denominator)

    def values(self) -> list[Rational]:
        return [fmpq(x, self.denominator) for x in self.numerators]

    def total(self) -> Rational:
        return fmpq(sum(self.numerators, fmpz(0)), self.denominator)

    def weighted(self, weights: Sequence[Rational]) -> Rational:
        """sum_i weights[i] x[i], the weights' denominators cleared once."""
        common = common_denominator(weights)
        total = fmpz(0)
        for weight, x in zip(weights, self.numerators):
            if weight != 0:
                total += (weight * common).p * x
        return fmpq(total, self.denominator * common)


def grouped_products(terms: Sequence[tuple[Rational, fmpz]]) -> Rational:
    """sum of ``weight * whole`` over (weight, whole) pairs: whole numbers summed per distinct weight
    (a chain has few distinct probabilities), then one rational sum of a few terms."""
    sums: dict[Rational, fmpz] = {}
    for weight, whole in terms:
        if weight != 0 and whole != 0:
            sums[weight] = sums.get(weight, fmpz(0)) + whole
    return sum((weight * total for weight, total in sums.items()), QQ(0))


def common_denominator(values: Sequence[Rational]) -> fmpz:
    """The least common multiple of the values' denominators, as a FLINT integer."""
    common = 1
    for value in values:
        denominator = int(QQ.denom(value))
        if denominator != 1:
            common = lcm(common, denominator)
    return fmpz(common)


class IntegerLU:
    """Factor once in whole numbers; ``solve_scaled`` and ``solve_transposed_scaled`` for as many
    right-hand sides as needed, ``solve``/``solve_transposed`` when every value is wanted reduced."""

    method = "integer elimination"

    def __init__(
        self,
        rows: Sequence[dict[int, Rational]],
        should_stop: Callable[[], bool] | None = None,
        max_bits: int | None = None,
    ) -> None:
        """``max_bits`` bounds the factors' size (stored numbers times the pivot's bits), checked row by
        row (``ExactTooLarge``); the work budget's clock is polled as rows go by, and in every solve."""
        size = len(rows)
        self.size = size
        self.should_stop = should_stop
        self.scale: list[fmpz] = []  # row i of the whole-number system is row i of I - Q times scale[i]
        self.pivots: list[fmpz] = []
        self.lower: list[list[tuple[int, fmpz, int]]] = []  # row i: (step k, entry at level s, s) in order
        self.upper: list[list[tuple[int, fmpz]]] = []  # row i: (j, m(i-1)[i][j]) for j > i
        self.upper_columns: list[list[tuple[int, fmpz]]] = [[] for _ in range(size)]  # column j: (i, U[i][j])
        self.lower_columns: list[list[tuple[int, fmpz]]] = [[] for _ in range(size)]  # column k: (i, m(k-1)[i][k])
        self._solve_seconds: float | None = None
        upper_maps: list[dict[int, fmpz]] = []
        clock = ExactClock(should_stop, size, "factorisation")
        stored_bits = operations = 0
        for i in range(size):
            if i % POLL_ROWS == 0:
                clock.poll(i)
            else:
                clock.tick(i)
            scale = common_denominator(list(rows[i].values()))
            row = {j: (v * scale).p for j, v in rows[i].items() if v != 0}
            self.scale.append(scale)
            pending = [j for j in row if j < i]
            heapq.heapify(pending)
            level = -1
            steps: list[tuple[int, fmpz, int]] = []
            while pending:
                k = heapq.heappop(pending)
                value = row.pop(k, None)
                if value is None or value == 0:
                    continue
                operations += len(upper_maps[k]) + len(row)
                if operations > POLL_OPERATIONS:
                    operations = 0
                    clock.tick(i)
                pivot, below = self.pivots[k], self._pivot(level)
                for j, v in row.items():
                    row[j] = pivot * v
                for j, u in upper_maps[k].items():
                    if j not in row:
                        row[j] = fmpz(0)
                        if j < i:
                            heapq.heappush(pending, j)
                    row[j] -= value * u
                if below != 1:
                    for j, v in row.items():
                        row[j] = v // below
                steps.append((k, value, level))
                self.lower_columns[k].append((i, _raise(value, level, k - 1, self.pivots)))
                level = k
            if level < i - 1:
                row = {j: _raise(v, level, i - 1, self.pivots) for j, v in row.items()}
            pivot = row.pop(i, fmpz(0))
            if pivot == 0:
                raise OddsbenchError("the first-step system is singular: some state cannot reach an end")
            kept = {j: v for j, v in row.items() if v != 0}
            if max_bits is not None:
                added = (len(kept) + len(steps) + 1) * pivot.bit_length()
                stored_bits = factor_bits(stored_bits, added, max_bits, i, size)
            upper_maps.append(kept)
            self.pivots.append(pivot)
            self.lower.append(steps)
            self.upper.append(sorted(kept.items()))
            for j, v in kept.items():
                self.upper_columns[j].append((i, v))

    @property
    def determinant(self) -> fmpz:
        """The determinant of the scaled whole-number system (its last pivot)."""
        return self.pivots[-1] if self.pivots else fmpz(1)

    def _pivot(self, level: int) -> fmpz:
        return self.pivots[level] if level >= 0 else fmpz(1)

    def solve_seconds(self) -> float:
        """Estimated seconds of one solve: entries touched times a multiply-and-divide timed on the
        factors' largest numbers (the solve's numbers are minors of the same size)."""
        if self._solve_seconds is None:
            touched = self.size + sum(len(r) for r in self.lower) + sum(len(r) for r in self.upper)
            if self.size == 0:
                self._solve_seconds = 0.0
            else:
                a = max(self.pivots, key=lambda p: p.bit_length())
                self._solve_seconds = SOLVE_WORK_FACTOR * touched * _fastest(lambda: (a * a) // a)
        return self._solve_seconds

    def expect_solves(self, count: int) -> None:
        """``ExactTooLarge`` now when ``count`` solves would not fit the time left to exact arithmetic."""
        require_exact_seconds(count * self.solve_seconds(), f"{count} exact solves of {self.size:,} states")

    def _clock(self) -> ExactClock:
        require_exact_seconds(self.solve_seconds(), f"an exact solve of {self.size:,} states")
        return ExactClock(self.should_stop, self.size, "solve")

    def solve_scaled(self, rhs: Sequence[Rational]) -> ScaledVector:
        """x with (I - Q) x = rhs, as whole numerators over one denominator."""
        size, pivots = self.size, self.pivots
        clock = self._clock()
        scaled = [QQ(b) * s for b, s in zip(rhs, self.scale)]
        common = common_denominator(scaled)
        forward: list[fmpz] = []
        for i in range(size):
            clock.tick(i // 2)
            v = (scaled[i] * common).p
            level = -1
            for k, value, at in self.lower[i]:
                v = pivots[k] * v - value * forward[k]
                if at >= 0:
                    v //= pivots[at]
                level = k
            forward.append(_raise(v, level, i - 1, pivots))
        return ScaledVector(tuple(self._back(forward, self.upper, clock)), self.determinant * common)

    def solve_transposed_scaled(self, rhs: Sequence[Rational]) -> ScaledVector:
        """x with (I - Q)^T x = rhs (a unit vector gives expected visits), as whole numerators over one
        denominator: the factors read as the transpose's, then the row scaling undone."""
        size, pivots = self.size, self.pivots
        clock = self._clock()
        common = common_denominator(rhs)
        forward: list[fmpz] = []
        for i in range(size):
            clock.tick(i // 2)
            v = (QQ(rhs[i]) * common).p
            level = -1
            for k, value in self.upper_columns[i]:  # the transpose's L: U read down column i, level k - 1
                if v == 0:
                    v = -(value * forward[k]) // pivots[k - 1] if k > 0 else -(value * forward[k])
                else:
                    v = _raise(v, level, k - 1, pivots)
                    v = pivots[k] * v - value * forward[k]
                    if k > 0:
                        v //= pivots[k - 1]
                level = k
            forward.append(_raise(v, level, i - 1, pivots))
        whole = self._back(forward, self.lower_columns, clock)
        return ScaledVector(tuple(s * x for s, x in zip(self.scale, whole)), self.determinant * common)

    def _back(self, forward: list[fmpz], upper: Sequence[Sequence[tuple[int, fmpz]]], clock: ExactClock) -> list:
        """Back substitution in whole numbers: p(i) X(i) = det Y(i) - sum_j U(i, j) X(j), X = det x (Cramer)."""
        size, pivots, det = self.size, self.pivots, self.determinant
        x: list = [fmpz(0)] * size
        for i in range(size - 1, -1, -1):
            clock.tick((2 * size - i) // 2)
            total = det * forward[i]
            for j, u in upper[i]:
                total -= u * x[j]
            x[i] = total // pivots[i]
        return x

    def solve(self, rhs: Sequence[Rational]) -> list[Rational]:
        return self.solve_scaled(rhs).values()

    def solve_transposed(self, rhs: Sequence[Rational]) -> list[Rational]:
        return self.solve_transposed_scaled(rhs).values()


def _raise(value: fmpz, level: int, to: int, pivots: list[fmpz]) -> fmpz:
    """A row's entry at level ``level`` brought to level ``to``: times p(to) / p(level), exactly."""
    if level >= to:
        return value
    value = value * pivots[to]
    return value // pivots[level] if level >= 0 else value
