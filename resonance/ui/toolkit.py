"""The plot toolkit every kind's figures share: colours, bands, the standard layout, tables and the figure docs.

Each view has a builder that makes an empty figure with a fixed set of traces and an updater that fills them
from a result, so a live panel updates its traces in place (``FigureWidget``) and a static record draws the same
figure (``go.Figure``). The builders, updaters and HTML views of every kind share their signature's words:
:func:`drawn` writes their Parameters, Returns and Raises sections from the signature, so each function's own
docstring says only what it draws.
"""

from __future__ import annotations

import html
import inspect
import math
from collections.abc import Callable, Iterable, Sequence
from typing import Any, TypeVar

import plotly.graph_objects as go

__all__ = [
    "CLEAR_BAND",
    "FAIL",
    "OPERATING",
    "PASS",
    "TOLERANCE",
    "af_text",
    "drawn",
    "finished",
    "html_table",
    "modes_to_draw",
    "styled",
    "vertical_bands",
]

# Colours of our own: operating speeds blue, required clear bands orange,
# passing coincidences green, failing ones red.
OPERATING = "rgba(60, 120, 216, 0.15)"
CLEAR_BAND = "rgba(230, 140, 20, 0.22)"
TOLERANCE = "rgba(120, 120, 120, 0.18)"
PASS = "#2a9d4b"
FAIL = "#d62828"

#: The words of the parameters every figure shares, by name (``result`` by its type, below).
_PARAMETERS = {
    "fig": ("plotly.graph_objects.Figure", "A figure made by the matching builder; updated in place."),
    "system": ('{"SI", "US"}', "Unit system of the axes and labels."),
    "widget": ("bool", "Return a ``go.FigureWidget`` (filled before wrapping, so late views see the data)."),
    "channel": ("str", "The coast-down channel drawn."),
    "mode": ("int", "Which mode (0: the lowest)."),
    "tolerance": ("ToleranceResult, optional", "A what-if tolerance band, drawn as grey bands around each mode."),
}
#: What each kind's result is, as its figures' ``result`` (or ``fixes``) parameter.
_RESULTS = {
    "StudyResult": "The support study to draw.",
    "CheckedStudy": "Any study's result with modes, excitations and findings (support, rotor, torsion, space).",
    "RotorStudyResult": "The rotor study to draw.",
    "TorsionStudyResult": "The torsional study to draw.",
    "SpaceStudyResult": "The supports-in-space study to draw.",
    "FieldStudyResult": "The field verification to draw.",
    "UncertaintyResult": "The uncertainty study to draw.",
    "FixMap": "The combined-fix map to draw.",
    "Scenario": "The scenario: its operating range is shaded (and, for a panel, what it runs).",
}
_F = TypeVar("_F", bound=Callable[..., Any])


def drawn(returns: str | None = None, **parameters: str) -> Callable[[_F], _F]:
    """Complete a figure builder's, updater's or HTML view's docstring from its signature.

    Parameters
    ----------
    returns : str, optional
        What a view that returns text gives (a builder returns its figure, an updater nothing).
    **parameters : str
        The words of parameters of the function's own (``mode``, ``channel``...).

    Returns
    -------
    callable
        A decorator that appends the Parameters, Returns and Raises sections to the function's docstring.

    Raises
    ------
    KeyError
        A parameter with no words here, in ``parameters`` or of a known result type.
    """

    def decorate(function: _F) -> _F:
        lines = ["", "Parameters", "----------"]
        for name, parameter in inspect.signature(function).parameters.items():
            annotation = str(parameter.annotation).split(" | ")[0]
            if name in parameters:
                kind, words = annotation, parameters[name]
            elif name in _PARAMETERS:
                kind, words = _PARAMETERS[name]
            else:
                kind, words = annotation, _RESULTS[annotation]
            optional = ", optional" if parameter.default is None and not kind.endswith("optional") else ""
            lines += [f"{name} : {kind}{optional}", f"    {words}"]
        if function.__name__.endswith("_figure") and not function.__name__.startswith("update_"):
            lines += [
                "",
                "Returns",
                "-------",
                "plotly.graph_objects.Figure",
                "    A ``go.FigureWidget`` when ``widget``.",
            ]
        elif returns is not None:
            lines += ["", "Returns", "-------", "str", f"    {returns}"]
        lines += ["", "Raises", "------", "Nothing", "    Drawing only: the result is already validated."]
        function.__doc__ = inspect.cleandoc(function.__doc__ or "") + "\n" + "\n".join(lines) + "\n"
        return function

    return decorate


