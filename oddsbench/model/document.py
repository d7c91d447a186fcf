"""A ruleset file being edited: operations on its TOML document that keep comments and order.

The workbench never rebuilds a file from the ``Ruleset`` data: it edits the user's own TOML
(tomlkit keeps comments, blank lines, key order and alignment), and the edited text is read
back through ``read_ruleset_text`` exactly as ``oddsbench check`` would read the saved file.
Values are written as the user typed them: a whole number stays a TOML integer, anything else
(``"8/36"``, ``"1 - p"``) becomes a quoted expression; an empty optional field is removed.

``RulesetDocument`` gathers one mixin per concept: outcomes and their parts, actions and kinds of
state, strategies, families (``document_*.py``); this module holds the round's head, parameters,
the session table, states and the references to a name.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import tomlkit
from tomlkit.exceptions import ParseError, TOMLKitError

from oddsbench.model.document_base import DocumentError, OutcomeList, deletion
from oddsbench.model.document_families import FamilyEdits, as_template
from oddsbench.model.document_outcomes import FAMILY_FIELDS, OUTCOME_FIELDS, OutcomeEdits, OutcomeRow
from oddsbench.model.toml_edits import TEXT_FIELDS, multiline_array, rename_key, shown, value_item

HEAD_FIELDS = ("title", "about", "start", "stake")

__all__ = [
    "DocumentError",
    "FAMILY_FIELDS",
    "HEAD_FIELDS",
    "OUTCOME_FIELDS",
    "OutcomeList",
    "OutcomeRow",
    "RulesetDocument",
    "TEXT_FIELDS",
    "TomlPlace",
    "parse_with_place",
    "shown",
    "value_item",
]


@dataclass(frozen=True)
class TomlPlace:
    """Where the text stops being TOML: 1-based line and column, and tomlkit's reason."""

    line: int
    column: int
    reason: str


def parse_with_place(content: str) -> tuple[RulesetDocument | None, TomlPlace | None]:
    """The document, or where the text fails as TOML (None for a place when it nests too deeply)."""
    try:
        return RulesetDocument(tomlkit.parse(content)), None
    except ParseError as error:
        reason = " ".join(str(error).split())
        reason = reason.removesuffix(f" at line {error.line} col {error.col}")
        return None, TomlPlace(error.line, error.col, reason)
    except TOMLKitError as error:
        return None, TomlPlace(1, 1, " ".join(str(error).split()))
    except RecursionError:
        return None, None


