"""A session that is a skip-free walk (one law at every bankroll, at most one step down, or mirrored):
end chances from every bankroll in log space from positive terms, so a goal chance of 1e-2349 is a
number, not float underflow; expected rounds and their variance by the walk's Green function (or a
band LU of the same walk where that cannot vouch for its digits); the final distribution from the
start. ``session_absorbing`` solves every other chain.
"""

from __future__ import annotations

import numpy as np

from oddsbench.chain.bankroll import GOAL, BankrollChain
from oddsbench.model.numbers import to_float
from oddsbench.solve.bankroll_system import WalkView
from oddsbench.solve.linear import factor_float
from oddsbench.solve.session_absorbing import rhs_columns, unit_vector

SPLIT_TINY = 1e-12  # below this chance an overshoot past the far end is shown as one value, not split


def walk_decimal(chain: BankrollChain, view: WalkView) -> dict:
    """Figures of a skip-free walk: end chances from positive terms in log space, moments by its
    Green function (or a band LU of the same walk), the final distribution from the start."""
    n = chain.size
    _, staked_unit = rhs_columns(chain)
    factors = factor_float(view.walk)
    start = max(chain.start, 0)
    at = view.walk_level(start)
    near_decimal, near_log10 = factors.bottom_chance()  # the end the walk reaches exactly
    far_decimal, far_log10 = factors.top_chance()  # the end it may overshoot
    rounds_walk = factors.solve(np.ones(n))
    spread = view.chain_order(factors.solve(_centred_walk_rhs(view.walk, rounds_walk)))
    rounds = view.chain_order(rounds_walk)
    goal_decimal, goal_log10 = (near_decimal, near_log10) if view.mirrored else (far_decimal, far_log10)
    # where the walk's two ends sit among the chain's absorbing states: it reaches the near end exactly
    # (the ruin level, or the goal when mirrored); past the far end it may land on several values
    low_value, goal_value = chain.grid.low - 1, chain.grid.goal
    near_value = goal_value if view.mirrored else low_value
    far_mask = chain.absorbing_kinds != GOAL if view.mirrored else chain.absorbing_kinds == GOAL
    far_indices = np.flatnonzero(far_mask)
    nearest_far = int(far_indices[-1] if view.mirrored else far_indices[0])  # the far value closest to play
    near = int(np.flatnonzero(chain.absorbing_values == near_value)[0])
    absorbed = np.zeros(len(chain.absorbing_values))
    absorbed_log10 = np.full(len(chain.absorbing_values), np.nan)
    absorbed[near], absorbed_log10[near] = near_decimal[at], near_log10[at]
    notes = []
    far_total, far_total_log10 = far_decimal[at], far_log10[at]
    if len(far_indices) == 1:
        absorbed[nearest_far], absorbed_log10[nearest_far] = far_total, far_total_log10
    else:
        row, bound = factors.visits_from(at)
        reliable = float(bound[row > 0].max(initial=0.0)) <= 1e-10
        if not reliable and far_total < SPLIT_TINY:
            absorbed[nearest_far], absorbed_log10[nearest_far] = far_total, far_total_log10
            past = "ruin level" if view.mirrored else "goal"
            notes.append(
                f"the chance of ending past the {past} ({_power_text(far_total_log10)}) is shown at the first value "
                f"past the {past}: too small to split by how far past it the last round went"
            )
        else:
            visits = view.chain_order(row if reliable else factors.solve_transposed(unit_vector(n, at)))
            absorbed = np.where(far_mask, chain.r_matrix().T @ visits, absorbed)
    return {
        "absorbed": absorbed,
        "absorbed_log10": absorbed_log10,
        "rounds": rounds[start],
        "rounds_second": spread[start] + rounds[start] ** 2,
        "rounds_variance": spread[start],
        "staked": rounds[start] * int(chain.bets[0]) * to_float(staked_unit),
        "playing": np.zeros(0),
        "series": view.chain_order(goal_decimal),
        "series_log10": view.chain_order(goal_log10),
        "method": factors.method,
        "notes": notes,
    }


def _centred_walk_rhs(walk, rounds: np.ndarray) -> np.ndarray:
    """``centred_rhs`` for a walk with one law at every level, by shifted slices instead of a gather."""
    n = walk.size
    total = np.zeros(n)
    for jump, prob in zip(walk.jumps.tolist(), walk.probs.tolist()):
        after = np.zeros(n)
        if abs(jump) < n:
            after[max(-jump, 0) : n - max(jump, 0)] = rounds[max(jump, 0) : n + min(jump, 0)]
        total += prob * (1.0 + after - rounds) ** 2
    return total


def _power_text(log10: float) -> str:
    """A log10 as a power of ten for notes (the report layer formats figures)."""
    exponent = int(np.floor(log10))
    return f"about {10 ** (log10 - exponent):.3g}e{exponent:+d}"
