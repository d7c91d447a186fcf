"""Indexed families of states: one table in the file, many states once expanded.

A game with a state per running total (Pig, a dealer's hand) would take hundreds of hand-written
tables. A family writes them once::

    [families.turn]
    state = "turn-{t}"              # the name of each member; {...} holds an expression
    index = { t = [0, 99] }         # whole-number ranges, both ends included
    when = "t != 1"                 # optional: which index values give a member
    choices.roll = [
      { to = "pigged", prob = "1/6", pay = "-t" },
      { each = { f = [2, 6] }, to = "turn-{t + f}", prob = "1/6", when = "t + f < 100" },
    ]

Index variables (and any ``each`` variables of an outcome) are names in the expression language,
beside the file's ``[params]``. Everything goes through ``model/expr.py``; nothing is run as code.
The expansion is bounded (``MAX_FAMILY_STATES``, ``MAX_FAMILY_OUTCOMES``) and every error names
the family and the index values where it failed. The result is plain state tables, read by
``model/load.py`` exactly as if written out by hand. The index space (templates, ranges, ``let``,
combinations) is ``model/family_index.py``; the work budget of an expansion, ``model/family_budget.py``.
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from dataclasses import dataclass
from typing import Any

from oddsbench.model import family_index
from oddsbench.model.errors import Problem, type_name
from oddsbench.model.expr import ExpressionError, Node, evaluate, parse, partial
from oddsbench.model.family_budget import STATE_LIMIT, TABLE_STEPS, ExpansionSteps
from oddsbench.model.family_index import (
    FamilyError,
    Template,
    TooManyCombinations,
    at_index,
    fixed_count,
    index_combinations,
    index_ranges,
    parse_template,
    read_lets,
    reads_hands,
    steps_in,
    value_node,
    with_lets,
)
from oddsbench.model.numbers import Rational

MAX_FAMILY_STATES = 100_000
MAX_FAMILY_OUTCOMES = 1_000_000

FAMILY_KEYS = frozenset({"state", "index", "let", "when", "outcomes", "choices", "result", "about", "draw"})
FAMILY_OUTCOME_KEYS = frozenset({"to", "prob", "pay", "stake", "note", "when", "each", "let"})
CASE_KEYS = frozenset({"when", "to"})


@dataclass(frozen=True)
class FamilyMember:
    """Which family a state came from and at which index values (used by strategy rules)."""

    family: str
    index: tuple[tuple[str, Rational], ...]


@dataclass(frozen=True)
class FamilyExpansion:
    """Plain state tables from every family, and the family each came from."""

    tables: dict[str, dict[str, Any]]
    members: dict[str, FamilyMember]


class _Outcome:
    """One outcome table of a family, parsed once and rendered per index combination."""

    def __init__(self, raw: Any, where: str, taken: set[str], warn) -> None:
        if not isinstance(raw, dict):
            raise FamilyError(f'{where}: must be a table like {{ to = "...", prob = "..." }}, not {type_name(raw)}')
        for key in raw:
            if key not in FAMILY_OUTCOME_KEYS:
                warn(where, f"unknown field {key!r} is ignored")
        target = raw.get("to")
        if not isinstance(target, str | list):
            raise FamilyError(
                f"{where}: needs 'to', a state name in quotes (with {{...}} placeholders) or a list of cases"
            )
        inner_taken = set(taken)
        self.each = index_ranges(raw["each"], f"{where}, each", inner_taken) if "each" in raw else []
        self.lets = read_lets(raw.get("let"), f"{where}, let", inner_taken)
        try:
            self.cases = self._cases(target, where)
            self.note = parse_template(raw["note"]) if isinstance(raw.get("note"), str) else None
            self.when = parse(raw["when"]) if "when" in raw else None
        except ExpressionError as error:
            raise FamilyError(f"{where}: {error}") from None
        if "when" in raw and not isinstance(raw["when"], str):
            raise FamilyError(f"{where}, when: must be a condition in quotes")
        if "note" in raw and not isinstance(raw["note"], str):
            raise FamilyError(f"{where}, note: must be text")
        self.values = {key: value_node(raw[key], f"{where}, {key}") for key in ("prob", "pay", "stake") if key in raw}
        self.where = where
        self.steps = (
            TABLE_STEPS
            + sum(steps_in(node) for _, node in self.lets)
            + steps_in(self.when)
            + sum(steps_in(test) + template.steps for test, template in self.cases)
            + sum(steps_in(node) for node in self.values.values())
            + (self.note.steps if self.note is not None else 0)
        )

    def tables_per_member(self, params: Mapping[str, Rational]) -> int:
        """How many tables this outcome renders per member, when its ranges are fixed (else 1)."""
        count = fixed_count(self.each, params)
        return 1 if count is None else count

    def render(
        self, env: dict[str, Rational], tried: list[int] | None = None, steps: ExpansionSteps | None = None
    ) -> Iterator[dict[str, Any]]:
        for inner in index_combinations(self.each, env, tried):
            if steps is not None:
                steps.spend(self.steps)
            try:
                inner = with_lets(inner, self.lets)
                table: dict[str, Any] = {}
                if self.when is not None and reads_hands(self.when, inner):
                    table["when"] = partial(self.when, inner)  # a case of a deck game, chosen by the cards
                elif self.when is not None and evaluate(self.when, inner) == 0:
                    continue
                target = self._target(inner)
                if target is None:
                    continue
                table["to"] = target
                for key, node in self.values.items():
                    if isinstance(node, int):
                        table[key] = node
                    elif reads_hands(node, inner):
                        table[key] = partial(node, inner)
                    else:  # the exact value itself: read as written by hand, without a second parse
                        table[key] = evaluate(node, inner)
                if self.note is not None:
                    table["note"] = self.note.render(inner)
            except ExpressionError as error:
                shown = at_index(inner, [r.name for r in self.each]).removeprefix(" at ")
                raise ExpressionError(f"{shown}: {error}" if shown else str(error)) from None
            yield table

    @staticmethod
    def _cases(target: str | list, where: str) -> list[tuple[Node | None, Template]]:
        if isinstance(target, str):
            return [(None, parse_template(target))]
        cases = []
        for number, case in enumerate(target, start=1):
            place = f"{where}, to, case {number}"
            if not isinstance(case, dict) or not isinstance(case.get("to"), str):
                raise FamilyError(f'{place}: must be a table like {{ when = "...", to = "..." }}')
            if any(key not in CASE_KEYS for key in case):
                raise FamilyError(f"{place}: only 'when' and 'to' belong in a case")
            if "when" in case and not isinstance(case["when"], str):
                raise FamilyError(f"{place}, when: must be a condition in quotes")
            cases.append((parse(case["when"]) if "when" in case else None, parse_template(case["to"])))
        if not cases:
            raise FamilyError(f"{where}, to: the list of cases is empty")
        return cases

    def _target(self, env: dict[str, Rational]) -> str | None:
        """The first case whose condition holds; None when no case matches (no outcome)."""
        for test, template in self.cases:
            if test is not None and reads_hands(test, env):
                raise ExpressionError(
                    "a case in 'to' cannot read the hands: write one outcome per case, each with its own 'when'"
                )
            if test is None or evaluate(test, env) != 0:
                return template.render(env)
        return None


def _take_templates(draw: Any) -> list[Any] | None:
    """Placeholders in a family's ``draw.take`` (``take = ["{c}"]``), parsed once; None when there are none."""
    if not isinstance(draw, dict) or not isinstance(draw.get("take"), list):
        return None
    return [parse_template(t) if isinstance(t, str) and "{" in t else t for t in draw["take"]]


