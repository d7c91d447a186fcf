"""The Sessions charts draw what the figures say (issue 13, round 3, item 5).

The timid plan on the single-zero wheel seemed to draw a second low branch near bankroll 160 to
190. The figures are right (the chance of the goal rises with the bankroll, one value per
bankroll) and so is the terminal's drawing; the screenshots were not: each run of text is placed at
its start and squeezed to its cells by ``textLength``, which librsvg ignores, and its fonts draw
braille wider than a cell, so a long run of the curve overran its cells. These tests hold the
drawing to one branch, and every braille cell of a screenshot to its own place."""

from __future__ import annotations

import asyncio
import re

from textual_plotext import PlotextPlot

from oddsbench.screenshots import Scene, for_any_viewer, take_all
from tests.tui.helpers import app_on, copy_ruleset, settle

ANSI = re.compile(r"\x1b\[[0-9;]*m")
BRAILLE = re.compile("[\u2800-\u28ff]")


def braille_rows_by_column(chart: str, legend: str) -> dict[int, list[int]]:
    """The rows holding braille dots in each column of the chart, the legend's lines left out."""
    rows: dict[int, list[int]] = {}
    for y, line in enumerate(ANSI.sub("", chart).splitlines()):
        if legend in line:
            continue
        for x, char in enumerate(line):
            if BRAILLE.match(char) and char != "\u2800":
                rows.setdefault(x, []).append(y)
    return rows


async def test_the_timid_goal_curve_is_one_branch_rising_with_the_bankroll(tmp_path):
    app = app_on(copy_ruleset("single-zero-wheel.toml", tmp_path), tmp_path)
    async with app.run_test(size=(120, 40)) as pilot:
        await settle(pilot)
        await pilot.press("f5")
        await settle(pilot)
        field = app.workbench.query_one("#plans-field")
        field.focus()
        await pilot.press("end", "ctrl+u", *"timid")
        await settle(pilot)
        series = app.workbench.sessions_result.series
        assert [s.plan for s in series] == ["timid"]
        chances = series[0].goal_chance
        assert list(chances) == sorted(chances) and len(set(series[0].bankrolls)) == len(chances)
        chart = app.workbench.query_one("#goal-chart", PlotextPlot)
        plt = chart.plt
        plt.plotsize(chart.size.width, chart.size.height)
        drawn = braille_rows_by_column(plt.build(), legend="timid")
    assert len(drawn) > 50
    for x, ys in drawn.items():
        assert ys == list(range(ys[0], ys[-1] + 1)), f"column {x}: braille on rows {ys}, not one run"


def test_every_braille_cell_of_a_screenshot_is_drawn_in_its_own_cell(tmp_path):
    (svg,) = asyncio.run(take_all(tmp_path, (Scene("sessions", "single-zero-wheel.toml", (120, 40), ("f5",)),)))
    text = svg.read_text()
    runs = re.findall(r'<text class="[^"]*" x="([\d.]+)" y="[\d.]+" textLength="([\d.]+)"[^>]*>([^<]*)</text>', text)
    braille = [(float(x), float(length), body) for x, length, body in runs if BRAILLE.search(body)]
    assert braille, "the sessions charts draw braille"
    cell = 12.2  # Textual's SVG cell width
    for x, length, body in braille:
        assert len(body) == 1 and abs(length - cell) < 0.01, (x, body)
        assert abs(x / cell - round(x / cell)) < 1e-3  # at its column


def test_a_run_of_braille_becomes_one_element_per_cell():
    run = '<svg x><text class="r1" x="24.4" y="20" textLength="36.6" clip-path="url(#l)">⣀&#160;⠉</text></svg>'
    fixed = for_any_viewer(run)
    assert fixed.count("<text ") == 3
    assert 'x="24.4"' in fixed and 'x="36.6"' in fixed and 'x="48.8"' in fixed
    assert ">&#160;</text>" in fixed and 'xml:space="preserve"' in fixed
    assert for_any_viewer(fixed) == fixed  # applied again, nothing changes
    plain = '<svg x><text class="r1" x="0" y="20" textLength="24.4" clip-path="url(#l)">ab</text></svg>'
    assert for_any_viewer(plain).count("<text ") == 1  # text that is not braille stays one run
