"""SuperLU (through scipy) as one representation behind the float front door.

Three column orders, because each wins somewhere:

* ``fill-reducing``: SuperLU's COLAMD with its default partial pivoting. Irregular chains
  (rounds of a game, bold play, the optimiser's policies).
* ``from-top``: the given order reversed, no pivoting (``diag_pivot_thresh=0``, safe for the
  M-matrix I - Q). A bankroll walk whose losses step down by a few levels and wins up by many
  keeps its fill inside the band when eliminated from the top, several times faster than COLAMD.
* ``natural``: the given order, no pivoting: the order the exact engine eliminates in, so the
  float factors' size (``stored``) estimates the exact work.
"""

from __future__ import annotations

import numpy as np

ORDERS = ("fill-reducing", "from-top", "natural")


class FloatSingular(ArithmeticError):
    """I - Q is singular in floating point though not exactly: some stay-probability rounds to 1."""


class SuperLUFactors:
    """One SuperLU factorisation of a square sparse system; solves for many right-hand sides."""

    def __init__(self, system, order: str = "fill-reducing") -> None:
        from scipy.sparse import csc_matrix
        from scipy.sparse.linalg import splu

        if order not in ORDERS:
            raise ValueError(f"unknown column order {order!r} (known: {', '.join(ORDERS)})")
        self.size = system.shape[0]
        self.order = order
        self.method = f"SuperLU, {order} order"
        self._lu = None
        if self.size == 0:
            return
        try:
            if order == "fill-reducing":
                self._lu = splu(csc_matrix(system))
            elif order == "from-top":
                self._lu = splu(system[::-1, ::-1].tocsc(), permc_spec="NATURAL", diag_pivot_thresh=0)
            else:
                self._lu = splu(csc_matrix(system), permc_spec="NATURAL", diag_pivot_thresh=0)
        except RuntimeError as error:  # SuperLU: "Factor is exactly singular", or its allocation failed
            if "MALLOC" in str(error) or "memory" in str(error).lower():
                raise MemoryError(str(error)) from None
            raise FloatSingular(str(error)) from None
        except SystemError as error:  # SuperLU's own size counters overflowed: as good as out of memory
            raise MemoryError(str(error)) from None

    @property
    def stored(self) -> int:
        """Entries of L and U together: the fill of this order."""
        return 0 if self._lu is None else int(self._lu.L.nnz + self._lu.U.nnz)

    def solve(self, rhs) -> np.ndarray:
        """x with A x = rhs; ``rhs`` a vector or a matrix of columns."""
        return self._solve(rhs, "N")

    def solve_transposed(self, rhs) -> np.ndarray:
        """x with A^T x = rhs, from the same factors (expected visits from a start)."""
        return self._solve(rhs, "T")

    def _solve(self, rhs, trans: str) -> np.ndarray:
        rhs = np.asarray(rhs, dtype=float)
        if self._lu is None:
            return rhs.copy()
        if self.order != "from-top":
            return self._lu.solve(rhs, trans=trans)
        return self._lu.solve(np.ascontiguousarray(rhs[::-1]), trans=trans)[::-1]


def sparse_from_rows(rows: list[dict[int, float]], size: int):
    """A square scipy CSC matrix from row dicts of floats (equal positions added)."""
    from scipy.sparse import csc_matrix

    data, row_index, col_index = [], [], []
    for i, row in enumerate(rows):
        for j, value in row.items():
            row_index.append(i)
            col_index.append(j)
            data.append(float(value))
    return csc_matrix((np.asarray(data, dtype=float), (row_index, col_index)), shape=(size, size))
