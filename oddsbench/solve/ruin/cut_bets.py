"""Play with no goal when bets are cut near the bottom: a few low levels with their own law, a walk above.

A flat bet of B that the bankroll can no longer cover is cut to what it can cover (down to the
minimum bet), so the law of a round depends on the level below K = the first level that covers
B, and is one fixed law (the tail) from K upwards. The ruin chance and the expected rounds are
still exact: on levels >= K - d (d the tail's largest loss) they solve the tail's homogeneous
recurrence, so each residue class mod g (g the gcd of the tail's results) is a combination of the
tail's roots inside the unit disc (the same argument as in ``bounded_jumps``: bounded, tending
to 0, hence no root on or outside the circle). The values on the bottom levels and the d
coefficients then solve one finite linear system: the bottom levels' first-step equations plus
d consistency equations on the levels K - d .. K - 1. When the tail is skip-free with a rational
theta the system is rational and solved exactly; otherwise in ball arithmetic.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from dataclasses import dataclass, replace
from functools import cached_property
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text
from oddsbench.solve.cancel import StopCheck
from oddsbench.solve.ruin.approximations import adjustment_text, diffusion_figures
from oddsbench.solve.ruin.balls import (
    DEFAULT_DIGITS,
    arb_of,
    bits_for,
    cancellable,
    certified,
    certified_exact,
    enough,
    error_bound_text,
    interval,
    precision,
    with_retries,
)
from oddsbench.solve.ruin.bounded_jumps import solve_no_goal_ruin
from oddsbench.solve.ruin.durations import NOT_CERTAIN_SHORT
from oddsbench.solve.ruin.law import Law, ceil_div, law_moments, law_step, normalise_law, rational_power, reduced_law
from oddsbench.solve.ruin.result import (
    CUT_BETS,
    NO_ADJUSTMENT_COEFFICIENT,
    VERDICT_CERTAIN,
    VERDICT_POSSIBLE,
    NoGoalRuin,
    RoundsToRuin,
    TruncationCheck,
    WalkFacts,
    no_goal_ruin,
    settled_ruin,
)
from oddsbench.solve.ruin.roots import characteristic_polynomial, root_in_unit_interval, roots_inside
from oddsbench.solve.ruin.truncation import (
    CHECK_DIGITS,
    EXACT_CHECK_WORK,
    float_consistent,
    float_lower,
    ruin_before_goal_levels,
    ruin_before_goal_levels_float,
)

MAX_BOTTOM = 2_000  # bottom levels solved as one dense system
MAX_EXACT_DIGITS_BITS = 100_000  # write c x theta^n out as one fraction only below this size
MAX_FLOAT_LEVELS = 200_000  # float truncation of a walk with cut bets up to this goal


def solve_cut_bet_ruin(
    tail: Mapping[int, Rational],
    bottom: Sequence[Mapping[int, Rational]],
    bankroll: int,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    unit: Rational | int = 1,
    should_stop: StopCheck = None,
) -> NoGoalRuin:
    """Ruin figures of a walk whose level k < K = len(bottom) + 1 moves by ``bottom[k - 1]``.

    Levels are grid units above the ruin line (ruin: level <= 0); ``tail`` is the law from K up.
    ``should_stop`` is polled by the long exact solves (raises ``SolveCancelled``).
    """
    with cancellable(should_stop):
        return _solve(tail, bottom, bankroll, digits, check, unit)


def _solve(tail, bottom, bankroll, digits, check, unit) -> NoGoalRuin:
    tail_law = normalise_law(tail)
    bottom_laws = [normalise_law(law) for law in bottom]
    while bottom_laws and bottom_laws[-1] == tail_law:
        bottom_laws.pop()  # trailing levels that already move like the tail
    if not bottom_laws:
        return solve_no_goal_ruin(dict(tail_law), bankroll, digits=digits, check=check, unit=unit)
    if len(bottom_laws) > MAX_BOTTOM:
        raise OddsbenchError(f"{len(bottom_laws):,} levels with cut bets; the limit is {MAX_BOTTOM:,}")
    if not isinstance(bankroll, int) or bankroll < 1:
        raise OddsbenchError(f"bankroll must be a whole number of units, at least 1 (got {bankroll!r})")
    for k, law in enumerate(bottom_laws, start=1):
        if law[0][0] >= 0:
            raise OddsbenchError(f"at level {k} (a cut bet) no result loses: the walk description is not a bet")
    if tail_law[0][0] >= 0:
        raise OddsbenchError("the round has no losing result at the full bet")
    walk = CutBetWalk(tail_law, tuple(bottom_laws), bankroll)
    shown_mean = text(walk.mean * QQ(unit))
    notes = [
        f"below {walk.top} grid units above the ruin line the bet is cut to what the bankroll covers; "
        "those levels are solved one by one, the walk above them through its characteristic roots"
    ]
    facts = WalkFacts(CUT_BETS, bankroll, tail_law, walk.g, bankroll, walk.mean, walk.variance, walk.d)
    if walk.mean <= 0:
        return _certain(walk, facts, notes, shown_mean, digits)
    return _possible(walk, facts, notes, shown_mean, digits, check)


@dataclass(frozen=True)
class CutBetWalk:
    """The walk's laws and its tail basis (per residue class mod g, powers of the reduced roots)."""

    tail: Law
    bottom: tuple[Law, ...]
    bankroll: int

    @cached_property
    def mean(self) -> Rational:
        return law_moments(self.tail)[0]

    @cached_property
    def variance(self) -> Rational:
        return law_moments(self.tail)[1]

    @cached_property
    def g(self) -> int:
        """The gcd of the tail's results."""
        return law_step(self.tail)

    @cached_property
    def reduced(self) -> Law:
        return reduced_law(self.tail, self.g)

    @property
    def m(self) -> int:
        """Largest loss of the tail, in its steps."""
        return -self.reduced[0][0]

    @property
    def d(self) -> int:
        """Largest loss of the tail, in grid units."""
        return self.m * self.g

    @property
    def top(self) -> int:
        """K: the first level that moves like the tail."""
        return len(self.bottom) + 1

    def law_at(self, level: int) -> Law:
        return self.bottom[level - 1] if level < self.top else self.tail

    def tail_distance(self, level: int) -> int:
        """Tail steps from ``level`` down to just below K: the Lundberg exponent from there."""
        return ceil_div(level - self.top + 1, self.g)


