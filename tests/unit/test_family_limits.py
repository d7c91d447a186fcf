"""Families cannot hang the reader: every index combination tried counts against a budget,
kept or filtered out, whether the ranges are fixed (refused at once, with the count) or
depend on each other (refused when the budget runs out)."""

from __future__ import annotations

import pytest

from oddsbench.model import family_index
from oddsbench.model.load import read_ruleset_text

HEAD = '[ruleset]\ntitle = "t"\nstart = "end"\n[states.end]\n'


@pytest.fixture
def small_budget(monkeypatch):
    monkeypatch.setattr(family_index, "MAX_FAMILY_COMBINATIONS", 1_000)


def errors(text: str) -> list[str]:
    return [str(problem) for problem in read_ruleset_text(text, "f.toml").errors]


def test_fixed_ranges_past_the_budget_are_refused_with_their_count(small_budget):
    text = HEAD + '[families.s]\nstate = "s-{a}-{b}"\nindex = { a = [0, 99], b = [1, 20] }\nwhen = "0"\n'
    assert errors(text) == ["f.toml: family 's': index ranges give 2,000 combinations, over the limit of 1,000"]


def test_dependent_ranges_that_a_filter_empties_stop_at_the_budget(small_budget):
    text = HEAD + '[families.s]\nstate = "s-{a}-{b}"\nindex = { a = [0, 99], b = [0, "a"] }\nwhen = "a < 0"\n'
    assert errors(text) == ["f.toml: family 's': index ranges give more than 1,000 combinations to try (the limit)"]


def test_outcome_ranges_that_a_filter_empties_stop_at_the_budget(small_budget):
    text = (
        '[ruleset]\ntitle = "t"\nstart = "s-0"\n[states.end]\n[families.s]\nstate = "s-{t}"\n'
        "index = { t = [0, 3] }\n"
        'outcomes = [{ each = { f = [0, 100000] }, to = "s-{t}", when = "f < 0" }, { to = "end" }]\n'
    )
    assert errors(text) == [
        "f.toml: family 's' at t=0, outcomes, outcome 1: index ranges give more than 1,000 combinations "
        "to try (the limit)"
    ]


def test_a_family_inside_the_budget_expands():
    text = HEAD.replace('"end"', '"s-0"') + (
        '[families.s]\nstate = "s-{t}"\nindex = { t = [0, 9] }\n'
        'outcomes = [{ to = "s-{t + 1}", when = "t < 9" }, { to = "end", when = "t == 9" }]\n'
    )
    result = read_ruleset_text(text, "f.toml")
    assert result.ruleset is not None, result.problems
    assert len(result.ruleset.states) == 11
