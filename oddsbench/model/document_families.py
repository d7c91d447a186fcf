"""Families of states (``[families.NAME]``): the member name template, the index ranges, ``when``,
``let``, ``result`` and ``about``; their outcomes are edited like a state's (``document_outcomes.py``).

What a family expands to is the reader's business (``model/families.py``): these edits only write
the family's fields, and the workbench reads the text again after each one to show the members.
"""

from __future__ import annotations

import tomlkit

from oddsbench.model.document_base import DocumentError, deletion
from oddsbench.model.document_choices import ChoiceEdits
from oddsbench.model.document_outcomes import keyed_rows, new_keyed_row, set_keyed_cell
from oddsbench.model.toml_edits import Keys, inline_table, multiline_array, rename_key, shown, value_item

FAMILY_TEXT_FIELDS = ("state", "when", "result", "about")
FAMILY_PARTS = ("index", "let")


def as_template(name: str) -> str:
    """A state name as a family template writes it (``{`` and ``}`` doubled)."""
    return name.replace("{", "{{").replace("}", "}}")


class FamilyEdits(ChoiceEdits):
    """Create, rename and delete families; edit their fields, index ranges and ``let`` values."""

    def family_names(self) -> list[str]:
        return self._names("families")

    def family_fields(self, name: str) -> dict[str, str]:
        family = self._family(name)
        return {field: shown(family.get(field)) for field in FAMILY_TEXT_FIELDS}

    def family_part(self, name: str, kind: str) -> tuple[tuple[str, ...], ...]:
        """The rows of the family's ``index`` (name, from, to) or ``let`` (name, value)."""
        family = self._family(name)
        return keyed_rows(Keys(family, kind), kind) if isinstance(family.get(kind), dict) else ()

    # ----- families -----

    def add_family(self, name: str, template: str = "", variable: str = "i", low: str = "0", high: str = "9") -> None:
        """A new family: members ``template`` over ``variable`` from ``low`` to ``high``, one outcome to fill in."""
        name = self._checked_name(name, "family")
        if name in self.family_names():
            raise DocumentError(f"a family named {name!r} already exists")
        variable = variable.strip() or "i"
        bounds = tomlkit.array()
        bounds.extend([value_item(low, "index"), value_item(high, "index")])
        table = tomlkit.table()
        table["state"] = template.strip() or f"{as_template(name)}-{{{variable}}}"
        table["index"] = inline_table([(variable, bounds)])
        table["outcomes"] = multiline_array([inline_table([("to", "")])])
        self._append_named("families", name, table)

    def rename_family(self, old: str, new: str) -> int:
        """Rename a family and the strategy rules over it; the count of rules changed."""
        new = self._checked_name(new, "family")
        self._family(old)
        if new == old:
            return 0
        if new in self.family_names():
            raise DocumentError(f"a family named {new!r} already exists")
        rename_key(self._holder("families", old), old, new)
        return self._edit_rules(old, None, lambda _, rows, index: rows.set(index, "family", new))

    @deletion
    def delete_family(self, name: str) -> int:
        """Delete a family and the strategy rules over it; the count of rules removed."""
        self._family(name)
        del self._holder("families", name)[name]
        return self._edit_rules(name, None, lambda strategy, rows, index: self.delete_strategy_rule(strategy, index))

    def set_family_field(self, name: str, field: str, raw: str) -> None:
        if field not in FAMILY_TEXT_FIELDS:
            raise DocumentError(f"unknown family field {field!r}")
        self._set_or_remove(self._family(name), field, raw, required=field == "state")

    # ----- index ranges and let values -----

    def set_family_part(self, name: str, kind: str, row: int, column: str, raw: str) -> None:
        set_keyed_cell(self._family_keys(name, kind), kind, row, column, raw)

    def add_family_part(self, name: str, kind: str) -> int:
        taken = {row[0] for row in self.family_part(name, "index")} if kind == "let" else set()
        return new_keyed_row(self._family_keys(name, kind), kind, taken)

    @deletion
    def delete_family_part(self, name: str, kind: str, row: int) -> None:
        keys = self._family_keys(name, kind)
        names = keys.names()
        if not 0 <= row < len(names):
            raise DocumentError(f"no row {row + 1} in {kind}")
        if kind == "index" and len(names) == 1:
            raise DocumentError("a family needs an index variable: change this one instead")
        keys.delete(names[row])
        if not keys.names():
            del self._family(name)[kind]

    def move_family_part(self, name: str, kind: str, row: int, offset: int) -> int:
        keys = self._family_keys(name, kind)
        return row + offset if keys.move(keys.names()[row], offset) else row

    def _family_keys(self, name: str, kind: str) -> Keys:
        if kind not in FAMILY_PARTS:
            raise DocumentError(f"unknown family part {kind!r}")
        family = self._family(name)
        if kind in family and not isinstance(family[kind], dict):
            raise DocumentError(f"{kind} of family {name!r} is not a table; fix it in the Source view")
        return Keys(family, kind)
