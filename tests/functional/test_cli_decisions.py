"""``oddsbench best`` and the side-by-side ``oddsbench solve``: human text, JSON, bad input."""

from __future__ import annotations

import json

from conftest import RULESETS, run_cli

from oddsbench.report.cautions import CAUTIONS

PIG = RULESETS / "pig-turn.toml"
DEALER = RULESETS / "dealer-stands-soft-17.toml"


def test_best_prints_hold_decisions_exact_value_and_certificate(capsys):
    code, out, _ = run_cli(capsys, "best", PIG)
    assert code == 0
    lines = out.splitlines()
    assert any(line.split() == ["turn-0", "..", "turn-19", "19", "roll"] for line in lines)
    assert any(line.split() == ["turn-20", "..", "turn-99", "80", "hold"] for line in lines)
    assert any(line.split() == ["expected", "net", "492303203/60466176", "8.14179"] for line in lines)
    assert "Certificate: checked exactly" in out
    assert "turn-20: hold, exactly as good as roll" in out
    assert all(caution in out for caution in CAUTIONS)


def result_of(data: dict, key: str, value: str) -> dict:
    """The one object of ``solve --json``'s ``results`` whose ``key`` (start or strategy) is ``value``."""
    (found,) = [result for result in data["results"] if result[key] == value]
    return found


def test_best_json_has_the_documented_keys(capsys):
    code, out, _ = run_cli(capsys, "best", PIG, "--json")
    data = json.loads(out)
    assert code == 0
    assert {"command", "version", "goal", "best", "checks", "notes", "cautions"} <= data.keys()
    best = data["best"]
    assert {"value", "policy", "certified", "notes"} <= best.keys() and data["checks"] == []
    assert data["goal"] == "max-return" and best["certified"] is True
    assert best["value"]["exact"] == "492303203/60466176"
    assert abs(best["value"]["decimal"] - 492303203 / 60466176) < 1e-15
    assert best["policy"]["turn-19"] == "roll" and best["policy"]["turn-20"] == "hold" and len(best["policy"]) == 99


def test_best_every_state_lists_each_decision_state(capsys):
    _, out, _ = run_cli(capsys, "best", PIG, "--every-state")
    assert sum(1 for line in out.splitlines() if line.startswith("turn-")) == 99


def test_check_strategy_reports_state_and_better_action(capsys):
    code, out, _ = run_cli(capsys, "best", PIG, "--check-strategy", "hold-at-25")
    assert code == 0
    assert "Improvable: in 7 decision state(s)" in out
    assert any(line.split()[:5] == ["turn-24", "roll", "hold", "2/3", "0.666667"] for line in out.splitlines())


def test_check_strategy_json_for_an_optimal_strategy(capsys):
    _, out, _ = run_cli(capsys, "best", PIG, "--check-strategy", "hold-at-20", "--json")
    data = json.loads(out)
    assert data["best"] is None and [check["strategy"] for check in data["checks"]] == ["hold-at-20"]
    check = data["checks"][0]
    assert check["optimal"] is True and check["improvements"] == [] and check["value"] == check["best_value"]


def test_solve_without_strategy_shows_named_strategies_side_by_side(capsys):
    code, out, _ = run_cli(capsys, "solve", PIG)
    assert code == 0
    header = next(line for line in out.splitlines() if line.startswith("quantity"))
    assert header.split() == ["quantity", "hold-at-10", "hold-at-15", "hold-at-20", "hold-at-25"]
    net = next(line for line in out.splitlines() if line.startswith("expected net"))
    assert "492303203/60466176 | 8.14179" in net and "26725/3888 | 6.87371" in net


def test_solve_side_by_side_json_has_one_object_per_strategy(capsys):
    _, out, _ = run_cli(capsys, "solve", PIG, "--json")
    data = json.loads(out)
    assert data["compared"] == "strategies"
    assert [r["strategy"] for r in data["results"]] == ["hold-at-10", "hold-at-15", "hold-at-20", "hold-at-25"]
    assert result_of(data, "strategy", "hold-at-20")["figures"]["expected_net"]["exact"] == "492303203/60466176"
    assert result_of(data, "strategy", "hold-at-20")["policy"]["turn-19"] == "roll"


