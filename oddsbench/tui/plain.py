"""Text from a file (or typed by a user) as the workbench shows it: plain, visible, never interpreted.

Rich and Textual read ``[bold]`` in a string as markup (``[/b]`` with nothing open even raises),
and a terminal acts on the escape character. Every name, value, note, path or message that did
not come from this program's own wording goes on screen through ``plain``: a ``Text`` (no markup
parsing) whose control characters are written as escapes by ``model.visible``.
"""

from __future__ import annotations

from rich.text import Text

from oddsbench.model.visible import visible


def plain(text: str, style: str = "", multiline: bool = True) -> Text:
    """``text`` as a Rich ``Text``: no markup, control and escape sequences shown as ``\\x1b``."""
    return Text(visible(text, multiline=multiline), style=style)
