"""Reading the parts of a deck game that depend on the cards: draws, outcomes chosen by the hands,
strategy rules by hand. ``model/load.py`` calls these; every problem is one line through its reader.

A state draws with ``draw``::

    draw = 3                                     # three cards at random into the hand named "hand"
    draw = { hand = "player", count = 2 }        # two into the player's hand
    draw = { hand = "dealer", take = ["6"] }     # a 6 (its suit at random) out of the deck, chance 1

Outcomes whose ``when`` reads the hands are cases: tried in order, the first that holds is taken.
A drawing state's outcomes are always cases (the draw gives the chance; no ``prob``). ``pay``,
``stake`` and ``prob`` may read the hands too; they are kept as expressions and evaluated for every
hand when the deal is expanded (``chain/deal.py``).
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any, Protocol

from oddsbench.model.deck import Deck
from oddsbench.model.errors import shown_name, type_name
from oddsbench.model.expr import ExpressionError, Node, evaluate, hand_calls, is_tree, parse, uses_hands
from oddsbench.model.hands import DEFAULT_HAND, DRAWN, check_call
from oddsbench.model.numbers import Rational, is_integer, text, to_int
from oddsbench.model.ruleset import Draw

DRAW_KEYS = frozenset({"hand", "count", "take"})
RULE_FIELDS = ("prob", "pay", "stake")
MAX_TAKE = 100


class _Reader(Protocol):
    params: dict[str, Rational]

    def error(self, where: str, message: str) -> None: ...

    def value(self, raw: Any, where: str) -> Rational | None: ...


def hand_names(tables: dict[str, Any]) -> tuple[str, ...]:
    """The hands the states draw into, in order of first appearance (``hand`` when none is named)."""
    names: list[str] = []
    for table in tables.values():
        draw = table.get("draw") if isinstance(table, dict) else None
        if draw is None:
            continue
        hand = draw.get("hand", DEFAULT_HAND) if isinstance(draw, dict) else DEFAULT_HAND
        if isinstance(hand, str) and hand not in names:
            names.append(hand)
    return tuple(names)


def read_draw(raw: Any, where: str, reader: _Reader, deck: Deck | None) -> Draw | None:
    """A state's ``draw``: a whole number, or a table of ``hand``, ``count`` and ``take``."""
    place = f"{where}, draw"
    if deck is None:
        reader.error(place, "a state can draw only in a ruleset with a [deck] table to draw from")
        return None
    if not isinstance(raw, dict):
        raw = {"count": raw}
    for key in raw:
        if key not in DRAW_KEYS:
            reader.error(place, f"unknown field {shown_name(key)} (a draw has hand, count and take)")
            return None
    hand = raw.get("hand", DEFAULT_HAND)
    if not isinstance(hand, str) or not hand.isidentifier() or hand.startswith("__") or len(hand) > 40:
        reader.error(f"{place}, hand", f"{shown_name(hand)} is not a usable hand name (letters, digits and _)")
        return None
    if hand == DRAWN:
        reader.error(f"{place}, hand", f"{DRAWN!r} names the cards of the latest draw: choose another hand name")
        return None
    take = raw.get("take", [])
    if not isinstance(take, list) or len(take) > MAX_TAKE:
        reader.error(f"{place}, take", f'must be a list of at most {MAX_TAKE} cards, such as ["6"] or ["A of spades"]')
        return None
    for name in take:
        if not isinstance(name, str) or deck.card(name) is None:
            example = f'"{deck.ranks[-1]}"' + (f' or "{deck.ranks[-1]} of {deck.suits[-1]}"' if deck.suits else "")
            shown = shown_name(name) if isinstance(name, str) else type_name(name)
            reader.error(f"{place}, take", f"{shown} is not a {deck.kind} of this deck (write {example})")
            return None
    count = reader.value(raw.get("count", 0 if take else 1), f"{place}, count")
    if count is None:
        return None
    if not is_integer(count) or count < 0:
        reader.error(f"{place}, count", f"must be a whole number of {deck.kind}s, got {text(count)}")
        return None
    if count + len(take) == 0:
        reader.error(place, f"draws nothing: give a count of {deck.kind}s (or cards to take)")
        return None
    if count + len(take) > deck.size:
        reader.error(place, f"draws {to_int(count) + len(take):,} {deck.kind}s from a deck of {deck.size:,}")
        return None
    return Draw(hand, to_int(count), tuple(take))


def split_rules(
    raw: list[Any], where: str, reader: _Reader
) -> tuple[list[Any], list[tuple[Node | None, tuple[tuple[str, Node], ...]]]]:
    """The outcome tables with every part that reads the hands taken out, and those parts per outcome.

    A ``when`` or a value that does not read the hands is settled here: a condition that fails drops
    the outcome, one that holds is removed; a field left to the hands is replaced by a placeholder
    the plain reader accepts (the dealer replaces it hand by hand)."""
    tables: list[Any] = []
    rules: list[tuple[Node | None, tuple[tuple[str, Node], ...]]] = []
    for index, item in enumerate(raw, start=1):
        if not isinstance(item, dict):
            tables.append(item)
            rules.append((None, ()))
            continue
        place = f"{where}, outcome {index}"
        table = dict(item)
        when = None
        if "when" in table:
            tree = _tree(table.pop("when"), f"{place}, when", reader)
            if tree is False:
                continue
            if tree is not None and uses_hands(tree):
                when = tree
            elif tree is not None and not _holds(tree, f"{place}, when", reader):
                continue
        by_hand = []
        for key in RULE_FIELDS:
            if key in table and (is_tree(table[key]) or _reads_hands(table[key])):
                tree = _tree(table[key], f"{place}, {key}", reader)
                if tree is False or tree is None:
                    table.pop(key)
                    continue
                by_hand.append((key, tree))
                table[key] = 0
        tables.append(table)
        rules.append((when, tuple(by_hand)))
    return tables, rules


