"""Reading a sweep spec (TOML): the ruleset to vary and the axes of the grid.

    [sweep]
    title = "Payout of a straight-up bet"
    ruleset = "../rulesets/single-zero-wheel.toml"   # relative to the spec file
    figures = ["house_edge", "return_to_player"]      # columns of the table (all go to CSV/JSON)
    strategy = ["eager", "careful"]                   # optional axis: named strategies

    [params]                                          # one axis per ruleset parameter
    payout = [30, 31, 32, 33, 34, 35, 36]             # a list of values (whole numbers or "a/b")
    pockets = { from = 37, to = 38, step = 1 }        # or an inclusive range, exact arithmetic

    [session]                                         # optional: sessions at every point
    bankroll = [10, 20]                               # bankroll, goal, floor, min_bet, max_bet, unit,
    goal = 40                                         # max_rounds: values or ranges (defaults from the
                                                      # ruleset's [session]); goal may be "none"
    plan = ["flat:1", "bold"]                         # plans default to timid, bold

The grid is the product of every axis, first axis slowest. Values are exact: integers, or text
through the ruleset expression language (no names), never floats.
"""

from __future__ import annotations

import tomllib
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from oddsbench.model.defaults import (
    DEFAULT_PLANS,
    NO_GOAL,
    NO_GOAL_DEFAULT_PLANS,
    ROUND_EXACT_LIMIT,
    SESSION_SETTING_NAMES,
    is_no_goal,
)
from oddsbench.model.errors import Problem, RulesetError, shown_name
from oddsbench.model.expr import ExpressionError, evaluate_text
from oddsbench.model.file_read import FileRefused, read_text_capped
from oddsbench.model.load import MAX_FILE_BYTES
from oddsbench.model.numbers import QQ, Rational, text

MAX_POINTS = 100_000
SPEC_KEYS = frozenset({"sweep", "params", "session"})
SWEEP_KEYS = frozenset({"title", "ruleset", "figures", "strategy", "exact_limit"})
DEFAULT_FIGURES = ("house_edge", "return_to_player")
DEFAULT_EXACT_LIMIT = ROUND_EXACT_LIMIT


@dataclass(frozen=True)
class Axis:
    """One dimension of the grid: ``kind`` is "param", "strategy", "session" or "plan"; values in order."""

    kind: str
    name: str
    values: tuple[Any, ...]

    @property
    def label(self) -> str:
        return self.name if self.kind != "session" else f"session.{self.name}"

    def shown(self, value: Any) -> str:
        if self.kind in ("param", "session") and not isinstance(value, int | str):
            return text(value)
        return str(value)


@dataclass(frozen=True)
class SweepSpec:
    source: str
    title: str
    ruleset_path: Path
    ruleset_text: str
    axes: tuple[Axis, ...]
    figures: tuple[str, ...] = DEFAULT_FIGURES
    exact_limit: int = DEFAULT_EXACT_LIMIT

    @property
    def size(self) -> int:
        total = 1
        for axis in self.axes:
            total *= len(axis.values)
        return total


