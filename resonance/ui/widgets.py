"""What every panel shares: the caution banner, the verdict box, the speed and unit controls, the panel base.

Panels (:mod:`resonance.ui.panels`, :mod:`resonance.ui.rotor_panel`, :mod:`resonance.ui.field_panel` and
those to come) build on :class:`Panel` and these controls, so they look and behave alike.
"""

from __future__ import annotations

import html
import math
from collections.abc import Sequence
from typing import Any

import ipywidgets as w

from ..checks.speed_range import OperatingRange, operating_range
from ..core.errors import InputValueError
from ..core.units import UnitSystem
from ..records.record import CAUTION

__all__ = ["Panel", "caution_banner", "slider_range", "speed_slider", "units_toggle", "verdict_html"]

_BANNER_STYLE = "background:#fff4e0;border-left:6px solid #e08a00;padding:8px 12px;margin:4px 0;font-size:90%"


def caution_banner() -> w.HTML:
    """The caution every notebook shows first.

    Returns
    -------
    ipywidgets.HTML

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    return w.HTML(f"<div style='{_BANNER_STYLE}'><b>Caution.</b> {html.escape(CAUTION)}</div>")


def verdict_html(text: str, passed: bool) -> str:
    """The verdict lines as an HTML box, green when passed and red otherwise.

    Parameters
    ----------
    text : str
        The verdict lines.
    passed : bool
        Green when True, red otherwise.

    Returns
    -------
    str
        A coloured box with the lines escaped.

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    colour = "#2a9d4b" if passed else "#d62828"
    lines = "<br>".join(html.escape(line) for line in text.splitlines())
    return f"<div class='verdict' style='border-left:6px solid {colour};padding:6px 10px'>{lines}</div>"


def speed_slider(speed: OperatingRange) -> w.IntRangeSlider:
    """A range slider [rpm] around an operating range (0.4 to 1.6 times its ends).

    Parameters
    ----------
    speed : OperatingRange
        The operating range the slider starts at [rpm].

    Returns
    -------
    ipywidgets.IntRangeSlider

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    low, high = speed.speed_min, speed.speed_max
    step = 10 if high < 6000 else 50
    return w.IntRangeSlider(
        value=(round(low), round(high)),
        min=int(max(step, step * math.floor(0.4 * low / step))),
        max=int(step * math.ceil(1.6 * high / step)),
        step=step,
        description="speed [rpm]",
        continuous_update=False,
        layout=w.Layout(width="520px"),
        style={"description_width": "110px"},
    )


def factor_slider(
    label: str, decades: float = 1.0, step: float = 0.01, label_width: str = "170px", width: str = "560px"
) -> w.FloatLogSlider:
    """A what-if factor on a logarithmic scale, starting at 1 (x0.1 to x10 for one decade each way).

    Parameters
    ----------
    label : str
        Its description (``"bearing stiffness x"``).
    decades : float
        How far it reaches each way, in decades (0.6: x0.25 to x4).
    step : float
        Step in decades.
    label_width, width : str
        CSS widths of the description and of the whole slider.

    Returns
    -------
    ipywidgets.FloatLogSlider

    Raises
    ------
    Nothing
        Drawing only.
    """
    return w.FloatLogSlider(
        value=1.0,
        base=10,
        min=-decades,
        max=decades,
        step=step,
        readout_format=".3f" if step < 0.01 else ".2f",
        description=label,
        continuous_update=False,
        style={"description_width": label_width},
        layout=w.Layout(width=width),
    )


def modal_damping_slider(value: float, label_width: str = "170px", width: str = "560px") -> w.FloatSlider:
    """A modal damping ratio, 0 to 0.2.

    Parameters
    ----------
    value : float
        The starting ratio [-].
    label_width, width : str
        CSS widths of the description and of the whole slider.

    Returns
    -------
    ipywidgets.FloatSlider

    Raises
    ------
    Nothing
        Drawing only.
    """
    return w.FloatSlider(
        value=value,
        min=0.0,
        max=0.2,
        step=0.0025,
        readout_format=".4f",
        description="modal damping ratio",
        continuous_update=False,
        style={"description_width": label_width},
        layout=w.Layout(width=width),
    )


def slider_range(slider: w.IntRangeSlider, original: OperatingRange) -> OperatingRange:
    """The range a speed slider shows, keeping the original skip bands that still lie inside it.

    Parameters
    ----------
    slider : ipywidgets.IntRangeSlider
        A speed slider.
    original : OperatingRange
        The range whose skip bands are kept where they fit.

    Returns
    -------
    OperatingRange
        Speeds [rpm].

    Raises
    ------
    InputValueError
        A range the operating-range rules refuse.
    """
    low, high = slider.value
    bands = tuple(b for b in original.skip_bands if low <= b[0] and b[1] <= high)
    return operating_range(float(low), float(high), bands)


def units_toggle(value: str, label_width: str) -> w.ToggleButtons:
    """The SI / US customary switch.

    Parameters
    ----------
    value : {"SI", "US"}
        The initial unit system.
    label_width : str
        CSS width of the description.

    Returns
    -------
    ipywidgets.ToggleButtons

    Raises
    ------
    Nothing
        Drawing only: the result is already validated.
    """
    return w.ToggleButtons(
        options=["SI", "US"],
        value=value,
        description="units",
        style={"description_width": label_width, "button_width": "60px"},
    )


class Panel:
    """What every panel shares: the widget it shows, the unit switch, live updates, error display."""

    widget: w.VBox
    units: w.ToggleButtons | None
    message: w.HTML

    @property
    def system(self) -> UnitSystem:
        """The unit system shown."""
        return self.units.value if self.units is not None else "SI"

    def update(self) -> None:
        """Recompute and refresh the views (each panel defines it)."""
        raise NotImplementedError

    def _changed(self, _change: object) -> None:
        try:
            self.update()
            self.message.value = ""
        except InputValueError as error:
            self._error(str(error))

    def _error(self, text: str) -> None:
        self.message.value = f"<span style='color:#d62828'>{html.escape(text)}</span>"

    def _repr_mimebundle_(self, **kwargs: object) -> dict | None:
        return self.widget._repr_mimebundle_(**kwargs)


class KindPanel(Panel):
    """What the panels of one kind of study share: the speed and unit controls, verdict, message, findings.

    They are laid out on one page: the caution, the title, the controls, the verdict, then the kind's views.

    A kind's panel calls :meth:`_start` first, builds its own controls and views, then :meth:`_lay_out`.
    """

    original: Any
    scenario: Any
    result: Any

    def _start(self, scenario: Any, units_width: str) -> None:
        self.original = self.scenario = scenario
        self.speed = speed_slider(scenario.speed)
        self.units = units_toggle(scenario.units, units_width)
        self.verdict = w.HTML()
        self.message = w.HTML()
        self.findings_html = w.HTML()

    def _lay_out(
        self, title: str, controls: Sequence[w.Widget], views: Sequence[w.Widget], also: Sequence = ()
    ) -> None:
        # Every control above the verdict re-runs the study, and so do the ``also`` ones shown among the views.
        for control in (*controls, *also):
            control.observe(self._changed, names="value")
        top = [caution_banner(), w.HTML(f"<h3>{html.escape(title)}</h3>"), *controls, self.verdict, self.message]
        self.widget = w.VBox([*top, *views])

    def summary(self) -> str:
        """What the panel says, as plain text."""
        return str(self.result.summary(self.system))