def _reads_hands(raw: Any) -> bool:
    if not isinstance(raw, str):
        return False
    try:
        return uses_hands(parse(raw))
    except ExpressionError:
        return False  # the plain reader reports it


def _tree(raw: Any, where: str, reader: _Reader) -> Node | None | bool:
    """An expression tree from text or a family's tree; False after an error (reported)."""
    if is_tree(raw):
        return raw
    if not isinstance(raw, str):
        reader.error(where, f"must be a condition in quotes, not {type_name(raw)}")
        return False
    try:
        return parse(raw)
    except ExpressionError as error:
        reader.error(where, str(error))
        return False


def _holds(tree: Node, where: str, reader: _Reader) -> bool:
    try:
        return evaluate(tree, reader.params) != 0
    except ExpressionError as error:
        reader.error(where, str(error))
        return False


def check_rules(
    rules: Sequence[tuple[Node | None, tuple[tuple[str, Node], ...]]],
    where: str,
    reader: _Reader,
    deck: Deck | None,
    hands: Sequence[str],
    draws: bool,
) -> bool:
    """Every call of a hand function checked against the deck and the hands; False after a problem."""
    fine = True
    for index, (when, by_hand) in enumerate(rules, start=1):
        for key, tree in ((("when", when),) if when is not None else ()) + by_hand:
            place = f"{where}, outcome {index}, {key}"
            calls = hand_calls(tree)
            if deck is None:
                reader.error(place, f"{calls[0].function}() reads the cards dealt: the ruleset needs a [deck] table")
                fine = False
                continue
            for call in calls:
                checked = check_call(call, deck, hands, drawn=draws)
                if isinstance(checked, str):
                    reader.error(place, checked)
                    fine = False
                    break
    return fine


def read_hand_rule(
    rule: dict[str, Any], place: str, reader: _Reader, deck: Deck | None, hands: Sequence[str]
) -> tuple[str, Node | None, str] | None:
    """One strategy rule by hand: ``{ state = "player", when = "total(player) >= 17", action = "stand" }``."""
    state, action, when = rule.get("state"), rule.get("action"), rule.get("when")
    for key in rule:
        if key not in ("state", "when", "action"):
            reader.error(place, f"unknown field {shown_name(key)} (a rule by hand has state, when and action)")
            return None
    if not isinstance(state, str) or not isinstance(action, str):
        reader.error(place, "needs 'state' and 'action', both text")
        return None
    if deck is None:
        reader.error(f"{place}, state", "rules by 'state' read the hands of a deck game: this ruleset has no [deck]")
        return None
    tree = None
    if when is not None:
        tree = _tree(when, f"{place}, when", reader)
        if tree is False or tree is None:
            return None
        for call in hand_calls(tree):
            checked = check_call(call, deck, hands, drawn=False)
            if isinstance(checked, str):
                reader.error(f"{place}, when", checked)
                return None
        if not uses_hands(tree) and not _holds(tree, f"{place}, when", reader):
            return None
    return (state, tree, action)


def cases_well_formed(
    raw: list[Any],
    rules: Sequence[tuple[Node | None, tuple[tuple[str, Node], ...]]],
    where: str,
    reader,
    draws: bool,
    field_name: str,
) -> bool:
    """Cases take no ``prob`` (the draw, or the first condition that holds, decides), and nothing may
    follow a case without ``when`` (it takes every hand)."""
    for index, (item, (_, by_hand)) in enumerate(zip(raw, rules), start=1):
        if isinstance(item, dict) and "prob" in item and all(key != "prob" for key, _ in by_hand):
            why = "the draw gives the chance" if draws else "the first case whose 'when' holds is taken"
            reader.error(f"{where}, outcome {index}, prob", f"outcomes chosen by the cards take no 'prob' ({why})")
            return False
    unconditional = [index for index, (when, _) in enumerate(rules, start=1) if when is None]
    if unconditional and unconditional[0] < len(rules):
        first = unconditional[0]
        reader.error(
            f"{where}, outcome {first + 1}",
            f"is never taken: outcome {first} has no 'when', so it takes every hand (put it last)",
        )
        return False
    if any(key == "prob" for _, by_hand in rules for key, _ in by_hand):
        reader.error(where, f"outcomes chosen by the cards take no 'prob' ({field_name})")
        return False
    return True


def split_strategy_rules(
    rules: Any, where: str, reader, deck: Deck | None, hands: Sequence[str]
) -> tuple[Any, list[tuple[str, Node | None, str]]]:
    """A strategy's ``rules``: those by ``state`` (read here, for a deck game) and the rest (families)."""
    if not isinstance(rules, list) or not any(isinstance(rule, dict) and "state" in rule for rule in rules):
        return rules, []
    by_hand = []
    family_rules = []
    for number, rule in enumerate(rules, start=1):
        if isinstance(rule, dict) and "state" in rule:
            read = read_hand_rule(rule, f"{where}, rule {number}", reader, deck, hands)
            if read is not None:
                by_hand.append(read)
        else:
            family_rules.append(rule)
    return family_rules or None, by_hand
