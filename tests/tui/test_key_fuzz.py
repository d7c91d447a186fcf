"""Random key presses never end the workbench, never raise, and never leave a document or a file broken.

Hypothesis draws a ruleset, a terminal size (80x24 or 120x40), a view to start in (which also sets
the focus: F2 the state list, F3 to F7 each view's first widget), then a sequence of keys: every
binding of the app, its screens and its widgets (read from the classes, so a new binding is fuzzed
the day it lands), printable keys, Tab, Shift+Tab, Enter, Esc, arrows, and pauses that let the
background jobs finish mid-sequence. Quitting (Ctrl+Q, Ctrl+C) is left out: it ends the app by design.

After each sequence:
- the app is still running and no exception reached Textual;
- the document changed only through its history: undoing every step gives back the text it opened with;
- every file the workbench could have written is whole: the open file on disk is its last saved text.

The default run is short (``EXAMPLES`` below, well under a minute); the long run is
``ODDSBENCH_KEY_FUZZ_EXAMPLES=400 python -m pytest tests/tui/test_key_fuzz.py -n 0``.
"""

from __future__ import annotations

import asyncio
import importlib
import os
import pkgutil
import shutil
import tempfile
from pathlib import Path

from hypothesis import HealthCheck, given, settings
from hypothesis import strategies as st
from textual.binding import Binding
from textual.dom import DOMNode

import oddsbench.tui
from oddsbench.model.recovery import ENV_VAR as RECOVERY_ENV
from oddsbench.screenshots import wait_for_workers
from oddsbench.tui.app import create_app
from tests.tui.helpers import RULESETS

EXAMPLES = int(os.environ.get("ODDSBENCH_KEY_FUZZ_EXAMPLES", "12"))
RULESET_NAMES = ("lantern-dice.toml", "pig-turn.toml", "single-zero-wheel.toml", "lamplighter-ladder.toml")
SIZES = ((80, 24), (120, 40))
QUIT_KEYS = {"ctrl+q", "ctrl+c", "super+c"}
PAUSE = "<pause>"
# Printable keys: letters, digits and the characters of values and plans. No "/", "~" or "\": a typed
# path stays inside the scratch folder the test runs in.
PRINTABLE = list("abcdefghijklmnopqrstuvwxyz0123456789") + [
    "full_stop",
    "comma",
    "colon",
    "minus",
    "plus",
    "space",
    "left_parenthesis",
    "right_parenthesis",
    "asterisk",
    "quotation_mark",
    "left_square_bracket",
    "right_square_bracket",
]
MOVES = ["tab", "shift+tab", "enter", "escape", "up", "down", "left", "right", "home", "end", "backspace"]
MOVES += ["pageup", "pagedown", "delete", "ctrl+u"]


def _widget_classes() -> list[type]:
    """Every class of the workbench that can hold bindings (imported so none is missed)."""
    for module in pkgutil.walk_packages(oddsbench.tui.__path__, "oddsbench.tui."):
        importlib.import_module(module.name)
    found, pending = [], [DOMNode]
    while pending:
        cls = pending.pop()
        for sub in cls.__subclasses__():
            pending.append(sub)
            if sub.__module__.startswith("oddsbench.tui"):
                found.append(sub)
    return found


def binding_keys() -> list[str]:
    """Every key bound by the workbench's app, screens and widgets, Quit left out."""
    keys = set()
    for cls in _widget_classes():
        for binding in cls.__dict__.get("BINDINGS", []):
            if isinstance(binding, Binding):
                keys.update(key.strip() for key in binding.key.split(","))
    return sorted(keys - QUIT_KEYS)


BINDING_KEYS = binding_keys()
ALPHABET = BINDING_KEYS + PRINTABLE + MOVES + [PAUSE]
START_VIEWS = ("f2", "f3", "f4", "f5", "f6", "f7", "f10")


async def _settle(pilot) -> None:
    await pilot.pause()
    await wait_for_workers(pilot.app)
    await pilot.pause()


async def play(name: str, size: tuple[int, int], start: str, keys: list[str], folder: Path) -> None:
    path = folder / name
    opened = path.read_text(encoding="utf-8")
    app = create_app(path, folder=folder, cursor_blinks=False)
    async with app.run_test(size=size) as pilot:
        await _settle(pilot)
        await pilot.press(start)
        for key in keys:
            if key == PAUSE:
                await _settle(pilot)
            else:
                await pilot.press(key)
        await _settle(pilot)
        assert app.return_code is None and app.is_running, f"the app ended after {keys}"
        session = app.workbench.session
        if session.path is not None and session.path.exists() and not session.read_only:
            assert session.path.read_text(encoding="utf-8") == session.saved_text
        if session.path == path:
            text = session.text
            while session.undo() is not None:
                text = session.text
            assert text == opened, "undoing every step does not give back the text the file opened with"


@settings(
    max_examples=EXAMPLES,
    deadline=None,
    derandomize=EXAMPLES <= 12,  # the default run is the same every time; the long run explores
    suppress_health_check=[HealthCheck.too_slow, HealthCheck.data_too_large],
)
@given(
    name=st.sampled_from(RULESET_NAMES),
    size=st.sampled_from(SIZES),
    start=st.sampled_from(START_VIEWS),
    keys=st.lists(st.sampled_from(ALPHABET), min_size=1, max_size=40),
)
def test_random_keys_never_end_the_workbench(name, size, start, keys):
    with tempfile.TemporaryDirectory() as scratch_name:
        scratch = Path(scratch_name)
        for ruleset in RULESET_NAMES:
            shutil.copy(RULESETS / ruleset, scratch / ruleset)
        before_dir, before_env = Path.cwd(), os.environ.get(RECOVERY_ENV)
        os.chdir(scratch)  # a typed path (save as, report) lands here
        os.environ[RECOVERY_ENV] = str(scratch / ".recovery")
        try:
            asyncio.run(play(name, size, start, keys, scratch))
        finally:
            os.chdir(before_dir)
            if before_env is None:
                os.environ.pop(RECOVERY_ENV, None)
            else:
                os.environ[RECOVERY_ENV] = before_env


def test_the_fuzz_presses_every_binding_of_the_workbench():
    """The alphabet holds each view's key, the report and cautions keys and the tables' own keys."""
    for key in "f1 f2 f3 f4 f5 f6 f7 f8 f9 f10 f12 ctrl+s ctrl+z ctrl+r c g".split():
        assert key in BINDING_KEYS, key
    assert not QUIT_KEYS & set(BINDING_KEYS)