def _solve_levels(walk: CutBetWalk, bases: list[Any], kind: str, arithmetic: str, loss=None):
    """Unknowns x_1..x_{K-1}, c_b; returns (x values, coefficients) in the chosen arithmetic.

    ``bases`` are reduced roots sigma; basis (a, sigma) is [k = a mod g] sigma^(k div g).
    ``kind`` "ruin": V = 1 below the line; "rounds": V = 0 below, tail value k / loss + sum c f.
    """
    g, top, d = walk.g, walk.top, walk.d
    basis = [(a, sigma) for a in range(g) for sigma in bases]
    assert len(basis) == d
    size = top - 1 + d
    exact = arithmetic == "exact"
    if exact:
        zero, one = QQ(0), QQ(1)

        def num(value):
            return QQ(value)

        def power(sigma, n):
            return rational_power(sigma, n)
    else:
        from flint import acb

        zero, one = acb(0), acb(1)

        def num(value):
            return acb(arb_of(QQ(value)))

        def power(sigma, n):
            return sigma**n if n >= 0 else acb(1) / sigma ** (-n)

    def f(b: int, k: int):
        a, sigma = basis[b]
        return power(sigma, k // g) if k % g == a else zero

    def particular(k: int):
        return num(QQ(k) / loss) if kind == "rounds" else zero

    rows = [[zero] * size for _ in range(size)]
    rhs = [zero] * size
    for k in range(1, top):
        i = k - 1
        rows[i][i] += one
        rhs[i] += one if kind == "rounds" else zero
        for jump, chance in walk.law_at(k):
            p = num(chance)
            t = k + jump
            if t <= 0:
                if kind == "ruin":
                    rhs[i] += p
            elif t < top:
                rows[i][t - 1] -= p
            else:
                rhs[i] += p * particular(t)
                for b in range(d):
                    rows[i][top - 1 + b] -= p * f(b, t)
    for r, k in enumerate(range(top - d, top)):
        i = top - 1 + r
        for b in range(d):
            rows[i][top - 1 + b] += f(b, k)
        if k >= 1:
            rows[i][k - 1] -= one
            rhs[i] -= particular(k)
        else:
            rhs[i] += (one if kind == "ruin" else zero) - particular(k)
    if exact:
        from oddsbench.solve.linear import factor_exact

        dict_rows = [{j: value for j, value in enumerate(row) if value != 0} for row in rows]
        solution = factor_exact(dict_rows, method="dense").solve(rhs)
    else:
        from flint import acb_mat

        solved = acb_mat(rows).solve(acb_mat([[value] for value in rhs]))
        solution = [solved[i, 0] for i in range(size)]
    values = solution[: top - 1]
    coefficients = solution[top - 1 :]

    def at(level: int):
        if level <= 0:
            return one if kind == "ruin" else zero
        if level < top:
            return values[level - 1]
        total = particular(level)
        for b in range(d):
            total += coefficients[b] * f(b, level)
        return total

    at.coefficients = coefficients  # type: ignore[attr-defined]
    return at


def _reduced_roots_inside(walk: CutBetWalk, wanted: int):
    """The tail's reduced roots inside the unit disc, when simple and as many as wanted."""
    found = roots_inside(characteristic_polynomial(walk.reduced))
    if found is None:
        return None
    inside, simple = found
    if not simple or len(inside) != wanted:
        return "not-applicable"
    return inside


def _certified_value(walk: CutBetWalk, kind: str, digits: int, level: int, theta_exact=None, loss=None):
    """(Certified, exact or None, ball, closed text or None) of the ruin chance or expected rounds."""
    wanted = walk.m if kind == "ruin" else walk.m - 1
    if kind == "ruin" and walk.m == 1 and theta_exact is not None:
        at = _solve_levels(walk, [theta_exact], kind, "exact", loss)
        if level < walk.top:
            value = at(level)
            with precision(bits_for(digits, level)):
                return certified_exact(value, digits), value, arb_of(value), _short_text(value)
        # above the cut levels: psi = c_a theta^(level div g), a = level mod g, c_a exact
        coefficient = at.coefficients[level % walk.g]
        power = level // walk.g
        closed = f"{text(coefficient)} x ({text(theta_exact)})^{power}"
        size = max(numerator(theta_exact).bit_length(), denominator(theta_exact).bit_length())
        with precision(bits_for(digits, level)):
            ball = arb_of(coefficient) * arb_of(theta_exact) ** power
            shown = certified(ball, digits)
        if power * size <= MAX_EXACT_DIGITS_BITS:
            return shown, coefficient * rational_power(theta_exact, power), ball, closed
        return shown, None, ball, closed
    if kind == "rounds" and walk.m == 1:
        value = _solve_levels(walk, [QQ(1)], kind, "exact", loss)(level)
        return certified_exact(value, digits), value, None, _short_text(value)

    def compute():
        roots = _reduced_roots_inside(walk, wanted)
        if roots is None:
            return None
        if roots == "not-applicable":
            return ("not-applicable",)
        if kind == "rounds":
            from flint import acb

            roots = [acb(1)] + roots
        return ("ok", _solve_levels(walk, roots, kind, "balls", loss)(level).real)

    def good(result) -> bool:
        return result is not None and (result[0] == "not-applicable" or enough(result[1], digits))

    try:
        result, bits = with_retries(compute, digits, level + walk.top, good)
    except (OddsbenchError, ZeroDivisionError, ValueError):
        return None
    if result[0] != "ok":
        return None
    with precision(bits):
        return certified(result[1], digits), None, result[1], None


def _short_text(value: Rational) -> str:
    """Exact text when short, else a pointer to the written-out value."""
    size = max(numerator(value).bit_length(), denominator(value).bit_length())
    return text(value) if size <= 200 else "rational (written out below)"


def _certain(walk: CutBetWalk, facts: WalkFacts, notes: list[str], shown_mean: str, digits: int) -> NoGoalRuin:
    if walk.mean < 0:
        reason = (
            f"at the full bet the expected result per round is {shown_mean} unit(s) (< 0): the bankroll drifts "
            "down into the levels with cut bets, each visit there can end in ruin, so ruin comes with probability 1"
        )
        found = _certified_value(walk, "rounds", digits, walk.bankroll, loss=-walk.mean)
        if found is None:
            rounds = RoundsToRuin(
                "finite",
                None,
                None,
                None,
                None,
                "finite (subfair), but the characteristic roots could not be separated",
            )
        else:
            shown, exact, _, _ = found
            rounds = RoundsToRuin(
                "finite",
                exact,
                exact,
                exact,
                shown,
                "first-step equations on the levels with cut bets; above them k / expected loss plus a "
                "combination of constants per residue class and the tail's roots inside the unit disc",
            )
    else:
        reason = (
            "at the full bet the expected result per round is 0 (a fair game): the walk keeps returning to the "
            "levels with cut bets, so ruin comes with probability 1"
        )
        rounds = RoundsToRuin(
            "infinite", None, None, None, None, "fair game: ruin is certain but its expected time is infinite"
        )
    return settled_ruin(
        facts,
        verdict=VERDICT_CERTAIN,
        ruin=QQ(1),
        reason=reason,
        method="expected result per round <= 0 at the full bet",
        bound_reason=NO_ADJUSTMENT_COEFFICIENT,
        diffusion_reason="not applicable: ruin is certain",
        rounds=rounds,
        notes=notes,
        digits=digits,
    )


def _possible(
    walk: CutBetWalk, facts: WalkFacts, notes: list[str], shown_mean: str, digits: int, check: bool
) -> NoGoalRuin:
    level = walk.bankroll
    reason = (
        f"at the full bet the expected result per round is {shown_mean} unit(s) (> 0): the bankroll drifts up, so "
        "ruin is possible but not certain; the figure is the minimal non-negative solution of the hitting equations"
    )
    rho = root_in_unit_interval(characteristic_polynomial(walk.reduced), digits)
    distance = max(walk.tail_distance(level), 0)
    with precision(bits_for(digits, level)):
        rho_ball = rho.ball()
        rate_ball = -rho_ball.log()
        rate = float(rate_ball.mid())
        adjustment = certified(rate_ball / walk.g, digits)
        lundberg = certified(rho_ball**distance, digits)
    lundberg_text = (
        f"rho^{distance}: from the bankroll, the chance of ever falling below the levels with full bets "
        f"(exp(-R x distance), R = -ln rho the adjustment coefficient of the full bet); an upper bound"
    )
    found = _certified_value(walk, "ruin", digits, level, theta_exact=rho.exact if rho.is_rational else None)
    goal = level + walk.top + walk.g * (1 + math.ceil(min(digits, CHECK_DIGITS) * math.log(10) / rate))
    truncation, gap_ball = (
        _truncation(walk, level, goal, rho_ball, digits) if (check or found is None) else (None, None)
    )
    absent: dict[str, str] = {}
    if found is not None:
        ruin, ruin_exact, ball, closed = found
        if closed is not None:
            exact_text = closed
            method = (
                "levels with cut bets solved exactly together with theta^(k div g) per residue class above them "
                "(theta rational: one exact rational system)"
            )
            error_bound = "none: exact rational (decimal correct to the last digit shown)"
            if ruin_exact is None:
                absent["ruin_exact"] = "the exact fraction is too long to write out: shown as a power"
        else:
            exact_text = "algebraic: levels with cut bets + roots inside the unit disc"
            method = (
                "levels with cut bets solved together with the tail's roots inside the unit disc (per residue "
                "class mod g); interval arithmetic"
            )
            error_bound = error_bound_text(ruin.radius)
            absent["ruin_exact"] = "the ruin chance is algebraic (roots of the tail's polynomial): proved digits only"
        if truncation is not None and ball is not None:
            truncation = _with_consistency(truncation, ball, gap_ball, digits)
            if not truncation.consistent:
                raise OddsbenchError("internal check failed: the root method disagrees with truncation")
    else:
        if truncation is None or truncation.lower is None:
            raise OddsbenchError("the characteristic roots could not be separated and the walk is too long to truncate")
        with precision(bits_for(digits, goal)):
            ball = interval(arb_of(truncation.lower), rho_ball ** walk.tail_distance(truncation.goal))
            ruin = certified(ball, digits)
        ruin_exact, exact_text = None, "between the truncation's lower bound and that plus the gap"
        method = "truncation at a far goal, exact; the gap is at most rho^distance (Lundberg bound from the goal)"
        error_bound = f"at most {truncation.gap_bound.text} (proved)"
        absent["ruin_exact"] = "known only inside a proved interval (truncation at a far goal)"
    if ruin_exact is None:
        absent["ruin_closed_form"] = absent["ruin_exact"]
    if truncation is None:
        absent["truncation"] = (
            "the truncation cross-check was not asked for (--no-check)" if not check else "the goal it needs is too far"
        )
    if check and truncation is None:
        notes.append("truncation cross-check skipped: the goal it needs is too far")
    diffusion, diffusion_absent = diffusion_figures(facts, ball, digits)
    return no_goal_ruin(
        facts,
        verdict=VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        ruin_exact=ruin_exact,
        closed_form=ruin_exact,
        exact_text=exact_text,
        method=method,
        error_bound=error_bound,
        theta=rho,
        adjustment_coefficient=adjustment,
        adjustment_text=adjustment_text(rho, walk.g),
        lundberg=lundberg,
        lundberg_text=lundberg_text,
        lundberg_exact_text=f"rho^{distance}",
        **diffusion,
        rounds_to_ruin=RoundsToRuin("not defined", None, None, None, None, NOT_CERTAIN_SHORT),
        truncation=truncation,
        notes=notes,
        digits=digits,
        absent={
            **absent,
            "rounds_if_ruined": "given for walks without cut bets whose only loss is one step",
            **diffusion_absent,
        },
    )


def _truncation(walk: CutBetWalk, level: int, goal: int, rho_ball, digits: int):
    """P(ruin before reaching ``goal``) exactly (small systems) or in floats; gap <= rho^distance."""
    from flint import arb

    span = walk.tail[-1][0] - walk.tail[0][0]
    with precision(bits_for(digits, goal)):
        gap = rho_ball ** walk.tail_distance(goal)
        gap_upper = arb(gap.mid() + gap.rad())
    if goal * goal * max(span, 1) <= EXACT_CHECK_WORK:
        lower = ruin_before_goal_levels(walk.law_at, level, goal)
        with precision(bits_for(digits, goal)):
            shown = certified(arb_of(lower), digits)
            return TruncationCheck(goal, lower, shown, certified(gap_upper, 3), True, goal_level=goal), gap_upper
    if goal > MAX_FLOAT_LEVELS:
        return None, None
    lower_float = ruin_before_goal_levels_float(walk.law_at, level, goal)
    with precision(bits_for(digits, goal)):
        return TruncationCheck(
            goal, None, float_lower(lower_float), certified(gap_upper, 3), True, "floating point", goal_level=goal
        ), gap_upper


def _with_consistency(check: TruncationCheck, ball, gap, digits: int) -> TruncationCheck:
    with precision(bits_for(digits, check.goal)):
        if check.lower is not None:
            ok = bool(interval(arb_of(check.lower), gap).overlaps(ball))
        else:
            ok = float_consistent(ball, check.lower_decimal.value, gap)
    return replace(check, consistent=ok)
