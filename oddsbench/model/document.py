"""A ruleset file being edited: operations on its TOML document that keep comments and order.

The workbench never rebuilds a file from the ``Ruleset`` data: it edits the user's own TOML
(tomlkit keeps comments, blank lines, key order and alignment), and the edited text is read
back through ``read_ruleset_text`` exactly as ``oddsbench check`` would read the saved file.
Values are written as the user typed them: a whole number stays a TOML integer, anything else
(``"8/36"``, ``"1 - p"``) becomes a quoted expression; an empty optional field is removed.
"""

from __future__ import annotations

import re
from dataclasses import dataclass
from typing import Any

import tomlkit
from tomlkit.container import Container
from tomlkit.exceptions import TOMLKitError
from tomlkit.items import Array, InlineTable, SingleKey, Table

from oddsbench.model.errors import Problem

OUTCOME_FIELDS = ("to", "prob", "pay", "stake", "note")
TEXT_FIELDS = frozenset({"to", "note", "title", "about", "start", "result"})
HEAD_FIELDS = ("title", "about", "start", "stake")
_WHOLE_NUMBER = re.compile(r"[+-]?\d{1,18}")
_INT_LIMIT = 2**63


class DocumentError(ValueError):
    """An edit that cannot be made (a name taken, a state missing); one line for the user."""


def parse_document(content: str, source: str) -> tuple[RulesetDocument | None, Problem | None]:
    """The editable document of some text, or the one problem that stops TOML editing."""
    try:
        return RulesetDocument(tomlkit.parse(content)), None
    except TOMLKitError as error:
        return None, Problem(source, "", f"not valid TOML: {' '.join(str(error).split())}")
    except RecursionError:
        return None, Problem(source, "", "not valid TOML: nested too deeply")


def value_item(raw: str, field: str) -> Any:
    """The TOML value for what the user typed: integers stay integers, the rest is text."""
    if field not in TEXT_FIELDS:
        stripped = raw.strip()
        if _WHOLE_NUMBER.fullmatch(stripped) and abs(int(stripped)) < _INT_LIMIT:
            return int(stripped)
    return raw


def shown(value: Any) -> str:
    """A TOML value as the text the user edits (the inverse of ``value_item``)."""
    if value is None:
        return ""
    if isinstance(value, bool):
        return "true" if value else "false"
    if isinstance(value, str | int):
        return str(value)
    return tomlkit.item(value).as_string()


@dataclass(frozen=True)
class OutcomeList:
    """Where a list of outcomes lives in a state: ``outcomes`` or one choice's action."""

    state: str
    action: str | None = None

    @property
    def label(self) -> str:
        return "outcomes" if self.action is None else f"choice {self.action!r}"


