"""One open ruleset in the workbench: its path, its document, its history and whether it is saved.

Every edit is a function applied to the ``RulesetDocument``; the text after it is recorded in
the history, so undo, redo and the unsaved-changes guard all compare plain text.
"""

from __future__ import annotations

import tomllib
from collections.abc import Callable
from dataclasses import dataclass
from pathlib import Path

from tomlkit.exceptions import TOMLKitError

from oddsbench.model.atomic_write import OnDisk, write_text_atomically
from oddsbench.model.document import DocumentError, RulesetDocument, TomlPlace, parse_with_place
from oddsbench.model.errors import OddsbenchError
from oddsbench.model.file_read import FileRefused, read_text_capped
from oddsbench.model.history import History, Step
from oddsbench.model.load import MAX_FILE_BYTES
from oddsbench.model.toml_edits import LayoutError
from oddsbench.tui.bundled import is_bundled

Edit = Callable[[RulesetDocument], object]


@dataclass(frozen=True)
class EditOutcome:
    """What an edit did: whether the text changed, and the message to show if it was refused."""

    changed: bool
    refused: str | None = None
    result: object = None  # what the edit returned (a count of references changed, a new index)


class EditSession:
    """The open file. ``document`` is None while the text is not valid TOML (edit it as source)."""

    def __init__(self, text: str, path: Path | None, saved: bool = True) -> None:
        self.path = path
        self.history = History(text)
        self.saved_text: str | None = text if saved else None
        self.disk = OnDisk(text if saved else None)  # the file as read or last written: a save checks it still is
        self.document: RulesetDocument | None = None
        self.toml_place: TomlPlace | None = None  # where the text stops being TOML (None when it is TOML)
        self._load(text)

    @classmethod
    def open(cls, path: Path) -> EditSession:
        try:
            text = read_text_capped(path, MAX_FILE_BYTES, "is a folder, not a ruleset file")
        except FileRefused as refused:
            raise OddsbenchError(f"{path}: {refused}") from None
        return cls(text, path)

    @property
    def source(self) -> str:
        return self.path.name if self.path else "new ruleset"

    @property
    def text(self) -> str:
        return self.history.current

    @property
    def dirty(self) -> bool:
        return self.text != self.saved_text

    @property
    def read_only(self) -> bool:
        """Bundled rulesets are not overwritten: saving one asks for a new path."""
        return self.path is None or is_bundled(self.path)

    def apply(self, edit: Edit, label: str, field: str | None = None) -> EditOutcome:
        """Run one edit on the document and record it; a refused edit changes nothing."""
        if self.document is None:
            return EditOutcome(False, "the file is not valid TOML: fix it in the source view first")
        before = self.text
        base = self.history.merge_base(field) if field is not None else None
        if base is not None:
            self._load(base)
        try:
            if self.document is None:
                raise DocumentError("the file is not valid TOML")
            result = edit(self.document)
        except DocumentError as error:
            self._load(before)
            return EditOutcome(False, str(error))
        except (LayoutError, TOMLKitError, AttributeError, TypeError, KeyError, IndexError, ValueError) as error:
            # tomlkit meets a layout it cannot edit in place: refuse the edit, keep every byte
            self._load(before)
            return EditOutcome(False, _layout_refusal(error))
        after = self.document.text()
        try:
            tomllib.loads(after)  # what tomlkit wrote must read back as TOML, or the edit is not made
        except tomllib.TOMLDecodeError as error:
            self._load(before)
            return EditOutcome(False, _layout_refusal(error))
        self.history.record(after, label, field)
        return EditOutcome(after != before, None, result)

    def replace_text(self, text: str, label: str = "source edit") -> None:
        """The whole text edited by hand (the source view)."""
        self.history.record(text, label, "source")
        self._load(text)

    def undo(self) -> Step | None:
        step = self.history.undo()
        if step is not None:
            self._load(self.text)
        return step

    def redo(self) -> Step | None:
        step = self.history.redo()
        if step is not None:
            self._load(self.text)
        return step

    def seal(self) -> None:
        self.history.seal()

    def save(self, path: Path | None = None, overwrite: bool = False) -> Path:
        """Write the text atomically to ``path`` (or the file's own path) and mark it saved.

        Saving over the file's own path raises ``DiskChanged`` when another program changed it
        since it was opened or last saved, unless ``overwrite`` (the user said so)."""
        target = path or self.path
        if target is None:
            raise OddsbenchError("no file name: use save as")
        own = self.path is not None and target == self.path
        write_text_atomically(target, self.text, expect=None if overwrite or not own else self.disk)
        self.disk = OnDisk(self.text)
        self.path = target
        self.saved_text = self.text
        self.history.seal()
        return target

    def _load(self, text: str) -> None:
        self.document, self.toml_place = parse_with_place(text)
        if self.document is None and self.toml_place is None:
            self.toml_place = TomlPlace(1, 1, "nested too deeply")

    @property
    def toml_message(self) -> str | None:
        """Why the text is not TOML, with its line and column; the same words in every view."""
        place = self.toml_place
        if self.document is not None or place is None:
            return None
        return f"not valid TOML at line {place.line}, column {place.column}: {place.reason}"


def _layout_refusal(error: Exception) -> str:
    return f"this file's layout cannot take that edit ({type(error).__name__}): make it in the Source view (F6)"
