"""Unsaved edits survive a killed session (recovery copies) and are never lost by opening another file."""

from __future__ import annotations

import asyncio
import os
import signal
import subprocess
import sys
import time

import pytest
from textual.notifications import Notify

from oddsbench.model.recovery import copy_path, find_recovery
from oddsbench.tui.screens.dialogs import AskName, Choose
from oddsbench.tui.screens.open_file import OpenScreen
from tests.tui.helpers import ROOT, app_on, copy_ruleset, edit_field, figure, go_to_state, settle

# Pass line: house edge 7/495 (Epstein, The Theory of Gambling and Statistical Logic, ch. on dice (from memory)).
PASS_LINE_EDGE = "7/495"
# Point of 4 made with chance 1/2 instead of 1/3: 7/495 - 1/36 = -3/220 (worked by hand, as in test_workbench).
EDITED_EDGE = "-3/220"


async def _edit_point_4(pilot) -> None:
    await settle(pilot)
    await go_to_state(pilot, "point-4")
    await edit_field(pilot, 0, "prob", "6/36")
    await edit_field(pilot, 2, "prob", "24/36")


async def _leave_unsaved_edits(path, folder) -> str:
    """A session edits ``path`` and ends without its quit path (as a killed process would)."""
    app = app_on(path, folder)
    async with app.run_test(size=(100, 30)) as pilot:
        await _edit_point_4(pilot)
        assert figure(app, "house edge")[0] == EDITED_EDGE
        edited = app.workbench.session.text
        assert copy_path(path).exists(), "each unsaved edit is kept in the recovery copy"
    return edited


