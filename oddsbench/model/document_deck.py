"""The deck and the draws of a ruleset being edited: ``[deck]`` and each state's ``draw``, in place.

Edits of the same kind as ``document.py`` (tomlkit keeps comments, order and alignment; values are
written as typed: a whole number stays an integer, anything else a quoted expression), kept apart
because a deck is one concept: what a round is dealt from and how a state draws. Lists of names
(``ranks``, ``suits``, ``remove``, ``take``) are edited as text separated by commas, tables of
numbers (``items``, ``values``) as ``name = value`` pairs; the reader checks what they say.
"""

from __future__ import annotations

import re
from typing import Any

import tomlkit
from tomlkit.items import InlineTable

from oddsbench.model.document import DocumentError, RulesetDocument, shown, value_item

DECK_LIST_FIELDS = ("ranks", "suits", "remove")
DECK_FIELDS = ("copies", "ranks", "suits", "remove", "values", "ace")  # a deck of cards, in form order
DRAW_FIELDS = ("count", "hand", "take")
DEFAULT_HAND = "hand"  # the hand a plain ``draw = N`` deals into (the reader's own default)
_PAIR = re.compile(r"^\s*([^=\s][^=]*?)\s*=\s*(.*?)\s*$")


class DeckDocument:
    """The ``[deck]`` table and the states' draws of one ``RulesetDocument`` (edited in place)."""

    def __init__(self, document: RulesetDocument) -> None:
        self.document = document
        self._doc = document._doc

    # ----- reading, for display -----

    def has_deck(self) -> bool:
        return isinstance(self._doc.get("deck"), dict)

    def is_items(self) -> bool:
        deck = self._deck(create=False)
        return deck is not None and "items" in deck

    def fields(self) -> dict[str, str]:
        """Every field of a deck of cards as the text the user edits ('' where not given)."""
        deck = self._deck(create=False) or {}
        return {field: _shown_field(deck.get(field)) for field in DECK_FIELDS}

    def items(self) -> list[tuple[str, str]]:
        """A deck of items: each label and its count, in file order."""
        deck = self._deck(create=False) or {}
        items = deck.get("items")
        return [(str(label), shown(count)) for label, count in items.items()] if isinstance(items, dict) else []

    def draw(self, state: str) -> dict[str, str]:
        """A state's draw as its three fields ('' everywhere when the state does not draw)."""
        raw = self.document._state(state).get("draw")
        if raw is None:
            return dict.fromkeys(DRAW_FIELDS, "")
        if not isinstance(raw, dict):
            return {"count": shown(raw), "hand": "", "take": ""}
        return {
            "count": shown(raw.get("count")),
            "hand": shown(raw.get("hand")),
            "take": _shown_field(raw.get("take")),
        }

    # ----- edits -----

    def add_deck(self, items: bool = False) -> None:
        """A new ``[deck]`` before the states: the 52 cards, or two labelled items to rename."""
        if self._doc.get("deck") is not None:
            raise DocumentError("this ruleset already has a [deck]")
        table = tomlkit.table()
        if items:
            table.add("items", _pairs_table("red = 1, blue = 1"))
        else:
            table.add("copies", 1)
        table.add(tomlkit.nl())
        keys = [name.key if name is not None else None for name, _ in self._doc.body]
        later = [i for i, key in enumerate(keys) if key in ("states", "families", "strategies", "session")]
        if later:
            self._doc._insert_at(later[0], "deck", table)
        else:
            self._doc.append("deck", table)

    def set_field(self, field: str, raw: str) -> None:
        """One field of a deck of cards; an emptied field is removed (the reader's default applies)."""
        if field not in DECK_FIELDS:
            raise DocumentError(f"a deck of cards has no field {field!r}")
        deck = self._deck(create=True)
        if "items" in deck and field in DECK_LIST_FIELDS:
            raise DocumentError(f"a deck of items has no {field}: its labels and counts are under items")
        if raw.strip() == "":
            if field in deck:
                del deck[field]
            return
        if field in DECK_LIST_FIELDS:
            deck[field] = _names(raw)
        elif field == "values":
            deck[field] = _pairs_table(raw)
        elif field == "ace":
            deck[field] = raw.strip()
        else:
            deck[field] = value_item(raw, field)

    def set_item(self, label: str, raw: str) -> None:
        """The count of one item (a whole number or an expression over the parameters)."""
        items = self._items()
        if label not in items:
            raise DocumentError(f"the deck has no item {label!r}")
        if raw.strip() == "":
            raise DocumentError(f"item {label!r} needs a count (0 keeps the label with none of it)")
        items[label] = value_item(raw, "count")

    def add_item(self, label: str, raw: str = "1") -> None:
        label = label.strip()
        items = self._items()
        if not label:
            raise DocumentError("an item's label must not be blank")
        if label in items:
            raise DocumentError(f"the deck already has an item {label!r}")
        self._rewrite_items({**items, label: value_item(raw, "count")})

    def delete_item(self, label: str) -> None:
        items = self._items()
        if label not in items:
            raise DocumentError(f"the deck has no item {label!r}")
        if len(items) == 1:
            raise DocumentError("a deck of items keeps at least one label")
        self._rewrite_items({key: value for key, value in items.items() if key != label})

    def remove_card(self, rank: str, suit: str) -> None:
        """One copy of ``RANK of SUIT`` out of the deck: one more entry in ``remove``."""
        deck = self._deck(create=True)
        removed = self._removed(deck)
        deck["remove"] = _names(", ".join([*removed, f"{rank} of {suit}"]))

    def return_card(self, rank: str, suit: str) -> None:
        """One copy of ``RANK of SUIT`` back: the last matching entry of ``remove`` goes."""
        deck = self._deck(create=True)
        removed = self._removed(deck)
        card = f"{rank} of {suit}"
        if card not in removed:
            if rank in removed:
                raise DocumentError(f"every {rank} is removed by {rank!r} in remove: edit the remove field")
            raise DocumentError(f"no {card} was removed: raise copies to add cards")
        removed.reverse()
        removed.remove(card)
        removed.reverse()
        if removed:
            deck["remove"] = _names(", ".join(removed))
        else:
            del deck["remove"]

    def set_draw(self, state: str, field: str, raw: str) -> None:
        """One field of a state's draw. ``draw = N`` while only a count is given into the default
        hand; a table ``{ hand, count, take }`` otherwise; every field emptied: the state draws nothing."""
        if field not in DRAW_FIELDS:
            raise DocumentError(f"a draw has no field {field!r}")
        table = self.document._state(state)
        values = self.draw(state)
        values[field] = raw.strip()
        count, hand, take = values["count"], values["hand"], values["take"]
        if not (count or hand or take):
            if "draw" in table:
                del table["draw"]
            return
        if not hand and not take:
            table["draw"] = value_item(count, "count")
            return
        fields: dict[str, Any] = {}
        if hand:
            fields["hand"] = hand
        if count:
            fields["count"] = value_item(count, "count")
        if take:
            fields["take"] = list(_names(take))
        table["draw"] = _inline(fields)

    # ----- internals -----

    def _deck(self, create: bool) -> Any:
        deck = self._doc.get("deck")
        if deck is None and create:
            raise DocumentError("this ruleset has no [deck]: add one first")
        if deck is not None and not isinstance(deck, dict):
            raise DocumentError("[deck] is not a table in this file; fix it in the source first")
        return deck

    @staticmethod
    def _removed(deck: Any) -> list[str]:
        removed = deck.get("remove", [])
        if not isinstance(removed, list):
            raise DocumentError("remove is not a list of cards: fix it in the remove field first")
        return [str(name) for name in removed]

    def _rewrite_items(self, items: dict[str, Any]) -> None:
        """An inline ``items`` written again whole in the files' style (tomlkit would leave ``1}``); a
        ``[deck.items]`` table edited key by key, keeping its comments."""
        table = self._items()
        if isinstance(table, InlineTable):
            self._deck(create=True)["items"] = _inline(items)
            return
        for key in [key for key in table if key not in items]:
            del table[key]
        for key, value in items.items():
            if key not in table:
                table[key] = value

    def _items(self) -> Any:
        items = self._deck(create=True).get("items")
        if not isinstance(items, dict):
            raise DocumentError("this deck holds cards, not labelled items")
        return items


