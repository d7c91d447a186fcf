"""The one settings object a front end hands to the core, and the reading of money amounts.

Every field has the default of ``model/defaults.py``; a field left None means "the default for
this question" (the exact limit is 5,000 states for rounds and best play, 3,000 for sessions) or,
for session amounts, "the ruleset's ``[session]`` value".
"""

from __future__ import annotations

from dataclasses import dataclass, fields
from typing import Any

from oddsbench.model.defaults import (
    DEFAULT_BEST_GOAL,
    DEFAULT_CONFIDENCE,
    DEFAULT_EXACT_BITS,
    DEFAULT_MAX_STATES,
    DEFAULT_MAX_STEPS,
    NO_GOAL,
    NO_GOAL_DIGITS,
    ROUND_EXACT_LIMIT,
    SESSION_EXACT_LIMIT,
    is_no_goal,
)
from oddsbench.model.errors import OddsbenchError, SettingProblem, shown_name
from oddsbench.model.numbers import Rational

MONEY_FIELDS = ("bankroll", "goal", "floor", "min_bet", "max_bet", "unit")


@dataclass(frozen=True)
class SessionRequest:
    """Session settings over the ruleset's ``[session]`` table (None: the table's value, or the rule's default).

    ``goal`` is an exact amount or ``"none"`` (play until ruin); ``plans`` empty means the default
    plans (timid and bold); ``digits`` and ``check`` apply to play with no goal.
    """

    bankroll: Rational | None = None
    goal: Rational | str | None = None
    floor: Rational | None = None
    min_bet: Rational | None = None
    max_bet: Rational | None = None
    unit: Rational | None = None
    max_rounds: int | None = None
    plans: tuple[str, ...] = ()
    digits: int = NO_GOAL_DIGITS
    check: bool = True

    def overrides(self) -> dict[str, Any]:
        """The given amounts by setting name, for merging over the ``[session]`` table."""
        return {name: getattr(self, name) for name in (*MONEY_FIELDS, "max_rounds")}


@dataclass(frozen=True)
class Settings:
    """Everything a question may take besides the game. Fields a question does not use are ignored.

    - exact arithmetic: ``exact_limit`` (None: the question's default), ``exact_bits``, ``max_states``;
    - the round: ``starts`` (a state, a comma list or a pattern such as ``up-*``; None: the file's
      start), ``strategies`` (named strategies to play; empty: each of the file's, for a game with
      decisions), ``rounds`` (chances of having ended by step N; for sessions, within N rounds);
    - best play: ``best_goal`` (max-return, max-win, min-loss, min-steps); ``play_best`` plays it in
      a simulation;
    - sessions: ``session`` (None: no sessions asked for);
    - simulation: ``trials`` (None: 1,000,000 rounds or 100,000 sessions per plan), ``seed`` (None:
      a fresh one, reported), ``confidence``, ``max_steps``.
    """

    exact_limit: int | None = None
    exact_bits: int = DEFAULT_EXACT_BITS
    max_states: int = DEFAULT_MAX_STATES
    starts: str | None = None
    strategies: tuple[str, ...] = ()
    rounds: int | None = None
    best_goal: str = DEFAULT_BEST_GOAL
    play_best: bool = False
    session: SessionRequest | None = None
    trials: int | None = None
    seed: int | None = None
    confidence: float = DEFAULT_CONFIDENCE
    max_steps: int = DEFAULT_MAX_STEPS

    @property
    def round_exact_limit(self) -> int:
        return ROUND_EXACT_LIMIT if self.exact_limit is None else self.exact_limit

    @property
    def session_exact_limit(self) -> int:
        return SESSION_EXACT_LIMIT if self.exact_limit is None else self.exact_limit


DEFAULTS = Settings()


def money(value: object, name: str) -> Rational | None:
    """An exact amount from text (``"5/2"``), a whole number or a rational; None stays None.

    Text is read by the ruleset expression language (never by ``eval``); a bad amount is one line
    naming the option.
    """
    from oddsbench.model.expr import ExpressionError, evaluate_text
    from oddsbench.model.numbers import QQ

    if value is None:
        return None
    if isinstance(value, bool):
        raise SettingProblem(f"{_words(name)} {shown_name(value)}: expected an amount", name)
    if isinstance(value, int):
        return QQ(value)
    if isinstance(value, str):
        try:
            return evaluate_text(value)
        except ExpressionError as error:
            raise SettingProblem(f"{_words(name)} {shown_name(value)}: {error}", name) from None
    if isinstance(value, float):
        raise SettingProblem(
            f"{_words(name)} {shown_name(value)}: give amounts exactly, as text such as '0.5' or '1/2'", name
        )
    return value


def _words(name: str) -> str:
    """A setting's key as words: ``min_bet`` -> ``min bet``."""
    return name.replace("_", " ")


def session_request(**given: Any) -> SessionRequest:
    """A ``SessionRequest`` from plain values: amounts as text or numbers, ``goal="none"``, plans as a list."""
    known = {f.name for f in fields(SessionRequest)}
    unknown = sorted(set(given) - known)
    if unknown:
        raise OddsbenchError(f"unknown session setting(s): {', '.join(unknown)} (known: {', '.join(sorted(known))})")
    values = dict(given)
    for name in MONEY_FIELDS:
        if name == "goal" and is_no_goal(values.get(name)):
            values[name] = NO_GOAL
        elif name in values:
            values[name] = money(values[name], name)
    plans = values.get("plans", ())
    values["plans"] = (plans,) if isinstance(plans, str) else tuple(plans)
    return SessionRequest(**values)


def make_settings(**given: Any) -> Settings:
    """``Settings`` from keyword values as a script writes them; session amounts go into ``session``.

    ``make_settings(rounds=10, strategies=["hold-at-20"])``, ``make_settings(bankroll=100, goal=200,
    plans=["flat:1", "bold"])``: one clear line for an unknown name.
    """
    session_names = {f.name for f in fields(SessionRequest)}
    session = {name: given.pop(name) for name in list(given) if name in session_names}
    known = {f.name for f in fields(Settings)}
    unknown = sorted(set(given) - known)
    if unknown:
        names = ", ".join(sorted(known | session_names))
        raise OddsbenchError(f"unknown setting(s): {', '.join(unknown)} (known: {names})")
    if isinstance(given.get("strategies"), str):
        given["strategies"] = (given["strategies"],)
    elif "strategies" in given:
        given["strategies"] = tuple(given["strategies"])
    if session:
        given["session"] = session_request(**session)
    return Settings(**given)


__all__ = ["DEFAULTS", "Settings", "SessionRequest", "make_settings", "session_request", "money"]
