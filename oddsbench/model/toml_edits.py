"""Edits of a tomlkit document that keep the file's own layout: the building blocks of the forms.

A TOML table can be written in several ways (``x = { a = 1 }``, a ``[x]`` table, dotted keys
``x.a = 1`` spread over lines), and a list of tables as an array of inline tables or as
``[[x]]`` tables. ``Keys`` and ``Rows`` give one way to edit each, whatever way the file chose,
touching only the entries edited: comments, blank lines and the order of everything else stay.
tomlkit has no public rename or reorder; the few private container calls used here are pinned by
``tests/unit/test_toml_edits.py``.
"""

from __future__ import annotations

import re
from typing import Any

import tomlkit
from tomlkit.container import Container, OutOfOrderTableProxy
from tomlkit.items import AoT, Array, Comment, InlineTable, Item, SingleKey, Table, Whitespace

TEXT_FIELDS = frozenset({"to", "note", "title", "about", "start", "result", "when", "state", "family", "action"})
_WHOLE_NUMBER = re.compile(r"[+-]?\d{1,18}")
_INT_LIMIT = 2**63


class LayoutError(ValueError):
    """The file writes this part in a way these edits cannot change in place (say so; never guess)."""


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


def plain(value: Any) -> Any:
    """A tomlkit value as plain Python (dicts, lists, str, int)."""
    return value.unwrap() if hasattr(value, "unwrap") else value


def inline_table(pairs: list[tuple[str, Any]]) -> InlineTable:
    """``{ a = 1, b = "x" }`` with the keys in the order given (values plain or tomlkit items)."""
    body = ", ".join(f"{tomlkit.key(key).as_string()} = {_rendered(value)}" for key, value in pairs)
    return tomlkit.parse(f"x = {{ {body} }}" if body else "x = {}")["x"]


def _rendered(value: Any) -> str:
    """A value as written: a tomlkit item keeps its own spelling (quotes, number form)."""
    if isinstance(value, InlineTable):
        return inline_table(pairs_of(value)).as_string()
    if isinstance(value, Array) and "\n" not in value.as_string():
        return "[" + ", ".join(_rendered(element) for element in value) + "]"
    if isinstance(value, Item):
        return value.as_string().strip()
    return tomlkit.item(value).as_string()


def multiline_array(items: list[Any] | None = None) -> Array:
    """An array written one item a line, indented by two spaces as the bundled rulesets are."""
    if not items:
        array = tomlkit.array()
        array.multiline(True)
        return array
    lines = "".join(f"  {_rendered(item)},\n" for item in items)
    return tomlkit.parse(f"x = [\n{lines}]\n")["x"]


def ordered(existing: list[str], new: str, order: tuple[str, ...]) -> int:
    """Where a new key goes among ``existing``: after the last key that comes before it in ``order``
    (keys the order does not know stay where they are), else first."""
    if new not in order:
        return len(existing)
    rank = order.index(new)
    position = 0
    for index, key in enumerate(existing):
        if key in order and order.index(key) < rank:
            position = index + 1
    return position


def pairs_of(table: Any) -> list[tuple[str, Any]]:
    """A table's (key, item) pairs as written, in order."""
    return [(str(key.key), item) for key, item in container_of(table).body if key is not None]


def container_of(table: Any) -> Container:
    if isinstance(table, Container):
        return table
    if isinstance(table, Table | InlineTable):
        return table.value
    raise LayoutError(f"not an editable table: {type(table).__name__}")


def rename_key(table: Any, old: str, new: str) -> None:
    """Rename a key in place, keeping its position, its comments and its value's layout.

    tomlkit has no public rename; swapping the key in the container's body keeps every byte
    around it (its ``_replace`` adds a blank line after a table that ends with a comment).
    """
    if isinstance(table, OutOfOrderTableProxy):
        raise LayoutError("a table written in pieces")
    item = table.item(old)
    if isinstance(item, Table) and item.display_name:
        # the header is written from display_name: swap its last part, keeping the prefix as written
        old_part = tomlkit.key(old).as_string()
        if item.display_name.endswith(old_part):
            item.display_name = item.display_name[: -len(old_part)] + tomlkit.key(new).as_string()
        else:
            item.display_name = None
    container = container_of(table)
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


