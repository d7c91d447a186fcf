"""Benchmark: `best` on Pig turns with a growing goal (states = goal), exact and decimal.

Run on demand: python tests/benchmarks/bench_best_policy.py [--quick]
Baseline: plain float value iteration (numpy, Jacobi sweeps to a 1e-12 change), the textbook
method; we print our exact policy iteration and decimal policy iteration beside it.
"""

from __future__ import annotations

import sys
import time

import numpy as np

from oddsbench.model.load import load_ruleset_text
from oddsbench.strategy.best_policy import best_policy

PIG = """
[ruleset]
title = "Pig turn to {goal}"
start = "turn-0"
stake = 0
[params]
goal = {goal}
[families.turn]
state = "turn-{{t}}"
index = {{ t = [0, "goal - 1"] }}
when = "t != 1"
choices.hold = [{{ to = "held", pay = "t" }}]
choices.roll = [
  {{ to = "pigged", prob = "1/6" }},
  {{ each = {{ f = [2, 6] }}, when = "t + f < goal", to = "turn-{{t + f}}", prob = "1/6" }},
  {{ each = {{ f = [2, 6] }}, when = "t + f >= goal", to = "done", prob = "1/6", pay = "t + f" }},
]
[states.held]
[states.pigged]
[states.done]
"""


def value_iteration(goal: int) -> tuple[float, int]:
    values = np.zeros(goal + 6)
    sweeps = 0
    totals = np.arange(goal + 6, dtype=float)
    while True:
        sweeps += 1
        ahead = np.where(np.arange(goal + 6) >= goal, totals, values)
        roll = np.array([sum(ahead[t + f] for f in range(2, 7)) / 6 if t < goal else 0.0 for t in range(goal + 6)])
        new = np.where(np.arange(goal + 6) < goal, np.maximum(totals, roll), totals)
        if np.max(np.abs(new - values)) < 1e-12:
            return float(new[0]), sweeps
        values = new


def timed(function, *args):
    start = time.perf_counter()
    result = function(*args)
    return result, time.perf_counter() - start


def main() -> None:
    goals = [100, 500] if "--quick" in sys.argv else [100, 500, 2000, 5000]
    print(f"{'goal':>6} {'states':>7} {'read s':>7} {'exact PI s':>11} {'decimal PI s':>13} {'float VI s':>11}  value")
    for goal in goals:
        ruleset, read = timed(load_ruleset_text, PIG.format(goal=goal), "bench.toml")
        exact, exact_time = timed(best_policy, ruleset, "max-return")
        decimal, decimal_time = timed(best_policy, ruleset, "max-return", 0)
        (vi_value, sweeps), vi_time = timed(value_iteration, goal)
        assert abs(decimal.value.decimal - exact.value.decimal) < 1e-9 and abs(vi_value - exact.value.decimal) < 1e-9
        print(
            f"{goal:>6} {len(ruleset.states):>7} {read:>7.2f} {exact_time:>11.2f} {decimal_time:>13.2f} "
            f"{vi_time:>11.2f}  {exact.value.decimal:.6f} ({exact.iterations} PI rounds, {sweeps} VI sweeps)"
        )
    print()
    print("goal max-win (roll everywhere; many rounds of policy iteration, long exact fractions)")
    print(f"{'goal':>6} {'exact PI s':>11} {'rounds':>7} {'decimal PI s':>13} {'rounds':>7}  chance")
    for goal in [100, 300] if "--quick" in sys.argv else [100, 300, 1000]:
        text = PIG.format(goal=goal).replace("[states.done]", '[states.done]\nresult = "win"')
        ruleset = load_ruleset_text(text, "bench.toml")
        exact, exact_time = timed(best_policy, ruleset, "max-win")
        decimal, decimal_time = timed(best_policy, ruleset, "max-win", 0)
        assert abs(decimal.value.decimal - exact.value.decimal) <= 1e-9 * exact.value.decimal
        print(
            f"{goal:>6} {exact_time:>11.2f} {exact.iterations:>7} {decimal_time:>13.2f} {decimal.iterations:>7}"
            f"  {exact.value.decimal:.6e}"
        )


if __name__ == "__main__":
    main()
