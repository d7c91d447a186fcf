"""Checks on the raw TOML document before any ruleset is built: nesting depth and characters.

A shared file must not carry terminal control codes or the direction overrides that make text
display in a different order, in any key or text value; and its tables must not nest deeper than
``MAX_NESTING``. One walk over the document (no recursion) names each problem by its dotted path.
"""

from __future__ import annotations

from typing import Any

from oddsbench.model.errors import Problem, shown_name
from oddsbench.model.visible import first_unsafe

MAX_NESTING = 32


def document_problems(document: dict[str, Any], source: str) -> list[Problem]:
    """One walk over the raw document (no recursion): nesting depth and forbidden characters
    in every key and text value, each named by its dotted path."""
    problems: list[Problem] = []
    pending: list[tuple[str, Any, int]] = [("", document, 0)]
    while pending:
        path, value, depth = pending.pop()
        if depth > MAX_NESTING:
            problems.append(Problem(source, path[:120], f"nested more than {MAX_NESTING} levels deep"))
            continue
        if isinstance(value, dict):
            for key, item in value.items():
                step = f"{path}.{_path_key(key)}" if path else _path_key(key)
                bad = first_unsafe(key)
                if bad:
                    problems.append(Problem(source, step, f"the name contains the control character {bad}"))
                    continue
                pending.append((step, item, depth + 1))
        elif isinstance(value, list):
            pending.extend((f"{path}[{index}]", item, depth + 1) for index, item in enumerate(value, start=1))
        elif isinstance(value, str):
            bad = first_unsafe(value, multiline=True)
            if bad:
                problems.append(Problem(source, path, f"contains the control character {bad}"))
    return sorted(problems, key=lambda problem: problem.where)


def _path_key(key: str) -> str:
    plain = key.replace("-", "").replace("_", "").isalnum() and key.isascii()
    return key if plain else shown_name(key)
