"""Tune on an equation whose one high-degree factor has many real roots (run on demand).

    python tests/benchmarks/bench_tune_roots.py [--quick]

The case (invented): an even-chance round whose win pays T_n(x), the Chebyshev polynomial of
degree n, and loses nothing; the target expected_net = 1/7 asks for T_n(x) = 2/7, whose n real
roots lie in (-1, 1) (T_n(cos t) = cos nt). Every root is certified and, when the win chance is x
too (so the valid range is x in [0, 1]), every root's validity signs are taken on the same factor.
The baseline finds the factor's roots afresh for each of these asks (as before the roots were
kept per factor and precision, ``solve/rational_function.py``); ours finds them once per precision.
Both from one run, in this process (past degree 40 each finding runs in a child process).
"""

from __future__ import annotations

import sys
import time

import oddsbench
from oddsbench.solve import rational_function


def chebyshev(n: int) -> list[int]:
    """T_n's integer coefficients, lowest power first (sympy's own, exact)."""
    from sympy import chebyshevt_poly

    return [int(c) for c in reversed(chebyshevt_poly(n, polys=True).all_coeffs())]


def ruleset(n: int, chance_is_x: bool) -> str:
    pays = " + ".join(f"({c})*x^{i}" for i, c in enumerate(chebyshev(n)) if c)
    win, lose = ('"x"', '"1 - x"') if chance_is_x else ('"1/2"', '"1/2"')
    return f"""[ruleset]
title = "polynomial payout {n}"
start = "spin"
stake = 1
[params]
x = "1/5"
[states.spin]
outcomes = [
  {{ to = "won", prob = {win}, pay = "{pays}" }},
  {{ to = "lost", prob = {lose}, pay = "0" }},
]
[states.won]
result = "win"
[states.lost]
result = "loss"
"""


def timed(game, uncached: bool) -> tuple[float, int]:
    found = rational_function._roots_at
    rational_function._roots_at.cache_clear()
    if uncached:  # the baseline: every ask finds the roots again
        rational_function._roots_at = found.__wrapped__
    try:
        began = time.perf_counter()
        results = _tune(game)
        return time.perf_counter() - began, len(results.values)
    finally:
        rational_function._roots_at = found


def _tune(game):
    from oddsbench import core
    from oddsbench.model.budget import Budget

    # the baseline of the largest case runs past the default 50 s budget on a busy machine
    return core.tune(game, "x", core.parse_target("expected_net=1/7"), work=core.Work(budget=Budget(3_600)))


def main() -> None:
    degrees = (45,) if "--quick" in sys.argv else (45, 60)
    print(f"{'case':<28}{'roots':>6}{'baseline s':>12}{'ours s':>10}{'ratio':>8}")
    for n in degrees:
        for chance_is_x in (False, True):
            game = oddsbench.loads(ruleset(n, chance_is_x), f"cheb{n}.toml")
            base, count = timed(game, uncached=True)
            ours, again = timed(game, uncached=False)
            assert count == again
            label = f"T_{n}, win chance {'x' if chance_is_x else '1/2'}"
            print(f"{label:<28}{count:>6}{base:>12.2f}{ours:>10.2f}{base / ours:>8.1f}")


if __name__ == "__main__":
    main()
