"""How one parameter enters a ruleset: as a polynomial of known degree, or not polynomially.

``oddsbench tune`` finds a figure as an exact rational function of one ``[params]`` entry. That
is only true where the parameter enters the chances, pays and stakes as polynomials, and its
degree bound comes from their degrees. This module walks the raw document and the parse trees of
``model/expr.py`` (never evaluating user text as code) to find:

- the degree of the parameter in every ``prob``, every ``pay`` and every extra ``stake``, and in
  ``[ruleset] stake`` (through other ``[params]`` and ``let`` helpers that use it);
- every place where it enters otherwise: ``floor``, ``ceil``, ``min``, ``max``, ``abs``, ``//``,
  ``%``, comparisons, ``and``/``or``/``not``, an ``if`` test, a division by an expression of it, a
  power it is in the exponent of, or any field that shapes the chain (``when``, ``to`` and ``state``
  placeholders, ``index`` and ``each`` ranges, ``draw``, the deck, strategy rules).

A ``let`` helper's name is given the worst degree any of its definitions has (scopes are not
told apart): an upper bound, which is all the degree bound needs.
"""

from __future__ import annotations

import re
from collections.abc import Iterator, Mapping
from dataclasses import dataclass, field
from typing import Any

from oddsbench.model.expr import (
    HAND_FUNCTIONS,
    Binary,
    Call,
    Conditional,
    ExpressionError,
    Name,
    Node,
    Number,
    Unary,
    evaluate,
    names_in,
    parse,
)
from oddsbench.model.numbers import is_integer, to_int

# Fields whose value is free text or a name, never an expression.
TEXT_KEYS = frozenset({"title", "about", "note", "result", "start", "version", "family", "action", "hand"})
COUNT_FIELDS = frozenset({"index", "each", "draw", "copies"})  # fields whose values count something
ROLE_KEYS = {"prob": "prob", "pay": "pay", "stake": "stake"}
_NAME = re.compile(r"[A-Za-z_][A-Za-z0-9_]*")


class NotPolynomial(Exception):
    """The parameter enters an expression otherwise than as a polynomial; the message says how.
    ``piecewise``: through a step (floor, a comparison, an if...), not only a division or a power."""

    def __init__(self, how: str, piecewise: bool = True) -> None:
        super().__init__(how)
        self.piecewise = piecewise


@dataclass
class ParamDegrees:
    """The largest degree of the parameter in each kind of field, and the places it is not polynomial."""

    name: str
    prob: int = 0
    pay: int = 0
    stake: int = 0  # extra stakes of outcomes
    round_stake: int = 0  # [ruleset] stake
    unused: bool = True
    not_polynomial: list[str] = field(default_factory=list)
    piecewise: bool = False  # some entry is a step (floor, comparison, if, a field shaping the chain)
    counts: bool = False  # it sets a count (a family's index range, a draw, copies): whole values only

    @property
    def polynomial(self) -> bool:
        return not self.not_polynomial


def degree(node: Node, degrees: Mapping[str, int], values: Mapping[str, object] | None = None) -> int:
    """The degree of a tree in the parameter (names in ``degrees`` have that degree, others 0).

    Raises ``NotPolynomial`` naming the first operation through which the parameter enters
    otherwise. ``values`` (the file's parameter values) read a constant exponent.
    """
    if isinstance(node, Number):
        return 0
    if isinstance(node, Name):
        return degrees.get(node.name, 0)
    if isinstance(node, Unary):
        inner = degree(node.operand, degrees, values)
        if node.op == "not" and _uses(node.operand, degrees):
            raise NotPolynomial("'not'")
        return inner
    if isinstance(node, Conditional):
        if _uses(node.test, degrees):
            raise NotPolynomial("an 'if' test")
        return max(degree(node.then, degrees, values), degree(node.otherwise, degrees, values))
    if isinstance(node, Call):
        if node.function in HAND_FUNCTIONS:
            return 0
        if any(_uses(arg, degrees) for arg in node.args):
            raise NotPolynomial(f"{node.function}()")
        return 0
    if isinstance(node, Binary):
        return _binary_degree(node, degrees, values)
    raise NotPolynomial("an unknown operation")


def _binary_degree(node: Binary, degrees: Mapping[str, int], values: Mapping[str, object] | None) -> int:
    left_uses, right_uses = _uses(node.left, degrees), _uses(node.right, degrees)
    if node.op in ("+", "-"):
        return max(degree(node.left, degrees, values), degree(node.right, degrees, values))
    if node.op == "*":
        return degree(node.left, degrees, values) + degree(node.right, degrees, values)
    if node.op == "/":
        if right_uses:
            raise NotPolynomial("a division by an expression of it", piecewise=False)
        return degree(node.left, degrees, values)
    if node.op == "^":
        if right_uses:
            raise NotPolynomial("an exponent", piecewise=False)
        base = degree(node.left, degrees, values)
        if not left_uses:
            return 0
        try:
            exponent = evaluate(node.right, dict(values or {}))
        except ExpressionError:
            raise NotPolynomial("a power whose exponent is not a constant") from None
        if not is_integer(exponent) or exponent < 0:
            raise NotPolynomial("a negative or fractional power", piecewise=False)
        return base * to_int(exponent)
    if left_uses or right_uses:
        raise NotPolynomial(f"'{node.op}'")
    return 0


def _uses(node: Node, degrees: Mapping[str, int]) -> bool:
    return bool(names_in(node) & degrees.keys())