class RulesetDocument(FamilyEdits, OutcomeEdits):
    """The editable TOML of one ruleset. Every method either edits in place or raises DocumentError."""

    @classmethod
    def from_text(cls, content: str) -> RulesetDocument:
        return cls(tomlkit.parse(content))

    # ----- reading, for display -----

    def head(self) -> dict[str, str]:
        table = self._table("ruleset")
        return {name: shown(table.get(name)) if table is not None else "" for name in HEAD_FIELDS}

    def params(self) -> list[tuple[str, str]]:
        table = self._table("params")
        return [] if table is None else [(str(name), shown(value)) for name, value in table.items()]

    def session(self) -> list[tuple[str, str]]:
        table = self._table("session")
        return [] if table is None else [(str(name), shown(value)) for name, value in table.items()]

    def state_names(self) -> list[str]:
        return self._names("states")

    def family_count(self) -> int:
        return len(self.family_names())

    def state_kind(self, name: str) -> str:
        """``outcomes``, ``choices`` or ``end`` (a state with neither ends the round)."""
        return self.owner_kind(name)

    def state_result(self, name: str) -> str:
        return shown(self._state(name).get("result"))

    def outcome_lists(self, name: str, family: bool = False) -> list[OutcomeList]:
        owner = self._owner(name, family)
        if "choices" in owner and isinstance(owner["choices"], dict):
            return [OutcomeList(name, str(action), family) for action in owner["choices"]]
        if "outcomes" in owner:
            return [OutcomeList(name, None, family)]
        return []

    def strategies(self) -> list[tuple[str, list[tuple[str, str]]]]:
        return [(name, self.strategy_entries(name)) for name in self.strategy_names()]

    # ----- editing the round's head, params and session -----

    def set_head(self, field: str, raw: str) -> None:
        if field not in HEAD_FIELDS:
            raise DocumentError(f"unknown [ruleset] field {field!r}")
        self._set_or_remove(self._ensure_table("ruleset"), field, raw, required=field in {"title", "start"})

    def set_param(self, name: str, raw: str) -> None:
        self._set_or_remove(self._ensure_table("params"), name, raw, required=True)

    def add_param(self, name: str, raw: str = "0") -> None:
        name = self._checked_name(name, "parameter")
        params = self._ensure_table("params")
        if name in params:
            raise DocumentError(f"a parameter named {name!r} already exists")
        params[name] = value_item(raw, name)

    @deletion
    def delete_param(self, name: str) -> None:
        params = self._table("params")
        if params is None or name not in params:
            raise DocumentError(f"no parameter named {name!r}")
        del params[name]

    def set_session(self, field: str, raw: str) -> None:
        self._set_or_remove(self._ensure_table("session"), field, raw, required=False)

    # ----- editing states -----

    def add_state(self, name: str, kind: str = "outcomes", actions: tuple[str, ...] = ()) -> None:
        """A new state at the end: plain (an empty outcome list), a decision (``actions``, each with
        an outcome to fill in), or an end state with a result."""
        name = self._checked_name(name, "state")
        if name in self.state_names():
            raise DocumentError(f"a state named {name!r} already exists")
        table = tomlkit.table()
        if kind == "end":
            table["result"] = "win"
        elif kind != "choices":
            table["outcomes"] = multiline_array()
        self._append_named("states", name, table)
        if kind == "choices":
            names = [self._checked_name(action, "action") for action in actions] or ["play"]
            if len(set(names)) != len(names):
                raise DocumentError("two actions with one name")
            for action in names:
                self.add_action(name, action)

    def rename_state(self, old: str, new: str) -> int:
        """Rename a state and every reference to it (start, targets, strategies); returns the count."""
        new = self._checked_name(new, "state")
        if old not in self.state_names():
            raise DocumentError(f"no state named {old!r}")
        if new == old:
            return 0
        if new in self.state_names():
            raise DocumentError(f"a state named {new!r} already exists")
        rename_key(self._holder("states", old), old, new)
        changed = 1
        head = self._table("ruleset")
        if head is not None and head.get("start") == old:
            head["start"] = new
            changed += 1
        for owner, family in self._outcome_owners():
            match = (as_template(old), as_template(new)) if family else (old, new)  # templates double braces
            for where in self.outcome_lists(owner, family):
                rows = self._rows(where)
                for index in range(len(rows)):
                    changed += _retarget(rows.row(index), *match)
        return changed + self._rename_state_entries(old, new)

    @deletion
    def delete_state(self, name: str) -> int:
        """Delete a state and the strategy entries that name it; the count of entries removed."""
        if name not in self.state_names():
            raise DocumentError(f"no state named {name!r}")
        del self._holder("states", name)[name]
        return self._drop_state_entries(name)

    def set_state_result(self, name: str, raw: str) -> None:
        self._set_or_remove(self._state(name), "result", raw, required=False)

    # ----- references -----

    def state_references(self, name: str) -> list[str]:
        """Every place that names the state, in words: the start, outcome targets (family templates
        that spell the name as written), strategy entries."""
        return self.references_to({name})

    def references_to(self, names: set[str], skip_family: str | None = None) -> list[str]:
        """Every place outside the states ``names`` themselves (and outside ``skip_family``) that names
        one of them."""
        found = []
        if (self._table("ruleset") or {}).get("start") in names:
            found.append("the round's start")
        templates = {as_template(name) for name in names}
        for owner, family in self._outcome_owners():
            if (owner in names and not family) or (family and owner == skip_family):
                continue
            for where in self.outcome_lists(owner, family):
                rows = self._rows(where)
                for index in range(len(rows)):
                    if _targets(rows.row(index), templates if family else names):
                        place = where.owner_label if where.action is None else f"{where.owner_label}, {where.label}"
                        found.append(f"{place}, outcome {index + 1}")
        found += [f"strategy {strategy!r}" for strategy, body in self._strategy_tables() if names & set(body)]
        return found

    def family_references(self, name: str) -> list[str]:
        """Strategy rules over the family, in words."""
        found = []
        for strategy, body in self._strategy_tables():
            rules = body.get("rules")
            for number, rule in enumerate(rules if isinstance(rules, list) else [], start=1):
                if isinstance(rule, dict) and rule.get("family") == name:
                    found.append(f"strategy {strategy!r}, rule {number}")
        return found

    def _outcome_owners(self) -> list[tuple[str, bool]]:
        return [(name, False) for name in self.state_names()] + [(name, True) for name in self.family_names()]


def _targets(item: Any, targets: set[str]) -> bool:
    if not isinstance(item, dict):
        return False
    to = item.get("to")
    if isinstance(to, str):
        return to in targets
    return isinstance(to, list) and any(isinstance(case, dict) and case.get("to") in targets for case in to)


def _retarget(item: Any, old: str, new: str) -> int:
    """Point an outcome's ``to`` (a name, or each case of a list) from ``old`` to ``new``; the count."""
    if not isinstance(item, dict):
        return 0
    target = item.get("to")
    if target == old:
        item["to"] = new
        return 1
    changed = 0
    for case in target if isinstance(target, list) else []:
        if isinstance(case, dict) and case.get("to") == old:
            case["to"] = new
            changed += 1
    return changed
