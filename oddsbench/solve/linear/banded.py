"""LAPACK's banded LU as one representation behind the float front door.

A walk over levels whose round moves at most ``lower`` levels down and ``upper`` up gives a
system with that band and nothing outside it. LAPACK stores only the band and factors it with
partial pivoting in O(size x lower x (lower + upper)): ``gbtrf``/``gbtrs`` in general,
``gttrf``/``gttrs`` for a tridiagonal band (the same routines ``scipy.linalg.solve_banded`` runs
for one right-hand side, here split so that one factorisation serves several).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.solve.linear.sparse import FloatSingular


@dataclass(frozen=True)
class BandMatrix:
    """A square matrix in LAPACK band storage: ``bands[upper + i - j, j] = A[i, j]``."""

    lower: int
    upper: int
    bands: np.ndarray  # shape (lower + upper + 1, size)

    @property
    def size(self) -> int:
        return self.bands.shape[1]

    @classmethod
    def zeros(cls, lower: int, upper: int, size: int) -> BandMatrix:
        return cls(lower, upper, np.zeros((lower + upper + 1, size)))

    def add(self, rows: np.ndarray, cols: np.ndarray, values) -> None:
        """A[rows, cols] += values (entries must lie inside the band)."""
        np.add.at(self.bands, (self.upper + rows - cols, cols), values)


class BandFactors:
    """One LAPACK factorisation of a band matrix; solves for many right-hand sides."""

    def __init__(self, matrix: BandMatrix) -> None:
        from scipy.linalg import lapack

        self.size = matrix.size
        self.lower, self.upper = matrix.lower, matrix.upper
        self.tridiagonal = self.lower == 1 and self.upper == 1
        self.method = "LAPACK tridiagonal LU" if self.tridiagonal else "LAPACK banded LU"
        self._diagonal = None
        self._small = None
        if self.size == 0:
            return
        bands = matrix.bands
        if self.size == 1:  # a 1 x 1 system is a division (as scipy's solve_banded does it)
            self._diagonal = float(bands[self.upper, 0])
            if self._diagonal == 0:
                raise FloatSingular("the band matrix is singular at row 1")
            return
        if self.tridiagonal and self.size < 3:  # scipy's gttrf wrapper needs n >= 3; gtsv per solve
            self._small = bands.copy()
            return
        if self.tridiagonal:
            *self._factors, info = lapack.dgttrf(bands[2, :-1], bands[1, :], bands[0, 1:])
        else:
            storage = np.zeros((2 * self.lower + self.upper + 1, self.size))
            storage[self.lower :, :] = bands
            lu, pivots, info = lapack.dgbtrf(storage, self.lower, self.upper)
            self._factors = [lu, pivots]
        if info > 0:
            raise FloatSingular(f"the band matrix is singular at row {info}")

    def solve(self, rhs) -> np.ndarray:
        """x with A x = rhs; ``rhs`` a vector or a matrix of columns."""
        return self._solve(rhs, 0)

    def solve_transposed(self, rhs) -> np.ndarray:
        """x with A^T x = rhs, from the same factors."""
        return self._solve(rhs, 1)

    def _solve(self, rhs, trans: int) -> np.ndarray:
        from scipy.linalg import lapack

        rhs = np.asarray(rhs, dtype=float)
        if self.size == 0:
            return rhs.copy()
        if self._diagonal is not None:
            return rhs / self._diagonal
        if self._small is not None:
            upper, diagonal, lower = self._small[0, 1:], self._small[1, :], self._small[2, :-1]
            if trans:
                upper, lower = lower, upper
            *_, x, info = lapack.dgtsv(lower, diagonal, upper, rhs)
            if info > 0:
                raise FloatSingular(f"the band matrix is singular at row {info}")
            return x
        if self.tridiagonal:
            x, info = lapack.dgttrs(*self._factors, rhs, trans="NT"[trans])
        else:
            lu, pivots = self._factors
            x, info = lapack.dgbtrs(lu, self.lower, self.upper, rhs, pivots, trans=trans)
        if info != 0:
            raise ValueError(f"LAPACK band solve: illegal argument {-info}")
        return x
