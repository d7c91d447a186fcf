"""The return table reuses the exact round's expected visits where the chain over (state, pay so far)
is the round chain itself, and gives the same table as its own solve on that chain.

Checked on the bundled rulesets (pass line, Pig turn, lantern dice: some reach a state with one pay
so far, Pig's turn with many) and on a +1/-1 walk, whose net law is the classical ruin chances:
reaching +2 before -2 from 0 with p = 18/37 has chance p^2 / (p^2 + q^2) (Feller vol. I ch. XIV
sec. 2, the ruin formula with a = 4, z = 2).
"""

from __future__ import annotations

import pytest
from conftest import RULESETS

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset, load_ruleset_text
from oddsbench.model.numbers import QQ
from oddsbench.solve.linear import factor_exact, identity_minus
from oddsbench.solve.return_table import return_table
from oddsbench.solve.round import solve_round
from oddsbench.strategy.compare import policy_of

WALK = """[ruleset]
title = "walk"
start = "s0"
[states.s0]
outcomes = [{ to = "s1", prob = "18/37", pay = 1 }, { to = "m1", prob = "19/37", pay = -1 }]
[states.s1]
outcomes = [{ to = "won", prob = "18/37", pay = 1 }, { to = "s0", prob = "19/37", pay = -1 }]
[states.m1]
outcomes = [{ to = "s0", prob = "18/37", pay = 1 }, { to = "lost", prob = "19/37", pay = -1 }]
[states.won]
result = "win"
[states.lost]
result = "loss"
"""


def visits_of(chain):
    unit = [QQ(0)] * chain.transient_count
    unit[0] = QQ(1)
    return factor_exact(identity_minus(chain.q_rows()), "integer").solve_transposed_scaled(unit)


@pytest.mark.parametrize(
    ("name", "strategy"), [("pass-line.toml", None), ("pig-turn.toml", "hold-at-20"), ("lantern-dice.toml", None)]
)
def test_the_table_from_the_rounds_visits_is_the_table_from_its_own_solve(name, strategy):
    ruleset = load_ruleset(RULESETS / name)
    chain = build_round_chain(ruleset, policy_of(ruleset, strategy))
    alone = return_table(chain, 3_000)
    reused = return_table(chain, 3_000, chain_visits=visits_of(chain))
    assert alone == reused


def test_a_walks_net_law_is_the_ruin_chance_and_the_round_lists_it():
    chain = build_round_chain(load_ruleset_text(WALK, "walk.toml"))
    p, q = QQ(18, 37), QQ(19, 37)
    win = p**2 / (p**2 + q**2)
    table = solve_round(chain).return_table
    assert {value.net: value.probability for value in table.law} == {QQ(2): win, QQ(-2): 1 - win}
    assert table == return_table(chain, 3_000)


def test_with_the_rounds_visits_the_walks_table_needs_no_solve_of_its_own(monkeypatch):
    chain = build_round_chain(load_ruleset_text(WALK, "walk.toml"))
    visits = visits_of(chain)
    expected = return_table(chain, 3_000)

    def no_solve(*args, **kwargs):
        raise AssertionError("the chain over (state, pay so far) is the round chain: no solve needed")

    monkeypatch.setattr("oddsbench.solve.round_distribution.factor_exact", no_solve)
    assert return_table(chain, 3_000, chain_visits=visits) == expected
