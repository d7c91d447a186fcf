"""The float and exact front doors (solve/linear): which engine runs, and that each solves right.

Reference answers come from numpy's dense solver (LAPACK gesv) and from exact rationals.
"""

from __future__ import annotations

import numpy as np
import pytest
from scipy.sparse import csc_matrix, identity

from oddsbench.model.numbers import QQ
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.linear import (
    BandFactors,
    BandMatrix,
    ExactTooLarge,
    FloatSingular,
    SuperLUFactors,
    factor_exact,
    factor_float,
    identity_minus,
    identity_minus_float,
    sparse_from_rows,
    structure_of,
)


def walk_rows(size: int, up, down) -> list[dict]:
    """Rows of Q of a +1/-1 walk on transient levels 0..size-1 (absorbing just outside)."""
    rows = [{} for _ in range(size)]
    for i in range(size):
        if i + 1 < size:
            rows[i][i + 1] = up
        if i > 0:
            rows[i][i - 1] = down
    return rows


def walk_q(size: int, up: float, down: float):
    return sparse_from_rows(walk_rows(size, up, down), size)


def band_of(dense: np.ndarray, lower: int, upper: int) -> BandMatrix:
    size = dense.shape[0]
    band = BandMatrix.zeros(lower, upper, size)
    rows, cols = np.nonzero(dense)
    band.add(rows, cols, dense[rows, cols])
    return band


def test_structure_reads_both_bandwidths():
    dense = np.eye(6)
    dense[4, 1] = -0.25  # three below the diagonal
    dense[0, 2] = -0.5  # two above
    structure = structure_of(csc_matrix(dense))
    assert (structure.size, structure.lower, structure.upper, structure.stored) == (6, 3, 2, 8)
    assert structure.bandwidth == 3 and not structure.tridiagonal


def test_a_band_matrix_goes_to_lapack_and_a_sparse_one_to_superlu():
    system = identity_minus_float(walk_q(40, 0.45, 0.5))
    dense = system.toarray()
    assert isinstance(factor_float(band_of(dense, 1, 1)), BandFactors)
    assert factor_float(band_of(dense, 1, 1)).method == "LAPACK tridiagonal LU"
    assert factor_float(band_of(dense, 2, 3)).method == "LAPACK banded LU"
    assert isinstance(factor_float(system), SuperLUFactors)
    assert factor_float(system).method == "SuperLU, fill-reducing order"
    assert factor_float(system, order="from-top").method == "SuperLU, from-top order"


def test_from_top_falls_back_to_fill_reducing_when_the_band_is_too_wide_to_store():
    size = 20_000  # one entry in the far corner: bandwidth x size = 4e8, over the band-fill limit
    q = csc_matrix(([0.5], ([0], [size - 1])), shape=(size, size))
    factors = factor_float(identity_minus_float(q), order="from-top")
    assert factors.order == "fill-reducing"
    x = factors.solve(np.ones(size))
    assert x[0] == pytest.approx(1.5) and x[1] == pytest.approx(1.0)


@pytest.mark.parametrize("order", ["fill-reducing", "from-top", "natural"])
def test_every_superlu_order_solves_and_solves_transposed(order):
    system = identity_minus_float(walk_q(30, 0.3, 0.6))
    dense = system.toarray()
    rhs = np.linspace(0.0, 1.0, 30)
    factors = factor_float(system, order=order)
    assert np.allclose(factors.solve(rhs), np.linalg.solve(dense, rhs), rtol=1e-13, atol=0)
    assert np.allclose(factors.solve_transposed(rhs), np.linalg.solve(dense.T, rhs), rtol=1e-13, atol=0)
    block = np.column_stack([rhs, np.ones(30)])
    assert np.allclose(factors.solve(block), np.linalg.solve(dense, block), rtol=1e-13, atol=0)


