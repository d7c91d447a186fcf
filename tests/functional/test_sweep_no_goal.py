"""Sweeps with no goal: every point played until ruin, through the core's one session entry, its
ruin chance exact where it is rational and between proved exact bounds, in the table, CSV and JSON.

Published checks (Feller, An Introduction to Probability Theory and Its Applications, vol. I, ch.
XIV.2-3): a gambler with k units betting one unit at even money, won with chance p (q = 1 - p),
against an infinitely rich adversary is ruined with probability 1 when p <= q and (q/p)^k when
p > q; when p < q the expected duration is k/(q - p).
"""

from __future__ import annotations

import csv
import io
import json
import math

import pytest
from conftest import run_cli
from jsonschema import Draft202012Validator

from oddsbench.model.numbers import QQ, parse_fraction
from oddsbench.schemas import schema

COIN = """[ruleset]
title = "Bent coin, even money"
start = "toss"
stake = 1
[params]
p = "1/2"
w = 1
[states.toss]
outcomes = [
  { to = "won", prob = "p", pay = "w" },
  { to = "lost", prob = "1 - p", pay = -1 },
]
[states.won]
result = "win"
[states.lost]
result = "loss"
[session]
bankroll = 3
goal = 10
"""


def sweep_json(capsys, tmp_path, spec: str) -> dict:
    (tmp_path / "coin.toml").write_text(COIN, encoding="utf-8")
    (tmp_path / "sweep.toml").write_text(spec, encoding="utf-8")
    out = tmp_path / "out.json"
    code, text, err = run_cli(capsys, "sweep", tmp_path / "sweep.toml", "--workers", "1", "--json", out)
    assert code == 0, err
    document = json.loads(out.read_text(encoding="utf-8"))
    Draft202012Validator(schema("sweep")).validate(document)
    return document, text


def test_ruin_with_no_goal_is_certain_when_unfavourable_and_q_over_p_to_the_k_when_favourable(capsys, tmp_path):
    spec = """[sweep]
ruleset = "coin.toml"
figures = ["session.ruin_probability", "session.expected_rounds_to_ruin"]
[params]
p = ["2/5", "1/2", "3/5", "2/3"]
[session]
goal = "none"
"""
    document, table = sweep_json(capsys, tmp_path, spec)
    k = 3
    for point in document["points"]:
        p = parse_fraction(point["settings"]["p"])
        q = 1 - p
        figures = point["figures"]
        ruin = QQ(1) if p <= q else (q / p) ** k
        assert point["settings"]["plan"] == "timid"  # with no goal the default plan is the one that can play
        assert parse_fraction(figures["session.ruin_probability"]["exact"]) == ruin
        assert figures["session.ruin_probability_lower"]["exact"] == figures["session.ruin_probability_upper"]["exact"]
        assert parse_fraction(figures["session.expected_result_per_round"]["exact"]) == p - q
        if p < q:
            assert parse_fraction(figures["session.expected_rounds_to_ruin"]["exact"]) == k / (q - p)  # 15 at p = 2/5
        else:
            assert "session.expected_rounds_to_ruin" not in figures
            assert any("expected rounds to ruin" in note for note in point["notes"])
        assert point["exact"] is True
    assert "8/27" in table and "1/8" in table  # (2/3)^3 and (1/2)^3 in the table


def test_a_ruin_chance_that_is_not_rational_comes_with_proved_exact_bounds_and_its_exact_form(capsys, tmp_path):
    # Win 2 or lose 1 at even chances from 3 units: ruin = theta^3, theta the root in (0, 1) of
    # (t^3 + 1) / 2 = t, i.e. t^2 + t - 1 = 0: theta = (sqrt 5 - 1) / 2, and theta^3 = sqrt 5 - 2
    # (standard algebra: the ladder-height root of a skip-free walk, Feller vol. I, ch. XIV.8).
    spec = """[sweep]
ruleset = "coin.toml"
figures = ["session.ruin_probability"]
[params]
w = [2]
[session]
goal = ["none", 10]
plan = "flat:1"
"""
    document, _ = sweep_json(capsys, tmp_path, spec)
    no_goal, bounded = document["points"]
    figures = no_goal["figures"]
    truth = math.sqrt(5) - 2
    assert figures["session.ruin_probability"]["exact"] is None
    assert figures["session.ruin_probability"]["decimal"] == pytest.approx(truth, rel=1e-15)
    low = parse_fraction(figures["session.ruin_probability_lower"]["exact"])
    high = parse_fraction(figures["session.ruin_probability_upper"]["exact"])
    assert low < high and high - low < QQ(1, 10**18)  # the default 20 digits
    assert low * low + 4 * low - 1 < 0 < high * high + 4 * high - 1  # sqrt 5 - 2 is the root of x^2 + 4x - 1
    assert any("theta^3" in note for note in no_goal["notes"])
    assert no_goal["exact"] is False  # no rational: the chance is said by its exact form, between exact bounds
    assert bounded["settings"]["session.goal"] == "10" and "session.goal_probability" in bounded["figures"]


def test_the_csv_of_a_sweep_with_no_goal_carries_the_ruin_columns(capsys, tmp_path):
    (tmp_path / "coin.toml").write_text(COIN, encoding="utf-8")
    spec = '[sweep]\nruleset = "coin.toml"\n[params]\np = ["3/5"]\n[session]\ngoal = "none"\n'
    (tmp_path / "sweep.toml").write_text(spec, encoding="utf-8")
    out = tmp_path / "out.csv"
    code, _, err = run_cli(capsys, "sweep", tmp_path / "sweep.toml", "--workers", "1", "--csv", out)
    assert code == 0, err
    rows = list(csv.DictReader(io.StringIO(out.read_text(encoding="utf-8"))))
    assert rows[0]["session.ruin_probability exact"] == "8/27"
    assert rows[0]["session.goal"] == "none"
