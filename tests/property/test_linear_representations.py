"""Every representation behind the front doors gives the same answer on the same chain.

Random walks over levels with bounded jumps (hypothesis): the system I - Q of ruin before a goal,
solved by LAPACK's band LU, by SuperLU in each column order, and exactly by the three exact
methods. The exact methods must agree to the last digit; each float engine must match the exact
answer to 1e-12 (absolute, on chances in [0, 1]; direct solvers give about 1e-14).
"""

from __future__ import annotations

import numpy as np
from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve.linear import BandMatrix, factor_exact, factor_float, sparse_from_rows

ORDERS = ("fill-reducing", "from-top", "natural")


@st.composite
def walks(draw):
    """(law {jump: chance}, number of transient levels): jumps between -3 and +4, chances exact."""
    jumps = draw(st.lists(st.integers(-3, 4), min_size=2, max_size=5, unique=True))
    if min(jumps) >= 0:
        jumps[0] = -1
    weights = draw(st.lists(st.integers(1, 9), min_size=len(jumps), max_size=len(jumps)))
    total = sum(weights)
    law = {jump: QQ(weight, total) for jump, weight in zip(jumps, weights)}
    return law, draw(st.integers(2, 40))


def systems(law, size):
    """Exact rows, float rows and a band matrix of I - Q; right-hand side: ruin in one round."""
    lower = max(0, -min(law))
    upper = max(0, max(law))
    exact_rows, float_rows, rhs = [], [], []
    band = BandMatrix.zeros(lower, upper, size)
    for k in range(size):
        row = {k: QQ(1)}
        ruin_now = QQ(0)
        for jump, chance in law.items():
            target = k + jump
            if target < 0:
                ruin_now += chance
            elif target < size:
                row[target] = row.get(target, QQ(0)) - chance
        exact_rows.append(row)
        float_rows.append({j: to_float(v) for j, v in row.items()})
        rhs.append(ruin_now)
        cols = np.array(list(row))
        band.add(np.full(len(cols), k), cols, [to_float(v) for v in row.values()])
    return exact_rows, float_rows, band, rhs


@settings(max_examples=60, deadline=None)
@given(walks())
def test_float_engines_match_the_exact_engines_on_the_same_walk(walk):
    law, size = walk
    exact_rows, float_rows, band, rhs = systems(law, size)
    truth = factor_exact(exact_rows).solve(rhs)
    assert factor_exact(exact_rows, method="dense").solve(rhs) == truth
    assert factor_exact(exact_rows, method="fraction-free").solve(rhs) == truth
    assert factor_exact(exact_rows, method="integer").solve(rhs) == truth
    truth_t = factor_exact(exact_rows).solve_transposed(rhs)
    assert factor_exact(exact_rows, method="integer").solve_transposed(rhs) == truth_t
    assert factor_exact(exact_rows, method="fraction-free").solve_transposed(rhs) == truth_t
    expected = np.array([to_float(v) for v in truth])
    expected_t = np.array([to_float(v) for v in truth_t])
    rhs_float = np.array([to_float(v) for v in rhs])
    engines = [factor_float(band)] + [factor_float(sparse_from_rows(float_rows, size), order=o) for o in ORDERS]
    for engine in engines:
        assert np.allclose(engine.solve(rhs_float), expected, rtol=0, atol=1e-12), engine.method
        scale = max(1.0, float(np.max(np.abs(expected_t))))
        assert np.allclose(engine.solve_transposed(rhs_float), expected_t, rtol=0, atol=1e-12 * scale), engine.method
