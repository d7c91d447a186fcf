"""A decision chain with a goal's reward on every step: what policy iteration evaluates.

Each step of each action carries the goal's reward (``strategy/goals.py``) beside its chance,
exactly and as floats. ``evaluate_exact`` / ``evaluate_decimal`` give a policy's value on a set
of states (one solve through the front doors of ``solve/linear``); ``q_value`` the one-step
look-ahead E[reward + V(next)] of an action.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.decision_chain import DecisionChain
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.linear import factor_exact, factor_float, identity_minus, identity_minus_float
from oddsbench.strategy.goals import Goal


@dataclass(frozen=True)
class RewardedStep:
    target: int  # transient index, or -1 for an end state
    prob: Rational
    reward: Rational
    prob_float: float
    reward_float: float


class DecisionProcess:
    """The chain's states and actions, with the goal's reward on each step."""

    def __init__(self, chain: DecisionChain, goal: Goal) -> None:
        self.chain = chain
        self.names = list(chain.names)
        self.decision = list(chain.decision)
        self.actions = list(chain.actions)
        self.steps: list[list[tuple[RewardedStep, ...]]] = [
            [tuple(_rewarded(step, goal) for step in steps) for steps in per_action] for per_action in chain.steps
        ]

    def ends_surely(self, policy: list[int], members: list[int] | None = None) -> set[int]:
        return self.chain.ends_surely(policy, members)

    def surely_ending_policy(self) -> list[int]:
        return self.chain.surely_ending_policy()

    def reached(self, policy: list[int]) -> set[int]:
        return self.chain.reached(policy)

    def evaluate_exact(self, policy: list[int], members: list[int], should_stop=None) -> dict[int, Rational]:
        position = {state: k for k, state in enumerate(members)}
        rows: list[dict[int, Rational]] = []
        rhs: list[Rational] = []
        for i in members:
            row: dict[int, Rational] = {}
            total = QQ(0)
            for step in self.steps[i][policy[i]]:
                total += step.prob * step.reward
                if step.target >= 0:
                    k = position[step.target]
                    row[k] = row.get(k, QQ(0)) + step.prob
            rows.append(row)
            rhs.append(total)
        values = factor_exact(identity_minus(rows), should_stop=should_stop).solve(rhs) if members else []
        return {i: values[k] for k, i in enumerate(members)}

    def evaluate_decimal(self, policy: list[int], members: list[int]) -> dict[int, float]:
        from scipy.sparse import csc_matrix

        position = {state: k for k, state in enumerate(members)}
        data, rows, cols = [], [], []
        rhs = np.zeros(len(members))
        for k, i in enumerate(members):
            for step in self.steps[i][policy[i]]:
                rhs[k] += step.prob_float * step.reward_float
                if step.target >= 0:
                    rows.append(k)
                    cols.append(position[step.target])
                    data.append(step.prob_float)
        q = csc_matrix((data, (rows, cols)), shape=(len(members), len(members)))
        values = factor_float(identity_minus_float(q)).solve(rhs) if members else np.zeros(0)
        return {i: float(values[k]) for k, i in enumerate(members)}

    def q_value(self, i: int, a: int, values: dict, zero) -> object | None:
        """E[reward + V(next)] of action ``a`` in state ``i``; None where a target has no value."""
        total = zero
        exact = not isinstance(zero, float)
        for step in self.steps[i][a]:
            after = zero
            if step.target >= 0:
                if step.target not in values:
                    return None
                after = values[step.target]
            if exact:
                total += step.prob * (step.reward + after)
            else:
                total += step.prob_float * (step.reward_float + after)
        return total


def _rewarded(step, goal: Goal) -> RewardedStep:
    reward = goal.reward(step.pay, step.result)
    return RewardedStep(step.target, step.prob, reward, to_float(step.prob), to_float(reward))
