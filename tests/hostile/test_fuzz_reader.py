"""Property tests: random text and random TOML structures into the expression language, the
reader, the validator and (when a ruleset comes out valid) the chain builder and solver.

Whatever goes in, nothing may raise except the documented refusals (``ExpressionError`` from
expressions, ``OddsbenchError`` from chains), and every problem is a single readable line.
The default run is modest; ``ODDSBENCH_FUZZ_EXAMPLES=20000`` (examples per test) is the
large run, done by hand.
"""

from __future__ import annotations

import os

import pytest
import tomlkit
from hypothesis import HealthCheck, assume, event, given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import MAX_LINE_LENGTH, OddsbenchError
from oddsbench.model.expr import ExpressionError, evaluate, parse
from oddsbench.model.load import read_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

# A numpy warning would print extra lines on the command line's stderr: treat it as a failure.
pytestmark = pytest.mark.filterwarnings("error::RuntimeWarning")

EXAMPLES = int(os.environ.get("ODDSBENCH_FUZZ_EXAMPLES", "0")) or None
FUZZ = settings(
    max_examples=EXAMPLES or 60,
    deadline=None,
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large, HealthCheck.filter_too_much],
)

# The grammar's whole alphabet, plus near misses an attacker might try.
TOKENS = (
    "0 1 2 7 36 18 0.5 .25 4096 999999999999 p q x __import__ __class__ lambda if then else and or not "
    "min max abs floor ceil eval exec open ( ) , + - * / // % ^ ** < <= > >= == != = . [ ] { } : ; ' \" "
    "# @ ! ~ & | \\ 1e9 0x1f ١ １ 9^4096 2^-4096"
).split()
ENV = {"p": QQ(18, 37), "q": QQ(19, 37), "x": QQ(-3)}


def assert_one_line(message: str) -> None:
    assert message.strip(), "empty message"
    assert "\n" not in message and "\r" not in message
    assert len(message) <= MAX_LINE_LENGTH


def check_expression(text: str) -> None:
    try:
        value = evaluate(parse(text), ENV)
    except ExpressionError as error:
        assert_one_line(str(error))
    else:
        assert QQ.of_type(value)


token_soup = st.lists(st.sampled_from(TOKENS), max_size=60).flatmap(
    lambda tokens: st.lists(st.sampled_from(["", " ", "  ", "\t"]), min_size=len(tokens), max_size=len(tokens)).map(
        lambda gaps: "".join(gap + token for gap, token in zip(gaps, tokens))
    )
)


@FUZZ
@given(st.text(max_size=300))
def test_random_text_is_evaluated_or_refused_in_one_line(text):
    check_expression(text)


@FUZZ
@given(token_soup)
def test_random_token_soups_are_evaluated_or_refused_in_one_line(text):
    check_expression(text)


@FUZZ
@given(st.sampled_from(["(", "-", "not ", "2^", "abs(", "if 1 then "]), st.integers(1, 1200))
def test_deep_repetitions_are_refused_quickly(opening, count):
    closing = {"(": ")", "abs(": ")", "if 1 then ": " else 0"}.get(opening, "")
    check_expression(opening * count + "1" + closing * count)


