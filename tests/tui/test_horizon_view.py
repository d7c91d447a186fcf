"""The Horizon view (F10, issue 13 items 4 and 5): the total after N rounds of the open game, a
column per N, the horizon caution beside the figures, a bad list of rounds answered inline with the
last good figures kept, `s` cycling the strategy, Esc cancelling, the cells switch.

Every test drives real key presses; the figures are checked against first principles and against
``oddsbench horizon --json`` (the same core)."""

from __future__ import annotations

import json
import threading
from math import comb

from oddsbench.model.numbers import QQ, text
from oddsbench.report.cautions import HORIZON_CAUTIONS
from tests.conftest import RULESETS, run_cli
from tests.tui.helpers import app_on, cell, copy_ruleset, settle

# After 10 even-money rounds on the 37-pocket wheel (win 18/37, lose 19/37): ahead means 6 or more
# wins, even exactly 5 (binomial, first principles).
WHEEL_AHEAD_10 = "1655010535112064/4808584372417849"
WHEEL_EVEN_10 = "1179046873678464/4808584372417849"


def binomial_chance(wins: range) -> str:
    """P(the number of wins in 10 rounds lies in ``wins``), p = 18/37: first principles."""
    return text(sum((QQ(comb(10, k) * 18**k * 19 ** (10 - k), 37**10) for k in wins), QQ(0)))


def test_the_published_values_are_the_binomial_ones():
    assert binomial_chance(range(6, 11)) == WHEEL_AHEAD_10
    assert binomial_chance(range(5, 6)) == WHEEL_EVEN_10


async def open_horizon(pilot) -> None:
    """Wait for the first solve, then F10 and wait for the horizon."""
    await settle(pilot)
    await pilot.press("f10")
    await settle(pilot)


async def type_rounds(pilot, keys: str) -> None:
    """Retype the rounds field with the keyboard."""
    field = pilot.app.workbench.query_one("#horizon-rounds")
    field.focus()
    await pilot.press("end", "ctrl+u", *keys)
    await settle(pilot)