class _Family:
    def __init__(self, name: str, raw: Any, params: Mapping[str, Rational], warn, plain: bool = False) -> None:
        self.name = name
        self._current = "state"
        self.tried = [family_index.MAX_FAMILY_COMBINATIONS]
        self.steps: ExpansionSteps | None = None
        self.states_left = MAX_FAMILY_STATES
        where = f"family {name!r}"
        if not isinstance(raw, dict):
            raise FamilyError(f"{where}: must be a table, not {type_name(raw)}")
        for key in raw:
            if key not in FAMILY_KEYS:
                warn(where, f"unknown field {key!r} is ignored")
        if not isinstance(raw.get("state"), str):
            raise FamilyError(f"{where}: needs 'state', the member name with placeholders, e.g. \"total-{{t}}\"")
        taken = set(params)
        self.ranges = [] if plain else index_ranges(raw.get("index"), f"{where}, index", taken)
        self.variables = [r.name for r in self.ranges]
        self.lets = read_lets(raw.get("let"), f"{where}, let", taken)
        try:
            self.state = parse_template(raw["state"])
            self.when = parse(raw["when"]) if "when" in raw else None
            self.result = parse_template(raw["result"]) if isinstance(raw.get("result"), str) else None
        except ExpressionError as error:
            raise FamilyError(f"{where}: {error}") from None
        if "when" in raw and not isinstance(raw["when"], str):
            raise FamilyError(f"{where}, when: must be a condition in quotes")
        if "result" in raw and not isinstance(raw["result"], str):
            raise FamilyError(f"{where}, result: must be text")
        if "outcomes" in raw and "choices" in raw:
            raise FamilyError(f"{where}: has both 'outcomes' and 'choices': a state has one or the other")
        self.about = raw.get("about")
        self.draw = raw.get("draw")
        try:
            self.take = _take_templates(self.draw)
        except ExpressionError as error:
            raise FamilyError(f"{where}, draw: {error}") from None
        self.outcomes = self._outcome_list(raw.get("outcomes"), f"{where}, outcomes", taken, warn)
        self.choices: list[tuple[str, list[_Outcome]]] = []
        if "choices" in raw:
            if not isinstance(raw["choices"], dict) or not raw["choices"]:
                raise FamilyError(f"{where}, choices: must be a table of action = [outcomes]")
            for action, listed in raw["choices"].items():
                self.choices.append((action, self._outcome_list(listed, f"{where}, choice {action!r}", taken, warn)))

    @staticmethod
    def _outcome_list(raw: Any, where: str, taken: set[str], warn) -> list[_Outcome] | None:
        if raw is None:
            return None
        if not isinstance(raw, list):
            raise FamilyError(f"{where}: must be a list of outcome tables, not {type_name(raw)}")
        return [_Outcome(item, f"{where}, outcome {i}", taken, warn) for i, item in enumerate(raw, start=1)]

    def member_steps(self) -> int:
        """Steps of one index combination: its lets, its condition, its name."""
        return TABLE_STEPS + sum(steps_in(node) for _, node in self.lets) + steps_in(self.when) + self.state.steps

    def outcome_steps(self, params: Mapping[str, Rational]) -> tuple[int, int]:
        """(steps, tables) of one member's outcome tables, where their ranges are fixed."""
        listed = list(self.outcomes or []) + [outcome for _, outcomes in self.choices for outcome in outcomes]
        tables = [outcome.tables_per_member(params) for outcome in listed]
        return sum(outcome.steps * count for outcome, count in zip(listed, tables)), sum(tables)

    def members(self, params: dict[str, Rational]) -> Iterator[tuple[dict[str, Rational], str]]:
        env: dict[str, Rational] = params
        count = fixed_count(self.ranges, params)
        if count is not None and count > self.tried[0]:
            raise FamilyError(
                f"family {self.name!r}: index ranges give {count:,} combinations, over the limit of "
                f"{family_index.MAX_FAMILY_COMBINATIONS:,}"
            )
        if count is not None and self.when is None and count > self.states_left:
            raise _too_many_states(self.name, self.states_left)
        each = self.member_steps()
        if count is not None and self.steps is not None:
            outcome_steps, tables = self.outcome_steps(params) if self.when is None else (0, 0)
            work = count * (each + outcome_steps)
            # past the combination limit that limit speaks first; the running count bounds the rest
            if count * (1 + tables) <= self.tried[0] and work > self.steps.left:
                combinations = "index combination" if count == 1 else "index combinations"
                shown = f"about {work:,} expression steps to expand ({count:,} {combinations}, {work // count:,} each)"
                raise FamilyError(f"family {self.name!r}: " + self.steps.over(shown))
        combinations = index_combinations(self.ranges, params, self.tried)
        while True:
            try:
                if self.steps is not None:
                    self.steps.spend(each)
                env = next(combinations)
                env = with_lets(env, self.lets)
                if self.when is not None and evaluate(self.when, env) == 0:
                    continue
                name = self.state.render(env)
            except StopIteration:
                return
            except ExpressionError as error:
                raise FamilyError(f"family {self.name!r}{at_index(env, self.variables)}: {error}") from None
            except TooManyCombinations as error:
                raise FamilyError(f"family {self.name!r}: {error}") from None
            yield env, name

    def table(self, env: dict[str, Rational], budget: list[int]) -> dict[str, Any]:
        """One member's plain state table; ``budget`` counts outcomes left before the limit."""
        table: dict[str, Any] = {}
        where = f"family {self.name!r}{at_index(env, self.variables)}"
        try:
            if self.result is not None:
                table["result"] = self.result.render(env)
            if isinstance(self.about, str):
                table["about"] = self.about
            if self.draw is not None:
                self._current = "draw"
                table["draw"] = self._drawn(env)
            if self.outcomes is not None:
                listed = self._render(self.outcomes, env, budget)
                if listed:
                    table["outcomes"] = listed
            if self.choices:
                choices = {}
                for action, outcomes in self.choices:
                    listed = self._render(outcomes, env, budget)
                    if listed:
                        choices[action] = listed
                if choices:
                    table["choices"] = choices
        except (ExpressionError, TooManyCombinations) as error:
            raise FamilyError(f"{where}, {self._current}: {error}") from None
        return table

    def _drawn(self, env: dict[str, Rational]) -> Any:
        """The member's draw: as written, with ``{...}`` placeholders in ``take`` filled in."""
        if self.take is None:
            return self.draw
        return dict(self.draw, take=[t.render(env) if isinstance(t, Template) else t for t in self.take])

    def _render(self, outcomes: list[_Outcome], env: dict[str, Rational], budget: list[int]) -> list[dict[str, Any]]:
        listed = []
        for outcome in outcomes:
            self._current = outcome.where.removeprefix(f"family {self.name!r}, ")
            for table in outcome.render(env, self.tried, self.steps):
                budget[0] -= 1
                if budget[0] < 0:
                    raise FamilyError(
                        f"family {self.name!r}: families expand to more than "
                        f"{MAX_FAMILY_OUTCOMES:,} outcomes (the limit)"
                    )
                listed.append(table)
        return listed


