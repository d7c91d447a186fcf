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
from flint import fmpq, fmpz

from oddsbench.chain.deal import HandCounts
from oddsbench.chain.round_chain import RoundChain
from oddsbench.model.defaults import DEFAULT_EXACT_BITS, ROUND_EXACT_LIMIT
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.figure import Figure, all_exact
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.checked import Tolerance, checked_figure
from oddsbench.solve.linear import (
    ExactTooLarge,
    FloatSingular,
    factor_exact,
    factor_float,
    identity_minus,
    sparse_from_rows,
)
from oddsbench.solve.linear.integer_lu import ScaledVector, common_denominator, grouped_products
from oddsbench.solve.return_table import CHANCE_FIGURES, ReturnTable, net_sd, return_table

DEFAULT_EXACT_LIMIT = ROUND_EXACT_LIMIT
TOLERANCE = Tolerance(relative=1e-9, absolute=1e-12)
NEAR_SINGULAR = 1e7  # condition number past which the float engine may lose 7 of its 16 digits
EXACT_SOLVES = 3  # expected visits from the start (one transposed solve), net, steps

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
    return_table: ReturnTable | None = None  # the net law and each paying step's share (exact only)

    @property
    def exact(self) -> bool:
        return all_exact((name, figure.exact) for name, figure in self.figures.items())


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
    net_variance: object = None  # centred, where the engine solved for it (floats)
    steps_variance: object = None
    resolution: float = 0.0  # the smallest net variance the float engine resolves
    visits: ScaledVector | None = None  # exact expected visits from the start (for the return table)


def solve_round(
    chain: RoundChain,
    rounds: int | None = None,
    exact_limit: int = DEFAULT_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
    exact_bits: int | None = DEFAULT_EXACT_BITS,
    with_return_table: bool = True,
) -> RoundFigures:
    """Solve a round chain both ways and collect figures, notes and checks (``with_return_table``
    False skips the net law and the hit, push and loss chances: a caller that needs only moments)."""
    notes: list[str] = []
    exact = None
    system = identity_minus(chain.q_rows())  # I - Q, exact: both engines start from it
    if chain.transient_count <= exact_limit:
        try:
            exact = _exact_moments(chain, system, should_stop, exact_bits)
        except ExactTooLarge as error:
            notes.append(f"exact arithmetic stopped: {error}; decimals are from the float engine")
    else:
        notes.append(
            f"exact arithmetic skipped: {chain.transient_count:,} transient states exceed the exact "
            f"limit of {exact_limit:,} (raise it with --exact-limit); decimals are from the float engine"
        )
    try:
        with np.errstate(all="ignore"):  # inf and nan are caught and named by checked_figure
            decimal = _decimal_moments(chain, system)
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
    _add_net_sd(figures)
    table = None
    if with_return_table:
        table = _return_table(chain, figures, exact, exact_limit, should_stop, exact_bits, notes)
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
        return_table=table,
    )


def _add_net_sd(figures: dict[str, Figure]) -> None:
    """``net_sd`` right after ``net_variance``, where something is staked."""
    if "house_edge" not in figures:
        return
    ordered = {}
    for name, figure in figures.items():
        ordered[name] = figure
        if name == "net_variance":
            ordered["net_sd"] = net_sd(figure, figures["expected_staked"])
    figures.clear()
    figures.update(ordered)


