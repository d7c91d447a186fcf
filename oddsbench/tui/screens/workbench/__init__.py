"""The workbench screen, one concept per module: the screen (``screen.py``: views, keys, edits and
showing results), where its widgets sit (``layout.py``), the background jobs (``background.py``),
saving (``saving.py``), the recovery copy (``recovery.py``) and the list's commands (``commands.py``)."""

from oddsbench.tui.screens.workbench.screen import WorkbenchScreen

__all__ = ["WorkbenchScreen"]