class RulesetDocument:
    """The editable TOML of one ruleset. Every method either edits in place or raises DocumentError."""

    def __init__(self, document: tomlkit.TOMLDocument) -> None:
        self._doc = document

    @classmethod
    def from_text(cls, content: str) -> RulesetDocument:
        return cls(tomlkit.parse(content))

    def text(self) -> str:
        return tomlkit.dumps(self._doc)

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
        states = self._table("states")
        return [] if states is None else [str(name) for name, value in states.items() if isinstance(value, dict)]

    def state_kind(self, name: str) -> str:
        """``outcomes``, ``choices`` or ``end`` (a state with neither ends the round)."""
        state = self._state(name)
        if "choices" in state:
            return "choices"
        return "outcomes" if "outcomes" in state else "end"

    def state_result(self, name: str) -> str:
        return shown(self._state(name).get("result"))

    def outcome_lists(self, name: str) -> list[OutcomeList]:
        state = self._state(name)
        if "choices" in state and isinstance(state["choices"], dict):
            return [OutcomeList(name, str(action)) for action in state["choices"]]
        if "outcomes" in state:
            return [OutcomeList(name)]
        return []

    def outcomes(self, where: OutcomeList) -> list[dict[str, str]]:
        """Each outcome's fields as text ('' where not given)."""
        listed = self._list(where, create=False)
        rows = []
        for item in listed if listed is not None else []:
            table = item if isinstance(item, dict) else {}
            rows.append({field: shown(table.get(field)) for field in OUTCOME_FIELDS})
        return rows

    def strategies(self) -> list[tuple[str, list[tuple[str, str]]]]:
        table = self._table("strategies")
        if table is None:
            return []
        return [
            (str(name), [(str(k), shown(v)) for k, v in body.items()])
            for name, body in table.items()
            if isinstance(body, dict)
        ]

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

    def delete_param(self, name: str) -> None:
        params = self._table("params")
        if params is None or name not in params:
            raise DocumentError(f"no parameter named {name!r}")
        del params[name]

    def set_session(self, field: str, raw: str) -> None:
        self._set_or_remove(self._ensure_table("session"), field, raw, required=False)

    # ----- editing states -----

    def add_state(self, name: str, kind: str = "outcomes") -> None:
        """A new state at the end: with an empty outcome list, or an end state with a result."""
        name = self._checked_name(name, "state")
        states = self._ensure_table("states", super_table=True)
        if name in states:
            raise DocumentError(f"a state named {name!r} already exists")
        table = tomlkit.table()
        if kind == "end":
            table["result"] = "win"
        else:
            table["outcomes"] = _multiline_array()
        states.append(name, table)

    def rename_state(self, old: str, new: str) -> int:
        """Rename a state and every reference to it (start, targets, strategies); returns the count."""
        new = self._checked_name(new, "state")
        states = self._ensure_table("states", super_table=True)
        if old not in states:
            raise DocumentError(f"no state named {old!r}")
        if new == old:
            return 0
        if new in states:
            raise DocumentError(f"a state named {new!r} already exists")
        _rename_key(states, old, new)
        changed = 1
        head = self._table("ruleset")
        if head is not None and head.get("start") == old:
            head["start"] = new
            changed += 1
        for state_name in self.state_names():
            for where in self.outcome_lists(state_name):
                for item in self._list(where, create=False) or []:
                    if isinstance(item, dict) and item.get("to") == old:
                        item["to"] = new
                        changed += 1
        strategies = self._table("strategies")
        for body in (strategies or {}).values():
            if isinstance(body, dict) and old in body:
                _rename_key(body, old, new)
                changed += 1
        return changed

    def delete_state(self, name: str) -> None:
        states = self._table("states")
        if states is None or name not in states:
            raise DocumentError(f"no state named {name!r}")
        del states[name]

    def set_state_result(self, name: str, raw: str) -> None:
        self._set_or_remove(self._state(name), "result", raw, required=False)

    # ----- editing outcomes -----

    def set_outcome(self, where: OutcomeList, index: int, field: str, raw: str) -> None:
        """Set one field of one outcome; an empty optional field is removed from the table."""
        if field not in OUTCOME_FIELDS:
            raise DocumentError(f"unknown outcome field {field!r}")
        item = self._outcome(where, index)
        keys_before = list(item.keys())
        if raw.strip() == "" and field != "to":
            if field in item:
                del item[field]
        else:
            item[field] = value_item(raw, field)
        if list(item.keys()) != keys_before:
            self._tidy(where, index)

    def add_outcome(self, where: OutcomeList, after: int | None = None, to: str = "") -> int:
        """A new outcome after ``after`` (or at the end); returns its index."""
        listed = self._list(where, create=True)
        position = len(listed) if after is None else min(after + 1, len(listed))
        fields = {"to": to}
        listed.insert(position, _inline(fields))
        return position

    def delete_outcome(self, where: OutcomeList, index: int) -> None:
        listed = self._list(where, create=False)
        if listed is None or not 0 <= index < len(listed):
            raise DocumentError(f"no outcome {index + 1} in {where.label} of state {where.state!r}")
        del listed[index]

    def move_outcome(self, where: OutcomeList, index: int, offset: int) -> int:
        """Move an outcome up (-1) or down (+1); returns its new index."""
        listed = self._list(where, create=False)
        if listed is None or not 0 <= index < len(listed):
            raise DocumentError(f"no outcome {index + 1} in {where.label} of state {where.state!r}")
        target = index + offset
        if not 0 <= target < len(listed):
            return index
        first, second = _inline(dict(listed[index])), _inline(dict(listed[target]))
        listed[index], listed[target] = second, first
        return target

    # ----- internals -----

    def _table(self, key: str) -> Any:
        value = self._doc.get(key)
        return value if isinstance(value, dict) else None

    def _ensure_table(self, key: str, super_table: bool = False) -> Any:
        value = self._doc.get(key)
        if isinstance(value, dict):
            return value
        if value is not None:
            raise DocumentError(f"[{key}] is not a table in this file; fix it in the source first")
        table = tomlkit.table(is_super_table=super_table)
        self._doc.append(key, table)
        return self._doc[key]

    def _state(self, name: str) -> Any:
        states = self._table("states")
        if states is None or name not in states or not isinstance(states[name], dict):
            raise DocumentError(f"no state named {name!r}")
        return states[name]

    def _list(self, where: OutcomeList, create: bool) -> Any:
        state = self._state(where.state)
        if where.action is None:
            if "choices" in state:
                raise DocumentError(f"state {where.state!r} has choices, not plain outcomes")
            listed = state.get("outcomes")
            if listed is None and create:
                state["outcomes"] = _multiline_array()
                listed = state["outcomes"]
        else:
            choices = state.get("choices")
            listed = choices.get(where.action) if isinstance(choices, dict) else None
            if listed is None and create:
                raise DocumentError(f"state {where.state!r} has no choice {where.action!r}")
        if listed is not None and not isinstance(listed, list):
            raise DocumentError(f"{where.label} of state {where.state!r} is not a list; fix it in the source first")
        return listed

    def _outcome(self, where: OutcomeList, index: int) -> Any:
        listed = self._list(where, create=False)
        if listed is None or not 0 <= index < len(listed):
            raise DocumentError(f"no outcome {index + 1} in {where.label} of state {where.state!r}")
        item = listed[index]
        if not isinstance(item, dict):
            raise DocumentError(f"outcome {index + 1} of state {where.state!r} is not a table; fix it in the source")
        return item

    def _tidy(self, where: OutcomeList, index: int) -> None:
        """After a key was added or removed, rewrite that one inline table in the canonical style."""
        listed = self._list(where, create=False)
        item = listed[index]
        if isinstance(item, InlineTable):
            listed[index] = _inline(dict(item))

    @staticmethod
    def _checked_name(name: str, what: str) -> str:
        name = name.strip()
        if not name:
            raise DocumentError(f"a {what} name must not be blank")
        if len(name) > 200:
            raise DocumentError(f"a {what} name must be at most 200 characters")
        return name

    @staticmethod
    def _set_or_remove(table: Any, field: str, raw: str, required: bool) -> None:
        if raw.strip() == "" and not required:
            if field in table:
                del table[field]
            return
        table[field] = value_item(raw, field)


