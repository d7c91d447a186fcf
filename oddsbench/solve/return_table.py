"""The return table of one round: the exact law of its net result and where the return comes from.

A round can pay at several steps (a raise, then a win), so the net result is the SUM of the pays
along the path taken. Its law comes from the product chain over (state, pay so far) that sessions
already use (``solve/round_distribution.round_law``: one exact transposed solve). From it:

- the net law: each distinct net value, its chance, and its contribution (chance x value); the
  contributions add up exactly to the expected net;
- hit frequency (net > 0), push (net = 0) and loss (net < 0) chances;
- each step's share of the expected net (expected times taken x pay), grouped by
  (state, action, target, pay), so a designer sees which payout carries the edge;

and, from the round's exact variance, the standard deviation per unit staked (a square root:
exact only where it is rational, its decimal correctly rounded from the exact values otherwise).
"""

from __future__ import annotations

import math
from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.chain.round_chain import RoundChain
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, to_float
from oddsbench.solve.linear import ExactTooLarge, ScaledVector
from oddsbench.solve.round_distribution import PRODUCT_LIMIT, ProductTooLarge, round_law

NET_LAW_LIMIT = 10_000  # distinct net values listed; past it the law is summed up, not listed
SHARE_LIMIT = 10_000  # paying steps listed with their share of the expected net
CHANCE_FIGURES = ("hit_frequency", "push_probability", "loss_probability")


@dataclass(frozen=True)
class NetValue:
    """One value the round's net result can take, its chance and its contribution (chance x value)."""

    net: Rational
    probability: Rational
    contribution: Rational


@dataclass(frozen=True)
class PayShare:
    """A paying step of the round (from ``source`` under ``action`` to ``target``, paying ``pay``),
    the expected number of times a round takes it, and its share of the expected net (taken x pay)."""

    source: str
    action: str | None
    target: str
    pay: Rational
    taken: Rational
    contribution: Rational


@dataclass(frozen=True)
class ReturnTable:
    """The net law (None when it has more than ``NET_LAW_LIMIT`` values: ``values`` counts them),
    the paying steps' shares, the chances of a hit, a push and a loss, and notes."""

    law: tuple[NetValue, ...] | None
    values: int
    shares: tuple[PayShare, ...]
    chances: dict[str, Figure]
    notes: tuple[str, ...] = ()
    nodes: int = 0  # transient states of the chain over (state, pay so far)


def net_sd(variance: Figure, staked: Figure) -> Figure:
    """Standard deviation of the net per unit staked: sqrt(net variance) / expected staked.

    A square root is rarely rational: ``exact`` is set only when it is; the decimal comes from the
    exact variance (correctly rounded square root of a correctly rounded float) where there is one.
    """
    if variance.exact is not None and staked.exact is not None:
        root = rational_sqrt(variance.exact)
        decimal = math.sqrt(max(to_float(variance.exact), 0.0)) / to_float(staked.exact)
        return Figure(None if root is None else root / staked.exact, decimal)
    return Figure(None, math.sqrt(max(variance.decimal, 0.0)) / staked.decimal)


def rational_sqrt(value: Rational) -> Rational | None:
    """The square root of a non-negative rational when it is rational, else None."""
    if value < 0:
        return None
    top, bottom = numerator(value), denominator(value)
    root_top, root_bottom = math.isqrt(top), math.isqrt(bottom)
    if root_top * root_top == top and root_bottom * root_bottom == bottom:
        return QQ(root_top, root_bottom)
    return None


def return_table(
    chain: RoundChain,
    exact_limit: int,
    should_stop: Callable[[], bool] | None = None,
    max_bits: int | None = None,
    chain_visits: ScaledVector | None = None,
) -> ReturnTable | str:
    """The return table of a round chain, or one line saying why it is not listed.

    The product chain is solved exactly while it has at most ``exact_limit`` transient nodes; where
    it is the round chain itself, the round's expected visits (``chain_visits``) serve instead.
    """
    try:
        limit = max(PRODUCT_LIMIT, 2 * exact_limit)
        law = round_law(chain, limit, should_stop, max_bits, exact_limit, chain_visits)
    except (ProductTooLarge, ExactTooLarge) as error:
        return f"return table not listed: {error}"
    by_net: dict[Rational, Rational] = {}
    for (pay, _extra), prob in law.totals.items():
        by_net[pay] = by_net.get(pay, QQ(0)) + prob
    ordered = sorted(by_net.items())
    chances = {
        "hit_frequency": _chance(sum((p for net, p in ordered if net > 0), QQ(0))),
        "push_probability": _chance(by_net.get(QQ(0), QQ(0))),
        "loss_probability": _chance(sum((p for net, p in ordered if net < 0), QQ(0))),
    }
    notes = []
    listed: tuple[NetValue, ...] | None = tuple(NetValue(net, p, net * p) for net, p in ordered)
    if len(ordered) > NET_LAW_LIMIT:
        listed = None
        notes.append(
            f"net law not listed: the round's net takes {len(ordered):,} values, over the limit of {NET_LAW_LIMIT:,}; "
            "the hit, push and loss chances are exact"
        )
    shares = _shares(chain, law.edge_taken)
    if len(shares) > SHARE_LIMIT:
        notes.append(f"shares of the return: the {SHARE_LIMIT:,} largest of {len(shares):,} paying steps are listed")
        shares = sorted(shares, key=lambda s: -abs(s.contribution))[:SHARE_LIMIT]
    return ReturnTable(listed, len(ordered), tuple(shares), chances, tuple(notes), law.nodes)


def _chance(value: Rational) -> Figure:
    return Figure(value, to_float(value))


def _shares(chain: RoundChain, taken: tuple[Rational, ...]) -> list[PayShare]:
    """Expected pay from each paying step, grouped by (state, action, target, pay), in chain order."""
    actions = dict(chain.actions)
    grouped: dict[tuple[int, int, Rational], Rational] = {}
    for edge, times in zip(chain.edges, taken):
        if edge.pay != 0 and times != 0:
            key = (edge.source, edge.target, edge.pay)
            grouped[key] = grouped.get(key, QQ(0)) + times
    names = chain.names
    return [
        PayShare(names[source], actions.get(names[source]), names[target], pay, times, times * pay)
        for (source, target, pay), times in grouped.items()
    ]
