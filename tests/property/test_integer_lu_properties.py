"""Elimination in whole numbers (``IntegerLU``) gives exactly what rational elimination gives.

Random absorbing chains with irregular steps (hypothesis): any state may step to any state, so
elimination fills in, rows skip levels and some entries cancel. Both solves, from rational and
from whole-number factors, must agree to the last digit, and the figures kept unreduced
(``ScaledVector``: weighted sums, totals, products grouped by weight) must equal the same sums
taken over reduced rationals.
"""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.model.numbers import QQ
from oddsbench.solve.linear import factor_exact, identity_minus
from oddsbench.solve.linear.integer_lu import grouped_products


@st.composite
def chains(draw):
    """Q rows of an absorbing chain on 1..14 states: each state leaks to an end with some chance."""
    size = draw(st.integers(1, 14))
    rows = []
    for _ in range(size):
        targets = draw(st.lists(st.integers(0, size - 1), max_size=4, unique=True))
        weights = draw(st.lists(st.integers(1, 40), min_size=len(targets), max_size=len(targets)))
        leak = draw(st.integers(1, 30))
        total = sum(weights) + leak
        rows.append({j: QQ(w, total) for j, w in zip(targets, weights)})
    rhs = draw(st.lists(st.fractions(min_value=-5, max_value=5, max_denominator=50), min_size=size, max_size=size))
    return rows, [QQ(v.numerator, v.denominator) for v in rhs]


@settings(max_examples=80, deadline=None)
@given(chains())
def test_whole_number_elimination_solves_exactly_as_rational_elimination(chain):
    q_rows, rhs = chain
    system = identity_minus(q_rows)
    rational = factor_exact(system)
    whole = factor_exact(system, method="integer")
    assert whole.solve(rhs) == rational.solve(rhs)
    assert whole.solve_transposed(rhs) == rational.solve_transposed(rhs)


@settings(max_examples=40, deadline=None)
@given(chains(), st.lists(st.fractions(min_value=-3, max_value=3, max_denominator=12), min_size=14, max_size=14))
def test_figures_from_unreduced_vectors_equal_the_same_sums_of_reduced_values(chain, weights):
    q_rows, rhs = chain
    whole = factor_exact(identity_minus(q_rows), method="integer")
    x = whole.solve_scaled(rhs)
    y = whole.solve_transposed_scaled(rhs)
    reduced_x, reduced_y = x.values(), y.values()
    w = [QQ(v.numerator, v.denominator) for v in weights[: len(rhs)]]
    assert x.weighted(w) == sum((a * b for a, b in zip(w, reduced_x)), QQ(0))
    assert y.total() == sum(reduced_y, QQ(0))
    assert all(x.value(i) == reduced_x[i] for i in range(len(x)))
    pairs = [(w[i], x.numerators[i] * y.numerators[i]) for i in range(len(rhs))]
    expected = sum((w[i] * reduced_x[i] * reduced_y[i] for i in range(len(rhs))), QQ(0))
    assert grouped_products(pairs) / (x.denominator * y.denominator) == expected
