"""Risk of ruin when play never stops at a goal: a bankroll walk with no top.

The bankroll moves by a fixed law of net results per round (whole grid units, exact rational
chances, bounded jumps), from ``bankroll`` units; ruin is the first time it is at 0 or below.
There is no upper absorbing state, so the chain has infinitely many states and cannot be solved
as a finite system: its hitting equations psi(k) = sum_j p_j psi(k + j) (k >= 1), psi(k) = 1
(k <= 0), have many solutions and the ruin probability is the minimal non-negative one.

What we answer, and why it is right:

* Expected result per round mu <= 0 (and some result negative): ruin is certain. Subfair walks
  reach ruin in finite expected time; Wald's identity E[S_T] = mu E[T] gives
  E[T] = bankroll / |mu| when the only loss is one unit (the walk lands exactly on 0), and
  (bankroll + mean overshoot) / |mu| in general. Fair walks take infinite expected time (were it
  finite, Wald would give E[S_T] = 0, but S_T <= -bankroll).
* mu > 0: with d the largest loss (in units), psi is the combination of the d roots inside the
  unit disc of P(t) = t^d (E[t^X] - 1) that equals 1 on 0, -1, ..., -(d-1) (the general solution
  of the recurrence is a combination of r^k over all roots of P; psi is bounded and tends to 0,
  which removes every root on or outside the circle; a bounded harmonic function with those
  boundary values is unique by optional stopping). For d = 1 (skip-free downward) this is
  theta^bankroll, theta the unique root in (0, 1) of E[t^X] = 1: exact as a rational, or as
  sympy's CRootOf of the irreducible factor of P that carries it.
* Decimals come from ball (interval) arithmetic (python-flint's arb/acb): every digit shown is
  correct to one unit in the last place, and the radius is reported as the error bound. Tiny
  values keep their exponent (no float underflow).
* Cross-check and fallback: P(ruin before reaching G) is an exact finite system that increases
  to psi as G grows, and psi - P(ruin before G) <= rho^G (from any level >= G ruin has chance at
  most rho^level, rho = exp(-R) with R the adjustment coefficient: the Lundberg bound).
"""

from __future__ import annotations

import math
from collections.abc import Callable, Iterator, Mapping
from contextlib import contextmanager
from contextvars import ContextVar
from dataclasses import dataclass, field
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text
from oddsbench.solve.cancel import stop_if_asked

DEFAULT_DIGITS = 30
MAX_DIGITS = 2000
MAX_SPAN = 400  # largest loss + largest win, in steps: the degree of the characteristic polynomial
MAX_EXACT_BITS = 200_000  # expand theta^bankroll as one fraction only below this size
MAX_EXACT_DIGITS_BITS = 100_000  # the same limit on the larger of numerator and denominator
CHECK_DIGITS = 12  # the truncation cross-check aims at an error bound of 10^-12 (relative to rho^bankroll)
EXACT_CHECK_WORK = 5_000_000  # levels^2 x span: exact truncation above this (~0.5 s) is done in floats
EXACT_FALLBACK_WORK = 60_000_000  # when truncation is the method itself, exact up to this (~10 s)
MAX_FLOAT_CHECK_LEVELS = 1_000_000  # float truncation (banded solve) up to this many levels
FLOAT_CHECK_TOLERANCE = 1e-11  # absolute error allowed to the float check (direct solvers: ~1e-14)
# the caller's cancel check (a TUI worker's), seen by the exact solves deep inside one call
_SHOULD_STOP: ContextVar[Callable[[], bool] | None] = ContextVar("unbounded_ruin_should_stop", default=None)
VERDICT_CERTAIN = "certain"
VERDICT_NEVER = "never"
VERDICT_POSSIBLE = "possible"


@dataclass(frozen=True)
class Certified:
    """A real number known inside a proved interval: ``text`` is correct to its last digit."""

    text: str
    radius: str  # an upper bound on |true - shown midpoint|, as text ("0" when exact)
    log10: float  # log10 of the value (-inf for 0), usable far below the float range
    value: float  # nearest float (0.0 when the value is below the float range)

    def __str__(self) -> str:
        return self.text


@dataclass(frozen=True)
class CharacteristicRoot:
    """theta (or rho): the unique root in (0, 1) of E[t^X] = 1, kept exactly."""

    polynomial: tuple[int, ...]  # irreducible factor carrying the root, highest power first
    polynomial_text: str  # "18 t^2 - 37 t + 19"
    exact: Any  # a QQ rational, or a sympy CRootOf
    exact_text: str  # "49/51" or "root in (0, 1) of 2 t^2 + 2 t - 1"
    is_rational: bool
    decimal: Certified


@dataclass(frozen=True)
class RoundsToRuin:
    """Expected number of rounds until ruin, or why there is no finite figure."""

    kind: str  # "finite", "infinite" (fair), "not defined" (ruin not certain), "none" (no ruin)
    exact: Rational | None  # when known as a rational
    lower: Rational | None  # proved bounds when the exact figure is not a rational
    upper: Rational | None
    decimal: Certified | None
    method: str


