"""A round with choices as one chain over every play: the states reachable under some play.

``build_round_chain`` fixes a policy first; best play needs the chain before any policy is
chosen: every transient state reachable from the start under some play (start first, then file
order), and for each state the steps of each of its actions (a state without choices has one
action, ``None``). Policies are lists of action indices, one per transient state.
"""

from __future__ import annotations

from dataclasses import dataclass

from oddsbench.chain.deal import dealt
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import Rational
from oddsbench.model.ruleset import Ruleset
from oddsbench.model.validate import reachable_from, successor_graph


@dataclass(frozen=True)
class Step:
    """One outcome of an action: where it leads (transient index, or -1 for an end state)."""

    target: int
    prob: Rational
    pay: Rational
    result: str | None  # the end state's result, when the step ends the round


@dataclass(frozen=True)
class DecisionChain:
    """Transient states reachable under some play, their actions, and each action's steps."""

    names: tuple[str, ...]
    decision: tuple[bool, ...]  # whether each state asks the player to choose
    actions: tuple[tuple[str | None, ...], ...]
    steps: tuple[tuple[tuple[Step, ...], ...], ...]  # steps[state][action]

    @property
    def size(self) -> int:
        return len(self.names)

    def ends_surely(self, policy: list[int], members: list[int] | None = None) -> set[int]:
        """Transient states from which the round surely ends under ``policy`` (reverse search)."""
        members = list(range(self.size)) if members is None else members
        backward: dict[int, list[int]] = {}
        done: set[int] = set()
        stack = []
        for i in members:
            for step in self.steps[i][policy[i]]:
                if step.target < 0:
                    if i not in done:
                        done.add(i)
                        stack.append(i)
                else:
                    backward.setdefault(step.target, []).append(i)
        while stack:
            for source in backward.get(stack.pop(), ()):
                if source not in done:
                    done.add(source)
                    stack.append(source)
        return done

    def surely_ending_policy(self) -> list[int]:
        """A first play under which every state surely ends: grow the set that can reach an end."""
        count = self.size
        policy = [0] * count
        settled = [False] * count
        changed = True
        while changed:
            changed = False
            for i in range(count):
                if settled[i]:
                    continue
                for a, steps in enumerate(self.steps[i]):
                    if any(step.target < 0 or settled[step.target] for step in steps):
                        policy[i], settled[i], changed = a, True, True
                        break
        if not all(settled):
            stuck = self.names[settled.index(False)]
            raise OddsbenchError(f"state {stuck!r}: no play ends the round from here")
        return policy

    def reached(self, policy: list[int]) -> set[int]:
        """Transient states reached from the start under ``policy``."""
        seen = {0}
        stack = [0]
        while stack:
            i = stack.pop()
            for step in self.steps[i][policy[i]]:
                if step.target >= 0 and step.target not in seen:
                    seen.add(step.target)
                    stack.append(step.target)
        return seen


def build_decision_chain(ruleset: Ruleset) -> DecisionChain:
    """The chain of a ruleset over every play, from its start (a deck game dealt out first)."""
    if ruleset.deck is not None:
        ruleset = dealt(ruleset)
    by_name = {state.name: state for state in ruleset.states}
    reachable = reachable_from(ruleset.start, successor_graph(ruleset.states))
    ordered = [name for name in ruleset.state_names if name in reachable and not by_name[name].is_end]
    if ruleset.start in ordered:
        ordered.remove(ruleset.start)
        ordered.insert(0, ruleset.start)
    index = {name: i for i, name in enumerate(ordered)}
    actions = []
    steps = []
    for name in ordered:
        state = by_name[name]
        options = state.choices if state.is_decision else ((None, state.outcomes),)
        actions.append(tuple(action for action, _ in options))
        per_action = []
        for _, outcomes in options:
            listed = []
            for outcome in outcomes:
                if outcome.prob == 0:
                    continue
                target = by_name[outcome.to]
                result = target.result if target.is_end else None
                listed.append(Step(index.get(outcome.to, -1), outcome.prob, outcome.pay, result))
            per_action.append(tuple(listed))
        steps.append(tuple(per_action))
    return DecisionChain(
        names=tuple(ordered),
        decision=tuple(by_name[name].is_decision for name in ordered),
        actions=tuple(actions),
        steps=tuple(steps),
    )