class _SpecReader:
    def __init__(self, source: str) -> None:
        self.source = source
        self.problems: list[Problem] = []

    def error(self, where: str, message: str) -> None:
        self.problems.append(Problem(self.source, where, message))

    def exact(self, raw: Any, where: str) -> Rational | None:
        if isinstance(raw, bool) or not isinstance(raw, int | str):
            if isinstance(raw, float):
                self.error(where, f'write decimals in quotes ("{raw}") so they stay exact')
            else:
                self.error(where, f"must be a whole number or an exact value in quotes, not {type(raw).__name__}")
            return None
        if isinstance(raw, int):
            return QQ(raw)
        try:
            return evaluate_text(raw)
        except ExpressionError as error:
            self.error(where, str(error))
            return None

    def values(self, raw: Any, where: str) -> tuple[Rational, ...]:
        if isinstance(raw, list):
            found = [self.exact(item, f"{where}, value {i}") for i, item in enumerate(raw, start=1)]
            if not raw:
                self.error(where, "needs at least one value")
            return tuple(v for v in found if v is not None) if None not in found else ()
        if isinstance(raw, dict):
            unknown = set(raw) - {"from", "to", "step"}
            if unknown or "from" not in raw or "to" not in raw:
                self.error(where, "a range is { from = A, to = B, step = C } (step optional, default 1)")
                return ()
            low = self.exact(raw["from"], f"{where}, from")
            high = self.exact(raw["to"], f"{where}, to")
            step = self.exact(raw.get("step", 1), f"{where}, step")
            if low is None or high is None or step is None:
                return ()
            if step <= 0:
                self.error(f"{where}, step", f"must be more than 0, got {text(step)}")
                return ()
            if high < low:
                self.error(where, f"'to' ({text(high)}) is below 'from' ({text(low)})")
                return ()
            count = int((high - low) / step) + 1
            if count > MAX_POINTS:
                self.error(where, f"{count:,} values, over the limit of {MAX_POINTS:,}")
                return ()
            return tuple(low + step * i for i in range(count))
        self.error(where, "must be a list of values or a range table { from, to, step }")
        return ()


PlanCheck = Callable[[str], object]  # reads one plan text, raising OddsbenchError with one line


def _session_axes(reader: _SpecReader, session: dict[str, Any], check_plan: PlanCheck | None) -> list[Axis]:
    """Session settings (exact money, whole max_rounds) and the plan axis; plans default to timid, bold.

    ``check_plan`` is the plan grammar (the core passes ``strategy.plans.parse_plan``: this layer
    sits beside strategy and does not import it).
    """
    if not session:
        return []
    from oddsbench.model.errors import OddsbenchError
    from oddsbench.model.numbers import is_integer, to_int

    axes: list[Axis] = []
    for name, raw in session.items():
        where = f"[session], {name}"
        if name == "plan":
            continue
        if name not in SESSION_SETTING_NAMES:
            reader.error(where, f"unknown setting (known: {', '.join(SESSION_SETTING_NAMES)}, plan)")
            continue
        listed = raw if isinstance(raw, list | dict) else [raw]
        if name == "goal" and isinstance(listed, list) and any(is_no_goal(item) for item in listed):
            values = _goals(reader, listed, where)
        else:
            values = reader.values(listed, where)
        if name == "max_rounds":
            if not all(is_integer(v) and v >= 1 for v in values):
                reader.error(where, "must be whole numbers of rounds, at least 1")
                continue
            values = tuple(to_int(v) for v in values)
        if values:
            axes.append(Axis("session", name, values))
    goals = next((axis.values for axis in axes if axis.name == "goal"), ())
    defaults = NO_GOAL_DEFAULT_PLANS if goals and all(goal == NO_GOAL for goal in goals) else DEFAULT_PLANS
    plans = session.get("plan", list(defaults))
    listed = [plans] if isinstance(plans, str) else plans
    if not isinstance(listed, list) or not listed or not all(isinstance(p, str) for p in listed):
        reader.error("[session], plan", 'must be a plan or a list of plans such as ["flat:1", "bold"]')
        return axes
    for plan in listed if check_plan is not None else ():
        try:
            check_plan(plan)
        except OddsbenchError as error:
            reader.error("[session], plan", str(error))
    axes.append(Axis("plan", "plan", tuple(listed)))
    return axes


def _goals(reader: _SpecReader, listed: list[Any], where: str) -> tuple[Any, ...]:
    """Goal values, ``"none"`` among them (play with no goal: until ruin), each other an exact amount."""
    found = [
        NO_GOAL if is_no_goal(item) else reader.exact(item, f"{where}, value {i}") for i, item in enumerate(listed, 1)
    ]
    return tuple(found) if None not in found else ()


