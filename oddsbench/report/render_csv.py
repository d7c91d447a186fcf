"""A report as CSV in long form: one figure per row, so any spreadsheet or script reads it back.

Columns: section, subject, quantity, exact, decimal, note. Exact values are full rationals
("7/495"); decimals are Python's shortest round-trip text of the float.
"""

from __future__ import annotations

import csv
import io

from oddsbench.model.numbers import text, to_float
from oddsbench.report.document import ReportDocument
from oddsbench.report.numbers_text import csv_decimal
from oddsbench.report.report_rows import param_items, round_figure_items, strategy_label
from oddsbench.report.return_table_report import return_table_csv_rows
from oddsbench.report.ruleset_echo import file_digest, outcome_rows

COLUMNS = ("section", "subject", "quantity", "exact", "decimal", "note")


def render_csv(document: ReportDocument) -> str:
    ruleset = document.ruleset
    rows: list[tuple[str, str, str, str, str, str]] = [
        ("report", "oddsbench", "version", "", "", document.version),
        ("ruleset", ruleset.title, "source", "", "", ruleset.source),
        ("ruleset", ruleset.title, "sha256", "", "", file_digest(document.content)),
        ("ruleset", ruleset.title, "start", "", "", ruleset.start),
        ("ruleset", ruleset.title, "stake", text(ruleset.stake), repr(to_float(ruleset.stake)), ""),
    ]
    rows += [("param", name, "value", exact, repr(decimal), "") for name, exact, decimal in param_items(document)]
    for r in outcome_rows(ruleset):
        subject = f"{r.state} [{r.action}] -> {r.to}" if r.action else f"{r.state} -> {r.to}"
        for quantity, value in (("prob", r.prob), ("pay", r.pay), ("stake", r.stake)):
            rows.append(("outcome", subject, quantity, text(value), repr(to_float(value)), r.note))
    for s in ruleset.strategies:
        for state, action in s.actions:
            rows.append(("strategy", s.name, state, "", "", action))
        if s.default:
            rows.append(("strategy", s.name, "default", "", "", s.default))
    for section in document.rounds:
        subject = strategy_label(section)
        for key, _label, f in round_figure_items(section):
            exact = "" if f.exact is None else text(f.exact)
            rows.append(("round", subject, key, exact, csv_decimal(f), ""))
        rows += return_table_csv_rows(section.figures, subject)
        rows += [("note", subject, "", "", "", note) for note in section.figures.notes]
    for extra in document.extra_sections:
        rows += extra.csv_rows()
    rows += [("source", s.topic, "", "", "", f"{s.method} {s.reference}") for s in document.sources]
    rows += [("caution", str(i), "", "", "", line) for i, line in enumerate(document.cautions, start=1)]
    buffer = io.StringIO()
    writer = csv.writer(buffer, lineterminator="\n")
    writer.writerow(COLUMNS)
    writer.writerows(rows)
    return buffer.getvalue()