async def test_recovery_copy_offered_after_a_killed_session(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    edited = await _leave_unsaved_edits(path, tmp_path)
    assert path.read_text() == original
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(app.screen, Choose)
        assert "Unsaved edits of pass-line.toml" in app.screen.question
        assert "changed on disk" not in app.screen.detail
        await pilot.press("r")
        await settle(pilot)
        session = app.workbench.session
        assert session.text == edited
        assert session.dirty, "restored edits are not saved until the user saves"
        assert figure(app, "house edge")[0] == EDITED_EDGE
        assert path.read_text() == original
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert session.text == original and not session.dirty
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE
        assert not copy_path(path).exists(), "back at the saved text, the copy goes"


async def test_discarding_the_offered_copy_removes_it_and_shows_the_saved_file(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    await _leave_unsaved_edits(path, tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("d")
        await settle(pilot)
        assert not copy_path(path).exists()
        assert app.workbench.session.text == original and not app.workbench.session.dirty
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE


async def test_keeping_the_copy_opens_the_saved_file_and_offers_it_again_next_time(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    edited = await _leave_unsaved_edits(path, tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("k")
        await settle(pilot)
        assert not app.workbench.session.dirty
        await pilot.press("ctrl+q")
        await pilot.pause()
        assert app.return_code is not None  # the app was told to exit
    assert find_recovery(path, path.read_text()).copy.text == edited


async def test_a_file_changed_on_disk_since_the_copy_is_said_so_in_the_offer(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    await _leave_unsaved_edits(path, tmp_path)
    path.write_text(path.read_text().replace("# Come-out roll", "# Changed elsewhere. Come-out roll"))
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(app.screen, Choose)
        assert "the file changed on disk since" in app.screen.detail


async def test_a_broken_copy_is_ignored_and_said_so(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    target = copy_path(path)
    target.parent.mkdir(parents=True, exist_ok=True)
    target.write_text("{ not json")
    app = app_on(path, tmp_path)
    messages = []  # every notification the app posts, seen through Textual's public message hook

    def hook(message) -> None:
        if isinstance(message, Notify):
            messages.append(str(message.notification.message))

    async with app.run_test(size=(100, 30), message_hook=hook) as pilot:
        await settle(pilot)
        assert not isinstance(app.screen, Choose)
        assert any(m.startswith(f"recovery copy {target} ignored: it is broken") for m in messages)
        assert figure(app, "house edge")[0] == PASS_LINE_EDGE


async def test_saving_removes_the_recovery_copy(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await _edit_point_4(pilot)
        assert copy_path(path).exists()
        await pilot.press("ctrl+s")
        await settle(pilot)
        assert not copy_path(path).exists()


async def test_discarding_at_quit_removes_the_recovery_copy(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await _edit_point_4(pilot)
        await pilot.press("ctrl+q")
        await pilot.pause()
        await pilot.press("d")
        await pilot.pause()
        assert app.return_code is not None  # the app was told to exit
    assert not copy_path(path).exists()


async def test_a_bundled_game_edited_and_abandoned_is_offered_back(tmp_path):
    app = app_on(None, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        demo = app.workbench.session.path
        await edit_field(pilot, 0, "note", "kept for later")
        assert app.workbench.session.dirty
    assert "kept for later" not in demo.read_text()
    again = app_on(None, tmp_path)
    async with again.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(again.screen, Choose)
        await pilot.press("r")
        await settle(pilot)
        assert "kept for later" in again.workbench.session.text
        await pilot.press("ctrl+z")
        await settle(pilot)
    assert not copy_path(demo).exists()


async def _open_from_the_list(pilot, path) -> None:
    await pilot.press("ctrl+o")
    await pilot.pause()
    assert isinstance(pilot.app.screen, OpenScreen)
    options = pilot.app.screen.query_one("#open-list")
    options.highlighted = options.get_option_index(str(path))
    await pilot.press("enter")
    await pilot.pause()


async def test_opening_another_file_with_unsaved_changes_asks_first(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    other = copy_ruleset("single-zero-wheel.toml", tmp_path)
    original = path.read_text()
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await _edit_point_4(pilot)
        await _open_from_the_list(pilot, other)
        assert isinstance(app.screen, Choose) and app.screen.question == "There are unsaved changes."
        await pilot.press("c")
        await settle(pilot)
        assert app.workbench.session.path == path and app.workbench.session.dirty
        await _open_from_the_list(pilot, other)
        await pilot.press("d")
        await settle(pilot)
        assert app.workbench.session.path == other
        assert not copy_path(path).exists(), "discarded edits leave no recovery copy"
    assert path.read_text() == original


async def test_a_new_ruleset_with_unsaved_changes_asks_first_and_save_keeps_them(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await _edit_point_4(pilot)
        await pilot.press("ctrl+n")
        await pilot.pause()
        assert isinstance(app.screen, AskName)
        await pilot.press("enter")
        await pilot.pause()
        assert isinstance(app.screen, Choose) and app.screen.question == "There are unsaved changes."
        await pilot.press("s")
        await settle(pilot)
        assert app.workbench.session.path == tmp_path / "new-game.toml"
    assert 'prob = "24/36"' in path.read_text()
    assert not copy_path(path).exists()


# A real process: the workbench runs headless in a child, edits, and is killed with SIGKILL, so no
# exit code of any kind runs; the next workbench on the same file must offer the edits back.
KILLED_SESSION = """
import asyncio, sys
from pathlib import Path
from tests.tui.helpers import ROOT, app_on, edit_field, go_to_state, settle

path, ready = Path(sys.argv[1]), Path(sys.argv[2])

async def edit_then_wait(pilot):
    await settle(pilot)
    await go_to_state(pilot, "point-4")
    await edit_field(pilot, 0, "prob", "6/36")
    await edit_field(pilot, 2, "prob", "24/36")
    part = ready.with_suffix(".part")
    part.write_text(pilot.app.workbench.session.text)
    part.rename(ready)
    await asyncio.sleep(600)

app_on(path, path.parent).run(headless=True, size=(100, 30), auto_pilot=edit_then_wait)
"""


@pytest.mark.skipif(not hasattr(signal, "SIGKILL"), reason="needs SIGKILL")
async def test_recovery_copy_offered_after_a_process_killed_with_sigkill(tmp_path, recovery_folder):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    ready = tmp_path / "ready.txt"
    env = {**os.environ, "PYTHONPATH": str(ROOT), "ODDSBENCH_RECOVERY_DIR": str(recovery_folder)}
    child = subprocess.Popen(
        [sys.executable, "-c", KILLED_SESSION, str(path), str(ready)],
        env=env,
        cwd=tmp_path,
        stdout=subprocess.DEVNULL,
        stderr=subprocess.PIPE,
    )
    try:
        deadline = time.monotonic() + 90  # generous for a loaded machine; about 3 s when idle
        while not ready.exists() and child.poll() is None and time.monotonic() < deadline:
            await asyncio.sleep(0.1)
    finally:
        if child.poll() is None:
            child.send_signal(signal.SIGKILL)
        child.wait(timeout=30)
        errors = child.stderr.read()
        child.stderr.close()
    assert ready.exists(), f"the child workbench did not finish its edits: {errors[-2000:]!r}"
    assert child.returncode == -signal.SIGKILL
    edited = ready.read_text()
    assert path.read_text() == original
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(app.screen, Choose)
        await pilot.press("r")
        await settle(pilot)
        assert app.workbench.session.text == edited and app.workbench.session.dirty
        assert figure(app, "house edge")[0] == EDITED_EDGE
