"""Properties of the return table on random small rounds that pay at several steps (hypothesis).

The net law comes from the chain over (state, pay so far); the round solver's moments come from
first-step analysis on the round chain. Two different computations, so each checks the other.
"""

from __future__ import annotations

from hypothesis import given, settings
from hypothesis import strategies as st

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round


@st.composite
def paying_rounds(draw):
    """Ruleset text: transient states t0..tn-1 moving only forward (so the pay so far stays bounded), with
    pays on any step, extra stakes, pushes, and several ways into the same end state."""
    transient = draw(st.integers(1, 5))
    ends = draw(st.integers(1, 3))
    lines = ['[ruleset]\ntitle = "random"\nstart = "t0"\n']
    for i in range(transient):
        later = [f"t{k}" for k in range(i + 1, transient)] + [f"e{j}" for j in range(ends)]
        count = draw(st.integers(1, 4))
        targets = [draw(st.sampled_from(later)) for _ in range(count)]
        weights = [draw(st.integers(1, 9)) for _ in targets]
        total = sum(weights)
        outcomes = []
        for target, weight in zip(targets, weights):
            pay = draw(st.integers(-4, 6))
            stake = draw(st.integers(0, 1))
            outcomes.append(f'{{ to = "{target}", prob = "{weight}/{total}", pay = {pay}, stake = {stake} }}')
        lines.append(f"[states.t{i}]\noutcomes = [{', '.join(outcomes)}]\n")
    lines += [f"[states.e{j}]\n" for j in range(ends)]
    return "\n".join(lines)


def solved(text: str):
    return solve_round(build_round_chain(load_ruleset_text(text)))


@settings(max_examples=60, deadline=None)
@given(paying_rounds())
def test_contributions_sum_exactly_to_the_expected_net(text):
    figures = solved(text)
    law = figures.return_table.law
    assert sum((v.probability for v in law), QQ(0)) == 1
    assert all(v.contribution == v.net * v.probability for v in law)
    assert sum((v.contribution for v in law), QQ(0)) == figures.figures["expected_net"].exact


@settings(max_examples=60, deadline=None)
@given(paying_rounds())
def test_the_law_has_the_round_solvers_variance(text):
    figures = solved(text)
    law = figures.return_table.law
    mean = sum((v.contribution for v in law), QQ(0))
    second = sum((v.net * v.net * v.probability for v in law), QQ(0))
    assert second - mean * mean == figures.figures["net_variance"].exact


@settings(max_examples=60, deadline=None)
@given(paying_rounds())
def test_hit_push_and_loss_split_the_round_and_the_shares_sum_to_the_net(text):
    figures = solved(text)
    chances = [figures.figures[name].exact for name in ("hit_frequency", "push_probability", "loss_probability")]
    assert sum(chances, QQ(0)) == 1 and all(chance >= 0 for chance in chances)
    shares = figures.return_table.shares
    assert sum((s.contribution for s in shares), QQ(0)) == figures.figures["expected_net"].exact
    assert all(s.contribution == s.taken * s.pay for s in shares)
