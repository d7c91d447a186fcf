"""Regenerate ``screenshots/*.svg`` from the real workbench: ``python -m oddsbench.screenshots [FOLDER]``.

Each scene opens the app through the same factory as the CLI, drives it with the keyboard
(Textual's Pilot, headless) and saves what the terminal shows. A scratch copy of the bundled
rulesets is used, so nothing in the repository is edited.
"""

from __future__ import annotations

import asyncio
import os
import re
import shutil
import sys
import tempfile
from collections.abc import Awaitable, Callable
from dataclasses import dataclass
from pathlib import Path

from oddsbench.model.recovery import ENV_VAR as RECOVERY_ENV
from oddsbench.tui.app import create_app
from oddsbench.tui.bundled import bundled_folder

DEFAULT_FOLDER = Path(__file__).resolve().parent.parent / "screenshots"


@dataclass(frozen=True)
class Scene:
    name: str
    ruleset: str
    size: tuple[int, int]
    keys: tuple[str, ...] = ()
    state: str | None = None


SIZES = ((80, 24), (120, 40))
VIEWS = (  # (name, ruleset, keys): every view, each shown at every size in ``SIZES``
    ("edit", "lantern-dice.toml", ("enter", "enter", "tab", "end", "ctrl+u", "2")),  # a payout edited
    ("round", "lantern-dice.toml", ("f3",)),
    ("strategies", "pig-turn.toml", ("f4",)),
    ("sessions", "single-zero-wheel.toml", ("f5",)),
    ("source", "pass-line.toml", ("f6",)),
    ("simulation", "lantern-dice.toml", ("f7", *"20000", "tab", *"7", "enter")),
    ("horizon", "single-zero-wheel.toml", ("f10",)),
    ("help", "pass-line.toml", ("f1",)),
    ("cautions", "pass-line.toml", ("f9",)),
    ("bad-value", "pass-line.toml", ("enter", "enter", "end", "ctrl+u", *"8/3(")),
)
SCENES = tuple(
    Scene(f"{name}-{width}x{height}", ruleset, (width, height), keys)
    for name, ruleset, keys in VIEWS
    for width, height in SIZES
) + (
    Scene("wide-160x40", "pass-line.toml", (160, 40), ("down", "enter")),
    Scene("deck-120x40", "three-card-hands.toml", (120, 40), ("up", "enter", *["tab"] * 6, "down", "right", "minus")),
)


async def wait_for_workers(app) -> None:
    """Wait until no background job runs. A job cancelled by a newer one (the workbench's jobs are
    exclusive) is not an error; a job that failed is raised."""
    from textual.worker import WorkerFailed

    while pending := [worker for worker in app.workers if not worker.is_finished]:
        for outcome in await asyncio.gather(*(worker.wait() for worker in pending), return_exceptions=True):
            if isinstance(outcome, WorkerFailed):
                raise outcome


async def _settle(pilot) -> None:
    for _ in range(3):
        await pilot.pause()
        await wait_for_workers(pilot.app)
    await pilot.pause()


async def take(scene: Scene, folder: Path, scratch: Path) -> Path:
    source = scratch / scene.ruleset
    app = create_app(source, folder=scratch, cursor_blinks=False)
    async with app.run_test(size=scene.size) as pilot:
        await _settle(pilot)
        for key in scene.keys:
            await pilot.press(key)
            await _settle(pilot)
        await _settle(pilot)
        path = Path(app.save_screenshot(f"{scene.name}.svg", str(folder)))
    path.write_text(for_any_viewer(path.read_text(encoding="utf-8")), encoding="utf-8")
    return path


_RUN = re.compile(
    r'<text class="(?P<cls>[^"]*)" x="(?P<x>[\d.]+)" y="(?P<y>[\d.]+)" textLength="(?P<length>[\d.]+)"'
    r"(?P<rest>[^>]*)>(?P<text>[^<]*)</text>"
)
_CHAR = re.compile(r"&#?\w+;|.", re.DOTALL)  # one character of a run: an entity counts as one
_BRAILLE = re.compile("[\u2800-\u28ff]")


def for_any_viewer(svg: str) -> str:
    """The SVG so that any viewer draws it as the terminal showed it.

    Spaces are drawn as written: without ``xml:space``, viewers drop the spaces that begin a run of
    text ("State 'first-roll'  3 outcomes" would read "State 'first-roll'3 outcomes"). Runs of
    braille (the charts) get one element per cell: each run is placed at its start and squeezed to
    its cells by ``textLength``, which librsvg ignores; its fonts draw braille wider than a cell, so
    a long run of a chart's curve ran past its cells and drew a second, false branch (the Sessions
    chart of the timid plan on the single-zero wheel, near bankroll 160 to 190)."""
    if 'xml:space="preserve"' not in svg[:400]:
        svg = svg.replace("<svg ", '<svg xml:space="preserve" ', 1)

    def per_cell(run: re.Match) -> str:
        chars = _CHAR.findall(run["text"])
        if len(chars) < 2 or not _BRAILLE.search(run["text"]):
            return run[0]
        cell = float(run["length"]) / len(chars)
        x = float(run["x"])
        return "".join(
            f'<text class="{run["cls"]}" x="{x + i * cell:.5g}" y="{run["y"]}" textLength="{cell:.5g}"'
            f"{run['rest']}>{char}</text>"
            for i, char in enumerate(chars)
        )

    return _RUN.sub(per_cell, svg)


async def take_all(
    folder: Path, scenes: tuple[Scene, ...] = SCENES, step: Callable[[Path], Awaitable[None]] | None = None
):
    folder.mkdir(parents=True, exist_ok=True)
    written = []
    with tempfile.TemporaryDirectory() as scratch_name:
        scratch = Path(scratch_name)
        # Scenes leave unsaved edits: each scene's recovery copies stay in its own scratch folder, so
        # neither an earlier scene nor an old copy in the user's folder puts a dialog into a screenshot.
        before = os.environ.get(RECOVERY_ENV)
        try:
            for path in bundled_folder().glob("*.toml"):
                shutil.copy(path, scratch / path.name)
            for scene in scenes:
                os.environ[RECOVERY_ENV] = str(scratch / f".recovery-{scene.name}")
                written.append(await take(scene, folder, scratch))
        finally:
            if before is None:
                os.environ.pop(RECOVERY_ENV, None)
            else:
                os.environ[RECOVERY_ENV] = before
    return written


def main(argv: list[str] | None = None) -> int:
    args = sys.argv[1:] if argv is None else argv
    folder = Path(args[0]) if args else DEFAULT_FOLDER
    for path in asyncio.run(take_all(folder)):
        print(path)
    return 0


if __name__ == "__main__":
    sys.exit(main())