def swap_keys(table: Any, first: str, second: str) -> None:
    """Exchange the places of two keys of one table (each with its comments and layout)."""
    container = container_of(table)
    a, b = container._map.get(SingleKey(first)), container._map.get(SingleKey(second))
    if not isinstance(a, int) or not isinstance(b, int):
        raise LayoutError("a table written in pieces")
    body = container._body
    body[a], body[b] = body[b], body[a]
    container._map[body[a][0]] = a
    container._map[body[b][0]] = b
    _reorder_dict(container, [str(key.key) for key, _ in body if key is not None])
    if container is not table and isinstance(table, dict):
        _reorder_dict(table, [str(key.key) for key, _ in body if key is not None])


def _reorder_dict(mapping: dict, keys: list[str]) -> None:
    values = {key: dict.__getitem__(mapping, key) for key in dict.keys(mapping)}
    dict.clear(mapping)
    for key in keys:
        if key in values and not dict.__contains__(mapping, key):
            dict.__setitem__(mapping, key, values[key])


class Keys:
    """The keys of one TOML table ``parent[key]``, edited where they are written.

    Inline tables are rewritten whole (one line); ``[tables]`` are edited entry by entry; a table
    written as dotted keys (``let.a = ...`` lines, possibly several) gets each entry edited on its
    own line and new entries on a new line after the last.
    """

    def __init__(self, parent: Any, key: str) -> None:
        self.parent = parent
        self.key = key

    # ----- reading -----

    def exists(self) -> bool:
        return self.key in self.parent and isinstance(self.parent[self.key], dict)

    def names(self) -> list[str]:
        return [str(name) for name in self.parent[self.key]] if self.exists() else []

    def items(self) -> list[tuple[str, Any]]:
        return [(str(name), value) for name, value in self.parent[self.key].items()] if self.exists() else []

    # ----- editing -----

    def set(self, name: str, value: Any, create_inline: bool = True) -> None:
        """Change ``name``'s value in place, or add it at the end."""
        if not self.exists():
            if self.key in self.parent:
                raise LayoutError(f"{self.key!r} is not a table")
            self.parent[self.key] = inline_table([(name, value)]) if create_inline else tomlkit.table()
            if not create_inline:
                self.parent[self.key][name] = value
            return
        table = self.parent[self.key]
        if isinstance(table, InlineTable):
            pairs = pairs_of(table)
            names = [k for k, _ in pairs]
            if name in names:
                pairs[names.index(name)] = (name, value)
            else:
                pairs.append((name, value))
            self._replace_inline(pairs)
        elif name in table:
            self._piece(name)[name] = value
        else:
            pieces = self._dotted_pieces()
            if pieces:
                self._add_piece(pieces[-1][0] + 1, name, value)
            else:
                table[name] = value

    def rename(self, old: str, new: str) -> None:
        table = self.parent[self.key]
        if isinstance(table, InlineTable):
            self._replace_inline([(new if k == old else k, v) for k, v in pairs_of(table)])
        else:
            rename_key(self._piece(old), old, new)

    def delete(self, name: str) -> None:
        table = self.parent[self.key]
        if isinstance(table, InlineTable):
            self._replace_inline([(k, v) for k, v in pairs_of(table) if k != name])
            return
        pieces = self._dotted_pieces()
        holder = self._piece(name)
        if pieces and len(holder) == 1 and len(pieces) > 1:
            container = container_of(self.parent)
            index = next(i for i, piece in pieces if piece is holder)
            container._remove_at(index)
        else:
            del holder[name]

    def move(self, name: str, offset: int) -> bool:
        """Move ``name`` one place up (-1) or down (+1); False at either end."""
        names = self.names()
        index = names.index(name)
        target = index + offset
        if not 0 <= target < len(names):
            return False
        other = names[target]
        table = self.parent[self.key]
        if isinstance(table, InlineTable):
            pairs = pairs_of(table)
            pairs[index], pairs[target] = pairs[target], pairs[index]
            self._replace_inline(pairs)
            return True
        pieces = self._dotted_pieces()
        if pieces and len(pieces) > 1:
            mine = next(i for i, piece in pieces if name in piece)
            theirs = next(i for i, piece in pieces if other in piece)
            body = container_of(self.parent)._body
            body[mine], body[theirs] = body[theirs], body[mine]
            return True
        swap_keys(table, name, other)
        return True

    # ----- internals -----

    def _replace_inline(self, pairs: list[tuple[str, Any]]) -> None:
        self.parent[self.key] = inline_table(pairs)

    def _dotted_pieces(self) -> list[tuple[int, Table]]:
        """The body entries of a table written as dotted keys (``let.a = 1``), with their places."""
        try:
            container = container_of(self.parent)
        except LayoutError:
            return []
        found = []
        for index, (key, item) in enumerate(container._body):
            if key is not None and str(key.key) == self.key and isinstance(item, Table):
                if not item.is_super_table() or any(isinstance(v, Table | AoT) for _, v in item.value.body):
                    return []
                found.append((index, item))
        return found

    def _piece(self, name: str) -> Any:
        """The table object that holds ``name`` (one dotted piece, or the table itself)."""
        for _, piece in self._dotted_pieces():
            if name in piece:
                return piece
        table = self.parent[self.key]
        if isinstance(table, OutOfOrderTableProxy):
            raise LayoutError(f"{self.key!r} is written in pieces")
        if name not in table:
            raise KeyError(name)
        return table

    def _add_piece(self, index: int, name: str, value: Any) -> None:
        snippet = tomlkit.parse(f"[x]\n{tomlkit.key([self.key, name]).as_string()} = {_rendered(value)}\n")
        key, piece = snippet["x"].value._body[0]
        container = container_of(self.parent)
        if index >= len(container._body):
            container._raw_append(key, piece)
            return
        container._insert_at(index, key, piece)