@pytest.mark.parametrize(("lower", "upper"), [(1, 1), (2, 1), (1, 3), (0, 2)])
def test_lapack_band_solves_and_solves_transposed(lower, upper):
    rng = np.random.default_rng(lower * 10 + upper)
    size = 25
    dense = np.eye(size)
    for offset in range(-lower, upper + 1):
        if offset:
            dense += np.diag(-rng.uniform(0, 0.9 / (lower + upper), size - abs(offset)), offset)
    factors = factor_float(band_of(dense, lower, upper))
    rhs = rng.uniform(size=(size, 2))
    assert np.allclose(factors.solve(rhs), np.linalg.solve(dense, rhs), rtol=1e-13, atol=0)
    assert np.allclose(factors.solve_transposed(rhs), np.linalg.solve(dense.T, rhs), rtol=1e-13, atol=0)


def test_lapack_band_of_one_state_is_a_division_as_in_scipy():
    band = BandMatrix.zeros(1, 1, 1)
    band.bands[1, 0] = 4.0
    assert factor_float(band).solve(np.array([2.0])).tolist() == [0.5]


def test_the_band_engine_gives_the_same_floats_as_scipy_solve_banded():
    from scipy.linalg import solve_banded

    rng = np.random.default_rng(7)
    for lower, upper, size in ((1, 1, 300), (1, 1, 2), (2, 35, 300)):
        bands = -rng.uniform(0, 0.02, (lower + upper + 1, size))
        bands[upper, :] = 1.0
        rhs = rng.uniform(size=size)
        ours = factor_float(BandMatrix(lower, upper, bands)).solve(rhs)
        assert np.array_equal(ours, solve_banded((lower, upper), bands, rhs))


def test_singular_float_systems_are_named_as_such():
    with pytest.raises(FloatSingular):
        factor_float(csc_matrix(np.array([[1.0, 1.0], [1.0, 1.0]])))
    band = BandMatrix.zeros(1, 1, 3)
    band.bands[1, :] = [1.0, 0.0, 1.0]
    with pytest.raises(FloatSingular):
        factor_float(band)


def test_an_empty_system_returns_its_right_hand_side():
    empty = identity(0, format="csc")
    assert factor_float(empty).solve(np.zeros(0)).shape == (0,)
    assert factor_float(BandMatrix.zeros(1, 1, 0)).solve(np.zeros(0)).shape == (0,)


def test_unknown_order_and_method_are_refused():
    with pytest.raises(ValueError, match="unknown column order"):
        factor_float(identity(3, format="csc"), order="sideways")
    with pytest.raises(ValueError, match="unknown exact method"):
        factor_exact([{0: QQ(1)}], method="guess")


def _exact_walk(size: int):
    """I - Q of an 18/37 walk, exactly, with the chance of leaving at the top as right-hand side."""
    rhs = [QQ(0)] * size
    rhs[-1] = QQ(18, 37)
    return identity_minus(walk_rows(size, QQ(18, 37), QQ(19, 37))), rhs


def test_the_three_exact_methods_agree_both_ways():
    rows, rhs = _exact_walk(12)
    answers = {method: factor_exact(rows, method=method) for method in ("elimination", "dense", "fraction-free")}
    plain = {method: factors.solve(rhs) for method, factors in answers.items()}
    transposed = {method: factors.solve_transposed(rhs) for method, factors in answers.items()}
    assert plain["elimination"] == plain["dense"] == plain["fraction-free"]
    assert transposed["elimination"] == transposed["dense"] == transposed["fraction-free"]
    # gambler's ruin (Feller vol. I ch. XIV sec. 2): P(goal from k) = (1 - r^k) / (1 - r^N), r = q/p;
    # the top transient level is k = 12 of N = 13
    r = QQ(19, 18)
    assert plain["elimination"][-1] == (r**12 - 1) / (r**13 - 1)


def test_dense_exact_method_pivots_where_elimination_in_order_cannot():
    rows = [{1: QQ(2)}, {0: QQ(3), 1: QQ(4)}]  # zero in the first pivot: not an M-matrix
    assert factor_exact(rows, method="dense").solve([QQ(2), QQ(7)]) == [QQ(1), QQ(1)]


def test_exact_elimination_stops_on_size_and_on_request():
    rows, _ = _exact_walk(400)
    with pytest.raises(ExactTooLarge, match="exact size limit"):
        factor_exact(rows, max_bits=1_000)
    with pytest.raises(SolveCancelled):
        factor_exact(rows, should_stop=lambda: True)
