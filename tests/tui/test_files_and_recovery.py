"""Files and recovery copies under attack: nothing a user wrote is lost or silently overwritten,
and nothing a file holds drives the terminal or breaks the screen."""

from __future__ import annotations

import os

from textual.notifications import Notify

from oddsbench.model.recovery import claim_recovery, copy_path, find_recovery, kept_paths, write_recovery
from oddsbench.tui.screens.dialogs import Choose
from tests.tui.helpers import app_on, copy_ruleset, edit_field, go_to_state, settle

EDITED_ELSEWHERE = "# edited by the first workbench\n"


def notifications(into: list[str]):
    """A message hook that keeps every notification's text (Textual's public message hook)."""

    def hook(message) -> None:
        if isinstance(message, Notify):
            into.append(str(message.notification.message))

    return hook


async def test_a_second_workbench_on_a_file_is_told_and_leaves_the_first_ones_copy_alone(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    first = claim_recovery(path)  # the first workbench: its claim, and the copy of its unsaved edits
    write_recovery(path, original + EDITED_ELSEWHERE, original)
    messages: list[str] = []
    app = app_on(path, tmp_path)
    try:
        async with app.run_test(size=(100, 30), message_hook=notifications(messages)) as pilot:
            await settle(pilot)
            assert not isinstance(app.screen, Choose), "the first workbench's copy is not offered: it is alive"
            assert any(f"open in another workbench (process {os.getpid()})" in m for m in messages), messages
            await go_to_state(pilot, "point-4")
            await edit_field(pilot, 0, "note", "second workbench")
            await pilot.press("ctrl+z")
            await settle(pilot)
            await pilot.press("ctrl+q")
            await pilot.pause()
        copy = find_recovery(path, original).copy
        assert copy is not None and copy.text == original + EDITED_ELSEWHERE
    finally:
        first.release()


async def test_keep_means_keep_through_later_edits_and_undo(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    original = path.read_text()
    write_recovery(path, original + EDITED_ELSEWHERE, original)  # left by a killed session
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("k")
        await settle(pilot)
        (kept,) = kept_paths(path)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "note", "new edit")
        assert copy_path(path).exists(), "the new edits have their own copy"
        await pilot.press("ctrl+z")
        await settle(pilot)
        assert not app.workbench.session.dirty
        assert kept.exists(), "neither the next edit nor Ctrl+Z reaches the kept copy"
    again = app_on(path, tmp_path)
    async with again.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        assert isinstance(again.screen, Choose) and "kept aside earlier" in again.screen.question
        await pilot.press("r")
        await settle(pilot)
        assert again.workbench.session.text == original + EDITED_ELSEWHERE
        assert not kept.exists(), "a restored kept copy becomes the live one"


def _fifo_copy(target):
    os.mkfifo(target)


def _endless_copy(target):
    target.symlink_to("/dev/zero")


def _huge_copy(target):
    with open(target, "wb") as handle:
        handle.truncate(60_000_000)  # 60 MB, sparse: cheap to make, costly to read whole


async def test_copies_that_are_not_small_regular_files_are_ignored_and_the_keys_answer(tmp_path):
    for name, make, reason in (
        ("fifo", _fifo_copy, "named pipe"),
        ("zero", _endless_copy, "character device"),
        ("huge", _huge_copy, "over the limit"),
    ):
        folder = tmp_path / name
        folder.mkdir()
        path = copy_ruleset("pass-line.toml", folder)
        target = copy_path(path)
        target.parent.mkdir(parents=True, exist_ok=True)
        make(target)
        messages: list[str] = []
        app = app_on(path, folder)
        async with app.run_test(size=(100, 30), message_hook=notifications(messages)) as pilot:
            await settle(pilot)
            assert not isinstance(app.screen, Choose)
            assert any(m.startswith(f"recovery copy {target} ignored:") and reason in m for m in messages), messages
            await pilot.press("f6")
            await pilot.pause()
            assert app.workbench.query_one("#views").current == "source", "the keys still work"
        target.unlink()


async def test_save_asks_when_the_file_changed_on_disk_and_overwrites_only_when_told(tmp_path):
    path = copy_ruleset("pass-line.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "note", "mine")
        elsewhere = path.read_text() + "# added by another program\n"
        path.write_text(elsewhere)
        await pilot.press("ctrl+s")
        await pilot.pause()
        assert isinstance(app.screen, Choose) and "changed on disk" in app.screen.question
        await pilot.press("c")
        await settle(pilot)
        assert path.read_text() == elsewhere and app.workbench.session.dirty
        await pilot.press("ctrl+s")
        await pilot.pause()
        await pilot.press("o")
        await settle(pilot)
        assert path.read_text() == app.workbench.session.text and not app.workbench.session.dirty
        assert "mine" in path.read_text()
        await edit_field(pilot, 0, "note", "mine again")
        await pilot.press("ctrl+s")  # saved since: no question
        await settle(pilot)
        assert not isinstance(app.screen, Choose) and "mine again" in path.read_text()


async def test_saving_a_file_opened_through_a_link_writes_the_target_and_keeps_the_link(tmp_path):
    (tmp_path / "shared").mkdir()
    target = copy_ruleset("pass-line.toml", tmp_path / "shared")
    link = tmp_path / "pass-line.toml"
    link.symlink_to(target)
    app = app_on(link, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await go_to_state(pilot, "point-4")
        await edit_field(pilot, 0, "note", "through the link")
        await pilot.press("ctrl+s")
        await settle(pilot)
    assert link.is_symlink() and os.readlink(link) == str(target)
    assert "through the link" in target.read_text()


HOSTILE_TOML = r"""# A title, names and notes carrying terminal escapes and markup.
[ruleset]
title = "Coin \u001b]0;PWNED\u0007 [/b] title"
start = "toss"

[params]
"p\u001b[5m" = "1/2"

[states.toss]
outcomes = [
  { to = "heads\u001b[2J", prob = "1/2", pay = 1, note = "[/b] \u001b[5mblink\u001b[0m" },
  { to = "tails", pay = -1, note = "[bold]not bold" },
]

[states."heads\u001b[2J"]
result = "win [/]"

[states.tails]
result = "loss"

[strategies."s[/b]"]
"""


async def test_text_from_the_file_is_never_raw_on_screen(tmp_path):
    path = tmp_path / "hostile.toml"
    path.write_text(HOSTILE_TOML)
    broken = tmp_path / "broken.toml"
    broken.write_text("# \x1b]0;PWNED\x07 \x1b[2J\x1b[5mblink\n[ruleset\n")  # not TOML: opens in the Source view
    for opened in (path, broken):
        app = app_on(opened, tmp_path)
        async with app.run_test(size=(120, 40)) as pilot:
            await settle(pilot)
            for key in ("f2", "down", "down", "down", "down", "down", "f3", "f4", "f5", "f6"):
                await pilot.press(key)
                await settle(pilot)
                assert app.is_running
                shown = app.export_screenshot()
                assert "\x1b" not in shown and "\x07" not in shown, f"raw control character after {key}"
            if opened == broken:
                assert "\\x1b]0;PWNED\\x07" in app.workbench.query_one("#source-text").text
