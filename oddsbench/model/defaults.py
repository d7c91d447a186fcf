"""Every default the layers and the front ends share, in one place (no imports: ``--help`` stays quick).

A default used by two modules lives here and nowhere else: the command line shows these values in
its help, the core applies them when a setting is left out, and the engines take them as their
keyword defaults.
"""

# Sizes a ruleset or chain may reach before it is refused.
DEFAULT_MAX_STATES = 200_000

# Exact arithmetic: the largest chain (transient states) solved over the rationals, per question.
ROUND_EXACT_LIMIT = 5_000  # one round, strategies side by side, best play, simulation, reports, sweeps
SESSION_EXACT_LIMIT = 3_000  # bankroll sessions asked on their own (``oddsbench session``)
DEFAULT_EXACT_LIMIT = ROUND_EXACT_LIMIT
DEFAULT_EXACT_BITS = 16_000_000_000  # estimated bits held by the exact factors before the exact engine stops

# The work budget of one question (``--budget``, ``--memory``; ``model/budget.py``): every command on any
# file ends within about a minute and 2 GB on a 2-core machine, in figures, figures with a note, or one line.
DEFAULT_BUDGET_SECONDS = 50
DEFAULT_MEMORY_MB = 1_900

# Sessions.
DEFAULT_PLANS = ("timid", "bold")  # the plans compared when none is named
NO_GOAL_DEFAULT_PLANS = ("timid",)  # ... and with no goal (bold play needs a goal)
NO_GOAL = "none"  # ``--goal none`` / ``goal = "none"``: play until ruin, no target
NO_GOAL_WORDS = frozenset({"none", "no", "never"})
NO_GOAL_DIGITS = 20  # significant digits of each proved decimal with no goal (``--digits``)

# Best play.
DEFAULT_BEST_GOAL = "max-return"

# Results over many rounds (``oddsbench horizon``, the workbench's Horizon view).
DEFAULT_HORIZON_ROUNDS = (1, 10, 100, 1_000, 10_000)

# Simulation.
DEFAULT_ROUND_TRIALS = 1_000_000
DEFAULT_SESSION_TRIALS = 100_000
DEFAULT_CONFIDENCE = 0.99
DEFAULT_MAX_STEPS = 1_000_000  # a simulated round still running after this many steps is left out

# Output.
JSON_VERSION = 2  # the shape of every ``--json`` output; 1 was the shapes before one shape per command

# Names of the session settings, as in a [session] table (options spell them with dashes).
SESSION_SETTING_NAMES = ("bankroll", "goal", "floor", "min_bet", "max_bet", "unit", "max_rounds")

# The goals of best play (``oddsbench best --goal``), as ``strategy/goals.py`` defines them.
BEST_GOALS = ("max-return", "max-win", "min-loss", "min-steps")


def is_no_goal(goal: object) -> bool:
    """``goal = "none"`` in a [session] table, or ``--goal none``: play until ruin, no target."""
    return isinstance(goal, str) and goal.strip().lower() in NO_GOAL_WORDS
