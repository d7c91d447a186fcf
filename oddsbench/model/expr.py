"""The ruleset expression language: a small, bounded, exact parser of our own.

Ruleset values such as ``"18/37"`` or ``"(1 - p)^2"`` are text from files that other people
write, so they are never handed to ``eval`` or ``sympify``. This module tokenises and parses
them into a tiny tree and evaluates that tree to an exact rational (sympy's ``QQ``), refusing
anything that could take unbounded time or memory: long literals, huge powers, deep nesting.

Grammar (lowest precedence first)::

    expr    := "if" expr "then" expr "else" expr | either
    either  := both ("or" both)*
    both    := negate ("and" negate)*
    negate  := "not" negate | compare
    compare := sum (("<" | "<=" | ">" | ">=" | "==" | "!=") sum)?
    sum     := product (("+" | "-") product)*
    product := unary (("*" | "/" | "//" | "%") unary)*
    unary   := ("-" | "+") unary | power
    power   := atom ("^" unary)?            # right-associative, integer exponents only
    atom    := number | name | name "(" expr ("," expr)* ")" | "(" expr ")"

Truth values are 1 and 0. Functions: ``min``, ``max``, ``abs``, ``floor``, ``ceil``.

Functions of the hands (``HAND_FUNCTIONS``: ``count(player, A)``, ``total(dealer)``, ``left()``) read
the cards dealt in a game with a ``[deck]``; their arguments are labels (a hand, a rank, a suit, an
item), never evaluated. ``model/hands.py`` gives them their meaning; ``evaluate`` asks the caller's
``hands`` for their values, and refuses them where no cards are dealt.
"""

from __future__ import annotations

import re
from collections.abc import Callable, Mapping
from dataclasses import dataclass

from oddsbench.model.numbers import QQ, Rational, bit_size, is_integer, to_int

MAX_TEXT_LENGTH = 2_000
MAX_LITERAL_DIGITS = 60
MAX_DEPTH = 60
MAX_TREE_DEPTH = 200
MAX_EXPONENT = 4_096
MAX_RESULT_BITS = 16_384


class ExpressionError(ValueError):
    """A refused or failed expression; the message is one line for the user."""


@dataclass(frozen=True)
class Number:
    value: Rational


@dataclass(frozen=True)
class Name:
    name: str


@dataclass(frozen=True)
class Unary:
    op: str
    operand: Node


@dataclass(frozen=True)
class Binary:
    op: str
    left: Node
    right: Node


@dataclass(frozen=True)
class Call:
    function: str
    args: tuple[Node, ...]


@dataclass(frozen=True)
class Conditional:
    test: Node
    then: Node
    otherwise: Node


Node = Number | Name | Unary | Binary | Call | Conditional

_TOKEN = re.compile(
    r"[ \t\r\n]*(?:(?P<number>[0-9]+(?:\.[0-9]+)?|\.[0-9]+)|(?P<name>[A-Za-z_][A-Za-z0-9_]*)"
    r"|(?P<op>//|<=|>=|==|!=|[-+*/%^(),<>]))"
)
_KEYWORDS = frozenset({"if", "then", "else", "and", "or", "not"})
_FUNCTIONS = frozenset({"min", "max", "abs", "floor", "ceil"})
# Functions of the cards dealt; the names only (their meaning and checks are in model/hands.py).
HAND_FUNCTIONS = frozenset(
    {"cards", "count", "most", "pairs", "kinds", "flush", "most_suit", "straight", "high", "total", "hard", "soft"}
    | {"left"}
)
_COMPARISONS = ("<=", ">=", "==", "!=", "<", ">")

# Binding strength of each infix operator (higher binds tighter); "not" sits between "and"
# and the comparisons, unary minus between the products and "^".
_OR, _AND, _NOT, _COMPARE, _SUM, _PRODUCT, _SIGN, _POWER = range(1, 9)
_INFIX = {"or": _OR, "and": _AND, "+": _SUM, "-": _SUM, "*": _PRODUCT, "/": _PRODUCT, "//": _PRODUCT}
_INFIX |= {"%": _PRODUCT, "^": _POWER} | dict.fromkeys(_COMPARISONS, _COMPARE)


def _tokenize(text: str) -> list[tuple[str, str]]:
    tokens: list[tuple[str, str]] = []
    position = 0
    stripped_end = len(text.rstrip(" \t\r\n"))
    while position < stripped_end:
        match = _TOKEN.match(text, position)
        if match is None or match.end() == position:
            bad = text[position:].lstrip(" \t\r\n")[:1]
            raise ExpressionError(f"unexpected character {bad!r}")
        kind = match.lastgroup or ""
        value = match.group(kind)
        if kind == "number" and len(value.replace(".", "")) > MAX_LITERAL_DIGITS:
            raise ExpressionError(f"number literal longer than {MAX_LITERAL_DIGITS} digits")
        if kind == "name" and value.startswith("__"):
            raise ExpressionError(f"names starting with '__' are not allowed ({_cut(value)!r})")
        if kind == "name" and value in _KEYWORDS:
            kind = "keyword"
        tokens.append((kind, value))
        position = match.end()
    return tokens


