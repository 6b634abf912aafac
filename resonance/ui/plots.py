"""Plotly figures drawn from study results (no physics here).

Each view has a builder that makes an empty figure with a fixed set of traces
and an updater that fills them from a result, so a live panel updates its
traces in place (``FigureWidget``) and a static record draws the same figure
(``go.Figure``).
"""

from __future__ import annotations

import html
import math
from collections.abc import Sequence
from typing import Protocol

import numpy as np
import plotly.graph_objects as go
from plotly.subplots import make_subplots

from ..checks.excitations import Excitation
from ..checks.interference import FindingsTable
from ..checks.margins import clear_band
from ..checks.speed_range import OperatingRange
from ..core.units import UnitSystem, display_unit
from ..dynamics.modes import Mode
from ..kinds.support.study import StudyResult
from ..kinds.support.whatif import ToleranceResult
from .toolkit import (
    CLEAR_BAND,
    FAIL,
    OPERATING,
    PASS,
    TOLERANCE,
    af_text,
    drawn,
    finished,
    html_table,
    styled,
    vertical_bands,
)

#: A logarithmic frequency axis, the interference diagram's option for drive trains.
LOG_FREQUENCY = (
    "A logarithmic frequency axis (drive trains: a coupling mode at 15 Hz and a gear mesh at 2 kHz on one diagram)."
)

__all__ = [
    "CheckedStudy",
    "response_figure",
    "update_response_figure",
    "interference_figure",
    "update_interference_figure",
    "modes_table_html",
    "findings_table_html",
]


class _CheckedScenario(Protocol):
    @property
    def speed(self) -> OperatingRange: ...

    @property
    def excitations(self) -> Sequence[Excitation]: ...


class CheckedStudy(Protocol):
    """What the interference diagram and the findings table read from any kind of study's result.

    Attributes
    ----------
    scenario : object
        With ``speed`` (an OperatingRange) and ``excitations``.
    modes : sequence of Mode
        The modes checked.
    findings : FindingsTable
        Their findings.
    """

    @property
    def scenario(self) -> _CheckedScenario:
        """The scenario checked."""

    @property
    def modes(self) -> Sequence[Mode]:
        """The modes checked."""

    @property
    def findings(self) -> FindingsTable:
        """Their findings."""