# Random ruleset-shaped documents: the format's own keys mixed with junk, at every level.
NAMES = st.sampled_from(["a", "b", "c", "won", "lost", "", " ", "é", "x" * 250, "a.b", "\u202e", "default"])
EXPRESSIONS = st.sampled_from(["1/2", "1/3", "2/3", "1", "0", "-1", "p", "1/0", "2^9999", "0.5", "q", "1 -"])
SCALARS = st.one_of(
    EXPRESSIONS,
    st.integers(-(2**70), 2**70),
    st.floats(allow_nan=True, allow_infinity=True),
    st.booleans(),
    st.text(max_size=20),
    NAMES,
)
JUNK = st.recursive(
    SCALARS,
    lambda inner: st.one_of(st.lists(inner, max_size=4), st.dictionaries(st.text(max_size=8), inner, max_size=4)),
    max_leaves=12,
)
HAND_CONDITIONS = st.sampled_from(
    ["flush(hand)", "most(hand) == 2", "total(hand) > 5", "count(hand, red) > 0", "cards(x) > 1", "left() < 3"]
    + ["straight(drawn)", "count(hand, 1/0)", "most()", "pairs(hand) + left(A)"]
)
OUTCOME = st.dictionaries(
    st.sampled_from(["to", "prob", "pay", "stake", "note", "odd", "when"]),
    st.one_of(NAMES, EXPRESSIONS, SCALARS, HAND_CONDITIONS),
    max_size=5,
)
OUTCOMES = st.one_of(st.lists(OUTCOME, max_size=4), JUNK)
DRAW = st.one_of(
    st.integers(-1, 3),
    st.fixed_dictionaries(
        {},
        optional={
            "hand": st.one_of(st.sampled_from(["hand", "x", "drawn", "1h"]), SCALARS),
            "count": st.one_of(st.integers(-1, 3), SCALARS),
            "take": st.one_of(st.lists(st.sampled_from(["A", "red", "A of spades", "Z"]), max_size=2), SCALARS),
        },
    ),
    JUNK,
)
DECK = st.one_of(
    st.fixed_dictionaries(
        {},
        optional={
            "copies": st.one_of(st.integers(-1, 3), SCALARS),
            "items": st.one_of(
                st.dictionaries(st.sampled_from(["red", "blue", "1x", "__x"]), st.integers(0, 3), max_size=3), JUNK
            ),
            "ranks": st.one_of(st.lists(st.sampled_from(["2", "3", "A", "K", "x y"]), max_size=4), JUNK),
            "suits": st.one_of(st.lists(st.sampled_from(["s", "h", "A"]), max_size=3), JUNK),
            "remove": st.one_of(st.lists(st.sampled_from(["2", "A of s", "Q"]), max_size=2), JUNK),
            "ace": st.one_of(st.sampled_from(["both", "high", "low", "odd"]), SCALARS),
        },
    ),
    JUNK,
)
STATE = st.one_of(
    st.fixed_dictionaries({}, optional={"outcomes": OUTCOMES, "result": st.one_of(NAMES, SCALARS), "draw": DRAW}),
    st.fixed_dictionaries({"choices": st.dictionaries(NAMES, OUTCOMES, max_size=3)}),
    JUNK,
)
TEMPLATES = st.sampled_from(["f-{t}", "f-{t + 1}", "f-{t - 1}", "f-{t}-{u}", "a", "won", "f-{", "f-{t/2}", "f-{x}"])
FAMILY_OUTCOME = st.dictionaries(
    st.sampled_from(["to", "prob", "pay", "when", "each", "note"]),
    st.one_of(TEMPLATES, EXPRESSIONS, st.just({"u": [0, 2]}), st.sampled_from(["t > 0", "t < 3", "u == t"]), SCALARS),
    max_size=5,
)
FAMILY = st.one_of(
    st.fixed_dictionaries(
        {"state": st.one_of(TEMPLATES, SCALARS)},
        optional={
            "index": st.one_of(
                st.dictionaries(
                    st.sampled_from(["t", "u", "p", "if", "1t"]),
                    st.one_of(st.tuples(st.integers(-3, 12), st.integers(-3, 12)).map(list), SCALARS),
                    max_size=2,
                ),
                JUNK,
            ),
            "when": st.one_of(st.sampled_from(["t != 1", "t > 100", "1 -", "t"]), SCALARS),
            "outcomes": st.one_of(st.lists(FAMILY_OUTCOME, max_size=3), JUNK),
            "result": st.one_of(TEMPLATES, SCALARS),
        },
    ),
    JUNK,
)
DOCUMENT = st.fixed_dictionaries(
    {},
    optional={
        "ruleset": st.one_of(
            st.fixed_dictionaries(
                {},
                optional={
                    "title": st.one_of(st.just("t"), SCALARS),
                    "start": st.one_of(NAMES, SCALARS),
                    "stake": st.one_of(EXPRESSIONS, SCALARS),
                    "version": st.one_of(st.just(1), SCALARS),
                },
            ),
            JUNK,
        ),
        "params": st.one_of(st.dictionaries(st.sampled_from(["p", "q", "r", "1x", "__x", "if"]), SCALARS), JUNK),
        "states": st.one_of(st.dictionaries(NAMES, STATE, max_size=5), JUNK),
        "strategies": st.one_of(st.dictionaries(NAMES, st.dictionaries(NAMES, NAMES, max_size=3)), JUNK),
        "families": st.one_of(st.dictionaries(st.sampled_from(["f", "g", ""]), FAMILY, max_size=2), JUNK),
        "session": JUNK,
        "deck": DECK,
        "extra": JUNK,
    },
)


