"""Random key presses on rulesets whose states come partly from families (the dealer rulesets,
Pig's turn, the ladder): whatever is pressed, the app keeps running, the file on disk is not
touched without a save, and the unsaved text is in the recovery copy: nothing is lost.

Seeded, so a failure replays exactly (the seed and the keys so far are in the message). The
default run is two seeds of 60 keys per ruleset; the long run, done by hand, sets the keys per
sequence (``ODDSBENCH_KEY_FUZZ=2000``) and the seeds per ruleset (``ODDSBENCH_KEY_FUZZ_SEEDS=100``:
300 sequences over the three rulesets).
Keys that write files or leave the app (Ctrl+S, F12, Ctrl+Q, Ctrl+O, Ctrl+N, the palette, F7, F8)
are not pressed: the invariant is about what an edit does, not about saving.
"""

from __future__ import annotations

import os
import random

import pytest

from oddsbench.model.recovery import find_recovery
from tests.tui.helpers import app_on, copy_ruleset, settle

KEYS_PER_RUN = int(os.environ.get("ODDSBENCH_KEY_FUZZ", "0")) or 60
SEEDS = range(1, 1 + (int(os.environ.get("ODDSBENCH_KEY_FUZZ_SEEDS", "0")) or 2))
MOVES = ["up", "down", "left", "right", "tab", "shift+tab", "enter", "escape", "home", "end", "pageup", "pagedown"]
EDITS = ["a", "e", "r", "d", "delete", "insert", "backspace", "ctrl+u", "ctrl+z", "ctrl+y", "ctrl+r"]
VIEWS = ["f2", "f3", "f4", "f5", "f6", "f9", "f1", "g", "s", "c", "k", "y", "n", "q"]
TYPED = list('xyzip019/-=. "[]')
FAMILY_RULESETS = ["dealer-stands-soft-17.toml", "pig-turn.toml", "lamplighter-ladder.toml"]


def key_sequence(seed: int, count: int) -> list[str]:
    """Keys weighted towards what reaches edits: moving about, then typing into what is focused."""
    chooser = random.Random(seed)
    pools = [(MOVES, 4), (EDITS, 2), (VIEWS, 1), (TYPED, 3)]
    keys: list[str] = []
    while len(keys) < count:
        pool = chooser.choices([p for p, _ in pools], weights=[w for _, w in pools])[0]
        keys.append(chooser.choice(pool))
    return keys


@pytest.mark.parametrize("seed", SEEDS)
@pytest.mark.parametrize("name", FAMILY_RULESETS)
async def test_random_keys_on_a_family_ruleset_lose_nothing(tmp_path, name, seed):
    path = copy_ruleset(name, tmp_path)
    on_disk = path.read_text()
    keys = key_sequence(seed * 1000 + FAMILY_RULESETS.index(name), KEYS_PER_RUN)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        for done, key in enumerate(keys, 1):
            await pilot.press(key)
            assert app.is_running, f"{name}, seed {seed}: the app ended after keys {keys[:done]}"
            if done % 20 == 0:
                await settle(pilot)
        await settle(pilot)
        assert app.is_running, f"{name}, seed {seed}: the app ended after keys {keys}"
        session = app.workbench.session
        assert path.read_text() == on_disk, f"{name}, seed {seed}: the file changed without a save: {keys}"
        copy = find_recovery(path, on_disk).copy
        if session.dirty:
            assert copy is not None and copy.text == session.text, f"{name}, seed {seed}: unsaved text not kept: {keys}"
        else:
            assert copy is None, f"{name}, seed {seed}: a copy is left with nothing unsaved: {keys}"


async def test_back_from_the_help_the_keys_go_to_the_view_shown_not_the_hidden_state_list(tmp_path):
    """Found by the fuzz (seed 3, dealer): with nothing focused in the Strategies view, closing the
    help gave the focus to the hidden state list; its Page Down ended the app, its d deletes a state."""
    path = copy_ruleset("dealer-stands-soft-17.toml", tmp_path)
    app = app_on(path, tmp_path)
    async with app.run_test(size=(100, 30)) as pilot:
        await settle(pilot)
        await pilot.press("f4")
        await settle(pilot)
        app.workbench.set_focus(None)  # as after the focused row went away
        await pilot.press("f1", "escape")
        await settle(pilot)
        assert app.focused is not None and app.focused in app.workbench.focus_chain
        await pilot.press("pagedown", "d", "y")
        await settle(pilot)
        assert app.is_running and app.workbench.session.text == path.read_text()
