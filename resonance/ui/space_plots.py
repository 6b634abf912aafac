"""Plotly figures of a supports-in-space study: a mode shape in 3D, the bearing response against speed.

Builders make a figure with a fixed set of traces, updaters fill them from a result (a live panel updates in
place); the interference diagram is the one of :mod:`resonance.ui.plots`.
"""

from __future__ import annotations

import html
import math

import numpy as np
import plotly.graph_objects as go

from ..core.units import UnitSystem, display_unit
from ..kinds.space.bodies import equivalent_box
from ..kinds.space.study import SpaceStudyResult
from .toolkit import OPERATING, af_text, drawn, finished, html_table, styled, vertical_bands

__all__ = [
    "space_modes_html",
    "space_response_figure",
    "space_shape_figure",
    "update_space_response_figure",
    "update_space_shape_figure",
]

_EDGES = [(0, 1), (1, 3), (3, 2), (2, 0), (4, 5), (5, 7), (7, 6), (6, 4), (0, 4), (1, 5), (2, 6), (3, 7)]


def _corners(mass: float, inertia: np.ndarray, center: np.ndarray) -> np.ndarray:
    # The box with the body's mass and principal moments, along its principal axes (8 x 3).
    sides, axes = equivalent_box(mass, inertia)
    signs = np.array([[sx, sy, sz] for sx in (-0.5, 0.5) for sy in (-0.5, 0.5) for sz in (-0.5, 0.5)])
    return center + (signs * sides) @ axes.T


def _lines(points: np.ndarray, pairs: list[tuple[int, int]]) -> tuple[list, list, list]:
    xs: list = []
    ys: list = []
    zs: list = []
    for a, b in pairs:
        for p in (points[a], points[b]):
            xs.append(float(p[0]))
            ys.append(float(p[1]))
            zs.append(float(p[2]))
        xs.append(None)
        ys.append(None)
        zs.append(None)
    return xs, ys, zs


