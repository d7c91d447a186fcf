"""Endless play with a bounded progression (martingale or paroli with a series cap).

The bet depends on the plan's state (its place in the series), so the bankroll is a random walk
modulated by a finite Markov chain: a Markov additive process. Above the level K where every
bet of the plan is covered, the moves do not depend on the bankroll. We answer by truncation,
with a proved error bound:

* Verdict: with pi the stationary law of the plan's states and m_j the expected result in
  state j, the long-run drift is sum_j pi_j m_j. Drift <= 0 (and a plan chain that returns to
  every state): ruin is certain. Drift > 0: ruin is possible.
* Lundberg for a modulated walk: if R > 0 and h > 0 satisfy sum_o p_o e^{-R x_jo} h(next_jo)
  <= h(j) for every state j, then h(J_n) e^{-R Z_n} is a supermartingale above K, so from level
  y in state j the chance of ever falling below K is at most h(j) / min h * e^{-R (y - K + 1)}.
  We find R and h in floats and then verify the inequality in ball arithmetic (arb); only a
  verified pair is used.
* P(ruin before the bankroll reaches G) is a finite first-step system (exact for small systems,
  floats otherwise); it rises to the answer and the gap is at most max h / min h e^{-R (G-K+1)}.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence
from dataclasses import dataclass

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, denominator, numerator, text
from oddsbench.solve import unbounded_ruin as ur

Move = tuple[int, Rational, int]  # (jump in grid steps, chance, next plan state)
MAX_MODULATED_STATES = 400_000
EXACT_WORK = 5_000_000  # states^2 x band: larger truncations are solved in floats (~0.5 s)


@dataclass(frozen=True)
class ModulatedRuin:
    """The ruin figures of a modulated walk, from one level and plan state."""

    verdict: str  # certain | possible
    reason: str
    drift: Rational  # long-run expected result per round (grid steps), exact
    ruin: ur.Certified
    lower: Rational | None  # exact P(ruin before the goal), when solved exactly
    goal: int
    gap_bound: ur.Certified | None
    adjustment_coefficient: float | None  # verified R (per grid step)
    lundberg: ur.Certified | None  # h(j0)/min h x exp(-R (level - K + 1)): an upper bound
    arithmetic: str  # "exact" or "floating point"
    method: str


def stationary_drift(states: int, moves_top: Sequence[Sequence[Move]]) -> Rational:
    """Exact long-run expected result per round: pi P = pi, sum pi = 1, drift = sum pi_j m_j."""
    from oddsbench.solve.linear import factor_exact

    matrix = [[QQ(0)] * states for _ in range(states)]
    means = [QQ(0)] * states
    for j, moves in enumerate(moves_top):
        for jump, chance, nxt in moves:
            matrix[j][nxt] += chance
            means[j] += QQ(jump) * chance
    # rows of (P^T - I) with the last equation replaced by sum pi = 1
    system = [[matrix[c][r] - (QQ(1) if r == c else QQ(0)) for c in range(states)] for r in range(states)]
    system[-1] = [QQ(1)] * states
    rows = [{c: value for c, value in enumerate(row) if value != 0} for row in system]
    pi = factor_exact(rows, method="dense").solve([QQ(0)] * (states - 1) + [QQ(1)])
    return sum((pi[j] * means[j] for j in range(states)), QQ(0))


def _tilted(moves_top, states: int, rate: float):
    import numpy as np

    matrix = np.zeros((states, states))
    for j, moves in enumerate(moves_top):
        for jump, chance, nxt in moves:
            matrix[j, nxt] += float(chance) * math.exp(-rate * jump)
    return matrix


def _verified_lundberg(moves_top, states: int):
    """(R, h) with the supermartingale inequality verified in ball arithmetic, or None."""
    import numpy as np
    from flint import arb

    def radius(rate: float) -> float:
        return float(max(abs(np.linalg.eigvals(_tilted(moves_top, states, rate)))))

    low, high = 0.0, 1.0
    while radius(high) < 1 and high < 1e3:
        high *= 2
    if radius(high) < 1:
        return None
    for _ in range(80):
        mid = (low + high) / 2
        if radius(mid) < 1:
            low = mid
        else:
            high = mid
    for shrink in (1e-6, 1e-4, 1e-2, 1e-1):
        rate = low * (1 - shrink)
        values, vectors = np.linalg.eig(_tilted(moves_top, states, rate))
        k = int(np.argmax(abs(values)))
        h = np.abs(np.real(vectors[:, k]))
        if h.min() <= 0:
            continue
        h = h / h.min()
        scaled = int(rate * 2**40)  # R as a dyadic rational, slightly below the float found
        with ur._precision(128):
            rate_ball = arb(scaled) / arb(2) ** 40
            ok = True
            for j, moves in enumerate(moves_top):
                total = arb(0)
                for jump, chance, nxt in moves:
                    total += ur._arb_of(chance) * (-rate_ball * jump).exp() * arb(float(h[nxt]))
                if not total <= arb(float(h[j])):
                    ok = False
                    break
        if ok:
            return scaled / 2**40, [float(x) for x in h]
    return None


def solve_modulated_ruin(
    states: int,
    moves_at: Callable[[int, int], Sequence[Move]],
    top: int,
    level: int,
    start_state: int = 0,
    digits: int = 15,
    should_stop: Callable[[], bool] | None = None,
) -> ModulatedRuin:
    """Ruin from ``level`` (grid steps above the ruin line) in plan state ``start_state``.

    ``moves_at(k, j)`` lists the moves from level k in plan state j; from ``top`` up they must not
    depend on k.
    """
    moves_top = [tuple(moves_at(top, j)) for j in range(states)]
    drift = stationary_drift(states, moves_top)
    if drift <= 0:
        reason = (
            f"the long-run expected result per round of the progression is {text(drift)} grid steps (<= 0): "
            "the bankroll returns below every level, so ruin comes with probability 1"
        )
        return ModulatedRuin(
            "certain",
            reason,
            drift,
            ur._certified_exact(QQ(1), digits),
            QQ(1),
            0,
            None,
            None,
            None,
            "exact",
            "long-run drift of the progression <= 0",
        )
    found = _verified_lundberg(moves_top, states)
    if found is None:
        raise OddsbenchError("no verified adjustment coefficient for this progression: cannot bound the answer")
    rate, h = found
    spread = max(h) / min(h)
    lundberg_value = h[start_state] * math.exp(-rate * max(level - top + 1, 0))
    target = 1e-12
    goal = top + max(level, 1) + math.ceil((math.log(spread) - math.log(target)) / rate)
    size = (goal - 1) * states
    if size > MAX_MODULATED_STATES:
        raise OddsbenchError(
            f"the truncation needs {size:,} states for an error bound of {target:g}; the limit is "
            f"{MAX_MODULATED_STATES:,} (the edge is too small for this progression)"
        )
    band = states * (1 + max(abs(jump) for moves in moves_top for jump, _, _ in moves))
    gap = spread * math.exp(-rate * (goal - top + 1))
    if size * size * band <= EXACT_WORK:
        lower = _ruin_before_goal_exact(states, moves_at, level, start_state, goal, should_stop)
        with ur._precision(ur._bits_for(digits, goal)):
            from flint import arb

            low = ur._arb_of(lower)
            ball = arb(low.mid() + gap / 2, gap / 2 + low.rad())
            ruin = ur._certified(ball, digits)
        arithmetic = "exact"
    else:
        lower = None
        value = _ruin_before_goal_float(states, moves_at, level, start_state, goal)
        ruin = ur.Certified(f"{value + gap / 2:.10g}", f"{gap / 2 + 1e-11:.2g}", math.log10(max(value, 1e-300)), value)
        arithmetic = "floating point"
    reason = (
        f"the long-run expected result per round of the progression is {text(drift)} grid steps (> 0): ruin is "
        "possible but not certain; the figure is the minimal solution, by truncation with a proved bound"
    )
    return ModulatedRuin(
        "possible",
        reason,
        drift,
        ruin,
        lower,
        goal,
        ur.Certified(f"{gap:.3g}", "0", math.log10(gap) if gap > 0 else -math.inf, gap),
        rate,
        ur.Certified(f"{min(lundberg_value, 1.0):.6g}", "0", math.log10(max(lundberg_value, 1e-300)), lundberg_value),
        arithmetic,
        f"truncation at a goal of {goal} steps ({arithmetic} arithmetic); gap at most max h / min h x "
        "exp(-R (goal - K + 1)) with R and h verified in ball arithmetic",
    )


def _rows(states: int, moves_at, goal: int, exact: bool):
    rows, rhs = [], []
    for k in range(1, goal):
        for j in range(states):
            i = (k - 1) * states + j
            row = {i: QQ(1) if exact else 1.0}
            ruin_now = QQ(0) if exact else 0.0
            for jump, chance, nxt in moves_at(k, j):
                p = chance if exact else float(chance)
                t = k + jump
                if t <= 0:
                    ruin_now += p
                elif t < goal:
                    col = (t - 1) * states + nxt
                    row[col] = row.get(col, 0) - p
            rows.append(row)
            rhs.append(ruin_now)
    return rows, rhs


def _ruin_before_goal_exact(states, moves_at, level, start_state, goal, should_stop=None) -> Rational:
    from oddsbench.solve.linear import factor_exact

    rows, rhs = _rows(states, moves_at, goal, exact=True)
    rows = [{c: QQ(v) for c, v in row.items()} for row in rows]
    return factor_exact(rows, should_stop=should_stop).solve(rhs)[(level - 1) * states + start_state]


def _ruin_before_goal_float(states, moves_at, level, start_state, goal) -> float:
    import numpy as np
    from scipy.sparse import csc_matrix

    from oddsbench.solve.linear import factor_float

    rows, rhs = _rows(states, moves_at, goal, exact=False)
    r, c, v = [], [], []
    for i, row in enumerate(rows):
        for j, value in row.items():
            r.append(i), c.append(j), v.append(value)
    size = len(rows)
    solution = factor_float(csc_matrix((v, (r, c)), shape=(size, size))).solve(np.array(rhs))
    return float(solution[(level - 1) * states + start_state])


def describe(value: Rational) -> str:
    return text(value) if max(numerator(value).bit_length(), denominator(value).bit_length()) < 200 else "rational"
