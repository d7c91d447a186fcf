"""Betting plans: how much to stake in each bankroll state (and plan level).

Spellings on the command line (``--plan``), all amounts in money, exact:

- ``flat:B``     the same bet B every round.
- ``timid``      always the table minimum (the smallest steps: longest sessions).
- ``bold``       stake what reaches the goal with one win, or everything if less (Dubins and
                 Savage's bold play).
- ``fraction:F`` a fixed fraction F of the current bankroll (proportional betting), rounded down
                 to the betting unit.
- ``kelly``      the growth-optimal fraction of the game (Kelly criterion); ``kelly:F`` bets F
                 times that fraction (``kelly:1/2`` is half Kelly).
- ``martingale:B:K`` start at B, double after each loss, at most K bets in a series; a win, or
                 a K-th loss, starts a new series at B. Pushes keep the bet.
- ``paroli:B:K`` start at B, double after each win, at most K bets in a run; a loss, or a K-th
                 win, returns to B. Pushes keep the bet.
- ``best``       the bet in every state that maximises the chance of reaching the goal
                 (policy iteration, ``strategy.bet_optimiser``).

With no goal (``--goal none``) only plans whose bet stays bounded are played: flat, timid and
the two capped progressions; ``timid`` takes no value anywhere (``timid:1/2`` is refused in the
same line by every command: the table minimum is a session setting, ``--min-bet``).

Every bet is then raised to the table minimum and cut to the table maximum and to what the
bankroll can cover for the round's worst case; a bankroll that cannot cover the minimum is ruin.
This module is the grammar only (light to import); ``strategy/plan_bets.py`` turns a plan into
the bets of a bankroll chain.
"""

from __future__ import annotations

from collections.abc import Iterable
from dataclasses import dataclass
from typing import TYPE_CHECKING

from oddsbench.model.errors import SettingProblem, shown_name

PLANS = "plans"  # the setting key of plan texts (``SettingProblem``): the CLI says --plan, the workbench its field

if TYPE_CHECKING:  # the grammar stays light: the command line reads PLAN_HELP for its --help
    from oddsbench.model.numbers import Rational

PLAN_HELP = (
    ("flat:B", "the same bet B every round"),
    ("timid", "always the table minimum bet"),
    ("bold", "stake what reaches the goal with one win, or everything if less (Dubins and Savage)"),
    ("fraction:F", "a fixed fraction F of the current bankroll, rounded down to the betting unit"),
    ("kelly", "the growth-optimal (Kelly) fraction of the bankroll; kelly:F bets F times it"),
    ("martingale:B:K", "double after a loss, from B, at most K bets in a series"),
    ("paroli:B:K", "double after a win, from B, at most K bets in a run"),
    ("best", "the bet in each state that maximises the chance of the goal (optimiser)"),
)
MAX_SERIES = 30
PROGRESSIONS = ("martingale", "paroli")
NO_GOAL_KINDS = ("flat", "timid", *PROGRESSIONS)  # plans whose bet stays bounded as the bankroll grows
NO_GOAL_PLANS = (
    "flat:B (a fixed bet of B), timid (always the table minimum), or a capped progression martingale:B:K / paroli:B:K"
)


@dataclass(frozen=True)
class Plan:
    """A parsed plan: its kind, an amount (bet or fraction) and a series length for progressions."""

    spelling: str
    kind: str
    amount: Rational | None = None
    series: int = 1

    @property
    def levels(self) -> int:
        return self.series if self.kind in PROGRESSIONS else 1

    @property
    def plays_without_goal(self) -> bool:
        """Whether the bet stays bounded however far the bankroll grows, so play with no goal is defined."""
        return self.kind in NO_GOAL_KINDS

    @property
    def fixed_amounts(self) -> tuple[Rational, ...]:
        """The money amounts the plan bets by itself (flat B, a progression's base B): the default unit follows them."""
        return (self.amount,) if self.kind in ("flat", *PROGRESSIONS) else ()


def parse_plan(spelling: str, no_goal: bool = False) -> Plan:
    """``flat:2``, ``kelly:1/2``, ``martingale:1:6``...: one clear line when it is not a plan.

    The one reader of plan text for every command and the workbench. With ``no_goal`` the plans
    whose bet grows with the bankroll (or that aim at a goal) are refused in one line.
    """
    from oddsbench.model.expr import ExpressionError, evaluate_text
    from oddsbench.model.numbers import QQ, is_integer, text, to_int

    named = f"plan {shown_name(spelling)}"
    parts = [part.strip() for part in spelling.strip().split(":")]
    kind, args = parts[0].lower(), parts[1:]
    known = ", ".join(name for name, _ in PLAN_HELP)

    def value(field: str, what: str) -> Rational:
        try:
            number = evaluate_text(field)
        except ExpressionError as error:
            raise SettingProblem(f"{named}: {what}: {error}", PLANS) from None
        if number <= 0:
            raise SettingProblem(f"{named}: {what} must be more than 0, got {text(number)}", PLANS)
        return number

    def expect(count: int) -> None:
        if len(args) != count:
            raise SettingProblem(f"{named}: {kind} takes {count} value(s) after ':' (plans: {known})", PLANS)

    if kind == "timid" and args:
        raise SettingProblem(
            f"{named}: timid takes no value: it always bets the table minimum "
            "(set that as the session's min_bet, or use flat:B for a fixed bet of B)",
            PLANS,
            "min_bet",
        )
    if kind in ("timid", "bold", "best"):
        expect(0)
        plan = Plan(spelling, kind)
    elif kind == "kelly":
        if len(args) > 1:
            expect(1)
        plan = Plan(spelling, kind, value(args[0], "Kelly multiple") if args else QQ(1))
    elif kind == "flat":
        expect(1)
        plan = Plan(spelling, kind, value(args[0], "bet"))
    elif kind == "fraction":
        expect(1)
        fraction = value(args[0], "fraction")
        if fraction > 1:
            raise SettingProblem(f"{named}: fraction must be at most 1, got {text(fraction)}", PLANS)
        plan = Plan(spelling, kind, fraction)
    elif kind in PROGRESSIONS:
        expect(2)
        series = value(args[1], "series length")
        if not is_integer(series) or series > MAX_SERIES:
            raise SettingProblem(f"{named}: series length must be a whole number from 1 to {MAX_SERIES}", PLANS)
        plan = Plan(spelling, kind, value(args[0], "base bet"), to_int(series))
    else:
        raise SettingProblem(f"{named}: unknown plan (plans: {known})", PLANS)
    if no_goal and not plan.plays_without_goal:
        raise SettingProblem(
            f"{named}: with no goal the bet must stay bounded; use {NO_GOAL_PLANS}"
            + (" (bold play needs a goal to aim at)" if kind == "bold" else ""),
            PLANS,
        )
    return plan


def parse_plans(spellings: str | Iterable[str], no_goal: bool = False) -> tuple[Plan, ...]:
    """Several plans: a list, or one text such as ``timid, bold, flat:2`` (the workbench's field)."""
    if isinstance(spellings, str):
        spellings = spellings.replace(";", ",").split(",")
    return tuple(parse_plan(part.strip(), no_goal) for part in spellings if part.strip())