@dataclass(frozen=True)
class TruncationCheck:
    """P(ruin before the bankroll reaches ``goal``): an exact lower bound on the ruin chance."""

    goal: int  # in steps of the walk
    lower: Rational | None  # exact, when solved in exact arithmetic
    lower_decimal: Certified
    gap_bound: Certified  # psi - lower <= rho^goal
    consistent: bool  # the root result lies inside [lower, lower + gap bound]
    arithmetic: str = "exact"  # "exact", or "floating point" for systems too large for rationals
    goal_level: int = 0  # the goal in grid units above the ruin line (``goal`` may count steps)


@dataclass(frozen=True)
class UnboundedRuin:
    """Everything ``--goal none`` reports: ruin chance, how it was found, bounds, durations."""

    bankroll: int  # grid units, as given
    jumps: tuple[tuple[int, Rational], ...]  # net result per round (grid units) -> chance
    step: int  # common divisor of the jumps: the walk moves in multiples of it
    steps_bankroll: int  # bankroll counted in steps: ceil(bankroll / step)
    mean: Rational  # expected result per round, grid units
    variance: Rational  # variance of the result per round, grid units^2
    largest_loss: int  # in steps
    verdict: str  # certain | never | possible
    reason: str
    ruin: Certified
    ruin_exact: Rational | None  # the ruin chance as one fraction, when rational and not huge
    ruin_closed_form: Any  # sympy/QQ exact object: theta**z, or None when only digits exist
    ruin_exact_text: str  # "(49/51)^20", "1", "theta^20 (theta = ...)", "algebraic: ..."
    method: str
    error_bound: str
    theta: CharacteristicRoot | None  # rho: the root in (0,1); theta when skip-free
    adjustment_coefficient: Certified | None  # R = -ln(rho) per step of the walk
    lundberg: Certified | None  # exp(-R * steps_bankroll) = rho^steps_bankroll
    lundberg_text: str
    lundberg_exact_text: str  # "theta^20 (= the exact figure)", "rho^19"
    diffusion: Certified | None  # exp(-2 mean bankroll / variance): an approximation
    diffusion_text: str
    diffusion_exponent: Rational | None  # -2 mean bankroll / variance, exact
    diffusion_ratio: Certified | None  # approximation / exact ruin chance
    adjustment_text: str  # exact form of R: "ln(51/49)" or "-ln rho"
    rounds_to_ruin: RoundsToRuin
    rounds_if_ruined: RoundsToRuin | None  # favourable skip-free walks: E[T | ruin]
    truncation: TruncationCheck | None
    notes: tuple[str, ...]
    digits: int
    _reduced: tuple[tuple[int, Rational], ...] = field(default=(), repr=False, compare=False)

    @property
    def is_skip_free(self) -> bool:
        return self.largest_loss == 1

    def ruin_from(self, bankroll: int, digits: int | None = None) -> Certified:
        """Ruin chance from another starting bankroll (grid units), same law: the whole curve."""
        if bankroll < 1:
            return _certified_exact(QQ(1))
        if self.verdict == VERDICT_CERTAIN:
            return _certified_exact(QQ(1))
        if self.verdict == VERDICT_NEVER:
            return _certified_exact(QQ(0))
        level = _ceil_div(bankroll, self.step)
        wanted = digits or self.digits
        if self.theta is not None and self.theta.is_rational and self.is_skip_free:
            with _precision(_bits_for(wanted, level)):
                return _certified(_arb_of(self.theta.exact) ** level, wanted)
        by_roots = _favourable_by_roots(self._reduced, self.largest_loss, level, wanted) if self._reduced else None
        if by_roots is None:
            raise OddsbenchError("the ruin curve needs the root method, which did not apply to this walk")
        return by_roots[0]


# --------------------------------------------------------------------------------------------
# the law of one round


def _normalise(jumps: Mapping[int, Rational]) -> tuple[tuple[int, Rational], ...]:
    if not jumps:
        raise OddsbenchError("no results given for the round")
    law: dict[int, Rational] = {}
    total = QQ(0)
    for jump, chance in jumps.items():
        if not isinstance(jump, int):
            raise OddsbenchError(f"result {jump!r} is not a whole number of grid units")
        chance = QQ(chance)
        if chance < 0:
            raise OddsbenchError(f"result {jump}: negative chance {text(chance)}")
        if chance == 0:
            continue
        law[jump] = law.get(jump, QQ(0)) + chance
        total += chance
    if total != 1:
        raise OddsbenchError(f"the chances of the round's results add up to {text(total)}, not 1")
    return tuple(sorted(law.items()))


def _moments(law: tuple[tuple[int, Rational], ...]) -> tuple[Rational, Rational]:
    mean = sum((QQ(j) * p for j, p in law), QQ(0))
    second = sum((QQ(j * j) * p for j, p in law), QQ(0))
    return mean, second - mean * mean


