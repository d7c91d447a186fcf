"""Benchmark of the session engines (run on demand: python tests/benchmarks/bench_session.py).

Prints our times beside dense numpy, sympy ``Matrix.LUsolve`` and plain value iteration, in one
run. Sizes are chosen so the whole script finishes in a few minutes on 2 cores; pass --quick to
skip the two largest cases.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

import numpy as np

sys.path.insert(0, str(Path(__file__).resolve().parents[2]))

from oddsbench.chain.bankroll import build_bankroll_chain, make_grid  # noqa: E402
from oddsbench.chain.round_distribution import RoundOutcome, make_distribution, parse_round_text  # noqa: E402
from oddsbench.model.numbers import QQ, to_float  # noqa: E402
from oddsbench.strategy.session import SessionSettings, analyse_session  # noqa: E402

WHEEL = "1:18/37,-1:19/37"


def timed(action):
    start = time.perf_counter()
    value = action()
    return time.perf_counter() - start, value


def paytable():
    """An invented paytable (demo data): 38 outcomes, wins paying 1 to 1000 units, edge about 7%."""
    pays = sorted(set(range(1, 21)) | {25, 30, 40, 50, 60, 75, 100, 125, 150, 200, 250, 300, 400, 500, 750, 1000})
    scale = 10**7
    weights = [int(3.1e6 / (pay + 1) ** 2) for pay in pays] + [500_000]
    outcomes = [RoundOutcome(QQ(p), QQ(w, scale)) for p, w in zip(pays + [0], weights)]
    outcomes.append(RoundOutcome(QQ(-1), QQ(scale - sum(weights), scale)))
    return make_distribution("paytable (demo)", outcomes)


def q_system(distribution, goal):
    grid = make_grid(distribution, QQ(goal // 2), QQ(goal))
    outcomes = len(distribution.outcomes)
    chain = build_bankroll_chain(
        distribution, grid, np.ones((1, grid.width), dtype=np.int64), np.zeros((1, outcomes), dtype=np.int64)
    )
    return chain


def row(label, seconds, value, note=""):
    shown = f"{seconds:9.3f} s" if seconds is not None else "        - "
    print(f"  {label:<46} {shown}   {value:<24} {note}")


def main(quick: bool) -> None:
    wheel = parse_round_text(WHEEL)
    p, q = 18 / 37, 19 / 37
    print("Decimal engine (float64), timid play on an even-money wheel bet, bankroll = goal / 2")
    for goal in [10**4, 10**5] if quick else [10**4, 10**5, 10**6]:
        build, chain = timed(lambda g=goal: q_system(wheel, g))
        seconds, result = timed(lambda g=goal: analyse_session(wheel, SessionSettings(QQ(g // 2), QQ(g)), "timid"))
        rounds = result.figures["expected_rounds"].decimal
        z, a = goal // 2, goal
        r = q / p  # Feller ch. XIV (3.4), with (1 - r^z)/(1 - r^a) written as r^(z-a)(r^-z - 1)/(r^-a - 1)
        exact_rounds = z / (q - p) - a / (q - p) * r ** (z - a) * (r**-z - 1) / (r**-a - 1)
        row(
            f"ours, {goal:,} units (build {build:.2f} s)",
            seconds,
            f"E[rounds] {rounds:.10g}",
            f"closed form {exact_rounds:.10g}",
        )
    seconds, result = timed(lambda: analyse_session(wheel, SessionSettings(QQ(5 * 10**5), QQ(10**6)), "bold"))
    row(
        "ours, bold play, 1,000,000 units",
        seconds,
        f"P(goal) {result.figures['goal_probability'].decimal:.6f}",
        "Dubins-Savage: 18/37 = 0.486486",
    )
    size = 3000
    chain = q_system(wheel, size + 1)
    dense = np.eye(chain.size) - chain.q_matrix().toarray()
    rhs = np.ones(chain.size)
    seconds, solved = timed(lambda: np.linalg.solve(dense, rhs))
    row(f"dense numpy solve, {chain.size:,} states", seconds, f"E[rounds] {solved[chain.start]:.10g}")
    seconds, result = timed(
        lambda: analyse_session(wheel, SessionSettings(QQ((size + 1) // 2), QQ(size + 1)), "timid", exact_limit=0)
    )
    rounds = result.figures["expected_rounds"].decimal
    row(f"ours (decimal), {chain.size:,} states", seconds, f"E[rounds] {rounds:.10g}")
    q_matrix = chain.q_matrix()
    r_goal = np.asarray(chain.r_matrix()[:, chain.absorbing_kinds == 0].sum(axis=1)).ravel()

    def value_iteration(tolerance=1e-12, limit=200_000):
        h = np.zeros(chain.size)
        for sweep in range(limit):
            new = q_matrix @ h + r_goal
            if np.max(np.abs(new - h)) < tolerance:
                return sweep + 1, new
            h = new
        return limit, h

    seconds, (sweeps, h) = timed(value_iteration)
    truth = result.figures["goal_probability"].decimal
    row(
        f"value iteration, {chain.size:,} states",
        seconds,
        f"{sweeps:,} sweeps",
        f"P(goal) {h[chain.start]:.6g} vs {truth:.6g}",
    )

    print()
    print("Decimal engine, paytable with 38 outcomes and payouts up to 1000x, flat 1")
    table = paytable()
    print(f"  house edge {to_float(table.house_edge):.4f}")
    for goal in [10**4] if quick else [10**4, 10**5]:
        seconds, result = timed(lambda g=goal: analyse_session(table, SessionSettings(QQ(g // 2), QQ(g)), "flat:1"))
        row(
            f"ours, {goal:,} units",
            seconds,
            f"E[rounds] {result.figures['expected_rounds'].decimal:.8g}",
            f"E[net] = -edge x staked: {result.figures['expected_net'].decimal:.6g} "
            f"= {result.figures['edge_times_staked'].decimal:.6g}",
        )

    print()
    print("Exact engine (rationals), timid play on the wheel bet")
    for goal in (201, 1001, 2001):
        settings = SessionSettings(QQ(goal // 2), QQ(goal))
        seconds, result = timed(lambda s=settings: analyse_session(wheel, s, "timid"))
        row(
            f"ours, full session, {goal - 1:,} states",
            seconds,
            f"P(goal) {result.figures['goal_probability'].decimal:.6g}",
            f"exact: {result.exact}",
        )
    from oddsbench.solve.linear import factor_exact, identity_minus

    chain = q_system(wheel, 2001)
    q_rows, _ = chain.exact_rows()
    seconds, _ = timed(lambda: factor_exact(identity_minus(q_rows)).solve([QQ(1)] * chain.size))
    row("ours, ExactSparseLU one solve, 2,000 states", seconds, "E[rounds]")
    import sympy

    chain = q_system(wheel, 201)
    q_rows, _ = chain.exact_rows()
    n = chain.size
    matrix = sympy.zeros(n, n)
    for i, entries in enumerate(identity_minus(q_rows)):
        for j, value in entries.items():
            matrix[i, j] = sympy.Rational(int(value.numerator), int(value.denominator))
    seconds, _ = timed(lambda: matrix.LUsolve(sympy.ones(n, 1)))
    row(f"sympy Matrix.LUsolve, {n} states", seconds, "E[rounds]")
    seconds, _ = timed(lambda: factor_exact(identity_minus(q_rows)).solve([QQ(1)] * n))
    row(f"ours, ExactSparseLU one solve, {n} states", seconds, "E[rounds]")

    print()
    print("Optimiser (plan best), even-money wheel bet, bankroll 100, goal 200")
    seconds, result = timed(lambda: analyse_session(wheel, SessionSettings(QQ(100), QQ(200)), "best"))
    row(
        "ours, policy iteration + exact certificate",
        seconds,
        f"P(goal) {result.figures['goal_probability'].decimal:.6f}",
        "bold play: 0.486486",
    )


if __name__ == "__main__":
    main("--quick" in sys.argv)