def _too_many_states(name: str, cap: int) -> FamilyError:
    if cap < MAX_FAMILY_STATES:
        return FamilyError(
            f"family {name!r}: families expand to more than {cap:,} states, over the state limit "
            "(raise it with --max-states)"
        )
    return FamilyError(f"family {name!r}: families expand to more than {MAX_FAMILY_STATES:,} states (the limit)")


def expand_families(
    document: dict[str, Any], source: str, problems: list[Problem], params: dict[str, Rational]
) -> FamilyExpansion:
    """Every family of the document as plain state tables; problems are appended, never raised."""
    raw = document.get("families", {})
    tables: dict[str, dict[str, Any]] = {}
    members: dict[str, FamilyMember] = {}
    if not isinstance(raw, dict):
        problems.append(Problem(source, "[families]", f"must be a table, not {type_name(raw)}"))
        return FamilyExpansion(tables, members)

    def warn(where: str, message: str) -> None:
        problems.append(Problem(source, where, message, "warning"))

    state_cap = STATE_LIMIT.get()
    states_cap = MAX_FAMILY_STATES if state_cap is None else min(state_cap, MAX_FAMILY_STATES)
    states_left = states_cap
    budget = [MAX_FAMILY_OUTCOMES]
    tried = [family_index.MAX_FAMILY_COMBINATIONS]
    steps = ExpansionSteps()
    for name, body in raw.items():
        try:
            family = _Family(name, body, params, warn)
            family.tried = tried
            family.steps = steps
            family.states_left = states_left
            found: dict[str, dict[str, Rational]] = {}
            for env, state in family.members(params):
                if state in found:
                    first = at_index(found[state], family.variables).removeprefix(" at ")
                    again = at_index(env, family.variables).removeprefix(" at ")
                    raise FamilyError(f"family {name!r}: {first} and {again} both give the state name {state!r}")
                if state in tables:
                    where = f"family {name!r}{at_index(env, family.variables)}"
                    raise FamilyError(f"{where}: state {state!r} is made twice")
                states_left -= 1
                if states_left < 0:
                    raise _too_many_states(name, states_cap)
                found[state] = env
            for state, env in found.items():
                tables[state] = family.table(env, budget)
                members[state] = FamilyMember(name, tuple((v, env[v]) for v in family.variables))
        except FamilyError as error:
            problems.append(Problem(source, "", str(error)))
        except RecursionError:
            problems.append(Problem(source, f"family {name!r}", "expression nested too deeply"))
    return FamilyExpansion(tables, members)


