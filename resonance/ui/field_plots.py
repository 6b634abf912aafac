"""Plotly figures of field verification: Bode (amplitude and phase against speed) and polar views."""

from __future__ import annotations

import numpy as np
import plotly.graph_objects as go
from plotly.subplots import make_subplots

from ..core.units import UnitSystem, display_unit
from ..kinds.field.study import FieldStudyResult
from ..kinds.support.scenario import Scenario
from .toolkit import FAIL, OPERATING, PASS, drawn, finished, styled, vertical_bands

__all__ = [
    "bode_figure",
    "update_bode_figure",
    "polar_figure",
    "update_polar_figure",
    "impact_figure",
    "update_impact_figure",
]


def _curves(
    result: FieldStudyResult, channel: str
) -> tuple[np.ndarray, np.ndarray, np.ndarray | None, np.ndarray | None]:
    data = result.coastdown
    x = data.channel(channel)
    if result.fit is None:
        return data.speed, x, None, None
    fine = np.linspace(result.fit.speed[0], result.fit.speed[-1], 400)
    return data.speed, x, fine, result.fit.evaluate(fine)


@drawn()
def bode_figure(
    result: FieldStudyResult, scenario: Scenario, channel: str, system: UnitSystem = "SI", widget: bool = False
) -> go.Figure:
    """Measured amplitude (pk-pk) and phase lag against speed, the fitted model overlaid, resonances marked."""
    fig = make_subplots(rows=2, cols=1, shared_xaxes=True, vertical_spacing=0.08, row_heights=[0.6, 0.4])
    fig.add_trace(go.Scatter(name="measured", mode="markers", marker={"size": 4, "color": "#1f4e9c"}), row=1, col=1)
    fig.add_trace(go.Scatter(name="fitted model", mode="lines", line={"color": "#c2410c"}), row=1, col=1)
    fig.add_trace(go.Scatter(name="resonances", mode="markers", marker={"size": 12, "symbol": "x"}), row=1, col=1)
    fig.add_trace(
        go.Scatter(name="measured phase", mode="markers", marker={"size": 4, "color": "#1f4e9c"}, showlegend=False),
        row=2,
        col=1,
    )
    fig.add_trace(
        go.Scatter(name="fitted phase", mode="lines", line={"color": "#c2410c"}, showlegend=False), row=2, col=1
    )
    styled(fig, 540, legend_y=-0.15, title_text="Coast-down: amplitude and phase")
    fig.update_xaxes(title_text="speed [rpm]", row=2, col=1)
    fig.update_yaxes(title_text="phase lag [deg]", row=2, col=1)
    update_bode_figure(fig, result, scenario, channel, system)
    return finished(fig, widget)


@drawn()
def update_bode_figure(
    fig: go.Figure, result: FieldStudyResult, scenario: Scenario, channel: str, system: UnitSystem = "SI"
) -> None:
    """Fill a :func:`bode_figure` in place."""
    unit, factor = display_unit("displacement", system)
    speed, x, fine, fitted = _curves(result, channel)
    verdicts = [f.passed for f in result.findings] if result.findings is not None else []
    confirmed = [r for r in result.resonances if r.confirmed]
    with fig.batch_update():
        fig.data[0].update(x=speed, y=2 * np.abs(x) * factor)
        fig.data[1].update(
            x=fine if fine is not None else [], y=2 * np.abs(fitted) * factor if fitted is not None else []
        )
        fig.data[2].update(
            x=[r.speed for r in confirmed],
            y=[2 * r.amplitude * factor for r in confirmed],
            marker_color=[PASS if ok else FAIL for ok in verdicts] or None,
            text=[
                f"{r.speed:.0f} rpm, AF {r.amplification_factor:.1f}"
                if r.amplification_factor
                else f"{r.speed:.0f} rpm"
                for r in confirmed
            ],
            hovertemplate="%{text}<extra></extra>",
        )
        fig.data[3].update(x=speed, y=np.degrees(result.coastdown.phase_lag(channel)))
        fig.data[4].update(
            x=fine if fine is not None else [], y=np.degrees(np.unwrap(-np.angle(fitted))) if fitted is not None else []
        )
        fig.layout.shapes = vertical_bands(scenario.speed.intervals, OPERATING, (1, 2))
        fig.layout.yaxis.title.text = f"amplitude [{unit} pk-pk]"


