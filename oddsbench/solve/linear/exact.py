"""The exact representations behind the exact front door: rational elimination and sympy's solvers.

* ``elimination``: ``ExactSparseLU``, elimination without pivoting on dict rows. I - Q of an
  absorbing chain (every transient state can reach an end) is a nonsingular M-matrix, and so is
  each of its leading principal blocks: elimination in the given order needs no pivoting. Fill-in
  stays inside a chain's band (a bankroll walk stays tridiagonal, a 35-to-1 bet keeps a band of
  36), which is what makes exact solves of thousands of states take a fraction of a second.
* ``integer``: ``IntegerLU`` (``linear/integer_lu.py``), the same elimination in whole numbers
  (Bareiss): nothing reduced by a gcd until a value is asked for; solves return whole numerators
  over one denominator, for callers that need only a few figures from long solution vectors.
* ``dense``: sympy's ``DomainMatrix`` over QQ (python-flint's ``fmpq_mat`` underneath), with
  pivoting: for small general systems that are not I - Q (a root fit, a stationary law).
* ``fraction-free``: sympy's sparse fraction-free ``solve_den`` over ZZ after clearing
  denominators: an independent method for cross-checks and benchmarks.
"""

from __future__ import annotations

import heapq
from collections.abc import Callable, Mapping, Sequence
from math import lcm

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, from_sympy
from oddsbench.solve.linear.costs import (
    POLL_OPERATIONS,
    POLL_ROWS,
    ExactClock,
    factor_bits,
    require_exact_seconds,
    solve_seconds,
)
from oddsbench.solve.linear.costs import bits as _bits

Row = dict[int, Rational]
EXACT_METHODS = ("elimination", "integer", "dense", "fraction-free")