class Rows:
    """A list of tables ``parent[key]``: an array of inline tables or ``[[key]]`` tables.

    Each row is edited where it is written: an inline row is rewritten as one line (its keys in
    the order they had, a new key placed by ``order``), a ``[[table]]`` row key by key.
    """

    def __init__(self, parent: Any, key: str, order: tuple[str, ...] = ()) -> None:
        self.parent = parent
        self.key = key
        self.order = order

    def exists(self) -> bool:
        return self.key in self.parent and isinstance(self.parent[self.key], list)

    def listed(self) -> Any:
        if not self.exists():
            raise LayoutError(f"{self.key!r} is not a list")
        return self.parent[self.key]

    def __len__(self) -> int:
        return len(self.parent[self.key]) if self.exists() else 0

    def row(self, index: int) -> Any:
        listed = self.listed()
        if not 0 <= index < len(listed):
            raise IndexError(index)
        row = listed[index]
        if not isinstance(row, dict):
            raise LayoutError(f"row {index + 1} of {self.key!r} is not a table")
        return row

    def set(self, index: int, field: str, value: Any | None) -> None:
        """Set (or with None remove) one field of one row."""
        row = self.row(index)
        if isinstance(row, InlineTable) and value is not None and field in row:
            row[field] = value  # in place: the line keeps its spacing
        elif isinstance(row, InlineTable):
            before = pairs_of(row)
            pairs = list(before)
            names = [k for k, _ in pairs]
            if value is None:
                pairs = [(k, v) for k, v in pairs if k != field]
            elif field in names:
                pairs[names.index(field)] = (field, value)
            else:
                pairs.insert(ordered(names, field, self.order), (field, value))
            if pairs != before:
                self.listed()[index] = inline_table(pairs)
        elif value is None:
            if field in row:
                del row[field]
        else:
            row[field] = value

    def insert(self, position: int, pairs: list[tuple[str, Any]]) -> int:
        """A new row at ``position`` (clamped); returns its index."""
        if not self.exists():
            if self.key in self.parent:
                raise LayoutError(f"{self.key!r} is not a list")
            self.parent[self.key] = multiline_array()
        listed = self.listed()
        position = max(0, min(position, len(listed)))
        if not len(listed) and not isinstance(listed, AoT):
            self.parent[self.key] = multiline_array([inline_table(pairs)])  # the first row on a line of its own
            return 0
        if isinstance(listed, AoT):
            table = tomlkit.table()
            for name, value in pairs:
                table[name] = value
            rows = listed.body
            if position == len(rows) and rows:
                # the last row carries the space before whatever follows: the new last row takes it
                _set_trailing(table, _trailing(rows[-1]))
                _set_trailing(rows[-1], "\n")
            else:
                _set_trailing(table, "\n")
            listed.insert(position, table)
            table.trivia.indent = ""
        else:
            listed.insert(position, inline_table(pairs))
        return position

    def delete(self, index: int) -> None:
        self.row(index)
        del self.listed()[index]

    def move(self, index: int, offset: int) -> int:
        """Move a row up (-1) or down (+1); returns its new index."""
        listed = self.listed()
        self.row(index)
        target = index + offset
        if not 0 <= target < len(listed):
            return index
        if isinstance(listed, AoT):
            body = listed._body
            first, second = body[index], body[target]
            # the space around each place stays with the place: only the rows' contents trade places
            first.trivia.indent, second.trivia.indent = second.trivia.indent, first.trivia.indent
            after_first, after_second = _trailing(first), _trailing(second)
            _set_trailing(first, after_second)
            _set_trailing(second, after_first)
            body[index], body[target] = second, first
            list.__setitem__(listed, index, second)
            list.__setitem__(listed, target, first)
        else:
            first = inline_table(pairs_of(listed[index]))
            second = inline_table(pairs_of(listed[target]))
            listed[index], listed[target] = second, first
        return target


