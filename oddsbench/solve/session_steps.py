"""Sessions with a time cap, and figures within N rounds: the distribution stepped round by round.

With a cap of N rounds the chain is no longer time-homogeneous, so the figures come from
stepping the distribution over states forward from the start (and the goal chance from every
bankroll backward), exactly where the work is small enough and in floats always. Float stepping
stops early once nothing moves (no mass left, or a fixed point in floating point), so a cap of
10^9 rounds costs what the chain needs to drain; exact stepping gives way to decimals when its
share of the work budget runs out (``solve/linear/costs.py``).
"""

from __future__ import annotations

import numpy as np

from oddsbench.chain.bankroll import GOAL, BankrollChain
from oddsbench.model import budget
from oddsbench.model.numbers import QQ, Rational, to_float
from oddsbench.solve.linear.costs import ExactClock
from oddsbench.solve.session_absorbing import rhs_columns

POLL_STEPS = 64  # the cancel check, the work budget and exact arithmetic's share are polled this often


def forward_decimal(chain: BankrollChain, steps: int) -> dict:
    """Step the distribution over states ``steps`` rounds from the start."""
    n = chain.size
    goal_columns, staked_unit = rhs_columns(chain)
    absorbed = np.zeros(len(chain.absorbing_values))
    if n == 0 or chain.start < 0:
        return {"absorbed": absorbed, "rounds": 0.0, "rounds_second": 0.0, "staked": 0.0, "playing": np.zeros(n)}
    q_t = chain.q_matrix().T.tocsr()
    r_t = chain.r_matrix().T.tocsr()
    staked = chain.bets.astype(float) * to_float(staked_unit)
    d = np.zeros(n)
    d[chain.start] = 1.0
    rounds = second = spent = 0.0
    for step in range(steps):
        if step % POLL_STEPS == 0:
            budget.check(f"the session stepped over {steps:,} rounds")
        alive = d.sum()
        if alive == 0.0:
            break
        rounds += alive
        second += (2 * step + 1) * alive
        spent += float(d @ staked)
        absorbed += r_t @ d
        d = q_t @ d
    return {"absorbed": absorbed, "rounds": rounds, "rounds_second": second, "staked": spent, "playing": d}


def forward_exact(chain: BankrollChain, steps: int, should_stop) -> dict | None:
    n = chain.size
    if n == 0 or chain.start < 0:
        return None
    _, staked_unit = rhs_columns(chain)
    q_rows, r_rows = chain.exact_rows()
    bets = chain.bets.tolist()
    d: dict[int, Rational] = {chain.start: QQ(1)}
    absorbed = [QQ(0)] * len(chain.absorbing_values)
    rounds = second = spent = QQ(0)
    clock = ExactClock(should_stop, steps, "stepping")
    for step in range(steps):
        clock.tick(step)
        if not d:
            break
        alive = sum(d.values(), QQ(0))
        rounds += alive
        second += (2 * step + 1) * alive
        spent += staked_unit * sum((w * bets[i] for i, w in d.items()), QQ(0))
        nxt: dict[int, Rational] = {}
        for i, w in d.items():
            for j, p in q_rows[i].items():
                nxt[j] = nxt.get(j, QQ(0)) + w * p
            for a, p in r_rows[i].items():
                absorbed[a] += w * p
        d = {j: w for j, w in nxt.items() if w != 0}
    playing = [QQ(0)] * n
    for i, w in d.items():
        playing[i] = w
    return {"absorbed": absorbed, "rounds": rounds, "rounds_second": second, "staked": spent, "playing": playing}


def capped_series_decimal(chain: BankrollChain, steps: int) -> np.ndarray:
    """Chance of reaching the goal within ``steps`` rounds from every state (backward stepping)."""
    n = chain.size
    if n == 0:
        return np.zeros(0)
    q = chain.q_matrix()
    r = chain.r_matrix()
    r_goal = np.asarray(r[:, chain.absorbing_kinds == GOAL].sum(axis=1)).ravel()
    h = np.zeros(n)
    for step in range(steps):
        if step % POLL_STEPS == 0:
            budget.check(f"the goal chances within {steps:,} rounds")
        moved = q @ h + r_goal
        if np.array_equal(moved, h):  # a fixed point in floating point: every further round gives it again
            break
        h = moved
    return h


def capped_series_exact(chain: BankrollChain, steps: int, should_stop) -> list | None:
    n = chain.size
    if n == 0:
        return None
    q_rows, r_rows = chain.exact_rows()
    goal_set = set(np.flatnonzero(chain.absorbing_kinds == GOAL).tolist())
    r_goal = [sum((p for a, p in row.items() if a in goal_set), QQ(0)) for row in r_rows]
    h = [QQ(0)] * n
    clock = ExactClock(should_stop, steps, "stepping")
    for step in range(steps):
        clock.tick(step)
        h = [r_goal[i] + sum((p * h[j] for j, p in q_rows[i].items()), QQ(0)) for i in range(n)]
    return h