def _cut(value: str, limit: int = 40) -> str:
    return value if len(value) <= limit else value[: limit - 3] + "..."


class _Parser:
    """Precedence climbing: a few Python frames per level of nesting, so the nesting limit
    stays far from the interpreter's recursion limit even when called from deep stacks."""

    def __init__(self, tokens: list[tuple[str, str]]) -> None:
        self.tokens = tokens
        self.index = 0
        self.depth = 0
        self.heights: dict[int, int] = {}

    def peek(self) -> tuple[str, str]:
        return self.tokens[self.index] if self.index < len(self.tokens) else ("end", "")

    def take(self, value: str | None = None) -> tuple[str, str]:
        token = self.peek()
        if value is not None and token[1] != value:
            found = token[1] or "end of text"
            raise ExpressionError(f"expected {value!r} but found {_cut(found)!r}")
        if token[0] == "end":
            raise ExpressionError("unexpected end of text")
        self.index += 1
        return token

    def at(self, *values: str) -> bool:
        kind, value = self.peek()
        return kind in ("op", "keyword") and value in values

    def built(self, node: Node, *children: Node) -> Node:
        """Record the tree's height: long operator chains nest as deeply as parentheses do,
        and every walk over the tree (evaluation, names, equality) recurses once per level."""
        height = 1 + max((self.heights.get(id(child), 1) for child in children), default=0)
        if height > MAX_TREE_DEPTH:
            raise ExpressionError(f"expression has more than {MAX_TREE_DEPTH} operations inside one another")
        self.heights[id(node)] = height
        return node

    def nested(self, parse: Callable[[], Node]) -> Node:
        self.depth += 1
        if self.depth > MAX_DEPTH:
            raise ExpressionError(f"expression nested deeper than {MAX_DEPTH} levels")
        try:
            return parse()
        finally:
            self.depth -= 1

    def expr(self) -> Node:
        return self.nested(self._expr)

    def _expr(self) -> Node:
        if self.at("if"):
            self.take()
            test = self.expr()
            self.take("then")
            then = self.expr()
            self.take("else")
            otherwise = self.expr()
            return self.built(Conditional(test, then, otherwise), test, then, otherwise)
        return self.infix(_OR)

    def infix(self, weakest: int) -> Node:
        """Operators binding at least as tightly as ``weakest``, left to right."""
        node = self.prefix(weakest)
        while True:
            kind, op = self.peek()
            strength = _INFIX.get(op) if kind in ("op", "keyword") else None
            if strength is None or strength < weakest:
                return node
            self.take()
            if op == "^":
                right = self.nested(lambda: self.infix(_POWER))
            elif strength == _COMPARE:
                right = self.infix(_SUM)
                if self.at(*_COMPARISONS):
                    raise ExpressionError("chained comparisons need 'and' between them")
            else:
                right = self.infix(strength + 1)
            node = self.built(Binary(op, node, right), node, right)

    def prefix(self, weakest: int) -> Node:
        if self.at("not") and weakest <= _COMPARE:
            self.take()
            operand = self.nested(lambda: self.infix(_COMPARE))
            return self.built(Unary("not", operand), operand)
        if self.at("-", "+"):
            op = self.take()[1]
            operand = self.nested(lambda: self.infix(_POWER))
            return self.built(Unary(op, operand), operand)
        return self.atom()

    def atom(self) -> Node:
        kind, value = self.peek()
        if kind == "number":
            self.take()
            return Number(_literal(value))
        if kind == "name":
            self.take()
            if self.at("("):
                if value not in _FUNCTIONS and value not in HAND_FUNCTIONS:
                    raise ExpressionError(f"unknown function {_cut(value)!r}")
                self.take("(")
                if value in HAND_FUNCTIONS and self.at(")"):
                    self.take()
                    return Call(value, ())
                args = [self.expr()]
                while self.at(","):
                    self.take()
                    args.append(self.expr())
                self.take(")")
                return self.built(Call(value, tuple(args)), *args)
            if value in _FUNCTIONS:
                raise ExpressionError(f"function {value!r} needs arguments in parentheses")
            return Name(value)
        if self.at("("):
            self.take()
            node = self.expr()
            self.take(")")
            return node
        if kind == "end":
            raise ExpressionError("unexpected end of text")
        raise ExpressionError(f"unexpected {_cut(value)!r}")


