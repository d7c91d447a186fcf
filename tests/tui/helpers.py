"""Shared steps for driving the workbench in Pilot tests."""

from __future__ import annotations

import shutil
from pathlib import Path

from oddsbench.screenshots import wait_for_workers
from oddsbench.tui.app import WorkbenchApp, create_app

ROOT = Path(__file__).resolve().parents[2]
RULESETS = ROOT / "rulesets"


def copy_ruleset(name: str, folder: Path) -> Path:
    target = folder / name
    shutil.copy(RULESETS / name, target)
    return target


def app_on(path: Path | None, folder: Path) -> WorkbenchApp:
    return create_app(path, folder=folder, cursor_blinks=False)


async def settle(pilot) -> None:
    """Let pending messages run and the background read and solve finish."""
    await pilot.pause()
    await wait_for_workers(pilot.app)
    await pilot.pause()
    await wait_for_workers(pilot.app)
    await pilot.pause()


def figure(app: WorkbenchApp, quantity: str) -> tuple[str, str]:
    """(exact, decimal) of the round's figure as the round view holds it (its detail pane shows them whole)."""
    return cell(app.workbench.result.table, quantity)


def cell(table, quantity: str, column: int = 0) -> tuple[str | None, str]:
    """(exact in full, decimal) of one figure of a view's table (report text, as the detail pane shows it)."""
    for row in table.rows:
        if row.label == quantity:
            shown = row.cells[column]
            return shown.exact, shown.decimal
    raise KeyError(quantity)


async def go_to_state(pilot, name: str) -> None:
    await go_to_entry(pilot, "state:" + name)


async def go_to_entry(pilot, entry: str) -> None:
    """Highlight one entry of the list on the left (``setup:``, ``params:``, ``session:``, ``state:NAME``)."""
    navigator = pilot.app.workbench.query_one("#navigator")
    navigator.focus()
    ids = [navigator.get_option_at_index(i).id for i in range(navigator.option_count)]
    navigator.highlighted = ids.index(entry)
    await settle(pilot)


async def edit_field(pilot, row: int, field: str, text: str) -> None:
    """Highlight outcome ``row`` in the table, then retype ``field`` with the keyboard."""
    screen = pilot.app.workbench
    table = screen.query_one("#outcomes")
    table.focus()
    table.move_cursor(row=row)
    await pilot.pause()
    screen.query_one(f"#field-{field}").focus()
    await pilot.press("end", "ctrl+u", *text)
    await settle(pilot)
