"""The self-contained HTML record: text, tables and figures, readable offline.

plotly.js is embedded once, inline, so the file opens without a network.
"""

from __future__ import annotations

import html
import os
from collections.abc import Callable, Sequence
from pathlib import Path
from typing import Any

from ..kinds.field.study import FieldStudyResult
from ..kinds.rotor.kind import rotor_outcome
from ..kinds.rotor.study import RotorStudyResult
from ..kinds.support.kind import support_outcome
from ..kinds.support.study import StudyResult
from ..records.outcome import StudyOutcome
from ..records.record import CAUTION, Record
from ..records.tables import atomic_write
from .field_plots import bode_figure, impact_figure, polar_figure
from .plots import interference_figure, modes_table_html, response_figure
from .rotor_plots import campbell_figure, mode_shape_figure, rotor_response_figure, speed_map_figure
from .space_plots import space_modes_html, space_response_figure, space_shape_figure
from .toolkit import modes_to_draw
from .torsion_plots import torque_figure, torque_table_html, torsion_modes_html, torsion_shape_figure
from .uncertainty_plots import failure_probability_figure, sensitivity_figure, worst_margin_figure

__all__ = ["VIEWS", "render_fleet_html", "render_html", "render_outcome_html", "render_rotor_html", "write_html"]

_STYLE = """
body{font-family:system-ui,sans-serif;max-width:1100px;margin:24px auto;padding:0 16px;color:#222}
table{border-collapse:collapse;font-size:90%;margin:8px 0}td,th{border:1px solid #bbb;padding:3px 8px;text-align:left}
tr.fail td{background:#fde2e2}tr.pass td{background:#e6f4ea}.caution{background:#fff4e0;border-left:6px solid #e08a00;
padding:8px 12px}.verdict{font-size:120%;font-weight:bold}
pre{background:#f6f6f6;padding:8px;overflow-x:auto;font-size:85%;white-space:pre-wrap}
tr.exempt td{background:#fff4e0}table.revision td{min-width:9em}
@media print{
@page{size:A4;margin:15mm 12mm 18mm 12mm}
body{max-width:none;margin:0;padding:0;font-size:10pt;color:#000}
h1{font-size:15pt}h2{font-size:12pt;break-after:avoid;page-break-after:avoid}
table,pre,.caution,.verdict,.js-plotly-plot,.plotly-graph-div{break-inside:avoid;page-break-inside:avoid}
pre{white-space:pre-wrap;word-break:break-word;font-size:7.5pt;background:none;border:1px solid #999}
table{font-size:8pt}
tr.fail td,tr.pass td,tr.exempt td,.caution{-webkit-print-color-adjust:exact;print-color-adjust:exact}
.plotly-graph-div{max-width:100%}.modebar-container{display:none}
}
"""


