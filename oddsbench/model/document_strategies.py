"""Strategies in the file: ``[strategies.NAME]`` tables of ``state = "action"``, a ``default``, and
``rules`` over families, each ``{ family, when, action }``, tried in order.

Edits elsewhere keep strategies in step: renaming a state or an action renames its entries,
turning a decision state plain drops the entries that name it (``_drop_state_entries`` and
friends, called by ``document_choices.py`` and ``document.py``).
"""

from __future__ import annotations

from typing import Any

import tomlkit

from oddsbench.model.document_base import DocumentBase, DocumentError, deletion
from oddsbench.model.toml_edits import Keys, Rows, inline_table, multiline_array, plain, rename_key, shown, value_item

RULE_FIELDS = ("family", "when", "action")
DEFAULT = "default"
RULES = "rules"


def copied(value: Any) -> Any:
    """A plain copy of a TOML value that tomlkit writes back the way strategies are written
    (a list of tables stays an array of inline tables, never becomes ``[[...]]``)."""
    value = plain(value)
    if isinstance(value, list):
        array = multiline_array() if value and all(isinstance(v, dict) for v in value) else tomlkit.array()
        for item in value:
            array.append(inline_table(list(item.items())) if isinstance(item, dict) else item)
        return array
    if isinstance(value, dict):
        return inline_table(list(value.items()))
    return value


