"""The starting point for a new ruleset: small, valid, and commented so a user sees the format."""

NEW_RULESET = """\
# A new game for oddsbench. Each state lists its outcomes: where play goes next (to),
# how likely (prob, an exact number or expression in quotes), what the player wins or
# loses in units of the stake (pay), and any extra amount put at risk (stake).

[ruleset]
title = "New game"
about = "A fair coin: heads wins the stake, tails loses it."
start = "toss"
stake = 1

[states.toss]
outcomes = [
  { to = "won",  prob = "1/2", pay = 1,  note = "heads" },
  { to = "lost", prob = "1/2", pay = -1, note = "tails" },
]

[states.won]
result = "win"

[states.lost]
result = "loss"
"""