def _return_table(
    chain: RoundChain,
    figures: dict[str, Figure],
    exact: _Moments | None,
    exact_limit: int,
    should_stop: Callable[[], bool] | None,
    exact_bits: int | None,
    notes: list[str],
) -> ReturnTable | None:
    """Where exact arithmetic ran, add the hit, push and loss chances to ``figures``; return the
    table (None, with a note, when it is not listed)."""
    if exact is None:
        notes.append("return table (net law; hit, push and loss chances) not listed: it needs exact arithmetic")
        return None
    table = return_table(chain, exact_limit, should_stop, exact_bits, exact.visits)
    if isinstance(table, str):
        notes.append(table)
        return None
    figures.update((name, table.chances[name]) for name in CHANCE_FIGURES)
    notes.extend(table.notes)
    return table


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
    chain: RoundChain,
    system: list,
    should_stop: Callable[[], bool] | None,
    max_bits: int | None = DEFAULT_EXACT_BITS,
) -> _Moments | None:
    """One exact factorisation in whole numbers (``linear/integer_lu.py``), three solves: the expected
    visits from the start (a transposed solve) give every end chance and every figure needed only at
    the start; expected net and steps are solved for every state because the second moments need
    them. The three vectors stay whole numerators over one denominator: the figures are sums of
    their products, and only the figures are reduced to lowest terms."""
    n = chain.transient_count
    if n == 0:
        return _Moments([QQ(1)], QQ(0), QQ(0), QQ(0), QQ(0), QQ(0))
    lu = factor_exact(system, "integer", should_stop, max_bits)
    lu.expect_solves(EXACT_SOLVES)
    start = [QQ(0)] * n
    start[0] = QQ(1)
    visits = lu.solve_transposed_scaled(start)
    end = _end_chances_exact(chain, visits)
    net = lu.solve_scaled(_one_step(chain, lambda e: e.pay))
    steps = lu.solve_scaled([QQ(1)] * n)
    # E[net^2] = sum over steps of visits x prob x (pay^2 + 2 pay net(after)); E[T^2] = visits . (2 T - 1)
    net_second = visits.weighted(_one_step(chain, lambda e: e.pay * e.pay)) + 2 * _carried(chain, visits, net)
    products = sum((v * t for v, t in zip(visits.numerators, steps.numerators)), fmpz(0))
    steps_second = 2 * fmpq(products, visits.denominator * steps.denominator) - visits.total()
    extra = visits.weighted(_one_step(chain, lambda e: e.stake))
    return _Moments(end, net.value(0), extra, net_second, steps.value(0), steps_second, visits=visits)


def _carried(chain: RoundChain, visits: ScaledVector, net: ScaledVector) -> Rational:
    """sum over steps i -> j inside the round of visits(i) x prob x pay x net(j): each step's weight
    (prob x pay) made whole by one common denominator, summed per source state (small times large),
    then one product of large whole numbers per state."""
    n = chain.transient_count
    inside = [(e, e.prob * e.pay) for e in chain.edges if e.target < n and e.pay != 0]
    common = common_denominator([weight for _, weight in inside])
    per_source = [fmpz(0)] * n
    for edge, weight in inside:
        per_source[edge.source] += (weight * common).p * net.numerators[edge.target]
    total = sum((v * s for v, s in zip(visits.numerators, per_source) if s != 0), fmpz(0))
    return fmpq(total, common * visits.denominator * net.denominator)


def _end_chances_exact(chain: RoundChain, visits: ScaledVector) -> list[Rational]:
    """The chance of ending in each end state from the start: P(end j) = sum over edges i -> j of v_i p,
    from the expected visits v (no transient x end matrix: a star of 10,000 branches needs one solve,
    not 10,000)."""
    n = chain.transient_count
    into: list[list[tuple[Rational, object]]] = [[] for _ in chain.ends]
    for edge in chain.edges:
        if edge.target >= n:
            into[edge.target - n].append((edge.prob, visits.numerators[edge.source]))
    return [grouped_products(terms) / visits.denominator for terms in into]


