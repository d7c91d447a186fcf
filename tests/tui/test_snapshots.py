"""Snapshot tests of the main screens (pytest-textual-snapshot; update with --snapshot-update)."""

from __future__ import annotations

import shutil

import pytest

from oddsbench.tui.app import create_app
from tests.tui.helpers import RULESETS, settle


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


def test_edit_view_at_80x24(snap_compare, scratch):
    assert snap_compare(workbench(scratch, "lantern-dice.toml"), terminal_size=(80, 24), run_before=settle)


def test_round_view_at_100x30(snap_compare, scratch):
    async def round_view(pilot):
        await settle(pilot)
        await pilot.press("f3")
        await settle(pilot)

    assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=(100, 30), run_before=round_view)


def test_a_bad_value_shows_its_message_beside_the_field(snap_compare, scratch):
    async def bad_value(pilot):
        await settle(pilot)
        await pilot.press("enter", "enter", "end", "ctrl+u", *"8/3(")
        await settle(pilot)

    assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=(100, 30), run_before=bad_value)


def test_strategies_view_at_120x40(snap_compare, scratch):
    async def strategies(pilot):
        await settle(pilot)
        await pilot.press("f4")
        await settle(pilot)

    assert snap_compare(workbench(scratch, "lamplighter-ladder.toml"), terminal_size=(120, 40), run_before=strategies)


def test_help_screen(snap_compare, scratch):
    async def help_screen(pilot):
        await settle(pilot)
        await pilot.press("f1")
        await settle(pilot)

    assert snap_compare(workbench(scratch, "pass-line.toml"), terminal_size=(100, 30), run_before=help_screen)
