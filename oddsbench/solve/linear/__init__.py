"""The one way to solve a linear system: a float front door and an exact one.

Like sympy's ``DomainMatrix.lu_solve``, which hands the work to whichever representation the
matrix has (dense, sparse, flint), each door factors once and returns factors with ``solve(rhs)``
and ``solve_transposed(rhs)`` for as many right-hand sides as needed; the caller never picks a
library routine.

Float: ``factor_float(system, order=...)``.

* A ``SkipFreeWalk`` (one law at every level, at most one level down a round) goes to the
  skip-free recursion (``linear/skip_free.py``): its chances of either end from every level in
  log space, from positive terms, and other right-hand sides by its Green function where that
  holds its digits (else a band LU of the same walk).
* A ``BandMatrix`` (band storage, built by walks over levels) goes to LAPACK's banded LU
  (``gbtrf``/``gbtrs``; ``gttrf``/``gttrs`` when tridiagonal); ``band_storage_fits`` says when
  the band is small enough to store.
* A scipy sparse matrix goes to SuperLU. ``order`` says what the caller knows of the state
  order: ``"fill-reducing"`` (irregular chains: COLAMD), ``"from-top"`` (states are bankroll
  levels, value-major: eliminate from the top without pivoting while the band's fill fits,
  ``Structure.band_fits``, else COLAMD), ``"natural"`` (the exact engine's order, for its fill).

Exact: ``factor_exact(rows, method=...)`` over dict rows of rationals: ``"elimination"``
(``ExactSparseLU``, no pivoting: I - Q of an absorbing chain), ``"integer"`` (``IntegerLU``: the
same elimination in whole numbers, solves as numerators over one denominator), ``"dense"`` (sympy
``DomainMatrix`` over QQ with pivoting, for small general systems), ``"fraction-free"`` (sympy's
sparse ``solve_den`` over ZZ, an independent method for cross-checks).

A new engine is one class with ``solve``/``solve_transposed``/``method`` and one rule in
``_float_engine``.
Heavy libraries (scipy, sympy) are imported only when a system is factored.
"""

from __future__ import annotations

from collections.abc import Callable, Sequence

import numpy as np

from oddsbench.model import budget
from oddsbench.solve.detached import Detached, can_detach
from oddsbench.solve.linear.banded import BandFactors, BandMatrix
from oddsbench.solve.linear.costs import ExactTooLarge, float_cost
from oddsbench.solve.linear.exact import (
    EXACT_METHODS,
    DenseExactSolver,
    ExactSparseLU,
    FractionFreeSolver,
    Row,
    identity_minus,
)
from oddsbench.solve.linear.integer_lu import IntegerLU, ScaledVector
from oddsbench.solve.linear.skip_free import SkipFreeFactors, SkipFreeWalk
from oddsbench.solve.linear.sparse import ORDERS, FloatSingular, SuperLUFactors, sparse_from_rows
from oddsbench.solve.linear.structure import (
    BAND_STORAGE_LIMIT,
    BANDED_FILL_LIMIT,
    Structure,
    band_storage_fits,
    structure_of,
)

__all__ = [
    "BAND_STORAGE_LIMIT",
    "BANDED_FILL_LIMIT",
    "EXACT_METHODS",
    "ORDERS",
    "BandFactors",
    "BandMatrix",
    "DenseExactSolver",
    "DetachedFactors",
    "ExactSparseLU",
    "ExactTooLarge",
    "FloatSingular",
    "FractionFreeSolver",
    "IntegerLU",
    "Row",
    "ScaledVector",
    "SkipFreeFactors",
    "SkipFreeWalk",
    "Structure",
    "SuperLUFactors",
    "band_storage_fits",
    "factor_exact",
    "factor_float",
    "identity_minus",
    "identity_minus_float",
    "sparse_from_rows",
    "structure_of",
]


def factor_float(
    system, order: str = "fill-reducing", should_stop: Callable[[], bool] | None = None
) -> BandFactors | SuperLUFactors | SkipFreeFactors | DetachedFactors:
    """Factor a square float system once (see the module text for how the engine is chosen).

    Its cost is estimated first (``costs.float_cost``): a factorisation that would not fit the
    memory left in the work budget is refused in one line, and a long one runs in a child process
    (``DetachedFactors``) that Ctrl-C, ``should_stop`` and the deadline can abandon.
    """
    if isinstance(system, SkipFreeWalk):
        return SkipFreeFactors(system)  # a recursion of O(levels) in numpy: nothing to bound
    cost = float_cost(system, order)
    if order == "from-top" and cost.memory > budget.memory_left():
        order = "fill-reducing"  # the band would not fit: let COLAMD look for less fill
        cost = float_cost(system, order)
    budget.require(f"the float factorisation of {cost.size:,} states", memory=cost.memory)
    if cost.detach and can_detach():
        return DetachedFactors(system, order, should_stop)
    return _float_engine(system, order)


def _float_engine(system, order: str) -> BandFactors | SuperLUFactors | SkipFreeFactors:
    if isinstance(system, SkipFreeWalk):
        return SkipFreeFactors(system)
    if isinstance(system, BandMatrix):
        return BandFactors(system)
    if order == "from-top" and not structure_of(system).band_fits:
        order = "fill-reducing"
    return SuperLUFactors(system, order)


class DetachedFactors:
    """A float factorisation made and kept in a child process (``solve/detached.py``): the same
    ``solve``/``solve_transposed``/``method`` as the factors it holds; the child ends with this object."""

    def __init__(self, system, order: str, should_stop: Callable[[], bool] | None = None) -> None:
        size = system.size if isinstance(system, BandMatrix) else system.shape[0]
        what = f"the float factorisation of {size:,} states"
        self._child = Detached(_float_engine, (system, order), what, should_stop)
        self.size = size
        self.method = self._child.attributes.get("method", "")
        self.stored = self._child.attributes.get("stored", 0)

    def solve(self, rhs) -> np.ndarray:
        return self._child.call("solve", rhs)

    def solve_transposed(self, rhs) -> np.ndarray:
        return self._child.call("solve_transposed", rhs)

    def close(self) -> None:
        self._child.close()


def identity_minus_float(q_matrix):
    """I - Q as a scipy CSC matrix, from a sparse Q of floats."""
    from scipy.sparse import identity

    return (identity(q_matrix.shape[0], format="csc") - q_matrix).tocsc()


def factor_exact(
    rows: Sequence[Row],
    method: str = "elimination",
    should_stop: Callable[[], bool] | None = None,
    max_bits: int | None = None,
) -> ExactSparseLU | IntegerLU | DenseExactSolver | FractionFreeSolver:
    """Factor a square system of exact rationals given as dict rows (see the module text).

    ``should_stop`` and ``max_bits`` bound the elimination (``SolveCancelled``, ``ExactTooLarge``).
    """
    if method == "elimination":
        return ExactSparseLU(rows, should_stop, max_bits)
    if method == "integer":
        return IntegerLU(rows, should_stop, max_bits)
    if method == "dense":
        return DenseExactSolver(rows)
    if method == "fraction-free":
        return FractionFreeSolver(rows)
    raise ValueError(f"unknown exact method {method!r} (known: {', '.join(EXACT_METHODS)})")