def param_degrees(document: Mapping[str, Any], name: str, values: Mapping[str, object] | None = None) -> ParamDegrees:
    """How ``name`` (a ``[params]`` entry) enters the chances, pays and stakes of ``document``."""
    found = ParamDegrees(name)
    degrees: dict[str, int] = {name: 1}
    tainted: set[str] = {name}
    params = document.get("params", {})
    if isinstance(params, Mapping):
        for key, raw in params.items():
            if key == name or not isinstance(raw, str):
                continue
            _bind(key, raw, degrees, tainted, values, found, f"[params] {key}")
    for _ in range(3):  # lets may use lets written elsewhere: a few passes reach every chain of them
        for key, raw, where in _lets(document):
            _bind(key, raw, degrees, tainted, values, found, where)
    for path, raw in _leaves(document):
        _field(place_text(path), path[-1] if path else "", raw, degrees, tainted, values, found)
        if set(path) & COUNT_FIELDS and isinstance(raw, str) and set(_names_of(path[-1], raw)) & tainted:
            found.counts = True
    found.not_polynomial = list(dict.fromkeys(found.not_polynomial))
    return found


def _bind(key, raw, degrees, tainted, values, found, where) -> None:
    """A helper name (a later parameter or a ``let``) takes the degree of its expression."""
    try:
        tree = parse(raw)
    except ExpressionError:
        return  # the reader reports it; a file that does not load is refused before this
    if not names_in(tree) & tainted:
        return
    tainted.add(key)
    try:
        degrees[key] = max(degrees.get(key, 0), degree(tree, degrees, values))
    except NotPolynomial as reason:
        _not_polynomial(found, where, reason)
        degrees[key] = max(degrees.get(key, 0), 1)


def _field(where, key, raw, degrees, tainted, values, found) -> None:
    if not isinstance(raw, str) or key in TEXT_KEYS:
        return
    if key in ROLE_KEYS:
        try:
            tree = parse(raw)
        except ExpressionError:
            return
        if not names_in(tree) & tainted:
            return
        found.unused = False
        try:
            value = degree(tree, degrees, values)
        except NotPolynomial as reason:
            _not_polynomial(found, where, reason)
            return
        role = "round_stake" if where == "[ruleset], stake" else ROLE_KEYS[key]
        setattr(found, role, max(getattr(found, role), value))
        return
    if set(_names_of(key, raw)) & tainted:
        found.unused = False
        found.not_polynomial.append(f"{where}: it shapes the chain there")
        found.piecewise = True


def _not_polynomial(found: ParamDegrees, where: str, reason: NotPolynomial) -> None:
    found.not_polynomial.append(f"{where}: through {reason}")
    found.piecewise = found.piecewise or reason.piecewise


def _names_of(key: str, raw: str) -> Iterator[str]:
    """Names an expression or a template's placeholders (``to``, ``state``: ``"turn-{t + f}"``) read."""
    if key in ("to", "state"):
        for hole in re.findall(r"(?<!\{)\{([^{}]*)\}", raw):
            yield from _NAME.findall(hole)
        return
    yield from _NAME.findall(raw)


def _lets(document: Any, where: str = "") -> Iterator[tuple[str, str, str]]:
    """Every ``let`` binding in the document (name, expression text, place)."""
    if isinstance(document, Mapping):
        for key, value in document.items():
            place = f"{where}.{key}" if where else str(key)
            if key == "let" and isinstance(value, Mapping):
                for name, raw in value.items():
                    if isinstance(raw, str):
                        yield name, raw, f"{place}.{name}"
            else:
                yield from _lets(value, place)
    elif isinstance(document, list):
        for i, item in enumerate(document):
            yield from _lets(item, f"{where}[{i + 1}]")


def _leaves(document: Any, path: tuple[str, ...] = ()) -> Iterator[tuple[tuple[str, ...], Any]]:
    """(path, value) of every leaf except ``[params]``, ``[session]``, ``let`` tables and
    the plain actions of strategies (their ``rules`` are walked: a rule's ``when`` shapes the play)."""
    if isinstance(document, Mapping):
        for name, value in document.items():
            if (not path and name in ("params", "session")) or name == "let":
                continue
            if len(path) == 2 and path[0] == "strategies" and not isinstance(value, (Mapping, list)):
                continue  # a strategy's plain entry: state = "action"
            yield from _leaves(value, (*path, str(name)))
    elif isinstance(document, list):
        for i, item in enumerate(document):
            yield from _leaves(item, (*path, f"#{i + 1}"))
    else:
        yield path, document


def place_text(path: tuple[str, ...]) -> str:
    """``("states", "spin", "outcomes", "#2", "prob")`` as ``state 'spin', outcome 2, prob``."""
    words: list[str] = []
    kinds = {"states": "state", "families": "family", "strategies": "strategy", "choices": "choice"}
    i = 0
    while i < len(path):
        part = path[i]
        if part in kinds and i + 1 < len(path) and not path[i + 1].startswith("#"):
            words.append(f"{kinds[part]} {path[i + 1]!r}")
            i += 2
            continue
        if part.startswith("#"):
            listed = path[i - 1] if i else ""
            if listed == "outcomes" and words:
                words[-1] = f"outcome {part[1:]}"
            else:
                kind = "outcome" if i >= 2 and path[i - 2] == "choices" else "item"
                words.append(f"{kind} {part[1:]}")
        elif i == 0:
            words.append(f"[{part}]")
        else:
            words.append(part)
        i += 1
    return ", ".join(words)