def check_ruleset_text(text: str) -> None:
    result = read_ruleset_text(text, "fuzz.toml")
    for problem in result.problems:
        assert_one_line(str(problem))
        assert str(problem).startswith("fuzz.toml: ")
    assert (result.ruleset is None) == bool(result.errors)
    if result.ruleset is None:
        event("refused with problems")
    else:
        try:
            figures = solve_round(build_round_chain(result.ruleset))
        except OddsbenchError as error:
            event("valid, but the chain was refused")
            assert_one_line(str(error))
        else:
            event("valid and solved")
            assert sum(figure.exact for figure in figures.end_probability.values()) == 1


def toml_text(document: dict) -> str:
    try:
        return tomlkit.dumps(document)
    except Exception:  # a structure TOML cannot hold (say, a list mixing tables and numbers)
        assume(False)
        raise


@FUZZ
@given(DOCUMENT)
def test_random_ruleset_structures_are_read_or_refused_in_one_line(document):
    check_ruleset_text(toml_text(document))


@FUZZ
@given(st.text(max_size=400))
def test_random_text_as_a_ruleset_is_refused_in_one_line(text):
    check_ruleset_text(text)


VALID = """[ruleset]
title = "fuzz"
start = "a"
[params]
p = "18/37"
[states.a]
outcomes = [{ to = "won", prob = "p", pay = 1 }, { to = "b" }]
[states.b]
outcomes = [{ to = "a", prob = "1/2" }, { to = "lost", pay = -1 }]
[states.won]
result = "win"
[states.lost]
result = "loss"
"""


@FUZZ
@given(st.lists(st.tuples(st.integers(0, len(VALID)), st.integers(0, 3), st.text(max_size=3)), max_size=6))
def test_damaged_copies_of_a_valid_ruleset_are_read_or_refused_in_one_line(edits):
    text = VALID
    for position, removed, inserted in edits:
        position = min(position, len(text))
        text = text[:position] + inserted + text[position + removed :]
    check_ruleset_text(text)


def test_the_undamaged_ruleset_is_valid():
    result = read_ruleset_text(VALID, "fuzz.toml")
    assert result.ruleset is not None, result.problems


# Near-valid rulesets: the right shape with random targets, chances, pays and end states, so
# many come out valid and go on through the chain builder and both engines.
SHAPED_OUTCOME = st.fixed_dictionaries(
    {"to": st.sampled_from(["a", "b", "won", "lost", "gone"])},
    optional={
        "prob": st.sampled_from(["1/2", "1/3", "1/6", "18/37", "0", "1", "1 - 1/10^30", "1/10^40"]),
        "pay": st.one_of(st.integers(-5, 35), st.sampled_from(["-1", "35", "1/2", "2^60"])),
        "stake": st.sampled_from([0, 1, "1/2"]),
    },
)
SHAPED = st.fixed_dictionaries(
    {
        "ruleset": st.just({"title": "shaped", "start": "a"}),
        "states": st.fixed_dictionaries(
            {
                "a": st.fixed_dictionaries({"outcomes": st.lists(SHAPED_OUTCOME, min_size=1, max_size=4)}),
                "won": st.just({"result": "win"}),
                "lost": st.just({"result": "loss"}),
            },
            optional={"b": st.fixed_dictionaries({"outcomes": st.lists(SHAPED_OUTCOME, min_size=1, max_size=4)})},
        ),
    }
)


@FUZZ
@given(SHAPED)
def test_near_valid_rulesets_are_solved_or_refused_in_one_line(document):
    check_ruleset_text(toml_text(document))