def _page(
    title: str, passed: bool, summary: str, findings: str, tables: list[tuple[str, str]], figures: list, record: Record
) -> str:
    """A self-contained page: caution, verdict, findings, tables, figures (plotly.js inline once), record.

    One heading, one verdict and one caution at the top; the full text record below them without its own
    closing caution (the page's is at the top).
    """
    plots = [fig.to_html(full_html=False, include_plotlyjs=(i == 0)) for i, fig in enumerate(figures)]
    data = record.data
    verdict = str(data["verdict"])
    verdict_colour = "#d62828" if verdict == "FAIL" else ("#b36b00" if verdict != "PASS" else "#2a9d4b")
    rev = data["revision"]
    revision = (
        '<table class="revision"><tr><th>revision</th><th>date</th><th>prepared by</th><th>checked by</th>'
        "<th>scenario file</th><th>scenario SHA-256</th></tr><tr>"
        + "".join(
            f"<td>{html.escape(str(v or '-'))}</td>"
            for v in (
                rev["revision"],
                rev["date"],
                rev["preparer"],
                rev["checker"],
                data["scenario_file"],
                data["scenario_sha256"] or "none (edited in memory)",
            )
        )
        + "</tr></table>"
    )
    extra = "".join(f"<h2>{html.escape(heading)}</h2>{body}" for heading, body in tables)
    # One verdict at the top: the summary's own verdict line (with its reason) where it is the record's verdict.
    first, _, rest = summary.partition("\n")
    said = first.removeprefix("Verdict: ").split(" (", 1)[0]
    verdict_line, summary = (
        (first, rest.strip("\n"))
        if first.startswith("Verdict: ") and said == verdict
        else (
            f"Verdict: {verdict}",
            summary,
        )
    )
    return f"""<!DOCTYPE html>
<html lang="en"><head><meta charset="utf-8"><title>{html.escape(title)}</title>
<style>{_STYLE}</style></head><body>
<h1>{html.escape(title)}</h1>
{revision}
<p class="caution"><b>Caution.</b> {html.escape(CAUTION)}</p>
<p class="verdict" style="color:{verdict_colour}">{html.escape(verdict_line)}</p>
<pre>{html.escape(summary)}</pre>
<h2>Findings (worst first)</h2>{findings}
{extra}
<h2>Figures</h2>{"".join(plots)}
<h2>Assumptions</h2><ul>{"".join(f"<li>{html.escape(a)}</li>" for a in data["assumptions"])}</ul>
<h2>Methods and references</h2><ul>{
        "".join(f"<li>{html.escape(m['method'])} <i>[{html.escape(m['reference'])}]</i></li>" for m in data["methods"])
    }</ul>
<h2>Full text record</h2><pre>{html.escape(record.body)}</pre>
<p><small>Created {html.escape(data["created_utc"])} with {
        html.escape(", ".join(f"{k} {v}" for k, v in data["software"].items()))
    }.</small></p>
</body></html>
"""


def render_html(result: StudyResult, record: Record, field: FieldStudyResult | None = None) -> str:
    """The HTML record of a support study (figures with plotly.js inline), with its field verification.

    Parameters
    ----------
    result : StudyResult
        The support study to draw.
    record : Record
        The record the page shows in full.
    field : FieldStudyResult, optional
        The field verification, whose tables and figures are added.

    Returns
    -------
    str
        The support record's page: the record, its tables and figures.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    return render_outcome_html(support_outcome(result, field, record))


def render_rotor_html(result: RotorStudyResult, record: Record) -> str:
    """The HTML record of a rotor study.

    Parameters
    ----------
    result : RotorStudyResult
        The rotor study to draw.
    record : Record
        The record the page shows in full.

    Returns
    -------
    str
        The rotor record's page: the record, its tables and figures.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    return render_outcome_html(rotor_outcome(result, record))


def _support_view(outcome: StudyOutcome) -> tuple[list[tuple[str, str]], list]:
    result, field, system = outcome.result, outcome.field, outcome.units
    figures = [response_figure(result, system), interference_figure(result, system)]
    if field is not None:
        figures += [
            bode_figure(field, result.scenario, field.spec.channel, system),
            polar_figure(field, field.spec.channel, system),
            impact_figure(field),
        ]
    return [("Modes", modes_table_html(result, system))], figures + _uncertainty_figures(outcome)


def _rotor_view(outcome: StudyOutcome) -> tuple[list[tuple[str, str]], list]:
    result, system = outcome.result, outcome.units
    figures = [
        campbell_figure(result, system),
        rotor_response_figure(result, system),
        speed_map_figure(result, system),
        mode_shape_figure(result),
    ]
    return [], figures + _uncertainty_figures(outcome)


def _uncertainty_figures(outcome: StudyOutcome) -> list:
    u = outcome.uncertainty
    return [] if u is None else [worst_margin_figure(u), failure_probability_figure(u), sensitivity_figure(u)]


def _torsion_view(outcome: StudyOutcome) -> tuple[list[tuple[str, str]], list]:
    result, system = outcome.result, outcome.units
    tables = [("Torsional modes", torsion_modes_html(result, system))]
    figures = [interference_figure(result, system, log_frequency=True), torsion_shape_figure(result)]
    if result.torque is not None:
        tables.append(("Forced torque", torque_table_html(result, system)))
        figures.append(torque_figure(result, system))
    return tables, figures