def _ceil_div(a: int, b: int) -> int:
    return -((-a) // b)


# --------------------------------------------------------------------------------------------
# precision and ball arithmetic (python-flint arb / acb)


@contextmanager
def _precision(bits: int) -> Iterator[None]:
    import flint

    saved = flint.ctx.prec
    flint.ctx.prec = max(int(bits), 64)
    try:
        yield
    finally:
        flint.ctx.prec = saved


def _bits_for(digits: int, level: int = 1) -> int:
    return int((digits + 12) * 3.33) + max(level, 1).bit_length() + 32


def _arb_of(value: Rational):
    from flint import arb, fmpq

    return arb(fmpq(numerator(value), denominator(value)))


def _certified(ball, digits: int) -> Certified:
    """Text with at most ``digits`` significant digits, each proved by the ball's radius."""
    from flint import arb

    if ball.is_exact() and ball.mid() == 0:
        return Certified("0", "0", -math.inf, 0.0)
    shown = ball.str(digits, radius=False)
    radius = ball.rad()
    radius_text = "0" if radius == 0 else arb(radius).str(3, radius=False)
    magnitude = abs(ball.mid())
    log10 = float((arb(magnitude).log() / arb(10).log()).mid()) if magnitude > 0 else -math.inf
    try:
        value = float(ball.mid())
    except (OverflowError, ValueError):
        value = 0.0
    return Certified(shown, radius_text, log10, value)


def _certified_exact(value: Rational, digits: int = DEFAULT_DIGITS) -> Certified:
    with _precision(_bits_for(digits)):
        ball = _arb_of(value)
        certified = _certified(ball, digits)
    return Certified(certified.text, "0", certified.log10, certified.value)


def _enough(ball, digits: int) -> bool:
    """True when the ball pins ``digits`` significant digits (relative radius small enough)."""
    from flint import arb

    magnitude = abs(ball.mid())
    if magnitude == 0:
        return ball.rad() == 0
    return ball.rad() <= magnitude * arb(10) ** (-(digits + 2))


def _with_retries(compute: Callable[[], Any], digits: int, level: int, check: Callable[[Any], bool]):
    """Run ``compute`` at growing precision until ``check`` accepts its balls."""
    bits = _bits_for(digits, level)
    stop = _SHOULD_STOP.get()
    for _ in range(6):
        stop_if_asked(stop)
        with _precision(bits):
            result = compute()
            if check(result):
                return result, bits
        bits *= 2
    raise OddsbenchError(f"could not reach {digits} correct digits even at {bits // 2} bits of precision")


# --------------------------------------------------------------------------------------------
# the characteristic polynomial P(t) = t^d (E[t^X] - 1), integer coefficients


def characteristic_polynomial(law: tuple[tuple[int, Rational], ...]) -> tuple[int, ...]:
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


def _root_in_unit_interval(low_first: tuple[int, ...], digits: int) -> CharacteristicRoot:
    """rho: the unique root of P in (0, 1), exactly (sympy) and as a certified decimal."""
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
        return CharacteristicRoot(high_first, shown_poly, exact, text(exact), True, _certified_exact(exact, digits))
    index = carrier.count_roots(None, 0)  # real roots below 0 come first in CRootOf's order
    exact = CRootOf(carrier, index)

    def compute():
        return _real_root_ball(high_first, 0, 1)

    ball, _ = _with_retries(compute, digits, 1, lambda b: _enough(b, digits))
    with _precision(_bits_for(digits) * 2):
        decimal = _certified(ball, digits)
    return CharacteristicRoot(high_first, shown_poly, exact, f"root in (0, 1) of {shown_poly}", False, decimal)


def _real_root_ball(high_first: tuple[int, ...], low: int, high: int):
    """The root of an integer polynomial inside (low, high), as an arb ball (proved)."""
    from flint import fmpz_poly

    roots = fmpz_poly(list(reversed(high_first))).complex_roots()
    inside = [r.real for r, _m in roots if r.imag == 0 and r.real > low and r.real < high]
    if len(inside) != 1:
        raise OddsbenchError("internal check failed: the root in (0, 1) is not isolated")
    return inside[0]


# --------------------------------------------------------------------------------------------
# the root method: bounded solutions as combinations of roots inside the unit disc


def _roots_inside(low_first: tuple[int, ...]):
    """(roots strictly inside the unit disc, all simple?) as acb balls; None if undecidable."""
    from flint import acb, fmpz_poly

    # t = 1 is always a root (simple when the mean is not 0) and lies on the circle: divide it out.
    # The other roots are off the circle: |E[r^X]| = 1 with |r| = 1 needs r^j = 1 for every result
    # j, so r = 1 once the results are counted in steps (their greatest common divisor is 1).
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


def _fit_boundary(bases: list[Any], boundary: list[tuple[int, Any]]):
    """Coefficients c with sum_j c_j b_j^k = value on each boundary level k (acb balls)."""
    from flint import acb, acb_mat

    rows = [[acb(b) ** k if k >= 0 else acb(1) / acb(b) ** (-k) for b in bases] for k, _ in boundary]
    matrix = acb_mat(rows)
    rhs = acb_mat([[acb(value)] for _, value in boundary])
    solution = matrix.solve(rhs)
    return [solution[i, 0] for i in range(len(bases))]


def _combination(fit: tuple[tuple[Any, Any], ...], level: int):
    from flint import acb

    total = acb(0)
    for coefficient, base in fit:
        total += coefficient * base**level
    return total


def _favourable_by_roots(law, largest_loss: int, level: int, digits: int):
    """psi(level) by the root method: (ball, fit) or None when the method does not apply."""
    low_first = characteristic_polynomial(law)
    if len(low_first) - 1 > MAX_SPAN:
        return None

    def compute():
        found = _roots_inside(low_first)
        if found is None:
            return None
        inside, simple = found
        if not simple or len(inside) != largest_loss:
            return ("not-applicable", len(inside), simple)
        coefficients = _fit_boundary(inside, [(-k, 1) for k in range(largest_loss)])
        return "ok", _combination(tuple(zip(coefficients, inside)), level).real

    def good(result) -> bool:
        if result is None:
            return False
        if result[0] == "not-applicable":
            return True
        return _enough(result[1], digits)

    result, bits = _with_retries(compute, digits, level, good)
    if result[0] == "not-applicable":
        return None
    _, ball = result
    with _precision(bits):
        return _certified(ball, digits), ball


# --------------------------------------------------------------------------------------------
# truncation: P(ruin before reaching goal), exact


def ruin_before_goal(law: tuple[tuple[int, Rational], ...], level: int, goal: int) -> Rational:
    """Exact P(the walk from ``level`` hits <= 0 before >= ``goal``): first-step analysis."""
    from oddsbench.solve.linear import factor_exact

    if level <= 0:
        return QQ(1)
    if level >= goal:
        return QQ(0)
    size = goal - 1  # levels 1 .. goal-1 are indices 0 .. goal-2
    rows: list[dict[int, Rational]] = []
    rhs: list[Rational] = []
    for k in range(1, goal):
        row: dict[int, Rational] = {k - 1: QQ(1)}
        ruin_now = QQ(0)
        for jump, chance in law:
            target = k + jump
            if target <= 0:
                ruin_now += chance
            elif target < goal:
                row[target - 1] = row.get(target - 1, QQ(0)) - chance
        rows.append(row)
        rhs.append(ruin_now)
    solution = factor_exact(rows, should_stop=_SHOULD_STOP.get()).solve(rhs)
    assert len(solution) == size
    return solution[level - 1]


def ruin_before_goal_float(law: tuple[tuple[int, Rational], ...], level: int, goal: int) -> float:
    """The same chance in floating point: one banded solve (LAPACK), for systems too big for rationals."""
    import numpy as np

    from oddsbench.solve.linear import BandMatrix, factor_float

    if level <= 0:
        return 1.0
    if level >= goal:
        return 0.0
    size = goal - 1
    below = -min(0, law[0][0])
    above = max(0, law[-1][0])
    system = BandMatrix.zeros(below, above, size)
    system.bands[above, :] = 1.0
    rhs = np.zeros(size)
    for jump, chance in law:
        p = float(chance)
        for_rows = np.arange(1, goal)
        targets = for_rows + jump
        ruin_rows = targets <= 0
        rhs[ruin_rows] += p
        inside = (targets >= 1) & (targets < goal)
        rows, cols = for_rows[inside] - 1, targets[inside] - 1
        system.bands[above + rows - cols, cols] -= p
    solution = factor_float(system).solve(rhs)
    return float(solution[level - 1])


def _truncation_goal(level: int, rate: float, digits: int) -> int:
    """Goal whose gap bound rho^goal is 10^-digits times rho^level."""
    return level + 1 + math.ceil(digits * math.log(10) / rate)


def _truncation_check(
    law,
    level: int,
    rho: CharacteristicRoot,
    digits: int,
    goal: int | None,
    root_ball=None,
    exact_work: int = EXACT_CHECK_WORK,
) -> TruncationCheck | None:
    """P(ruin before goal) beside the root result: exact when small enough, else floats, else None."""
    from flint import arb

    if goal is None:
        return None
    span = law[-1][0] - law[0][0]
    exact = goal * goal * max(span, 1) <= exact_work
    with _precision(_bits_for(digits, goal)):
        rho_ball = _arb_of(rho.exact) if rho.is_rational else _real_root_ball(rho.polynomial, 0, 1)
        gap = rho_ball**goal
        gap_upper = arb(gap.mid() + gap.rad())
    if not exact:
        if goal > MAX_FLOAT_CHECK_LEVELS or root_ball is None or not root_ball > arb("1e-280"):
            return None
        lower_float = ruin_before_goal_float(law, level, goal)
        with _precision(_bits_for(digits, goal)):
            consistent = bool(
                root_ball > arb(lower_float - FLOAT_CHECK_TOLERANCE)
                and root_ball < arb(lower_float + FLOAT_CHECK_TOLERANCE) + gap_upper
            )
            shown = Certified(
                f"{lower_float:.12g}",
                f"{FLOAT_CHECK_TOLERANCE:g}",
                math.log10(lower_float) if lower_float > 0 else -math.inf,
                lower_float,
            )
            return TruncationCheck(goal, None, shown, _certified(gap_upper, 3), consistent, "floating point")
    lower = ruin_before_goal(law, level, goal)
    with _precision(_bits_for(digits, goal)):
        lower_ball = _arb_of(lower)
        consistent = True
        if root_ball is not None:
            # proved: lower <= psi <= lower + gap; the root result must overlap that interval
            interval = arb(lower_ball.mid() + gap.mid() / 2, gap.mid() / 2 + gap.rad() + lower_ball.rad())
            consistent = bool(interval.overlaps(root_ball))
        return TruncationCheck(goal, lower, _certified(lower_ball, digits), _certified(gap_upper, 3), consistent)


# --------------------------------------------------------------------------------------------
# the figures


def solve_unbounded_ruin(
    jumps: Mapping[int, Rational],
    bankroll: int,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    unit: Rational | int = 1,
    should_stop: Callable[[], bool] | None = None,
) -> UnboundedRuin:
    """Ruin chance, method, bounds and expected rounds for endless play from ``bankroll`` units.

    ``jumps`` maps each net result of one round (whole grid units) to its exact chance. Ruin is
    the bankroll at 0 or below; callers that need the next stake covered shift the bankroll.
    ``unit`` (betting units per grid unit) only scales the expected result quoted in the reason.
    ``should_stop`` is polled by the long exact solves (raises ``SolveCancelled``).
    """
    token = _SHOULD_STOP.set(should_stop) if should_stop is not None else None
    try:
        return _solve_unbounded_ruin(jumps, bankroll, digits, check, unit)
    finally:
        if token is not None:
            _SHOULD_STOP.reset(token)


def _solve_unbounded_ruin(jumps, bankroll, digits: int, check: bool, unit) -> UnboundedRuin:
    if not isinstance(bankroll, int) or bankroll < 1:
        raise OddsbenchError(f"bankroll must be a whole number of units, at least 1 (got {bankroll!r})")
    if not isinstance(digits, int) or not 1 <= digits <= MAX_DIGITS:
        raise OddsbenchError(f"digits must be a whole number from 1 to {MAX_DIGITS} (got {digits!r})")
    law = _normalise(jumps)
    mean, variance = _moments(law)
    step = 0
    for jump, _ in law:
        step = math.gcd(step, jump)
    step = step or 1
    reduced = tuple((jump // step, chance) for jump, chance in law)
    level = _ceil_div(bankroll, step)
    largest_loss = -min(0, reduced[0][0])
    notes: list[str] = []
    if step > 1:
        notes.append(
            f"every result is a multiple of {step} units: the walk moves in steps of {step}, "
            f"so a bankroll of {bankroll} counts as {level} step(s)"
        )
    common = dict(
        bankroll=bankroll,
        jumps=law,
        step=step,
        steps_bankroll=level,
        mean=mean,
        variance=variance,
        largest_loss=largest_loss,
        digits=digits,
    )
    shown_mean = text(mean * QQ(unit))

    if largest_loss == 0:
        reason = "no result of the round loses money, so the bankroll never falls"
        return settled_ruin(
            common,
            verdict=VERDICT_NEVER,
            ruin=QQ(0),
            reason=reason,
            method="no losing result",
            lundberg_text="not applicable: no losing result",
            diffusion_text="not applicable: no losing result",
            rounds=RoundsToRuin("none", None, None, None, None, "ruin never happens"),
            notes=notes,
            digits=digits,
        )
    if mean <= 0:
        return _certain_ruin(common, reduced, level, notes, shown_mean)
    return _possible_ruin(common, reduced, level, notes, check, shown_mean)


def _certain_ruin(common: dict, reduced, level: int, notes: list[str], shown_mean: str) -> UnboundedRuin:
    mean = common["mean"]
    digits = common["digits"]
    step = common["step"]
    largest_loss = common["largest_loss"]
    if mean < 0:
        reason = (
            f"the expected result per round is {shown_mean} unit(s) (< 0): without a goal the bankroll "
            "drifts down and is wiped out with probability 1"
        )
        rounds = _subfair_rounds(reduced, level, mean / step, largest_loss, digits)
        diffusion_text = "not applicable: ruin is certain (the approximation is for favourable games)"
    else:
        reason = (
            "the expected result per round is 0 (a fair game): a fair walk returns below every level, "
            "so without a goal the bankroll is wiped out with probability 1"
        )
        rounds = RoundsToRuin(
            "infinite",
            None,
            None,
            None,
            None,
            "fair game: ruin is certain but its expected time is infinite (Wald: a finite mean time "
            "would force the mean result at ruin to be 0, yet it is at most -bankroll)",
        )
        diffusion_text = "not applicable: ruin is certain"
    return settled_ruin(
        common,
        verdict=VERDICT_CERTAIN,
        ruin=QQ(1),
        reason=reason,
        method="expected result per round <= 0",
        lundberg_text=NO_ADJUSTMENT_COEFFICIENT,
        diffusion_text=diffusion_text,
        rounds=rounds,
        notes=notes,
        digits=digits,
    )


def _subfair_rounds(reduced, level: int, drift: Rational, largest_loss: int, digits: int) -> RoundsToRuin:
    """E[T] for a subfair walk: Wald's identity, with the mean overshoot from the roots if d > 1."""
    loss = -drift
    if largest_loss == 1:
        value = QQ(level) / loss
        return RoundsToRuin(
            "finite",
            value,
            value,
            value,
            _certified_exact(value, digits),
            "Wald's identity: the walk lands exactly on 0, so E[rounds] = bankroll / expected loss per round",
        )
    lower = QQ(level) / loss
    upper = QQ(level + largest_loss - 1) / loss
    decimal = None
    method = (
        f"Wald's identity with overshoot: ruin lands between 0 and -{largest_loss - 1} steps, so "
        "E[rounds] lies between bankroll / loss and (bankroll + largest loss - 1) / loss"
    )
    low_first = characteristic_polynomial(reduced)
    if len(low_first) - 1 <= MAX_SPAN:
        decimal = _subfair_rounds_by_roots(low_first, level, loss, largest_loss, digits)
        if decimal is not None:
            method = (
                "Wald's identity plus the mean overshoot: E[rounds from k] = k / loss + a combination "
                f"of 1 and the {largest_loss - 1} roots inside the unit disc, zero on the ruin levels; "
                f"proved bounds [{text(lower)}, {text(upper)}]"
            )
    return RoundsToRuin("finite", None, lower, upper, decimal, method)


def _subfair_rounds_by_roots(low_first, level: int, loss: Rational, largest_loss: int, digits: int):
    from flint import acb

    def compute():
        found = _roots_inside(low_first)
        if found is None:
            return None
        inside, simple = found
        if not simple or len(inside) != largest_loss - 1:
            return ("not-applicable",)
        bases = [acb(1)] + inside
        loss_ball = _arb_of(loss)
        boundary = [(-k, -acb(-k) / loss_ball) for k in range(largest_loss)]
        coefficients = _fit_boundary(bases, boundary)
        value = (acb(level) / loss_ball + _combination(tuple(zip(coefficients, bases)), level)).real
        return ("ok", value)

    def good(result) -> bool:
        return result is not None and (result[0] == "not-applicable" or _enough(result[1], digits))

    try:
        result, bits = _with_retries(compute, digits, level, good)
    except OddsbenchError:
        return None
    if result[0] != "ok":
        return None
    with _precision(bits):
        return _certified(result[1], digits)


def _possible_ruin(common: dict, reduced, level: int, notes: list[str], check: bool, shown_mean: str) -> UnboundedRuin:
    digits = common["digits"]
    mean, variance, step = common["mean"], common["variance"], common["step"]
    largest_loss = common["largest_loss"]
    bankroll = common["bankroll"]
    reason = (
        f"the expected result per round is {shown_mean} unit(s) (> 0): the bankroll drifts up, so ruin "
        "is possible but not certain; the figure is the minimal non-negative solution of the hitting equations"
    )
    rho = _root_in_unit_interval(characteristic_polynomial(reduced), digits)
    with _precision(_bits_for(digits, level)):
        rho_ball = _arb_of(rho.exact) if rho.is_rational else _real_root_ball(rho.polynomial, 0, 1)
        rate_ball = -rho_ball.log()
        rate = float(rate_ball.mid())
        adjustment = _certified(rate_ball / step, digits)
        lundberg_ball = rho_ball**level
        lundberg = _certified(lundberg_ball, digits)
    rho_name = "theta" if largest_loss == 1 else "rho"
    lundberg_text = (
        f"exp(-R x bankroll) = {rho_name}^{level} with R = -ln {rho_name} the adjustment coefficient "
        "(E[exp(-R X)] = 1): an upper bound on the ruin chance"
    )
    if largest_loss == 1:
        lundberg_text += "; it is attained exactly when the only loss is one step"
    diffusion, diffusion_text = _diffusion(mean, variance, bankroll, digits)

    root_ball = None
    ruin_exact = None
    closed_form = None
    if largest_loss == 1:
        ruin = lundberg
        root_ball = lundberg_ball
        if rho.is_rational:
            if level * (numerator(rho.exact).bit_length() + denominator(rho.exact).bit_length()) <= MAX_EXACT_BITS:
                closed_form = _rational_power(rho.exact, level)
                ruin_exact = closed_form
            else:
                notes.append(f"theta^{level} is too long to write out as one fraction; shown as the power")
            base = f"({text(rho.exact)})" if not _is_integer_text(rho.exact) else text(rho.exact)
            exact_text = f"{base}^{level}"
            method = (
                "skip-free walk (the only loss is one step): ruin = theta^bankroll, theta the rational root "
                "in (0, 1) of E[t^X] = 1 (q/p for an even-money bet)"
            )
            error_bound = "none: exact rational (decimal correct to the last digit shown)"
        else:
            from sympy import Integer

            closed_form = rho.exact ** Integer(level)
            exact_text = f"theta^{level}, theta = root in (0, 1) of {rho.polynomial_text}"
            method = (
                "skip-free walk (the only loss is one step): ruin = theta^bankroll, theta the algebraic root "
                "in (0, 1) of E[t^X] = 1 (sympy CRootOf), digits by interval arithmetic"
            )
            error_bound = f"at most {lundberg.radius} (proved by interval arithmetic)"
        truncation_goal = _truncation_goal(level, rate, min(digits, CHECK_DIGITS)) if check else None
    else:
        by_roots = _favourable_by_roots(reduced, largest_loss, level, digits)
        truncation_goal = _truncation_goal(level, rate, min(digits, CHECK_DIGITS)) if check else None
        if by_roots is not None:
            ruin, root_ball = by_roots
            exact_text = f"algebraic: sum of c_i r_i^{level} over {largest_loss} roots r_i"
            method = (
                f"roots of the characteristic polynomial "
                f"{polynomial_text(tuple(reversed(characteristic_polynomial(reduced))))} inside the unit disc "
                f"({largest_loss} of them, the largest loss in steps): psi(k) = sum c_i r_i^k with psi = 1 on the "
                f"{largest_loss} ruin levels 0..-{largest_loss - 1}, the minimal solution of the hitting equations; "
                "digits by interval arithmetic"
            )
            error_bound = f"at most {ruin.radius} (proved by interval arithmetic)"
        else:
            truncation_goal = _truncation_goal(level, rate, min(digits, CHECK_DIGITS))
            check_only = _truncation_check(reduced, level, rho, digits, truncation_goal, exact_work=EXACT_FALLBACK_WORK)
            check_only = _with_goal_level(check_only, common, level)
            if check_only is None or check_only.lower is None:
                raise OddsbenchError(
                    "this walk has repeated characteristic roots (or too many to isolate) and its edge is too "
                    "small for exact truncation: no proved answer within the limits"
                )
            return _truncation_answer(
                common, check_only, rho, adjustment, lundberg, lundberg_text, diffusion, diffusion_text, reason, notes
            )
    truncation = _with_goal_level(
        _truncation_check(reduced, level, rho, digits, truncation_goal, root_ball), common, level
    )
    if check and truncation is None:
        notes.append(
            f"truncation cross-check skipped: the goal it needs ({truncation_goal:,} steps) is too far for a "
            "check, or the ruin chance is below the float range"
        )
    elif truncation is not None and truncation.arithmetic != "exact":
        notes.append(
            f"truncation cross-check solved in floating point: {truncation.goal:,} levels are too many for "
            "rationals in good time"
        )
    if truncation is not None and not truncation.consistent:
        raise OddsbenchError("internal check failed: the root method disagrees with truncation")
    return UnboundedRuin(
        **common,
        verdict=VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        ruin_exact=ruin_exact,
        ruin_closed_form=closed_form,
        ruin_exact_text=exact_text,
        method=method,
        error_bound=error_bound,
        theta=rho,
        adjustment_coefficient=adjustment,
        lundberg=lundberg,
        lundberg_text=lundberg_text,
        lundberg_exact_text=f"{rho_name}^{level}" + (" (= the exact figure)" if largest_loss == 1 else ""),
        diffusion=diffusion,
        diffusion_text=diffusion_text,
        **_diffusion_extras(common, root_ball, digits),
        adjustment_text=_adjustment_text(rho, common["step"], rho_name),
        rounds_to_ruin=RoundsToRuin(
            "not defined",
            None,
            None,
            None,
            None,
            "ruin is not certain: with positive chance play goes on for ever, so the plain expected time to "
            "ruin is infinite",
        ),
        rounds_if_ruined=_rounds_if_ruined(reduced, level, rho, digits) if largest_loss == 1 else None,
        truncation=truncation,
        notes=tuple(notes),
        _reduced=reduced,
    )


def _truncation_answer(
    common, check: TruncationCheck, rho, adjustment, lundberg, lundberg_text, diffusion, diffusion_text, reason, notes
) -> UnboundedRuin:
    from flint import arb

    digits = common["digits"]
    with _precision(_bits_for(digits, check.goal)):
        low = _arb_of(check.lower)
        gap = (
            _real_root_ball(rho.polynomial, 0, 1) ** check.goal
            if not rho.is_rational
            else _arb_of(rho.exact) ** check.goal
        )
        ball = arb(low.mid() + gap.mid() / 2, gap.mid() / 2 + gap.rad() + low.rad())
        ruin = _certified(ball, digits)
    return UnboundedRuin(
        **common,
        verdict=VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        ruin_exact=None,
        ruin_closed_form=None,
        ruin_exact_text=f"between {text(check.lower)} and that plus rho^{check.goal}",
        method=(
            f"truncation at goal {check.goal} steps: P(ruin before the goal), exact, increases to the answer; "
            "the gap is at most rho^goal (Lundberg bound from the goal)"
        ),
        error_bound=f"at most {check.gap_bound.text} (proved: rho^goal)",
        theta=rho,
        adjustment_coefficient=adjustment,
        lundberg=lundberg,
        lundberg_text=lundberg_text,
        lundberg_exact_text=f"rho^{common['steps_bankroll']}",
        diffusion=diffusion,
        diffusion_text=diffusion_text,
        **_diffusion_extras(common, ball, digits),
        adjustment_text=_adjustment_text(rho, common["step"]),
        rounds_to_ruin=RoundsToRuin(
            "not defined", None, None, None, None, "ruin is not certain: the plain expected time to ruin is infinite"
        ),
        rounds_if_ruined=None,
        truncation=check,
        notes=tuple(notes),
    )


def _with_goal_level(check: TruncationCheck | None, common: dict, level: int) -> TruncationCheck | None:
    """The check's goal (in steps of the reduced walk from ``level``) back in grid units."""
    from dataclasses import replace

    if check is None:
        return None
    return replace(check, goal_level=common["bankroll"] + common["step"] * (check.goal - level))


def _rounds_if_ruined(reduced, level: int, theta: CharacteristicRoot, digits: int) -> RoundsToRuin:
    """E[T | ruin] for a favourable skip-free walk: the walk given ruin has chances p_j theta^j.

    Given ruin, the walk is the Doob h-transform with h(k) = theta^k: a subfair skip-free walk with
    mean m* = sum_j j p_j theta^j < 0, so Wald gives E[T | ruin] = bankroll / |m*|.
    """
    if theta.is_rational:
        tilted = sum((QQ(j) * p * _rational_power(theta.exact, j) for j, p in reduced), QQ(0))
        value = QQ(level) / -tilted
        return RoundsToRuin(
            "finite",
            value,
            value,
            value,
            _certified_exact(value, digits),
            "given ruin the walk has chances p_j theta^j (subfair); Wald: bankroll / its expected loss",
        )

    def compute():
        from flint import arb

        theta_ball = _real_root_ball(theta.polynomial, 0, 1)
        tilted = arb(0)
        for j, p in reduced:
            tilted += _arb_of(p) * j * theta_ball**j
        return arb(level) / -tilted

    ball, bits = _with_retries(compute, digits, level, lambda b: _enough(b, digits))
    with _precision(bits):
        decimal = _certified(ball, digits)
    return RoundsToRuin(
        "finite",
        None,
        None,
        None,
        decimal,
        "given ruin the walk has chances p_j theta^j (subfair); Wald: bankroll / its expected loss",
    )


def _diffusion(mean: Rational, variance: Rational, bankroll: int, digits: int) -> tuple[Certified | None, str]:
    """The players' rule of thumb exp(-2 edge bankroll / variance) (common practice, no source)."""
    label = "exp(-2 x edge x bankroll / variance), from Brownian motion with the same mean and variance per round"
    if variance == 0:
        return None, "not applicable: the round has no variance"
    with _precision(_bits_for(digits, bankroll)):
        exponent = _arb_of(QQ(-2) * mean * QQ(bankroll) / variance)
        return _certified(exponent.exp(), digits), label


def _diffusion_extras(common: dict, ruin_ball, digits: int) -> dict[str, Any]:
    """The exact exponent of the rule of thumb, and its ratio to the exact ruin chance (balls)."""
    mean, variance, level = common["mean"], common["variance"], common["bankroll"]
    if variance == 0:
        return {"diffusion_exponent": None, "diffusion_ratio": None}
    exponent = QQ(-2) * mean * QQ(level) / variance
    ratio = None
    if ruin_ball is not None and ruin_ball > 0:
        with _precision(_bits_for(digits, level)):
            ratio = _certified(_arb_of(exponent).exp() / ruin_ball, min(digits, 12))
    return {"diffusion_exponent": exponent, "diffusion_ratio": ratio}


def _adjustment_text(rho: CharacteristicRoot, step: int, name: str = "rho") -> str:
    per_step = "" if step == 1 else f" / {step} per unit"
    if rho.is_rational:
        inverse = QQ(1) / rho.exact
        return f"ln({text(inverse)}){per_step}"
    return f"-ln {name}{per_step}"


def _rational_power(base: Rational, power: int) -> Rational:
    if power >= 0:
        return QQ(numerator(base) ** power, denominator(base) ** power)
    return QQ(denominator(base) ** (-power), numerator(base) ** (-power))


def _is_integer_text(value: Rational) -> bool:
    return denominator(value) == 1


NO_ADJUSTMENT_COEFFICIENT = "not applicable: no adjustment coefficient R > 0 when the expected result is <= 0"


def settled_ruin(
    common: dict,
    *,
    verdict: str,
    ruin: Rational,
    reason: str,
    method: str,
    lundberg_text: str,
    diffusion_text: str,
    rounds: RoundsToRuin,
    notes: list[str],
    digits: int,
) -> UnboundedRuin:
    """A ruin chance settled without any root or truncation (exactly 0 or exactly 1).

    The plain walk and the walk with cut bets both end here, so the fields that such an answer
    leaves empty are set in one place.
    """
    return UnboundedRuin(
        **common,
        verdict=verdict,
        reason=reason,
        ruin=_certified_exact(ruin, digits),
        ruin_exact=ruin,
        ruin_closed_form=ruin,
        ruin_exact_text=text(ruin),
        method=method,
        error_bound="none: exact",
        theta=None,
        adjustment_coefficient=None,
        lundberg=None,
        lundberg_exact_text="-",
        lundberg_text=lundberg_text,
        diffusion=None,
        diffusion_text=diffusion_text,
        diffusion_exponent=None,
        diffusion_ratio=None,
        adjustment_text="not applicable",
        rounds_to_ruin=rounds,
        rounds_if_ruined=None,
        truncation=None,
        notes=tuple(notes),
    )