def _literal(text: str) -> Rational:
    if "." in text:
        whole, _, fraction = text.partition(".")
        return QQ(int(whole or "0") * 10 ** len(fraction) + int(fraction), 10 ** len(fraction))
    return QQ(int(text))


def parse(text: str) -> Node:
    """Parse expression text into a tree, or raise ExpressionError with a one-line reason."""
    if not isinstance(text, str):
        raise ExpressionError("expression must be text")
    if len(text) > MAX_TEXT_LENGTH:
        raise ExpressionError(f"expression longer than {MAX_TEXT_LENGTH} characters")
    tokens = _tokenize(text)
    if not tokens:
        raise ExpressionError("empty expression")
    parser = _Parser(tokens)
    node = parser.expr()
    if parser.index != len(tokens):
        raise ExpressionError(f"unexpected {_cut(parser.peek()[1])!r}")
    return node


def names_in(node: Node) -> set[str]:
    """Every parameter name the expression refers to."""
    if isinstance(node, Name):
        return {node.name}
    if isinstance(node, Unary):
        return names_in(node.operand)
    if isinstance(node, Binary):
        return names_in(node.left) | names_in(node.right)
    if isinstance(node, Call):
        if node.function in HAND_FUNCTIONS:
            return set()  # labels of hands, ranks, suits and items, not parameters
        return set().union(*(names_in(arg) for arg in node.args))
    if isinstance(node, Conditional):
        return names_in(node.test) | names_in(node.then) | names_in(node.otherwise)
    return set()


def hand_calls(node: Node) -> list[Call]:
    """Every call of a hand function in the tree, in reading order (repeats kept)."""
    found: list[Call] = []
    pending: list[Node] = [node]
    while pending:
        item = pending.pop()
        if isinstance(item, Call) and item.function in HAND_FUNCTIONS:
            found.append(item)
        elif isinstance(item, Call):
            pending.extend(reversed(item.args))
        elif isinstance(item, Unary):
            pending.append(item.operand)
        elif isinstance(item, Binary):
            pending.extend((item.right, item.left))
        elif isinstance(item, Conditional):
            pending.extend((item.otherwise, item.then, item.test))
    return found


def uses_hands(node: Node) -> bool:
    """Whether the value depends on the cards dealt (a hand function appears in it)."""
    return bool(hand_calls(node))


def height(node: Node) -> int:
    """Levels of operations inside one another (1 for a number or a name)."""
    if isinstance(node, Unary):
        return 1 + height(node.operand)
    if isinstance(node, Binary):
        return 1 + max(height(node.left), height(node.right))
    if isinstance(node, Call):
        return 1 + max((height(arg) for arg in node.args), default=0)
    if isinstance(node, Conditional):
        return 1 + max(height(node.test), height(node.then), height(node.otherwise))
    return 1


def spelled(node: Node, top: bool = True) -> str:
    """Expression text for a tree (operations inside others in parentheses): how a condition kept
    for the dealer is shown in reports."""
    if isinstance(node, Number):
        value = node.value
        shown = str(QQ.numer(value)) if QQ.denom(value) == 1 else f"{QQ.numer(value)}/{QQ.denom(value)}"
        return shown if top or QQ.denom(value) == 1 and value >= 0 else f"({shown})"
    if isinstance(node, Name):
        return node.name
    if isinstance(node, Call):
        return f"{node.function}({', '.join(spelled(arg) for arg in node.args)})"
    if isinstance(node, Unary):
        inner = f"{'not ' if node.op == 'not' else node.op}{spelled(node.operand, False)}"
    elif isinstance(node, Binary):
        inner = f"{spelled(node.left, False)} {node.op} {spelled(node.right, False)}"
    else:
        inner = f"if {spelled(node.test)} then {spelled(node.then)} else {spelled(node.otherwise)}"
    return inner if top else f"({inner})"


def partial(node: Node, env: Mapping[str, Rational | Node]) -> Node:
    """The tree with every name known in ``env`` put in (a value, or a tree of its own), calls of
    hand functions kept: what a family or a ``let`` knows at reading time, kept for dealing.

    Put-in trees can deepen the result; past ``MAX_TREE_DEPTH`` it is refused like a parsed one."""
    result = _partial(node, env)
    if height(result) > MAX_TREE_DEPTH:
        raise ExpressionError(f"expression has more than {MAX_TREE_DEPTH} operations inside one another")
    return result


def _partial(node: Node, env: Mapping[str, Rational | Node]) -> Node:
    if isinstance(node, Name):
        if node.name not in env:
            return node
        value = env[node.name]
        return value if isinstance(value, _TREES) else Number(value)
    if isinstance(node, Unary):
        return Unary(node.op, _partial(node.operand, env))
    if isinstance(node, Binary):
        return Binary(node.op, _partial(node.left, env), _partial(node.right, env))
    if isinstance(node, Call):
        if node.function in HAND_FUNCTIONS:
            return node
        return Call(node.function, tuple(_partial(arg, env) for arg in node.args))
    if isinstance(node, Conditional):
        return Conditional(_partial(node.test, env), _partial(node.then, env), _partial(node.otherwise, env))
    return node