@drawn()
def response_figure(result: StudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Unbalance response, receptance and phase lag against speed.

    Three rows sharing the speed axis: unbalance response (displacement
    pk-pk), response per unit harmonic force (receptance magnitude), and
    phase lag; the operating speeds shaded, the speeds the range must keep
    clear of around each 1x coincidence shaded, and the half-power peak marked.
    """
    fig = make_subplots(rows=3, cols=1, shared_xaxes=True, vertical_spacing=0.06, row_heights=[0.42, 0.3, 0.28])
    fig.add_trace(go.Scatter(name="unbalance response", mode="lines", line={"color": "#1f4e9c"}), row=1, col=1)
    fig.add_trace(
        go.Scatter(name="peak (half-power)", mode="markers", marker={"size": 9, "color": "#1f4e9c"}), row=1, col=1
    )
    fig.add_trace(go.Scatter(name="per unit force", mode="lines", line={"color": "#6a4c93"}), row=2, col=1)
    fig.add_trace(go.Scatter(name="phase lag", mode="lines", line={"color": "#444444"}), row=3, col=1)
    styled(fig, 620, legend_y=None, showlegend=False)
    fig.update_xaxes(title_text="speed [rpm]", row=3, col=1)
    fig.update_yaxes(range=[0, 180], dtick=45, title_text="phase lag [deg]", row=3, col=1)
    update_response_figure(fig, result, system)
    # Wrap after filling: a FigureWidget sends later changes as messages to live views, so the data
    # must be in its initial state for a view that opens afterwards (Voila, a re-opened notebook).
    return finished(fig, widget)


@drawn()
def update_response_figure(fig: go.Figure, result: StudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`response_figure` from a result, in place."""
    d_unit, d_factor = display_unit("displacement", system)
    h_unit, h_factor = display_unit("receptance", system)
    pk_pk = 2.0 * result.displacement * d_factor
    clear = [
        clear_band(f.coincidence_speed, f.margin_rule, f.mode.amplification_factor)
        for f in result.findings
        if f.excitation.kind == "synchronous" and f.coincidence_speed is not None and f.margin_rule is not None
    ]
    shapes = vertical_bands(result.scenario.speed.intervals, OPERATING, (1, 2, 3))
    shapes += vertical_bands(clear, CLEAR_BAND, (1, 2, 3))
    with fig.batch_update():
        fig.data[0].update(x=result.speed, y=pk_pk)
        hp = result.half_power
        fig.data[1].update(
            x=[hp.peak_frequency] if hp else [],
            y=[2.0 * hp.peak_amplitude * d_factor] if hp else [],
            text=[f"AF {hp.amplification_factor:.1f}"] if hp else [],
        )
        fig.data[2].update(x=result.speed, y=result.receptance * h_factor)
        fig.data[3].update(x=result.speed, y=np.degrees(result.phase_lag))
        fig.layout.shapes = shapes
        for axis in (fig.layout.xaxis, fig.layout.xaxis2, fig.layout.xaxis3):
            axis.range = [float(result.speed[0]), float(result.speed[-1])]
        fig.layout.yaxis.title.text = f"unbalance response [{d_unit} pk-pk]"
        fig.layout.yaxis2.title.text = f"|H| [{h_unit}]"
        fig.layout.title.text = html.escape(result.scenario.title)


@drawn(log_frequency=LOG_FREQUENCY)
def interference_figure(
    result: CheckedStudy,
    system: UnitSystem = "SI",
    tolerance: ToleranceResult | None = None,
    widget: bool = False,
    log_frequency: bool = False,
) -> go.Figure:
    """Natural frequencies against speed with the excitation lines (an interference diagram).

    Order lines ``f = n N / 60`` and fixed-frequency sources as lines, natural
    frequencies as dashed lines, the operating speeds shaded, the speeds to keep
    clear around each coincidence shaded on its frequency, coincidences marked
    green (pass) or red (fail), and the tolerance band of each mode (when given)
    shaded grey.
    """
    fig = go.Figure()
    if log_frequency:
        fig.update_layout(yaxis_type="log")
    for excitation in result.scenario.excitations:
        fig.add_trace(go.Scatter(name=excitation.label, mode="lines", line={"width": 1.5}))
    for mode in result.modes:
        fig.add_trace(go.Scatter(name=mode.label, mode="lines", line={"dash": "dash", "color": "#555555", "width": 1}))
    fig.add_trace(
        go.Scatter(name="coincidences", mode="markers", marker={"size": 11, "symbol": "circle-open", "line_width": 3})
    )
    styled(fig, 480, legend_y=-0.18, xaxis_title="speed [rpm]")
    update_interference_figure(fig, result, system, tolerance)
    return finished(fig, widget)


@drawn()
def update_interference_figure(
    fig: go.Figure, result: CheckedStudy, system: UnitSystem = "SI", tolerance: ToleranceResult | None = None
) -> None:
    """Fill an :func:`interference_figure` from a result, in place."""
    f_unit, f_factor = display_unit("frequency", system)
    speed_max = result.scenario.speed.speed_max
    x_max = 1.4 * speed_max
    frequencies = [m.frequency for m in result.modes]
    fixed = [e.frequency for e in result.scenario.excitations if e.frequency is not None]
    top_order = max((e.order for e in result.scenario.excitations if e.order is not None), default=1.0)
    y_max = 1.25 * max([*frequencies, *fixed, top_order * speed_max / 60.0]) * f_factor
    shapes = vertical_bands(result.scenario.speed.intervals, OPERATING, (1,))
    xs, ys, colours, texts = [], [], [], []
    for finding in result.findings:
        if finding.coincidence_speed is None:
            continue
        n_c, f_n = finding.coincidence_speed, finding.mode.frequency * f_factor
        if finding.margin_rule is None:
            continue
        low, high = clear_band(n_c, finding.margin_rule, finding.mode.amplification_factor)
        shapes.append(
            {
                "type": "rect",
                "x0": low,
                "x1": min(high, 10 * x_max),
                "y0": 0.97 * f_n,
                "y1": 1.03 * f_n,
                "fillcolor": CLEAR_BAND,
                "line_width": 0,
                "layer": "below",
            }
        )
        if n_c <= x_max:
            xs.append(n_c)
            ys.append(f_n)
            colours.append(PASS if finding.passed else FAIL)
            texts.append(
                f"{finding.mode.label} x {finding.excitation.label}: SM {finding.margin:.1f} % "
                f"(required {finding.required_margin:.1f} %) {finding.verdict}"
            )
    if tolerance is not None:
        for low_f, high_f in tolerance.frequency_bands:
            shapes.append(
                {
                    "type": "rect",
                    "xref": "x domain",
                    "x0": 0,
                    "x1": 1,
                    "y0": low_f * f_factor,
                    "y1": high_f * f_factor,
                    "fillcolor": TOLERANCE,
                    "line_width": 0,
                    "layer": "below",
                }
            )
    log = fig.layout.yaxis.type == "log"
    # On a log axis an order line is a curve and 0 Hz is off the axis: draw it through many positive speeds.
    curved = log or any(e.law for e in result.scenario.excitations)  # a slip that follows the load bends a line
    x_line = np.linspace(x_max / 100.0, x_max, 100) if curved else np.array([0.0, x_max])
    with fig.batch_update():
        for i, excitation in enumerate(result.scenario.excitations):
            fig.data[i].update(x=x_line, y=excitation.frequency_at(x_line) * f_factor)
        offset = len(result.scenario.excitations)
        for i, mode in enumerate(result.modes):
            fig.data[offset + i].update(x=[0.0, x_max], y=[mode.frequency * f_factor] * 2)
        fig.data[-1].update(
            x=xs,
            y=ys,
            marker_color=colours,
            marker_line_color=colours,
            text=texts,
            hovertemplate="%{text}<extra></extra>",
        )
        fig.layout.shapes = shapes
        positive = [f * f_factor for f in [*frequencies, *fixed] if f > 0.0]
        if log:
            y_min = 0.5 * min(positive) if positive else y_max / 1000.0
            fig.layout.yaxis.range = [math.log10(y_min), math.log10(y_max)]
        else:
            fig.layout.yaxis.range = [0.0, y_max]
        fig.layout.xaxis.range = [0.0, x_max]
        fig.layout.yaxis.title.text = f"frequency [{f_unit}]"
        fig.layout.title.text = "Natural frequencies against excitations"


def _dec_af(m: Mode) -> tuple[str, str]:
    return f"{m.log_decrement:.3f}", af_text(m.amplification_factor)


@drawn(returns="The modes table's HTML.")
def modes_table_html(result: StudyResult, system: UnitSystem = "SI") -> str:
    """Modes as an HTML table: frequency, damping ratio, log decrement, AF."""
    f_unit, f_factor = display_unit("frequency", system)
    rows = [
        (m.label, f"{m.frequency * f_factor:.2f}", f"{m.speed:.0f}", f"{m.damping_ratio:.4f}", *_dec_af(m))
        for m in result.modes
    ]
    headers = ("mode", f"f<sub>n</sub> [{f_unit}]", "1x speed [rpm]", "damping ratio", "log dec.", "AF")
    return html_table("modes", headers, rows)


@drawn(returns="The findings table's HTML, worst first.")
def findings_table_html(result: CheckedStudy, system: UnitSystem = "SI") -> str:
    """The findings table, worst first, as HTML."""
    return result.findings.to_html(system=system)
