"""A report as one JSON object (format 1): every figure exact (text) and decimal (number)."""

from __future__ import annotations

import json
from typing import Any

from oddsbench.report.document import ReportDocument
from oddsbench.report.report_rows import comparison_rows
from oddsbench.report.round_report import round_json
from oddsbench.report.ruleset_echo import ruleset_json

FORMAT_VERSION = 1


def report_json(document: ReportDocument) -> dict[str, Any]:
    rounds = []
    for section in document.rounds:
        body = round_json(section.figures, document.ruleset.title)
        body.pop("cautions", None)
        rounds.append({"strategy": section.strategy, **body})
    out: dict[str, Any] = {
        "report": {"generator": f"oddsbench {document.version}", "format": FORMAT_VERSION},
        "cautions": list(document.cautions),
        "ruleset": ruleset_json(document.ruleset, document.content),
        "rounds": rounds,
    }
    if document.compares_strategies:
        headers, rows = comparison_rows(document)
        out["strategies_compared"] = {"columns": headers, "rows": rows}
    for extra in document.extra_sections:
        out[extra.json_key] = extra.json_value()
    out["sources"] = [{"topic": s.topic, "method": s.method, "reference": s.reference} for s in document.sources]
    return out


def render_json(document: ReportDocument) -> str:
    return json.dumps(report_json(document), indent=2, ensure_ascii=False) + "\n"
