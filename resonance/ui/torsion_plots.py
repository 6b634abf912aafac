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
from .toolkit import af_text, drawn, finished, html_table, styled

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


@drawn()
def torsion_shape_figure(result: TorsionStudyResult, widget: bool = False) -> go.Figure:
    """Each elastic mode's station angles (in each station's own shaft), largest scaled to 1."""
    fig = go.Figure()
    for n in range(min(SHAPES_DRAWN, len(result.shapes))):
        fig.add_trace(go.Scatter(name=f"mode {n + 1}", mode="lines+markers", marker={"size": 8}))
    styled(fig, 360, legend_y=-0.3, xaxis_title="station (shaft)", yaxis_title="angle in its own shaft [-]")
    update_torsion_shape_figure(fig, result)
    return finished(fig, widget)


@drawn()
def update_torsion_shape_figure(fig: go.Figure, result: TorsionStudyResult) -> None:
    """Fill a :func:`torsion_shape_figure` in place."""
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


@drawn()
def torque_figure(result: TorsionStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """Dynamic torque amplitude in every element over the operating speeds, the cases' amplitudes added.

    Allowable torques, where given, are dotted lines of the element's colour; the operating speeds are shaded.
    """
    fig = go.Figure()
    for label, *_ in result.scenario.train.elements:
        fig.add_trace(go.Scatter(name=label, mode="lines"))
    styled(fig, 400, legend_y=-0.22, xaxis_title="driver speed [rpm]", yaxis_type="log")
    update_torque_figure(fig, result, system)
    return finished(fig, widget)


@drawn()
def update_torque_figure(fig: go.Figure, result: TorsionStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`torque_figure` in place."""
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


@drawn(returns="The torsional modes table's HTML.")
def torsion_modes_html(result: TorsionStudyResult, system: UnitSystem = "SI") -> str:
    """The torsional modes as an HTML table: frequency, damping, AF and the element that twists most."""
    f_unit, f_factor = display_unit("frequency", system)
    rows = [
        (
            m.label,
            f"{m.frequency * f_factor:.2f}",
            f"{m.damping_ratio:.4f}",
            af_text(m.amplification_factor),
            s.twists_most,
        )
        for m, s in zip(result.modes, result.shapes, strict=True)
    ]
    return html_table("modes", ("mode", f"f<sub>n</sub> [{f_unit}]", "damping ratio", "AF", "twist"), rows)


@drawn(returns="HTML (a sentence when the scenario gives no harmonic torque).")
def torque_table_html(result: TorsionStudyResult, system: UnitSystem = "SI") -> str:
    """Each element's largest dynamic torque over the operating speeds against its allowable, as HTML."""
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
