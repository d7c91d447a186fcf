"""The workbench screen, one concept per module: the screen (``screen.py``: the open file, views,
keys, edits) with its mixins (``edit_view.py``, ``figure_views.py``, ``jobs.py``, ``saving.py``),
where its widgets sit (``layout.py``), what the background jobs run (``background.py``), the recovery
copy (``recovery.py``) and the list's commands (``commands.py``)."""

from oddsbench.tui.screens.workbench.screen import WorkbenchScreen

__all__ = ["WorkbenchScreen"]
