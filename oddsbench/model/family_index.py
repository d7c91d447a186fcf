"""The index space of a family: ``{expression}`` name templates, index ranges, ``let`` values and
every combination of index values, each step bounded.

Split from ``model/families.py`` (which turns one family table into members and their outcomes):
this is the arithmetic of "which index values, in which order", shared by a family's members and
by the ``each`` variables of its outcomes. Everything goes through ``model/expr.py``.
"""

from __future__ import annotations

from collections.abc import Iterator, Mapping
from dataclasses import dataclass
from typing import Any

from oddsbench.model.errors import shown_name, type_name
from oddsbench.model.expr import (
    Binary,
    Call,
    Conditional,
    ExpressionError,
    Node,
    Unary,
    evaluate,
    is_tree,
    names_in,
    parse,
    partial,
    uses_hands,
)
from oddsbench.model.numbers import Rational, is_integer, text, to_int

MAX_INDEX_VARIABLES = 8
MAX_FAMILY_COMBINATIONS = 2_000_000  # index values tried, kept or not: a filter cannot hide a hang
RESERVED_NAMES = frozenset({"if", "then", "else", "and", "or", "not", "min", "max", "abs", "floor", "ceil"})


class FamilyError(Exception):
    """One failure inside a family; the message already names the family and index values."""


def steps_in(node: Node | int | None) -> int:
    """Nodes of an expression: the steps one evaluation of it takes."""
    if node is None or isinstance(node, int):
        return 0
    count, stack = 0, [node]
    while stack:
        item = stack.pop()
        count += 1
        if isinstance(item, Unary):
            stack.append(item.operand)
        elif isinstance(item, Binary):
            stack += [item.left, item.right]
        elif isinstance(item, Call):
            stack += list(item.args)
        elif isinstance(item, Conditional):
            stack += [item.test, item.then, item.otherwise]
    return count


class TooManyCombinations(FamilyError):
    """The combination budget ran out; re-raised with the family's name by the caller."""


@dataclass(frozen=True)
class Template:
    """Text with ``{expression}`` holes; ``{{`` and ``}}`` are literal braces."""

    parts: tuple[str | Node, ...]
    raw: str

    @property
    def steps(self) -> int:
        return sum(steps_in(part) for part in self.parts if not isinstance(part, str))

    def render(self, env: Mapping[str, Rational]) -> str:
        pieces = []
        for part in self.parts:
            if isinstance(part, str):
                pieces.append(part)
                continue
            value = evaluate(part, env)
            if not is_integer(value):
                raise ExpressionError(f"placeholder in {shown_name(self.raw)} gives {text(value)}, not a whole number")
            pieces.append(str(to_int(value)))
        return "".join(pieces)


def parse_template(raw: str) -> Template:
    parts: list[str | Node] = []
    literal: list[str] = []
    i = 0
    while i < len(raw):
        char = raw[i]
        if raw.startswith("{{", i) or raw.startswith("}}", i):
            literal.append(char)
            i += 2
            continue
        if char == "}":
            raise ExpressionError(f"unmatched '}}' in {shown_name(raw)} (write '}}}}' for a literal brace)")
        if char == "{":
            end = raw.find("}", i + 1)
            if end < 0:
                raise ExpressionError(f"unclosed '{{' in {shown_name(raw)}")
            if literal:
                parts.append("".join(literal))
                literal = []
            parts.append(parse(raw[i + 1 : end]))
            i = end + 1
            continue
        literal.append(char)
        i += 1
    if literal:
        parts.append("".join(literal))
    return Template(tuple(parts), raw)


@dataclass(frozen=True)
class IndexRange:
    name: str
    low: Node | int
    high: Node | int


def value_node(raw: Any, what: str) -> Node | int:
    if isinstance(raw, float):
        raise FamilyError(f'{what}: write decimals in quotes ("{raw}") so they stay exact')
    if isinstance(raw, bool) or not isinstance(raw, int | str):
        raise FamilyError(f"{what} must be a whole number or an expression in quotes, not {type_name(raw)}")
    if isinstance(raw, int):
        return raw
    try:
        return parse(raw)
    except ExpressionError as error:
        raise FamilyError(f"{what} {shown_name(raw)}: {error}") from None


def whole_value(node: Node | int, env: Mapping[str, Rational], what: str) -> int:
    if isinstance(node, int):
        return node
    value = evaluate(node, env)
    if not is_integer(value):
        raise ExpressionError(f"{what} is {text(value)}, not a whole number")
    return to_int(value)