def _decimal_moments(chain: RoundChain, system_exact: list | None = None) -> _Moments:
    """Float moments. I - Q is built from the exact I - Q (each diagonal is the exact chance of leaving
    the state, rounded once, as Grassmann, Taksar and Heyman take it from what leaves a state, so a stay
    chance of 1 - 3e-16 does not cancel to nothing), and the variances are solved for directly (centred
    second moments, sums of squares), never as E[X^2] - E[X]^2."""
    n = chain.transient_count
    if n == 0:
        return _Moments([1.0], 0.0, 0.0, 0.0, 0.0, 0.0, net_variance=0.0, steps_variance=0.0)
    if system_exact is None:
        system_exact = identity_minus(chain.q_rows())
    system = [{j: to_float(v) for j, v in row.items()} for row in system_exact]
    lu = factor_float(sparse_from_rows(system, n))
    source = np.fromiter((e.source for e in chain.edges), dtype=np.int64)
    target = np.fromiter((e.target for e in chain.edges), dtype=np.int64)
    prob = np.fromiter((to_float(e.prob) for e in chain.edges), dtype=float)
    pay = np.fromiter((to_float(e.pay) for e in chain.edges), dtype=float)
    stake = np.fromiter((to_float(e.stake) for e in chain.edges), dtype=float)

    def one_step(values: np.ndarray) -> np.ndarray:
        return np.bincount(source, weights=prob * values, minlength=n)

    def after(values: np.ndarray) -> np.ndarray:
        return np.where(target < n, values[np.minimum(target, n - 1)], 0.0)

    start = np.zeros(n)
    start[0] = 1.0
    visits = lu.solve_transposed(start)  # expected visits from the start (see _end_chances_exact)
    into_end = target >= n
    end = np.bincount(
        target[into_end] - n, weights=visits[source[into_end]] * prob[into_end], minlength=len(chain.ends)
    )
    solved = lu.solve(np.column_stack([one_step(pay), one_step(stake), np.ones(n)]))
    net, extra, steps = solved[:, 0], solved[:, 1], solved[:, 2]
    spread = lu.solve(
        np.column_stack(
            [one_step((pay + after(net) - net[source]) ** 2), one_step((1.0 + after(steps) - steps[source]) ** 2)]
        )
    )
    net_variance, steps_variance = spread[0, 0], spread[0, 1]
    return _Moments(
        list(end),
        net[0],
        extra[0],
        net_variance + net[0] ** 2,
        steps[0],
        steps_variance + steps[0] ** 2,
        _condition(system, steps),
        net_variance=net_variance,
        steps_variance=steps_variance,
        resolution=_resolution(net, steps),
    )


def _resolution(net: np.ndarray, steps: np.ndarray) -> float:
    """About the smallest net variance the float engine resolves: each step's share is the square of a
    difference of expected nets known to some units of the last place of the largest of them."""
    largest = float(np.max(np.abs(net))) if len(net) else 0.0
    return float((8 * np.finfo(float).eps * max(largest, 1e-300)) ** 2 * max(float(steps[0]), 1.0))


def _condition(system: list[dict[int, float]], steps: np.ndarray) -> float:
    """The infinity-norm condition number of I - Q, at no extra cost: (I - Q)^-1 is non-negative,
    so its norm is its largest row sum, which is the largest expected number of steps."""
    norm = max(sum(abs(v) for v in row.values()) for row in system)
    largest = float(np.max(np.abs(steps))) if len(steps) else 1.0
    return norm * largest if np.isfinite(largest) else float("inf")


def _variance(centred, second, first):
    """The engine's centred variance where it solved for one, else second moment minus the squared mean."""
    return centred if centred is not None else second - first**2


def _vouched_digits(condition: float) -> int | None:
    """Significant digits a float solve vouches for, from the condition estimate (None: all six shown)."""
    if not math.isfinite(condition):
        return 1
    lost = condition * 4 * np.finfo(float).eps
    digits = math.floor(-math.log10(lost)) if lost > 0 else 16
    return None if digits >= 6 else max(digits, 1)


def _figures(chain: RoundChain, exact: _Moments | None, decimal: _Moments, notes: list[str]):
    stake_exact = chain.stake
    stake = to_float(stake_exact)
    values_decimal = {
        "expected_net": decimal.net,
        "expected_staked": stake + decimal.staked_extra,
        "net_variance": _variance(decimal.net_variance, decimal.net_second, decimal.net),
        "expected_steps": decimal.steps,
        "steps_variance": _variance(decimal.steps_variance, decimal.steps_second, decimal.steps),
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
    digits = _vouched_digits(decimal.condition)
    figures = {
        name: checked_figure(name, values_exact[name], values_decimal[name], notes, TOLERANCE, None, digits)
        for name in order
    }
    ends = {
        name: checked_figure(
            f"end_probability[{name}]", exact.end[j] if exact else None, decimal.end[j], notes, TOLERANCE, None, digits
        )
        for j, name in enumerate(chain.ends)
    }
    variance = figures.get("net_variance")
    if variance is not None and variance.exact is None and abs(variance.decimal) < decimal.resolution:
        notes.append(
            f"net_variance: {variance.decimal:.3g} is below what the float engine resolves here (about "
            f"{decimal.resolution:.1g}: the outcome is all but certain); raise --exact-limit for the exact value"
        )
        figures["net_variance"] = Figure(None, variance.decimal, None, 1)
    return figures, ends


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
        name: checked_figure(f"end_probability_by_step[{name}]", exact_values[j], decimals[j], notes, TOLERANCE)
        for j, name in enumerate(chain.ends)
    }
