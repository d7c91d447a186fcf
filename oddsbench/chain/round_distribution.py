"""One round as a distribution of results per unit of initial stake: what a session is built on.

A session only needs, for each way a round can end, the net result and the extra stake put up
(doubling, insurance...), both per unit of the initial stake, and its exact probability. The
distribution comes from a ruleset (``solve.round_distribution``) or from inline text such as
``"1:18/37,-1:19/37"`` (net : probability; an optional third field is the extra stake).
"""

from __future__ import annotations

from dataclasses import dataclass

from oddsbench.chain.session_rules import cover_of, grid_scale
from oddsbench.model.errors import OddsbenchError, shown_name
from oddsbench.model.numbers import QQ, Rational, text, to_float


@dataclass(frozen=True)
class RoundOutcome:
    """Net result and extra stake per unit of initial stake, with the chance of ending so."""

    net: Rational
    prob: Rational
    extra: Rational = QQ(0)


@dataclass(frozen=True)
class RoundDistribution:
    """Outcomes of one round (probabilities sum to exactly 1), sorted by net result."""

    title: str
    outcomes: tuple[RoundOutcome, ...]
    source: str = "<round>"

    @property
    def expected_net(self) -> Rational:
        return sum((o.prob * o.net for o in self.outcomes), QQ(0))

    @property
    def expected_staked(self) -> Rational:
        """Expected total stake per unit of initial stake (extra stakes included)."""
        return 1 + sum((o.prob * o.extra for o in self.outcomes), QQ(0))

    @property
    def house_edge(self) -> Rational:
        return -self.expected_net / self.expected_staked

    @property
    def cover(self) -> Rational:
        """Bankroll needed per unit bet: the most a round can take or tie up (extra stakes included)."""
        return cover_of((o.net, o.extra) for o in self.outcomes)

    @property
    def net_denominator(self) -> int:
        """Common denominator of the net results: a bet of one unit moves the bankroll in 1/D steps."""
        return grid_scale(o.net for o in self.outcomes)

    @property
    def best_net(self) -> Rational:
        return max(o.net for o in self.outcomes)

    def floats(self) -> tuple[list[float], list[float]]:
        return [to_float(o.net) for o in self.outcomes], [to_float(o.prob) for o in self.outcomes]


def make_distribution(title: str, outcomes: list[RoundOutcome], source: str = "<round>") -> RoundDistribution:
    """Merge equal (net, extra) pairs, drop zero chances, check the sum and that play can move."""
    merged: dict[tuple, Rational] = {}
    for outcome in outcomes:
        if outcome.prob < 0:
            raise OddsbenchError(f"{source}: negative probability {text(outcome.prob)} for net {text(outcome.net)}")
        if outcome.extra < 0:
            raise OddsbenchError(f"{source}: negative extra stake {text(outcome.extra)}")
        if outcome.prob > 0:
            key = (outcome.net, outcome.extra)
            merged[key] = merged.get(key, QQ(0)) + outcome.prob
    total = sum(merged.values(), QQ(0))
    if total != 1:
        raise OddsbenchError(f"{source}: round probabilities sum to {text(total)}, not 1")
    if all(net == 0 for net, _ in merged):
        raise OddsbenchError(f"{source}: every outcome has net result 0: a session could never end")
    ordered = sorted(merged.items(), key=lambda item: (item[0][0], item[0][1]))
    return RoundDistribution(
        title=title,
        outcomes=tuple(RoundOutcome(net, prob, extra) for (net, extra), prob in ordered),
        source=source,
    )


def parse_round_text(spec: str) -> RoundDistribution:
    """``"1:18/37,-1:19/37"``: comma-separated ``net:probability[:extra]``, exact values.

    Values go through the safe expression language, so ``35`` and ``(1/37)`` both work.
    """
    from oddsbench.model.expr import ExpressionError, evaluate_text

    source = f"--round {shown_name(spec)}"
    outcomes = []
    items = [item.strip() for item in spec.split(",") if item.strip()]
    if not items:
        raise OddsbenchError(f"{source}: expected net:probability pairs such as 1:18/37,-1:19/37")
    for item in items:
        fields = [field.strip() for field in item.split(":")]
        if len(fields) not in (2, 3) or not all(fields):
            raise OddsbenchError(f"{source}: {shown_name(item)} is not net:probability or net:probability:extra")
        try:
            values = [evaluate_text(field) for field in fields]
        except ExpressionError as error:
            raise OddsbenchError(f"{source}: {shown_name(item)}: {error}") from None
        outcomes.append(RoundOutcome(values[0], values[1], values[2] if len(values) == 3 else QQ(0)))
    return make_distribution("inline round", outcomes, source)
