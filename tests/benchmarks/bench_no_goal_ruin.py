"""Play with no goal: the root method against truncation at a far goal (run on demand).

    python tests/benchmarks/bench_no_goal_ruin.py [--quick]

For each walk: our time (roots + interval arithmetic, 30 proved digits, no cross-check) beside
the baseline a user would otherwise run, exact truncation at a goal far enough for a gap below
1e-12, which gives only an interval.
"""

from __future__ import annotations

import math
import sys
import time

import oddsbench  # noqa: F401  (sets FLINT ground types before sympy loads)
from oddsbench.model.numbers import QQ
from oddsbench.solve.ruin import ruin_before_goal, ruin_before_goal_float, solve_no_goal_ruin

WALKS = {
    "even money 51/49, bankroll 20": ({1: QQ(51, 100), -1: QQ(49, 100)}, 20),
    "payouts 1 and 2, lose 1": ({-1: QQ(2, 5), 1: QQ(2, 5), 2: QQ(1, 5)}, 20),
    "lose 1 or 2, win 1 or 2": ({-2: QQ(1, 5), -1: QQ(1, 10), 1: QQ(3, 5), 2: QQ(1, 10)}, 20),
    "35 to 1, won 1 in 30": ({35: QQ(1, 30), -1: QQ(29, 30)}, 50),
}


def timed(function, *args, **kwargs):
    start = time.perf_counter()
    result = function(*args, **kwargs)
    return result, time.perf_counter() - start


def main() -> None:
    quick = "--quick" in sys.argv
    print(f"{'walk':34s} {'roots (s)':>10s} {'goal':>6s} {'exact trunc (s)':>16s} {'float trunc (s)':>16s}")
    for name, (law, bankroll) in WALKS.items():
        ruin, ours = timed(solve_no_goal_ruin, law, bankroll, digits=30, check=False)
        rate = float(ruin.adjustment_coefficient.value) * ruin.step
        goal = ruin.steps_bankroll + 1 + math.ceil(12 * math.log(10) / rate)
        ordered = tuple(sorted(law.items()))
        span = ordered[-1][0] - ordered[0][0]
        if quick and goal * goal * span > 5e6:
            exact_time = float("nan")
        else:
            _, exact_time = timed(ruin_before_goal, ordered, ruin.steps_bankroll, goal)
        _, float_time = timed(ruin_before_goal_float, ordered, ruin.steps_bankroll, goal)
        print(f"{name:34s} {ours:10.4f} {goal:6d} {exact_time:16.4f} {float_time:16.4f}   psi = {ruin.ruin.text[:18]}")


if __name__ == "__main__":
    main()
