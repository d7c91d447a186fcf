"""Endless play when bets are cut near the bottom: a few low levels with their own law, a walk above.

A flat bet of B that the bankroll can no longer cover is cut to what it can cover (down to the
minimum bet), so the law of a round depends on the level below K = the first level that covers
B, and is one fixed law (the tail) from K upwards. The ruin chance and the expected rounds are
still exact: on levels >= K - d (d the tail's largest loss) they solve the tail's homogeneous
recurrence, so each residue class mod g (g the gcd of the tail's results) is a combination of the
tail's roots inside the unit disc (the same argument as in ``unbounded_ruin``: bounded, tending
to 0, hence no root on or outside the circle). The values on the bottom levels and the d
coefficients then solve one finite linear system: the bottom levels' first-step equations plus
d consistency equations on the levels K - d .. K - 1. When the tail is skip-free with a rational
theta the system is rational and solved exactly; otherwise in ball arithmetic.
"""

from __future__ import annotations

import math
from collections.abc import Mapping, Sequence
from typing import Any

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.solve import unbounded_ruin as ur
from oddsbench.solve.unbounded_ruin import (
    DEFAULT_DIGITS,
    RoundsToRuin,
    TruncationCheck,
    UnboundedRuin,
    solve_unbounded_ruin,
)

Law = tuple[tuple[int, Rational], ...]
MAX_BOTTOM = 2_000  # bottom levels solved as one dense system


def solve_clipped_ruin(
    tail: Mapping[int, Rational],
    bottom: Sequence[Mapping[int, Rational]],
    bankroll: int,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    unit: Rational | int = 1,
    should_stop=None,
) -> UnboundedRuin:
    """Ruin figures of a walk whose level k < K = len(bottom) + 1 moves by ``bottom[k - 1]``.

    Levels are grid units above the ruin line (ruin: level <= 0); ``tail`` is the law from K up.
    ``should_stop`` is polled by the long exact solves (raises ``SolveCancelled``).
    """
    token = ur._SHOULD_STOP.set(should_stop) if should_stop is not None else None
    try:
        return _solve_clipped_ruin(tail, bottom, bankroll, digits, check, unit)
    finally:
        if token is not None:
            ur._SHOULD_STOP.reset(token)


def _solve_clipped_ruin(tail, bottom, bankroll, digits, check, unit) -> UnboundedRuin:
    tail_law = ur._normalise(tail)
    bottom_laws = [ur._normalise(law) for law in bottom]
    while bottom_laws and bottom_laws[-1] == tail_law:
        bottom_laws.pop()  # trailing levels that already move like the tail
    if not bottom_laws:
        return solve_unbounded_ruin(dict(tail_law), bankroll, digits=digits, check=check, unit=unit)
    if len(bottom_laws) > MAX_BOTTOM:
        raise OddsbenchError(f"{len(bottom_laws):,} levels with cut bets; the limit is {MAX_BOTTOM:,}")
    if not isinstance(bankroll, int) or bankroll < 1:
        raise OddsbenchError(f"bankroll must be a whole number of units, at least 1 (got {bankroll!r})")
    for k, law in enumerate(bottom_laws, start=1):
        if law[0][0] >= 0:
            raise OddsbenchError(f"at level {k} (a cut bet) no result loses: the walk description is not a bet")
    if tail_law[0][0] >= 0:
        raise OddsbenchError("the round has no losing result at the full bet")
    problem = _Problem(tail_law, tuple(bottom_laws), bankroll)
    mean, variance = problem.mean, problem.variance
    shown_mean = text(mean * QQ(unit))
    top = problem.top
    notes = [
        f"below {top} grid units above the ruin line the bet is cut to what the bankroll covers; "
        "those levels are solved one by one, the walk above them through its characteristic roots"
    ]
    common = dict(
        bankroll=bankroll,
        jumps=tail_law,
        step=problem.g,
        steps_bankroll=bankroll,
        mean=mean,
        variance=variance,
        largest_loss=problem.d,
        digits=digits,
    )
    if mean <= 0:
        return _certain(problem, common, notes, shown_mean, digits)
    return _possible(problem, common, notes, shown_mean, digits, check)