@drawn()
def polar_figure(result: FieldStudyResult, channel: str, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """The response in the complex plane (Nyquist / polar view), measured and fitted."""
    fig = go.Figure()
    fig.add_trace(go.Scatter(name="measured", mode="markers", marker={"size": 4, "color": "#1f4e9c"}))
    fig.add_trace(go.Scatter(name="fitted model", mode="lines", line={"color": "#c2410c"}))
    styled(
        fig, 460, legend_y=None, width=520, title_text="Polar view (lag measured clockwise)", yaxis={"scaleanchor": "x"}
    )
    update_polar_figure(fig, result, channel, system)
    return finished(fig, widget)


@drawn()
def update_polar_figure(fig: go.Figure, result: FieldStudyResult, channel: str, system: UnitSystem = "SI") -> None:
    """Fill a :func:`polar_figure` in place."""
    unit, factor = display_unit("displacement", system)
    speed, x, _, fitted = _curves(result, channel)
    with fig.batch_update():
        fig.data[0].update(
            x=x.real * factor,
            y=x.imag * factor,
            text=[f"{s:.0f} rpm" for s in speed],
            hovertemplate="%{text}<extra></extra>",
        )
        fig.data[1].update(
            x=fitted.real * factor if fitted is not None else [], y=fitted.imag * factor if fitted is not None else []
        )
        fig.layout.xaxis.title.text = f"real [{unit}, 0-peak]"
        fig.layout.yaxis.title.text = f"imaginary [{unit}, 0-peak]"


@drawn()
def impact_figure(result: FieldStudyResult, widget: bool = False) -> go.Figure:
    """Impact test: ``|receptance|`` (H1) and coherence against frequency, the identified modes marked."""
    fig = make_subplots(rows=2, cols=1, shared_xaxes=True, vertical_spacing=0.08, row_heights=[0.7, 0.3])
    fig.add_trace(go.Scatter(name="|H1| (receptance)", mode="lines", line={"color": "#1f4e9c"}), row=1, col=1)
    fig.add_trace(
        go.Scatter(name="identified modes", mode="markers", marker={"size": 11, "symbol": "x", "color": "#c2410c"}),
        row=1,
        col=1,
    )
    fig.add_trace(go.Scatter(name="coherence", mode="lines", line={"color": "#444444"}, showlegend=False), row=2, col=1)
    styled(fig, 440, legend_y=-0.2, title_text="Impact test: H1 and coherence")
    fig.update_yaxes(type="log", title_text="|H| [m/N]", row=1, col=1)
    fig.update_yaxes(range=[0, 1.05], title_text="coherence", row=2, col=1)
    fig.update_xaxes(title_text="frequency [Hz]", row=2, col=1)
    update_impact_figure(fig, result)
    return finished(fig, widget)


@drawn()
def update_impact_figure(fig: go.Figure, result: FieldStudyResult) -> None:
    """Fill an :func:`impact_figure` in place (empty when the scenario has no impact test)."""
    frf = result.frf
    with fig.batch_update():
        if frf is None:
            for trace in fig.data:
                trace.update(x=[], y=[])
            return
        low, high = result.spec.impact_band
        band = (frf.frequency >= low) & (frf.frequency <= high)
        h = np.abs(frf.receptance())
        fig.data[0].update(x=frf.frequency[band], y=h[band])
        fig.data[1].update(
            x=[p.frequency for p in result.impact_poles],
            y=[float(np.interp(p.frequency, frf.frequency, h)) for p in result.impact_poles],
            text=[f"{p.frequency:.2f} Hz, zeta {p.damping_ratio:.4f}" for p in result.impact_poles],
            hovertemplate="%{text}<extra></extra>",
        )
        fig.data[2].update(x=frf.frequency[band], y=frf.coherence[band])