def _shown_field(value: Any) -> str:
    """A list of names as ``a, b, c``; a table as ``a = 1, b = 2``; anything else as ``shown``."""
    if isinstance(value, list) and all(isinstance(name, str | int) for name in value):
        return ", ".join(str(name) for name in value)
    if isinstance(value, dict):
        return ", ".join(f"{name} = {shown(number)}" for name, number in value.items())
    return shown(value)


def _names(raw: str) -> Any:
    """``a, b, c`` as a TOML array of strings (the reader checks each name)."""
    array = tomlkit.array()
    for name in (part.strip() for part in raw.split(",")):
        if name:
            array.append(name)
    return array


def _pairs_table(raw: str) -> Any:
    """``A = 1, K = 10`` as an inline table; a pair without ``=`` is refused in one line."""
    pairs: dict[str, Any] = {}
    for part in (piece for piece in raw.split(",") if piece.strip()):
        match = _PAIR.match(part)
        if match is None:
            raise DocumentError(f"{part.strip()!r}: write name = value, pairs separated by commas")
        name, value = match[1], match[2]
        if value == "":
            raise DocumentError(f"{name!r} needs a value after '='")
        pairs[name] = value_item(value, "count")
    return _inline(pairs)


def _inline(fields: dict[str, Any]) -> Any:
    """An inline table in the files' own style, ``{ hand = "player", count = 2 }``, keys in order."""
    body = ", ".join(
        f"{tomlkit.key(key).as_string()} = {tomlkit.item(value).as_string()}" for key, value in fields.items()
    )
    return tomlkit.parse(f"x = {{ {body} }}" if body else "x = {}")["x"]
