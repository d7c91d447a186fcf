"""The envelope of every ``--json`` output: the command, the shape's version, and only finite numbers.

Each command has one shape whatever the number of plans, strategies or start states (a single
one is a list of one); its JSON Schema is ``oddsbench/schemas/<command>.schema.json``. Strict
parsers reject NaN and Infinity, so a decimal that is not finite becomes null, with a note naming
it (the exact value, where there is one, stands beside it).
"""

from __future__ import annotations

import json
import math
from typing import Any

from oddsbench import __version__
from oddsbench.model.defaults import JSON_VERSION
from oddsbench.report.cautions import CAUTIONS


def envelope(command: str, body: dict[str, Any], notes: list[str] | None = None) -> dict[str, Any]:
    """``{"command", "version", "oddsbench", **body, "notes", "cautions"}`` with every number finite."""
    out: dict[str, Any] = {"command": command, "version": JSON_VERSION, "oddsbench": __version__}
    out.update(body)
    all_notes = list(notes or []) + list(body.get("notes", []))
    cleaned = finite(out, "", all_notes)
    cleaned["notes"] = all_notes
    cleaned["cautions"] = list(CAUTIONS)
    return cleaned


def finite(value: Any, where: str, notes: list[str]) -> Any:
    """``value`` with every NaN or infinite float replaced by None, one note per replacement."""
    if isinstance(value, float) and not math.isfinite(value):
        notes.append(
            f"{where or 'a decimal'}: the decimal is {value!r}, beyond the float range; it is null here "
            "(the exact value, where given, stands)"
        )
        return None
    if isinstance(value, dict):
        return {key: finite(item, f"{where}.{key}" if where else str(key), notes) for key, item in value.items()}
    if isinstance(value, (list, tuple)):
        return [finite(item, f"{where}[{i}]", notes) for i, item in enumerate(value)]
    return value


def dumps(document: dict[str, Any]) -> str:
    """The JSON text as the commands print it: ASCII only (escapes for the rest), never NaN or Infinity."""
    return json.dumps(document, indent=2, allow_nan=False)
