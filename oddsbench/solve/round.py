"""Every figure of one round, exactly and in floating point, by first-step analysis.

With N = (I - Q)^-1 over the transient states, end probabilities are N R, expected totals
are N r for the one-step expectation r, and second moments come from one more solve with the
first moments on the right. Both engines solve the same systems; the exact results are the
truth, their decimals are what is shown, and the float engine is checked against them.
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass, field

import numpy as np

from oddsbench.chain.deal import HandCounts
from oddsbench.chain.round_chain import RoundChain
from oddsbench.model.defaults import DEFAULT_EXACT_BITS, ROUND_EXACT_LIMIT
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, log10_abs, to_float
from oddsbench.solve.linear import (
    ExactTooLarge,
    FloatSingular,
    factor_exact,
    factor_float,
    identity_minus,
    identity_minus_float,
    sparse_from_rows,
)

DEFAULT_EXACT_LIMIT = ROUND_EXACT_LIMIT
RELATIVE_TOLERANCE = 1e-9
ZERO_TOLERANCE = 1e-12
NEAR_SINGULAR = 1e7  # condition number past which the float engine may lose 7 of its 16 digits
FLOAT_TINY = 2.2250738585072014e-308  # smallest normal float; below it values are underflow
UNRELIABLE_TINY = 1e-300
EXACT_SOLVES = 6  # end chances (one transposed solve), net, extra stake, net second moment, steps, steps second

FIGURE_ORDER = (
    "expected_net",
    "expected_staked",
    "house_edge",
    "return_to_player",
    "net_variance",
    "expected_steps",
    "steps_variance",
)


STAKE_RATIOS = frozenset({"house_edge", "return_to_player"})


@dataclass(frozen=True)
class RoundFigures:
    """All figures of one round from its start state."""

    title: str
    start: str
    states: int
    figures: dict[str, Figure]
    end_probability: dict[str, Figure]
    result_probability: dict[str, Figure]
    end_results: dict[str, str | None]
    rounds: int | None = None
    end_probability_by_step: dict[str, Figure] = field(default_factory=dict)
    notes: tuple[str, ...] = ()
    actions: tuple[tuple[str, str], ...] = ()
    hands: HandCounts | None = None  # a deck game dealt in one draw: each end's count of hands

    @property
    def exact(self) -> bool:
        return all(figure.exact is not None for figure in self.figures.values())


@dataclass
class _Moments:
    """Raw solutions from one engine, values at the start state."""

    end: list
    net: object
    staked_extra: object
    net_second: object
    steps: object
    steps_second: object
    condition: float = 1.0


def solve_round(
    chain: RoundChain,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
    exact_bits: int | None = DEFAULT_EXACT_BITS,
) -> RoundFigures:
    """Solve a round chain both ways and collect figures, notes and checks."""
    notes: list[str] = []
    exact = None
    if chain.transient_count <= exact_limit:
        try:
            exact = _exact_moments(chain, should_stop, exact_bits)
        except ExactTooLarge as error:
            notes.append(f"exact arithmetic stopped: {error}; decimals are from the float engine")
    else:
        notes.append(
            f"exact arithmetic skipped: {chain.transient_count:,} transient states exceed the exact "
            f"limit of {exact_limit:,} (raise it with --exact-limit); decimals are from the float engine"
        )
    try:
        with np.errstate(all="ignore"):  # inf and nan are caught and named by _checked
            decimal = _decimal_moments(chain)
    except FloatSingular:
        if exact is None:
            raise OddsbenchError(
                f"{chain.title}: the float engine cannot solve this chain (a probability of staying is so close "
                "to 1 that it rounds to 1) and exact arithmetic was not done (raise --exact-limit)"
            ) from None
        notes.append(
            "the float engine cannot solve this chain (a probability of staying rounds to 1 in floating "
            "point); every decimal shown is derived from the exact value"
        )
        decimal = _floats_of(exact)
    if decimal.condition > NEAR_SINGULAR:
        lost = f"about {math.log10(decimal.condition):.0f}" if math.isfinite(decimal.condition) else "all"
        notes.append(
            f"near-singular system: condition number about {decimal.condition:.1e}, so the float engine may "
            f"lose {lost} of its 16 digits; "
            + ("the exact values stand" if exact is not None else "no exact values to check (raise --exact-limit)")
        )
    with np.errstate(all="ignore"):
        figures, ends = _figures(chain, exact, decimal, notes)
    results = _by_result(chain, ends)
    by_step: dict[str, Figure] = {}
    if rounds is not None:
        by_step = _by_step(chain, rounds, exact is not None, notes, should_stop)
        figures["ended_by"] = _sum_figures(list(by_step.values()))
    return RoundFigures(
        title=chain.title,
        start=chain.names[0],
        states=len(chain.names),
        figures=figures,
        end_probability=ends,
        result_probability=results,
        end_results=dict(zip(chain.ends, chain.end_results)),
        rounds=rounds,
        end_probability_by_step=by_step,
        notes=tuple(notes),
        actions=chain.actions,
    )


def _one_step(chain: RoundChain, weight: Callable) -> list:
    totals = [QQ(0)] * chain.transient_count
    for edge in chain.edges:
        totals[edge.source] += edge.prob * weight(edge)
    return totals


def _floats_of(exact: _Moments) -> _Moments:
    """Decimals derived from exact moments, as numpy floats (which overflow to inf, not raise)."""

    def floated(value: Rational) -> np.float64:
        return np.float64(to_float(value))

    return _Moments(
        [floated(value) for value in exact.end],
        *(floated(value) for value in (exact.net, exact.staked_extra, exact.net_second, exact.steps)),
        floated(exact.steps_second),
    )


def _exact_moments(
    chain: RoundChain, should_stop: Callable[[], bool] | None, max_bits: int | None = DEFAULT_EXACT_BITS
) -> _Moments | None:
    n = chain.transient_count
    if n == 0:
        return _Moments([QQ(1)], QQ(0), QQ(0), QQ(0), QQ(0), QQ(0))
    lu = factor_exact(identity_minus(chain.q_rows()), should_stop=should_stop, max_bits=max_bits)
    lu.expect_solves(EXACT_SOLVES)
    end = _end_chances_exact(chain, lu)
    net = lu.solve(_one_step(chain, lambda e: e.pay))
    extra = lu.solve(_one_step(chain, lambda e: e.stake))

    def net_after(edge) -> Rational:
        return net[edge.target] if edge.target < n else QQ(0)

    net_second = lu.solve(_one_step(chain, lambda e: e.pay * e.pay + 2 * e.pay * net_after(e)))
    steps = lu.solve([QQ(1)] * n)
    steps_second = lu.solve([2 * t - 1 for t in steps])
    return _Moments(end, net[0], extra[0], net_second[0], steps[0], steps_second[0])


def _end_chances_exact(chain: RoundChain, lu) -> list[Rational]:
    """The chance of ending in each end state from the start: one transposed solve gives the expected
    visits v to every transient state, and P(end j) = sum over edges i -> j of v_i p (no transient x
    end matrix: a star of 10,000 branches needs one solve, not 10,000)."""
    start = [QQ(0)] * chain.transient_count
    start[0] = QQ(1)
    visits = lu.solve_transposed(start)
    n = chain.transient_count
    end = [QQ(0)] * len(chain.ends)
    for edge in chain.edges:
        if edge.target >= n and visits[edge.source] != 0:
            end[edge.target - n] += visits[edge.source] * edge.prob
    return end


def _decimal_moments(chain: RoundChain) -> _Moments:
    n = chain.transient_count
    if n == 0:
        return _Moments([1.0], 0.0, 0.0, 0.0, 0.0, 0.0)
    rows = [{j: to_float(v) for j, v in row.items()} for row in chain.q_rows()]
    lu = factor_float(identity_minus_float(sparse_from_rows(rows, n)))
    source = np.fromiter((e.source for e in chain.edges), dtype=np.int64)
    target = np.fromiter((e.target for e in chain.edges), dtype=np.int64)
    prob = np.fromiter((to_float(e.prob) for e in chain.edges), dtype=float)
    pay = np.fromiter((to_float(e.pay) for e in chain.edges), dtype=float)
    stake = np.fromiter((to_float(e.stake) for e in chain.edges), dtype=float)

    def one_step(values: np.ndarray) -> np.ndarray:
        return np.bincount(source, weights=prob * values, minlength=n)

    start = np.zeros(n)
    start[0] = 1.0
    visits = lu.solve_transposed(start)  # expected visits from the start (see _end_chances_exact)
    into_end = target >= n
    end = np.bincount(
        target[into_end] - n, weights=visits[source[into_end]] * prob[into_end], minlength=len(chain.ends)
    )
    solved = lu.solve(np.column_stack([one_step(pay), one_step(stake), np.ones(n)]))
    net, extra, steps = solved[:, 0], solved[:, 1], solved[:, 2]
    net_after = np.where(target < n, net[np.minimum(target, n - 1)], 0.0)
    second = lu.solve(np.column_stack([one_step(pay * pay + 2 * pay * net_after), 2 * steps - 1]))
    return _Moments(list(end), net[0], extra[0], second[0, 0], steps[0], second[0, 1], _condition(rows, steps))


def _condition(rows: list[dict[int, float]], steps: np.ndarray) -> float:
    """The infinity-norm condition number of I - Q, at no extra cost: (I - Q)^-1 is non-negative,
    so its norm is its largest row sum, which is the largest expected number of steps."""
    norm = max(abs(1 - row.get(i, 0.0)) + sum(abs(v) for j, v in row.items() if j != i) for i, row in enumerate(rows))
    largest = float(np.max(np.abs(steps))) if len(steps) else 1.0
    return norm * largest if np.isfinite(largest) else float("inf")


def _figures(chain: RoundChain, exact: _Moments | None, decimal: _Moments, notes: list[str]):
    stake_exact = chain.stake
    stake = to_float(stake_exact)
    values_decimal = {
        "expected_net": decimal.net,
        "expected_staked": stake + decimal.staked_extra,
        "net_variance": decimal.net_second - decimal.net**2,
        "expected_steps": decimal.steps,
        "steps_variance": decimal.steps_second - decimal.steps**2,
    }
    if exact is not None:
        nothing_staked = stake_exact + exact.staked_extra == 0
    else:
        nothing_staked = stake + float(decimal.staked_extra) == 0.0
    order = FIGURE_ORDER
    if nothing_staked:
        # A game of points with no wager (a turn at Pig): a house edge would divide by zero.
        order = tuple(name for name in FIGURE_ORDER if name not in STAKE_RATIOS)
        notes.append("nothing is staked in this round: house edge and return to player do not apply")
    else:
        values_decimal["house_edge"] = -values_decimal["expected_net"] / values_decimal["expected_staked"]
        values_decimal["return_to_player"] = 1 - values_decimal["house_edge"]
    values_exact: dict[str, Rational | None] = dict.fromkeys(FIGURE_ORDER)
    if exact is not None:
        staked = stake_exact + exact.staked_extra
        values_exact = {
            "expected_net": exact.net,
            "expected_staked": staked,
            "net_variance": exact.net_second - exact.net**2,
            "expected_steps": exact.steps,
            "steps_variance": exact.steps_second - exact.steps**2,
        }
        if not nothing_staked:
            values_exact["house_edge"] = -exact.net / staked
            values_exact["return_to_player"] = 1 + exact.net / staked
    figures = {name: _checked(name, values_exact[name], values_decimal[name], notes) for name in order}
    ends = {
        name: _checked(f"end_probability[{name}]", exact.end[j] if exact else None, decimal.end[j], notes)
        for j, name in enumerate(chain.ends)
    }
    return figures, ends


def _checked(name: str, exact: Rational | None, decimal: float, notes: list[str]) -> Figure:
    """The figure to show, with a note where the float engine disagrees with the exact one."""
    decimal = float(decimal)
    if exact is None:
        if not np.isfinite(decimal):
            notes.append(f"{name}: the float engine gave {decimal}; no exact value to fall back on")
        elif decimal != 0 and abs(decimal) < UNRELIABLE_TINY:
            notes.append(
                f"{name}: the float engine gives {decimal:.3g}, so small that floating point is unreliable "
                "(underflow); raise --exact-limit for the exact value"
            )
        elif name.startswith("end_probability") and decimal < 0:
            notes.append(f"{name}: the float engine gives a negative chance ({decimal:.3g}): rounding error")
        return Figure(None, decimal)
    truth = to_float(exact)
    if exact != 0 and abs(truth) < FLOAT_TINY:
        notes.append(
            f"{name}: the exact value is about 1e{log10_abs(exact):.0f}, below the floating-point range; the float "
            f"engine gives {decimal!r} (underflow); the exact value stands"
        )
        return Figure(exact, truth)
    gap = abs(decimal - truth)
    limit = RELATIVE_TOLERANCE * abs(truth) if truth != 0 else ZERO_TOLERANCE
    if not np.isfinite(decimal) or gap > limit:
        shown = repr(truth) if np.isfinite(truth) else f"about 1e{log10_abs(exact):.0f}, beyond the float range"
        notes.append(
            f"numerical warning: {name}: float engine gives {decimal!r}, exact value is {shown}; "
            "the exact value is shown"
        )
    return Figure(exact, truth)


def _sum_figures(figures: list[Figure]) -> Figure:
    if figures and all(f.exact is not None for f in figures):
        total = sum((f.exact for f in figures), QQ(0))
        return Figure(total, to_float(total))
    return Figure(None, float(sum(f.decimal for f in figures)))


def _by_result(chain: RoundChain, ends: dict[str, Figure]) -> dict[str, Figure]:
    """Chance of each result label (win, loss, push, ...) over the end states carrying it."""
    grouped: dict[str, list[Figure]] = {}
    for name, result in zip(chain.ends, chain.end_results):
        if result:
            grouped.setdefault(result, []).append(ends[name])
    return {label: _sum_figures(figures) for label, figures in grouped.items()}


def _by_step(
    chain: RoundChain, rounds: int, exact: bool, notes: list[str], should_stop: Callable[[], bool] | None
) -> dict[str, Figure]:
    """Chance of being in each end state after ``rounds`` steps (``solve/by_step.py``)."""
    from oddsbench.solve.by_step import end_chances_by_step

    exact_values, decimals = end_chances_by_step(chain, rounds, exact, notes, should_stop)
    return {
        name: _checked(f"end_probability_by_step[{name}]", exact_values[j], decimals[j], notes)
        for j, name in enumerate(chain.ends)
    }