class StrategyEdits(DocumentBase):
    """Create, rename and delete strategies; set the action of a state, the default and the rules."""

    # ----- reading -----

    def strategy_names(self) -> list[str]:
        return self._names("strategies")

    def strategy_entries(self, name: str) -> list[tuple[str, str]]:
        """``state = "action"`` entries as written (the default included, the rules not)."""
        return [(key, shown(value)) for key, value in self._strategy(name).items() if key != RULES]

    def strategy_rules(self, name: str) -> list[dict[str, str]]:
        rules = self._strategy(name).get(RULES)
        if not isinstance(rules, list):
            return []
        return [
            {field: shown(rule.get(field)) if isinstance(rule, dict) else "" for field in RULE_FIELDS} for rule in rules
        ]

    # ----- strategies -----

    def add_strategy(self, name: str, copy_of: str | None = None, default: str | None = None) -> None:
        """A new strategy at the end: a copy of ``copy_of``, or one ``default`` action."""
        name = self._checked_name(name, "strategy")
        if name in self.strategy_names():
            raise DocumentError(f"a strategy named {name!r} already exists")
        table = tomlkit.table()
        if copy_of is not None:
            for key, value in self._strategy(copy_of).items():
                table[key] = copied(value)
        elif default:
            table[DEFAULT] = default
        self._append_named("strategies", name, table)

    def rename_strategy(self, old: str, new: str) -> None:
        new = self._checked_name(new, "strategy")
        self._strategy(old)
        if new == old:
            return
        if new in self.strategy_names():
            raise DocumentError(f"a strategy named {new!r} already exists")
        rename_key(self._holder("strategies", old), old, new)

    @deletion
    def delete_strategy(self, name: str) -> None:
        self._strategy(name)
        del self._holder("strategies", name)[name]

    def set_strategy_action(self, name: str, state: str, raw: str) -> None:
        """The action of ``state`` (or ``default``) in a strategy; empty removes the entry."""
        if state == RULES:
            raise DocumentError("'rules' is not a state")
        strategy = self._strategy(name)
        if raw.strip() == "":
            if state in strategy:
                Keys(self._holder("strategies", name), name).delete(state)
            return
        Keys(self._holder("strategies", name), name).set(state, value_item(raw, "action"))

    # ----- rules over families -----

    def add_strategy_rule(self, name: str, family: str = "", action: str = "", after: int | None = None) -> int:
        """A new rule (after ``after``, else last) for ``family``; its condition is left to fill in."""
        rows = self._rules(name)
        position = len(rows) if after is None else after + 1
        return rows.insert(position, [("family", family), ("when", ""), ("action", action)])

    def set_strategy_rule(self, name: str, index: int, field: str, raw: str) -> None:
        if field not in RULE_FIELDS:
            raise DocumentError(f"unknown rule field {field!r}")
        rows = self._rules(name)
        self._rule(rows, name, index)
        rows.set(index, field, None if field == "when" and raw.strip() == "" else value_item(raw, field))

    @deletion
    def delete_strategy_rule(self, name: str, index: int) -> None:
        rows = self._rules(name)
        self._rule(rows, name, index)
        rows.delete(index)
        if not len(rows):
            Keys(self._holder("strategies", name), name).delete(RULES)

    def move_strategy_rule(self, name: str, index: int, offset: int) -> int:
        rows = self._rules(name)
        self._rule(rows, name, index)
        return rows.move(index, offset)

    # ----- keeping strategies in step with other edits -----

    def _strategy_tables(self) -> list[tuple[str, Any]]:
        table = self._table("strategies")
        return [] if table is None else [(str(k), v) for k, v in table.items() if isinstance(v, dict)]

    def _rename_state_entries(self, old: str, new: str) -> int:
        changed = 0
        for name, body in self._strategy_tables():
            if old in body:
                Keys(self._holder("strategies", name), name).rename(old, new)
                changed += 1
        return changed

    def _choose_everywhere(self, state: str, action: str) -> int:
        """A new decision state: each strategy that has no word for it (and whose default is another
        action) chooses ``action`` there; the count."""
        changed = 0
        for name, body in self._strategy_tables():
            if state not in body and body.get(DEFAULT) != action:
                Keys(self._holder("strategies", name), name).set(state, action)
                changed += 1
        return changed

    def _drop_state_entries(self, state: str) -> int:
        changed = 0
        for name, body in self._strategy_tables():
            if state in body and state not in (DEFAULT, RULES):
                Keys(self._holder("strategies", name), name).delete(state)
                changed += 1
        return changed

    def _rename_action_entries(self, state: str, old: str, new: str) -> int:
        changed = 0
        for name, body in self._strategy_tables():
            if body.get(state) == old:
                Keys(self._holder("strategies", name), name).set(state, new)
                changed += 1
        return changed

    def _drop_action_entries(self, state: str, action: str) -> int:
        changed = 0
        for name, body in self._strategy_tables():
            if body.get(state) == action:
                Keys(self._holder("strategies", name), name).delete(state)
                changed += 1
        return changed

    def _edit_rules(self, family: str, action: str | None, edit) -> int:
        """Apply ``edit(rows, index)`` to every rule over ``family`` (with ``action``, if given),
        last first so deletions keep the indices; the count."""
        changed = 0
        for name, body in self._strategy_tables():
            rules = body.get(RULES)
            if not isinstance(rules, list):
                continue
            rows = self._rules(name)
            for index in reversed(range(len(rules))):
                rule = rules[index]
                if isinstance(rule, dict) and rule.get("family") == family:
                    if action is None or rule.get("action") == action:
                        edit(name, rows, index)
                        changed += 1
        return changed

    def _rename_default(self, old: str, new: str) -> int:
        changed = 0
        for name, body in self._strategy_tables():
            if body.get(DEFAULT) == old:
                Keys(self._holder("strategies", name), name).set(DEFAULT, new)
                changed += 1
        return changed

    # ----- internals -----

    def _strategy(self, name: str) -> Any:
        table = self._table("strategies")
        if table is None or name not in table or not isinstance(table[name], dict):
            raise DocumentError(f"no strategy named {name!r}")
        return table[name]

    def _rules(self, name: str) -> Rows:
        strategy = self._strategy(name)
        if RULES in strategy and not isinstance(strategy[RULES], list):
            raise DocumentError(f"the rules of strategy {name!r} are not a list; fix them in the Source view")
        return Rows(Keys(self._holder("strategies", name), name).parent[name], RULES, RULE_FIELDS)

    @staticmethod
    def _rule(rows: Rows, name: str, index: int) -> None:
        if not 0 <= index < len(rows):
            raise DocumentError(f"no rule {index + 1} in strategy {name!r}")
