"""Plotly figures of a torsional study: mode shapes along the train and dynamic torque against speed.

Builders make a figure with a fixed set of traces, updaters fill them from a result (a live panel updates its
traces in place); the interference diagram is the one of :mod:`resonance.ui.plots`.
"""

from __future__ import annotations

import html
import math

import plotly.graph_objects as go

from ..core.units import UnitSystem, display_unit
from ..kinds.torsion.study import TorsionStudyResult

__all__ = [
    "torque_figure",
    "torque_table_html",
    "torsion_modes_html",
    "torsion_shape_figure",
    "update_torque_figure",
    "update_torsion_shape_figure",
]

_ROW_CLASS = {"EXCEEDS ALLOWABLE": "fail", "within allowable": "pass", "no allowable given": ""}

#: Modes drawn in the shape view (the lowest ones govern a train's interference).
SHAPES_DRAWN = 4


def torsion_shape_figure(result: TorsionStudyResult, widget: bool = False) -> go.Figure:
    """Each elastic mode's station angles (in each station's own shaft), largest scaled to 1.

    Parameters
    ----------
    result : TorsionStudyResult
        The torsional study to draw.
    widget : bool
        Return a ``go.FigureWidget`` (filled before wrapping, so late views see the data).

    Returns
    -------
    plotly.graph_objects.Figure
        A ``go.FigureWidget`` when ``widget`` is True.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    fig = go.Figure()
    for n in range(min(SHAPES_DRAWN, len(result.shapes))):
        fig.add_trace(go.Scatter(name=f"mode {n + 1}", mode="lines+markers", marker={"size": 8}))
    fig.update_layout(
        height=360,
        margin={"l": 70, "r": 20, "t": 40, "b": 50},
        template="plotly_white",
        xaxis_title="station (shaft)",
        yaxis_title="angle in its own shaft [-]",
        legend={"orientation": "h", "y": -0.3},
    )
    update_torsion_shape_figure(fig, result)
    return go.FigureWidget(fig) if widget else fig


def update_torsion_shape_figure(fig: go.Figure, result: TorsionStudyResult) -> None:
    """Fill a :func:`torsion_shape_figure` in place.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        A figure made by the matching builder; updated in place.
    result : TorsionStudyResult
        The torsional study to draw.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    stations = result.scenario.train.stations
    names = [f"{s.name} ({s.shaft})" for s in stations]
    with fig.batch_update():
        for n, trace in enumerate(fig.data):
            if n >= len(result.shapes):
                trace.update(x=[], y=[])
                continue
            shape = result.shapes[n]
            trace.update(
                x=names,
                y=[shape.angles[s.name] for s in stations],
                name=f"mode {n + 1}: {shape.frequency:.1f} Hz, {shape.twists_most}",
                hovertemplate="%{x}: %{y:.3f}<extra>" + html.escape(f"mode {n + 1}") + "</extra>",
            )
        fig.layout.title.text = "Torsional mode shapes (the element named takes most of the twist)"