def _space_view(outcome: StudyOutcome) -> tuple[list[tuple[str, str]], list]:
    result, system = outcome.result, outcome.units
    figures = [
        interference_figure(result, system, log_frequency=True),
        space_response_figure(result, system),
        # The governing mode and every failing finding's mode, whatever their rank (then the lowest, to three).
        *(space_shape_figure(result, i) for i in modes_to_draw(result.findings, result.modes)),
    ]
    return [("Modes in space", space_modes_html(result, system))], figures


#: Each kind of study's own tables (HTML, with a heading) and figures in its record (the presentation half of
#: the study registry); a kind without an entry shows its findings and record only.
VIEWS: dict[str, Callable[[StudyOutcome], tuple[list[tuple[str, str]], list]]] = {
    "support": _support_view,
    "rotor": _rotor_view,
    "torsion": _torsion_view,
    "space": _space_view,
}


def render_outcome_html(outcome: StudyOutcome) -> str:
    """The HTML record of any kind of study, from its outcome (its own tables and figures from :data:`VIEWS`).

    Parameters
    ----------
    outcome : StudyOutcome
        Any kind of study's outcome.

    Returns
    -------
    str
        The page of any kind's record, with the views its kind registers.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    system = outcome.units
    tables, figures = VIEWS.get(outcome.kind, lambda _: ([], []))(outcome)
    tables += [(heading, table.to_html(system=system)) for heading, table in outcome.tables]
    return _page(
        outcome.title,
        outcome.passed,
        outcome.summary,
        outcome.findings.to_html(system=system),
        tables,
        figures,
        outcome.record,
    )


def write_html(result: StudyResult, record: Record, path: str | os.PathLike[str]) -> Path:
    """Write the HTML record (through a temporary file: never a partial record).

    Parameters
    ----------
    result : StudyResult
        The support study to draw.
    record : Record
        The record the page shows in full.
    path : path-like
        The file to write.

    Returns
    -------
    pathlib.Path
        The self-contained HTML file (it opens offline).

    Raises
    ------
    OSError
        The file cannot be written (no partial file is left).
    """
    return atomic_write(path, render_html(result, record))


def _link(record: str | None) -> str:
    return "-" if not record else f'<a href="{html.escape(record)}">record</a>'


def render_fleet_html(rows: Sequence[Any]) -> str:
    """The fleet summary as one offline HTML page: machine, verdict, worst finding, margin, record link.

    Parameters
    ----------
    rows : sequence of FleetRow
        The machines (:func:`resonance.fleet.run_fleet`).

    Returns
    -------
    str
        HTML (no script: it opens anywhere).

    Raises
    ------
    Nothing
        Drawing only.
    """
    css = {"PASS": "pass", "PASS WITH EXEMPTION": "exempt", "FAIL": "fail", "BAD INPUT": "fail"}
    body = "".join(
        f"<tr class='{css.get(r.verdict, '')}'><td>{html.escape(r.title or Path(r.path).name)}</td>"
        f"<td>{html.escape(r.verdict)}</td><td>{html.escape(r.worst)}</td>"
        f"<td>{'-' if r.margin is None else f'{r.margin:.1f}'}</td>"
        f"<td>{'-' if r.required is None else f'{r.required:.1f}'}</td>"
        f"<td>{_link(r.record)}</td>"
        f"<td>{html.escape(r.path)}</td></tr>"
        for r in rows
    )
    failing = sum(r.verdict in ("FAIL", "BAD INPUT") for r in rows)
    return (
        f"<!DOCTYPE html><html><head><meta charset='utf-8'><title>Fleet summary</title><style>{_STYLE}</style>"
        f"</head><body><h1>Fleet summary: {len(rows)} machines, {failing} failing or bad input</h1>"
        f"<div class='caution'><b>Caution.</b> {html.escape(CAUTION)}</div>"
        "<table><thead><tr><th>machine</th><th>verdict</th><th>worst finding (or error)</th><th>SM [%]</th>"
        f"<th>required [%]</th><th>record</th><th>file</th></tr></thead><tbody>{body}</tbody></table></body></html>"
    )