def test_solve_with_a_strategy_gives_that_strategy_alone(capsys):
    _, out, _ = run_cli(capsys, "solve", PIG, "--strategy", "hold-at-15", "--json")
    data = json.loads(out)
    assert data["compared"] is None and [r["strategy"] for r in data["results"]] == ["hold-at-15"]
    assert data["results"][0]["figures"]["expected_net"]["exact"] == "732275/93312"


def test_solve_from_a_state_gives_the_dealer_row_for_that_upcard(capsys):
    _, out, _ = run_cli(capsys, "solve", DEALER, "--from", "up-6", "--json")
    ends = json.loads(out)["results"][0]["figures"]["end_probability"]
    assert round(ends["bust"]["decimal"], 4) == 0.4232  # Griffin, The Theory of Blackjack (from memory)


def test_solve_from_an_unknown_state_exits_2_with_a_suggestion(capsys):
    code, _, err = run_cli(capsys, "solve", DEALER, "--from", "up-66")
    assert code == 2
    assert "no state 'up-66' to start from (did you mean 'up-6'?)" in err


def test_decisions_without_strategies_exit_2(capsys, tmp_path):
    path = tmp_path / "bare.toml"
    text = PIG.read_text()
    path.write_text(text[: text.index("[strategies.hold-at-10]")])
    code, _, err = run_cli(capsys, "solve", path)
    assert code == 2 and "no [strategies] to compare" in err


def test_unknown_strategy_to_check_exits_2(capsys):
    code, _, err = run_cli(capsys, "best", PIG, "--check-strategy", "hold-at-99")
    assert code == 2 and "unknown strategy 'hold-at-99'" in err


def test_bad_family_exits_2_with_one_line_naming_family_and_index(capsys, tmp_path):
    path = tmp_path / "bad.toml"
    path.write_text(PIG.read_text().replace('pay = "t", note', 'pay = "t / (t - 50)", note'))
    code, _, err = run_cli(capsys, "best", path)
    assert code == 2
    assert err.strip() == "bad.toml: family 'turn' at t=50, choice 'hold', outcome 1: division by zero"


def test_solve_from_a_pattern_puts_every_upcard_side_by_side(capsys):
    code, out, _ = run_cli(capsys, "solve", DEALER, "--from", "up-*", "--cells", "decimal")
    assert code == 0
    header = next(line for line in out.splitlines() if line.startswith("quantity"))
    assert header.split() == ["quantity"] + [f"up-{c}" for c in range(2, 12)]
    bust = next(line for line in out.splitlines() if line.startswith("ends in 'bust'"))
    assert "0.42315 (42.32 %)" in bust  # upcard 6; Griffin, The Theory of Blackjack (from memory)


def test_solve_from_a_list_json_has_one_object_per_start(capsys):
    _, out, _ = run_cli(capsys, "solve", DEALER, "--from", "up-10,up-11", "--json")
    data = json.loads(out)
    assert data["compared"] == "starts" and [r["start"] for r in data["results"]] == ["up-10", "up-11"]
    assert result_of(data, "start", "up-11")["figures"]["end_probability"]["blackjack"]["exact"] == "4/13"


def test_several_starts_of_a_file_with_decisions_need_a_strategy(capsys):
    code, _, err = run_cli(capsys, "solve", PIG, "--from", "turn-0,turn-10")
    assert code == 2 and "choose a strategy to compare start states" in err
    code, out, _ = run_cli(capsys, "solve", PIG, "--from", "turn-0,turn-10", "--strategy", "hold-at-20", "--json")
    assert code == 0
    assert result_of(json.loads(out), "start", "turn-0")["figures"]["expected_net"]["exact"] == "492303203/60466176"


def test_pattern_matching_no_state_exits_2(capsys):
    code, _, err = run_cli(capsys, "solve", DEALER, "--from", "top-*")
    assert code == 2 and "no state matches 'top-*'" in err
