"""The Round view (F3) shows the return table: the round's net law, each value's chance exact
beside its decimal, and each paying step's share of the expected net, as ``solve --json`` gives
them (the same core), following the `c` cells switch."""

from __future__ import annotations

import json

from tests.conftest import RULESETS, run_cli
from tests.tui.helpers import app_on, cell, copy_ruleset, settle

# Pass line: P(win) = 244/495, P(loss) = 251/495, no push, house edge 7/495 (Ethier, The Doctrine
# of Chances, 2010, ch. 15).
PASS_LINE_WIN = "244/495"
PASS_LINE_LOSS = "251/495"


async def test_f3_shows_the_net_law_as_solve_json_gives_it(tmp_path, capsys):
    code, out, _ = run_cli(capsys, "solve", RULESETS / "pass-line.toml", "--json")
    assert code == 0
    net_law = json.loads(out)["results"][0]["net_law"]
    app = app_on(copy_ruleset("pass-line.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("f3")
        await pilot.pause()
        workbench = app.workbench
        assert workbench.query_one("#views").current == "round"
        grid = workbench.query_one("#law-table")
        assert grid.display and grid.row_count == len(net_law) == 2
        assert "2 value(s)" in str(workbench.query_one("#law-heading").render())
        for value in net_law:
            label = f"net {value['net']['exact']}"
            exact, decimal = cell(grid.table, label, 0)
            assert exact == value["probability"]["exact"]
            assert decimal.startswith(f"{value['probability']['decimal']:.6f}"[:7])
            assert cell(grid.table, label, 1)[0] == value["contribution"]["exact"]
        assert cell(grid.table, "net 1", 0)[0] == PASS_LINE_WIN
        assert cell(grid.table, "net -1", 0)[0] == PASS_LINE_LOSS
        shown = [grid.get_row_at(i) for i in range(grid.row_count)]
        assert any(PASS_LINE_WIN in str(c) for row in shown for c in row)  # exact on screen beside the decimal
        shares = workbench.query_one("#shares-table")
        assert shares.display and shares.row_count == len(json.loads(out)["results"][0]["return_shares"])
        await pilot.press("c", "c")  # exact, then decimal alone
        await pilot.pause()
        shown = [str(c) for i in range(grid.row_count) for c in grid.get_row_at(i)]
        assert grid.kind == "decimal" and not any(PASS_LINE_WIN in c for c in shown)
        assert str(workbench.query_one("#cautions").render())


TWO_WHEELS = """
[ruleset]
title = "Two wheels of a hundred (invented demo)"
start = "first"
stake = 1

[states.first]
outcomes = [{ each = { k = [0, 99] }, to = "second", prob = "1/100", pay = "k" }]

[states.second]
outcomes = [{ each = { j = [0, 99] }, to = "done", prob = "1/100", pay = "100 * j - 5000" }]

[states.done]
result = "push"
"""


async def test_a_net_law_of_10000_values_lists_the_likeliest_1000_and_says_where_the_rest_is(tmp_path, capsys):
    # nets k + 100 j - 5000 for k, j in 0..99: 10,000 distinct values, each 1/10000 (first principles)
    path = tmp_path / "two-wheels.toml"
    path.write_text(TWO_WHEELS)
    code, out, _ = run_cli(capsys, "solve", path, "--json")
    assert code == 0 and len(json.loads(out)["results"][0]["net_law"]) == 10_000
    app = app_on(path, tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("f3")
        await pilot.pause()
        workbench = app.workbench
        grid = workbench.query_one("#law-table")
        assert grid.row_count == 1_000
        heading = str(workbench.query_one("#law-heading").render())
        assert "1,000 likeliest of 10,000 values" in heading and "solve --json" in heading
        # equal chances: the likeliest are the first in order of the net
        assert grid.table.rows[0].label == "net -5000" and grid.table.rows[-1].label == "net -4001"
        assert cell(grid.table, "net -5000", 0)[0] == "1/10000"
