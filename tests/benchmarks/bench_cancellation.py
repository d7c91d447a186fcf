"""How soon a cancelled exact round solve stops (run on demand; the tests check it in work, not time).

    python tests/benchmarks/bench_cancellation.py [--quick]

For an invented subfair walk (18/37 up, the rest down) of N states: the baseline is the whole
exact solve run to its end; ours is the time from the moment ``should_stop`` first answers yes
to the moment ``SolveCancelled`` reaches the caller, with the stop asked at several moments of
the solve. A stop asked after the factorisation is only seen if the later phases check too.
The second table does the same for a walk whose up-chance has a 60-digit denominator: its factors
are small but its solves work on numbers that grow row by row, so there the stop lands in a solve.
"""

from __future__ import annotations

import sys
import time

import oddsbench  # noqa: F401  (sets FLINT ground types before sympy loads)
from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.numbers import QQ
from oddsbench.model.ruleset import Outcome, Ruleset, State
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.round import solve_round

UP = QQ(18, 37)
LONG_UP = QQ(10**59 + 12_345, 2 * 10**59 + 7)  # invented: a 60-digit denominator


def walk(goal: int, up: QQ = UP) -> Ruleset:
    """A +1/-1 walk on 0..goal from the middle, built directly (no file size limit)."""
    states = [
        State(
            name=f"b{z}", outcomes=(Outcome(f"b{z + 1}", up, QQ(1), QQ(0)), Outcome(f"b{z - 1}", 1 - up, QQ(-1), QQ(0)))
        )
        for z in range(1, goal)
    ]
    states += [State(name="b0", result="ruin"), State(name=f"b{goal}", result="goal")]
    return Ruleset(title="walk", start=f"b{goal // 2}", stake=QQ(1), states=tuple(states))


def stop_latency(chain, after: float) -> tuple[float, bool]:
    """Ask to stop ``after`` seconds into the solve: (seconds from that moment to the end, cancelled?)."""
    began = time.perf_counter()
    asked_at: list[float] = []

    def should_stop() -> bool:
        now = time.perf_counter()
        if now - began >= after:
            asked_at.append(asked_at[0] if asked_at else began + after)
            return True
        return False

    try:
        solve_round(chain, exact_limit=10**6, should_stop=should_stop)
        cancelled = False
    except SolveCancelled:
        cancelled = True
    end = time.perf_counter()
    return end - (asked_at[0] if asked_at else began + after), cancelled


def main() -> None:
    quick = "--quick" in sys.argv
    table(((1_000,) if quick else (1_000, 3_000)), UP, "up 18/37")
    table(((200,) if quick else (200, 400)), LONG_UP, "up with a 60-digit denominator")


def table(sizes: tuple[int, ...], up: QQ, label: str) -> None:
    header = f"{'states':>7s} {'full solve (s)':>15s} {'stop asked at (s)':>18s} {'stopped after (s)':>18s}"
    print(f"walk, {label}")
    print(header + f" {'ratio':>7s}  how")
    for size in sizes:
        chain = build_round_chain(walk(size, up), max_states=10**6)
        start = time.perf_counter()
        solve_round(chain, exact_limit=10**6)
        full = time.perf_counter() - start
        for fraction in (0.01, 0.5):
            latency, cancelled = stop_latency(chain, fraction * full)
            how = "cancelled" if cancelled else "ran to its end (no check in this phase)"
            print(f"{size:7,d} {full:15.3f} {fraction * full:18.3f} {latency:18.3f} {latency / full:7.3f}  {how}")


if __name__ == "__main__":
    main()
