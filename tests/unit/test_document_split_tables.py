"""A ``[states]`` table written in pieces (states, then families, then more states) edits like any other.

The dealer rulesets put ``[states.deal]`` before the families and the end states after them;
tomlkit reads such a table as an out-of-order proxy that can neither append nor rename.
"""

from __future__ import annotations

from pathlib import Path

import pytest

from oddsbench.model.document import RulesetDocument
from oddsbench.model.load import read_ruleset_text

ROOT = Path(__file__).resolve().parents[2]
DEALER = (ROOT / "rulesets" / "dealer-stands-soft-17.toml").read_text()


def problems_of(text: str) -> list[str]:
    return [str(problem) for problem in read_ruleset_text(text, "x").problems if problem.severity == "error"]


@pytest.mark.parametrize("kind", ["end", "outcomes"])
def test_a_new_state_goes_after_the_last_piece_and_the_rest_is_untouched(kind):
    document = RulesetDocument.from_text(DEALER)
    document.add_state("insured", kind)
    after = document.text()
    assert after.startswith(DEALER.rstrip("\n"))  # every byte before stays as it was
    assert after.rstrip().endswith("[states.insured]\n" + ('result = "win"' if kind == "end" else "outcomes = []"))
    assert document.state_names() == ["deal", "blackjack", "bust", "insured"]


def test_an_added_end_state_reads_back_with_the_families_intact():
    document = RulesetDocument.from_text(DEALER)
    document.add_state("insured", "end")
    result = read_ruleset_text(document.text(), "x")
    assert result.ruleset is not None and problems_of(document.text()) == []
    assert len(result.ruleset.states) == len(read_ruleset_text(DEALER, "x").ruleset.states) + 1


@pytest.mark.parametrize("old", ["deal", "blackjack", "bust"])
def test_renaming_a_state_in_any_piece_follows_every_reference_including_the_families(old):
    document = RulesetDocument.from_text(DEALER)
    document.rename_state(old, "renamed")
    after = document.text()
    assert "[states.renamed]" in after and f"[states.{old}]" not in after
    assert f'to = "{old}"' not in after and f'start = "{old}"' not in after
    assert problems_of(after) == []


def test_a_family_target_with_braces_in_the_name_is_matched_as_the_template_writes_it():
    text = DEALER.replace('to = "bust"', 'to = "bust{{x}}"').replace("[states.bust]", '[states."bust{x}"]')
    assert problems_of(text) == []
    document = RulesetDocument.from_text(text)
    document.rename_state("bust{x}", "over{y}")
    assert 'to = "over{{y}}"' in document.text() and problems_of(document.text()) == []