def read_sweep_spec(path: str | Path, check_plan: PlanCheck | None = None) -> SweepSpec:
    """Read a spec file and the ruleset it names, or raise RulesetError naming file and field."""
    path = Path(path)
    source = path.name
    try:
        document = tomllib.loads(read_text_capped(path, MAX_FILE_BYTES, "is a folder, not a sweep spec"))
    except FileRefused as refused:
        raise RulesetError([Problem(source, "", str(refused))]) from None
    except tomllib.TOMLDecodeError as error:
        raise RulesetError([Problem(source, "", f"not valid TOML: {error}")]) from None
    reader = _SpecReader(source)
    for key in document:
        if key not in SPEC_KEYS:
            reader.error("", f"unknown table {key!r} (known: sweep, params, session)")
    head = document.get("sweep")
    if not isinstance(head, dict):
        reader.error("", "missing [sweep] table" if head is None else "[sweep] must be a table")
        raise RulesetError(reader.problems)
    for key in head:
        if key not in SWEEP_KEYS:
            reader.error("[sweep]", f"unknown field {key!r}")
    ruleset_name = head.get("ruleset")
    if not isinstance(ruleset_name, str) or not ruleset_name:
        reader.error("[sweep], ruleset", "missing: the path of the ruleset file to vary")
        raise RulesetError(reader.problems)
    ruleset_path = path.parent / ruleset_name  # an absolute name stays as it is; no resolve: loops are refused below
    try:
        ruleset_text = read_text_capped(ruleset_path, MAX_FILE_BYTES, "is a folder, not a ruleset file")
    except FileRefused as refused:
        reader.error("[sweep], ruleset", f"{shown_name(ruleset_name)}: {refused}")
        raise RulesetError(reader.problems) from None
    axes: list[Axis] = []
    params = document.get("params", {})
    if not isinstance(params, dict):
        reader.error("[params]", "must be a table of name = [values]")
        params = {}
    for name, raw in params.items():
        values = reader.values(raw, f"[params], {name}")
        if values:
            axes.append(Axis("param", name, values))
    strategies = head.get("strategy")
    if strategies is not None:
        listed = [strategies] if isinstance(strategies, str) else strategies
        if not isinstance(listed, list) or not listed or not all(isinstance(s, str) for s in listed):
            reader.error("[sweep], strategy", "must be a strategy name or a list of names")
        else:
            axes.append(Axis("strategy", "strategy", tuple(listed)))
    session = document.get("session", {})
    if not isinstance(session, dict):
        reader.error("[session]", "must be a table of setting = [values]")
        session = {}
    axes += _session_axes(reader, session, check_plan)
    figures = head.get("figures", list(DEFAULT_FIGURES))
    if not isinstance(figures, list) or not all(isinstance(f, str) for f in figures) or not figures:
        reader.error("[sweep], figures", 'must be a list of figure names such as ["house_edge"]')
        figures = list(DEFAULT_FIGURES)
    exact_limit = head.get("exact_limit", DEFAULT_EXACT_LIMIT)
    if isinstance(exact_limit, bool) or not isinstance(exact_limit, int) or exact_limit < 0:
        reader.error("[sweep], exact_limit", "must be a whole number of states, at least 0")
        exact_limit = DEFAULT_EXACT_LIMIT
    title = head.get("title", "")
    if not isinstance(title, str):
        reader.error("[sweep], title", "must be text")
        title = ""
    spec = SweepSpec(
        source=source,
        title=title or f"Sweep of {ruleset_path.name}",
        ruleset_path=ruleset_path,
        ruleset_text=ruleset_text,
        axes=tuple(axes),
        figures=tuple(figures),
        exact_limit=exact_limit,
    )
    if spec.size > MAX_POINTS:
        reader.error("", f"the grid has {spec.size:,} points, over the limit of {MAX_POINTS:,}")
    if reader.problems:
        raise RulesetError(reader.problems)
    return spec