def torque_figure(result: TorsionStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Dynamic torque amplitude in every element over the operating speeds, the cases' amplitudes added.

    Allowable torques, where given, are dotted lines of the element's colour; the operating speeds are shaded.

    Parameters
    ----------
    result : TorsionStudyResult
        The torsional study to draw.
    system : {"SI", "US"}
        Unit system of the axes.
    widget : bool
        Return a ``go.FigureWidget`` (filled before wrapping, so late views see the data).

    Returns
    -------
    plotly.graph_objects.Figure
        A ``go.FigureWidget`` when ``widget`` is True.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    fig = go.Figure()
    for label, *_ in result.scenario.train.elements:
        fig.add_trace(go.Scatter(name=label, mode="lines"))
    fig.update_layout(
        height=400,
        margin={"l": 70, "r": 20, "t": 40, "b": 50},
        template="plotly_white",
        xaxis_title="driver speed [rpm]",
        yaxis_type="log",
        legend={"orientation": "h", "y": -0.22},
    )
    update_torque_figure(fig, result, system)
    return go.FigureWidget(fig) if widget else fig


def update_torque_figure(fig: go.Figure, result: TorsionStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`torque_figure` in place.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        A figure made by the matching builder; updated in place.
    result : TorsionStudyResult
        The torsional study to draw.
    system : {"SI", "US"}
        Unit system of the axes.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    unit, factor = display_unit("torque", system)
    sweep = result.torque
    shapes: list[dict] = []
    levels: list[float] = []
    palette = ("#1f5fbf", "#c2410c", "#15803d", "#7e22ce", "#a16207", "#0e7490")
    with fig.batch_update():
        for i, trace in enumerate(fig.data):
            colour = palette[i % len(palette)]
            if sweep is None or trace.name not in sweep.element_torque:
                trace.update(x=[], y=[])
                continue
            y = sweep.element_torque[trace.name].sum(axis=0) * factor
            levels += [float(y.min()), float(y.max())]
            trace.update(
                x=sweep.speed,
                y=y,
                line={"color": colour},
                hovertemplate="%{x:.0f} rpm: %{y:.4g} " + unit + "<extra>" + html.escape(trace.name) + "</extra>",
            )
            allowed = result.scenario.allowables.get(trace.name)
            if allowed is not None and allowed.torque is not None:
                levels.append(allowed.torque * factor)
                shapes.append(
                    {
                        "type": "line",
                        "xref": "x domain",
                        "x0": 0,
                        "x1": 1,
                        "y0": allowed.torque * factor,
                        "y1": allowed.torque * factor,
                        "line": {"color": colour, "dash": "dot"},
                    }
                )
        fig.layout.shapes = shapes
        positive = [v for v in levels if v > 0.0]
        if positive:  # the allowables are shapes, which the autorange leaves out
            fig.layout.yaxis.range = [math.log10(min(positive) / 2.0), math.log10(max(positive) * 2.0)]
        fig.layout.yaxis.title.text = f"dynamic torque [{unit}]"
        fig.layout.title.text = (
            "Dynamic torque per element (allowables dotted)"
            if sweep is not None
            else "No harmonic torque given: forced response not computed"
        )


def torsion_modes_html(result: TorsionStudyResult, system: UnitSystem = "SI") -> str:
    """The torsional modes as an HTML table: frequency, damping, AF and the element that twists most.

    Parameters
    ----------
    result : TorsionStudyResult
        The torsional study.
    system : {"SI", "US"}
        Unit system.

    Returns
    -------
    str
        HTML.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    f_unit, f_factor = display_unit("frequency", system)
    rows = "".join(
        f"<tr><td>{html.escape(m.label)}</td><td>{m.frequency * f_factor:.2f}</td><td>{m.damping_ratio:.4f}</td>"
        f"<td>{'inf' if math.isinf(m.amplification_factor) else f'{m.amplification_factor:.1f}'}</td>"
        f"<td>{html.escape(s.twists_most)}</td></tr>"
        for m, s in zip(result.modes, result.shapes, strict=True)
    )
    return (
        f"<table class='modes'><thead><tr><th>mode</th><th>f<sub>n</sub> [{f_unit}]</th><th>damping ratio</th>"
        f"<th>AF</th><th>twist</th></tr></thead><tbody>{rows}</tbody></table>"
    )


def torque_table_html(result: TorsionStudyResult, system: UnitSystem = "SI") -> str:
    """Each element's largest dynamic torque over the operating speeds against its allowable, as HTML.

    Parameters
    ----------
    result : TorsionStudyResult
        The torsional study.
    system : {"SI", "US"}
        Unit system.

    Returns
    -------
    str
        HTML (a sentence when the scenario gives no harmonic torque).

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    sweep = result.torque
    if sweep is None:
        return "<p>No harmonic torque given: forced response not computed.</p>"
    t_unit, t_factor = display_unit("torque", system)
    p_unit, p_factor = display_unit("stress", system)

    def cell(x: float | None, factor: float, unit: str) -> str:
        return "-" if x is None else f"{x * factor:.4g} {unit}"

    cases = "".join(
        f"<li>{html.escape(c.label)}: {c.torque * t_factor:.4g} {t_unit} at {html.escape(c.station)}, at the "
        f"frequency of {html.escape(c.excitation.label)}</li>"
        for c in sweep.cases
    )
    rows = "".join(
        f"<tr class='{_ROW_CLASS[r.status]}'><td>{html.escape(r.element)}</td>"
        f"<td>{cell(r.peak_torque, t_factor, t_unit)}</td><td>{r.speed:.0f}</td>"
        f"<td>{cell(r.peak_stress, p_factor, p_unit)}</td><td>{cell(r.allowable.torque, t_factor, t_unit)}</td>"
        f"<td>{cell(r.allowable.stress, p_factor, p_unit)}</td>"
        f"<td>{'-' if r.utilisation is None else f'{100 * r.utilisation:.0f} %'}</td>"
        f"<td>{r.status}</td></tr>"
        for r in sweep.rows
    )
    return (
        f"<ul>{cases}</ul><table class='modes'><thead><tr><th>element</th><th>peak torque</th><th>at [rpm]</th>"
        f"<th>shear stress</th><th>allowable torque</th><th>allowable stress</th><th>use</th><th>status</th></tr>"
        f"</thead><tbody>{rows}</tbody></table><p>Steady state over the operating speeds, the cases' amplitudes "
        "added (conservative). Fatigue design belongs to the governing code and a qualified engineer.</p>"
    )
