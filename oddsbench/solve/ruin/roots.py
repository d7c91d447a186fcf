"""Characteristic roots of a walk: P(t) = t^d (E[t^X] - 1) and its roots inside the unit disc.

For a walk with largest loss d (in steps of the gcd of its results) the general solution of the
hitting recurrence psi(k) = sum_j p_j psi(k + j) is a combination of r^k over the roots r of
P. A bounded solution tending to 0 uses only the roots strictly inside the unit disc: t = 1 is
divided out first, and no other root is on the circle once jumps are counted in steps of their
gcd (|E[r^X]| = 1 with |r| = 1 needs r^j = 1 for every result j). rho, the root in (0, 1),
gives the adjustment coefficient R = -ln rho. Polynomials are built from our integers, never
from text.
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, denominator, numerator, text
from oddsbench.solve.ruin.balls import (
    Certified,
    arb_of,
    bits_for,
    certified,
    certified_exact,
    enough,
    precision,
    with_retries,
)
from oddsbench.solve.ruin.law import Law

MAX_SPAN = 400  # largest loss + largest win, in steps: the degree of the characteristic polynomial


@dataclass(frozen=True)
class CharacteristicRoot:
    """theta (or rho): the unique root in (0, 1) of E[t^X] = 1, kept exactly."""

    polynomial: tuple[int, ...]  # irreducible factor carrying the root, highest power first
    polynomial_text: str  # "18 t^2 - 37 t + 19"
    exact: Any  # a QQ rational, or a sympy CRootOf
    exact_text: str  # "49/51" or "root in (0, 1) of 2 t^2 + 2 t - 1"
    is_rational: bool
    decimal: Certified

    def ball(self):
        """rho as an arb ball at the current precision."""
        return arb_of(self.exact) if self.is_rational else real_root_ball(self.polynomial, 0, 1)


def characteristic_polynomial(law: Law) -> tuple[int, ...]:
    """Integer coefficients of t^d (E[t^X] - 1), lowest power first, content removed."""
    d = -min(0, law[0][0])
    top = max(0, law[-1][0])
    common = 1
    for _, chance in law:
        common = math.lcm(common, denominator(chance))
    coefficients = [0] * (d + top + 1)
    for jump, chance in law:
        coefficients[jump + d] += numerator(chance) * (common // denominator(chance))
    coefficients[d] -= common
    content = 0
    for c in coefficients:
        content = math.gcd(content, c)
    content = content or 1
    while coefficients and coefficients[-1] == 0:
        coefficients.pop()
    return tuple(c // content for c in coefficients)


def polynomial_text(coefficients_high_first: tuple[int, ...], variable: str = "t") -> str:
    """``18 t^2 - 37 t + 19`` from integer coefficients, highest power first."""
    degree = len(coefficients_high_first) - 1
    parts: list[str] = []
    for i, c in enumerate(coefficients_high_first):
        if c == 0:
            continue
        power = degree - i
        size = abs(c)
        if power == 0:
            body = str(size)
        else:
            monomial = variable if power == 1 else f"{variable}^{power}"
            body = monomial if size == 1 else f"{size} {monomial}"
        if not parts:
            parts.append(("-" if c < 0 else "") + body)
        else:
            parts.append(("- " if c < 0 else "+ ") + body)
    return " ".join(parts) or "0"


# Root finding within the work budget. Measured on characteristic polynomials of rounds with up to
# 300 results (coefficients of about 16 bits): isolating rho with sympy (factoring, Sturm
# sequences) takes about ROOT_SECONDS x degree^ROOT_POWER seconds, flint's complex_roots less;
# both grow with the coefficients' size. Past DETACH_DEGREE they run detached (solve/detached.py),
# where Ctrl-C, a cancelled worker and the deadline can stop them.
ROOT_SECONDS = 1.2e-6
ROOT_POWER = 2.6
COEFFICIENT_BITS = 16
DETACH_DEGREE = 40


def root_seconds(low_first: tuple[int, ...]) -> float:
    """Estimated seconds to isolate the roots of a characteristic polynomial."""
    degree = max(len(low_first) - 1, 1)
    size = max((abs(c).bit_length() for c in low_first), default=1)
    return ROOT_SECONDS * degree**ROOT_POWER * max(1.0, size / COEFFICIENT_BITS)


def require_root_budget(low_first: tuple[int, ...], name: str = "characteristic polynomial") -> None:
    """Refuse root finding (one line) that would not fit the time left in the work budget."""
    from oddsbench.model import budget

    degree = len(low_first) - 1
    what = f"finding the roots of the degree-{degree:,} {name}"
    budget.require(what, seconds=root_seconds(low_first))


def detached_roots(low_first: tuple[int, ...], function, args: tuple, what: str):
    """``function(*args)`` detached when the polynomial is large (see ``DETACH_DEGREE``), else here."""
    if len(low_first) - 1 < DETACH_DEGREE:
        return function(*args)
    from oddsbench.solve.detached import run_detached
    from oddsbench.solve.ruin.balls import current_stop

    return run_detached(function, args, what, current_stop())


def ball_text(ball, prec: int) -> str:
    """An arb ball as text that encloses it (arb balls do not pickle)."""
    return ball.str(int(prec * 0.30103) + 5, radius=True, more=True)


def root_in_unit_interval(low_first: tuple[int, ...], digits: int) -> CharacteristicRoot:
    """rho: the unique root of P in (0, 1), exactly (sympy) and as a certified decimal."""
    require_root_budget(low_first)
    return detached_roots(low_first, _root_in_unit_interval, (low_first, digits), "finding the root rho")


def _root_in_unit_interval(low_first: tuple[int, ...], digits: int) -> CharacteristicRoot:
    from sympy import CRootOf, Poly, Symbol

    t = Symbol("t")
    poly = Poly(list(reversed(low_first)), t, domain="ZZ")
    carrier = None
    for factor, _multiplicity in poly.factor_list()[1]:
        # count_roots counts the closed interval [0, 1]: t - 1 always divides P and must be skipped
        # Poly.eval evaluates an integer polynomial at 1; no text is parsed.
        if factor.degree() >= 1 and factor.eval(1) != 0 and factor.count_roots(0, 1) == 1:  # safe: Poly.eval
            carrier = factor
            break
    if carrier is None:
        raise OddsbenchError("internal check failed: no root of E[t^X] = 1 in (0, 1) for a favourable walk")
    high_first = tuple(int(c) for c in carrier.all_coeffs())
    if high_first[0] < 0:
        high_first = tuple(-c for c in high_first)
    shown_poly = polynomial_text(high_first)
    if carrier.degree() == 1:
        exact = QQ(-high_first[1], high_first[0])
        return CharacteristicRoot(high_first, shown_poly, exact, text(exact), True, certified_exact(exact, digits))
    index = carrier.count_roots(None, 0)  # real roots below 0 come first in CRootOf's order
    exact = CRootOf(carrier, index)

    def compute():
        return real_root_ball(high_first, 0, 1)

    ball, _ = with_retries(compute, digits, 1, lambda b: enough(b, digits))
    with precision(bits_for(digits) * 2):
        decimal = certified(ball, digits)
    return CharacteristicRoot(high_first, shown_poly, exact, f"root in (0, 1) of {shown_poly}", False, decimal)


def real_root_ball(high_first: tuple[int, ...], low: int, high: int):
    """The root of an integer polynomial inside (low, high), as an arb ball (proved)."""
    import flint

    prec = flint.ctx.prec
    found = detached_roots(high_first, _real_root_text, (high_first, low, high, prec), "finding a root in (0, 1)")
    return flint.arb(found)


def _real_root_text(high_first: tuple[int, ...], low: int, high: int, prec: int) -> str:
    import flint

    flint.ctx.prec = prec
    roots = flint.fmpz_poly(list(reversed(high_first))).complex_roots()
    inside = [r.real for r, _m in roots if r.imag == 0 and r.real > low and r.real < high]
    if len(inside) != 1:
        raise OddsbenchError("internal check failed: the root in (0, 1) is not isolated")
    return ball_text(inside[0], prec)


def roots_inside(low_first: tuple[int, ...]):
    """(roots strictly inside the unit disc, all simple?) as acb balls; None if undecidable."""
    import flint

    prec = flint.ctx.prec
    found = detached_roots(low_first, _roots_inside_text, (low_first, prec), "finding the roots inside the unit disc")
    if found is None:
        return None
    texts, simple = found
    return [flint.acb(flint.arb(real), flint.arb(imag)) for real, imag in texts], simple


def _roots_inside_text(low_first: tuple[int, ...], prec: int):
    """``_roots_inside`` with its balls as text, so that a detached child can send them back."""
    import flint

    flint.ctx.prec = prec
    found = _roots_inside(low_first)
    if found is None:
        return None
    inside, simple = found
    return [(ball_text(root.real, prec), ball_text(root.imag, prec)) for root in inside], simple


def _roots_inside(low_first: tuple[int, ...]):
    from flint import acb, fmpz_poly

    # t = 1 is always a root (simple when the mean is not 0) and lies on the circle: divide it out.
    quotient, remainder = divmod(fmpz_poly(list(low_first)), fmpz_poly([-1, 1]))
    if remainder != 0:
        raise OddsbenchError("internal check failed: t = 1 is not a root of the characteristic polynomial")
    inside = []
    simple = True
    for root, multiplicity in quotient.complex_roots():
        size = abs(root)
        if size < 1:
            inside.append(acb(root))
            simple = simple and multiplicity == 1
        elif not size >= 1:
            return None  # the ball straddles the circle at this precision
    return inside, simple


def fit_boundary(bases: list[Any], boundary: list[tuple[int, Any]]):
    """Coefficients c with sum_j c_j b_j^k = value on each boundary level k (acb balls)."""
    from flint import acb, acb_mat

    rows = [[acb(b) ** k if k >= 0 else acb(1) / acb(b) ** (-k) for b in bases] for k, _ in boundary]
    matrix = acb_mat(rows)
    rhs = acb_mat([[acb(value)] for _, value in boundary])
    solution = matrix.solve(rhs)
    return [solution[i, 0] for i in range(len(bases))]


def combination(fit: tuple[tuple[Any, Any], ...], level: int):
    """sum_i c_i b_i^level (acb balls)."""
    from flint import acb

    total = acb(0)
    for coefficient, base in fit:
        total += coefficient * base**level
    return total


def ruin_by_roots(law: Law, loss: int, level: int, digits: int):
    """psi(level) by the root method: (Certified, ball), or None when the method does not apply.

    ``loss`` is the largest loss in steps; psi = sum c_i r_i^k over the ``loss`` roots inside the
    disc, fitted to 1 on the ruin levels 0, -1, ..., -(loss - 1).
    """
    low_first = characteristic_polynomial(law)
    if len(low_first) - 1 > MAX_SPAN:
        return None

    def compute():
        found = roots_inside(low_first)
        if found is None:
            return None
        inside, simple = found
        if not simple or len(inside) != loss:
            return ("not-applicable", len(inside), simple)
        coefficients = fit_boundary(inside, [(-k, 1) for k in range(loss)])
        return "ok", combination(tuple(zip(coefficients, inside)), level).real

    def good(result) -> bool:
        if result is None:
            return False
        if result[0] == "not-applicable":
            return True
        return enough(result[1], digits)

    result, bits = with_retries(compute, digits, level, good)
    if result[0] == "not-applicable":
        return None
    _, ball = result
    with precision(bits):
        return certified(ball, digits), ball
