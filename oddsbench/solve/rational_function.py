"""Exact rational functions of one variable: reconstruction from exact values, and exact roots.

``reconstruct(points, a, b)`` finds the rational function P/Q with deg P <= a, deg Q <= b through
a + b + 1 exact points (Cauchy interpolation: the Newton polynomial through the points, then the
extended Euclidean algorithm against prod (x - x_k), stopped at the first remainder of degree <= a;
von zur Gathen and Gerhard, "Modern Computer Algebra", section 5.7). If the true function has
degrees within the bounds it is the one found: two such functions that agree on a + b + 1 points
are equal, since P Q' - P' Q has degree at most a + b. The caller confirms at further points.

``solutions(f, target, low, high)``: every real x with f(x) = target: rational roots exactly (from
the factors of degree 1 over the rationals), the others as exact algebraic numbers (sympy
``CRootOf`` of an irreducible integer polynomial, built from its coefficients) with certified
decimals (python-flint ``arb`` balls; every digit shown is proved).
"""

from __future__ import annotations

import functools
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, to_float
from oddsbench.solve.ruin.balls import Certified, bits_for, certified, certified_exact, enough, precision, with_retries

ROOT_DIGITS = 30
ROOT_CACHE = 64  # factors x precisions whose real roots are kept (text, a few KB each)


class DegreeBoundFailed(OddsbenchError):
    """The points do not fit a rational function within the degree bounds (a wrong bound: a bug)."""


@dataclass(frozen=True)
class RationalFunction:
    """P(x)/Q(x) in lowest terms, integer coefficients lowest power first, Q's leading one positive."""

    numerator: tuple[int, ...]
    denominator: tuple[int, ...]

    def __call__(self, x: Rational) -> Rational:
        return poly_value(self.numerator, x) / poly_value(self.denominator, x)

    @property
    def degrees(self) -> tuple[int, int]:
        return len(self.numerator) - 1, len(self.denominator) - 1

    def text(self, variable: str) -> str:
        """The function in the expression language of rulesets: ``(19 - 18*payout)/37``."""
        top = poly_text(self.numerator, variable)
        if self.denominator == (1,):
            return top
        if len([c for c in self.numerator if c]) > 1:
            top = f"({top})"
        bottom = poly_text(self.denominator, variable)
        if len([c for c in self.denominator if c]) > 1 or len(self.denominator) > 1:
            bottom = f"({bottom})"
        return f"{top}/{bottom}"


def poly_value(coefficients: Sequence[Rational], x: Rational) -> Rational:
    """A polynomial (coefficients lowest power first) at x, by Horner's rule, exactly."""
    total = QQ(0)
    for c in reversed(coefficients):
        total = total * x + c
    return total


def poly_text(low_first: Sequence[int], variable: str) -> str:
    """``19 - 18*payout + payout^2``: lowest power first, in the expression language of rulesets."""
    parts: list[str] = []
    for power, c in enumerate(low_first):
        if c == 0:
            continue
        size = abs(c)
        monomial = "" if power == 0 else variable if power == 1 else f"{variable}^{power}"
        body = str(size) if not monomial else monomial if size == 1 else f"{size}*{monomial}"
        if not parts:
            parts.append(("-" if c < 0 else "") + body)
        else:
            parts.append(("- " if c < 0 else "+ ") + body)
    return " ".join(parts) or "0"


def reconstruct(points: Sequence[tuple[Rational, Rational]], top: int, bottom: int) -> RationalFunction:
    """The rational function with numerator degree <= ``top`` and denominator degree <= ``bottom``
    through the first ``top + bottom + 1`` points (distinct abscissae); every point is then checked."""
    from flint import fmpq, fmpq_poly

    count = top + bottom + 1
    if len(points) < count:
        raise ValueError(f"{count} points are needed, {len(points)} given")
    used = points[:count]
    xs = [fmpq(numerator(x), denominator(x)) for x, _ in used]
    ys = [fmpq(numerator(y), denominator(y)) for _, y in used]
    interpolant = _newton(xs, ys)
    modulus = fmpq_poly([1])
    for x in xs:
        modulus *= fmpq_poly([-x, 1])
    r0, r1 = modulus, interpolant
    u0, u1 = fmpq_poly([0]), fmpq_poly([1])
    while r1 != 0 and r1.degree() > top:
        quotient, remainder = divmod(r0, r1)
        r0, r1 = r1, remainder
        u0, u1 = u1, u0 - quotient * u1
    if u1 == 0 or u1.degree() > bottom:
        raise DegreeBoundFailed("no rational function within the degree bounds goes through these values")
    common = r1.gcd(u1) if r1 != 0 else u1
    result = _normalised(r1 / common if r1 != 0 else fmpq_poly([0]), u1 / common)
    for x, y in points:
        if poly_value(result.denominator, x) == 0 or result(x) != y:
            raise DegreeBoundFailed("the values do not fit one rational function within the degree bounds")
    return result


