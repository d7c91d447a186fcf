"""Building a ``Ruleset`` from a checked TOML document: one pass that collects problems.

Every value is exact (an integer or an expression of ``model/expr.py``); families of states
(``model/families.py``) and state-level family outcomes are expanded into plain state tables and
read exactly as hand-written ones; strategy rules become plain (state, action) pairs
(``model/family_rules.py``). Nothing raises for a bad file: each problem becomes a ``Problem``.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from typing import Any

from oddsbench.model import deck_rules
from oddsbench.model.deck import Deck, read_deck
from oddsbench.model.errors import Problem, shown_name, type_name
from oddsbench.model.expr import ExpressionError, evaluate, is_tree, names_in, parse
from oddsbench.model.families import FamilyMember, expand_families, expand_plain_state, uses_family_outcomes
from oddsbench.model.family_rules import rule_actions
from oddsbench.model.numbers import QQ, Rational, is_rational, text
from oddsbench.model.ruleset import Outcome, Ruleset, State, Strategy

MAX_NAME_LENGTH = 200
FORMAT_VERSION = 1

RULESET_KEYS = frozenset({"title", "about", "start", "stake", "version"})
STATE_KEYS = frozenset({"outcomes", "choices", "result", "about", "draw"})
OUTCOME_KEYS = frozenset({"to", "prob", "pay", "stake", "note"})
TOP_KEYS = frozenset({"ruleset", "params", "states", "strategies", "session", "families", "deck"})


def describe_value(value: Any) -> str:
    """A short echo of a field's value for messages: strings quoted (unprintable characters
    escaped, so a file cannot send terminal control codes through a message), long ones cut."""
    if is_rational(value):
        value = text(value)  # a family's value, shown as the text it stands for
    if isinstance(value, str):
        shown = '"' + "".join(c if c.isprintable() else repr(c)[1:-1] for c in value[:80]) + '"'
    else:
        shown = repr(value)
    return shown if len(shown) <= 60 else shown[:57] + '..."'


class RulesetReader:
    """One pass over the TOML document; records problems instead of raising."""

    def __init__(self, source: str, problems: list[Problem], overrides: Mapping[str, Rational] | None = None) -> None:
        self.source = source
        self.problems = problems
        self.params: dict[str, Rational] = {}
        self.failed_params: set[str] = set()
        self.members: dict[str, FamilyMember] = {}
        self.member_tables: dict[str, dict[str, Any]] = {}
        self.overrides = dict(overrides or {})
        self.deck: Deck | None = None
        self.deck_failed = False
        self.hands: tuple[str, ...] = ()

    def error(self, where: str, message: str) -> None:
        self.problems.append(Problem(self.source, where, message))

    def warn(self, where: str, message: str) -> None:
        self.problems.append(Problem(self.source, where, message, "warning"))

    def unknown_keys(self, table: dict[str, Any], known: frozenset[str], where: str) -> None:
        for key in table:
            if key not in known:
                self.warn(where, f"unknown field {shown_name(key)} is ignored")

    def value(self, raw: Any, where: str, env: dict[str, Rational] | None = None) -> Rational | None:
        """An exact value from a TOML integer or an expression string; None after an error."""
        if isinstance(raw, bool):
            self.error(where, "must be a number or an expression in quotes, not true/false")
            return None
        if isinstance(raw, int):
            return QQ(raw)
        if is_rational(raw):  # a family's value, already evaluated under the same limits
            return raw
        if isinstance(raw, float):
            if raw != raw or raw in (float("inf"), float("-inf")):
                self.error(where, f"must be a finite number, not {raw}")
            else:
                self.error(where, f'write decimals in quotes ("{raw}") so they stay exact')
            return None
        if not isinstance(raw, str) and not is_tree(raw):
            self.error(where, f"must be a number or an expression in quotes, not {type_name(raw)}")
            return None
        try:
            tree = raw if is_tree(raw) else parse(raw)
            broken = sorted(names_in(tree) & self.failed_params)
            if broken:
                self.error(where, f"uses parameter {shown_name(broken[0])}, which has an error")
                return None
            return evaluate(tree, self.params if env is None else env)
        except ExpressionError as error:
            self.error(where, str(error))
            return None
        except RecursionError:
            self.error(where, "expression nested too deeply")
            return None

    def text_field(self, table: dict[str, Any], key: str, where: str, required: bool) -> str | None:
        if key not in table:
            if required:
                self.error(where, f"missing required field {key!r}")
            return None
        raw = table[key]
        if not isinstance(raw, str):
            self.error(f"{where}, {key}", f"must be text, not {type_name(raw)}")
            return None
        return raw

    def read(self, document: dict[str, Any]) -> Ruleset | None:
        self.unknown_keys(document, TOP_KEYS, "")
        head = document.get("ruleset")
        if not isinstance(head, dict):
            self.error("", "missing [ruleset] table" if head is None else "[ruleset] must be a table")
            head = {}
        self.unknown_keys(head, RULESET_KEYS, "[ruleset]")
        version = head.get("version", FORMAT_VERSION)
        if isinstance(version, bool) or version != FORMAT_VERSION:
            self.error(
                "[ruleset], version",
                f"format version {describe_value(version)} is not supported (this oddsbench reads version "
                f"{FORMAT_VERSION})",
            )
        title = self.text_field(head, "title", "[ruleset]", required=True)
        about = self.text_field(head, "about", "[ruleset]", required=False) or ""
        start = self.text_field(head, "start", "[ruleset]", required=True)
        if start is not None and not start.strip():
            self.error("[ruleset], start", "must name a state, not be blank")
        stake = self.value(head.get("stake", 1), "[ruleset], stake")
        if stake is not None and stake < 0:
            self.error("[ruleset], stake", f"cannot be negative, got {text(stake)}")
        self.read_params(document.get("params", {}))
        if "deck" in document:
            self.deck = read_deck(document["deck"], self)
            self.deck_failed = self.deck is None
        states = self.read_states(document)
        strategies = self.read_strategies(document.get("strategies", {}))
        session = document.get("session", {})
        if not isinstance(session, dict):
            self.error("[session]", f"must be a table, not {type_name(session)}")
            session = {}
        if any(problem.is_error for problem in self.problems):
            return None
        return Ruleset(
            title=title or "",
            about=about,
            start=start or "",
            stake=stake,
            states=tuple(states),
            source=self.source,
            params=tuple(self.params.items()),
            strategies=tuple(strategies),
            session=session,
            deck=self.deck,
        )

    def read_params(self, raw: Any) -> None:
        if not isinstance(raw, dict):
            self.error("[params]", f"must be a table, not {type_name(raw)}")
            return
        for name, value in raw.items():
            where = f"param {shown_name(name)}"
            if len(name) > MAX_NAME_LENGTH:
                self.error(where, f"name longer than {MAX_NAME_LENGTH} characters")
                continue
            try:
                parse(name)
                if set(names_in(parse(name))) != {name}:
                    raise ExpressionError("not a plain name")
            except ExpressionError:
                rule = "letters, digits and _ (not starting with a digit or '__')"
                self.error(where, f"a parameter name must be {rule}")
                continue
            if name in self.overrides:
                self.params[name] = self.overrides[name]
                continue
            result = self.value(value, where)
            if result is None:
                self.failed_params.add(name)
            else:
                self.params[name] = result
        for name in self.overrides:
            if name not in raw:
                known = ", ".join(repr(key) for key in raw) or "none"
                self.error(
                    f"param {name!r}", f"cannot be set: the file has no such parameter (its parameters: {known})"
                )

    def read_states(self, document: dict[str, Any]) -> list[State]:
        raw_states = document.get("states")
        if raw_states is None:
            raw_states = {}
        if not isinstance(raw_states, dict):
            self.error("[states]", f"must be a table, not {type_name(raw_states)}")
            return []
        tables: dict[str, Any] = {}
        for name, table in raw_states.items():
            if uses_family_outcomes(table):
                table = expand_plain_state(name, table, self.source, self.problems, self.params)
                if table is None:
                    continue
            tables[name] = table
        expansion = expand_families(document, self.source, self.problems, self.params)
        self.members = expansion.members
        self.member_tables = expansion.tables
        for name, table in expansion.tables.items():
            if name in tables:
                self.error(
                    f"state {name!r}", f"defined twice (by hand and by family {expansion.members[name].family!r})"
                )
                continue
            tables[name] = table
        if not tables:
            self.error("[states]", "no states: a ruleset needs at least one state")
        self.hands = deck_rules.hand_names(tables)
        return [state for name, table in tables.items() if (state := self.read_state(name, table))]

    def read_state(self, name: str, table: Any) -> State | None:
        where = f"state {shown_name(name)}"
        if not name.strip():
            self.error(where, "a state name must not be blank")
            return None
        if len(name) > MAX_NAME_LENGTH:
            self.error(where, f"name longer than {MAX_NAME_LENGTH} characters")
            return None
        if not isinstance(table, dict):
            self.error(where, f"must be a table, not {type_name(table)}")
            return None
        self.unknown_keys(table, STATE_KEYS, where)
        result = self.text_field(table, "result", where, required=False)
        if result is not None and len(result) > MAX_NAME_LENGTH:
            self.error(f"{where}, result", f"longer than {MAX_NAME_LENGTH} characters")
            return None
        outcomes: tuple[Outcome, ...] = ()
        choices: list[tuple[str, tuple[Outcome, ...]]] = []
        if "outcomes" in table and "choices" in table:
            self.error(where, "has both 'outcomes' and 'choices': a state has one or the other")
            return None
        draw = None
        if "draw" in table:
            if self.deck is None and self.deck_failed:
                return None  # the [deck] table's own problem is the one to fix
            draw = deck_rules.read_draw(table["draw"], where, self, self.deck)
            if draw is None:
                return None
            if "choices" in table:
                self.error(where, "a state that draws cannot offer choices: draw here, then decide in the next state")
                return None
            if "outcomes" not in table:
                self.error(where, "draws but has no outcomes: say where the round goes after the draw")
                return None
        if "outcomes" in table:
            outcomes = self.read_outcomes(table["outcomes"], where, "outcomes", draw is not None)
            if not outcomes and isinstance(table["outcomes"], list) and not table["outcomes"]:
                self.warn(where, "'outcomes' is empty, so this state ends the round")
        if "choices" in table:
            raw_choices = table["choices"]
            if not isinstance(raw_choices, dict) or not raw_choices:
                self.error(f"{where}, choices", "must be a table of action = [outcomes]")
                return None
            for action, raw in raw_choices.items():
                if len(action) > MAX_NAME_LENGTH:
                    too_long = f"name longer than {MAX_NAME_LENGTH} characters"
                    self.error(f"{where}, choice {shown_name(action)}", too_long)
                    return None
                listed = self.read_outcomes(raw, f"{where}, choice {shown_name(action)}", "outcomes")
                if listed:
                    choices.append((action, listed))
        return State(name=name, outcomes=outcomes, choices=tuple(choices), result=result, draw=draw)

    def read_outcomes(self, raw: Any, where: str, field_name: str, draws: bool = False) -> tuple[Outcome, ...]:
        if not isinstance(raw, list):
            self.error(f"{where}, {field_name}", f"must be a list of outcome tables, not {type_name(raw)}")
            return ()
        raw, rules = deck_rules.split_rules(raw, where, self)
        if any(when is not None or by_hand for when, by_hand in rules) or draws:
            return self.read_cases(raw, rules, where, field_name, draws)
        return self.read_plain_outcomes(raw, where)

    def read_cases(self, raw: list[Any], rules, where: str, field_name: str, draws: bool) -> tuple[Outcome, ...]:
        """Outcomes of a deck game that read the hands: plain reading, then the hand rules attached.
        Where any ``when`` reads the hands (or the state draws) the outcomes are cases, tried in order."""
        if not deck_rules.check_rules(rules, where, self, self.deck, self.hands, draws):
            return ()
        cases = draws or any(when is not None for when, _ in rules)
        if cases and not deck_rules.cases_well_formed(raw, rules, where, self, draws, field_name):
            return ()
        outcomes = self.read_plain_outcomes(raw, where)
        if len(outcomes) != len(rules):
            return ()
        one = QQ(1)
        return tuple(
            dataclasses.replace(
                outcome,
                when=when,
                by_hand=by_hand,
                prob=one if cases or any(key == "prob" for key, _ in by_hand) else outcome.prob,
                prob_given=not cases and outcome.prob_given,
            )
            for outcome, (when, by_hand) in zip(outcomes, rules)
        )

    def read_plain_outcomes(self, raw: list[Any], where: str) -> tuple[Outcome, ...]:
        read: list[tuple[dict[str, Any], Rational | None, str]] = []
        failed = False
        for index, item in enumerate(raw, start=1):
            place = f"{where}, outcome {index}"
            if not isinstance(item, dict):
                self.error(place, f'must be a table like {{ to = "...", prob = "..." }}, not {type_name(item)}')
                failed = True
                continue
            self.unknown_keys(item, OUTCOME_KEYS, place)
            if "to" not in item:
                self.error(place, "missing required field 'to'")
                failed = True
            elif not isinstance(item["to"], str):
                self.error(f"{place}, to", f"must be a state name in quotes, not {type_name(item['to'])}")
                failed = True
            elif len(item["to"]) > MAX_NAME_LENGTH:
                self.error(f"{place}, to", f"state name longer than {MAX_NAME_LENGTH} characters")
                failed = True
            prob = None
            if "prob" in item:
                prob = self.value(item["prob"], f"{place}, prob {describe_value(item['prob'])}")
                if prob is None:
                    failed = True
                elif prob < 0 or prob > 1:
                    self.error(
                        f"{place}, prob {describe_value(item['prob'])}", f"must be between 0 and 1, got {text(prob)}"
                    )
                    failed = True
            read.append((item, prob, place))
        explicit = sum((prob for item, prob, _ in read if prob is not None), QQ(0))
        omitted = [place for item, prob, place in read if "prob" not in item]
        share = QQ(0)
        if omitted and not failed:
            leftover = QQ(1) - explicit
            if leftover < 0:
                self.error(
                    where,
                    f"given probabilities already sum to {text(explicit)}, more than 1, "
                    f"so nothing is left for the {len(omitted)} outcome(s) without 'prob'",
                )
                failed = True
            else:
                share = leftover / len(omitted)
        outcomes: list[Outcome] = []
        for item, prob, place in read:
            pay = self.value(item.get("pay", 0), f"{place}, pay {describe_value(item.get('pay', 0))}")
            stake = self.value(item.get("stake", 0), f"{place}, stake {describe_value(item.get('stake', 0))}")
            if stake is not None and stake < 0:
                self.error(f"{place}, stake", f"extra stake cannot be negative, got {text(stake)}")
                failed = True
            note = item.get("note", "")
            if not isinstance(note, str):
                self.error(f"{place}, note", f"must be text, not {type_name(note)}")
                failed = True
            if pay is None or stake is None or failed:
                failed = True
                continue
            outcomes.append(
                Outcome(
                    to=item["to"],
                    prob=prob if prob is not None else share,
                    pay=pay,
                    stake=stake,
                    note=note,
                    prob_given=prob is not None,
                )
            )
        return () if failed else tuple(outcomes)

    def read_strategies(self, raw: Any) -> list[Strategy]:
        if not isinstance(raw, dict):
            self.error("[strategies]", f"must be a table, not {type_name(raw)}")
            return []
        strategies = []
        for name, table in raw.items():
            where = f"strategy {shown_name(name)}"
            if len(name) > MAX_NAME_LENGTH:
                self.error(where, f"name longer than {MAX_NAME_LENGTH} characters")
                continue
            if not isinstance(table, dict):
                self.error(where, f'must be a table of state = "action", not {type_name(table)}')
                continue
            actions = []
            default = None
            rules = table.get("rules")
            for state_name, action in table.items():
                if state_name == "rules":
                    continue
                if not isinstance(action, str):
                    self.error(f"{where}, {shown_name(state_name)}", f"action must be text, not {type_name(action)}")
                    continue
                if len(action) > MAX_NAME_LENGTH or len(state_name) > MAX_NAME_LENGTH:
                    self.error(f"{where}, {shown_name(state_name)}", f"name longer than {MAX_NAME_LENGTH} characters")
                    continue
                if state_name == "default":
                    default = action
                else:
                    actions.append((state_name, action))
            rules, by_hand = deck_rules.split_strategy_rules(rules, where, self, self.deck, self.hands)
            if rules is not None:
                explicit = {state_name for state_name, _ in actions}
                actions += rule_actions(rules, where, self.members, self.params, explicit, self.problems, self.source)
            strategies.append(Strategy(name=name, actions=tuple(actions), default=default, by_hand=tuple(by_hand)))
        return strategies
