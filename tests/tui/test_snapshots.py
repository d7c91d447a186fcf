"""Snapshots of every view at 80x24 and 120x40 (pytest-textual-snapshot), grouped by feature.

Update with ``python -m pytest tests/tui/test_snapshots.py --snapshot-update -n 0`` and look at
the SVGs in ``tests/tui/__snapshots__`` before committing. Each scene's docstring says what it proves.
"""

from __future__ import annotations

import shutil

import pytest

from oddsbench.tui.app import create_app
from tests.tui.helpers import RULESETS, settle

SIZES = [pytest.param((80, 24), id="80x24"), pytest.param((120, 40), id="120x40")]


@pytest.fixture
def scratch(tmp_path, monkeypatch):
    """Bundled rulesets copied to a fixed-name folder so paths shown on screen do not vary."""
    folder = tmp_path / "games"
    folder.mkdir()
    for path in RULESETS.glob("*.toml"):
        shutil.copy(path, folder / path.name)
    monkeypatch.chdir(folder)
    return folder


def workbench(scratch, name):
    return create_app(scratch / name, folder=scratch, cursor_blinks=False)


def pressing(*keys: str):
    """A scene: wait for the first solve, press ``keys`` (each one settled), wait again."""

    async def run(pilot):
        await settle(pilot)
        for key in keys:
            await pilot.press(key)
            await settle(pilot)

    return run


@pytest.mark.parametrize("size", SIZES)
class TestEditing:
    def test_edit_view(self, snap_compare, scratch, size):
        """The demo opens on its start state: the state list, the outcome table and its fields, the
        headline figures on one line, the cautions on one line, and a footer that does not wrap."""
        assert snap_compare(workbench(scratch, "lantern-dice.toml"), terminal_size=size, run_before=settle)

    def test_the_state_lists_keys_fit_the_footer(self, snap_compare, scratch, size):
        """F2 puts the cursor in the state list: its keys (add, add end, rename, delete) and the
        file's keys on one footer line, at 80 columns too (compact, Ctrl+P left to the help)."""
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=pressing("f2"))

    def test_a_bad_value_keeps_the_last_good_figures(self, snap_compare, scratch, size):
        """A value that does not read: its message beside the field, the summary marked as the last
        good figures."""
        scene = pressing("enter", "enter", "end", "ctrl+u", *"8/3(")
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=scene)

    def test_source_view(self, snap_compare, scratch, size):
        """F6: the file as text with line numbers."""
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=pressing("f6"))


@pytest.mark.parametrize("size", SIZES)
class TestRoundView:
    def test_round_figures_and_their_detail(self, snap_compare, scratch, size):
        """F3: every figure, exact beside decimal, the win, push and loss totals, and the detail pane
        with the highlighted figure's meaning in plain words."""
        assert snap_compare(workbench(scratch, "lantern-dice.toml"), terminal_size=size, run_before=pressing("f3"))

    def test_a_game_of_points(self, snap_compare, scratch, size):
        """Pig has no stake: the summary names the strategy played and gives the expected points and
        how turns end, not only the expected steps."""
        assert snap_compare(workbench(scratch, "pig-turn.toml"), terminal_size=size, run_before=settle)

    def test_decimal_cells(self, snap_compare, scratch, size):
        """`c` switches the cells: exact and decimal, exact alone, decimal alone (here: exact)."""
        scene = pressing("f3", "c")
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=scene)

    def test_a_figure_whole(self, snap_compare, scratch, size):
        """Enter on a figure: its exact value in full on a screen of its own."""
        scene = pressing("f3", "down", "down", "enter")
        assert snap_compare(workbench(scratch, "lantern-dice.toml"), terminal_size=size, run_before=scene)


@pytest.mark.parametrize("size", SIZES)
class TestStrategiesView:
    def test_every_strategy_beside_the_best_play(self, snap_compare, scratch, size):
        """F4 on Pig: all four named strategies and the best play fit side by side (first column of
        figures whole), then the best play's certificate and where 'hold-at-10' loses."""
        scene = pressing("f4")
        assert snap_compare(workbench(scratch, "pig-turn.toml"), terminal_size=size, run_before=scene)


@pytest.mark.parametrize("size", SIZES)
class TestSessionsView:
    def test_plans_side_by_side_with_charts(self, snap_compare, scratch, size):
        """F5: two plans with the file's goal, each plan's ruin with no goal beside, and the charts
        with round ticks and a line at the starting bankroll."""
        scene = pressing("f5")
        assert snap_compare(workbench(scratch, "single-zero-wheel.toml"), terminal_size=size, run_before=scene)


@pytest.mark.parametrize("size", SIZES)
class TestSimulationView:
    def test_a_seeded_run(self, snap_compare, scratch, size):
        """F7, 20,000 rounds with seed 7: each estimate and its interval beside the exact figure."""
        scene = pressing("f7", *"20000", "tab", *"7", "enter")
        assert snap_compare(workbench(scratch, "lantern-dice.toml"), terminal_size=size, run_before=scene)


@pytest.mark.parametrize("size", SIZES)
class TestHorizonView:
    def test_the_total_after_n_rounds_with_its_charts(self, snap_compare, scratch, size):
        """F10: a column per N (1 to 10,000), the last one a float law (said in the law row), the
        caution over many rounds above the table, the first column of figures whole at 80 columns."""
        assert snap_compare(
            workbench(scratch, "single-zero-wheel.toml"), terminal_size=size, run_before=pressing("f10")
        )

    def test_the_charts_against_n_on_a_log_scale(self, snap_compare, scratch, size):
        """F10, Shift+Tab, PgDn: the chance ahead and the 90 % and 99 % return ranges closing in on the
        expected return, against N at round powers of ten, the legend on a line of its own."""
        scene = pressing("f10", "shift+tab", "pagedown")
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=scene)

    def test_a_bad_list_keeps_the_last_good_figures(self, snap_compare, scratch, size):
        """A list of rounds that does not read: the message beside the field, the figures of the
        last list that read marked as the last good ones."""
        scene = pressing("f10", "end", *", 1,0")
        assert snap_compare(workbench(scratch, "single-zero-wheel.toml"), terminal_size=size, run_before=scene)


@pytest.mark.parametrize("size", SIZES)
class TestScreensOverTheWorkbench:
    def test_help(self, snap_compare, scratch, size):
        """F1: every key, read from the bindings."""
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=pressing("f1"))

    def test_cautions_in_full(self, snap_compare, scratch, size):
        """F9: the cautions in full, one per line."""
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=pressing("f9"))

    def test_report_path(self, snap_compare, scratch, size):
        """F8: the report's path, its suffix naming the format."""
        assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=size, run_before=pressing("f8"))
