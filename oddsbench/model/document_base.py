"""The parts every document edit shares: the error, where an outcome list lives, and finding tables.

``RulesetDocument`` (``model/document.py``) is this base plus one mixin per concept: outcomes
(``document_outcomes.py``), actions and kinds of state (``document_choices.py``), strategies
(``document_strategies.py``) and families (``document_families.py``). Each edits the user's own
TOML through ``model/toml_edits.py``, so only what is edited changes.
"""

from __future__ import annotations

import functools
from collections.abc import Callable
from dataclasses import dataclass
from typing import Any, TypeVar

import tomlkit
from tomlkit.items import Table

from oddsbench.model.toml_edits import Rows, append_table, value_item
from oddsbench.model.toml_tidy import tidy_removal

MAX_NAME = 200
OUTCOME_ORDER = ("each", "let", "when", "to", "prob", "pay", "stake", "note")


class DocumentError(ValueError):
    """An edit that cannot be made (a name taken, a state missing); one line for the user."""


@dataclass(frozen=True)
class OutcomeList:
    """Where a list of outcomes lives: a state's (or a family's) ``outcomes``, or one action's."""

    state: str  # the state's name, or the family's when ``family``
    action: str | None = None
    family: bool = False

    @property
    def label(self) -> str:
        return "outcomes" if self.action is None else f"choice {self.action!r}"

    @property
    def owner_label(self) -> str:
        return f"{'family' if self.family else 'state'} {self.state!r}"


Deletion = TypeVar("Deletion", bound=Callable[..., Any])


def deletion(method: Deletion) -> Deletion:
    """Marks an edit that deletes a table or an entry: once the outermost one ends, the blank lines
    and comments around what went are tidied (``model/toml_tidy.py``), as a careful hand leaves them."""

    @functools.wraps(method)
    def tidied(self: DocumentBase, *args: Any, **kwargs: Any) -> Any:
        if self._deleting:  # a deletion made by another (a state's strategy entries): tidied with it
            return method(self, *args, **kwargs)
        before = self.text()
        self._deleting = True
        try:
            result = method(self, *args, **kwargs)
        finally:
            self._deleting = False
        after = self.text()
        tidy = tidy_removal(before, after)
        if tidy != after:
            self._doc = tomlkit.parse(tidy)
        return result

    return tidied  # type: ignore[return-value]


class DocumentBase:
    """The TOML document and the lookups every edit needs; every failure is a ``DocumentError``."""

    def __init__(self, document: tomlkit.TOMLDocument) -> None:
        self._doc = document
        self._deleting = False

    def text(self) -> str:
        return tomlkit.dumps(self._doc)

    # ----- tables -----

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

    def _parts(self, key: str) -> list[Any]:
        """The tables that hold a top-level table's keys, in file order.

        A table written in pieces (``[states.a]``, then ``[families.x]``, then ``[states.b]``, as
        the dealer rulesets do) reads as one out-of-order proxy, which can neither append nor
        rename: those edits go to the piece that holds the key, and a new key to the last piece.
        """
        pieces = [item for name, item in self._doc.body if name is not None and name.key == key]
        tables = [item for item in pieces if isinstance(item, Table)]
        return tables or [self._doc[key]]

    def _holder(self, key: str, name: str) -> Any:
        """The piece of a top-level table that holds ``name``."""
        return next(part for part in self._parts(key) if name in part)

    def _append_named(self, key: str, name: str, table: Any) -> None:
        """A new ``[key.name]`` table after the last piece of ``[key]`` (created at the end if missing)."""
        self._ensure_table(key, super_table=True)
        piece = self._parts(key)[-1]
        last = next((item for item_key, item in reversed(self._doc.body) if item_key is not None), None)
        append_table(piece, name, table, last_in_file=last is piece)

    def _names(self, key: str) -> list[str]:
        table = self._table(key)
        return [] if table is None else [str(name) for name, value in table.items() if isinstance(value, dict)]

    def _state(self, name: str) -> Any:
        states = self._table("states")
        if states is None or name not in states or not isinstance(states[name], dict):
            raise DocumentError(f"no state named {name!r}")
        return states[name]

    def _family(self, name: str) -> Any:
        families = self._table("families")
        if families is None or name not in families or not isinstance(families[name], dict):
            raise DocumentError(f"no family named {name!r}")
        return families[name]

    def _owner(self, name: str, family: bool) -> Any:
        """A state's table, or a family's (both hold ``outcomes`` or ``choices``)."""
        return self._family(name) if family else self._state(name)

    def _rows(self, where: OutcomeList, create: bool = False) -> Rows:
        """The outcome list ``where`` names, as editable rows."""
        owner = self._owner(where.state, where.family)
        if where.action is None:
            if "choices" in owner:
                raise DocumentError(f"{where.owner_label} has choices, not plain outcomes")
            rows = Rows(owner, "outcomes", OUTCOME_ORDER)
            missing = "outcomes" not in owner
        else:
            choices = owner.get("choices")
            if not isinstance(choices, dict) or where.action not in choices:
                raise DocumentError(f"{where.owner_label} has no choice {where.action!r}")
            rows = Rows(choices, where.action, OUTCOME_ORDER)
            missing = False
        if not rows.exists() and not (create and missing):
            raise DocumentError(f"{where.label} of {where.owner_label} is not a list; fix it in the Source view")
        return rows

    @staticmethod
    def _checked_name(name: str, what: str) -> str:
        name = name.strip()
        if not name:
            raise DocumentError(f"a {what} name must not be blank")
        if len(name) > MAX_NAME:
            raise DocumentError(f"a {what} name must be at most {MAX_NAME} characters")
        return name

    @staticmethod
    def _set_or_remove(table: Any, field: str, raw: str, required: bool) -> None:
        if raw.strip() == "" and not required:
            if field in table:
                del table[field]
            return
        table[field] = value_item(raw, field)
