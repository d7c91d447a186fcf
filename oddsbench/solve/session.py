"""Every figure of a bankroll session, exactly and in floating point: which engines run, and the result.

Without a time cap one factorisation serves every figure (``session_absorbing``); with a cap,
and for figures within N rounds, the distribution is stepped round by round (``session_steps``);
``session_figures`` names the figures, checks decimals against exact values and builds the
final distribution. Exact results are the truth when the chain is small enough (the exact
limit, and an estimate of the elimination's fill); decimals are checked against them.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from oddsbench.chain.bankroll import BankrollChain
from oddsbench.model.defaults import SESSION_EXACT_LIMIT
from oddsbench.model.figure import Figure
from oddsbench.model.float_series import FloatSeries
from oddsbench.model.numbers import Rational
from oddsbench.solve.bankroll_system import skip_free_view
from oddsbench.solve.by_step import require_exact_steps
from oddsbench.solve.linear import ExactTooLarge, factor_float, identity_minus_float
from oddsbench.solve.session_absorbing import absorbing_decimal, absorbing_exact
from oddsbench.solve.session_figures import FinalValue, goal_series_of, session_figures, underflow_notes
from oddsbench.solve.session_steps import capped_series_decimal, capped_series_exact, forward_decimal, forward_exact
from oddsbench.solve.session_walk import walk_decimal

DEFAULT_EXACT_LIMIT = SESSION_EXACT_LIMIT
EXACT_STEP_BUDGET = 3_000_000
EXACT_WORK_LIMIT = 20_000_000


@dataclass(frozen=True)
class SessionSolution:
    """Raw session figures from the start state, the final distribution and the goal series."""

    figures: dict[str, Figure]
    final: tuple[FinalValue, ...]
    goal_series: FloatSeries
    goal_series_exact: tuple[Rational, ...] | None
    after_rounds: tuple[FinalValue, ...] = ()
    rounds: int | None = None
    exact: bool = False
    notes: tuple[str, ...] = field(default=())
    goal_series_log10: np.ndarray | None = field(default=None, compare=False)  # log10 of each value (-inf: 0)


def solve_session(
    chain: BankrollChain,
    max_rounds: int | None = None,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> SessionSolution:
    """Solve a session chain (both engines where exact is feasible) and collect its figures."""
    notes: list[str] = []
    use_exact = chain.size <= exact_limit
    if not use_exact:
        notes.append(
            f"exact arithmetic skipped: {chain.size:,} bankroll states exceed the exact limit of "
            f"{exact_limit:,} (raise it with --exact-limit); decimals are from the float engine"
        )
    elif max_rounds is None and exact_work(chain) > EXACT_WORK_LIMIT * max(exact_limit / DEFAULT_EXACT_LIMIT, 1):
        use_exact = False
        notes.append(
            f"exact arithmetic skipped: the {chain.size:,}-state system fills in too much for rational "
            "elimination (a plan with large or varied bets); decimals are from the float engine"
        )
    if max_rounds is not None:
        budget_ok = max_rounds * chain.target.size <= EXACT_STEP_BUDGET
        if use_exact and not budget_ok:
            notes.append(
                f"time cap of {max_rounds:,} rounds: exact stepping skipped (over {EXACT_STEP_BUDGET:,} "
                "updates); decimals are from the float engine"
            )
        use_exact = use_exact and budget_ok
        raw_decimal = forward_decimal(chain, max_rounds)
        series = capped_series_decimal(chain, max_rounds)
        raw_exact = series_exact = None
        if use_exact:
            capped = _exact_or_note(lambda: _capped_exact(chain, max_rounds, should_stop), notes, "time cap")
            raw_exact, series_exact = capped or (None, None)
            use_exact = capped is not None
    else:
        view = skip_free_view(chain)
        if view.walk is not None:
            raw_decimal = walk_decimal(chain, view)
        else:
            raw_decimal = absorbing_decimal(chain, should_stop)
        raw_exact = None
        if use_exact:
            raw_exact = _exact_or_note(lambda: absorbing_exact(chain, should_stop), notes, "session")
            use_exact = raw_exact is not None
        series = raw_decimal["series"]
        series_exact = raw_exact["series"] if raw_exact else None
    figures, final = session_figures(chain, raw_exact, raw_decimal, notes, max_rounds)
    if raw_exact is None:
        notes.extend(raw_decimal.get("notes", ()))
    after: tuple[FinalValue, ...] = ()
    if rounds is not None:
        horizon = rounds if max_rounds is None else min(rounds, max_rounds)
        exact_within = use_exact and horizon * chain.target.size <= EXACT_STEP_BUDGET
        if use_exact and not exact_within:
            notes.append(f"figures within {horizon:,} rounds: exact stepping skipped; decimals only")
        within_decimal = forward_decimal(chain, horizon)
        within_exact = None
        if exact_within:
            within_exact = _exact_or_note(
                lambda: _stepped_exact(chain, horizon, should_stop), notes, f"figures within {horizon:,} rounds"
            )
        within_figures, after = session_figures(chain, within_exact, within_decimal, notes, horizon, prefix="within")
        figures.update(within_figures)
    series_log10 = raw_decimal.get("series_log10") if max_rounds is None else None
    goal_series, goal_exact, goal_log10 = goal_series_of(chain, series, series_exact, series_log10)
    underflow_notes(figures, notes)
    goal = figures["goal_probability"]
    if goal.exact is None and goal.log10 is None and goal.decimal == 0.0 and (goal_series.array()[:-1] > 0).any():
        notes.append(
            "goal_probability: shown as 0 because it is below the float range (about 1e-308); the goal can "
            "be reached from higher bankrolls (see the series); solve a smaller grid exactly for its size"
        )
    return SessionSolution(
        figures=figures,
        final=final,
        goal_series=goal_series,
        goal_series_exact=goal_exact,
        after_rounds=after,
        rounds=rounds,
        exact=raw_exact is not None,
        notes=tuple(notes),
        goal_series_log10=goal_log10,
    )


def _exact_or_note(compute: Callable, notes: list[str], what: str):
    """The exact result, or None with a note when exact arithmetic would not fit the work budget."""
    try:
        return compute()
    except ExactTooLarge as error:
        notes.append(f"{what}: exact arithmetic stopped: {error}; decimals are from the float engine")
        return None


def _stepped_exact(chain: BankrollChain, steps: int, should_stop) -> dict | None:
    """``forward_exact`` once its cost is known to fit (``by_step.require_exact_steps``)."""
    probabilities = [outcome.prob for outcome in chain.distribution.outcomes]
    require_exact_steps(probabilities, chain.target.size, steps, f"{steps:,} exact rounds")
    return forward_exact(chain, steps, should_stop)


def _capped_exact(chain: BankrollChain, steps: int, should_stop) -> tuple[dict | None, list | None]:
    """The exact session and goal series with a time cap: forward and backward stepping."""
    probabilities = [outcome.prob for outcome in chain.distribution.outcomes]
    require_exact_steps(probabilities, 2 * chain.target.size, steps, f"{steps:,} exact rounds")
    return forward_exact(chain, steps, should_stop), capped_series_exact(chain, steps, should_stop)


def exact_work(chain: BankrollChain) -> int:
    """Estimated cost of the exact solve: entries of L and U (no reordering) times the state count.

    Exact values carry about as many digits as there are states, so the rational work grows like
    fill x size. The fill is read from a float factorisation in the same (natural) order.
    """
    n = chain.size
    if n == 0:
        return 0
    return factor_float(identity_minus_float(chain.q_matrix()), order="natural").stored * n
