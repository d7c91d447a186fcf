"""Floating-point first-step systems: one sparse LU (SuperLU) reused for every right-hand side."""

from __future__ import annotations

import numpy as np
from scipy.sparse import csc_matrix, identity
from scipy.sparse.linalg import splu


class FloatSingular(ArithmeticError):
    """I - Q is singular in floating point though not exactly: some stay-probability rounds to 1."""


class DecimalSparseLU:
    """Factor I - Q once (Q given as a sparse matrix), then solve many right-hand sides."""

    def __init__(self, q_matrix) -> None:
        size = q_matrix.shape[0]
        self.size = size
        system = csc_matrix(identity(size, format="csc") - q_matrix)
        try:
            self._lu = splu(system) if size else None
        except RuntimeError as error:  # SuperLU: "Factor is exactly singular"
            raise FloatSingular(str(error)) from None

    def solve(self, rhs: np.ndarray) -> np.ndarray:
        rhs = np.asarray(rhs, dtype=float)
        if self.size == 0:
            return rhs.copy()
        return self._lu.solve(rhs)

    def solve_transposed(self, rhs: np.ndarray) -> np.ndarray:
        """Solve (I - Q)^T x = rhs with the same factors (visits from a start, for distributions)."""
        rhs = np.asarray(rhs, dtype=float)
        if self.size == 0:
            return rhs.copy()
        return self._lu.solve(rhs, trans="T")


def q_matrix_from_rows(rows: list[dict[int, float]], size: int) -> csc_matrix:
    """A sparse Q from row dicts of floats."""
    data, row_index, col_index = [], [], []
    for i, row in enumerate(rows):
        for j, value in row.items():
            row_index.append(i)
            col_index.append(j)
            data.append(float(value))
    return csc_matrix((np.asarray(data, dtype=float), (row_index, col_index)), shape=(size, size))
