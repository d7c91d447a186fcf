"""A round as an absorbing Markov chain: transient states, end states and weighted edges."""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from oddsbench.chain.deal import dealt
from oddsbench.model.defaults import DEFAULT_MAX_STATES
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational
from oddsbench.model.ruleset import Outcome, Ruleset, State
from oddsbench.model.validate import reachable_from, reaching, trapped_sets


@dataclass(frozen=True)
class Edge:
    """One step with probability above zero. ``target`` indexes ``RoundChain.names``."""

    source: int
    target: int
    prob: Rational
    pay: Rational
    stake: Rational


@dataclass(frozen=True)
class RoundChain:
    """States reachable from the start, transient ones first (start at index 0), then end states."""

    title: str
    names: tuple[str, ...]
    transient_count: int
    results: tuple[str | None, ...]
    edges: tuple[Edge, ...]
    stake: Rational
    actions: tuple[tuple[str, str], ...] = ()

    @property
    def transient(self) -> tuple[str, ...]:
        return self.names[: self.transient_count]

    @property
    def ends(self) -> tuple[str, ...]:
        return self.names[self.transient_count :]

    @property
    def end_results(self) -> tuple[str | None, ...]:
        return self.results[self.transient_count :]

    def q_rows(self) -> list[dict[int, Rational]]:
        """Transient-to-transient probabilities, row by row, equal targets added."""
        rows: list[dict[int, Rational]] = [{} for _ in range(self.transient_count)]
        for edge in self.edges:
            if edge.target < self.transient_count:
                row = rows[edge.source]
                row[edge.target] = row.get(edge.target, QQ(0)) + edge.prob
        return rows

    def end_columns(self) -> list[list[Rational]]:
        """For each end state, the one-step probability of entering it from each transient state."""
        columns = [[QQ(0)] * self.transient_count for _ in self.ends]
        for edge in self.edges:
            if edge.target >= self.transient_count:
                column = columns[edge.target - self.transient_count]
                column[edge.source] += edge.prob
        return columns


def outcomes_under(state: State, policy: Mapping[str, str]) -> tuple[Outcome, ...]:
    """The outcomes a state offers once the player's action (if any) is fixed."""
    if not state.is_decision:
        return state.outcomes
    action = policy.get(state.name)
    if action is None:
        raise OddsbenchError(f"state {state.name!r} needs a decision: choose a strategy")
    try:
        return state.choice(action)
    except KeyError:
        raise OddsbenchError(
            f"state {state.name!r}: unknown action {action!r} (choose from {', '.join(state.actions)})"
        ) from None


def check_state_count(count: int, max_states: int | None, source: str, what: str = "the round reaches") -> None:
    """Refuse a chain above the state limit before any matrix is built, naming both figures."""
    if max_states is not None and count > max_states:
        raise OddsbenchError(
            f"{source}: {what} {count:,} states, over the state limit of {max_states:,} (raise it with --max-states)"
        )


def build_round_chain(
    ruleset: Ruleset, policy: Mapping[str, str] | None = None, max_states: int | None = DEFAULT_MAX_STATES
) -> RoundChain:
    """The chain of one round under a policy (decision state -> action). A deck game is dealt out first
    (``chain/deal.py``; a no-op for one already dealt), so its draws never reach the solver unexpanded."""
    policy = policy or {}
    if ruleset.deck is not None:
        ruleset = dealt(ruleset, max_states)
    check_state_count(len(ruleset.states), max_states, ruleset.source, "the ruleset has")
    by_name = {state.name: state for state in ruleset.states}
    graph = {
        state.name: {o.to for o in outcomes_under(state, policy) if o.prob > 0}
        for state in ruleset.states
        if not state.is_decision or state.name in policy
    }
    reachable = reachable_from(ruleset.start, _Guarded(graph, by_name))
    check_state_count(len(reachable), max_states, ruleset.source)
    ordered = [name for name in ruleset.state_names if name in reachable]
    transient = [ruleset.start] + [n for n in ordered if n != ruleset.start and not by_name[n].is_end]
    ends = [n for n in ordered if by_name[n].is_end]
    if by_name[ruleset.start].is_end:
        transient = []
        ends = [ruleset.start]
    can_end = reaching(set(ends), graph)
    stuck = set(transient) - can_end
    if stuck:
        trapped = trapped_sets(stuck, graph)
        names = ", ".join(repr(n) for n in sorted(trapped[0] if trapped else stuck)[:8])
        raise OddsbenchError(f"{ruleset.source}: under this play the round can never end: trapped in {{{names}}}")
    names = tuple(transient + ends)
    index = {name: i for i, name in enumerate(names)}
    edges = []
    for i, name in enumerate(transient):
        for outcome in outcomes_under(by_name[name], policy):
            if outcome.prob > 0:
                edges.append(Edge(i, index[outcome.to], outcome.prob, outcome.pay, outcome.stake))
    return RoundChain(
        title=ruleset.title,
        names=names,
        transient_count=len(transient),
        results=tuple(by_name[n].result for n in names),
        edges=tuple(edges),
        stake=ruleset.stake,
        actions=tuple((n, policy[n]) for n in transient if by_name[n].is_decision),
    )


class _Guarded(dict):
    """Successors for reachability that name the undecided state instead of failing later."""

    def __init__(self, graph: dict[str, set[str]], by_name: dict[str, State]) -> None:
        super().__init__(graph)
        self.by_name = by_name

    def get(self, name, default=()):  # type: ignore[override]
        if name not in self and self.by_name[name].is_decision:
            raise OddsbenchError(f"state {name!r} needs a decision: choose a strategy")
        return super().get(name, default)
