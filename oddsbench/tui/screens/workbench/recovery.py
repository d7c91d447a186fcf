"""The recovery copy of unsaved edits: written after each edit, dropped once saved or given up."""

from __future__ import annotations

from pathlib import Path

from oddsbench.model.errors import OddsbenchError
from oddsbench.model.recovery import discard_recovery, write_recovery
from oddsbench.tui.editing import EditSession


class RecoveryCopy:
    """The copy one workbench keeps for its open file. A copy that cannot be written is said once,
    not after every keystroke."""

    def __init__(self) -> None:
        self.path: Path | None = None  # the path whose copy this workbench wrote
        self.failed = False

    def sync(self, session: EditSession) -> str | None:
        """Write the copy while there are unsaved changes, drop it at the saved text.

        Returns a warning to show the first time a copy cannot be written, else None."""
        path = session.path
        if not (session.dirty and path is not None):
            self.drop()
            return None
        if self.path is not None and self.path != path:
            discard_recovery(self.path)
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
