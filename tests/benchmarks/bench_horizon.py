"""Benchmark: ``oddsbench horizon`` at N = 10,000 rounds, beside a plain float baseline on the same law.

Run on demand: ``python tests/benchmarks/bench_horizon.py [--quick]`` (``--quick``: N = 1,000).

Problems: the pass line (nets -1 and 1) and a 38-outcome paytable (an invented 38-pocket prize
wheel, demo data: 20 pockets lose the stake, the others pay 1, 3, ..., 35 to 1). Columns: the whole
question through the core (the round solved, its net law, the law after N rounds, every figure),
the law and its figures alone (exact or float, as the limits choose), our float law alone (FFT
convolution by repeated squaring), and the baseline: numpy's direct convolution (``np.convolve``)
by repeated squaring in floats on the same lattice law, the obvious way to write it; then the
ratio baseline / our float law and the difference between the chances ahead. One run each, on a
shared machine: the ratios are what to read.
"""

from __future__ import annotations

import sys
import time
from functools import partial
from pathlib import Path

import numpy as np

from oddsbench.core import game_from_text, horizon, load_game
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve import horizon as engine

RULESETS = Path(__file__).resolve().parent.parent.parent / "rulesets"


def prize_wheel() -> str:
    """An invented 38-pocket prize wheel (demo data): one outcome per pocket."""
    outcomes = []
    for pocket in range(38):
        pay = -1 if pocket < 20 else 2 * (pocket - 20) + 1
        target = "lost" if pay < 0 else "won"
        outcomes.append(f'  {{ to = "{target}", prob = "1/38", pay = {pay}, note = "pocket {pocket}" }},')
    return "\n".join(
        [
            "[ruleset]",
            'title = "Prize wheel, 38 pockets (invented demo)"',
            'start = "spin"',
            "[states.spin]",
            "outcomes = [",
            *outcomes,
            "]",
            "[states.won]",
            'result = "win"',
            "[states.lost]",
            'result = "loss"',
        ]
    )


def numpy_direct(lattice: engine.Lattice, n: int) -> np.ndarray:
    """The baseline: the lattice law to the n-th power by repeated squaring with np.convolve (direct)."""
    base = np.array(lattice.weights, dtype=float) / lattice.denominator
    result, square = np.ones(1), base
    while True:
        if n & 1:
            result = np.convolve(result, square)
        n >>= 1
        if not n:
            return result
        square = np.convolve(square, square)


def timed(action):
    began = time.perf_counter()
    value = action()
    return value, time.perf_counter() - began


def main() -> None:
    rounds = 1_000 if "--quick" in sys.argv else 10_000
    problems = (
        ("pass line", load_game(RULESETS / "pass-line.toml")),
        ("38-outcome prize wheel", game_from_text(prize_wheel(), "prize-wheel.toml")),
    )
    print(f"horizon at N = {rounds:,} rounds: ours beside numpy's direct convolution (repeated squaring, floats)")
    print(
        f"{'problem':<24} {'totals':>9} {'law':>6} {'question s':>11} {'law s':>8} {'float law s':>12} "
        f"{'numpy s':>9} {'numpy/float':>12}  |ahead - numpy's|"
    )
    warm = horizon(problems[0][1], (2,))  # imports (sympy, flint, scipy) before any timing
    engine._float_law(engine.lattice_of(warm.law), 2, None)
    for name, game in problems:
        results, question = timed(partial(horizon, game, (rounds,)))
        (h,) = results.horizons
        lattice = engine.lattice_of(results.law)
        staked = None if results.expected_staked is None else results.expected_staked.exact
        _, law_seconds = timed(partial(engine.horizons, results.law, staked, (rounds,)))
        floated, float_seconds = timed(partial(engine._float_law, lattice, rounds, None))
        law, baseline = timed(partial(numpy_direct, lattice, rounds))
        _, _, above = engine._around_zero(h.low, h.step, h.support)
        gap = abs(float(law[above:].sum()) - h.ahead.decimal)
        print(
            f"{name:<24} {h.support:>9,} {h.method:>6} {question:>11.3f} {law_seconds:>8.3f} {float_seconds:>12.3f} "
            f"{baseline:>9.3f} {baseline / float_seconds:>11.1f}x  {gap:.1e}"
        )
    exact_rounds = 1_000
    law = [(QQ(1), QQ(244, 495)), (QQ(-1), QQ(251, 495))]
    (h,), seconds = timed(lambda: engine.horizons(law, QQ(1), (exact_rounds,)))
    print(
        f"\nexact law of the pass line at N = {exact_rounds:,}: {seconds:.3f} s "
        f"(chance ahead {to_float(h.ahead.exact):.6f}, its fraction {len(str(h.ahead.exact)):,} characters)"
    )


if __name__ == "__main__":
    main()
