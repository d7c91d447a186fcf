"""Simulation estimates beside exact figures: each with its interval and an inside/outside flag."""

from __future__ import annotations

import math
from dataclasses import dataclass

from oddsbench.model.figure import Figure
from oddsbench.simulate.intervals import DEFAULT_CONFIDENCE, Interval, normal_interval, wilson_interval
from oddsbench.simulate.round_sim import RoundSample
from oddsbench.solve.round import RoundFigures

WILSON = "Wilson"
NORMAL = "normal"


@dataclass(frozen=True)
class Check:
    """One estimate: ``name`` matches the key of the exact figure it is checked against."""

    name: str
    estimate: float
    interval: Interval
    method: str
    exact: Figure | None = None

    @property
    def outside(self) -> bool:
        """True where the exact value falls outside the interval (chance or a wrong model)."""
        return self.exact is not None and not self.interval.contains(self.exact.decimal)


def round_estimates(
    sample: RoundSample, confidence: float = DEFAULT_CONFIDENCE
) -> list[tuple[str, float, Interval, str]]:
    """(name, estimate, interval, method) for every figure a round simulation can estimate."""
    rows: list[tuple[str, float, Interval, str]] = []
    net, staked, steps = sample.net, sample.staked, sample.steps
    if net.count == 0:
        return rows
    rows.append(("expected_net", net.mean, normal_interval(net.mean, net.mean_error, confidence), NORMAL))
    rows.append(("expected_staked", staked.mean, normal_interval(staked.mean, staked.mean_error, confidence), NORMAL))
    if staked.mean != 0:  # a round that stakes nothing has no house edge (as in solve.round)
        edge, edge_error = _ratio(
            -net.mean, staked.mean, net.variance, staked.variance, -sample.net_staked.covariance, net.count
        )
        edge_interval = normal_interval(edge, edge_error, confidence)
        rows.append(("house_edge", edge, edge_interval, NORMAL))
        rows.append(("return_to_player", 1 - edge, Interval(1 - edge_interval.high, 1 - edge_interval.low), NORMAL))
    rows.append(("net_variance", net.variance, normal_interval(net.variance, net.variance_error, confidence), NORMAL))
    rows.append(("expected_steps", steps.mean, normal_interval(steps.mean, steps.mean_error, confidence), NORMAL))
    rows.append(
        ("steps_variance", steps.variance, normal_interval(steps.variance, steps.variance_error, confidence), NORMAL)
    )
    for name, count in zip(sample.end_names, sample.end_counts):
        rows.append(_chance(f"end_probability[{name}]", int(count), sample.trials, confidence))
    results: dict[str, int] = {}
    for result, count in zip(sample.end_results, sample.end_counts):
        if result:
            results[result] = results.get(result, 0) + int(count)
    for label, count in results.items():
        rows.append(_chance(f"result_probability[{label}]", count, sample.trials, confidence))
    return rows


def _chance(name: str, count: int, trials: int, confidence: float) -> tuple[str, float, Interval, str]:
    return (name, count / trials, wilson_interval(count, trials, confidence), WILSON)


def _ratio(x: float, y: float, var_x: float, var_y: float, cov: float, n: int) -> tuple[float, float]:
    """x / y and its delta-method standard error for means of n pairs."""
    ratio = x / y
    spread = var_x - 2 * ratio * cov + ratio * ratio * var_y
    return ratio, math.sqrt(max(spread, 0.0) / n) / abs(y)


def exact_lookup(figures: RoundFigures) -> dict[str, Figure]:
    """Exact figures of a round keyed as ``round_estimates`` names them."""
    found = dict(figures.figures)
    found.update({f"end_probability[{k}]": v for k, v in figures.end_probability.items()})
    found.update({f"result_probability[{k}]": v for k, v in figures.result_probability.items()})
    return found


def round_checks(
    sample: RoundSample, figures: RoundFigures | None, confidence: float = DEFAULT_CONFIDENCE
) -> list[Check]:
    """Every estimate of the sample, with the exact figure beside it where one exists."""
    exact = exact_lookup(figures) if figures is not None else {}
    return [
        Check(name, estimate, interval, method, exact.get(name))
        for name, estimate, interval, method in round_estimates(sample, confidence)
    ]


SESSION_CHANCES = (
    ("goal_probability", "goal"),
    ("ruin_probability", "ruin"),
    ("floor_probability", "floor"),
    ("time_cap_probability", "time_cap"),
)


def session_estimates(sample, confidence: float = DEFAULT_CONFIDENCE, floor: bool = False):
    """(name, estimate, interval, method) for the session figures a simulation can estimate."""
    rows = []
    for name, kind in SESSION_CHANCES:
        if kind == "floor" and not floor:
            continue
        if kind == "time_cap" and sample.max_rounds is None:
            continue
        rows.append(_chance(name, sample.ends[kind], sample.trials, confidence))
    rounds, staked, final = sample.rounds, sample.staked, sample.final
    if rounds.count == 0:
        return rows
    rows.append(("expected_rounds", rounds.mean, normal_interval(rounds.mean, rounds.mean_error, confidence), NORMAL))
    rows.append(
        (
            "rounds_variance",
            rounds.variance,
            normal_interval(rounds.variance, rounds.variance_error, confidence),
            NORMAL,
        )
    )
    rows.append(("expected_staked", staked.mean, normal_interval(staked.mean, staked.mean_error, confidence), NORMAL))
    final_interval = normal_interval(final.mean, final.mean_error, confidence)
    rows.append(("expected_final_bankroll", final.mean, final_interval, NORMAL))
    start = sample.start_bankroll
    rows.append(
        (
            "expected_net",
            final.mean - start,
            Interval(final_interval.low - start, final_interval.high - start),
            NORMAL,
        )
    )
    return rows


def session_checks(sample, figures, confidence: float = DEFAULT_CONFIDENCE) -> list[Check]:
    """Every estimate of a session sample beside the solver's figure of the same name."""
    exact = dict(figures.figures) if figures is not None else {}
    floor = "floor_probability" in exact
    return [
        Check(name, estimate, interval, method, exact.get(name))
        for name, estimate, interval, method in session_estimates(sample, confidence, floor)
    ]
