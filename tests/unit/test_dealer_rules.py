"""The dealer's drawing rules at twenty-one (infinite deck): final totals per upcard.

Two checks: an independent recursion written here (exact, every row of both rules), and the
widely tabulated infinite-deck figures for "stands on soft 17" at four decimals, recalled from
memory (the tables in Griffin, The Theory of Blackjack, and many others). Only the rows recalled
with confidence are checked against memory: for upcards 3, 4, 5 and 8 the recalled fourth decimals
disagreed with both computations in places, so those rows rest on the independent recursion alone.
"""

from __future__ import annotations

import dataclasses
from functools import cache

import pytest
from conftest import RULESETS

from oddsbench.chain.round_chain import build_round_chain
from oddsbench.model.load import load_ruleset
from oddsbench.model.numbers import QQ
from oddsbench.solve.round import solve_round

CARDS = {value: QQ(4, 13) if value == 10 else QQ(1, 13) for value in range(1, 11)}  # 1 = ace
FINALS = ("stand-17", "stand-18", "stand-19", "stand-20", "stand-21", "blackjack", "bust")
FILES = {"stands": "dealer-stands-soft-17.toml", "hits": "dealer-hits-soft-17.toml"}


def independent_row(upcard: int, hits_soft_17: bool) -> dict[str, QQ]:
    """Final-total chances by recursion over (hard sum, holds an ace, cards dealt)."""

    @cache
    def finish(hard: int, ace: bool, cards: int) -> tuple[tuple[str, QQ], ...]:
        soft = ace and hard + 10 <= 21
        total = hard + 10 if soft else hard
        if cards == 2 and soft and total == 21:
            return (("blackjack", QQ(1)),)
        if hard > 21:
            return (("bust", QQ(1)),)
        if total >= 18 or (total == 17 and not (soft and hits_soft_17)):
            return ((f"stand-{total}", QQ(1)),)
        out: dict[str, QQ] = {}
        for value, chance in CARDS.items():
            for name, p in finish(hard + value, ace or value == 1, cards + 1):
                out[name] = out.get(name, QQ(0)) + chance * p
        return tuple(out.items())

    first = 1 if upcard == 11 else upcard
    row = dict(finish(first, upcard == 11, 1))
    return {name: row.get(name, QQ(0)) for name in FINALS}


@cache
def solved_rows(rule: str) -> dict[int, dict[str, QQ]]:
    ruleset = load_ruleset(RULESETS / FILES[rule])
    rows = {}
    for upcard in range(2, 12):
        figures = solve_round(build_round_chain(dataclasses.replace(ruleset, start=f"up-{upcard}")))
        rows[upcard] = {
            name: figures.end_probability[name].exact if name in figures.end_probability else QQ(0) for name in FINALS
        }
    return rows


@pytest.mark.parametrize("rule", ["stands", "hits"])
@pytest.mark.parametrize("upcard", range(2, 12))
def test_final_totals_match_an_independent_recursion_exactly(rule, upcard):
    assert solved_rows(rule)[upcard] == independent_row(upcard, rule == "hits")


@pytest.mark.parametrize("rule", ["stands", "hits"])
def test_every_upcard_row_sums_to_exactly_one(rule):
    assert all(sum(row.values(), QQ(0)) == 1 for row in solved_rows(rule).values())


# Stands on soft 17, infinite deck: 17, 18, 19, 20, 21, natural, bust, at four decimals
# (widely tabulated, e.g. Griffin, The Theory of Blackjack; values from memory).
PUBLISHED_S17 = {
    2: (0.1398, 0.1349, 0.1297, 0.1240, 0.1180, 0.0, 0.3536),
    6: (0.1654, 0.1063, 0.1063, 0.1017, 0.0972, 0.0, 0.4232),
    7: (0.3686, 0.1378, 0.0786, 0.0786, 0.0741, 0.0, 0.2623),
    9: (0.1200, 0.1200, 0.3508, 0.1200, 0.0608, 0.0, 0.2284),
    10: (0.1114, 0.1114, 0.1114, 0.3422, 0.0345, 0.0769, 0.2121),
    11: (0.1308, 0.1308, 0.1308, 0.1308, 0.0539, 0.3077, 0.1153),
}


@pytest.mark.parametrize("upcard", sorted(PUBLISHED_S17))
def test_stands_soft_17_rows_match_the_published_table_at_four_decimals(upcard):
    row = solved_rows("stands")[upcard]
    shown = tuple(round(float(row[name]), 4) for name in FINALS)
    assert shown == PUBLISHED_S17[upcard]


def test_hitting_soft_17_changes_nothing_for_upcards_7_to_10():
    # Soft 17 is an ace with other cards summing to 6: an upcard of 7 or more already exceeds that,
    # so the rule never comes into play (hand-worked).
    assert all(solved_rows("stands")[c] == solved_rows("hits")[c] for c in (7, 8, 9, 10))


def test_a_natural_comes_with_chance_4_of_13_under_an_ace():
    # Infinite deck: the hole card is ten-valued with chance 4/13 (common practice, no source).
    assert solved_rows("stands")[11]["blackjack"] == QQ(4, 13)
