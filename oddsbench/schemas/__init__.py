"""JSON Schemas of every ``--json`` output (draft 2020-12), shipped with the package.

``schema("session")`` returns the schema of ``oddsbench session --json`` as a dict; the files are
``oddsbench/schemas/<command>.schema.json`` for solve, best, session, simulate, sweep, report, horizon and tune.
"""

from __future__ import annotations

import json
from importlib import resources

COMMANDS = ("solve", "best", "session", "simulate", "sweep", "report", "horizon", "tune")


def schema(command: str) -> dict:
    """The JSON Schema of one command's JSON output."""
    if command not in COMMANDS:
        raise ValueError(f"no schema for {command!r} (commands: {', '.join(COMMANDS)})")
    return json.loads(resources.files(__name__).joinpath(f"{command}.schema.json").read_text(encoding="utf-8"))