async def test_the_players_journey_in_the_horizon_view(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_horizon(pilot)
        screen = app.workbench
        assert screen.current_view == "horizon"
        grid = screen.query_one("#horizon-table")
        assert grid.table.columns == ("N = 1", "N = 10", "N = 100", "N = 1,000", "N = 10,000")
        assert cell(grid.table, "ahead (total > 0)", 1) == (WHEEL_AHEAD_10, "0.344178 (34.42 %)")
        assert cell(grid.table, "even (total = 0)", 1)[0] == WHEEL_EVEN_10
        assert cell(grid.table, "law", 4) == (None, "float")  # 10,000 rounds: past the exact limits, said so
        assert cell(grid.table, "90 % range of the return to player", 1) == ("2/5 .. 7/5", "40 % .. 140 %")
        assert cell(grid.table, "  normal approximation, 90 %", 1) == (None, "45.3 % .. 149.3 %")
        # the caution where horizon figures are shown, and the one-line cautions under every view
        assert str(screen.query_one("#horizon-caution").render()) == " ".join(HORIZON_CAUTIONS)
        assert str(screen.query_one("#cautions").render()).startswith(" F9 ")
        # at 80 columns the first column of figures is whole: its cells as fitted are the decimals in full
        first = [str(grid.get_row_at(i)[1]).strip() for i in range(grid.row_count)]
        assert "0.486486" in first and "-0.027027" in first

        # a list that does not read: one line beside the field, the last good figures kept and marked
        # (typed key by key: "10, 1," read well and was solved on the way)
        assert app.focused.id == "horizon-rounds"
        await type_rounds(pilot, "10, 1,000")
        message = str(screen.query_one("#horizon-message").render())
        assert "commas separate the numbers of rounds" in message
        assert screen.query_one("#horizon-rounds").has_class("-invalid")
        shown = grid.table
        assert shown.columns == ("N = 1", "N = 10")
        assert "last good figures (the rounds have a problem)" in str(screen.query_one("#horizon-heading").render())
        await pilot.press("backspace", "backspace", "backspace", "backspace")
        await settle(pilot)
        assert "at least 1, got 0" not in str(screen.query_one("#horizon-message").render())
        await type_rounds(pilot, "0")
        assert "at least 1, got 0" in str(screen.query_one("#horizon-message").render())
        assert grid.table is shown and app.return_code is None

        # a good list: solved at once, the mark and the message gone
        await type_rounds(pilot, "10, 1_000")
        assert grid.table.columns == ("N = 10", "N = 1,000")
        assert cell(grid.table, "ahead (total > 0)", 0)[0] == WHEEL_AHEAD_10
        assert str(screen.query_one("#horizon-message").render()).strip() == ""
        assert "last good" not in str(screen.query_one("#horizon-heading").render())

        # Esc with nothing to cancel: back to the table; the cells switch and the detail pane
        await pilot.press("escape")
        await pilot.pause()
        assert app.focused is grid
        await pilot.press("down")
        await pilot.pause()
        detail = str(screen.query_one("#detail-text").render())
        assert "ahead (total > 0)" in detail and "N = 10" in detail and "above zero" in detail
        assert WHEEL_AHEAD_10 in detail
        await pilot.press("c")
        await pilot.pause()
        assert grid.kind == "exact"
        # exact cells: shortened to their digit counts where two long fractions share 80 columns
        assert all("/" in str(c) for c in grid.get_row_at(1)[1:])
        await pilot.press("c")
        await pilot.pause()
        assert grid.kind == "decimal" and not any("/" in str(c) for c in grid.get_row_at(1))
        assert app.return_code is None


async def test_s_cycles_the_strategy_and_the_figures_follow(tmp_path, capsys):
    app = app_on(copy_ruleset("lamplighter-ladder.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await open_horizon(pilot)
        screen = app.workbench
        await type_rounds(pilot, "1, 10")
        first = screen.strategy
        assert f"strategy {first!r}" in str(screen.query_one("#horizon-heading").render())
        await pilot.press("escape")  # to the table: letters are keys there
        await pilot.press("s")
        await settle(pilot)
        second = screen.strategy
        assert second != first
        assert f"strategy {second!r}" in str(screen.query_one("#horizon-heading").render())
        table = screen.query_one("#horizon-table").table
    code, out, _ = run_cli(
        capsys, "horizon", RULESETS / "lamplighter-ladder.toml", "--rounds", "1,10", "--strategy", second, "--json"
    )
    assert code == 0
    for column, solved in enumerate(json.loads(out)["horizons"]):
        assert cell(table, "ahead (total > 0)", column)[0] == solved["ahead"]["exact"]
        assert cell(table, "behind (total < 0)", column)[0] == solved["behind"]["exact"]


async def test_esc_cancels_a_solve_and_marks_the_figures(tmp_path, monkeypatch):
    """A solve that runs until it is told to stop: Esc stops it through the worker's cancel check;
    the last figures stay, marked, and Ctrl+R solves again."""
    import oddsbench.tui.horizons as horizons
    from oddsbench.core.work import Cancelled

    real = horizons.horizon_text
    started = threading.Event()

    def endless(ruleset, strategy, rounds, should_stop=None):
        if rounds != (7,):
            return real(ruleset, strategy, rounds, should_stop)
        started.set()
        while not should_stop():
            threading.Event().wait(0.01)
        raise Cancelled("cancelled")

    monkeypatch.setattr(horizons, "horizon_text", endless)
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_horizon(pilot)
        screen = app.workbench
        good = screen.horizon_result
        screen.query_one("#horizon-rounds").focus()
        await pilot.press("end", "ctrl+u", "7")
        for _ in range(200):
            if started.is_set():
                break
            await pilot.pause(0.01)
        assert started.is_set() and screen.horizon_comparison.busy
        await pilot.press("escape")
        await settle(pilot)
        assert not screen.horizon_comparison.busy and app.return_code is None
        assert screen.horizon_result is good
        assert "solve cancelled" in str(screen.query_one("#horizon-heading").render())
        monkeypatch.setattr(horizons, "horizon_text", real)
        await pilot.press("ctrl+r")
        await settle(pilot)
        assert screen.horizon_result.table.columns == ("N = 7",)
        assert "cancelled" not in str(screen.query_one("#horizon-heading").render())


async def test_rounds_the_core_refuses_keep_the_last_good_figures(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_horizon(pilot)
        screen = app.workbench
        await type_rounds(pilot, "10, 9000000")  # 9,000,001 possible totals: over the float law's limit
        message = str(screen.query_one("#horizon-message").render())
        assert "9,000,000" in message and "limit" in message and not message.startswith("--")
        # the last list solved is kept (typed key by key, "10, 900000" was solved on the way)
        assert screen.horizon_result.table.columns == ("N = 10", "N = 900,000")
        assert "last good figures" in str(screen.query_one("#horizon-heading").render())
        assert app.return_code is None


async def test_a_game_of_points_draws_its_total_and_has_no_return(tmp_path):
    app = app_on(copy_ruleset("pig-turn.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await open_horizon(pilot)
        await type_rounds(pilot, "1, 10, 100")
        result = app.workbench.horizon_result
        assert result.expected is None and result.band_title == "total after N rounds"
        labels = [row.label for row in result.table.rows]
        assert "ahead (total > 0)" in labels and not any("return to player" in label for label in labels)


async def test_an_edit_that_breaks_the_file_keeps_the_figures_marked_and_a_fix_solves_again(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await open_horizon(pilot)
        screen = app.workbench
        good = screen.horizon_result
        source = screen.session.text
        screen.session.replace_text(source.replace("payout = 1", "payout = 1 +"))
        screen.refresh_forms()
        await settle(pilot)
        assert screen.horizon_result is good and app.return_code is None
        assert "last good figures (the text now has problems)" in str(screen.query_one("#horizon-heading").render())
        screen.session.replace_text(source.replace("payout = 1", "payout = 2"))
        screen.refresh_forms()
        await settle(pilot)
        heading = str(screen.query_one("#horizon-heading").render())
        assert "last good" not in heading
        # paying 2 to 1 on 18 of 37 pockets: ahead after one round with chance 18/37 still, the mean 17/37
        table = screen.horizon_result.table
        assert cell(table, "ahead (total > 0)", 0)[0] == "18/37"
        assert cell(table, "mean total", 0)[0] == "17/37"


async def test_f10_before_the_first_solve_plays_the_files_first_strategy(tmp_path):
    app = app_on(copy_ruleset("lamplighter-ladder.toml", tmp_path), tmp_path)
    async with app.run_test(size=(80, 24)) as pilot:
        await pilot.press("f10")  # no wait: the round has not been solved yet, no strategy chosen
        await settle(pilot)
        heading = str(app.workbench.query_one("#horizon-heading").render())
        assert "strategy 'first-win'" in heading and app.workbench.horizon_result.table
