"""Plotly figures of rotor results: Campbell diagram, unbalance response, critical speed map, mode shapes.

As in :mod:`.plots`, each view has a builder (fixed traces) and an updater
that fills them from a :class:`~resonance.kinds.rotor.study.RotorStudyResult`.
"""

from __future__ import annotations

import plotly.graph_objects as go
from plotly.subplots import make_subplots

from ..checks.margins import clear_band
from ..core.units import UnitSystem, display_unit
from ..kinds.rotor.study import RotorStudyResult
from .toolkit import CLEAR_BAND, FAIL, OPERATING, PASS, drawn, finished, styled, vertical_bands

__all__ = [
    "campbell_figure",
    "update_campbell_figure",
    "rotor_response_figure",
    "update_rotor_response_figure",
    "speed_map_figure",
    "update_speed_map_figure",
    "mode_shape_figure",
    "update_mode_shape_figure",
]

_PROBE_COLOURS = ("#1f4e9c", "#c2410c", "#2a9d4b", "#6a4c93", "#8a6d00")


@drawn()
def campbell_figure(result: RotorStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Whirl frequencies against speed: forward branches solid, backward dotted, order lines, criticals marked."""
    fig = go.Figure()
    for b, whirl in enumerate(result.campbell.whirl):
        dash = "solid" if whirl == "forward" else "dot"
        fig.add_trace(go.Scatter(name=f"branch {b + 1} ({whirl})", mode="lines", line={"dash": dash, "width": 1.6}))
    for excitation in result.scenario.excitations:
        fig.add_trace(go.Scatter(name=excitation.label, mode="lines", line={"color": "#444444", "width": 1}))
    fig.add_trace(
        go.Scatter(
            name="critical speeds", mode="markers", marker={"size": 11, "symbol": "circle-open", "line_width": 3}
        )
    )
    styled(fig, 460, legend_y=-0.2, xaxis_title="speed [rpm]", title_text="Campbell diagram")
    update_campbell_figure(fig, result, system)
    return finished(fig, widget)


@drawn()
def update_campbell_figure(fig: go.Figure, result: RotorStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`campbell_figure` in place."""
    f_unit, f_factor = display_unit("frequency", system)
    data = result.campbell
    x_max = float(data.speed[-1])
    verdicts = {f.mode.label: f.passed for f in result.findings}
    with fig.batch_update():
        for b in range(data.frequency.shape[1]):
            fig.data[b].update(x=data.speed, y=data.frequency[:, b] * f_factor)
        offset = data.frequency.shape[1]
        for i, excitation in enumerate(result.scenario.excitations):
            fig.data[offset + i].update(x=[0.0, x_max], y=excitation.frequency_at([0.0, x_max]) * f_factor)
        labels = [c.to_mode().label for c in result.criticals]
        fig.data[-1].update(
            x=[c.speed for c in result.criticals],
            y=[c.frequency * f_factor for c in result.criticals],
            marker_color=[PASS if verdicts.get(label, True) else FAIL for label in labels],
            text=[
                f"{c.speed:.0f} rpm ({c.order:g}x), log dec. {c.to_mode().log_decrement:.2f}" for c in result.criticals
            ],
            hovertemplate="%{text}<extra></extra>",
        )
        fig.layout.shapes = vertical_bands(result.scenario.speed.intervals, OPERATING, (1,))
        # Show what the orders can reach: twice the highest order line at the end of the sweep.
        top_order = max((e.order for e in result.scenario.excitations if e.order is not None), default=1.0)
        y_max = max((2.0 * top_order * x_max / 60.0, *(1.1 * c.frequency for c in result.criticals)))
        fig.layout.yaxis.range = [0.0, y_max * f_factor]
        fig.layout.yaxis.title.text = f"whirl frequency [{f_unit}]"


@drawn()
def rotor_response_figure(result: RotorStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Unbalance response at the probes: orbit major axis (pk-pk) and x phase lag against speed."""
    fig = make_subplots(rows=2, cols=1, shared_xaxes=True, vertical_spacing=0.08, row_heights=[0.62, 0.38])
    for j, station in enumerate(result.scenario.probes):
        colour = _PROBE_COLOURS[j % len(_PROBE_COLOURS)]
        fig.add_trace(go.Scatter(name=f"station {station}", mode="lines", line={"color": colour}), row=1, col=1)
    for j, station in enumerate(result.scenario.probes):
        colour = _PROBE_COLOURS[j % len(_PROBE_COLOURS)]
        fig.add_trace(
            go.Scatter(name=f"station {station} phase", mode="lines", line={"color": colour}, showlegend=False),
            row=2,
            col=1,
        )
    fig.add_trace(go.Scatter(name="API limit", mode="lines", line={"color": "#d62828", "dash": "dash"}), row=1, col=1)
    styled(fig, 560, legend_y=-0.15, title_text="Unbalance response")
    fig.update_xaxes(title_text="speed [rpm]", row=2, col=1)
    fig.update_yaxes(range=[0, 360], dtick=90, title_text="x phase lag [deg]", row=2, col=1)
    update_rotor_response_figure(fig, result, system)
    return finished(fig, widget)


@drawn()
def update_rotor_response_figure(fig: go.Figure, result: RotorStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`rotor_response_figure` in place."""
    d_unit, d_factor = display_unit("displacement", system)
    response = result.response
    n = len(result.scenario.probes)
    clear = [
        clear_band(f.coincidence_speed, f.margin_rule, f.mode.amplification_factor)
        for f in result.findings
        if f.excitation.kind == "synchronous" and f.coincidence_speed is not None and f.margin_rule is not None
    ]
    with fig.batch_update():
        for j in range(n):
            fig.data[j].update(x=response.speed, y=response.major_pk_pk[:, j] * d_factor)
            fig.data[n + j].update(x=response.speed, y=response.x_phase_lag_deg[:, j])
        fig.data[-1].update(x=[response.speed[0], response.speed[-1]], y=[result.vibration_limit * d_factor] * 2)
        shapes = vertical_bands(result.scenario.speed.intervals, OPERATING, (1, 2))
        fig.layout.shapes = shapes + vertical_bands(clear, CLEAR_BAND, (1, 2))
        fig.layout.yaxis.title.text = f"major axis [{d_unit} pk-pk]"
        for axis in (fig.layout.xaxis, fig.layout.xaxis2):
            axis.range = [float(response.speed[0]), float(response.speed[-1])]


@drawn()
def speed_map_figure(result: RotorStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Undamped critical speed map: criticals against support stiffness, bearing stiffness curves overlaid."""
    fig = go.Figure()
    for i in range(result.speed_map.speed.shape[1]):
        fig.add_trace(go.Scatter(name=f"critical {i + 1}", mode="lines", line={"color": "#1f4e9c", "width": 1.5}))
    for label, *_ in result.bearing_curves:
        fig.add_trace(go.Scatter(name=f"{label} kxx", mode="lines", line={"color": "#c2410c"}))
        fig.add_trace(go.Scatter(name=f"{label} kyy", mode="lines", line={"color": "#c2410c", "dash": "dot"}))
    styled(
        fig,
        440,
        legend_y=-0.2,
        yaxis_title="critical speed [rpm]",
        yaxis_type="log",
        xaxis_type="log",
        title_text="Undamped critical speed map",
    )
    update_speed_map_figure(fig, result, system)
    return finished(fig, widget)


@drawn()
def update_speed_map_figure(fig: go.Figure, result: RotorStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`speed_map_figure` in place."""
    k_unit, k_factor = display_unit("stiffness", system)
    m = result.speed_map
    with fig.batch_update():
        for i in range(m.speed.shape[1]):
            fig.data[i].update(x=m.stiffness * k_factor, y=m.speed[:, i])
        offset = m.speed.shape[1]
        for j, (_, speeds, kxx, kyy) in enumerate(result.bearing_curves):
            fig.data[offset + 2 * j].update(x=kxx * k_factor, y=speeds)
            fig.data[offset + 2 * j + 1].update(x=kyy * k_factor, y=speeds)
        fig.layout.shapes = [
            {
                "type": "rect",
                "xref": "x domain",
                "x0": 0,
                "x1": 1,
                "y0": a,
                "y1": b,
                "fillcolor": OPERATING,
                "line_width": 0,
                "layer": "below",
            }
            for a, b in result.scenario.speed.intervals
        ]
        fig.layout.xaxis.title.text = f"support stiffness [{k_unit}]"


@drawn()
def mode_shape_figure(result: RotorStudyResult, widget: bool = False) -> go.Figure:
    """Deflected shapes (orbit semi-major axis along the shaft) of the lowest modes at the chosen speed."""
    fig = go.Figure()
    for b in range(min(6, len(result.shapes_at_max))):
        fig.add_trace(go.Scatter(name=f"mode {b + 1}", mode="lines+markers", marker={"size": 3}))
    styled(fig, 360, legend_y=-0.25, xaxis_title="axial position [m]", yaxis_title="relative amplitude")
    update_mode_shape_figure(fig, result)
    return finished(fig, widget)


@drawn()
def update_mode_shape_figure(fig: go.Figure, result: RotorStudyResult) -> None:
    """Fill a :func:`mode_shape_figure` in place."""
    with fig.batch_update():
        for b in range(len(fig.data)):
            z, shape = result.shapes_at_max[b]
            fig.data[b].update(x=z, y=shape)
        bearing_z = [
            result.rotor.node_z[result.rotor.station_nodes[bearing.station]] for bearing in result.rotor.bearings
        ]
        fig.layout.shapes = [
            {
                "type": "line",
                "xref": "x",
                "yref": "y domain",
                "x0": z,
                "x1": z,
                "y0": 0,
                "y1": 1,
                "line": {"color": "#888888", "dash": "dot"},
            }
            for z in bearing_z
        ]
        fig.layout.title.text = f"Mode shapes at {result.shape_speed:.0f} rpm (bearings dotted)"
