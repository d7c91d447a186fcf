"""Outcomes of a state or a family, with their parts: ``each`` and ``let`` (named values) and a
``to`` written as a list of cases. The same edits serve hand-written states and family templates.

Parts are rows of small tables: ``each`` and a family's ``index`` rows are (name, from, to),
``let`` rows (name, value), cases (when, to). A row's cell is edited as text, exactly as typed.
"""

from __future__ import annotations

from dataclasses import dataclass
from typing import Any

import tomlkit
from tomlkit.items import InlineTable

from oddsbench.model.document_base import DocumentBase, DocumentError, OutcomeList, deletion
from oddsbench.model.toml_edits import Keys, Rows, inline_table, pairs_of, shown, value_item

OUTCOME_FIELDS = ("to", "prob", "pay", "stake", "note")
FAMILY_FIELDS = ("when",)  # outcome fields of the family language, beside OUTCOME_FIELDS
PART_COLUMNS = {
    "each": ("name", "from", "to"),
    "index": ("name", "from", "to"),
    "let": ("name", "value"),
    "cases": ("when", "to"),
}
RANGE_PARTS = frozenset({"each", "index"})
NEW_VARIABLES = {"each": "fghmnuvwxyz", "index": "ijkabcdepq", "let": ""}


@dataclass(frozen=True)
class OutcomeRow:
    """One outcome as text: its fields ('' where not given) and its parts (``cases`` empty when
    ``to`` names one state)."""

    fields: dict[str, str]
    each: tuple[tuple[str, ...], ...] = ()
    lets: tuple[tuple[str, ...], ...] = ()
    cases: tuple[tuple[str, ...], ...] = ()

    def __getitem__(self, field: str) -> str:
        return self.fields[field]

    @property
    def uses_family_parts(self) -> bool:
        return bool(self.each or self.lets or self.cases or self.fields.get("when"))

    def part(self, kind: str) -> tuple[tuple[str, ...], ...]:
        return {"each": self.each, "let": self.lets, "cases": self.cases}[kind]


def keyed_rows(keys: Keys, kind: str) -> tuple[tuple[str, ...], ...]:
    """The rows of a keyed part (``each``, ``index``: name, from, to; ``let``: name, value)."""
    rows = []
    for name, value in keys.items():
        if kind in RANGE_PARTS:
            bounds = list(value) if isinstance(value, list) else [value, ""]
            low, high = (bounds + ["", ""])[:2] if len(bounds) <= 2 else (shown(value), "")
            rows.append((name, shown(low), shown(high)))
        else:
            rows.append((name, shown(value)))
    return tuple(rows)


def set_keyed_cell(keys: Keys, kind: str, row: int, column: str, raw: str) -> None:
    """Edit one cell of a keyed part: a name is renamed (every row keeps its place), a bound or a value set."""
    names = keys.names()
    if not 0 <= row < len(names):
        raise DocumentError(f"no row {row + 1} in {kind}")
    name = names[row]
    if column == "name":
        new = raw.strip()
        if not new:
            raise DocumentError(f"a name in {kind} must not be blank")
        if new != name and new in names:
            raise DocumentError(f"{kind} already has a name {new!r}")
        if new != name:
            keys.rename(name, new)
        return
    if kind in RANGE_PARTS:
        current = keys.parent[keys.key][name]
        bounds = list(current) if isinstance(current, list) and len(current) == 2 else ["", ""]
        bounds[0 if column == "from" else 1] = value_item(raw, kind)
        array = tomlkit.array()
        for bound in bounds:
            array.append(bound)
        keys.set(name, array)
    else:
        keys.set(name, value_item(raw, kind))


def new_keyed_row(keys: Keys, kind: str, taken: set[str]) -> int:
    """A new row at the end of a keyed part, with a free name; returns its index."""
    names = set(keys.names()) | taken
    candidates = [letter for letter in NEW_VARIABLES.get(kind, "")] + [f"v{n}" for n in range(1, 1000)]
    name = next(candidate for candidate in candidates if candidate not in names)
    value: Any = "0"
    if kind in RANGE_PARTS:
        value = tomlkit.array()
        value.extend([0, 1])
    keys.set(name, value)
    return keys.names().index(name)