def index_ranges(raw: Any, what: str, taken: set[str]) -> list[IndexRange]:
    if not isinstance(raw, dict) or not raw:
        raise FamilyError(f"{what} must be a table of name = [low, high], e.g. {{ t = [0, 99] }}")
    if len(raw) > MAX_INDEX_VARIABLES:
        raise FamilyError(f"{what} has {len(raw)} variables, more than the limit of {MAX_INDEX_VARIABLES}")
    ranges = []
    for name, bounds in raw.items():
        try:
            plain = names_in(parse(name)) == {name}
        except ExpressionError:
            plain = False
        if not plain or name in RESERVED_NAMES:
            raise FamilyError(f"{what}: {name!r} is not a usable variable name (letters, digits and _)")
        if name in taken:
            raise FamilyError(f"{what}: variable {name!r} is already a parameter or index variable")
        if not isinstance(bounds, list) or len(bounds) != 2:
            raise FamilyError(f"{what}, {name}: must be [low, high] (both included), not {shown_name(bounds)}")
        low = value_node(bounds[0], f"{what}, {name}, low end")
        high = value_node(bounds[1], f"{what}, {name}, high end")
        ranges.append(IndexRange(name, low, high))
        taken.add(name)
    return ranges


def read_lets(raw: Any, what: str, taken: set[str]) -> list[tuple[str, Node]]:
    """Named helper values, in order, each free to use the ones before it."""
    if raw is None:
        return []
    if not isinstance(raw, dict):
        raise FamilyError(f'{what} must be a table of name = "expression"')
    lets = []
    for name, expression in raw.items():
        try:
            plain = names_in(parse(name)) == {name}
        except ExpressionError:
            plain = False
        if not plain or name in RESERVED_NAMES:
            raise FamilyError(f"{what}: {name!r} is not a usable name (letters, digits and _)")
        if name in taken:
            raise FamilyError(f"{what}: {name!r} is already a parameter or variable")
        if not isinstance(expression, int | str) or isinstance(expression, bool):
            raise FamilyError(f"{what}, {name}: must be an expression in quotes")
        try:
            lets.append((name, parse(str(expression))))
        except ExpressionError as error:
            raise FamilyError(f"{what}, {name} {shown_name(expression)}: {error}") from None
        taken.add(name)
    return lets


def reads_hands(node: Node, env: Mapping[str, Any]) -> bool:
    """Whether a value depends on the cards dealt: a hand function in it, or a ``let`` that has one.
    Such values stay expressions (with the index values put in) for the dealer of a deck game."""
    return uses_hands(node) or any(is_tree(env.get(name)) for name in names_in(node))


def with_lets(env: dict[str, Rational], lets: list[tuple[str, Node]]) -> dict[str, Rational]:
    if not lets:
        return env
    env = dict(env)
    for name, node in lets:
        try:
            env[name] = partial(node, env) if reads_hands(node, env) else evaluate(node, env)
        except ExpressionError as error:
            raise ExpressionError(f"let {name}: {error}") from None
    return env


def index_combinations(
    ranges: list[IndexRange], env: dict[str, Rational], tried: list[int] | None = None
) -> Iterator[dict[str, Rational]]:
    """Every assignment of the index variables, the later ranges free to use the earlier values.
    ``tried`` counts down the combinations left in the whole expansion (``when`` filters can
    discard every one, so the count of members alone does not bound the time)."""
    from oddsbench.model.numbers import QQ

    if not ranges:
        if tried is not None:
            tried[0] -= 1
            if tried[0] < 0:
                raise TooManyCombinations(
                    f"index ranges give more than {MAX_FAMILY_COMBINATIONS:,} combinations to try (the limit)"
                )
        yield dict(env)
        return
    first, rest = ranges[0], ranges[1:]
    low = whole_value(first.low, env, f"low end of {first.name}")
    high = whole_value(first.high, env, f"high end of {first.name}")
    for value in range(low, high + 1):
        inner = dict(env)
        inner[first.name] = QQ(value)
        yield from index_combinations(rest, inner, tried)


def fixed_count(ranges: list[IndexRange], params: Mapping[str, Rational]) -> int | None:
    """How many combinations the ranges give, when no range depends on another (else None):
    a hopeless expansion is refused at once, with its size, instead of after the budget runs out."""
    count = 1
    for item in ranges:
        try:
            low = whole_value(item.low, params, "low end")
            high = whole_value(item.high, params, "high end")
        except ExpressionError:
            return None
        count *= max(high - low + 1, 0)
    return count


def at_index(env: Mapping[str, Rational], names: list[str]) -> str:
    shown = ", ".join(f"{name}={text(env[name])}" for name in names if name in env)
    return f" at {shown}" if shown else ""
