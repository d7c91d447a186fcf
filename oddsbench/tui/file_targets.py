"""Where the workbench may write a file (Save as, a report): one rule for every path it asks for."""

from __future__ import annotations

from pathlib import Path


def path_problem(value: str) -> str | None:
    """Why the typed path cannot be written to, or None."""
    if not value:
        return "a file name is needed"
    target = Path(value).expanduser()
    if target.is_dir():
        return f"{value} is a folder"
    if not target.parent.is_dir():
        return f"no folder {target.parent}"
    return None