class OutcomeEdits(DocumentBase):
    """Reading and editing outcome lists (in states and families) and their parts."""

    def outcomes(self, where: OutcomeList) -> list[OutcomeRow]:
        """Each outcome of the list as text."""
        rows = self._rows(where)
        listed = rows.listed() if rows.exists() else []
        found = []
        for item in listed:
            table = item if isinstance(item, dict) else {}
            target = table.get("to")
            fields = {field: shown(table.get(field)) for field in (*OUTCOME_FIELDS, *FAMILY_FIELDS)}
            cases: tuple[tuple[str, ...], ...] = ()
            if isinstance(target, list):
                fields["to"] = ""
                cases = tuple(
                    (shown(case.get("when")), shown(case.get("to"))) if isinstance(case, dict) else ("", shown(case))
                    for case in target
                )
            each = keyed_rows(Keys(table, "each"), "each") if isinstance(table.get("each"), dict) else ()
            lets = keyed_rows(Keys(table, "let"), "let") if isinstance(table.get("let"), dict) else ()
            found.append(OutcomeRow(fields, each, lets, cases))
        return found

    def set_outcome(self, where: OutcomeList, index: int, field: str, raw: str) -> None:
        """Set one field of one outcome; an empty optional field is removed from the table."""
        if field not in OUTCOME_FIELDS and field not in FAMILY_FIELDS:
            raise DocumentError(f"unknown outcome field {field!r}")
        rows = self._rows(where)
        item = self._outcome(rows, where, index)
        if field == "to" and isinstance(item.get("to"), list):
            raise DocumentError("this outcome goes by a list of cases: edit the cases")
        if raw.strip() == "" and field != "to":
            rows.set(index, field, None)
        else:
            rows.set(index, field, value_item(raw, field))

    def add_outcome(self, where: OutcomeList, after: int | None = None, to: str = "") -> int:
        """A new outcome after ``after`` (or at the end); returns its index.

        It goes nowhere yet (``to`` empty, which the check flags, so no figure is shown for a half-made
        game) and, beside other outcomes, has chance 0: it changes nothing until it is given one.
        """
        rows = self._rows(where, create=True)
        count = len(rows)
        fields: list[tuple[str, Any]] = [("to", to)]
        if count:
            fields.append(("prob", "0"))
        return rows.insert(count if after is None else after + 1, fields)

    @deletion
    def delete_outcome(self, where: OutcomeList, index: int) -> None:
        rows = self._rows(where)
        self._outcome(rows, where, index)
        rows.delete(index)

    def move_outcome(self, where: OutcomeList, index: int, offset: int) -> int:
        """Move an outcome up (-1) or down (+1); returns its new index."""
        rows = self._rows(where)
        self._outcome(rows, where, index)
        return rows.move(index, offset)

    # ----- parts of one outcome: each, let, cases -----

    def set_outcome_part(self, where: OutcomeList, index: int, kind: str, row: int, column: str, raw: str) -> None:
        rows = self._rows(where)
        if kind == "cases":
            cases = self._cases(rows, where, index)
            if column == "when" and raw.strip() == "":
                cases.set(row, "when", None)
            else:
                cases.set(row, column, value_item(raw, column))
        else:
            set_keyed_cell(self._part_keys(rows, where, index, kind, create=False), kind, row, column, raw)
        self._tidy(rows, index)

    def add_outcome_part(self, where: OutcomeList, index: int, kind: str) -> int:
        """A new row of ``each``, ``let`` or the cases; returns its index among the rows.

        A first case turns ``to`` into a list: the old target stays as the last case (taken when
        no condition before it holds) and the new case goes before it."""
        rows = self._rows(where)
        if kind == "cases":
            item = self._outcome(rows, where, index)
            target = item.get("to")
            if not isinstance(target, list):
                rows.set(index, "to", tomlkit.array())
                cases = Rows(self._outcome(rows, where, index), "to", ("when", "to"))
                cases.insert(0, [("to", shown(target))])
            cases = Rows(self._outcome(rows, where, index), "to", ("when", "to"))
            listed = cases.listed()
            last = listed[-1] if len(listed) else None
            position = len(listed) - 1 if isinstance(last, dict) and "when" not in last else len(listed)
            added = cases.insert(position, [("when", ""), ("to", "")])
            self._tidy(rows, index)
            return added
        taken = {name for name, *_ in self.outcomes(where)[index].part("each")} if kind == "let" else set()
        added = new_keyed_row(self._part_keys(rows, where, index, kind, create=True), kind, taken)
        self._tidy(rows, index)
        return added

    @deletion
    def delete_outcome_part(self, where: OutcomeList, index: int, kind: str, row: int) -> None:
        """Remove a row; an emptied ``each`` or ``let`` goes, and one case left without a condition
        becomes a plain ``to`` again."""
        rows = self._rows(where)
        if kind == "cases":
            cases = self._cases(rows, where, index)
            cases.delete(row)
            listed = cases.listed()
            if len(listed) == 1 and isinstance(listed[0], dict) and "when" not in listed[0]:
                rows.set(index, "to", listed[0].get("to", ""))
            elif not len(listed):
                rows.set(index, "to", "")
        else:
            keys = self._part_keys(rows, where, index, kind, create=False)
            names = keys.names()
            if not 0 <= row < len(names):
                raise DocumentError(f"no row {row + 1} in {kind}")
            keys.delete(names[row])
            if not keys.names():
                rows.set(index, kind, None)
        self._tidy(rows, index)

    def move_outcome_part(self, where: OutcomeList, index: int, kind: str, row: int, offset: int) -> int:
        rows = self._rows(where)
        if kind == "cases":
            moved = self._cases(rows, where, index).move(row, offset)
        else:
            keys = self._part_keys(rows, where, index, kind, create=False)
            names = keys.names()
            moved = row + offset if keys.move(names[row], offset) else row
        self._tidy(rows, index)
        return moved

    # ----- internals -----

    def _outcome(self, rows: Rows, where: OutcomeList, index: int) -> Any:
        try:
            return rows.row(index)
        except IndexError:
            raise DocumentError(f"no outcome {index + 1} in {where.label} of {where.owner_label}") from None

    def _cases(self, rows: Rows, where: OutcomeList, index: int) -> Rows:
        item = self._outcome(rows, where, index)
        if not isinstance(item.get("to"), list):
            raise DocumentError(f"outcome {index + 1} of {where.owner_label} has no list of cases")
        return Rows(item, "to", ("when", "to"))

    def _part_keys(self, rows: Rows, where: OutcomeList, index: int, kind: str, create: bool) -> Keys:
        item = self._outcome(rows, where, index)
        if kind not in item:
            if not create:
                raise DocumentError(f"outcome {index + 1} of {where.owner_label} has no {kind}")
            rows.set(index, kind, inline_table([]))
            item = self._outcome(rows, where, index)
        if not isinstance(item[kind], dict):
            raise DocumentError(f"{kind} of outcome {index + 1} is not a table; fix it in the Source view")
        return Keys(item, kind)

    @staticmethod
    def _tidy(rows: Rows, index: int) -> None:
        """After an edit inside an inline outcome, write that one line again in the canonical style."""
        item = rows.row(index)
        if isinstance(item, InlineTable):
            rows.listed()[index] = inline_table(pairs_of(item))