def _trailing(table: Table) -> str:
    """The blank space at the end of a ``[[table]]``'s body (what separates it from the next header)."""
    body = table.value.body
    text = ""
    for key, item in reversed(body):
        if key is not None or not isinstance(item, Whitespace):
            break
        text = item.as_string() + text
    return text


def _set_trailing(table: Table, text: str) -> None:
    body = table.value.body
    while body and body[-1][0] is None and isinstance(body[-1][1], Whitespace):
        body.pop()
    if text:
        body.append((None, Whitespace(text)))


def append_table(parent: Any, name: str, table: Table, last_in_file: bool = False) -> None:
    """``[parent.name]`` after the last table of ``parent``, spaced as its neighbours: the last table
    keeps its own comments and gives the new one what stood after it (the blank line and the comment
    above the next table, or nothing at the end of the file); one blank line goes between the two."""
    previous = next((item for key, item in reversed(container_of(parent).body) if key is not None), None)
    if not isinstance(previous, Table):
        if not last_in_file:
            table.add(tomlkit.nl())  # the first table of its kind: a blank line before whatever follows
        parent.append(name, table)
        return
    body = previous.value.body
    tail = len(body)
    while tail > 0 and body[tail - 1][0] is None and isinstance(body[tail - 1][1], Whitespace | Comment):
        tail -= 1
    moved = tail
    while moved < len(body) and not isinstance(body[moved][1], Whitespace):
        moved += 1  # comments right under the last entry are the last table's own
    if moved == len(body):
        moved = tail  # no blank line: the comments stand right above the next table, and go with it
    for item in [item for _, item in body[moved:]]:
        table.add(item)
    del body[moved:]
    previous.add(tomlkit.ws("\n"))
    parent.append(name, table)