def _geometry(result: SpaceStudyResult, mode: int | None) -> tuple[np.ndarray, list[tuple[int, int]]]:
    # Every body's box corners and the frame's nodes, displaced by a mode (None: at rest).
    model = result.model
    points: list[np.ndarray] = []
    pairs: list[tuple[int, int]] = []
    q = None
    if mode is not None:
        q = np.real(result.shapes[mode].shape)
    span = max(
        (float(np.ptp(np.array([b.center for b in model.bodies] + list(model.origins)), axis=0).max()) or 1.0), 1.0
    )
    for b in model.bodies:
        corners = _corners(b.mass, b.inertia, b.center)
        if q is not None:
            j = model.index(b.name)
            origin = model.origins[j // 6]
            # A point moves t + theta x r (small rotations) with its owner (the body, or the node it rides on).
            moved = q[j : j + 3] + np.cross(q[j + 3 : j + 6], corners - origin)
            corners = corners + moved * 0.12 * span / max(float(np.abs(q).max()), 1e-30)
        base = len(points)
        points += list(corners)
        pairs += [(base + a, base + c) for a, c in _EDGES]
    index = {}
    for name, origin in zip(model.owners, model.origins, strict=True):
        if any(b.name == name for b in model.bodies):
            continue
        p = origin.copy()
        if q is not None:
            j = model.index(name)
            p = p + q[j : j + 3] * 0.12 * span / max(float(np.abs(q).max()), 1e-30)
        index[name] = len(points)
        points.append(p)
    for beam in model.beams:
        if beam.node_a in index and beam.node_b in index:
            pairs.append((index[beam.node_a], index[beam.node_b]))
    return np.array(points), pairs


@drawn()
def space_shape_figure(result: SpaceStudyResult, mode: int = 0, widget: bool = False) -> go.Figure:
    """One mode in 3D: every body's box (and the frame) at rest in grey and displaced in colour."""
    fig = go.Figure(
        [
            go.Scatter3d(name="at rest", mode="lines", line={"color": "#aaaaaa", "width": 2}),
            go.Scatter3d(name="mode shape", mode="lines", line={"color": "#c2410c", "width": 5}),
            go.Scatter3d(name="mounts", mode="markers", marker={"size": 3, "color": "#1f5fbf"}),
        ]
    )
    fig.update_layout(
        height=520,
        margin={"l": 0, "r": 0, "t": 40, "b": 0},
        scene={"aspectmode": "data", "xaxis_title": "x [m]", "yaxis_title": "y [m]", "zaxis_title": "z [m]"},
        legend={"orientation": "h", "y": -0.05},
    )
    update_space_shape_figure(fig, result, mode)
    return finished(fig, widget)


@drawn()
def update_space_shape_figure(fig: go.Figure, result: SpaceStudyResult, mode: int = 0) -> None:
    """Fill a :func:`space_shape_figure` in place."""
    mode = min(max(mode, 0), len(result.shapes) - 1)
    rest, pairs = _geometry(result, None)
    moved, _ = _geometry(result, mode)
    mounts = np.array([m.point for m in result.model.mounts]).reshape(-1, 3)  # none: a frame on fixed feet
    shape = result.shapes[mode]
    with fig.batch_update():
        for trace, points in ((fig.data[0], rest), (fig.data[1], moved)):
            x, y, z = _lines(points, pairs)
            trace.x, trace.y, trace.z = x, y, z
        fig.data[2].x, fig.data[2].y, fig.data[2].z = mounts[:, 0], mounts[:, 1], mounts[:, 2]
        fig.layout.title.text = html.escape(f"Mode {mode + 1}: {shape.frequency:.2f} Hz, {shape.words} (exaggerated)")


@drawn()
def space_response_figure(result: SpaceStudyResult, system: UnitSystem = "SI", widget: bool = False) -> go.Figure:
    """RMS velocity of the 1x unbalance response at each probe in x, y and z against speed."""
    fig = go.Figure()
    dashes = ("solid", "dash", "dot")
    for label, _body, _point in result.scenario.probes:
        for d, direction in enumerate("xyz"):
            fig.add_trace(go.Scatter(name=f"{label} {direction}", mode="lines", line={"dash": dashes[d]}))
    styled(fig, 400, legend_y=-0.22, xaxis_title="speed [rpm]")
    update_space_response_figure(fig, result, system)
    return finished(fig, widget)


@drawn()
def update_space_response_figure(fig: go.Figure, result: SpaceStudyResult, system: UnitSystem = "SI") -> None:
    """Fill a :func:`space_response_figure` in place."""
    unit, factor = display_unit("velocity", system)
    with fig.batch_update():
        for k in range(len(result.scenario.probes)):
            for d in range(3):
                trace = fig.data[3 * k + d]
                trace.x, trace.y = result.speed, result.velocity_rms[:, k, d] * factor
        fig.layout.shapes = vertical_bands(result.scenario.speed.intervals, OPERATING, (1,))
        fig.layout.yaxis.title.text = f"1x velocity [{unit} RMS]"
        fig.layout.title.text = "Unbalance response at the bearings (operating speeds shaded)"


def _af(zeta: float) -> float:
    # A space mode carries its damping ratio; its AF is Q = 1 / (2 zeta) (inf undamped).
    return math.inf if zeta <= 0 else 1 / (2 * zeta)


@drawn(returns="The modes table's HTML.")
def space_modes_html(result: SpaceStudyResult, system: UnitSystem = "SI") -> str:
    """The modes as an HTML table: frequency, damping, AF and what moves."""
    f_unit, f_factor = display_unit("frequency", system)
    rows = [
        (i + 1, f"{s.frequency * f_factor:.2f}", f"{s.damping_ratio:.4f}", af_text(_af(s.damping_ratio)), s.words)
        for i, s in enumerate(result.shapes)
    ]
    return html_table("modes", ("mode", f"f<sub>n</sub> [{f_unit}]", "damping ratio", "AF", "what moves"), rows)
