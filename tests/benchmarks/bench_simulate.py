"""Benchmark: simulated rounds per second on one core, beside the goal of millions per second.

Run on demand: ``python tests/benchmarks/bench_simulate.py [--quick]``. Each game is simulated
at a fixed seed after a warm-up; the figure is rounds (and chain steps) per second of wall time.
"""

from __future__ import annotations

import sys
import time
from pathlib import Path

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.simulate.round_sim import simulate_round

RULESETS = Path(__file__).resolve().parent.parent.parent / "rulesets"
GAMES = ("single-zero-wheel.toml", "field.toml", "pass-line.toml", "deuce-game.toml", "lantern-dice.toml")
GOAL_ROUNDS_PER_SECOND = 1_000_000  # the aim: "millions of simple rounds per second on one core"


def main() -> None:
    trials = 1_000_000 if "--quick" in sys.argv else 5_000_000
    print(f"simulated rounds per second, {trials:,} trials each, one process (goal >= {GOAL_ROUNDS_PER_SECOND:,})")
    print(f"{'game':<28} {'rounds/s':>12} {'steps/s':>12} {'seconds':>8}  vs goal")
    for name in GAMES:
        chain = build_round_chain(load_ruleset(RULESETS / name))
        simulate_round(chain, 10_000, 0)
        began = time.perf_counter()
        sample = simulate_round(chain, trials, 1)
        seconds = time.perf_counter() - began
        rate = trials / seconds
        verdict = "meets" if rate >= GOAL_ROUNDS_PER_SECOND else "below"
        print(f"{name:<28} {rate:>12,.0f} {sample.steps_taken / seconds:>12,.0f} {seconds:>8.2f}  {verdict}")
    sessions(trials // 10)


def sessions(trials: int) -> None:
    """Whole sessions: each round played on the round chain; figure is session rounds per second."""
    from oddsbench.model.numbers import QQ
    from oddsbench.simulate.round_sim import RoundPlayer
    from oddsbench.simulate.session_sim import simulate_session
    from oddsbench.solve.round_distribution import round_distribution
    from oddsbench.strategy.session import SessionSettings, session_chain

    print(f"\nsimulated sessions, {trials:,} per plan, one process")
    print(f"{'game, plan, bankroll -> goal':<44} {'rounds/s':>12} {'sessions/s':>12} {'seconds':>8}")
    cases = (
        ("single-zero-wheel.toml", "flat:1", 10, 20),
        ("single-zero-wheel.toml", "bold", 10, 100),
        ("pass-line.toml", "flat:1", 10, 20),
        ("lantern-dice.toml", "martingale:1:4", 20, 40),
    )
    for name, plan, bankroll, goal in cases:
        chain = build_round_chain(load_ruleset(RULESETS / name))
        distribution = round_distribution(chain)
        settings = SessionSettings(QQ(bankroll), QQ(goal))
        bankroll_chain = session_chain(distribution, settings, plan, 5_000).chain
        player = RoundPlayer.of(chain)
        began = time.perf_counter()
        sample = simulate_session(bankroll_chain, trials, 1, player, plan=plan)
        seconds = time.perf_counter() - began
        label = f"{name}, {plan}, {bankroll} -> {goal}"
        print(f"{label:<44} {sample.rounds_played / seconds:>12,.0f} {trials / seconds:>12,.0f} {seconds:>8.2f}")


if __name__ == "__main__":
    main()
