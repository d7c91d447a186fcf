"""The best action in every decision state, by policy iteration, with a certificate.

A ruleset with choices is a Markov decision process over the states reachable from the start
under some play. Policy iteration alternates an evaluation (one linear solve: exact rationals,
or floats above the exact limit) with an improvement (in each decision state, switch to an
action whose one-step value Q(s, a) = E[reward + V(next)] is strictly higher). It starts from a
play that surely ends the round and only switches on strict improvement, so every play it meets
ends the round, and it stops after finitely many steps at a play no single change improves.

Ties: where several actions are exactly as good, the one listed first in the state's choices
is reported, provided the round still surely ends with it (otherwise the action found by the
iteration is kept). The certificate is an exact check, state by state and action by action, that
Q(s, a) <= V(s) with equality for the chosen action (Bellman optimality). Since V is the exact
value of a play that ends the round with probability 1, no play that ends the round does better.
"""

from __future__ import annotations

from collections.abc import Callable
from dataclasses import dataclass

from oddsbench.chain.decision_chain import build_decision_chain
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.defaults import ROUND_EXACT_LIMIT
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.figure import Figure
from oddsbench.model.numbers import QQ, text, to_float
from oddsbench.model.ruleset import Ruleset
from oddsbench.solve.round import RoundFigures, solve_round
from oddsbench.strategy.decision_process import DecisionProcess
from oddsbench.strategy.goals import Goal, goal_named

MAX_ITERATIONS = 1_000
DECIMAL_TOLERANCE = 1e-11  # relative: small chances (1e-20) still compare


@dataclass(frozen=True)
class Tie:
    """A decision state where other actions are exactly as good as the chosen one."""

    state: str
    chosen: str
    equally_good: tuple[str, ...]


@dataclass(frozen=True)
class Certificate:
    """The result of checking Bellman optimality: exact when ``exact`` is true."""

    holds: bool
    exact: bool
    decision_states: int
    pairs_checked: int
    ties: tuple[Tie, ...]
    largest_gain: Figure  # largest Q(s, a) - V(s) over all pairs: 0 when optimal
    statement: str


@dataclass(frozen=True)
class BestPolicy:
    """The best play for a goal, its value from the start state, and its certificate."""

    title: str
    start: str
    goal: str
    value_label: str
    value: Figure
    policy: tuple[tuple[str, str], ...]  # every decision state reachable under some play, file order
    reached: tuple[str, ...]  # decision states reached under this play
    certified: bool
    certificate: Certificate
    iterations: int
    notes: tuple[str, ...]
    figures: RoundFigures | None = None  # every round figure under this play (None: nothing to solve)


@dataclass(frozen=True)
class Improvement:
    """A single change of action that raises a state's value: the gain is Q(s, better) - V(s)."""

    state: str
    action: str
    better: str
    gain: Figure
    reached: bool


@dataclass(frozen=True)
class StrategyCheck:
    """A named strategy held against the goal: its value, the best value, and every improvement."""

    title: str
    strategy: str
    goal: str
    value_label: str
    value: Figure
    best_value: Figure
    improvements: tuple[Improvement, ...]
    optimal: bool
    exact: bool
    decision_states: int
    notes: tuple[str, ...]


