"""A report as one JSON object: every figure exact (text) and decimal (number), in the shared envelope."""

from __future__ import annotations

from typing import Any

from oddsbench.report.document import ReportDocument
from oddsbench.report.json_output import envelope
from oddsbench.report.report_rows import comparison_rows
from oddsbench.report.round_report import round_result_json
from oddsbench.report.ruleset_echo import ruleset_json


def report_json(document: ReportDocument) -> dict[str, Any]:
    """``{"command": "report", "version", "ruleset", "rounds", "strategies_compared", "sessions", "sources", ...}``:
    the same keys whatever was asked (``strategies_compared`` and ``sessions`` are null when absent)."""
    rounds = [round_result_json(section.figures, section.strategy) for section in document.rounds]
    compared = None
    if document.compares_strategies:
        headers, rows = comparison_rows(document)
        compared = {"columns": headers, "rows": rows}
    sessions = None
    for extra in document.extra_sections:
        if extra.json_key == "sessions":
            sessions = extra.json_value()
    body: dict[str, Any] = {
        "generator": f"oddsbench {document.version}",
        "ruleset": ruleset_json(document.ruleset, document.content),
        "rounds": rounds,
        "strategies_compared": compared,
        "sessions": sessions,
        "sources": [{"topic": s.topic, "method": s.method, "reference": s.reference} for s in document.sources],
    }
    out = envelope("report", body)
    out["cautions"] = list(document.cautions)
    return out


def render_json(document: ReportDocument) -> str:
    import json

    return json.dumps(report_json(document), indent=2, ensure_ascii=False, allow_nan=False) + "\n"
