"""Play with no goal under a bounded progression (martingale or paroli with a series cap).

The bet depends on the plan's state (its place in the series), so the bankroll is a random walk
modulated by a finite Markov chain: a Markov additive process. Above the level K where every
bet of the plan is covered, the moves do not depend on the bankroll. We answer by truncation,
with a proved error bound:

* Verdict: with pi the stationary law of the plan's states and m_j the expected result in
  state j, the long-run drift is sum_j pi_j m_j. Drift <= 0 (and a plan chain that returns to
  every state): ruin is certain. Drift > 0: ruin is possible.
* Lundberg for a modulated walk (Asmussen and Albrecher, Ruin Probabilities, ch. VII): if R > 0
  and h > 0 satisfy sum_o p_o e^{-R x_jo} h(next_jo) <= h(j) for every state j, then
  h(J_n) e^{-R Z_n} is a supermartingale above K, so from level y in state j the chance of ever
  falling below K is at most h(j) / min h * e^{-R (y - K + 1)}. We find R and h in floats and
  then verify the inequality in ball arithmetic (arb); only a verified pair is used.
* P(ruin before the bankroll reaches G) is a finite first-step system (exact for small systems,
  floats otherwise); it rises to the answer and the gap is at most max h / min h e^{-R (G-K+1)}.
"""

from __future__ import annotations

import math
from collections.abc import Callable, Sequence

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, Rational, text
from oddsbench.solve.cancel import StopCheck
from oddsbench.solve.ruin.balls import (
    Certified,
    arb_of,
    bits_for,
    cancellable,
    certified,
    certified_exact,
    current_stop,
    error_bound_text,
    interval,
    precision,
)
from oddsbench.solve.ruin.law import Law, ceil_div, largest_loss, law_step, reduced_law
from oddsbench.solve.ruin.result import (
    PROGRESSION,
    VERDICT_CERTAIN,
    VERDICT_POSSIBLE,
    NoGoalRuin,
    RoundsToRuin,
    WalkFacts,
    no_goal_ruin,
    settled_ruin,
)

Move = tuple[int, Rational, int]  # (jump in grid steps, chance, next plan state)
MAX_MODULATED_STATES = 400_000
EXACT_WORK = 5_000_000  # states^2 x band: larger truncations are solved in floats (~0.5 s)
PROGRESSION_DIGITS = 15  # a truncation in floats can vouch for no more
NO_VARIANCE = "the law of a round changes with the plan's place in the series: no single variance"
NO_DIFFUSION = "not given for progressions"
AS_TRUNCATION = "the progression's answer is itself a truncation at a far goal (see its method)"


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


MAX_EXPONENT = 600.0  # exp(-R x jump) is capped here: a tilt that large only says "radius past 1"


def _tilted(moves_top, states: int, rate: float):
    import numpy as np

    matrix = np.zeros((states, states))
    for j, moves in enumerate(moves_top):
        for jump, chance, nxt in moves:
            matrix[j, nxt] += float(chance) * math.exp(min(-rate * jump, MAX_EXPONENT))
    return matrix


def verified_lundberg(moves_top, states: int):
    """(R, h) with the supermartingale inequality verified in ball arithmetic, or None."""
    import numpy as np
    from flint import arb

    def radius(rate: float) -> float:
        try:
            found = float(max(abs(np.linalg.eigvals(_tilted(moves_top, states, rate)))))
        except np.linalg.LinAlgError:  # entries near the float limit: the radius is past 1 anyway
            return math.inf
        return found if math.isfinite(found) else math.inf

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
        with precision(128):
            rate_ball = arb(scaled) / arb(2) ** 40
            ok = True
            for j, moves in enumerate(moves_top):
                total = arb(0)
                for jump, chance, nxt in moves:
                    total += arb_of(chance) * (-rate_ball * jump).exp() * arb(float(h[nxt]))
                if not total <= arb(float(h[j])):
                    ok = False
                    break
        if ok:
            return scaled / 2**40, [float(x) for x in h]
    return None


def solve_progression_ruin(
    states: int,
    moves_at: Callable[[int, int], Sequence[Move]],
    top: int,
    level: int,
    full_bet_law: Law,
    start_state: int = 0,
    digits: int = PROGRESSION_DIGITS,
    unit_name: str = "grid steps",
    notes: Sequence[str] = (),
    should_stop: StopCheck = None,
) -> NoGoalRuin:
    """Ruin from ``level`` (grid steps above the ruin line) in plan state ``start_state``.

    ``moves_at(k, j)`` lists the moves from level k in plan state j; from ``top`` up they must not
    depend on k. ``full_bet_law`` is the law of the plan's largest bet (shown with the walk);
    ``unit_name`` names the grid step in the reason.
    """
    with cancellable(should_stop):
        return _solve(states, moves_at, top, level, full_bet_law, start_state, digits, unit_name, notes)


