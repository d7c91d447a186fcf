"""Families of states: expansion, conditions, limits, errors that name the family and index."""

from __future__ import annotations

import pytest
from conftest import RULESETS, solve_text

from oddsbench.model.families import MAX_FAMILY_STATES
from oddsbench.model.load import read_ruleset_text
from oddsbench.model.numbers import QQ

WALK = """
[ruleset]
title = "walk"
start = "at-1"

[params]
top = 4

[families.at]
state = "at-{i}"
index = { i = [1, "top - 1"] }
outcomes = [
  { to = "at-{i + 1}", prob = "1/2", when = "i + 1 < top" },
  { to = "home", prob = "1/2", when = "i + 1 == top", pay = 1 },
  { to = "at-{i - 1}", prob = "1/2", when = "i > 1" },
  { to = "broke", prob = "1/2", when = "i == 1", pay = -1 },
]

[states.home]
result = "win"

[states.broke]
result = "loss"
"""


def problems_of(text: str) -> list[str]:
    return [str(problem) for problem in read_ruleset_text(text, "test.toml").problems]


def test_family_expands_to_one_state_per_index_value():
    ruleset = read_ruleset_text(WALK, "test.toml").ruleset
    assert [name for name in ruleset.state_names if name.startswith("at-")] == ["at-1", "at-2", "at-3"]


def test_family_walk_matches_the_gamblers_ruin_chance():
    # Fair walk from 1 with absorbing barriers 0 and 4: P(reach 4) = 1/4 (Feller, Vol. I, ch. XIV, from memory).
    figures = solve_text(WALK)
    assert figures.result_probability["win"].exact == QQ(1, 4)


def test_conditions_choose_which_outcomes_exist():
    state = read_ruleset_text(WALK, "test.toml").ruleset.state("at-1")
    assert sorted(outcome.to for outcome in state.outcomes) == ["at-2", "broke"]


def test_family_when_leaves_out_members():
    text = WALK.replace('index = { i = [1, "top - 1"] }', 'index = { i = [1, "top - 1"] }\nwhen = "i != 2"')
    names = read_ruleset_text(text, "test.toml").problems
    assert any("unknown state 'at-2'" in str(problem) for problem in names)


def test_each_let_and_cases_expand_inside_one_outcome():
    text = """
[ruleset]
title = "die"
start = "roll"
[states.roll]
outcomes = [
  { each = { f = [1, 6] }, let = { big = "f >= 5" }, prob = "1/6",
    to = [{ when = "big", to = "high" }, { to = "low" }], pay = "if big then f else 0" },
]
[states.high]
[states.low]
"""
    figures = solve_text(text.replace("\n    to", " to"))
    assert figures.end_probability["high"].exact == QQ(1, 3)
    assert figures.figures["expected_net"].exact == QQ(11, 6)


def test_error_names_the_family_and_the_index_values():
    text = WALK.replace(
        '{ to = "at-{i + 1}", prob = "1/2"', '{ to = "at-{i + 1}", prob = "1/(2 * (i - 2) + 2 * (i - 2))"'
    )
    messages = problems_of(text)
    assert any("family 'at' at i=2" in m and "division by zero" in m for m in messages), messages


def test_placeholder_must_give_a_whole_number():
    text = WALK.replace('state = "at-{i}"', 'state = "at-{i / 2}"')
    messages = problems_of(text)
    assert any("family 'at' at i=1" in m and "not a whole number" in m for m in messages), messages


def test_expansion_beyond_the_limit_is_refused_before_building():
    text = WALK.replace('index = { i = [1, "top - 1"] }', "index = { i = [1, 1000], j = [1, 1000] }").replace(
        'state = "at-{i}"', 'state = "at-{i}-{j}"'
    )
    messages = problems_of(text)
    assert any(f"more than {MAX_FAMILY_STATES:,} states" in m for m in messages), messages


def test_two_index_values_giving_one_name_are_refused():
    text = WALK.replace('state = "at-{i}"', 'state = "at-{min(i, 2)}"')
    messages = problems_of(text)
    assert any("i=2 and i=3 both give the state name 'at-2'" in m for m in messages), messages


def test_family_state_clashing_with_a_hand_written_one_is_refused():
    text = WALK + '\n[states.at-2]\nresult = "win"\n'
    assert any("defined twice" in m and "family 'at'" in m for m in problems_of(text))


def test_unknown_index_variable_in_an_expression_is_reported_with_the_family():
    text = WALK.replace("pay = 1 }", 'pay = "j" }')
    messages = problems_of(text)
    assert any("family 'at' at i=3" in m and "unknown parameter 'j'" in m for m in messages), messages


