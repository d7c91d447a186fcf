"""The absorbing solve of a session: one factorisation for every figure of the whole session.

With N = (I - Q)^-1 over the transient (bankroll, level) states and R the one-round chances of
being absorbed, the chance of reaching the goal from every bankroll is N r_goal, the expected
number of rounds N 1 (second moment N (2t - 1)), the expected total staked N s. One transposed
solve from the start, v = N^T e_start (expected visits), gives the whole distribution of the
final bankroll at once: P(end at a) = sum_i v_i R[i, a]. Floats and exact rationals go through
the front doors of ``solve/linear``: a band LU where the chain's band can be stored, else SuperLU
eliminating bankroll levels from the top. The rounds' variance is solved for directly (its own
right-hand side, ``centred_rhs``), never as E[T^2] - E[T]^2. Skip-free walks go to ``session_walk``.
"""

from __future__ import annotations

import numpy as np

from oddsbench.chain.bankroll import GOAL, BankrollChain
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve.bankroll_system import float_system
from oddsbench.solve.linear import factor_exact, factor_float, identity_minus


def rhs_columns(chain: BankrollChain):
    """Per transient state: one-round chance of reaching the goal, and money staked per round."""
    grid = chain.grid
    goal_columns = chain.absorbing_kinds == GOAL
    staked_unit = grid.unit * chain.distribution.expected_staked
    return goal_columns, staked_unit


def absorbing_decimal(chain: BankrollChain, should_stop=None) -> dict:
    n = chain.size
    goal_columns, staked_unit = rhs_columns(chain)
    values = chain.absorbing_values.astype(float) * to_float(chain.grid.step)
    if n == 0:
        return {"absorbed": np.zeros(len(values)), "start_absorbed": True, "series": np.zeros(0)}
    r = chain.r_matrix()
    lu = factor_float(*float_system(chain), should_stop=should_stop)
    r_goal = np.asarray(r[:, goal_columns].sum(axis=1)).ravel()
    staked = chain.bets.astype(float) * to_float(staked_unit)
    solved = lu.solve(np.column_stack([r_goal, np.ones(n), staked]))
    h, t, s = solved[:, 0], solved[:, 1], solved[:, 2]
    start = max(chain.start, 0)
    spread = lu.solve(centred_rhs(chain, t))
    visits = lu.solve_transposed(unit_vector(n, start))
    absorbed = r.T @ visits
    return {
        "absorbed": absorbed,
        "rounds": t[start],
        "rounds_second": spread[start] + t[start] ** 2,
        "rounds_variance": spread[start],
        "staked": s[start],
        "playing": np.zeros(0),
        "series": h,
        "values": values,
        "method": lu.method,
    }


def absorbing_exact(chain: BankrollChain, should_stop) -> dict | None:
    n = chain.size
    goal_columns, staked_unit = rhs_columns(chain)
    q_rows, r_rows = chain.exact_rows()
    if n == 0:
        return None
    lu = factor_exact(identity_minus(q_rows), should_stop=should_stop)
    goal_set = set(np.flatnonzero(goal_columns).tolist())
    r_goal = [sum((p for a, p in row.items() if a in goal_set), QQ(0)) for row in r_rows]
    h = lu.solve(r_goal)
    t = lu.solve([QQ(1)] * n)
    staked = lu.solve([staked_unit * int(b) for b in chain.bets.tolist()])
    start = max(chain.start, 0)
    second = lu.solve([2 * x - 1 for x in t])
    e = [QQ(0)] * n
    e[start] = QQ(1)
    visits = lu.solve_transposed(e)
    absorbed = [QQ(0)] * len(chain.absorbing_values)
    for i, row in enumerate(r_rows):
        if visits[i] != 0:
            for a, p in row.items():
                absorbed[a] += visits[i] * p
    return {
        "absorbed": absorbed,
        "rounds": t[start],
        "rounds_second": second[start],
        "staked": staked[start],
        "playing": [],
        "series": h,
    }


def centred_rhs(chain: BankrollChain, rounds: np.ndarray) -> np.ndarray:
    """One round's share of the variance of the number of rounds, from every state: the variance of
    1 + (rounds left after it), sum_o p_o (1 + t(next) - t(k))^2, a sum of squares. Solving with it gives
    the variance itself (the law of total variance), never as E[T^2] - E[T]^2, which cancels."""
    after = np.where(chain.target >= 0, rounds[np.maximum(chain.target, 0)], 0.0)
    return ((1.0 + after - rounds[:, None]) ** 2 * chain.probabilities()[None, :]).sum(axis=1)


def unit_vector(size: int, at: int) -> np.ndarray:
    e = np.zeros(size)
    e[at] = 1.0
    return e
