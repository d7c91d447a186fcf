"""The recovery copies of unsaved edits: claimed at open, offered back, written after each edit,
dropped once saved or given up (the files and the lock are ``model/recovery.py``)."""

from __future__ import annotations

from collections.abc import Callable
from pathlib import Path

from textual.app import App

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.recovery import (
    Claim,
    claim_recovery,
    discard_copy,
    discard_recovery,
    find_recovery,
    keep_copy,
    write_recovery,
)
from oddsbench.tui.editing import EditSession
from oddsbench.tui.screens.dialogs import Choose


class RecoveryCopy:
    """The copies one workbench keeps for its open file. It claims the path first: while another
    live workbench holds it, this one writes, offers and removes nothing. A copy that cannot be
    written is said once, not after every keystroke."""

    def __init__(self) -> None:
        self.path: Path | None = None  # the path whose live copy this workbench wrote
        self.failed = False
        self.claim: Claim | None = None
        self.claimed: Path | None = None

    def claim_for(self, path: Path) -> Claim:
        """This workbench's claim on ``path`` (taken once; a claim on another path is given up)."""
        if self.claim is None or self.claimed != path:
            self.release()
            self.claim = claim_recovery(path)
            self.claimed = path
        return self.claim

    def sync(self, session: EditSession) -> str | None:
        """Write the copy while there are unsaved changes, drop it at the saved text.

        Returns a warning to show the first time a copy cannot be written, else None."""
        path = session.path
        if not (session.dirty and path is not None):
            self.drop()
            return None
        if self.path is not None and self.path != path:
            discard_recovery(self.path)
            self.path = None
        if not self.claim_for(path).owned:
            return None  # said when the file was opened: the other workbench keeps its own copy
        try:
            write_recovery(path, session.text, session.saved_text)
        except OddsbenchError as error:
            first = not self.failed
            self.failed = True
            return f"no recovery copy: {error}" if first else None
        self.path = path
        return None

    def drop(self) -> None:
        """The unsaved changes were saved or given up: their copy is no longer wanted."""
        if self.path is not None:
            discard_recovery(self.path)
            self.path = None

    def release(self) -> None:
        """Give up the claim (the screen closes, or another file is opened)."""
        if self.claim is not None:
            self.claim.release()
        self.claim = None
        self.claimed = None


def offer_recovery(app: App, copies: RecoveryCopy, session: EditSession, restored: Callable[[], None]) -> None:
    """If a killed session (or an earlier "keep") left unsaved edits of this file, offer them back,
    one copy after another; ``restored`` refreshes the screen after a restore."""
    path = session.path
    if path is None:
        return
    claim = copies.claim_for(path)
    if claim.problem:
        app.notify(claim.problem, severity="warning")
    if not claim.owned:
        holder = f"process {claim.holder}" if claim.holder else "another process"
        app.notify(
            f"{path.name} is open in another workbench ({holder}): its unsaved edits and their recovery copy "
            "stay its own; this one keeps no copy, and saving asks first if the file changed on disk",
            severity="warning",
            timeout=12,
        )
        return
    _offer_next(app, copies, session, restored, frozenset())


def _offer_next(
    app: App, copies: RecoveryCopy, session: EditSession, restored: Callable[[], None], answered_for: frozenset
) -> None:
    path = session.path
    found = find_recovery(path, session.saved_text, skip=answered_for)
    if found.problem:
        app.notify(found.problem, severity="warning")
    copy = found.copy
    if copy is None:
        return

    def answered(answer: str) -> None:
        if answer == "r":
            session.replace_text(copy.text, "restored unsaved edits")
            session.seal()
            restored()  # the edits are now the live copy of this workbench
            if copy.kept:
                discard_copy(copy)
            app.notify("unsaved edits restored: Ctrl+S saves them, Ctrl+Z takes them back")
            return
        if answer == "d":
            discard_copy(copy)
            app.notify("recovery copy discarded")
            _offer_next(app, copies, session, restored, answered_for | {copy.file})
            return
        try:
            kept = keep_copy(copy)
        except OddsbenchError as error:
            app.notify(str(error), severity="error")
            return
        app.notify("recovery copy kept aside: offered again next time; the file is shown as saved")
        _offer_next(app, copies, session, restored, answered_for | {kept.file})

    detail = f"{path}"
    if copy.disk_changed(session.saved_text):
        detail += "\nthe file changed on disk since: restoring replaces what is there now"
    when = copy.written_local()
    question = (
        f"Unsaved edits of {path.name} from {when}, kept aside earlier."
        if copy.kept
        else f"Unsaved edits of {path.name} from {when} were kept: that session ended unsaved."
    )
    app.push_screen(
        Choose(
            question,
            [("r", "Restore them"), ("d", "Discard the copy"), ("k", "Keep the copy, open as saved")],
            detail=detail,
        ),
        answered,
    )
