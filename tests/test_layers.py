"""The layer contract of DEVELOPERS.md: each package imports only from the layers below it."""

from __future__ import annotations

import re

from conftest import ROOT

RANK = {"model": 0, "chain": 1, "solve": 2, "strategy": 3, "simulate": 4, "sweep": 4, "report": 5, "cli": 6, "tui": 6}
IMPORT = re.compile(r"^\s*(?:from|import) (oddsbench\.(\w+)|textual\b)", re.M)


def imports_by_layer():
    for path in sorted((ROOT / "oddsbench").rglob("*.py")):
        layer = path.relative_to(ROOT / "oddsbench").parts[0]
        if layer in RANK:
            for match in IMPORT.finditer(path.read_text(encoding="utf-8")):
                yield path.relative_to(ROOT), layer, match.group(2) or "textual"


def test_no_layer_imports_a_layer_above_it():
    upward = [
        (str(path), layer, other)
        for path, layer, other in imports_by_layer()
        if other in RANK and RANK[other] > RANK[layer] and not (layer == "cli" and other == "tui")
    ]
    assert upward == []


def test_only_the_workbench_and_its_launcher_import_textual():
    users = {(layer, str(path)) for path, layer, other in imports_by_layer() if other == "textual"}
    assert {layer for layer, _ in users} <= {"tui"}
