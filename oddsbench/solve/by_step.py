"""The chance of having ended in each end state by step N (``solve --rounds N``), within the work budget.

The distribution over states is stepped forward N times. In floating point each step is one
sparse product; once the mass left in transient states is exactly 0 (it underflows after a few
thousand steps in most rounds), or the numbers stop changing (a mass stuck at the bottom of the
float range), every further step gives the same numbers, so the loop stops there: ``--rounds
100000`` on the pass line costs what its first 3,000 steps cost. The steps still needed are
forecast from how fast the mass falls, and refused in one line when they would not fit the time
left. Exact products are the truth where they fit: their numbers grow by the bits of the
probabilities' denominators at every step, so their cost is estimated from that growth, and
they stop (decimals only, with a note) when exact arithmetic's share of the budget runs out.
"""

from __future__ import annotations

import math
import time
from collections.abc import Callable, Sequence

import numpy as np

from oddsbench.chain.round_chain import RoundChain
from oddsbench.model import budget
from oddsbench.model.numbers import QQ, Rational, denominator, to_float
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.linear.costs import ExactClock, ExactTooLarge, fastest

MAX_SAMPLE_BITS = 200_000_000  # numbers this large at the last step: hopeless without timing them
POLL_STEPS = 64
FORECAST_STEPS = 4 * POLL_STEPS  # how often the steps still needed are forecast
SMALLEST_FLOAT = 5e-324


def end_chances_by_step(
    chain: RoundChain, rounds: int, exact: bool, notes: list[str], should_stop: Callable[[], bool] | None
) -> tuple[list[Rational | None], np.ndarray]:
    """(exact chances or Nones, decimal chances) of being in each end state after ``rounds`` steps."""
    decimal = _floats(chain, rounds, should_stop)
    exact_values: list[Rational | None] = [None] * len(chain.ends)
    if exact:
        try:
            _require_exact(chain, rounds)
            exact_values = _exact(chain, rounds, should_stop)
        except ExactTooLarge as error:
            notes.append(
                f"chances by step {rounds:,}: exact products stopped: {error}; decimals are from the float engine"
            )
    return exact_values, decimal


def _floats(chain: RoundChain, rounds: int, should_stop: Callable[[], bool] | None) -> np.ndarray:
    from scipy.sparse import csr_matrix

    size, n = len(chain.names), chain.transient_count
    source = np.fromiter((e.source for e in chain.edges), dtype=np.int64, count=len(chain.edges))
    target = np.fromiter((e.target for e in chain.edges), dtype=np.int64, count=len(chain.edges))
    prob = np.fromiter((to_float(e.prob) for e in chain.edges), dtype=float, count=len(chain.edges))
    forward = csr_matrix((prob, (target, source)), shape=(size, n)).tocsr()  # transient mass to its next states
    state = np.zeros(size)
    state[0] = 1.0
    began = time.monotonic()
    earlier = (0, 1.0)  # (step, mass left in transient states) at the last forecast
    for step in range(rounds):
        if step % POLL_STEPS == 0:
            if should_stop is not None and should_stop():
                raise SolveCancelled
            budget.check(f"chances by step {rounds:,}")
            if step and step % FORECAST_STEPS == 0:
                mass = float(state[:n].sum())
                needed = min(rounds - step, _steps_to_drain(earlier, (step, mass)))
                each = (time.monotonic() - began) / step
                budget.require(f"stepping {needed:,} more rounds in floating point", seconds=needed * each)
                earlier = (step, mass)
        moved = forward @ state[:n]
        moved[n:] += state[n:]
        if not moved[:n].any() or np.array_equal(moved, state):  # every further step gives the same numbers
            state = moved
            break
        state = moved
    return state[n:]


def _steps_to_drain(earlier: tuple[int, float], now: tuple[int, float]) -> float:
    """Steps until the mass left in transient states underflows to 0, at the rate it fell lately
    (infinite when it does not fall)."""
    (first, before), (last, after) = earlier, now
    if after <= 0 or before <= 0 or after >= before or last <= first:
        return math.inf if after > 0 else 0
    rate = math.log(after / before) / (last - first)  # log of the factor per step, < 0
    return math.log(SMALLEST_FLOAT / after) / rate


def _require_exact(chain: RoundChain, rounds: int) -> None:
    require_exact_steps([edge.prob for edge in chain.edges], len(chain.edges), rounds, f"{rounds:,} exact steps")


def require_exact_steps(probabilities: Sequence[Rational], updates: int, steps: int, what: str) -> None:
    """``ExactTooLarge`` when ``steps`` exact steps of ``updates`` products each would not fit exact
    arithmetic's share of the time. Their numbers grow by the bits of the lcm ``D`` of the
    probabilities' denominators at each step: N steps cost about ``updates`` x N / 2 times one
    update at the last step's size, timed here on numbers of that size (D^N)."""
    current = budget.current()
    left = current.exact_left() if current is not None else math.inf
    if not math.isfinite(left) or not probabilities:
        return
    common = 1
    for prob in probabilities:
        common = math.lcm(common, int(denominator(prob)))
    growth = max(common.bit_length() - 1, 1)
    if steps * growth > MAX_SAMPLE_BITS:
        seconds = math.inf
    else:
        seconds = updates * steps / 2 * _update_seconds(common, steps, probabilities[0])
    if seconds > left:
        raise ExactTooLarge(
            f"{what} would take about {budget.seconds_text(seconds)} (their numbers grow by {growth} bits a "
            f"step), more than exact arithmetic's share of the time budget (raise it with {budget.TIME_OPTION})"
        )


def _update_seconds(common: int, steps: int, prob: Rational) -> float:
    """One ``total += weight * p`` on numbers the size they reach after ``steps`` steps."""
    size = common**steps
    weight, total = QQ(size // 3 + 1, size), QQ(size // 7 + 1, size // common + 1)  # unlike denominators
    return fastest(lambda: total + weight * prob)


def _exact(chain: RoundChain, rounds: int, should_stop: Callable[[], bool] | None) -> list[Rational]:
    size, n = len(chain.names), chain.transient_count
    values = [QQ(0)] * size
    values[0] = QQ(1)
    clock = ExactClock(should_stop, rounds, "products by step")
    for step in range(rounds):
        clock.tick(step)
        nxt = [QQ(0)] * n + values[n:]
        for edge in chain.edges:
            weight = values[edge.source]
            if weight != 0:
                nxt[edge.target] += weight * edge.prob
        values = nxt
        if all(value == 0 for value in values[:n]):
            break
    return values[n:]
