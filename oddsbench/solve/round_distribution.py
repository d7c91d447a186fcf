"""A ruleset's round as a distribution of (net result, extra stake) per unit of initial stake.

Pays and extra stakes are attached to edges, so the result of a round is what has been added
up along the path taken. Most games give each end state one total, but a game may reach the
same end state with different totals. We therefore walk the product chain whose states are
(round state, pay so far, extra stake so far), starting from (start, 0, 0): loops that pay
nothing (rolling for a point) keep it the same size as the round chain, and a loop that keeps
adding pay makes it grow without bound, which we refuse past a limit with a clear message.
The chance of ending in each (end state, pay, extra) node comes from one exact transposed
solve (expected visits from the start); grouping by (pay, extra) gives the law of the round's
totals (``round_law``: the return table's net law and each step's share of the expected net, in
``solve/return_table.py``), and dividing by the stake the distribution a session is built on.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from flint import fmpq, fmpz

from oddsbench.chain.round_chain import RoundChain
from oddsbench.chain.round_distribution import RoundDistribution, RoundOutcome, make_distribution
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational
from oddsbench.solve.linear import ScaledVector, factor_exact, identity_minus
from oddsbench.solve.linear.integer_lu import grouped_products

PRODUCT_LIMIT = 20_000


class ProductTooLarge(OddsbenchError):
    """The (state, pay so far, extra stake so far) chain passed its node limit."""


@dataclass(frozen=True)
class RoundLaw:
    """The exact law of one round's totals, in money (not yet per unit of stake).

    ``totals`` maps (pay, extra stake) added up along the path to its chance; ``edge_taken[k]`` is
    the expected number of times the round takes ``chain.edges[k]`` (expected visits to its source
    times its chance), so ``edge_taken[k] * pay`` is that step's share of the expected net.
    """

    totals: dict[tuple[Rational, Rational], Rational]
    edge_taken: tuple[Rational, ...]
    nodes: int


def round_law(
    chain: RoundChain,
    limit: int = PRODUCT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
    max_bits: int | None = None,
    transient_limit: int | None = None,
    chain_visits: ScaledVector | None = None,
) -> RoundLaw:
    """The exact law of the round's (pay, extra stake) totals: one transposed solve on the product chain.

    Raises ``ProductTooLarge`` past ``limit`` product nodes or ``transient_limit`` transient ones
    (``ExactTooLarge``, ``SolveCancelled``
    from the exact elimination under ``max_bits`` and ``should_stop``). ``chain_visits``, the round
    chain's expected visits from the start, spares the solve when the product chain is the round chain.
    """
    n = chain.transient_count
    if n == 0:
        return RoundLaw({(QQ(0), QQ(0)): QQ(1)}, (), 1)
    if drifting_loop(chain):
        raise ProductTooLarge(
            f"{chain.title}: a loop of the round keeps adding pay or stake, so the round's result has no bound"
        )
    out: list[list[int]] = [[] for _ in range(n)]
    for k, edge in enumerate(chain.edges):
        out[edge.source].append(k)
    start = (0, QQ(0), QQ(0))
    index = {start: 0}
    nodes = [start]
    transitions: list[list[tuple[int, int]]] = []  # (product node, round-chain edge)
    cursor = 0
    while cursor < len(nodes):
        state, pay, extra = nodes[cursor]
        row: list[tuple[int, int]] = []
        if state < n:
            for k in out[state]:
                edge = chain.edges[k]
                key = (edge.target, pay + edge.pay, extra + edge.stake)
                if key not in index:
                    if len(nodes) >= limit:
                        raise ProductTooLarge(
                            f"{chain.title}: more than {limit:,} (state, pay so far) pairs: the chain is large, "
                            "or some loop keeps adding pay or stake, so the round's result has no bound"
                        )
                    index[key] = len(nodes)
                    nodes.append(key)
                row.append((index[key], k))
        transitions.append(row)
        cursor += 1
    transient = [i for i, (state, _, _) in enumerate(nodes) if state < n]
    if transient_limit is not None and len(transient) > transient_limit:
        raise ProductTooLarge(
            f"the round's chain over (state, pay so far) has {len(transient):,} transient states, over the exact "
            f"limit of {transient_limit:,} (raise it with --exact-limit)"
        )
    position = {node: k for k, node in enumerate(transient)}
    states = [nodes[i][0] for i in transient]
    if chain_visits is not None and len(set(states)) == n == len(states):
        # each state is reached with one pay so far: the product chain is the round chain, whose
        # expected visits the caller already has (the exact round's one factorisation)
        visits = ScaledVector(tuple(chain_visits.numerators[state] for state in states), chain_visits.denominator)
    else:
        q_rows = []
        for i in transient:
            q_row: dict[int, object] = {}
            for target, k in transitions[i]:
                if target in position:
                    q_row[position[target]] = q_row.get(position[target], QQ(0)) + chain.edges[k].prob
            q_rows.append(q_row)
        lu = factor_exact(identity_minus(q_rows), "integer", should_stop, max_bits)
        unit = [QQ(0)] * len(transient)
        unit[0] = QQ(1)
        visits = lu.solve_transposed_scaled(unit)
    # whole-number sums of visits per edge and per ending; each reduced to lowest terms once
    through = [fmpz(0)] * len(chain.edges)
    ending_terms: dict[tuple[Rational, Rational], list] = {}
    for j, i in enumerate(transient):
        visited = visits.numerators[j]
        if visited == 0:
            continue
        for target, k in transitions[i]:
            through[k] += visited
            if target not in position:
                ending_terms.setdefault(nodes[target][1:], []).append((chain.edges[k].prob, visited))
    ending = {key: grouped_products(terms) / visits.denominator for key, terms in ending_terms.items()}
    reduced: dict = {fmpz(0): QQ(0)}  # the edges of one state share its visits: reduce each total once
    for total in through:
        if total not in reduced:
            reduced[total] = fmpq(total, visits.denominator)
    taken = tuple(edge.prob * reduced[total] for edge, total in zip(chain.edges, through))
    return RoundLaw(ending, taken, len(transient))


def drifting_loop(chain: RoundChain) -> bool:
    """Whether some loop of the round adds pay or stake (the pay so far then has no bound).

    Every loop inside a strongly connected set of states adds nothing exactly when each state can
    be given a potential (pay, stake) with every edge inside the set adding the difference of its
    ends' potentials; one walk per set checks it, so the product walk is never started in vain.
    """
    from oddsbench.model.validate import strongly_connected

    n = chain.transient_count
    inside: list[list] = [[] for _ in range(n)]
    for edge in chain.edges:
        if edge.target < n:
            inside[edge.source].append(edge)
    sets = strongly_connected(range(n), lambda i: [edge.target for edge in inside[i]])
    member = {state: k for k, states in enumerate(sets) for state in states}
    potential: dict[int, tuple] = {}
    for states in sets:
        root = next(iter(states))
        potential[root] = (QQ(0), QQ(0))
        pending = [root]
        while pending:
            state = pending.pop()
            pay, stake = potential[state]
            for edge in inside[state]:
                if member[edge.target] != member[state]:
                    continue
                wanted = (pay + edge.pay, stake + edge.stake)
                if edge.target not in potential:
                    potential[edge.target] = wanted
                    pending.append(edge.target)
                elif potential[edge.target] != wanted:
                    return True
    return False


def round_distribution(chain: RoundChain, limit: int = PRODUCT_LIMIT) -> RoundDistribution:
    """The exact distribution of one round's result per unit of the initial stake."""
    if chain.transient_count == 0:
        raise OddsbenchError(f"{chain.title}: the round ends at its start: a session could never move")
    law = round_law(chain, limit)
    stake = chain.stake
    outcomes = [RoundOutcome(pay / stake, prob, extra / stake) for (pay, extra), prob in law.totals.items()]
    return make_distribution(chain.title, outcomes, chain.title)


def round_distribution_of(ruleset, policy=None) -> RoundDistribution:
    """Convenience: build the round chain of a ruleset (under a policy) and its distribution."""
    from oddsbench.chain.round_chain import build_round_chain

    distribution = round_distribution(build_round_chain(ruleset, policy))
    return RoundDistribution(distribution.title, distribution.outcomes, ruleset.source)
