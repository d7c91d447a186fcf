"""Saving the open file: Ctrl+S and Save as, where Save as suggests, what it refuses, and what the
workbench says after."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from textual.app import App

from oddsbench.model.atomic_write import DiskChanged
from oddsbench.model.document import DocumentError
from oddsbench.model.errors import OddsbenchError, Problem
from oddsbench.tui.editing import EditSession
from oddsbench.tui.file_targets import path_problem
from oddsbench.tui.screens.dialogs import AskName, Choose


def suggested_path(session: EditSession, folder: Path) -> Path:
    """The file itself, unless it is bundled (then a copy in the working folder) or new."""
    path = session.path
    if path is not None and not session.read_only:
        return path
    return folder / path.name if path is not None else folder / "new-game.toml"


def ask_save_path(app: App, session: EditSession, folder: Path, save: Callable[[Path], object]) -> None:
    """Ask for a path, and before overwriting another existing file, then ``save`` to it."""

    def chosen(value: str | None) -> None:
        if not value:
            return
        target = Path(value).expanduser()
        if target.exists() and target != session.path:

            def answered(answer: str) -> None:
                if answer == "o":
                    save(target)

            app.push_screen(Choose(f"{target} exists. Overwrite it?", [("o", "Overwrite"), ("c", "Cancel")]), answered)
            return
        save(target)

    app.push_screen(AskName("Save as (path)", str(suggested_path(session, folder)), check=path_problem), chosen)


def saved_message(saved: Path, problems: tuple[Problem, ...]) -> tuple[str, str]:
    """The notification after a save and its severity: a file with errors is saved, and said so."""
    errors = [p for p in problems if p.is_error]
    message = f"saved {saved}"
    if errors:
        message += f" (with {len(errors)} problem(s): `oddsbench check` will report them)"
    return message, "warning" if errors else "information"


def ask_about_disk_change(
    app: App, message: str, overwrite: Callable[[], object], save_as: Callable[[], object]
) -> None:
    """Another program changed the file since it was opened or saved: overwrite it, save elsewhere, or leave it."""

    def answered(answer: str) -> None:
        if answer == "o":
            overwrite()
        elif answer == "a":
            save_as()

    app.push_screen(
        Choose(
            message.replace("; nothing was written", ""),
            [("o", "Overwrite it with these edits"), ("a", "Save as another file"), ("c", "Cancel")],
            detail="nothing was written yet; Cancel keeps your edits here, unsaved",
        ),
        answered,
    )


class Saving:
    """Ctrl+S and Save as (mixed into ``WorkbenchScreen``): what is said after, and the questions
    asked first (another program changed the file; another file is there)."""

    def action_save(self) -> None:
        if self.session.read_only:
            self.action_save_as()
            return
        self.save_to(None)

    def action_save_as(self) -> None:
        ask_save_path(self.app, self.session, self.folder, self.save_to)

    def save_to(self, path: Path | None, overwrite: bool = False) -> bool:
        """Save to ``path`` (None: the open file); True once written, else the user was told why."""
        try:
            saved = self.session.save(path, overwrite)
        except DiskChanged as changed:
            again = lambda: self.save_to(path, overwrite=True)  # noqa: E731
            ask_about_disk_change(self.app, str(changed), again, self.action_save_as)
            return False
        except (OddsbenchError, DocumentError) as error:
            self.notify(str(error), severity="error")
            return False
        message, severity = saved_message(saved, self.reading.problems if self.reading else ())
        self.notify(message, severity=severity)
        self.sync_recovery()
        self._update_topbar()
        return True
