"""The Kelly criterion: the stake fraction of the bankroll that maximises expected log growth.

Kelly (1956), "A New Interpretation of Information Rate", Bell System Technical Journal 35:
for an even-money-style bet paying b to 1 with win chance p, the growth-optimal fraction is
f* = p - q/b, and the growth rate is G(f) = p log(1 + b f) + q log(1 - f). We give G in bits
(log base 2), as Kelly did. With one winning and one losing net result (pushes allowed) the
fraction is exact: f* = p/a - q/b for a loss of a per unit; otherwise it is found by bisection
on the derivative of G, which is decreasing in f (G is concave).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, to_float


@dataclass(frozen=True)
class KellyBet:
    """Growth-optimal fraction of the bankroll and the growth rate (bits per round) it gives."""

    fraction: Figure
    growth_bits: float


def kelly_fraction(distribution: RoundDistribution) -> Figure:
    """f* for the distribution: 0 when the game has no positive expectation."""
    if distribution.expected_net <= 0:
        return Figure(QQ(0), 0.0)
    wins = [o for o in distribution.outcomes if o.net > 0]
    losses = [o for o in distribution.outcomes if o.net < 0]
    if not losses:
        limit = 1.0
        return Figure(QQ(1), limit)
    if len(wins) == 1 and len(losses) == 1:
        (win,), (loss,) = wins, losses
        exact = win.prob / -loss.net - loss.prob / win.net
        exact = min(exact, 1 / -loss.net)
        return Figure(exact, to_float(exact))
    nets, probs = distribution.floats()
    top = 1.0 / -min(nets)

    def slope(f: float) -> float:
        return sum(p * n / (1.0 + f * n) for n, p in zip(nets, probs))

    low, high = 0.0, top * (1 - 1e-15)
    for _ in range(200):
        mid = (low + high) / 2
        if slope(mid) > 0:
            low = mid
        else:
            high = mid
    return Figure(None, low)


def growth_bits(distribution: RoundDistribution, fraction: float) -> float:
    """G(f) = sum p log2(1 + f * net): expected log2 growth of the bankroll per round."""
    nets, probs = distribution.floats()
    total = 0.0
    for n, p in zip(nets, probs):
        factor = 1.0 + fraction * n
        if factor <= 0:
            return -math.inf
        total += p * math.log2(factor)
    return total


def kelly_bet(distribution: RoundDistribution, multiple: Rational | None = None) -> KellyBet:
    multiple = QQ(1) if multiple is None else multiple
    full = kelly_fraction(distribution)
    exact = full.exact * multiple if full.exact is not None else None
    decimal = to_float(exact) if exact is not None else full.decimal * to_float(multiple)
    return KellyBet(Figure(exact, decimal), growth_bits(distribution, decimal))
