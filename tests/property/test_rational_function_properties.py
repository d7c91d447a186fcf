"""Exact rational functions: reconstruction from values and the roots of f = target.

Specification: two rational functions with deg P <= a and deg Q <= b that agree at a + b + 1
points are equal (P1 Q2 - P2 Q1 has degree <= a + b; von zur Gathen and Gerhard, "Modern Computer
Algebra", section 5.7), so the reconstruction from any a + b + 1 points of a function within the
bounds gives that function back; every rational root solves f = target exactly, and every
algebraic one lies where P - target Q changes sign.
"""

from __future__ import annotations

import math

from flint import fmpz_poly
from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.model.numbers import QQ
from oddsbench.solve.rational_function import RationalFunction, reconstruct, solutions

small = st.integers(min_value=-9, max_value=9)
polynomials = st.lists(small, min_size=1, max_size=4).filter(lambda c: c[-1] != 0)


def lowest_terms(p: list[int], q: list[int]) -> RationalFunction:
    """p/q with the common factor removed and q's leading coefficient positive (flint's gcd)."""
    top, bottom = fmpz_poly(p), fmpz_poly(q)
    common = top.gcd(bottom)
    top, bottom = top // common, bottom // common
    p2, q2 = [int(c) for c in top.coeffs()] or [0], [int(c) for c in bottom.coeffs()]
    content = math.gcd(*p2, *q2)
    sign = -1 if q2[-1] < 0 else 1
    return RationalFunction(tuple(sign * c // content for c in p2), tuple(sign * c // content for c in q2))


@settings(max_examples=60, deadline=None)
@given(polynomials, polynomials, st.integers(min_value=0, max_value=2), st.integers(min_value=0, max_value=2))
def test_reconstruction_within_the_bounds_gives_the_function_back(p, q, extra_top, extra_bottom):
    truth = lowest_terms(p, q)
    top, bottom = truth.degrees[0] + extra_top, truth.degrees[1] + extra_bottom
    xs = [QQ(k, 3) for k in range(-40, 40)]
    points = [(x, truth(x)) for x in xs if _defined(truth, x)]
    found = reconstruct(points[: top + bottom + 4], top, bottom)  # three more points confirm it
    assert found == truth


@settings(max_examples=60, deadline=None)
@given(polynomials, polynomials, st.fractions(min_value=-5, max_value=5, max_denominator=7))
def test_every_solution_solves_the_equation(p, q, target):
    f = lowest_terms(p, q)
    target = QQ(target.numerator, target.denominator)
    found = solutions(f, target)
    if found is None:
        assert all(f(QQ(k)) == target for k in range(-3, 4) if _defined(f, QQ(k)))
        return
    for s in found:
        if s.exact is not None:
            assert f(s.exact) == target
        else:
            left = QQ(s.approximate) - QQ(1, 10**6)
            right = QQ(s.approximate) + QQ(1, 10**6)
            # a simple root of an irreducible factor: the factor changes sign across it
            assert _at(s.polynomial, left) * _at(s.polynomial, right) <= 0
    assert [s.approximate for s in found] == sorted(s.approximate for s in found)


def _at(coefficients, x):
    return sum(c * x**i for i, c in enumerate(coefficients))


def _defined(f: RationalFunction, x) -> bool:
    return _at(f.denominator, x) != 0