class ExactSparseLU:
    """Factor once, then solve for as many right-hand sides as needed."""

    method = "elimination"

    def __init__(
        self, rows: Sequence[Row], should_stop: Callable[[], bool] | None = None, max_bits: int | None = None
    ) -> None:
        """``max_bits`` bounds an estimate of the factors' size (stored numbers times the
        pivot's bits), checked row by row, so a chain whose rationals or fill-in explode stops
        early with ExactTooLarge instead of exhausting memory. The work budget's clock
        (``ExactClock``) is polled as rows and operations go by, and again in every solve."""
        size = len(rows)
        stored_bits = 0
        self.size = size
        self.should_stop = should_stop
        self.lower: list[list[tuple[int, Rational]]] = []
        self.upper: list[list[tuple[int, Rational]]] = []
        self.pivots: list[Rational] = []
        self._solve_seconds: float | None = None
        upper_maps: list[Row] = []
        clock = ExactClock(should_stop, size, "factorisation")
        operations = 0
        for i in range(size):
            if i % POLL_ROWS == 0:
                clock.poll(i)
            else:
                clock.tick(i)
            row = {j: v for j, v in rows[i].items() if v != 0}
            pending = [j for j in row if j < i]
            heapq.heapify(pending)
            multipliers: list[tuple[int, Rational]] = []
            while pending:
                operations += len(upper_maps[pending[0]]) + 1
                if operations > POLL_OPERATIONS:
                    operations = 0
                    clock.tick(i)
                k = heapq.heappop(pending)
                value = row.pop(k, None)
                if value is None or value == 0:
                    continue
                factor = value / self.pivots[k]
                multipliers.append((k, factor))
                for j, u in upper_maps[k].items():
                    if j not in row and j < i:
                        heapq.heappush(pending, j)
                    row[j] = row.get(j, QQ(0)) - factor * u
            pivot = row.pop(i, QQ(0))
            if pivot == 0:
                raise OddsbenchError("the first-step system is singular: some state cannot reach an end")
            kept = {j: v for j, v in row.items() if v != 0}
            if max_bits is not None:
                added = (len(kept) + len(multipliers) + 1) * _bits(pivot)
                stored_bits = factor_bits(stored_bits, added, max_bits, i, size)
            upper_maps.append(kept)
            self.lower.append(multipliers)
            self.upper.append(sorted(kept.items()))
            self.pivots.append(pivot)

    def solve_seconds(self) -> float:
        """Estimated seconds of one solve with these factors (``costs.solve_seconds``), measured once."""
        if self._solve_seconds is None:
            touched = self.size + sum(len(r) for r in self.lower) + sum(len(r) for r in self.upper)
            entry = next((v for r in self.upper for _, v in r), QQ(1))
            self._solve_seconds = solve_seconds(self.pivots, entry, touched)
        return self._solve_seconds

    def expect_solves(self, count: int) -> None:
        """``ExactTooLarge`` now, before any of them, when ``count`` solves would not fit the time left
        to exact arithmetic: callers that know how many solves follow say so right after factoring."""
        require_exact_seconds(count * self.solve_seconds(), f"{count} exact solves of {self.size:,} states")

    def _clock(self, doing: str) -> ExactClock:
        require_exact_seconds(self.solve_seconds(), f"an exact solve of {self.size:,} states")
        return ExactClock(self.should_stop, self.size, doing)

    def solve(self, rhs: Sequence[Rational]) -> list[Rational]:
        size = self.size
        clock = self._clock("solve")
        y: list[Rational] = [QQ(0)] * size
        for i in range(size):
            clock.tick(i // 2)
            total = rhs[i]
            for k, factor in self.lower[i]:
                total -= factor * y[k]
            y[i] = total
        x: list[Rational] = [QQ(0)] * size
        for i in range(size - 1, -1, -1):
            clock.tick((2 * size - i) // 2)
            total = y[i]
            for j, u in self.upper[i]:
                total -= u * x[j]
            x[i] = total / self.pivots[i]
        return x

    def solve_transposed(self, rhs: Sequence[Rational]) -> list[Rational]:
        """Solve A^T x = rhs with the same factors (A = L U, so A^T = U^T L^T).

        One transposed solve from a unit vector gives expected visits to every transient state,
        hence the whole distribution of where the chain is absorbed.
        """
        size = self.size
        clock = self._clock("solve")
        z: list[Rational] = list(rhs)
        for i in range(size):
            clock.tick(i // 2)
            value = z[i] / self.pivots[i]
            z[i] = value
            if value != 0:
                for j, u in self.upper[i]:
                    z[j] -= u * value
        for i in range(size - 1, -1, -1):
            clock.tick((2 * size - i) // 2)
            value = z[i]
            if value != 0:
                for k, factor in self.lower[i]:
                    z[k] -= factor * value
        return z


class DenseExactSolver:
    """sympy's dense ``DomainMatrix`` over QQ (flint underneath), with pivoting, for general systems."""

    method = "dense"

    def __init__(self, rows: Sequence[Mapping[int, Rational]]) -> None:
        from sympy.polys.matrices import DomainMatrix

        self.size = len(rows)
        dense = [[QQ(0)] * self.size for _ in range(self.size)]
        for i, row in enumerate(rows):
            for j, value in row.items():
                dense[i][j] += value
        self._matrix = DomainMatrix([[_to_sympy(v) for v in row] for row in dense], (self.size, self.size), _sympy_qq())

    def solve(self, rhs: Sequence[Rational]) -> list[Rational]:
        return self._solve(self._matrix, rhs)

    def solve_transposed(self, rhs: Sequence[Rational]) -> list[Rational]:
        return self._solve(self._matrix.transpose(), rhs)

    def _solve(self, matrix, rhs: Sequence[Rational]) -> list[Rational]:
        from sympy.polys.matrices import DomainMatrix

        column = DomainMatrix([[_to_sympy(QQ(value))] for value in rhs], (self.size, 1), _sympy_qq())
        return [from_sympy(row[0]) for row in matrix.lu_solve(column).to_list()]


def _sympy_qq():
    from sympy.polys.domains import QQ as SYMPY_QQ

    return SYMPY_QQ


def _to_sympy(value: Rational):
    """Our rational in sympy's QQ (the same object when sympy runs on FLINT ground types)."""
    domain = _sympy_qq()
    return value if isinstance(value, domain.dtype) else domain(int(value.p), int(value.q))


class FractionFreeSolver:
    """sympy's sparse fraction-free ``solve_den`` over ZZ: a second, independent exact method.

    Each row is scaled by the common denominator of its entries and its right-hand side, so the
    system is integral; ``solve_den`` returns numerators over one common denominator.
    """

    method = "fraction-free"

    def __init__(self, rows: Sequence[Mapping[int, Rational]]) -> None:
        self.size = len(rows)
        self._rows = [dict(row) for row in rows]

    def solve(self, rhs: Sequence[Rational]) -> list[Rational]:
        return self._solve(self._rows, rhs)

    def solve_transposed(self, rhs: Sequence[Rational]) -> list[Rational]:
        columns: list[dict[int, Rational]] = [{} for _ in range(self.size)]
        for i, row in enumerate(self._rows):
            for j, value in row.items():
                columns[j][i] = value
        return self._solve(columns, rhs)

    def _solve(self, rows: Sequence[Mapping[int, Rational]], rhs: Sequence[Rational]) -> list[Rational]:
        from sympy.polys.domains import ZZ
        from sympy.polys.matrices import DomainMatrix

        size = self.size
        scaled: dict[int, dict[int, object]] = {}
        rhs_scaled: dict[int, dict[int, object]] = {}
        for i, row in enumerate(rows):
            common = 1
            for value in [*row.values(), rhs[i]]:
                common = lcm(common, int(QQ.denom(value)))
            entries = {j: ZZ(int(QQ.numer(v * common))) for j, v in row.items() if v != 0}
            if entries:
                scaled[i] = entries
            top = rhs[i] * common
            if top != 0:
                rhs_scaled[i] = {0: ZZ(int(QQ.numer(top)))}
        matrix = DomainMatrix(scaled, (size, size), ZZ)
        vector = DomainMatrix(rhs_scaled, (size, 1), ZZ)
        numerators, denominator = matrix.solve_den(vector)
        dense = numerators.to_dense().to_list()
        return [QQ(int(dense[i][0]), int(denominator)) for i in range(size)]


def identity_minus(q_rows: Sequence[Row]) -> list[Row]:
    """I - Q, row by row."""
    system = []
    for i, row in enumerate(q_rows):
        entries = {j: -v for j, v in row.items()}
        entries[i] = entries.get(i, QQ(0)) + 1
        system.append(entries)
    return system
