"""What "best" means: each goal turns a step of the round into a reward to maximise.

Every goal is stated as a maximisation of an expected total reward over one round, so one
policy iteration serves them all; goals to minimise (steps, chance of a loss) maximise the
negated reward, and ``sign`` turns the value back into the figure a user reads.
"""

from __future__ import annotations

from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational


@dataclass(frozen=True)
class Goal:
    """A goal: its command-line name, what its value means, and how each step is scored."""

    name: str
    value_label: str
    description: str
    sign: int  # the figure shown is sign * (the maximised expected reward)
    pay_weight: int = 0  # reward += pay_weight * pay of the step
    step_weight: int = 0  # reward += step_weight for every step
    result: str | None = None  # reward += result_weight on entering an end state with this result
    result_weight: int = 0

    def reward(self, pay: Rational, end_result: str | None) -> Rational:
        """The reward of one step that pays ``pay`` and enters a state with ``end_result``."""
        value = QQ(self.step_weight)
        if self.pay_weight:
            value += self.pay_weight * pay
        if self.result is not None and end_result == self.result:
            value += self.result_weight
        return value


GOALS: dict[str, Goal] = {
    goal.name: goal
    for goal in (
        Goal(
            "max-return",
            "expected net",
            "the highest expected net of a round (sum of every step's pay); with a fixed stake this "
            "is also the lowest house edge",
            sign=1,
            pay_weight=1,
        ),
        Goal(
            "max-win",
            'chance of a "win"',
            'the highest chance that the round ends in a state whose result is "win"',
            sign=1,
            result="win",
            result_weight=1,
        ),
        Goal(
            "min-loss",
            'chance of a "loss"',
            'the lowest chance that the round ends in a state whose result is "loss"',
            sign=-1,
            result="loss",
            result_weight=-1,
        ),
        Goal(
            "min-steps",
            "expected steps",
            "the fewest expected steps until the round ends",
            sign=-1,
            step_weight=-1,
        ),
    )
}


def goal_named(name: str) -> Goal:
    try:
        return GOALS[name]
    except KeyError:
        raise OddsbenchError(f"unknown goal {name!r} (choose from {', '.join(GOALS)})") from None
