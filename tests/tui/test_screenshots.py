"""The screenshot script runs against the real app and writes one SVG per scene."""

from __future__ import annotations

import asyncio

from oddsbench.screenshots import SCENES, take_all


def test_screenshot_script_writes_every_scene(tmp_path):
    written = asyncio.run(take_all(tmp_path, SCENES[:2]))
    assert [path.name for path in written] == [f"{scene.name}.svg" for scene in SCENES[:2]]
    for path in written:
        content = path.read_text()
        assert (
            content.startswith("<svg")
            and "These figures are mathematics, not advice.".replace(" ", "&#160;") in content
        )