class _Problem:
    """The walk's data and the tail basis (per residue class mod g, powers of the reduced roots)."""

    def __init__(self, tail: Law, bottom: tuple[Law, ...], bankroll: int) -> None:
        self.tail, self.bottom, self.bankroll = tail, bottom, bankroll
        self.mean, self.variance = ur._moments(tail)
        g = 0
        for jump, _ in tail:
            g = math.gcd(g, jump)
        self.g = g
        self.reduced: Law = tuple((jump // g, chance) for jump, chance in tail)
        self.m = -self.reduced[0][0]  # largest loss of the tail, in its steps
        self.d = self.m * g  # in grid units
        self.top = len(bottom) + 1  # K: first level that moves like the tail

    def law_at(self, level: int) -> Law:
        return self.bottom[level - 1] if level < self.top else self.tail

    def tail_distance(self, level: int) -> int:
        """Tail steps from ``level`` down to just below K: the Lundberg exponent from there."""
        return ur._ceil_div(level - self.top + 1, self.g)


def _solve_levels(problem: _Problem, bases: list[Any], kind: str, arithmetic: str, loss=None):
    """Unknowns x_1..x_{K-1}, c_b; returns (x values, coefficients) in the chosen arithmetic.

    ``bases`` are reduced roots sigma; basis (a, sigma) is [k = a mod g] sigma^(k div g).
    ``kind`` "ruin": V = 1 below the line; "rounds": V = 0 below, tail value k / loss + sum c f.
    """
    g, top, d = problem.g, problem.top, problem.d
    basis = [(a, sigma) for a in range(g) for sigma in bases]
    assert len(basis) == d
    size = top - 1 + d
    exact = arithmetic == "exact"
    if exact:
        zero, one = QQ(0), QQ(1)

        def num(value):
            return QQ(value)

        def power(sigma, n):
            return ur._rational_power(sigma, n)
    else:
        from flint import acb

        zero, one = acb(0), acb(1)

        def num(value):
            return acb(ur._arb_of(QQ(value)))

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
        for jump, chance in problem.law_at(k):
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


def _reduced_roots_inside(problem: _Problem, wanted: int):
    """The tail's reduced roots inside the unit disc, when simple and as many as wanted."""
    found = ur._roots_inside(ur.characteristic_polynomial(problem.reduced))
    if found is None:
        return None
    inside, simple = found
    if not simple or len(inside) != wanted:
        return "not-applicable"
    return inside


def _certified_value(problem: _Problem, kind: str, digits: int, level: int, theta_exact=None, loss=None):
    """(Certified, exact or None, ball) of the ruin chance or the expected rounds at ``level``."""
    wanted = problem.m if kind == "ruin" else problem.m - 1
    if kind == "ruin" and problem.m == 1 and theta_exact is not None:
        at = _solve_levels(problem, [theta_exact], kind, "exact", loss)
        if level < problem.top:
            value = at(level)
            with ur._precision(ur._bits_for(digits, level)):
                return ur._certified_exact(value, digits), value, ur._arb_of(value), _short_text(value)
        # above the cut levels: psi = c_a theta^(level div g), a = level mod g, c_a exact
        coefficient = at.coefficients[level % problem.g]
        power = level // problem.g
        closed = f"{ur.text(coefficient)} x ({ur.text(theta_exact)})^{power}"
        size = max(ur.numerator(theta_exact).bit_length(), ur.denominator(theta_exact).bit_length())
        with ur._precision(ur._bits_for(digits, level)):
            ball = ur._arb_of(coefficient) * ur._arb_of(theta_exact) ** power
            certified = ur._certified(ball, digits)
        if power * size <= ur.MAX_EXACT_DIGITS_BITS:
            return certified, coefficient * ur._rational_power(theta_exact, power), ball, closed
        return certified, None, ball, closed
    if kind == "rounds" and problem.m == 1:
        value = _solve_levels(problem, [QQ(1)], kind, "exact", loss)(level)
        return ur._certified_exact(value, digits), value, None, _short_text(value)

    def compute():
        roots = _reduced_roots_inside(problem, wanted)
        if roots is None:
            return None
        if roots == "not-applicable":
            return ("not-applicable",)
        if kind == "rounds":
            from flint import acb

            roots = [acb(1)] + roots
        return ("ok", _solve_levels(problem, roots, kind, "balls", loss)(level).real)

    def good(result) -> bool:
        return result is not None and (result[0] == "not-applicable" or ur._enough(result[1], digits))

    try:
        result, bits = ur._with_retries(compute, digits, level + problem.top, good)
    except (OddsbenchError, ZeroDivisionError, ValueError):
        return None
    if result[0] != "ok":
        return None
    with ur._precision(bits):
        return ur._certified(result[1], digits), None, result[1], None


def _short_text(value: Rational) -> str:
    """Exact text when short, else a pointer to the written-out value."""
    size = max(ur.numerator(value).bit_length(), ur.denominator(value).bit_length())
    return ur.text(value) if size <= 200 else "rational (written out below)"


def _certain(problem: _Problem, common: dict, notes: list[str], shown_mean: str, digits: int) -> UnboundedRuin:
    mean = problem.mean
    if mean < 0:
        reason = (
            f"at the full bet the expected result per round is {shown_mean} unit(s) (< 0): the bankroll drifts "
            "down into the levels with cut bets, each visit there can end in ruin, so ruin comes with probability 1"
        )
        found = _certified_value(problem, "rounds", digits, problem.bankroll, loss=-mean)
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
            certified, exact, _, _ = found
            rounds = RoundsToRuin(
                "finite",
                exact,
                exact,
                exact,
                certified,
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
    return ur.settled_ruin(
        common,
        verdict=ur.VERDICT_CERTAIN,
        ruin=QQ(1),
        reason=reason,
        method="expected result per round <= 0 at the full bet",
        lundberg_text=ur.NO_ADJUSTMENT_COEFFICIENT,
        diffusion_text="not applicable: ruin is certain",
        rounds=rounds,
        notes=notes,
        digits=digits,
    )


def _possible(
    problem: _Problem, common: dict, notes: list[str], shown_mean: str, digits: int, check: bool
) -> UnboundedRuin:
    level = problem.bankroll
    reason = (
        f"at the full bet the expected result per round is {shown_mean} unit(s) (> 0): the bankroll drifts up, so "
        "ruin is possible but not certain; the figure is the minimal non-negative solution of the hitting equations"
    )
    rho = ur._root_in_unit_interval(ur.characteristic_polynomial(problem.reduced), digits)
    distance = max(problem.tail_distance(level), 0)
    with ur._precision(ur._bits_for(digits, level)):
        rho_ball = ur._arb_of(rho.exact) if rho.is_rational else ur._real_root_ball(rho.polynomial, 0, 1)
        rate_ball = -rho_ball.log()
        rate = float(rate_ball.mid())
        adjustment = ur._certified(rate_ball / problem.g, digits)
        lundberg = ur._certified(rho_ball**distance, digits)
    lundberg_text = (
        f"rho^{distance}: from the bankroll, the chance of ever falling below the levels with full bets "
        f"(exp(-R x distance), R = -ln rho the adjustment coefficient of the full bet); an upper bound"
    )
    diffusion, diffusion_text = ur._diffusion(problem.mean, problem.variance, level, digits)
    found = _certified_value(problem, "ruin", digits, level, theta_exact=rho.exact if rho.is_rational else None)
    goal = level + problem.top + problem.g * (1 + math.ceil(min(digits, ur.CHECK_DIGITS) * math.log(10) / rate))
    truncation, gap_ball = (
        _truncation(problem, level, goal, rho_ball, digits) if (check or found is None) else (None, None)
    )
    if found is not None:
        ruin, ruin_exact, ball, closed = found
        if closed is not None:
            exact_text = closed
            method = (
                "levels with cut bets solved exactly together with theta^(k div g) per residue class above them "
                "(theta rational: one exact rational system)"
            )
            error_bound = "none: exact rational (decimal correct to the last digit shown)"
        else:
            exact_text = "algebraic: levels with cut bets + roots inside the unit disc"
            method = (
                "levels with cut bets solved together with the tail's roots inside the unit disc (per residue "
                "class mod g); interval arithmetic"
            )
            error_bound = f"at most {ruin.radius} (proved by interval arithmetic)"
        if truncation is not None and ball is not None:
            truncation = _with_consistency(truncation, ball, gap_ball, digits)
            if not truncation.consistent:
                raise OddsbenchError("internal check failed: the root method disagrees with truncation")
    else:
        if truncation is None or truncation.lower is None:
            raise OddsbenchError("the characteristic roots could not be separated and the walk is too long to truncate")
        with ur._precision(ur._bits_for(digits, goal)):
            from flint import arb

            low = ur._arb_of(truncation.lower)
            gap = rho_ball ** problem.tail_distance(truncation.goal)
            ball = arb(low.mid() + gap.mid() / 2, gap.mid() / 2 + gap.rad() + low.rad())
            ruin = ur._certified(ball, digits)
        ruin_exact, exact_text = None, "between the truncation's lower bound and that plus the gap"
        method = "truncation at a far goal, exact; the gap is at most rho^distance (Lundberg bound from the goal)"
        error_bound = f"at most {truncation.gap_bound.text} (proved)"
    if check and truncation is None:
        notes.append("truncation cross-check skipped: the goal it needs is too far")
    return UnboundedRuin(
        **common,
        verdict=ur.VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        ruin_exact=ruin_exact,
        ruin_closed_form=ruin_exact,
        ruin_exact_text=exact_text,
        method=method,
        error_bound=error_bound,
        theta=rho,
        adjustment_coefficient=adjustment,
        lundberg=lundberg,
        lundberg_text=lundberg_text,
        lundberg_exact_text=f"rho^{distance}",
        diffusion=diffusion,
        diffusion_text=diffusion_text,
        **ur._diffusion_extras(common, ball, digits),
        adjustment_text=ur._adjustment_text(rho, problem.g),
        rounds_to_ruin=RoundsToRuin(
            "not defined", None, None, None, None, "ruin is not certain: the plain expected time to ruin is infinite"
        ),
        rounds_if_ruined=None,
        truncation=truncation,
        notes=tuple(notes),
    )


def _truncation(problem: _Problem, level: int, goal: int, rho_ball, digits: int):
    """P(ruin before reaching ``goal``) exactly (small systems) or in floats; gap <= rho^distance."""
    from flint import arb

    span = problem.tail[-1][0] - problem.tail[0][0]
    with ur._precision(ur._bits_for(digits, goal)):
        gap = rho_ball ** problem.tail_distance(goal)
        gap_upper = arb(gap.mid() + gap.rad())
    if goal * goal * max(span, 1) <= ur.EXACT_CHECK_WORK:
        lower = ruin_before_goal_levels(problem, level, goal)
        with ur._precision(ur._bits_for(digits, goal)):
            shown = ur._certified(ur._arb_of(lower), digits)
            return TruncationCheck(goal, lower, shown, ur._certified(gap_upper, 3), True, goal_level=goal), gap_upper
    if goal > 200_000:
        return None, None
    lower_float = ruin_before_goal_levels_float(problem, level, goal)
    shown = ur.Certified(
        f"{lower_float:.12g}",
        f"{ur.FLOAT_CHECK_TOLERANCE:g}",
        math.log10(lower_float) if lower_float > 0 else -math.inf,
        lower_float,
    )
    with ur._precision(ur._bits_for(digits, goal)):
        return TruncationCheck(
            goal, None, shown, ur._certified(gap_upper, 3), True, "floating point", goal_level=goal
        ), gap_upper


def _with_consistency(check: TruncationCheck, ball, gap, digits: int) -> TruncationCheck:
    from dataclasses import replace

    from flint import arb

    with ur._precision(ur._bits_for(digits, check.goal)):
        if check.lower is not None:
            low = ur._arb_of(check.lower)
            interval = arb(low.mid() + gap.mid() / 2, gap.mid() / 2 + gap.rad() + low.rad())
            ok = bool(interval.overlaps(ball))
        else:
            low = check.lower_decimal.value
            ok = bool(ball > arb(low - ur.FLOAT_CHECK_TOLERANCE) and ball < arb(low + ur.FLOAT_CHECK_TOLERANCE) + gap)
    return replace(check, consistent=ok)


def ruin_before_goal_levels(problem: _Problem, level: int, goal: int) -> Rational:
    """Exact P(ruin before reaching >= goal) with the level-dependent laws (first-step analysis)."""
    from oddsbench.solve.linear import factor_exact

    if level <= 0:
        return QQ(1)
    if level >= goal:
        return QQ(0)
    rows: list[dict[int, Rational]] = []
    rhs: list[Rational] = []
    for k in range(1, goal):
        row: dict[int, Rational] = {k - 1: QQ(1)}
        ruin_now = QQ(0)
        for jump, chance in problem.law_at(k):
            target = k + jump
            if target <= 0:
                ruin_now += chance
            elif target < goal:
                row[target - 1] = row.get(target - 1, QQ(0)) - chance
        rows.append(row)
        rhs.append(ruin_now)
    return factor_exact(rows, should_stop=ur._SHOULD_STOP.get()).solve(rhs)[level - 1]


def ruin_before_goal_levels_float(problem: _Problem, level: int, goal: int) -> float:
    import numpy as np
    from scipy.sparse import csc_matrix

    from oddsbench.solve.linear import factor_float

    size = goal - 1
    rows, cols, vals = list(range(size)), list(range(size)), [1.0] * size
    rhs = np.zeros(size)
    for k in range(1, goal):
        for jump, chance in problem.law_at(k):
            target = k + jump
            if target <= 0:
                rhs[k - 1] += float(chance)
            elif target < goal:
                rows.append(k - 1), cols.append(target - 1), vals.append(-float(chance))
    matrix = csc_matrix((vals, (rows, cols)), shape=(size, size))
    return float(factor_float(matrix).solve(rhs)[level - 1])
