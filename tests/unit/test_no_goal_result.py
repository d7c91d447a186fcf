"""The one builder of no-goal results: every walk kind, no placeholder values, a reason for each absence."""

from __future__ import annotations

import pytest

from oddsbench.model.numbers import QQ
from oddsbench.solve.ruin import (
    BOUNDED_JUMPS,
    CUT_BETS,
    PROGRESSION,
    RoundsToRuin,
    solve_cut_bet_ruin,
    solve_no_goal_ruin,
)
from oddsbench.solve.ruin.balls import certified_exact
from oddsbench.solve.ruin.result import EXPLANATIONS, OPTIONAL_FIGURES, WalkFacts, no_goal_ruin
from oddsbench.strategy.no_goal_play import solve_no_goal_progression

EVEN = ((-1, QQ(1, 2)), (1, QQ(1, 2)))
FACTS = WalkFacts(BOUNDED_JUMPS, 3, EVEN, 1, 3, QQ(0), QQ(1), 1)
PRESENT = ("variance", "ruin_exact", "ruin_closed_form")  # what a settled fair walk has


def reasons(**changes) -> dict[str, str]:
    """A reason for every figure a settled fair walk lacks, then ``changes`` (None drops one)."""
    absent = {name: "does not apply" for name in OPTIONAL_FIGURES if name not in PRESENT} | changes
    return {name: reason for name, reason in absent.items() if reason is not None}


def build(**changes):
    fields = dict(
        verdict="certain",
        reason="fair",
        ruin=certified_exact(QQ(1)),
        ruin_exact=QQ(1),
        closed_form=QQ(1),
        exact_text="1",
        method="m",
        error_bound="none: exact",
        rounds_to_ruin=RoundsToRuin("infinite", None, None, None, None, "fair"),
        notes=(),
        digits=10,
        absent=reasons(),
    )
    fields.update(changes)
    return no_goal_ruin(FACTS, **fields)


def test_a_complete_result_is_built_and_says_why_each_figure_is_absent():
    result = build()
    assert result.why_absent("lundberg") == "does not apply" and result.why_absent("ruin_exact") == ""


def test_a_figure_left_out_without_a_reason_is_refused():
    with pytest.raises(ValueError, match="'truncation' is missing without a reason"):
        build(absent=reasons(truncation=None))


def test_a_reason_given_for_a_present_figure_is_refused():
    with pytest.raises(ValueError, match="'ruin_exact' is given with a reason"):
        build(absent=reasons(ruin_exact="n/a"))


def test_a_figure_without_the_explanation_shown_beside_it_is_refused():
    with pytest.raises(ValueError, match="'lundberg_text' must be given exactly when 'lundberg' is"):
        build(absent=reasons(lundberg=None), lundberg=certified_exact(QQ(1, 2)))


def _walks():
    """One result of each walk kind and verdict the engines produce."""
    p, q = QQ(3, 5), QQ(2, 5)
    return {
        "never": solve_no_goal_ruin({0: QQ(1, 2), 1: QQ(1, 2)}, 3),
        "certain": solve_no_goal_ruin({1: QQ(18, 37), -1: QQ(19, 37)}, 5),
        "skip-free, rational theta": solve_no_goal_ruin({1: p, -1: q}, 5),
        "skip-free, irrational theta": solve_no_goal_ruin({-1: QQ(2, 5), 1: QQ(2, 5), 2: QQ(1, 5)}, 3),
        "losses of two steps": solve_no_goal_ruin({-2: QQ(1, 5), -1: QQ(1, 10), 1: QQ(3, 5), 2: QQ(1, 10)}, 7),
        "no check asked": solve_no_goal_ruin({1: p, -1: q}, 5, check=False),
        "cut bets": solve_cut_bet_ruin({2: p, -2: q}, [{1: p, -1: q}], 5),
        "cut bets, certain": solve_cut_bet_ruin({2: QQ(9, 19), -2: QQ(10, 19)}, [{1: QQ(9, 19), -1: QQ(10, 19)}], 5),
        "progression, certain": solve_no_goal_progression(
            [(QQ(1), QQ(18, 37)), (QQ(-1), QQ(19, 37))], "martingale", 1, 3, 10
        ).ruin,
        "progression, possible": solve_no_goal_progression([(QQ(1), p), (QQ(-1), q)], "martingale", 1, 3, 6).ruin,
    }


@pytest.mark.parametrize("name", list(_walks()))
def test_every_walk_kind_leaves_no_figure_out_without_a_reason(name):
    result = _walks()[name]
    for figure in OPTIONAL_FIGURES:
        if getattr(result, figure) is None:
            assert result.why_absent(figure), f"{name}: {figure} is None with no reason"
        else:
            assert result.why_absent(figure) == "", f"{name}: {figure} is present yet has a reason"
        for explanation in EXPLANATIONS.get(figure, ()):
            assert (getattr(result, explanation) is None) == (getattr(result, figure) is None)


def test_the_walk_kind_is_named_and_a_progression_has_no_single_variance():
    walks = _walks()
    assert walks["certain"].kind == BOUNDED_JUMPS and walks["cut bets"].kind == CUT_BETS
    progression = walks["progression, possible"]
    assert progression.kind == PROGRESSION and progression.variance is None
    assert "series" in progression.why_absent("variance")
    assert progression.why_absent("diffusion") == "not given for progressions"
    assert progression.theta is None and progression.lundberg is not None and progression.truncation is None
