"""Play with no goal when every round moves the bankroll by one law: skip-free or bounded jumps.

The bankroll moves by a fixed law of net results per round (whole grid units, exact rational
chances, bounded jumps), from ``bankroll`` units; ruin is the first time it is at 0 or below.
There is no upper absorbing state, so the chain has infinitely many states: its hitting
equations psi(k) = sum_j p_j psi(k + j) (k >= 1), psi(k) = 1 (k <= 0) have many solutions and
the ruin chance is the minimal non-negative one.

* Expected result per round mu <= 0 (and some result negative): ruin is certain (durations in
  ``durations``).
* mu > 0: with d the largest loss (in steps), psi is the combination of the d roots inside the
  unit disc of P(t) = t^d (E[t^X] - 1) that equals 1 on 0, -1, ..., -(d-1) (``roots``; a
  bounded harmonic function with those boundary values is unique by optional stopping). For
  d = 1 (skip-free downward) this is theta^bankroll, theta the unique root in (0, 1) of
  E[t^X] = 1: exact as a rational, or as sympy's CRootOf of the irreducible factor carrying it.
* Decimals come from ball arithmetic (``balls``): every digit shown is proved, the radius is the
  error bound, and tiny values keep their exponent (no float underflow).
* Cross-check and fallback: truncation at a far goal (``truncation``), whose gap is at most rho^goal.
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import replace

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text
from oddsbench.solve.cancel import StopCheck
from oddsbench.solve.ruin.approximations import adjustment_text, diffusion_figures
from oddsbench.solve.ruin.balls import (
    DEFAULT_DIGITS,
    MAX_DIGITS,
    arb_of,
    bits_for,
    cancellable,
    certified,
    error_bound_text,
    interval,
    precision,
)
from oddsbench.solve.ruin.durations import FAIR_GAME, NOT_CERTAIN, NOT_CERTAIN_SHORT, rounds_if_ruined, subfair_rounds
from oddsbench.solve.ruin.law import (
    Law,
    ceil_div,
    largest_loss,
    law_moments,
    law_step,
    normalise_law,
    rational_power,
    reduced_law,
)
from oddsbench.solve.ruin.result import (
    BOUNDED_JUMPS,
    NO_ADJUSTMENT_COEFFICIENT,
    VERDICT_CERTAIN,
    VERDICT_NEVER,
    VERDICT_POSSIBLE,
    NoGoalRuin,
    RoundsToRuin,
    TruncationCheck,
    WalkFacts,
    no_goal_ruin,
    settled_ruin,
)
from oddsbench.solve.ruin.roots import (
    CharacteristicRoot,
    characteristic_polynomial,
    polynomial_text,
    root_in_unit_interval,
    ruin_by_roots,
)
from oddsbench.solve.ruin.truncation import (
    CHECK_DIGITS,
    EXACT_FALLBACK_WORK,
    truncation_check,
    truncation_goal,
)

MAX_EXACT_BITS = 200_000  # expand theta^bankroll as one fraction only below this size
NO_CHECK = "the truncation cross-check was not asked for (--no-check)"


def solve_no_goal_ruin(
    jumps: Mapping[int, Rational],
    bankroll: int,
    digits: int = DEFAULT_DIGITS,
    check: bool = True,
    unit: Rational | int = 1,
    should_stop: StopCheck = None,
) -> NoGoalRuin:
    """Ruin chance, method, bounds and expected rounds for play with no goal from ``bankroll`` units.

    ``jumps`` maps each net result of one round (whole grid units) to its exact chance. Ruin is
    the bankroll at 0 or below; callers that need the next stake covered shift the bankroll.
    ``unit`` (betting units per grid unit) only scales the expected result quoted in the reason.
    ``should_stop`` is polled by the long exact solves (raises ``SolveCancelled``).
    """
    with cancellable(should_stop):
        return _solve(jumps, bankroll, digits, check, unit)


def _solve(jumps, bankroll, digits: int, check: bool, unit) -> NoGoalRuin:
    if not isinstance(bankroll, int) or bankroll < 1:
        raise OddsbenchError(f"bankroll must be a whole number of units, at least 1 (got {bankroll!r})")
    if not isinstance(digits, int) or not 1 <= digits <= MAX_DIGITS:
        raise OddsbenchError(f"digits must be a whole number from 1 to {MAX_DIGITS} (got {digits!r})")
    law = normalise_law(jumps)
    mean, variance = law_moments(law)
    step = law_step(law)
    reduced = reduced_law(law, step)
    level = ceil_div(bankroll, step)
    notes: list[str] = []
    if step > 1:
        notes.append(
            f"every result is a multiple of {step} units: the walk moves in steps of {step}, "
            f"so a bankroll of {bankroll} counts as {level} step(s)"
        )
    walk = WalkFacts(BOUNDED_JUMPS, bankroll, law, step, level, mean, variance, largest_loss(reduced))
    shown_mean = text(mean * QQ(unit))
    if walk.largest_loss == 0:
        return settled_ruin(
            walk,
            verdict=VERDICT_NEVER,
            ruin=QQ(0),
            reason="no result of the round loses money, so the bankroll never falls",
            method="no losing result",
            bound_reason="not applicable: no losing result",
            diffusion_reason="not applicable: no losing result",
            rounds=RoundsToRuin("none", None, None, None, None, "ruin never happens"),
            notes=notes,
            digits=digits,
        )
    if mean <= 0:
        return _certain(walk, reduced, notes, shown_mean, digits)
    return _possible(walk, reduced, notes, check, shown_mean, digits)


def _certain(walk: WalkFacts, reduced: Law, notes: list[str], shown_mean: str, digits: int) -> NoGoalRuin:
    if walk.mean < 0:
        reason = (
            f"the expected result per round is {shown_mean} unit(s) (< 0): without a goal the bankroll "
            "drifts down and is wiped out with probability 1"
        )
        rounds = subfair_rounds(reduced, walk.steps_bankroll, walk.mean / walk.step, walk.largest_loss, digits)
        diffusion_reason = "not applicable: ruin is certain (the approximation is for favourable games)"
    else:
        reason = (
            "the expected result per round is 0 (a fair game): a fair walk returns below every level, "
            "so without a goal the bankroll is wiped out with probability 1"
        )
        rounds = RoundsToRuin("infinite", None, None, None, None, FAIR_GAME)
        diffusion_reason = "not applicable: ruin is certain"
    return settled_ruin(
        walk,
        verdict=VERDICT_CERTAIN,
        ruin=QQ(1),
        reason=reason,
        method="expected result per round <= 0",
        bound_reason=NO_ADJUSTMENT_COEFFICIENT,
        diffusion_reason=diffusion_reason,
        rounds=rounds,
        notes=notes,
        digits=digits,
    )


def _possible(walk: WalkFacts, reduced: Law, notes: list[str], check: bool, shown_mean: str, digits: int):
    level, loss = walk.steps_bankroll, walk.largest_loss
    reason = (
        f"the expected result per round is {shown_mean} unit(s) (> 0): the bankroll drifts up, so ruin "
        "is possible but not certain; the figure is the minimal non-negative solution of the hitting equations"
    )
    rho = root_in_unit_interval(characteristic_polynomial(reduced), digits)
    with precision(bits_for(digits, level)):
        rho_ball = rho.ball()
        rate_ball = -rho_ball.log()
        rate = float(rate_ball.mid())
        adjustment = certified(rate_ball / walk.step, digits)
        lundberg_ball = rho_ball**level
        lundberg = certified(lundberg_ball, digits)
    rho_name = "theta" if loss == 1 else "rho"
    lundberg_text = (
        f"exp(-R x bankroll) = {rho_name}^{level} with R = -ln {rho_name} the adjustment coefficient "
        "(E[exp(-R X)] = 1): an upper bound on the ruin chance"
    )
    if loss == 1:
        lundberg_text += "; it is attained exactly when the only loss is one step"
    bounds = dict(
        theta=rho,
        adjustment_coefficient=adjustment,
        adjustment_text=adjustment_text(rho, walk.step, rho_name),
        lundberg=lundberg,
        lundberg_text=lundberg_text,
    )
    absent: dict[str, str] = {}
    goal = truncation_goal(level, rate, min(digits, CHECK_DIGITS)) if check else None
    if loss == 1:
        ruin, root_ball = lundberg, lundberg_ball
        answer = _skip_free_answer(rho, level, notes, lundberg.radius, absent)
    else:
        by_roots = ruin_by_roots(reduced, loss, level, digits)
        if by_roots is None:
            return _truncation_answer(walk, reduced, rho, bounds, reason, notes, digits, rate)
        ruin, root_ball = by_roots
        answer = dict(
            exact_text=f"algebraic: sum of c_i r_i^{level} over {loss} roots r_i",
            method=(
                f"roots of the characteristic polynomial "
                f"{polynomial_text(tuple(reversed(characteristic_polynomial(reduced))))} inside the unit disc "
                f"({loss} of them, the largest loss in steps): psi(k) = sum c_i r_i^k with psi = 1 on the "
                f"{loss} ruin levels 0..-{loss - 1}, the minimal solution of the hitting equations; "
                "digits by interval arithmetic"
            ),
            error_bound=error_bound_text(ruin.radius),
        )
        absent["ruin_exact"] = "the ruin chance is algebraic (a combination of roots): known by its proved digits"
        absent["ruin_closed_form"] = absent["ruin_exact"]
        absent["rounds_if_ruined"] = "given for skip-free walks only (the only loss is one step)"
    truncation = _in_grid_units(truncation_check(reduced, level, rho, digits, goal, root_ball), walk)
    if not check:
        absent["truncation"] = NO_CHECK
    elif truncation is None:
        absent["truncation"] = "the goal it needs is too far for a check, or the ruin chance is below the float range"
        notes.append(
            f"truncation cross-check skipped: the goal it needs ({goal:,} steps) is too far for a "
            "check, or the ruin chance is below the float range"
        )
    elif truncation.arithmetic != "exact":
        notes.append(
            f"truncation cross-check solved in floating point: {truncation.goal:,} levels are too many for "
            "rationals in good time"
        )
    if truncation is not None and not truncation.consistent:
        raise OddsbenchError("internal check failed: the root method disagrees with truncation")
    diffusion, diffusion_absent = diffusion_figures(walk, root_ball, digits)
    return no_goal_ruin(
        walk,
        verdict=VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        **answer,
        **bounds,
        lundberg_exact_text=f"{rho_name}^{level}" + (" (= the exact figure)" if loss == 1 else ""),
        **diffusion,
        rounds_to_ruin=RoundsToRuin("not defined", None, None, None, None, NOT_CERTAIN),
        rounds_if_ruined=rounds_if_ruined(reduced, level, rho, digits) if loss == 1 else None,
        truncation=truncation,
        notes=notes,
        digits=digits,
        absent={**absent, **diffusion_absent},
        reduced=reduced,
    )


def _skip_free_answer(rho: CharacteristicRoot, level: int, notes: list[str], radius: str, absent: dict) -> dict:
    """theta^level: exact text, method and error bound, and the exact fraction when it is not huge."""
    if not rho.is_rational:
        from sympy import Integer

        absent["ruin_exact"] = "theta is irrational: the ruin chance is the algebraic power in the closed form"
        return dict(
            closed_form=rho.exact ** Integer(level),
            exact_text=f"theta^{level}, theta = root in (0, 1) of {rho.polynomial_text}",
            method=(
                "skip-free walk (the only loss is one step): ruin = theta^bankroll, theta the algebraic root "
                "in (0, 1) of E[t^X] = 1 (sympy CRootOf), digits by interval arithmetic"
            ),
            error_bound=error_bound_text(radius),
        )
    answer: dict = {}
    if level * (numerator(rho.exact).bit_length() + denominator(rho.exact).bit_length()) <= MAX_EXACT_BITS:
        answer["closed_form"] = answer["ruin_exact"] = rational_power(rho.exact, level)
    else:
        notes.append(f"theta^{level} is too long to write out as one fraction; shown as the power")
        absent["ruin_exact"] = absent["ruin_closed_form"] = f"theta^{level} is too long to write out as one fraction"
    base = text(rho.exact) if denominator(rho.exact) == 1 else f"({text(rho.exact)})"
    return dict(
        answer,
        exact_text=f"{base}^{level}",
        method=(
            "skip-free walk (the only loss is one step): ruin = theta^bankroll, theta the rational root "
            "in (0, 1) of E[t^X] = 1 (q/p for an even-money bet)"
        ),
        error_bound="none: exact rational (decimal correct to the last digit shown)",
    )


def _truncation_answer(
    walk: WalkFacts, reduced: Law, rho: CharacteristicRoot, bounds: dict, reason: str, notes, digits: int, rate: float
) -> NoGoalRuin:
    """When the roots cannot be used (repeated, or too many): the exact truncation is the answer."""
    level = walk.steps_bankroll
    goal = truncation_goal(level, rate, min(digits, CHECK_DIGITS))
    check = _in_grid_units(truncation_check(reduced, level, rho, digits, goal, exact_work=EXACT_FALLBACK_WORK), walk)
    if check is None or check.lower is None:
        raise OddsbenchError(
            "this walk has repeated characteristic roots (or too many to isolate) and its edge is too "
            "small for exact truncation: no proved answer within the limits"
        )
    with precision(bits_for(digits, check.goal)):
        ball = interval(arb_of(check.lower), rho.ball() ** check.goal)
        ruin = certified(ball, digits)
    interval_only = "known only inside a proved interval (truncation at a far goal)"
    diffusion, diffusion_absent = diffusion_figures(walk, ball, digits)
    return no_goal_ruin(
        walk,
        verdict=VERDICT_POSSIBLE,
        reason=reason,
        ruin=ruin,
        exact_text=f"between {text(check.lower)} and that plus rho^{check.goal}",
        method=(
            f"truncation at goal {check.goal} steps: P(ruin before the goal), exact, increases to the answer; "
            "the gap is at most rho^goal (Lundberg bound from the goal)"
        ),
        error_bound=f"at most {check.gap_bound.text} (proved: rho^goal)",
        **bounds,
        lundberg_exact_text=f"rho^{walk.steps_bankroll}",
        **diffusion,
        rounds_to_ruin=RoundsToRuin("not defined", None, None, None, None, NOT_CERTAIN_SHORT),
        truncation=check,
        notes=notes,
        digits=digits,
        absent={
            "ruin_exact": interval_only,
            "ruin_closed_form": interval_only,
            "rounds_if_ruined": "given for skip-free walks only (the only loss is one step)",
            **diffusion_absent,
        },
    )


def _in_grid_units(check: TruncationCheck | None, walk: WalkFacts) -> TruncationCheck | None:
    """The check's goal (in steps of the reduced walk from the bankroll) back in grid units."""
    if check is None:
        return None
    return replace(check, goal_level=walk.bankroll + walk.step * (check.goal - walk.steps_bankroll))