def styled(fig: go.Figure, height: int, legend_y: float | None = -0.2, **layout: Any) -> go.Figure:
    """Give a figure the layout every view shares: white template, margins, a legend under the plot.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        The figure, changed in place.
    height : int
        Height [px].
    legend_y : float or None
        Where the horizontal legend sits, in paper coordinates (below the plot when negative); None leaves
        plotly's legend.
    **layout
        Further layout of the view (axis titles and types, its title).

    Returns
    -------
    plotly.graph_objects.Figure
        The same figure.

    Raises
    ------
    ValueError
        A layout key plotly does not know.
    """
    legend = {} if legend_y is None else {"legend": {"orientation": "h", "y": legend_y}}
    fig.update_layout(height=height, margin={"l": 70, "r": 20, "t": 40, "b": 50}, template="plotly_white", **legend)
    fig.update_layout(**layout)
    return fig


def finished(fig: go.Figure, widget: bool) -> go.Figure:
    """The filled figure as it is, or wrapped for a live panel.

    Parameters
    ----------
    fig : plotly.graph_objects.Figure
        The figure, already filled by its updater.
    widget : bool
        Wrap it in a ``go.FigureWidget``.

    Returns
    -------
    plotly.graph_objects.Figure

    Raises
    ------
    Nothing
        Wrapping only.

    Notes
    -----
    Wrap after filling: a FigureWidget sends later changes as messages to live views, so the data must be in
    the figure before the wrap for a view opened later (a saved notebook, a test) to show it.
    """
    return go.FigureWidget(fig) if widget else fig


def modes_to_draw(findings: Sequence[Any], modes: Sequence[Any], lowest: int = 3) -> list[int]:
    """Which modes a record draws: the governing finding's first, then every failing finding's, else the lowest.

    Parameters
    ----------
    findings : sequence of Finding
        The study's findings, worst first (the first governs).
    modes : sequence of Mode
        The study's modes, in the order the figures index them.
    lowest : int
        How many modes to draw at least, the lowest filling up (when few findings fail).

    Returns
    -------
    list of int
        Indices into ``modes``, each once: the governing mode, the modes of failing findings worst first, then
        the lowest modes up to ``lowest``.

    Raises
    ------
    Nothing
        Selection only.
    """
    picked: list[int] = []
    for i, f in enumerate(findings):
        if (i == 0 or not f.passed) and f.mode in modes and modes.index(f.mode) not in picked:
            picked.append(modes.index(f.mode))
    picked += [i for i in range(len(modes)) if i not in picked][: max(0, lowest - len(picked))]
    return picked


def af_text(af: float) -> str:
    """An amplification factor as the tables show it: one decimal, ``inf`` for an undamped mode.

    Parameters
    ----------
    af : float
        The amplification factor [-].

    Returns
    -------
    str
        ``"12.5"`` or ``"inf"``.

    Raises
    ------
    Nothing
        Text only.
    """
    return "inf" if math.isinf(af) else f"{af:.1f}"


def html_table(css_class: str, headers: Sequence[str], rows: Iterable[Sequence[object]]) -> str:
    """A plain HTML table: headers (HTML as given) and cells (escaped text).

    Parameters
    ----------
    css_class : str
        The table's class (``modes``, ``findings``...).
    headers : sequence of str
        Column headers; HTML (units with ``<sub>``), not escaped.
    rows : iterable of sequences
        The cells, one sequence a row; each is shown as ``str`` and escaped.

    Returns
    -------
    str
        The table's HTML.

    Raises
    ------
    Nothing
        Text only.
    """
    head = "".join(f"<th>{h}</th>" for h in headers)
    body = "".join("<tr>" + "".join(f"<td>{html.escape(str(c))}</td>" for c in row) + "</tr>" for row in rows)
    return f"<table class='{css_class}'><thead><tr>{head}</tr></thead><tbody>{body}</tbody></table>"


def vertical_bands(spans: Sequence[tuple[float, float]], colour: str, rows: Sequence[int]) -> list[dict]:
    """Rectangles spanning the full height of the given subplot rows, one per speed span.

    Parameters
    ----------
    spans : sequence of (float, float)
        Speed spans [rpm].
    colour : str
        Fill colour.
    rows : sequence of int
        Subplot rows the rectangles span.

    Returns
    -------
    list of dict
        plotly shape dictionaries.

    Raises
    ------
    Nothing
        Drawing only: the spans are already validated.
    """
    shapes = []
    for low, high in spans:
        for row in rows:
            axis = "" if row == 1 else str(row)
            shapes.append(
                {
                    "type": "rect",
                    "xref": f"x{axis}",
                    "yref": f"y{axis} domain",
                    "x0": low,
                    "x1": high,
                    "y0": 0,
                    "y1": 1,
                    "fillcolor": colour,
                    # A fixed speed is a band of no width: drawn as a line of the band's colour, made opaque.
                    **(
                        {"line": {"color": colour.rsplit(",", 1)[0] + ", 0.9)", "width": 2}}
                        if low == high
                        else {"line_width": 0}
                    ),
                    "layer": "below",
                }
            )
    return shapes
