"""The help (F1) lists every key of the workbench, each written as it is pressed ("<", not
"less_than_sign"), and a long description wraps under itself, never under the keys."""

from __future__ import annotations

from rich.console import Console
from textual.binding import Binding
from textual.screen import ModalScreen

from oddsbench.tui.app import help_areas
from oddsbench.tui.screens.help import bindings_text, key_text
from tests.tui.test_key_fuzz import _widget_classes


def rendered(width: int) -> str:
    console = Console(width=width, record=True, color_system=None)
    console.print(bindings_text(help_areas()))
    return console.export_text()


def test_every_key_of_the_workbench_is_in_the_help():
    listed = {(binding.key, binding.description) for _, bindings in help_areas() for binding in bindings}
    listed_keys = {binding.key for _, bindings in help_areas() for binding in bindings}
    for cls in _widget_classes():
        if issubclass(cls, ModalScreen):
            continue  # a dialog says its own keys
        for binding in cls.__dict__.get("BINDINGS", []):
            if isinstance(binding, Binding) and binding.description:
                assert (binding.key, binding.description) in listed or binding.key in listed_keys, (
                    cls.__name__,
                    binding.key,
                    binding.description,
                )


def test_keys_are_written_as_they_are_pressed():
    assert key_text("less_than_sign") == "<"
    assert key_text("plus,equals_sign") == "+ / ="
    assert key_text("ctrl+up") == "Ctrl+Up"
    assert key_text("space") == "Space"
    text = rendered(76)
    for raw in ("_sign", "_bracket", "minus", "space "):
        assert raw not in text, raw
    for shown in ("Strategy table", "Deck", "Rule earlier", "Take one out"):
        assert shown in text, shown


def test_a_long_description_wraps_under_itself_in_a_narrow_help():
    lines = rendered(60).splitlines()
    escape = next(index for index, line in enumerate(lines) if line.lstrip().startswith("Esc "))
    first, second = lines[escape], lines[escape + 1]
    column = first.index("Cancel")
    assert second[:column].strip() == "", "the wrapped words start under the description, not under the keys"
