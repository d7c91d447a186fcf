"""Text from files made safe to show: control and escape sequences become visible, never sent.

A comment, a name, a recovery copy or a path can carry the terminal's escape character (which
can retitle the window, clear the screen, make text blink) or the direction overrides that make
text display in another order. The reader refuses them in a ruleset's names and values
(``first_unsafe``); everything shown (the command line's output, every text in the workbench)
passes through ``visible``, which writes each such character as its escape (``\\x1b``,
``\\u202e``). This module is the one copy of which characters those are.
"""

from __future__ import annotations

_LINE_BREAKS = "\t\n\r"
_UNSAFE = (
    [*range(0x00, 0x20), *range(0x7F, 0xA0)]  # C0 controls, DEL, C1 controls (0x9b starts a sequence too)
    + [*range(0x202A, 0x202F), *range(0x2066, 0x206A)]  # direction embeddings, overrides and isolates
)
_ESCAPES = {code: f"\\x{code:02x}" if code < 0x100 else f"\\u{code:04x}" for code in _UNSAFE}


def is_unsafe(character: str, multiline: bool = False) -> bool:
    """Whether one character may not be shown as it is (tab and line breaks pass in ``multiline`` text)."""
    if multiline and character in _LINE_BREAKS:
        return False
    return ord(character) in _ESCAPES


def first_unsafe(value: str, multiline: bool = False) -> str | None:
    """``U+001B`` for the first character that may not be shown as it is, or None."""
    for character in value:
        if is_unsafe(character, multiline):
            return f"U+{ord(character):04X}"
    return None


_SINGLE_LINE = str.maketrans(_ESCAPES)
_MULTI_LINE = str.maketrans({**_ESCAPES, ord("\t"): "\t", ord("\n"): "\n"})


def visible(text: str, multiline: bool = False) -> str:
    """``text`` with every control and direction character written as its escape (``\\x1b``).

    ``multiline`` keeps tabs, newlines and Windows line ends (a lone carriage return is shown:
    it can overwrite a line on a terminal).
    """
    if not multiline:
        return text.translate(_SINGLE_LINE)
    return "\r\n".join(part.translate(_MULTI_LINE) for part in text.split("\r\n"))  # Windows line ends stay
