"""What the float front door looks at before it chooses a representation: size and band.

A first-step system A = I - Q of an absorbing chain is a nonsingular M-matrix, and so is every
principal block of it, so Gaussian elimination needs no pivoting in any order. What decides the
fastest faithful factorisation is where the non-zeros sit: a walk over bankroll levels is
banded (lower and upper bandwidths), a round of a game is irregular.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

# A band of this many stored entries (bandwidth x size) still factors faster in the given order
# than with a fill-reducing reordering (measured on bankroll walks up to 10^6 states).
BANDED_FILL_LIMIT = 250_000_000


@dataclass(frozen=True)
class Structure:
    """Shape facts of a square system: ``lower``/``upper`` are the bandwidths below/above the diagonal."""

    size: int
    lower: int
    upper: int
    stored: int

    @property
    def bandwidth(self) -> int:
        """The farthest non-zero from the diagonal, on either side."""
        return max(self.lower, self.upper)

    @property
    def band_fits(self) -> bool:
        """Elimination in the given order keeps its fill inside a band small enough to store."""
        return self.bandwidth * self.size <= BANDED_FILL_LIMIT

    @property
    def tridiagonal(self) -> bool:
        return self.lower <= 1 and self.upper <= 1


def structure_of(matrix) -> Structure:
    """The structure of a scipy sparse matrix (CSC and CSR read in place; other formats via CSC)."""
    size = matrix.shape[0]
    if matrix.format not in ("csc", "csr"):
        matrix = matrix.tocsc()
    if matrix.nnz == 0:
        return Structure(size, 0, 0, 0)
    major = np.repeat(np.arange(matrix.shape[0 if matrix.format == "csr" else 1]), np.diff(matrix.indptr))
    offset = matrix.indices.astype(np.int64) - major  # column - row (CSR), or row - column (CSC)
    if matrix.format == "csc":
        offset = -offset
    return Structure(size, int(max(-offset.min(), 0)), int(max(offset.max(), 0)), int(matrix.nnz))


# LAPACK's band LU stores 2 x lower + upper + 1 numbers per row; above this many it costs more memory
# than SuperLU's fill for the same walk, and the sparse engine takes over.
BAND_STORAGE_LIMIT = 40_000_000


def band_storage_fits(lower: int, upper: int, size: int) -> bool:
    """LAPACK's band storage of a system of this band and size stays within ``BAND_STORAGE_LIMIT`` numbers."""
    return (2 * lower + upper + 1) * size <= BAND_STORAGE_LIMIT
