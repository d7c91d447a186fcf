"""Play with no goal: the chance of ruin when play never stops at a target, exactly where it can be.

One concept per module:

* ``result``: ``NoGoalRuin`` and the one builder ``no_goal_ruin`` (absent figures carry reasons);
* ``balls``: ball arithmetic (python-flint arb/acb) and the cancel check of a solve;
* ``law``: the law of one round in grid steps;
* ``roots``: the characteristic polynomial and its roots inside the unit disc;
* ``truncation``: ruin before a far goal, the cross-check and fallback;
* ``durations``: expected rounds to ruin; ``approximations``: the adjustment coefficient's form
  and the diffusion rule of thumb;
* the walk kinds: ``bounded_jumps`` (one law at every level, skip-free when the only loss is one
  step), ``cut_bets`` (the lowest levels bet what the bankroll covers), ``progressions``
  (martingale and paroli: the bet follows the plan's place in a series).
"""

from oddsbench.solve.ruin.balls import DEFAULT_DIGITS, MAX_DIGITS, Certified
from oddsbench.solve.ruin.bounded_jumps import solve_no_goal_ruin
from oddsbench.solve.ruin.cut_bets import CutBetWalk, solve_cut_bet_ruin
from oddsbench.solve.ruin.law import Law
from oddsbench.solve.ruin.progressions import Move, progression_ruin_before_goal, solve_progression_ruin
from oddsbench.solve.ruin.result import (
    BOUNDED_JUMPS,
    CUT_BETS,
    PROGRESSION,
    VERDICT_CERTAIN,
    VERDICT_NEVER,
    VERDICT_POSSIBLE,
    NoGoalRuin,
    RoundsToRuin,
    TruncationCheck,
)
from oddsbench.solve.ruin.roots import CharacteristicRoot
from oddsbench.solve.ruin.truncation import (
    ruin_before_goal,
    ruin_before_goal_float,
    ruin_before_goal_levels,
    ruin_before_goal_levels_float,
)

__all__ = [
    "BOUNDED_JUMPS",
    "CUT_BETS",
    "DEFAULT_DIGITS",
    "MAX_DIGITS",
    "PROGRESSION",
    "VERDICT_CERTAIN",
    "VERDICT_NEVER",
    "VERDICT_POSSIBLE",
    "Certified",
    "CharacteristicRoot",
    "CutBetWalk",
    "Law",
    "Move",
    "NoGoalRuin",
    "RoundsToRuin",
    "TruncationCheck",
    "progression_ruin_before_goal",
    "ruin_before_goal",
    "ruin_before_goal_float",
    "ruin_before_goal_levels",
    "ruin_before_goal_levels_float",
    "solve_cut_bet_ruin",
    "solve_no_goal_ruin",
    "solve_progression_ruin",
]