def _inline(fields: dict[str, Any]) -> InlineTable:
    """An inline table written ``{ to = "won", prob = "8/36" }``: known fields first, in order."""
    ordered = [key for key in OUTCOME_FIELDS if key in fields] + [key for key in fields if key not in OUTCOME_FIELDS]
    body = ", ".join(f"{tomlkit.key(key).as_string()} = {tomlkit.item(fields[key]).as_string()}" for key in ordered)
    parsed = tomlkit.parse(f"x = {{ {body} }}" if body else "x = {}")
    return parsed["x"]


def _multiline_array() -> Array:
    array = tomlkit.array()
    array.multiline(True)
    return array


def _rename_key(table: Any, old: str, new: str) -> None:
    """Rename a key in place, keeping its position, its comments and its value's layout.

    tomlkit has no public rename; swapping the key in the container's body keeps every byte
    around it (its ``_replace`` adds a blank line after a table that ends with a comment).
    """
    item = table.item(old)
    if isinstance(item, Table) and item.display_name:
        # the header is written from display_name: swap its last part, keeping the prefix as written
        old_part = tomlkit.key(old).as_string()
        if item.display_name.endswith(old_part):
            item.display_name = item.display_name[: -len(old_part)] + tomlkit.key(new).as_string()
        else:
            item.display_name = None
    container = table if isinstance(table, Container) else table.value
    index = container._map.get(SingleKey(old))
    if not isinstance(index, int):  # a table split over several places in the file
        container._replace(old, new, item)
        return
    key, value = container._body[index]
    new_key = SingleKey(new)
    container._body[index] = (new_key, value)
    del container._map[key]
    container._map[new_key] = index
    dict.__delitem__(container, old)
    dict.__setitem__(container, new, value)
    if container is not table and isinstance(table, dict):
        dict.__delitem__(table, old)
        dict.__setitem__(table, new, value)
