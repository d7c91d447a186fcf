"""The bet in every bankroll state that maximises the chance of reaching the goal.

A finite Markov decision problem: in state x choose a bet c from the minimum to what x can
cover (and the table maximum); the value is the chance of reaching the goal. Every policy ends
with probability 1 (each bet is at least the minimum, and some outcome moves the bankroll),
so the optimality equation has one solution and a policy that no single bet change improves
is optimal among all plans, history-dependent ones (progressions) included.

Method: policy iteration. Start from bold play, evaluate the policy with one sparse solve,
switch each state to the bet with the highest one-step look-ahead value when it beats the
current bet by more than a rounding tolerance, and repeat until nothing changes. Where the
chain is small enough, the final policy is evaluated exactly and the certificate is checked in
rational arithmetic: for every state and every allowed bet, sum_k p_k V(x + net_k c) <= V(x).
A bet that improves exactly (a float tie broken the wrong way) is taken and the check redone.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from oddsbench.chain.bankroll import BankrollGrid
from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.chain.session_rules import MACHINE_BET
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import QQ, to_int

MAX_WORK = 60_000_000
EXACT_WORK = 3_000_000
TOLERANCE = 1e-12
MAX_ITERATIONS = 200


@dataclass(frozen=True)
class BetCertificate:
    """How the optimiser's policy was found and checked."""

    iterations: int
    states: int
    choices: int
    exact: bool
    largest_gain: float

    def note(self) -> str:
        how = "in exact arithmetic" if self.exact else f"in floating point (gain at most {self.largest_gain:.1e})"
        return (
            f"best: policy iteration converged after {self.iterations} iteration(s); checked {how}: no single "
            f"bet change improves any of {self.states:,} bankroll states ({self.choices:,} bet choices)"
        )


def _limits(grid: BankrollGrid) -> tuple[np.ndarray, np.ndarray]:
    values = np.arange(grid.low, grid.goal, dtype=np.int64)
    return values, np.maximum(grid.largest_bet(values), min(grid.min_bet, MACHINE_BET))


def _evaluate(grid, steps, probs, values, bets) -> np.ndarray:
    """Goal chance of a stationary policy from every playing state (one sparse solve)."""
    from scipy.sparse import csc_matrix

    from oddsbench.solve.linear import factor_float, identity_minus_float

    n = len(values)
    landing = values[:, None] + bets[:, None] * steps[None, :]
    inside = (landing >= grid.low) & (landing < grid.goal)
    rows = np.broadcast_to(np.arange(n)[:, None], landing.shape)
    weight = np.broadcast_to(probs, landing.shape)
    q = csc_matrix((weight[inside], (rows[inside], landing[inside] - grid.low)), shape=(n, n))
    r_goal = (weight * (landing >= grid.goal)).sum(axis=1)
    return factor_float(identity_minus_float(q)).solve(r_goal)


def _extended(grid: BankrollGrid, h: np.ndarray):
    """V on every bankroll the look-ahead can reach: 0 below the playing run, 1 at the goal."""

    def value(y: np.ndarray) -> np.ndarray:
        out = np.where(y >= grid.goal, 1.0, 0.0)
        inside = (y >= grid.low) & (y < grid.goal)
        out[inside] = h[y[inside] - grid.low]
        return out

    return value


def optimise_bets(distribution: RoundDistribution, grid: BankrollGrid, start_bets: np.ndarray, exact_limit: int):
    """(bets per playing state in betting units, BetCertificate). ``start_bets``: the first policy."""
    values, cap = _limits(grid)
    n = len(values)
    if n == 0:
        return np.zeros(0, dtype=np.int64), BetCertificate(0, 0, 0, True, 0.0)
    steps = np.array([to_int(o.net * grid.scale) for o in distribution.outcomes], dtype=np.int64)
    probs = np.array(distribution.floats()[1])
    choices = int((cap - grid.min_bet + 1).sum())
    if choices * len(steps) > MAX_WORK:
        raise OddsbenchError(
            f"plan best: {choices:,} (state, bet) pairs are too many for the optimiser (limit "
            f"{MAX_WORK // len(steps):,}); use a smaller goal, a larger betting unit or a max_bet"
        )
    bets = np.clip(np.asarray(start_bets, dtype=np.int64), grid.min_bet, cap)
    top = int(cap.max())
    iterations = 0
    gain = 0.0
    while True:
        iterations += 1
        h = _evaluate(grid, steps, probs, values, bets)
        value = _extended(grid, h)
        best_value = h.copy()
        best_bet = bets.copy()
        for c in range(grid.min_bet, top + 1):
            allowed = c <= cap
            look = sum(p * value(values + c * s) for p, s in zip(probs, steps))
            better = allowed & (look > best_value + TOLERANCE)
            best_value = np.where(better, look, best_value)
            best_bet = np.where(better, c, best_bet)
        changed = best_bet != bets
        if not changed.any() or iterations >= MAX_ITERATIONS:
            gain = float(np.max(best_value - h))
            break
        bets = best_bet
    exact = False
    if n <= exact_limit and choices * len(steps) <= EXACT_WORK:
        bets, extra = _exact_certificate(distribution, grid, steps, values, cap, bets)
        iterations += extra
        exact = True
    return bets, BetCertificate(iterations, n, choices, exact, gain)


def _exact_certificate(distribution, grid, steps, values, cap, bets):
    """Evaluate exactly and check every single bet change; take exact improvements until none."""
    from oddsbench.solve.linear import factor_exact, identity_minus

    probs = [o.prob for o in distribution.outcomes]
    low, goal = grid.low, grid.goal
    rounds = 0
    while True:
        q_rows, r_goal = [], []
        for x, c in zip(values.tolist(), bets.tolist()):
            row: dict[int, object] = {}
            reach = QQ(0)
            for p, s in zip(probs, steps.tolist()):
                y = x + c * s
                if y >= goal:
                    reach += p
                elif y >= low:
                    row[y - low] = row.get(y - low, QQ(0)) + p
            q_rows.append(row)
            r_goal.append(reach)
        h = factor_exact(identity_minus(q_rows)).solve(r_goal)

        def value(y: int, h=h):
            return QQ(1) if y >= goal else (h[y - low] if y >= low else QQ(0))

        improved = False
        new = bets.copy()
        for i, (x, limit) in enumerate(zip(values.tolist(), cap.tolist())):
            best = h[i]
            for c in range(grid.min_bet, limit + 1):
                look = sum((p * value(x + c * s) for p, s in zip(probs, steps.tolist())), QQ(0))
                if look > best:
                    best, new[i], improved = look, c, True
        if not improved or rounds >= MAX_ITERATIONS:
            return bets, rounds
        bets = new
        rounds += 1
