"""Shared test material: small invented games."""

import pytest

# An invented two-action game for the strategies-compared section.
CHOICE_GAME = """
[ruleset]
title = "Coin with a second chance"
start = "first"

[states.first]
outcomes = [{ to = "won", prob = "1/2", pay = 1 }, { to = "offer", prob = "1/2" }]

[states.offer.choices]
accept = [{ to = "won", prob = "1/3", pay = 1 }, { to = "lost", pay = -1 }]
refuse = [{ to = "lost", pay = -1 }]

[states.won]
result = "win"

[states.lost]
result = "loss"

[strategies.eager]
offer = "accept"

[strategies.careful]
offer = "refuse"
"""


@pytest.fixture
def choice_game(tmp_path):
    """The invented coin game as a file."""
    path = tmp_path / "coin.toml"
    path.write_text(CHOICE_GAME)
    return path