FAMILY_ONLY_OUTCOME_KEYS = frozenset({"each", "let", "when"})


def uses_family_outcomes(table: Any) -> bool:
    """Whether a hand-written state uses ``each``, ``let``, ``when`` or a list of cases in ``to``."""
    if not isinstance(table, dict):
        return False
    lists = [table.get("outcomes")]
    if isinstance(table.get("choices"), dict):
        lists += list(table["choices"].values())
    return any(
        isinstance(item, dict) and (FAMILY_ONLY_OUTCOME_KEYS & item.keys() or isinstance(item.get("to"), list))
        for listed in lists
        if isinstance(listed, list)
        for item in listed
    )


def expand_plain_state(
    name: str, table: dict[str, Any], source: str, problems: list[Problem], params: dict[str, Rational]
) -> dict[str, Any] | None:
    """A hand-written state whose outcomes use family features, rendered to a plain table."""

    def warn(where: str, message: str) -> None:
        problems.append(Problem(source, where, message, "warning"))

    raw = {key: value for key, value in table.items() if key in ("outcomes", "choices", "result", "about", "draw")}
    raw["state"] = name.replace("{", "{{").replace("}", "}}")
    try:
        family = _Family(name, raw, params, warn, plain=True)
        family.name = name
        return family.table(dict(params), [MAX_FAMILY_OUTCOMES])
    except FamilyError as error:
        problems.append(Problem(source, "", str(error).replace(f"family {name!r}", f"state {name!r}", 1)))
    except RecursionError:
        problems.append(Problem(source, f"state {name!r}", "expression nested too deeply"))
    return None
