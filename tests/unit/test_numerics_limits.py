"""The solver's honesty and limits: it says when floating point is unreliable (underflow,
near-singular systems, stay-probabilities that round to 1) and lets the exact value stand;
it stops at its size limits with the figures that were exceeded; a long solve can be cancelled.

Reference for the walk figures: the gambler's-ruin formulas, W. Feller, An Introduction to
Probability Theory and Its Applications, vol. 1, 3rd ed., ch. XIV, sections 2 and 3 (from memory):
with r = q/p, the chance of reaching N before 0 from z is (r^z - 1)/(r^N - 1), and in a fair
game the expected duration is z (N - z).
"""

from __future__ import annotations

import pytest

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.load import load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.model.ruleset import Outcome, Ruleset, State
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.linear import ExactTooLarge, factor_exact, identity_minus
from oddsbench.solve.round import solve_round


def walk(goal: int, start: int, up: object) -> Ruleset:
    """A +1/-1 walk on bankrolls 0..goal, built directly (past the file size limit)."""
    down = 1 - up
    states = [
        State(
            name=f"b{z}",
            outcomes=(Outcome(f"b{z + 1}", up, QQ(1), QQ(0)), Outcome(f"b{z - 1}", down, QQ(-1), QQ(0))),
        )
        for z in range(1, goal)
    ]
    states += [State(name="b0", result="ruin"), State(name=f"b{goal}", result="goal")]
    return Ruleset(title="walk", start=f"b{start}", stake=QQ(1), states=tuple(states))


def test_a_chance_below_the_float_range_is_exact_and_the_underflow_is_noted():
    up = QQ(1, 10)
    figures = solve_round(build_round_chain(walk(400, 1, up)))
    r = (1 - up) / up
    expected = (r - 1) / (r**400 - 1)  # Feller XIV.2, about 8.9e-382
    goal = figures.end_probability["b400"]
    assert goal.exact == expected
    assert goal.decimal == 0.0  # below the float range: shown from the exact value by the report
    assert any("end_probability[b400]" in note and "below the floating-point range" in note for note in figures.notes)
    assert any("the exact value stands" in note for note in figures.notes)


def test_a_fair_game_with_a_huge_goal_is_reported_as_near_singular():
    goal, start = 20_000, 10_000
    figures = solve_round(build_round_chain(walk(goal, start, QQ(1, 2))))  # past the exact limit
    assert figures.figures["expected_steps"].exact is None
    expected = start * (goal - start)  # Feller XIV.3
    assert figures.figures["expected_steps"].decimal == pytest.approx(expected, rel=1e-4)
    notes = " ".join(figures.notes)
    assert "near-singular system: condition number about" in notes
    assert "no exact values to check" in notes


def test_a_small_fair_game_raises_no_near_singular_note():
    figures = solve_round(build_round_chain(walk(50, 25, QQ(1, 2))))
    assert figures.figures["expected_steps"].exact == 25 * 25  # Feller XIV.3
    assert not any("near-singular" in note for note in figures.notes)


STICKY = """[ruleset]
title = "sticky"
start = "a"
[states.a]
outcomes = [{ to = "a", prob = "1 - 1/10^30" }, { to = "end", pay = 1 }]
[states.end]
"""


def test_a_stay_probability_that_rounds_to_one_falls_back_on_the_exact_values():
    figures = solve_round(build_round_chain(load_ruleset_text(STICKY, "sticky.toml")))
    assert figures.figures["expected_steps"].exact == QQ(10) ** 30  # geometric: 1 / (1/10^30)
    assert figures.figures["expected_steps"].decimal == 1e30
    assert any("float engine cannot solve this chain" in note for note in figures.notes)


def test_a_stay_probability_that_rounds_to_one_without_exact_values_is_one_clear_error():
    chain = build_round_chain(load_ruleset_text(STICKY, "sticky.toml"))
    with pytest.raises(OddsbenchError, match="float engine cannot solve this chain.*raise --exact-limit"):
        solve_round(chain, exact_limit=0)


def test_the_exact_size_limit_stops_exact_arithmetic_with_the_figures():
    figures = solve_round(build_round_chain(walk(300, 150, QQ(18, 37))), exact_bits=10_000)
    assert figures.figures["house_edge"].exact is None
    (note,) = [note for note in figures.notes if note.startswith("exact arithmetic stopped")]
    assert "bits at state" in note and "over the exact size limit of 10,000 bits" in note
    assert "--exact-bits" in note


def test_the_factorisation_raises_too_large_before_finishing():
    rows = identity_minus(build_round_chain(walk(300, 150, QQ(18, 37))).q_rows())
    with pytest.raises(ExactTooLarge, match=r"at state [0-9,]+ of 299"):
        factor_exact(rows, max_bits=5_000)


def test_the_state_limit_names_the_count_and_the_limit():
    with pytest.raises(OddsbenchError, match="has 1,001 states, over the state limit of 1,000"):
        build_round_chain(walk(1_000, 500, QQ(1, 2)), max_states=1_000)


def test_a_long_exact_solve_is_cancelled_at_the_check_that_asks():
    chain = build_round_chain(walk(4_000, 2_000, QQ(18, 37)))
    calls = []

    def should_stop() -> bool:
        calls.append(True)
        return len(calls) > 1

    with pytest.raises(SolveCancelled):
        solve_round(chain, exact_limit=10_000, should_stop=should_stop)
    assert len(calls) == 2  # checked every 64 rows: stopped at the second check


def test_the_factorisation_asks_whether_to_stop_every_64_rows():
    # How prompt a cancel is, in work rather than seconds (the time is a benchmark:
    # tests/benchmarks/bench_cancellation.py): rows 0, 64, ..., 960 of 999 ask (a walk's rows
    # are too light for the every-4,096-operations check to add any).
    rows = identity_minus(build_round_chain(walk(1_000, 500, QQ(18, 37))).q_rows())
    asked = []
    factor_exact(rows, should_stop=lambda: asked.append(len(asked)) or False)
    assert len(rows) == 999 and len(asked) == 16


def test_a_long_step_by_step_run_is_cancelled():
    chain = build_round_chain(walk(20, 10, QQ(1, 2)))
    stop_after = iter(range(3, -1, -1))
    with pytest.raises(SolveCancelled):
        solve_round(chain, rounds=10_000_000, should_stop=lambda: next(stop_after, 0) == 0)
