"""A family's values obey the same limits as hand-written ones, and a cause repeated in every member is one line."""

from __future__ import annotations

import pytest

from oddsbench.model.load import read_ruleset_text

ENDS = '[states.win]\nresult = "win"\n[states.lose]\nresult = "lose"\n'


def family_game(prob: str, members: int = 2000, to: str = "lose") -> str:
    return (
        '[ruleset]\ntitle = "t"\nstart = "s-0"\n'
        f'[families.s]\nstate = "s-{{i}}"\nindex = {{ i = [0, {members - 1}] }}\n'
        f'outcomes = [ {{ to = "win", prob = "{prob}" }}, {{ to = "{to}" }} ]\n' + ENDS
    )


def plain_game(prob: str) -> str:
    return (
        '[ruleset]\ntitle = "t"\nstart = "s"\n'
        f'[states.s]\noutcomes = [ {{ to = "win", prob = "{prob}" }}, {{ to = "lose" }} ]\n' + ENDS
    )


def errors(text: str) -> list[str]:
    return [str(problem) for problem in read_ruleset_text(text, "f.toml").errors]


@pytest.mark.parametrize("prob", ["1/2 + 1/(10^60 + 7)", "1/2 - 1/3^4000", "(10^59 + 1)/(2*10^59 + 3)"])
def test_a_value_valid_in_a_plain_state_is_valid_in_a_family(prob):
    assert errors(plain_game(prob)) == []
    result = read_ruleset_text(family_game(prob, members=3), "f.toml")
    assert result.errors == ()
    plain = read_ruleset_text(plain_game(prob), "f.toml").ruleset.state("s").outcomes[0].prob
    assert result.ruleset.state("s-2").outcomes[0].prob == plain


@pytest.mark.parametrize(
    ("text", "line"),
    [
        (
            family_game("3/2"),
            "f.toml: state 's-0' (family 's' at i=0), outcome 1, prob \"3/2\": must be between 0 and 1, got 3/2 "
            "(the same in 1,999 more states of family 's')",
        ),
        (
            family_game("1/2", to="nowhere"),
            "f.toml: state 's-0' (family 's' at i=0), outcome 2, to: unknown state 'nowhere' "
            "(the same in 1,999 more states of family 's')",
        ),
    ],
)
def test_a_cause_repeated_in_every_member_is_one_line_with_the_count(text, line):
    assert errors(text) == [line]


def test_causes_that_differ_stay_apart():
    text = family_game("if i == 0 then 3/2 else 5/4", members=5)
    assert len(errors(text)) == 2
    assert "(the same in 3 more states" in errors(text)[1]


def test_a_refused_long_expression_gives_its_reason_within_the_line():
    long = "+".join(["1/7"] * 450) + " + )"
    for text in (family_game(long, members=3), plain_game(long)):
        (line,) = errors(text)
        assert len(line) < 400 and line.endswith("expression has more than 200 operations inside one another")
