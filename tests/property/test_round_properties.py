"""Properties of the round solver on random small chains (hypothesis)."""

from __future__ import annotations

import math

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset_text
from oddsbench.model.numbers import QQ, to_float
from oddsbench.solve.linear import factor_exact, identity_minus
from oddsbench.solve.round import _decimal_moments, solve_round


@st.composite
def random_chains(draw):
    """Ruleset text for a random chain of transient states t0..tn-1 and end states e0..em-1.

    Every transient state gets at least one outcome into an end state with positive weight, so
    the round always ends.
    """
    transient = draw(st.integers(1, 6))
    ends = draw(st.integers(1, 3))
    names = [f"t{i}" for i in range(transient)] + [f"e{j}" for j in range(ends)]
    lines = ['[ruleset]\ntitle = "random"\nstart = "t0"\n']
    for i in range(transient):
        count = draw(st.integers(1, 4))
        targets = [draw(st.sampled_from(names)) for _ in range(count)]
        targets.append(f"e{draw(st.integers(0, ends - 1))}")
        weights = [draw(st.integers(0, 9)) for _ in targets[:-1]] + [draw(st.integers(1, 9))]
        total = sum(weights)
        outcomes = []
        for target, weight in zip(targets, weights):
            pay = draw(st.integers(-5, 5))
            stake = draw(st.integers(0, 2))
            outcomes.append(f'{{ to = "{target}", prob = "{weight}/{total}", pay = {pay}, stake = {stake} }}')
        lines.append(f"[states.t{i}]\noutcomes = [{', '.join(outcomes)}]\n")
    for j in range(ends):
        lines.append(f"[states.e{j}]\n")
    return "\n".join(lines)


def close(a: float, b: float) -> bool:
    return math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)


@settings(max_examples=60, deadline=None)
@given(random_chains())
def test_exact_and_decimal_engines_agree(text):
    chain = build_round_chain(load_ruleset_text(text))
    figures = solve_round(chain)
    decimal = _decimal_moments(chain)
    assert close(decimal.net, to_float(figures.figures["expected_net"].exact))
    assert close(decimal.steps, to_float(figures.figures["expected_steps"].exact))
    assert not [note for note in figures.notes if note.startswith("numerical warning")]


@settings(max_examples=60, deadline=None)
@given(random_chains())
def test_end_probabilities_sum_to_one_exactly(text):
    figures = solve_round(build_round_chain(load_ruleset_text(text)))
    assert sum((f.exact for f in figures.end_probability.values()), QQ(0)) == 1


@settings(max_examples=40, deadline=None)
@given(random_chains())
def test_variances_are_never_negative(text):
    figures = solve_round(build_round_chain(load_ruleset_text(text)))
    assert figures.figures["net_variance"].exact >= 0
    assert figures.figures["steps_variance"].exact >= 0


@settings(max_examples=40, deadline=None)
@given(st.integers(1, 6), st.lists(st.integers(-3, 3), min_size=1, max_size=6))
def test_omitted_prob_equals_the_explicit_uniform_chain(count, pays):
    pays = (pays * count)[:count]
    targets = [f"e{i}" for i in range(count)]
    omitted = ", ".join(f'{{ to = "{t}", pay = {p} }}' for t, p in zip(targets, pays))
    explicit = ", ".join(f'{{ to = "{t}", prob = "1/{count}", pay = {p} }}' for t, p in zip(targets, pays))
    ends = "\n".join(f"[states.{t}]" for t in targets)
    head = '[ruleset]\ntitle = "u"\nstart = "s"\n'
    a = solve_round(build_round_chain(load_ruleset_text(f"{head}[states.s]\noutcomes = [{omitted}]\n{ends}")))
    b = solve_round(build_round_chain(load_ruleset_text(f"{head}[states.s]\noutcomes = [{explicit}]\n{ends}")))
    assert a.figures == b.figures
    assert a.end_probability == b.end_probability


@settings(max_examples=40, deadline=None)
@given(random_chains())
def test_sparse_lu_matches_sympy_fraction_free_solve(text):
    # The same system by two exact methods: our sparse LU and sympy's solve_den over ZZ.
    chain = build_round_chain(load_ruleset_text(text))
    rows = identity_minus(chain.q_rows())
    rhs = [QQ(1)] * chain.transient_count
    assert factor_exact(rows).solve(rhs) == factor_exact(rows, method="fraction-free").solve(rhs)
