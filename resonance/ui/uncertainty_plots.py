"""Plotly figures of an uncertainty study and of the combined-fix map (no physics here).

Builders make a figure with a fixed set of traces, updaters fill them from a result, so a live panel updates
in place and a static record draws the same figure.
"""

from __future__ import annotations

import math

import numpy as np
import plotly.graph_objects as go

from ..kinds.support.whatif import FixMap
from ..studies.uncertainty import UncertaintyResult
from .toolkit import FAIL, PASS, drawn, finished, styled

__all__ = [
    "fix_map_figure",
    "sensitivity_figure",
    "failure_probability_figure",
    "update_fix_map_figure",
    "update_uncertainty_figures",
    "worst_margin_figure",
]

_LAYOUT = {"height": 340, "margin": {"l": 70, "r": 20, "t": 40, "b": 50}, "template": "plotly_white"}


@drawn()
def worst_margin_figure(result: UncertaintyResult, widget: bool = False) -> go.Figure:
    """Histogram of each variant's worst margin minus required; variants left of 0 fail."""
    fig = go.Figure([go.Histogram(name="variants", marker_color="#3c78d8", nbinsx=60)])
    fig.update_layout(**_LAYOUT, xaxis_title="worst margin minus required [percent points]", yaxis_title="variants")
    update_uncertainty_figures(result, histogram=fig)
    return finished(fig, widget)


@drawn()
def failure_probability_figure(result: UncertaintyResult, widget: bool = False) -> go.Figure:
    """The probability that each finding fails (findings that never fail left out), largest at the top."""
    fig = go.Figure([go.Bar(orientation="h", marker_color=FAIL, name="P(fail)")])
    fig.update_layout(**_LAYOUT, xaxis_title="probability that the finding fails [%]")
    fig.update_layout(margin={"l": 330})
    update_uncertainty_figures(result, probability=fig)
    return finished(fig, widget)


@drawn()
def sensitivity_figure(result: UncertaintyResult, widget: bool = False) -> go.Figure:
    """First-order sensitivity index of the worst margin to each input, with its 95 % confidence."""
    fig = go.Figure([go.Bar(orientation="h", marker_color="#7e22ce", name="first-order index")])
    fig.update_layout(**_LAYOUT, xaxis_title="first-order index of the worst margin (RBD-FAST)")
    fig.update_layout(margin={"l": 160})
    update_uncertainty_figures(result, sensitivity=fig)
    return finished(fig, widget)


def update_uncertainty_figures(
    result: UncertaintyResult,
    histogram: go.Figure | None = None,
    probability: go.Figure | None = None,
    sensitivity: go.Figure | None = None,
) -> None:
    """Fill the uncertainty figures given, in place.

    Parameters
    ----------
    result : UncertaintyResult
        The study.
    histogram, probability, sensitivity : plotly.graph_objects.Figure, optional
        Figures made by the matching builders.

    Raises
    ------
    Nothing
        Drawing only.
    """
    if histogram is not None:
        worst = result.findings.worst_excess
        with histogram.batch_update():
            histogram.data[0].x = worst[np.isfinite(worst)]
            histogram.layout.shapes = [
                {
                    "type": "rect",
                    "xref": "x",
                    "yref": "y domain",
                    "x0": min(float(np.nanmin(worst)), 0.0) - 1.0,
                    "x1": 0.0,
                    "y0": 0,
                    "y1": 1,
                    "fillcolor": "rgba(214, 40, 40, 0.12)",
                    "line_width": 0,
                    "layer": "below",
                }
            ]
            histogram.layout.title.text = (
                f"Worst margin over {worst.size} variants: {100 * result.probability_any:.1f} % fail (shaded)"
            )
    if probability is not None:
        rows = result.rows()[:12][::-1]
        with probability.batch_update():
            probability.data[0].x = [100 * p for *_, p in rows]
            probability.data[0].y = [f"{mode} x {excitation}" for mode, excitation, _ in rows]
            probability.layout.title.text = "Probability of failure per finding" + ("" if rows else ": none fails")
    if sensitivity is not None:
        ranked = list(result.sensitivity)[::-1]
        with sensitivity.batch_update():
            sensitivity.data[0].x = [s1 for _, s1, _ in ranked]
            sensitivity.data[0].y = [name for name, *_ in ranked]
            sensitivity.data[0].error_x = {"type": "data", "array": [c for *_, c in ranked]}
            sensitivity.layout.title.text = "Which inputs drive the worst margin"


@drawn()
def fix_map_figure(fixes: FixMap, widget: bool = False) -> go.Figure:
    """The worst margin over a stiffness factor and a mass factor: passing region outlined, fixes marked."""
    fig = go.Figure(
        [
            go.Heatmap(name="worst margin", colorscale="RdBu", zmid=0.0, colorbar={"title": "pp"}),
            go.Contour(
                name="pass / fail",
                showscale=False,
                contours={"start": 0.0, "end": 0.0, "size": 1.0, "coloring": "none"},
                line={"color": "#111111", "width": 3},
            ),
            go.Scatter(name="as designed", mode="markers", marker={"symbol": "x", "size": 12, "color": "#111111"}),
            go.Scatter(name="smallest combined fix", mode="markers", marker={"size": 14, "color": PASS}),
        ]
    )
    styled(
        fig,
        460,
        legend_y=-0.2,
        xaxis={"type": "log", "title": "stiffness factor"},
        yaxis={"type": "log", "title": "mass factor"},
    )
    update_fix_map_figure(fig, fixes)
    return finished(fig, widget)


@drawn()
def update_fix_map_figure(fig: go.Figure, fixes: FixMap) -> None:
    """Fill a :func:`fix_map_figure` in place."""
    z = np.where(np.isfinite(fixes.worst_excess), fixes.worst_excess, np.nan)
    limit = float(np.nanmax(np.abs(z))) if np.any(np.isfinite(z)) else 1.0
    with fig.batch_update():
        for trace in fig.data[:2]:
            trace.x, trace.y, trace.z = fixes.stiffness, fixes.mass, z
        fig.data[0].zmin, fig.data[0].zmax = -limit, limit
        fig.data[2].x, fig.data[2].y = [1.0], [1.0]
        best = fixes.smallest
        fig.data[3].x, fig.data[3].y = ([best[0]], [best[1]]) if best else ([], [])
        fig.layout.title.text = "Worst margin minus required over two changes (black line: pass/fail)" + (
            "" if best else ": nothing passes here"
        )
        fig.layout.xaxis.range = [math.log10(fixes.stiffness[0]), math.log10(fixes.stiffness[-1])]
        fig.layout.yaxis.range = [math.log10(fixes.mass[0]), math.log10(fixes.mass[-1])]