def _newton(xs, ys):
    """The interpolating polynomial (Newton's divided differences) as an fmpq_poly."""
    from flint import fmpq_poly

    coefficients = list(ys)
    n = len(xs)
    for level in range(1, n):
        for i in range(n - 1, level - 1, -1):
            coefficients[i] = (coefficients[i] - coefficients[i - 1]) / (xs[i] - xs[i - level])
    result = fmpq_poly([coefficients[-1]])
    for i in range(n - 2, -1, -1):
        result = result * fmpq_poly([-xs[i], 1]) + coefficients[i]
    return result


def _normalised(top, bottom) -> RationalFunction:
    """Integer coefficients with no common factor, the denominator's leading coefficient positive."""
    scale = math.lcm(int(top.denom()), int(bottom.denom()))
    p = [int(c * scale) for c in top.coeffs()] or [0]
    q = [int(c * scale) for c in bottom.coeffs()]
    content = math.gcd(*p, *q)
    sign = -1 if q[-1] < 0 else 1
    return RationalFunction(tuple(sign * c // content for c in p), tuple(sign * c // content for c in q))


@dataclass(frozen=True)
class Solution:
    """One real x with f(x) = target: ``exact`` (a rational), or the ``index``-th real root (from the
    smallest) of the irreducible integer ``polynomial`` (lowest power first), certified to ``decimal``."""

    exact: Rational | None
    polynomial: tuple[int, ...]
    index: int
    decimal: Certified
    approximate: float

    def text(self, variable: str) -> str:
        """``19/18``, or ``the 2nd real root of -2 + p^2`` (exact: an irreducible integer polynomial)."""
        if self.exact is not None:
            from oddsbench.model.numbers import text

            return text(self.exact)
        return f"the {ordinal(self.index + 1)} real root of {poly_text(self.polynomial, variable)}"

    @property
    def algebraic(self) -> Any:
        """The exact number as sympy sees it: a rational, or ``CRootOf`` built from the integer coefficients."""
        if self.exact is not None:
            return self.exact
        from sympy import CRootOf, Poly, Symbol

        return CRootOf(Poly(list(reversed(self.polynomial)), Symbol("x"), domain="ZZ"), self.index)


def ordinal(number: int) -> str:
    """1st, 2nd, 3rd, 4th, ..., 11th, 12th, 13th, ..., 21st, 22nd, 23rd, ..., 111th (English ordinals)."""
    if number % 100 in (11, 12, 13):
        return f"{number}th"
    suffix = {1: "st", 2: "nd", 3: "rd"}.get(number % 10, "th")
    return f"{number}{suffix}"


def equation(f: RationalFunction, target: Rational) -> tuple[int, ...]:
    """Integer coefficients (lowest first) of P - target Q, whose real roots (where Q is not 0) solve f = target."""
    scale = denominator(target)
    top = numerator(target)
    size = max(len(f.numerator), len(f.denominator))
    p = list(f.numerator) + [0] * (size - len(f.numerator))
    q = list(f.denominator) + [0] * (size - len(f.denominator))
    coefficients = [scale * a - top * b for a, b in zip(p, q)]
    while len(coefficients) > 1 and coefficients[-1] == 0:
        coefficients.pop()
    return tuple(coefficients)


def solutions(f: RationalFunction, target: Rational) -> tuple[Solution, ...] | None:
    """Every real solution of f(x) = target in increasing order; None when f is the constant ``target``.

    Factoring and root isolation run inside flint, where Ctrl-C and a cancel cannot reach: they are
    estimated against the work budget first and, past a small degree, run detached (as the ruin
    engines' roots do), so the workbench's Esc and the deadline stop them."""
    from oddsbench.solve.ruin.roots import detached_roots, require_root_budget

    coefficients = equation(f, target)
    if coefficients == (0,):
        return None
    if len(coefficients) == 1:
        return ()
    require_root_budget(coefficients, "equation f(x) = target")
    factors = detached_roots(coefficients, _irreducible_factors, (coefficients,), "factoring f(x) = target")
    found: list[Solution] = []
    for low_first in factors:
        if len(low_first) == 2:
            root = QQ(-low_first[0], low_first[1])
            if poly_value(f.denominator, root) != 0:
                found.append(Solution(root, low_first, 0, certified_exact(root, ROOT_DIGITS), to_float(root)))
            continue
        for index, ball in enumerate(_real_root_balls(low_first)):
            found.append(_algebraic(low_first, index, ball))
    return tuple(sorted(found, key=lambda s: s.approximate))


def _irreducible_factors(low_first: tuple[int, ...]) -> list[tuple[int, ...]]:
    """The distinct irreducible integer factors (lowest power first) of a polynomial: plain integers,
    so that a detached child can send them back."""
    from flint import fmpz_poly

    _, factors = fmpz_poly(list(low_first)).factor()
    return [tuple(int(c) for c in factor.coeffs()) for factor, _multiplicity in factors]


def _real_root_balls(low_first: tuple[int, ...]) -> list[Any]:
    """The real roots of an irreducible integer polynomial as proved arb balls at the current
    precision, smallest first (found detached when the degree is large)."""
    import flint

    return [flint.arb(found) for found in _roots_at(low_first, flint.ctx.prec)]


@functools.lru_cache(maxsize=ROOT_CACHE)
def _roots_at(low_first: tuple[int, ...], prec: int) -> tuple[str, ...]:
    """``_real_root_texts``, found once per factor and precision: every root's certificate and every
    validity sign asks for one root of the same factor (a degree-60 factor with 55 real roots asked
    192 times, each a child process), and a root found at a precision stays found. A stop or an
    error is not kept (``lru_cache`` keeps only returned values)."""
    from oddsbench.solve.ruin.roots import detached_roots

    texts = detached_roots(low_first, _real_root_texts, (low_first, prec), "finding the roots of f(x) = target")
    return tuple(texts)


def _real_root_texts(low_first: tuple[int, ...], prec: int) -> list[str]:
    """``_real_root_balls`` as text (arb balls do not pickle), each enclosing its ball."""
    import flint

    from oddsbench.solve.ruin.roots import ball_text

    flint.ctx.prec = prec
    roots = [root.real for root, _m in flint.fmpz_poly(list(low_first)).complex_roots() if root.imag == 0]
    return [ball_text(ball, prec) for ball in sorted(roots, key=lambda ball: float(ball.mid()))]


def _algebraic(low_first: tuple[int, ...], index: int, ball) -> Solution:
    def compute():
        return _real_root_balls(low_first)[index]

    sharp, _ = with_retries(compute, ROOT_DIGITS, 1, lambda b: enough(b, ROOT_DIGITS))
    with precision(bits_for(ROOT_DIGITS) * 2):
        decimal = certified(sharp, ROOT_DIGITS)
    return Solution(None, low_first, index, decimal, decimal.value)


def sign_at(low_first: Sequence[Rational], solution: Solution) -> int | None:
    """The sign of a polynomial with rational coefficients at a solution: exact for a rational one,
    proved by ball arithmetic for an algebraic one (None when the ball cannot tell: the value is 0
    or too close to it at the working precision)."""
    if solution.exact is not None:
        value = poly_value([QQ(c) if not isinstance(c, int) else c for c in low_first], solution.exact)
        return (value > 0) - (value < 0)
    from flint import arb, fmpq

    with precision(bits_for(ROOT_DIGITS) * 4):
        root = _real_root_balls(solution.polynomial)[solution.index]
        total = arb(0)
        for c in reversed(low_first):
            total = total * root + arb(fmpq(numerator(c), denominator(c)))
        if total > 0:
            return 1
        if total < 0:
            return -1
    return None
