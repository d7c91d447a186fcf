"""The workbench's ways to change a setting the core names (``model/errors.py``, ``SettingProblem``): a field,
a form or a key, where the command line has options. Settings the workbench does not let a user
set (the tune dialog's range and tolerance, numbers of rounds) have no entry: their lines stay as
the core said them."""

from __future__ import annotations

SESSION_FORM = "the Session form of the Edit view (F2)"

WAYS = {
    "strategy": "s picks the next strategy",
    "best": "the Strategies view (F4) shows the best play",
    "target": "the target field",
    "plans": "the plans field of the Sessions view (F5)",
    "goal": f"goal, in {SESSION_FORM}",
    "bankroll": f"bankroll, in {SESSION_FORM}",
    "floor": f"floor, in {SESSION_FORM}",
    "min_bet": f"min_bet, in {SESSION_FORM}",
    "max_bet": f"max_bet, in {SESSION_FORM}",
    "unit": f"unit, in {SESSION_FORM}",
    "max_rounds": f"max_rounds, in {SESSION_FORM}",
    "trials": "the trials field of the Simulation view (F7)",
    "seed": "the seed field of the Simulation view (F7)",
}


def problem_line(error: BaseException) -> str:
    """An error as the workbench shows it: a setting problem ends with the field that changes it."""
    from oddsbench.model.errors import with_ways

    return with_ways(error, WAYS.get)
