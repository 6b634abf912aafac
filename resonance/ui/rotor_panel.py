"""The rotor panel: speed range, bearing stiffness and damping, live Campbell diagram and response."""

from __future__ import annotations

import ipywidgets as w

from ..kinds.rotor.scenario import RotorScenario
from ..kinds.rotor.study import RotorStudyResult, run_rotor_study
from .plots import findings_table_html
from .rotor_plots import (
    campbell_figure,
    mode_shape_figure,
    rotor_response_figure,
    speed_map_figure,
    update_campbell_figure,
    update_mode_shape_figure,
    update_rotor_response_figure,
    update_speed_map_figure,
)
from .widgets import KindPanel, factor_slider, slider_range, verdict_html

__all__ = ["RotorPanel"]


class RotorPanel(KindPanel):
    """Live rotor critical-speed check of a rotor scenario.

    Controls: the operating speed range, factors on every bearing's stiffness
    and damping, and the unit system. Views: verdict, Campbell diagram,
    unbalance response, findings, critical speed map, mode shapes.

    Parameters
    ----------
    scenario : RotorScenario
        The rotor scenario studied.
    """

    def __init__(self, scenario: RotorScenario):
        self._start(scenario, "110px")
        self.stiffness = factor_slider("bearing stiffness x", label_width="150px", width="540px")
        self.damping = factor_slider("bearing damping x", label_width="150px", width="540px")
        self.shape_speed = w.IntSlider(
            value=round(scenario.speed.speed_max),
            min=0,
            max=round(scenario.sweep_max),
            step=10,
            description="mode shapes at [rpm]",
            continuous_update=False,
            style={"description_width": "150px"},
            layout=w.Layout(width="540px"),
        )
        self.result: RotorStudyResult = self.compute()
        self.campbell_fig = campbell_figure(self.result, self.system, widget=True)
        self.response_fig = rotor_response_figure(self.result, self.system, widget=True)
        self.map_fig = speed_map_figure(self.result, self.system, widget=True)
        self.shape_fig = mode_shape_figure(self.result, widget=True)
        self._render_text()
        self._lay_out(
            scenario.title,
            [self.speed, self.stiffness, self.damping, self.units],
            [self.campbell_fig, self.response_fig, self.findings_html, self.map_fig, self.shape_speed, self.shape_fig],
            also=[self.shape_speed],
        )

    def edited_scenario(self) -> RotorScenario:
        """The scenario with the panel's speed range and unit system."""
        speed = slider_range(self.speed, self.original.speed)
        sweep = max(self.original.sweep_max, 1.25 * speed.speed_max)
        return self.original.replace(speed=speed, units=self.system, sweep_max=sweep)

    def compute(self) -> RotorStudyResult:
        """Re-run the rotor study for the controls (no drawing)."""
        self.scenario = self.edited_scenario()
        # The last result lends what the moved control does not touch (Campbell data, criticals, map, response).
        return run_rotor_study(
            self.scenario,
            float(self.stiffness.value),
            float(self.damping.value),
            float(self.shape_speed.value),
            previous=getattr(self, "result", None),
        )

    def update(self) -> None:
        """Recompute and refresh every view in place."""
        self.result = self.compute()
        update_campbell_figure(self.campbell_fig, self.result, self.system)
        update_rotor_response_figure(self.response_fig, self.result, self.system)
        update_speed_map_figure(self.map_fig, self.result, self.system)
        update_mode_shape_figure(self.shape_fig, self.result)
        self._render_text()

    def _render_text(self) -> None:
        self.verdict.value = verdict_html(self.summary(), self.result.passed)
        self.findings_html.value = findings_table_html(self.result, self.system)
