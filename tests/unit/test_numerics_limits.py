"""The solver's honesty and limits: it says when floating point is unreliable (underflow,
near-singular systems, stay-probabilities that round to 1) and lets the exact value stand;
it stops at its size limits with the figures that were exceeded; a long solve can be cancelled.

Reference for the walk figures: the gambler's-ruin formulas, W. Feller, An Introduction to
Probability Theory and Its Applications, vol. 1, 3rd ed., ch. XIV, sections 2 and 3 (from memory):
with r = q/p, the chance of reaching N before 0 from z is (r^z - 1)/(r^N - 1), and in a fair
game the expected duration is z (N - z).
"""

from __future__ import annotations

import os

import pytest

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.load import load_ruleset_text
from oddsbench.model.numbers import QQ, to_float
from oddsbench.model.ruleset import Outcome, Ruleset, State
from oddsbench.solve.cancel import SolveCancelled
from oddsbench.solve.linear import ExactTooLarge, costs, factor_exact, identity_minus
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


def test_a_stay_probability_that_rounds_to_one_is_solved_from_the_exact_chance_of_leaving():
    # 1 - (1 - 10^-30) is 0 in floats; the diagonal of I - Q is the exact 10^-30, rounded once
    figures = solve_round(build_round_chain(load_ruleset_text(STICKY, "sticky.toml")), exact_limit=0)
    assert figures.figures["expected_steps"].decimal == pytest.approx(1e30, rel=1e-15)  # geometric: 1 / 10^-30
    assert not any("float engine cannot solve this chain" in note for note in figures.notes)


def test_a_chance_of_leaving_below_the_float_range_without_exact_values_is_one_clear_error():
    sticky = STICKY.replace("1/10^30", "1/10^400")  # the chance of leaving is 0 in floats
    chain = build_round_chain(load_ruleset_text(sticky, "sticky.toml"))
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


def test_the_factorisation_asks_whether_to_stop_every_64_rows(monkeypatch):
    # How prompt a cancel is, in work rather than seconds (the time is a benchmark:
    # tests/benchmarks/bench_cancellation.py): rows 0, 64, ..., 960 of 999 ask (a walk's rows
    # are too light for the every-4,096-operations check to add any). Rows between ask too once
    # costs.POLL_SECONDS has passed (tests/unit/test_exact_solve_cancel.py); never here.
    monkeypatch.setattr(costs, "POLL_SECONDS", 3600.0)
    rows = identity_minus(build_round_chain(walk(1_000, 500, QQ(18, 37))).q_rows())
    asked = []
    factor_exact(rows, should_stop=lambda: asked.append(len(asked)) or False)
    assert len(rows) == 999 and len(asked) == 16


def test_a_long_step_by_step_run_is_cancelled():
    chain = build_round_chain(walk(20, 10, QQ(1, 2)))
    stop_after = iter(range(3, -1, -1))
    with pytest.raises(SolveCancelled):
        solve_round(chain, rounds=10_000_000, should_stop=lambda: next(stop_after, 0) == 0)


# Issue 16, "decimals that are wrong without a word": each break, decimals only (exact_limit=0).


def test_a_variance_below_what_floats_resolve_is_shown_with_one_digit_and_a_note():
    # Net is +-2,000 and the goal chance about 1.1e-47 (Feller XIV.2), so the variance is about
    # 4000^2 x 1.1e-47 = 1.75e-40; E[X^2] - E[X]^2 gave 6.74e-06 here without a word.
    exact = solve_round(build_round_chain(walk(400, 200, QQ(18, 37))))
    decimal = solve_round(build_round_chain(walk(4_000, 2_000, QQ(18, 37))), exact_limit=0)
    assert exact.figures["net_variance"].decimal == pytest.approx(
        to_float(exact.figures["net_variance"].exact), rel=1e-9
    )
    variance = decimal.figures["net_variance"]
    assert variance.digits == 1 and abs(variance.decimal) < 1e-17
    assert any(
        note.startswith("net_variance:") and "below what the float engine resolves" in note for note in decimal.notes
    )


@pytest.mark.skipif(not os.environ.get("ODDSBENCH_ATTACKS"), reason="full size on demand: ODDSBENCH_ATTACKS=1")
def test_a_variance_of_a_100_000_state_walk_is_not_cancellation_debris():
    # E[X^2] - E[X]^2 gave 0.101 here where the truth is about 100,000^2 x (18/19)^50,000, 1e-1164 (Feller XIV.2)
    figures = solve_round(build_round_chain(walk(100_000, 50_000, QQ(18, 37))), exact_limit=0)
    variance = figures.figures["net_variance"]
    assert variance.digits == 1 and abs(variance.decimal) < 1e-12
    assert any(
        note.startswith("net_variance:") and "below what the float engine resolves" in note for note in figures.notes
    )


def test_a_variance_of_a_small_walk_in_floats_is_centred_and_right():
    # 40 states, goal chance (r^20 - 1)/(r^40 - 1) with r = 19/18: floats agree with the exact value
    exact = solve_round(build_round_chain(walk(40, 20, QQ(18, 37))))
    decimal = solve_round(build_round_chain(walk(40, 20, QQ(18, 37))), exact_limit=0)
    for name in ("net_variance", "steps_variance"):
        truth = to_float(exact.figures[name].exact)
        assert decimal.figures[name].decimal == pytest.approx(truth, rel=1e-10), name
        assert decimal.figures[name].digits is None


def test_a_stay_chance_a_few_ulps_below_one_keeps_every_figure():
    # Stay 1 - 3e-16: leaving wins 1 w.p. 1/3 and loses 1 w.p. 2/3, so the house edge is exactly
    # 1/3 and the end chances are 1/3 and 2/3 (standard geometric trials). Taking 1 - q_aa in
    # floats gave 0.30024 and end chances summing to 0.90; the chance of leaving is taken whole.
    text = """[ruleset]
title = "sticky few ulps"
start = "a"
[states.a]
outcomes = [
  { to = "a", prob = "1 - 3/10^16" },
  { to = "won", prob = "1/10^16", pay = 1 },
  { to = "lost", prob = "2/10^16", pay = -1 },
]
[states.won]
[states.lost]
"""
    figures = solve_round(build_round_chain(load_ruleset_text(text, "few-ulps.toml")), exact_limit=0)
    assert figures.figures["house_edge"].decimal == pytest.approx(1 / 3, rel=1e-15)
    ends = figures.end_probability
    assert ends["won"].decimal == pytest.approx(1 / 3, rel=1e-15)
    assert ends["lost"].decimal == pytest.approx(2 / 3, rel=1e-15)
    assert ends["won"].decimal + ends["lost"].decimal == pytest.approx(1.0, rel=1e-15)
    assert figures.figures["expected_steps"].decimal == pytest.approx(1e16 / 3, rel=1e-15)
