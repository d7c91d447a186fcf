"""Ctrl+O: the open dialog offers rulesets only (not every TOML file) and takes a typed path."""

from __future__ import annotations

from textual.widgets import OptionList, Static

from oddsbench.tui.bundled import folder_rulesets
from oddsbench.tui.screens.open_file import OpenScreen
from tests.tui.helpers import app_on, copy_ruleset, settle


def project_folder(tmp_path):
    """A folder as a user has it: a ruleset, one with a TOML mistake, and TOML files that are not rulesets."""
    copy_ruleset("pass-line.toml", tmp_path)
    (tmp_path / "half-done.toml").write_text('[ruleset]\ntitle = "unfinished\n')
    (tmp_path / "pyproject.toml").write_text('[project]\nname = "mine"\nversion = "1"\n')
    (tmp_path / "notes.toml").write_text('ruleset = "not a table"\n')
    return tmp_path


def test_only_files_with_a_ruleset_table_are_offered(tmp_path):
    folder = project_folder(tmp_path)
    assert [path.name for path in folder_rulesets(folder)] == ["half-done.toml", "pass-line.toml"]


def offered(app) -> list[str]:
    options = app.screen.query_one(OptionList)
    return [str(options.get_option_at_index(i).id) for i in range(options.option_count)]


async def test_ctrl_o_lists_the_folders_rulesets_and_opens_a_typed_path(tmp_path):
    folder = project_folder(tmp_path)
    other = folder / "games"
    other.mkdir()
    copy_ruleset("field.toml", other)
    app = app_on(folder / "pass-line.toml", folder)
    async with app.run_test(size=(80, 24)) as pilot:
        await settle(pilot)
        await pilot.press("ctrl+o")
        await settle(pilot)
        assert isinstance(app.screen, OpenScreen)
        ids = offered(app)
        assert str(folder / "pass-line.toml") in ids and str(folder / "half-done.toml") in ids
        assert not any(name.endswith(("pyproject.toml", "notes.toml")) for name in ids)
        # a folder typed in lists its rulesets; a missing file is said inline and nothing closes
        await pilot.press("tab", *"games", "enter")
        await settle(pilot)
        assert str(other / "field.toml") in offered(app)
        await pilot.press("tab", "ctrl+u", *"nowhere.toml", "enter")
        await settle(pilot)
        message = str(app.screen.query_one("#open-message", Static).render())
        assert "nowhere.toml: no such file or folder" in message
        assert isinstance(app.screen, OpenScreen)
        await pilot.press("ctrl+u", *"field.toml", "enter")
        await settle(pilot)
        assert app.workbench.session.path == other / "field.toml"
