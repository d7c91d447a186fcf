"""Where the bundled rulesets are, and which one the workbench opens first."""

from __future__ import annotations

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
    """TOML files in a folder the user works in (not recursive: a quick pick, not a search)."""
    try:
        return sorted(path for path in folder.glob("*.toml") if path.is_file())
    except OSError:
        return []
