"""Where the bundled rulesets are, and which one the workbench opens first."""

from __future__ import annotations

import re
import tomllib
from pathlib import Path

DEMO_PREFERENCE = ("lantern-dice.toml", "pass-line.toml")


def bundled_folder() -> Path:
    """The ``rulesets/`` folder shipped beside the package."""
    return Path(__file__).resolve().parents[2] / "rulesets"


def bundled_rulesets() -> list[Path]:
    folder = bundled_folder()
    return sorted(folder.glob("*.toml")) if folder.is_dir() else []


def demo_ruleset() -> Path | None:
    """The game the workbench opens on when given no file."""
    found = bundled_rulesets()
    for name in DEMO_PREFERENCE:
        for path in found:
            if path.name == name:
                return path
    return found[0] if found else None


def is_bundled(path: Path) -> bool:
    try:
        return path.resolve().parent == bundled_folder()
    except OSError:
        return False


def folder_rulesets(folder: Path) -> list[Path]:
    """Rulesets in a folder the user works in (not recursive: a quick pick, not a search): TOML files
    that read as a ruleset or at least have a ``[ruleset]`` table, so ``pyproject.toml`` is not offered."""
    try:
        found = sorted(path for path in folder.glob("*.toml") if path.is_file())
    except OSError:
        return []
    return [path for path in found if looks_like_ruleset(path)]


_RULESET_HEADER = re.compile(r"^\s*\[\s*ruleset\s*\]", re.MULTILINE)


def looks_like_ruleset(path: Path) -> bool:
    """A ``[ruleset]`` table in the file (read capped; text that is not TOML yet counts when the
    header is there: a broken ruleset is still one to open and fix)."""
    from oddsbench.model.file_read import FileRefused, read_text_capped
    from oddsbench.model.load import MAX_FILE_BYTES

    try:
        text = read_text_capped(path, MAX_FILE_BYTES)
    except FileRefused:
        return False
    try:
        return isinstance(tomllib.loads(text).get("ruleset"), dict)
    except (tomllib.TOMLDecodeError, RecursionError):
        return _RULESET_HEADER.search(text) is not None
