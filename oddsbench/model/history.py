"""Undo and redo for edits of a ruleset document, as a stack of whole-text snapshots.

Snapshots of the TOML text are small (rulesets are kilobytes) and make undo exact: what comes
back is byte for byte what was there, comments included. Keystrokes in one field merge into
one step, so undo takes back a whole edit of a field rather than one character.
"""

from __future__ import annotations

from dataclasses import dataclass

MAX_STEPS = 500


@dataclass(frozen=True)
class Step:
    """The document text after an edit, what the edit was, and the field it touched (for merging)."""

    text: str
    label: str
    field: str | None = None


class History:
    """A linear undo/redo history; a new edit after an undo drops the redo branch."""

    def __init__(self, text: str, limit: int = MAX_STEPS) -> None:
        self._steps: list[Step] = [Step(text, "opened")]
        self._position = 0
        self._limit = limit
        self._merge_open = False

    @property
    def current(self) -> str:
        return self._steps[self._position].text

    @property
    def can_undo(self) -> bool:
        return self._position > 0

    @property
    def can_redo(self) -> bool:
        return self._position < len(self._steps) - 1

    def record(self, text: str, label: str, field: str | None = None) -> None:
        """An edit happened. Consecutive edits of the same ``field`` become one step."""
        if text == self.current:
            return
        del self._steps[self._position + 1 :]
        top = self._steps[self._position]
        if field is not None and self._merge_open and top.field == field and self._position > 0:
            self._steps[self._position] = Step(text, top.label, field)
        else:
            self._steps.append(Step(text, label, field))
            if len(self._steps) > self._limit:
                del self._steps[0]
            self._position = len(self._steps) - 1
        self._merge_open = field is not None

    def merge_base(self, field: str) -> str | None:
        """The text before the current run of edits in ``field``, if the next edit would merge into it.

        Re-applying each keystroke to this base (instead of to the text after the previous
        keystroke) means a field that passes through an empty value while it is retyped comes
        back with its original layout.
        """
        top = self._steps[self._position]
        if self._merge_open and top.field == field and self._position > 0:
            return self._steps[self._position - 1].text
        return None

    def seal(self) -> None:
        """End merging: the next edit starts a new step even in the same field."""
        self._merge_open = False

    def undo(self) -> Step | None:
        """Go back one step; returns the step undone (its label says what), or None."""
        if not self.can_undo:
            return None
        undone = self._steps[self._position]
        self._position -= 1
        self._merge_open = False
        return undone

    def redo(self) -> Step | None:
        if not self.can_redo:
            return None
        self._position += 1
        self._merge_open = False
        return self._steps[self._position]