def _checked(value: Rational) -> Rational:
    if bit_size(value) > MAX_RESULT_BITS:
        raise ExpressionError(f"number too large (more than {MAX_RESULT_BITS} bits)")
    return value


def _truth(flag: bool) -> Rational:
    return QQ(1) if flag else QQ(0)


def _power(base: Rational, exponent: Rational) -> Rational:
    if not is_integer(exponent):
        raise ExpressionError("exponent must be a whole number")
    n = to_int(exponent)
    if abs(n) > MAX_EXPONENT:
        shown = f"{n}" if abs(n) < 10**12 else f"of {abs(n).bit_length()} bits"
        raise ExpressionError(f"exponent {shown} is beyond the limit of {MAX_EXPONENT}")
    if base == 0 and n < 0:
        raise ExpressionError("division by zero")
    if bit_size(base) * abs(n) > MAX_RESULT_BITS:
        raise ExpressionError(f"number too large (more than {MAX_RESULT_BITS} bits)")
    result = base ** abs(n)
    return QQ(1) / result if n < 0 else result


def _floor(value: Rational) -> Rational:
    return QQ(QQ.numer(value) // QQ.denom(value))


def _apply(op: str, left: Rational, right: Rational) -> Rational:
    if op == "+":
        return left + right
    if op == "-":
        return left - right
    if op == "*":
        return left * right
    if op in ("/", "//", "%"):
        if right == 0:
            raise ExpressionError("division by zero")
        if op == "/":
            return left / right
        quotient = _floor(left / right)
        return quotient if op == "//" else left - right * quotient
    if op == "^":
        return _power(left, right)
    comparisons = {
        "<": left < right,
        "<=": left <= right,
        ">": left > right,
        ">=": left >= right,
        "==": left == right,
        "!=": left != right,
    }
    return _truth(comparisons[op])


HandValues = Callable[[Call], Rational]
_TREES = (Number, Name, Unary, Binary, Call, Conditional)


def is_tree(value: object) -> bool:
    """Whether a value is a parsed expression (kept for the dealer) rather than a number or text."""
    return isinstance(value, _TREES)


def evaluate(node: Node, env: Mapping[str, Rational], hands: HandValues | None = None) -> Rational:
    """Evaluate a parsed expression exactly; names come from ``env`` (params, index variables),
    the values of hand functions from ``hands`` (the dealer of a deck game; None elsewhere)."""
    if isinstance(node, Number):
        return node.value
    if isinstance(node, Name):
        if node.name not in env:
            raise ExpressionError(f"unknown parameter {_cut(node.name)!r}")
        value = env[node.name]
        if isinstance(value, _TREES):  # a family's ``let`` that reads the hands, kept as a tree
            raise ExpressionError(
                f"{_cut(node.name)!r} reads the cards dealt: use it only in an outcome's when, prob, pay or stake"
            )
        return value
    if isinstance(node, Unary):
        value = evaluate(node.operand, env, hands)
        if node.op == "not":
            return _truth(value == 0)
        return -value if node.op == "-" else value
    if isinstance(node, Conditional):
        chosen = node.then if evaluate(node.test, env, hands) != 0 else node.otherwise
        return evaluate(chosen, env, hands)
    if isinstance(node, Binary):
        left = evaluate(node.left, env, hands)
        if node.op == "and":
            return _truth(left != 0 and evaluate(node.right, env, hands) != 0)
        if node.op == "or":
            return _truth(left != 0 or evaluate(node.right, env, hands) != 0)
        return _checked(_apply(node.op, left, evaluate(node.right, env, hands)))
    if isinstance(node, Call):
        if node.function in HAND_FUNCTIONS:
            if hands is None:
                raise ExpressionError(
                    f"{node.function}() reads the cards dealt: it works only in the outcomes of a ruleset with a [deck]"
                )
            return hands(node)
        values = [evaluate(arg, env, hands) for arg in node.args]
        if node.function in ("min", "max"):
            return min(values) if node.function == "min" else max(values)
        if len(values) != 1:
            raise ExpressionError(f"{node.function} takes one argument")
        (value,) = values
        if node.function == "abs":
            return abs(value)
        if node.function == "floor":
            return _floor(value)
        return -_floor(-value)
    raise ExpressionError("unsupported expression")


def evaluate_text(text: str, env: Mapping[str, Rational] | None = None) -> Rational:
    """Parse and evaluate in one step."""
    return evaluate(parse(text), env or {})