def test_strategy_rules_map_a_family_by_a_condition():
    ruleset = read_ruleset_text((RULESETS / "pig-turn.toml").read_text(), "pig-turn.toml").ruleset
    strategy = ruleset.strategy("hold-at-20")
    actions = {
        ruleset.state(f"turn-{t}").name: strategy.action_for(ruleset.state(f"turn-{t}")) for t in (0, 19, 20, 99)
    }
    assert actions == {"turn-0": "roll", "turn-19": "roll", "turn-20": "hold", "turn-99": "hold"}


def test_hand_written_entry_beats_a_rule():
    text = (
        (RULESETS / "pig-turn.toml")
        .read_text()
        .replace(
            '[strategies.hold-at-10]\ndefault = "roll"', '[strategies.hold-at-10]\ndefault = "roll"\n"turn-12" = "roll"'
        )
    )
    ruleset = read_ruleset_text(text, "pig-turn.toml").ruleset
    strategy = ruleset.strategy("hold-at-10")
    assert strategy.action_for(ruleset.state("turn-12")) == "roll"
    assert strategy.action_for(ruleset.state("turn-13")) == "hold"


def test_rule_naming_an_unknown_family_is_an_error():
    text = (
        (RULESETS / "pig-turn.toml")
        .read_text()
        .replace('family = "turn", when = "t >= 15"', 'family = "tunr", when = "t >= 15"')
    )
    messages = problems_of(text)
    assert any("strategy 'hold-at-15', rule 1, family" in m and "unknown family 'tunr'" in m for m in messages)


@pytest.mark.parametrize("name", ["pig-turn.toml", "dealer-stands-soft-17.toml", "lamplighter-ladder.toml"])
def test_bundled_family_rulesets_are_valid(name):
    result = read_ruleset_text((RULESETS / name).read_text(), name)
    assert result.ruleset is not None, [str(p) for p in result.problems]
    assert result.warnings == ()


def test_sum_errors_in_a_member_name_the_family_and_index():
    text = WALK.replace(
        '{ to = "at-{i - 1}", prob = "1/2", when = "i > 1" }', '{ to = "at-{i - 1}", prob = "1/3", when = "i > 1" }'
    )
    messages = problems_of(text)
    assert (
        "test.toml: state 'at-2' (family 'at' at i=2): probabilities sum to 5/6, not 1 "
        "(the same in 1 more state of family 'at')" in messages
    )


def test_strategy_missing_many_family_states_is_one_line():
    # The rule covers t >= 10; without a default, turn-0 and turn-2 .. turn-9 have no action.
    text = (
        (RULESETS / "pig-turn.toml")
        .read_text()
        .replace('[strategies.hold-at-10]\ndefault = "roll"', "[strategies.hold-at-10]")
    )
    messages = [m for m in problems_of(text) if "hold-at-10" in m]
    assert messages == [
        "test.toml: strategy 'hold-at-10': no action and no default for decision state(s) "
        "'turn-0', 'turn-2', 'turn-3', 'turn-4', 'turn-5', 'turn-6', 'turn-7', 'turn-8' and 1 more"
    ]


def test_strategy_default_not_offered_is_one_line():
    text = (
        (RULESETS / "pig-turn.toml")
        .read_text()
        .replace('[strategies.hold-at-10]\ndefault = "roll"', '[strategies.hold-at-10]\ndefault = "fold"')
    )
    messages = [m for m in problems_of(text) if "hold-at-10" in m]
    assert len(messages) == 1 and "action 'fold' is not offered in state(s) 'turn-0'" in messages[0]


RUIN = """
[ruleset]
title = "ruin"
start = "at-{start}"
[params]
p = "18/37"
top = {top}
[families.at]
state = "at-{{i}}"
index = {{ i = [1, "top - 1"] }}
outcomes = [
  {{ prob = "p", to = [{{ when = "i + 1 == top", to = "reached" }}, {{ to = "at-{{i + 1}}" }}] }},
  {{ prob = "1 - p", to = [{{ when = "i == 1", to = "ruined" }}, {{ to = "at-{{i - 1}}" }}] }},
]
[states.reached]
result = "win"
[states.ruined]
result = "loss"
"""


@pytest.mark.parametrize(("start", "top"), [(1, 2), (5, 10), (20, 60), (37, 50)])
def test_family_walk_matches_the_classical_ruin_formula(start, top):
    # Feller, An Introduction to Probability Theory, Vol. I, ch. XIV.2 (from memory):
    # P(reach top from i) = (1 - r^i) / (1 - r^top) with r = q/p.
    r = QQ(19, 18)
    expected = (1 - r**start) / (1 - r**top)
    figures = solve_text(RUIN.format(start=start, top=top))
    assert figures.result_probability["win"].exact == expected
