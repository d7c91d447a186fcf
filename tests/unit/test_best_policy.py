"""Policy iteration and its certificate, against backward induction and hand-made games."""

from __future__ import annotations

import pytest
from conftest import RULESETS

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.load import load_ruleset, load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.strategy.best_policy import best_policy, check_strategy
from oddsbench.strategy.compare import compare_strategies


@pytest.fixture(scope="module")
def ladder():
    return load_ruleset(RULESETS / "lamplighter-ladder.toml")


def ladder_by_backward_induction(reward_of_collect, reward_of_slip) -> QQ:
    """The ladder only goes up, so the best value is a max over actions from the top rung down."""
    top = 8
    value = {top: reward_of_collect(top)}
    for k in range(top - 1, -1, -1):
        climb = QQ(11 - k, 13)
        leap = QQ((11 - k) * (10 - k), 169) + QQ(1, 26)
        options = [climb * value[k + 1] + (1 - climb) * reward_of_slip]
        if k + 2 <= top:
            options.append(leap * value[k + 2] + (1 - leap) * reward_of_slip)
        if k >= 1:
            options.append(reward_of_collect(k))
        value[k] = max(options)
    return value[0]


def prize(k: int) -> QQ:
    return QQ(k * k, 8) + QQ(k, 4)


def test_max_return_equals_backward_induction(ladder):
    expected = ladder_by_backward_induction(lambda k: prize(k) - 1, QQ(-1))
    best = best_policy(ladder, "max-return")
    assert best.value.exact == expected == QQ(-4501, 114244)
    assert best.certified


def test_max_win_equals_backward_induction(ladder):
    expected = ladder_by_backward_induction(lambda k: QQ(1) if prize(k) > 1 else QQ(0), QQ(0))
    assert best_policy(ladder, "max-win").value.exact == expected


def test_min_loss_equals_backward_induction(ladder):
    expected = -ladder_by_backward_induction(lambda k: QQ(-1) if prize(k) < 1 else QQ(0), QQ(-1))
    assert best_policy(ladder, "min-loss").value.exact == expected


def test_best_beats_or_equals_every_named_strategy(ladder):
    best = best_policy(ladder, "max-return").value.exact
    comparison = compare_strategies(ladder)
    assert all(f.figures["expected_net"].exact <= best for f in comparison.figures)


def test_suboptimal_strategy_is_reported_improvable_with_state_and_better_action(ladder):
    check = check_strategy(ladder, "first-win", "max-return")
    assert not check.optimal
    first = check.improvements[0]
    assert (first.state, first.action, first.better) == ("rung-0", "climb", "leap")
    assert first.gain.exact > 0 and first.reached


def test_improvement_gain_is_the_one_step_change(ladder):
    # Under first-win, rung-0 climbs: V(0) = (11/13) V(1); leaping instead gives leap(0) V(2) + ...
    check = check_strategy(ladder, "first-win", "max-return")
    gain = next(i.gain.exact for i in check.improvements if i.state == "rung-0")
    assert gain == QQ(135, 2704)


def test_check_of_an_unknown_strategy_names_the_known_ones(ladder):
    with pytest.raises(OddsbenchError, match="unknown strategy 'nope' .known: first-win"):
        check_strategy(ladder, "nope")


LOOP = """
[ruleset]
title = "loop"
start = "s"
[states.s.choices]
again = [{ to = "s", pay = 1 }]
stop = [{ to = "end" }]
[states.end]
"""


def test_goal_that_grows_for_ever_is_refused():
    with pytest.raises(OddsbenchError, match="no best play that ends the round"):
        best_policy(load_ruleset_text(LOOP), "max-return")


def test_zero_gain_loop_is_never_chosen_so_the_round_ends():
    best = best_policy(load_ruleset_text(LOOP.replace("pay = 1", "pay = 0")), "max-return")
    assert dict(best.policy) == {"s": "stop"} and best.certified


TIED = """
[ruleset]
title = "tied"
start = "s"
[states.s.choices]
left = [{ to = "a", prob = "1/2", pay = 2 }, { to = "a", prob = "1/2", pay = 0 }]
right = [{ to = "a", pay = 1 }]
[states.a]
"""


@pytest.mark.parametrize(("first", "second"), [("left", "right"), ("right", "left")])
def test_ties_go_to_the_action_listed_first(first, second):
    left, right = TIED.splitlines()[5:7]
    text = TIED if first == "left" else TIED.replace(left + "\n" + right, right + "\n" + left)
    ruleset = load_ruleset_text(text)
    best = best_policy(ruleset, "max-return")
    listed_first = ruleset.state("s").actions[0]
    assert listed_first == first
    assert dict(best.policy)["s"] == listed_first
    assert best.certificate.ties[0].equally_good == (ruleset.state("s").actions[1],)


def test_min_steps_prefers_the_short_way(ladder):
    # Hand-worked: leap from the foot (holds with chance 110/169 + 1/26 = 233/338), then collect:
    # 1 + 233/338 = 571/338 steps, fewer than climbing first (1 + 11/13).
    best = best_policy(ladder, "min-steps")
    assert dict(best.policy)["rung-0"] == "leap" and dict(best.policy)["rung-2"] == "collect"
    assert best.value.exact == QQ(571, 338)


def test_above_the_exact_limit_the_decimal_answer_is_not_certified(ladder):
    exact = best_policy(ladder, "max-return")
    decimal = best_policy(ladder, "max-return", exact_limit=0)
    assert decimal.value.exact is None and not decimal.certified
    assert abs(decimal.value.decimal - exact.value.decimal) < 1e-12
    assert dict(decimal.policy) == dict(exact.policy)
    assert any("exact limit" in note for note in decimal.notes)


def test_file_without_decisions_has_nothing_to_choose():
    best = best_policy(load_ruleset(RULESETS / "pass-line.toml"))
    assert best.policy == () and best.value.exact == QQ(-7, 495) and best.certified


def test_goal_whose_result_never_occurs_says_so():
    best = best_policy(load_ruleset_text(TIED), "max-win")
    assert best.value.exact == 0
    assert any('no end state has result "win"' in note for note in best.notes)


def test_best_carries_every_round_figure_under_its_play(ladder):
    best = best_policy(ladder, "max-win")
    assert best.figures.result_probability["win"].exact == best.value.exact
    # The play that wins most often returns no more than the play that returns most.
    assert best.figures.figures["expected_net"].exact <= best_policy(ladder, "max-return").value.exact