def best_policy(
    ruleset: Ruleset,
    goal: str = "max-return",
    exact_limit: int = ROUND_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> BestPolicy:
    """Policy iteration for ``goal`` from the ruleset's start, with its optimality certificate."""
    chosen_goal = goal_named(goal)
    process = DecisionProcess(build_decision_chain(ruleset), chosen_goal)
    notes: list[str] = []
    count = len(process.names)
    exact = count <= exact_limit
    if not exact:
        notes.append(
            f"{count:,} states exceed the exact limit of {exact_limit:,}: decimal policy iteration "
            "(float64, sparse LU); the certificate is a decimal check, not an exact one"
        )
    if chosen_goal.result is not None and all(
        state.result != chosen_goal.result for state in ruleset.states if state.is_end
    ):
        notes.append(f'no end state has result "{chosen_goal.result}", so every play gives 0 and every action ties')
    if count == 0:
        return _trivial(ruleset, chosen_goal, notes)
    policy = process.surely_ending_policy()
    members = list(range(count))
    zero = QQ(0) if exact else 0.0
    iterations = 0
    while True:
        iterations += 1
        if iterations > MAX_ITERATIONS:
            raise OddsbenchError(f"policy iteration did not settle in {MAX_ITERATIONS:,} rounds of improvement")
        values = (
            process.evaluate_exact(policy, members, should_stop) if exact else process.evaluate_decimal(policy, members)
        )
        changed = False
        for i in members:
            if not process.decision[i]:
                continue
            current = process.q_value(i, policy[i], values, zero)
            best_a, best_q = policy[i], current
            for a in range(len(process.actions[i])):
                q = process.q_value(i, a, values, zero)
                if q is not None and _better(q, best_q, exact):
                    best_a, best_q = a, q
            if best_a != policy[i]:
                policy[i] = best_a
                changed = True
        if not changed:
            break
        if len(process.ends_surely(policy)) < count:
            raise OddsbenchError(
                f"goal {chosen_goal.name!r} has no best play that ends the round: some play can keep "
                "improving it for ever (a cycle that gains at every lap)"
            )
    policy = _break_ties(process, policy, values, zero, exact)
    certificate = _certify(process, policy, values, zero, exact, chosen_goal)
    reached = process.reached(policy)
    value = _figure(values[0], chosen_goal.sign, exact)
    chosen = {process.names[i]: process.actions[i][policy[i]] for i in range(count) if process.decision[i]}
    figures = solve_round(build_round_chain(ruleset, chosen), exact_limit=exact_limit, should_stop=should_stop)
    return BestPolicy(
        title=ruleset.title,
        start=ruleset.start,
        goal=chosen_goal.name,
        value_label=chosen_goal.value_label,
        value=value,
        policy=tuple((process.names[i], process.actions[i][policy[i]]) for i in range(count) if process.decision[i]),
        reached=tuple(process.names[i] for i in sorted(reached) if process.decision[i]),
        certified=certificate.holds and certificate.exact,
        certificate=certificate,
        iterations=iterations,
        notes=tuple(notes),
        figures=figures,
    )


def check_strategy(
    ruleset: Ruleset,
    strategy: str,
    goal: str = "max-return",
    exact_limit: int = ROUND_EXACT_LIMIT,
    should_stop: Callable[[], bool] | None = None,
) -> StrategyCheck:
    """Hold a named strategy against ``goal``: every single change of action that would improve it."""
    chosen_goal = goal_named(goal)
    try:
        named = ruleset.strategy(strategy)
    except KeyError:
        known = ", ".join(s.name for s in ruleset.strategies) or "none defined"
        raise OddsbenchError(f"{ruleset.source}: unknown strategy {strategy!r} (known: {known})") from None
    process = DecisionProcess(build_decision_chain(ruleset), chosen_goal)
    by_name = {state.name: state for state in ruleset.states}
    policy = []
    for i, name in enumerate(process.names):
        action = named.action_for(by_name[name]) if process.decision[i] else None
        policy.append(process.actions[i].index(action) if action in process.actions[i] else 0)
    best = best_policy(ruleset, goal, exact_limit, should_stop)
    notes: list[str] = []
    count = len(process.names)
    if count == 0:
        return StrategyCheck(
            ruleset.title,
            strategy,
            chosen_goal.name,
            chosen_goal.value_label,
            best.value,
            best.value,
            (),
            True,
            True,
            0,
            ("the round ends at once: nothing to decide",),
        )
    region = sorted(process.ends_surely(policy))
    if 0 not in region:
        raise OddsbenchError(f"{ruleset.source}: under strategy {strategy!r} the round can go on for ever")
    if len(region) < count:
        notes.append(
            f"{count - len(region)} state(s) never end the round under {strategy!r}; actions leading "
            "there are not compared"
        )
    exact = len(region) <= exact_limit
    values = process.evaluate_exact(policy, region, should_stop) if exact else process.evaluate_decimal(policy, region)
    zero = QQ(0) if exact else 0.0
    reached = process.reached(policy)
    improvements = []
    for i in region:
        if not process.decision[i]:
            continue
        own = values[i]
        best_a, best_q = policy[i], own
        for a in range(len(process.actions[i])):
            q = process.q_value(i, a, values, zero)
            if q is not None and _better(q, best_q, exact):
                best_a, best_q = a, q
        if best_a != policy[i]:
            gain = best_q - own
            improvements.append(
                Improvement(
                    state=process.names[i],
                    action=process.actions[i][policy[i]],
                    better=process.actions[i][best_a],
                    gain=_figure(gain, 1, exact),
                    reached=i in reached,
                )
            )
    if not exact:
        notes.append(f"{len(region):,} states exceed the exact limit of {exact_limit:,}: a decimal check")
    return StrategyCheck(
        title=ruleset.title,
        strategy=strategy,
        goal=chosen_goal.name,
        value_label=chosen_goal.value_label,
        value=_figure(values[0], chosen_goal.sign, exact),
        best_value=best.value,
        improvements=tuple(improvements),
        optimal=not improvements,
        exact=exact,
        decision_states=sum(1 for i in region if process.decision[i]),
        notes=tuple(notes),
    )


def _better(q, than, exact: bool) -> bool:
    if than is None:
        return True
    if exact:
        return q > than
    return q > than + DECIMAL_TOLERANCE * max(abs(q), abs(than))


def _break_ties(process: DecisionProcess, policy: list[int], values: dict, zero, exact: bool) -> list[int]:
    """Report the first-listed of exactly equal best actions, where the round still surely ends."""
    if not exact:
        return policy
    count = len(process.names)
    policy = list(policy)
    for i in range(count):
        if not process.decision[i]:
            continue
        for a in range(policy[i]):
            if process.q_value(i, a, values, zero) == values[i]:
                previous = policy[i]
                policy[i] = a
                if len(process.ends_surely(policy)) < count:
                    policy[i] = previous
                    continue
                break
    return policy


def _certify(process: DecisionProcess, policy: list[int], values: dict, zero, exact: bool, goal: Goal) -> Certificate:
    holds = True
    pairs = 0
    decision_states = 0
    largest = None
    ties = []
    for i in range(len(process.names)):
        if not process.decision[i]:
            if exact and process.q_value(i, 0, values, zero) != values[i]:
                holds = False
            continue
        decision_states += 1
        own = values[i]
        if exact and process.q_value(i, policy[i], values, zero) != own:
            holds = False
        equal = []
        for a in range(len(process.actions[i])):
            q = process.q_value(i, a, values, zero)
            pairs += 1
            gap = q - own
            if largest is None or gap > largest:
                largest = gap
            if a != policy[i] and (q == own if exact else abs(gap) <= DECIMAL_TOLERANCE * max(abs(q), abs(own))):
                equal.append(process.actions[i][a])
            if exact and q > own:
                holds = False
        if equal:
            ties.append(Tie(process.names[i], process.actions[i][policy[i]], tuple(equal)))
    largest = zero if largest is None else largest
    if not exact and largest > DECIMAL_TOLERANCE * max(1.0, max(abs(v) for v in values.values())):
        holds = False
    kind = "exactly, in rational arithmetic" if exact else "in floating point only (not an exact check)"
    if holds and decision_states == 0:
        statement = "nothing to choose: no decision state is reachable from the start, so the play is fixed"
    elif holds:
        statement = (
            f"checked {kind}: in each of the {decision_states:,} decision states, no other action has a higher "
            f"one-step value E[reward + V(next)] than the chosen one ({pairs:,} state-action pairs; Bellman "
            "optimality). V is the value of this play, which ends the round with probability 1, so no single "
            "change of action improves any state and no play that ends the round does better."
        )
    else:
        statement = (
            f"FAILED ({kind}): some action does better than the chosen one by {text(largest) if exact else largest}"
        )
    return Certificate(
        holds=holds,
        exact=exact,
        decision_states=decision_states,
        pairs_checked=pairs,
        ties=tuple(ties),
        largest_gain=_figure(largest, 1, exact),
        statement=statement,
    )


def _figure(value, sign: int, exact: bool) -> Figure:
    if exact:
        shown = value * sign
        return Figure(shown, to_float(shown))
    return Figure(None, float(value) * sign)


def _trivial(ruleset: Ruleset, goal: Goal, notes: list[str]) -> BestPolicy:
    notes.append("the round ends at once: nothing to decide")
    certificate = Certificate(True, True, 0, 0, (), Figure(QQ(0), 0.0), "nothing to check: no decision states")
    return BestPolicy(
        ruleset.title,
        ruleset.start,
        goal.name,
        goal.value_label,
        Figure(QQ(0), 0.0),
        (),
        (),
        True,
        certificate,
        0,
        tuple(notes),
    )
