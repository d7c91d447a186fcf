"""Truncation: P(ruin before the bankroll reaches a goal), a finite first-step system.

The chance of ruin before a goal G rises to the no-goal ruin chance psi as G grows, and
psi - P(ruin before G) <= rho^G (from any level >= G ruin has chance at most rho^level: the
Lundberg bound). So a truncation is both a cross-check of the root method (the root result must
lie in [lower, lower + rho^G]) and, where the roots cannot be used, the method itself. Exact
systems go through the exact front door; larger ones in floats through the float one.
"""

from __future__ import annotations

import math
from collections.abc import Callable

from oddsbench.model.numbers import QQ, Rational
from oddsbench.solve.ruin.balls import (
    Certified,
    arb_of,
    bits_for,
    certified,
    current_stop,
    interval,
    precision,
)
from oddsbench.solve.ruin.law import Law
from oddsbench.solve.ruin.result import TruncationCheck
from oddsbench.solve.ruin.roots import CharacteristicRoot

CHECK_DIGITS = 12  # the cross-check aims at an error bound of 10^-12 (relative to rho^bankroll)
EXACT_CHECK_WORK = 5_000_000  # levels^2 x span: exact truncation above this (~0.5 s) is done in floats
EXACT_FALLBACK_WORK = 60_000_000  # when truncation is the method itself, exact up to this (~10 s)
MAX_FLOAT_CHECK_LEVELS = 1_000_000  # float truncation (banded solve) up to this many levels
FLOAT_CHECK_TOLERANCE = 1e-11  # absolute error allowed to the float check (direct solvers: ~1e-14)


def _truncated_rows(law_at: Callable[[int], Law], goal: int):
    """Rows of I - Q over levels 1 .. goal-1 (indices 0 .. goal-2) and the one-round ruin chances."""
    rows: list[dict[int, Rational]] = []
    rhs: list[Rational] = []
    for k in range(1, goal):
        row: dict[int, Rational] = {k - 1: QQ(1)}
        ruin_now = QQ(0)
        for jump, chance in law_at(k):
            target = k + jump
            if target <= 0:
                ruin_now += chance
            elif target < goal:
                row[target - 1] = row.get(target - 1, QQ(0)) - chance
        rows.append(row)
        rhs.append(ruin_now)
    return rows, rhs


def ruin_before_goal_levels(law_at: Callable[[int], Law], level: int, goal: int) -> Rational:
    """Exact P(the walk from ``level`` hits <= 0 before >= ``goal``), the law at level k being ``law_at(k)``."""
    from oddsbench.solve.linear import factor_exact

    if level <= 0:
        return QQ(1)
    if level >= goal:
        return QQ(0)
    rows, rhs = _truncated_rows(law_at, goal)
    return factor_exact(rows, should_stop=current_stop()).solve(rhs)[level - 1]


def ruin_before_goal(law: Law, level: int, goal: int) -> Rational:
    """Exact P(the walk from ``level`` hits <= 0 before >= ``goal``): first-step analysis."""
    return ruin_before_goal_levels(lambda _level: law, level, goal)


def ruin_before_goal_levels_float(law_at: Callable[[int], Law], level: int, goal: int) -> float:
    """The level-dependent chance in floating point (SuperLU through the float front door)."""
    import numpy as np
    from scipy.sparse import csc_matrix

    from oddsbench.solve.linear import factor_float

    size = goal - 1
    rows, cols, vals = list(range(size)), list(range(size)), [1.0] * size
    rhs = np.zeros(size)
    for k in range(1, goal):
        for jump, chance in law_at(k):
            target = k + jump
            if target <= 0:
                rhs[k - 1] += float(chance)
            elif target < goal:
                rows.append(k - 1), cols.append(target - 1), vals.append(-float(chance))
    matrix = csc_matrix((vals, (rows, cols)), shape=(size, size))
    return float(factor_float(matrix).solve(rhs)[level - 1])


def ruin_before_goal_float(law: Law, level: int, goal: int) -> float:
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


def truncation_goal(level: int, rate: float, digits: int) -> int:
    """Goal whose gap bound rho^goal is 10^-digits times rho^level."""
    return level + 1 + math.ceil(digits * math.log(10) / rate)


def float_lower(value: float) -> Certified:
    """A float truncation's lower bound, shown to 12 digits with the float check's tolerance."""
    return Certified(
        f"{value:.12g}", f"{FLOAT_CHECK_TOLERANCE:g}", math.log10(value) if value > 0 else -math.inf, value
    )


def float_consistent(ball, lower: float, gap_upper) -> bool:
    """The ball lies within the float check's tolerance of [lower, lower + gap]."""
    from flint import arb

    return bool(ball > arb(lower - FLOAT_CHECK_TOLERANCE) and ball < arb(lower + FLOAT_CHECK_TOLERANCE) + gap_upper)


def truncation_check(
    law: Law,
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
    with precision(bits_for(digits, goal)):
        gap = rho.ball() ** goal
        gap_upper = arb(gap.mid() + gap.rad())
    if not exact:
        if goal > MAX_FLOAT_CHECK_LEVELS or root_ball is None or not root_ball > arb("1e-280"):
            return None
        lower_float = ruin_before_goal_float(law, level, goal)
        with precision(bits_for(digits, goal)):
            consistent = float_consistent(root_ball, lower_float, gap_upper)
            return TruncationCheck(
                goal, None, float_lower(lower_float), certified(gap_upper, 3), consistent, "floating point"
            )
    lower = ruin_before_goal(law, level, goal)
    with precision(bits_for(digits, goal)):
        lower_ball = arb_of(lower)
        consistent = True
        if root_ball is not None:
            # proved: lower <= psi <= lower + gap; the root result must overlap that interval
            consistent = bool(interval(lower_ball, gap).overlaps(root_ball))
        return TruncationCheck(goal, lower, certified(lower_ball, digits), certified(gap_upper, 3), consistent)
