"""A parsed plan turned into bets: how much to stake in each bankroll state (and plan level).

The grammar is ``strategy/plans.py``; the rules of what a bet may be (table limits, what the
bankroll covers) are applied when the chain is built (``chain/bankroll.py``).
"""

from __future__ import annotations

import numpy as np

from oddsbench.chain.bankroll import BankrollGrid
from oddsbench.chain.round_distribution import RoundDistribution
from oddsbench.chain.session_rules import floor_times, machine_bets, whole_units
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.numbers import Rational
from oddsbench.strategy.plans import PROGRESSIONS, Plan


def _units(plan: Plan, amount: Rational, grid: BankrollGrid) -> int:
    return whole_units(f"plan {plan.spelling!r}: bet", amount, grid.unit)


def planned_bets(
    plan: Plan, distribution: RoundDistribution, grid: BankrollGrid
) -> tuple[np.ndarray, np.ndarray, tuple[str, ...]]:
    """(bets[level, value - low] in betting units, next_level[level, outcome], notes) of a plan."""
    width = grid.width
    values = np.arange(grid.low, grid.low + width, dtype=np.int64)
    outcomes = len(distribution.outcomes)
    stay = np.zeros((1, outcomes), dtype=np.int64)
    notes: list[str] = []
    if plan.kind == "flat":
        return machine_bets(np.full((1, width), _units(plan, plan.amount, grid), dtype=object)), stay, ()
    if plan.kind == "timid":
        return np.full((1, width), grid.min_bet), stay, ()
    if plan.kind == "bold":
        best = distribution.best_net * grid.scale
        if best <= 0:
            notes.append(f"{plan.spelling}: no outcome wins, so no bet reaches the goal; bold play stakes everything")
            return np.full((1, width), np.iinfo(np.int64).max // 4), stay, tuple(notes)
        need = grid.goal - values
        return -floor_times(-need, 1 / best)[None, :], stay, ()  # ceil(need / best)
    if plan.kind == "fraction":
        return floor_times(values, plan.amount / grid.scale)[None, :], stay, ()
    if plan.kind == "kelly":
        from oddsbench.strategy.kelly import kelly_bet

        bet = kelly_bet(distribution, plan.amount)
        if bet.fraction.decimal <= 0:
            notes.append(
                f"{plan.spelling}: the game has no positive expectation, so Kelly bets nothing; "
                "the plan bets the table minimum instead"
            )
        if bet.fraction.exact is not None:
            bets = floor_times(values, bet.fraction.exact / grid.scale)
        else:
            bets = np.floor(values * bet.fraction.decimal / grid.scale).astype(np.int64)
        return bets[None, :], stay, tuple(notes)
    if plan.kind in PROGRESSIONS:
        base = _units(plan, plan.amount, grid)
        levels = plan.series
        bets = machine_bets(np.array([[base * 2**level] * width for level in range(levels)], dtype=object))
        bets = bets.reshape(levels, width)
        nets = [o.net for o in distribution.outcomes]
        step = np.zeros((levels, outcomes), dtype=np.int64)
        for level in range(levels):
            for k, net in enumerate(nets):
                raising = net < 0 if plan.kind == "martingale" else net > 0
                if net == 0:
                    step[level, k] = level
                elif raising:
                    step[level, k] = level + 1 if level + 1 < levels else 0
                else:
                    step[level, k] = 0
        return bets, step, ()
    raise OddsbenchError(f"plan {plan.spelling!r} is chosen by the optimiser, not by a rule")
