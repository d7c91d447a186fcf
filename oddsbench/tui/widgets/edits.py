"""The one message by which editors ask for a change: the app applies it and records it."""

from __future__ import annotations

from collections.abc import Callable

from textual.message import Message

from oddsbench.tui.editing import Edit


class EditRequested(Message):
    """Apply ``edit`` to the document. ``field`` merges keystrokes in one field into one undo step."""

    def __init__(
        self,
        edit: Edit,
        label: str,
        field: str | None = None,
        select: str | None = None,
        done: Callable[[object], str | None] | None = None,
    ) -> None:
        super().__init__()
        self.edit = edit
        self.label = label
        self.field = field
        self.select = select  # the navigator entry to show afterwards (a renamed or new state)
        self.done = done  # given the edit's result once it is made: a message to show, or None
