"""A ruleset's round as a distribution of (net result, extra stake) per unit of initial stake.

Pays and extra stakes are attached to edges, so the result of a round is what has been added
up along the path taken. Most games give each end state one total, but a game may reach the
same end state with different totals. We therefore walk the product chain whose states are
(round state, pay so far, extra stake so far), starting from (start, 0, 0): loops that pay
nothing (rolling for a point) keep it the same size as the round chain, and a loop that keeps
adding pay makes it grow without bound, which we refuse past a limit with a clear message.
The chance of ending in each (end state, pay, extra) node comes from one exact transposed
solve (expected visits from the start); grouping by (pay, extra) gives the distribution.
"""

from __future__ import annotations

from oddsbench.chain.round_chain import RoundChain
from oddsbench.chain.round_distribution import RoundDistribution, RoundOutcome, make_distribution
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ
from oddsbench.solve.linear import factor_exact, identity_minus

PRODUCT_LIMIT = 20_000


def round_distribution(chain: RoundChain, limit: int = PRODUCT_LIMIT) -> RoundDistribution:
    """The exact distribution of one round's result per unit of the initial stake."""
    n = chain.transient_count
    if n == 0:
        raise OddsbenchError(f"{chain.title}: the round ends at its start: a session could never move")
    out: list[list] = [[] for _ in range(n)]
    for edge in chain.edges:
        out[edge.source].append(edge)
    start = (0, QQ(0), QQ(0))
    index = {start: 0}
    nodes = [start]
    transitions: list[list[tuple[int, object]]] = []
    cursor = 0
    while cursor < len(nodes):
        state, pay, extra = nodes[cursor]
        row: list[tuple[int, object]] = []
        if state < n:
            for edge in out[state]:
                key = (edge.target, pay + edge.pay, extra + edge.stake)
                if key not in index:
                    if len(nodes) >= limit:
                        raise OddsbenchError(
                            f"{chain.title}: more than {limit:,} (state, pay so far) pairs: some loop keeps "
                            "adding pay or stake, so the round's result is not bounded"
                        )
                    index[key] = len(nodes)
                    nodes.append(key)
                row.append((index[key], edge.prob))
        transitions.append(row)
        cursor += 1
    transient = [i for i, (state, _, _) in enumerate(nodes) if state < n]
    position = {node: k for k, node in enumerate(transient)}
    q_rows = []
    for i in transient:
        row: dict[int, object] = {}
        for target, prob in transitions[i]:
            if target in position:
                row[position[target]] = row.get(position[target], QQ(0)) + prob
        q_rows.append(row)
    lu = factor_exact(identity_minus(q_rows))
    unit = [QQ(0)] * len(transient)
    unit[0] = QQ(1)
    visits = lu.solve_transposed(unit)
    ending: dict[int, object] = {}
    for k, i in enumerate(transient):
        if visits[k] == 0:
            continue
        for target, prob in transitions[i]:
            if target not in position:
                ending[target] = ending.get(target, QQ(0)) + visits[k] * prob
    stake = chain.stake
    outcomes = [
        RoundOutcome(nodes[target][1] / stake, prob, nodes[target][2] / stake) for target, prob in ending.items()
    ]
    return make_distribution(chain.title, outcomes, chain.title)


def round_distribution_of(ruleset, policy=None) -> RoundDistribution:
    """Convenience: build the round chain of a ruleset (under a policy) and its distribution."""
    from oddsbench.chain.round_chain import build_round_chain

    distribution = round_distribution(build_round_chain(ruleset, policy))
    return RoundDistribution(distribution.title, distribution.outcomes, ruleset.source)
