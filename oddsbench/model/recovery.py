"""Recovery copies of unsaved workbench edits, so a killed session does not lose them.

One small JSON file per edited path, in a folder of its own (``ODDSBENCH_RECOVERY_DIR``, else
``$XDG_STATE_HOME/oddsbench/recovery``, else ``~/.local/state/oddsbench/recovery``). A copy holds
the absolute path, the unsaved text, the SHA-256 of the file's text when editing began and the
time it was written. Copies go through ``write_atomically``, so a kill mid-write leaves the last
whole copy; reading one never raises: a broken copy is reported as a one-line problem instead.
"""

from __future__ import annotations

import contextlib
import hashlib
import json
import os
from dataclasses import dataclass
from datetime import UTC, datetime
from pathlib import Path

from oddsbench.model.atomic_write import write_atomically
from oddsbench.model.errors import OddsbenchError

ENV_VAR = "ODDSBENCH_RECOVERY_DIR"
FORMAT = 1


@dataclass(frozen=True)
class RecoveryCopy:
    """Unsaved text of ``path``; ``disk_sha`` is the hash of the file's text when editing began."""

    path: str
    text: str
    disk_sha: str | None
    written: str  # ISO time, UTC

    def disk_changed(self, disk_text: str | None) -> bool:
        """Whether the file on disk is no longer the text the edits started from."""
        return self.disk_sha != text_sha(disk_text)

    def written_local(self) -> str:
        """When the copy was written, in local time, for a dialog."""
        try:
            return datetime.fromisoformat(self.written).astimezone().strftime("%Y-%m-%d %H:%M")
        except ValueError:
            return "an unknown time"


@dataclass(frozen=True)
class Lookup:
    """What was found for a path: a copy worth offering, or nothing, and a problem line if a copy was broken."""

    copy: RecoveryCopy | None = None
    problem: str | None = None


def recovery_folder() -> Path:
    override = os.environ.get(ENV_VAR)
    if override:
        return Path(override).expanduser()
    state = os.environ.get("XDG_STATE_HOME")
    base = Path(state).expanduser() if state else Path.home() / ".local" / "state"
    return base / "oddsbench" / "recovery"


def absolute(path: Path) -> str:
    try:
        return str(Path(path).expanduser().resolve())
    except OSError:
        return str(Path(path).expanduser().absolute())


def copy_path(path: Path) -> Path:
    """The copy's file for ``path``: named from a hash of the absolute path (any characters are safe)."""
    digest = hashlib.sha256(absolute(path).encode("utf-8")).hexdigest()[:32]
    return recovery_folder() / f"{digest}.json"


def text_sha(text: str | None) -> str | None:
    return None if text is None else hashlib.sha256(text.encode("utf-8")).hexdigest()


def write_recovery(path: Path, text: str, disk_text: str | None) -> Path:
    """Keep ``text`` as the recovery copy of ``path``. Raises OddsbenchError if it cannot be written."""
    target = copy_path(path)
    try:
        target.parent.mkdir(parents=True, exist_ok=True, mode=0o700)
    except OSError as error:
        raise OddsbenchError(f"{target.parent}: cannot hold recovery copies: {error.strerror or error}") from None
    record = {
        "format": FORMAT,
        "path": absolute(path),
        "text": text,
        "disk_sha256": text_sha(disk_text),
        "written": datetime.now(UTC).isoformat(timespec="seconds"),
    }
    return write_atomically(target, json.dumps(record, ensure_ascii=False), force=True)


def find_recovery(path: Path, disk_text: str | None) -> Lookup:
    """The copy of ``path`` worth offering: none if absent, for another path, or equal to ``disk_text``."""
    target = copy_path(path)
    try:
        raw = target.read_text(encoding="utf-8")
    except FileNotFoundError:
        return Lookup()
    except (OSError, UnicodeDecodeError) as error:
        return Lookup(problem=f"recovery copy {target} ignored: cannot be read ({error})")
    try:
        record = json.loads(raw)
        copy = RecoveryCopy(
            path=record["path"], text=record["text"], disk_sha=record["disk_sha256"], written=record["written"]
        )
        if not all(isinstance(value, str) for value in (copy.path, copy.text, copy.written)):
            raise TypeError("path, text and written must be text")
        if copy.disk_sha is not None and not isinstance(copy.disk_sha, str):
            raise TypeError("disk_sha256 must be text")
    except (ValueError, KeyError, TypeError) as error:
        return Lookup(problem=f"recovery copy {target} ignored: it is broken ({error})")
    if copy.path != absolute(path) or copy.text == disk_text:
        return Lookup()
    return Lookup(copy)


def discard_recovery(path: Path) -> None:
    """Remove the copy of ``path`` if there is one (a failure to remove is not worth stopping for)."""
    with contextlib.suppress(OSError):
        copy_path(path).unlink()