def _solve(states, moves_at, top, level, full_bet_law, start_state, digits, unit_name, notes) -> NoGoalRuin:
    digits = min(digits, PROGRESSION_DIGITS)
    moves_top = [tuple(moves_at(top, j)) for j in range(states)]
    drift = stationary_drift(states, moves_top)
    every_jump = tuple(sorted({(jump, QQ(0)) for moves in moves_top for jump, _, _ in moves}))
    step = law_step(every_jump)
    facts = WalkFacts(
        PROGRESSION,
        level,
        full_bet_law,
        step,
        ceil_div(level, step),
        drift,
        None,
        largest_loss(reduced_law(every_jump, step)),
    )
    if drift <= 0:
        return settled_ruin(
            facts,
            verdict=VERDICT_CERTAIN,
            ruin=QQ(1),
            reason=(
                f"the long-run expected result per round of the progression is {text(drift)} {unit_name} (<= 0): "
                "the bankroll returns below every level, so ruin comes with probability 1"
            ),
            method="long-run drift of the progression <= 0",
            diffusion_reason=NO_DIFFUSION,
            rounds=RoundsToRuin(
                "finite" if drift < 0 else "infinite",
                None,
                None,
                None,
                None,
                "finite for a losing progression (not computed for progressions)"
                if drift < 0
                else "fair progression: ruin is certain but its expected time is infinite",
            ),
            notes=notes,
            digits=digits,
            more_absent={"variance": NO_VARIANCE},
        )
    found = verified_lundberg(moves_top, states)
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
        lower = progression_ruin_before_goal(states, moves_at, level, start_state, goal)
        with precision(bits_for(digits, goal)):
            from flint import arb

            ruin = certified(interval(arb_of(lower), arb(gap)), digits)
        arithmetic = "exact"
    else:
        value = _ruin_before_goal_float(states, moves_at, level, start_state, goal)
        ruin = Certified(f"{value + gap / 2:.10g}", f"{gap / 2 + 1e-11:.2g}", math.log10(max(value, 1e-300)), value)
        arithmetic = "floating point"
    gap_bound = Certified(f"{gap:.3g}", "0", math.log10(gap) if gap > 0 else -math.inf, gap)
    lundberg = Certified(
        f"{min(lundberg_value, 1.0):.6g}", "0", math.log10(max(lundberg_value, 1e-300)), lundberg_value
    )
    interval_only = "known only inside a proved interval (truncation at a far goal)"
    return no_goal_ruin(
        facts,
        verdict=VERDICT_POSSIBLE,
        reason=(
            f"the long-run expected result per round of the progression is {text(drift)} {unit_name} (> 0): ruin "
            "is possible but not certain; the figure is the minimal solution, by truncation with a proved bound"
        ),
        ruin=ruin,
        exact_text="interval (truncation)",
        method=(
            f"truncation at a goal of {goal} steps ({arithmetic} arithmetic); gap at most max h / min h x "
            "exp(-R (goal - K + 1)) with R and h verified in ball arithmetic"
        ),
        error_bound=error_bound_text(ruin.radius, f"truncation gap {gap_bound.text}, proved"),
        adjustment_coefficient=certified_exact(QQ(int(rate * 2**40), 2**40), 10),
        adjustment_text="verified R (dyadic)",
        lundberg=lundberg,
        lundberg_text=(
            "h(start) / min h x exp(-R x (bankroll - levels with cut bets)), R and h verified for the modulated "
            "walk: an upper bound"
        ),
        lundberg_exact_text="h(j)/min h x exp(-R d)",
        rounds_to_ruin=RoundsToRuin(
            "not defined", None, None, None, None, "ruin is not certain: the plain expected time to ruin is infinite"
        ),
        notes=notes,
        digits=digits,
        absent={
            "variance": NO_VARIANCE,
            "ruin_exact": interval_only,
            "ruin_closed_form": interval_only,
            "theta": "a progression has no single characteristic root: its law changes with the plan's state",
            "diffusion": NO_DIFFUSION,
            "diffusion_ratio": NO_DIFFUSION,
            "rounds_if_ruined": "not computed for progressions",
            "truncation": AS_TRUNCATION,
        },
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


def progression_ruin_before_goal(states, moves_at, level, start_state, goal) -> Rational:
    """Exact P(ruin before the bankroll reaches ``goal``) of a modulated walk (first-step analysis)."""
    from oddsbench.solve.linear import factor_exact

    rows, rhs = _rows(states, moves_at, goal, exact=True)
    rows = [{c: QQ(v) for c, v in row.items()} for row in rows]
    return factor_exact(rows, should_stop=current_stop()).solve(rhs)[(level - 1) * states + start_state]


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
