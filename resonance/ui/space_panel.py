"""The supports-in-space panel: speed range, damping, soil and mount stiffness; modes in 3D, bearing response."""

from __future__ import annotations

import ipywidgets as w

from ..kinds.space.scenario import SpaceScenario
from ..kinds.space.study import SpaceStudyResult, run_space_study
from .plots import findings_table_html, interference_figure, update_interference_figure
from .space_plots import (
    space_modes_html,
    space_response_figure,
    space_shape_figure,
    update_space_response_figure,
    update_space_shape_figure,
)
from .widgets import (
    KindPanel,
    factor_slider,
    modal_damping_slider,
    slider_range,
    verdict_html,
)

__all__ = ["SpacePanel"]


class SpacePanel(KindPanel):
    """Live check of a machine on its support in space (bodies, frame, mounts, soil).

    Controls: the speed range, the modal damping ratio, a factor on the soil's shear modulus (the least
    certain input), a factor on the stiffness of the mounts the what-if varies (``[whatif] vary_mounts``), the
    mode shown in 3D, a factor on the frame's moduli (when there is a frame) and the unit system. Views:
    verdict, interference diagram, findings, modes in words, the mode in 3D, the bearing response against
    speed in x, y and z.

    Parameters
    ----------
    scenario : SpaceScenario
        The scenario studied.
    """

    def __init__(self, scenario: SpaceScenario):
        self._start(scenario, "170px")
        self.damping = modal_damping_slider(scenario.damping_ratio)
        self.soil = factor_slider("soil shear modulus x", 0.6)
        self.soil.disabled = scenario.soil is None
        self.mounts = factor_slider("isolator stiffness x", 0.6)
        self.frame = factor_slider("frame stiffness x", 0.6)
        self.frame.disabled = not scenario.beams
        self.modes_html = w.HTML()
        self.result: SpaceStudyResult = self.compute()
        self.mode = w.Dropdown(
            options=[(f"mode {i + 1}", i) for i in range(len(self.result.shapes))],
            value=0,
            description="mode shown in 3D",
            style={"description_width": "170px"},
        )
        self.interference_fig = interference_figure(self.result, self.system, widget=True, log_frequency=True)
        self.response_fig = space_response_figure(self.result, self.system, widget=True)
        self.shape_fig = space_shape_figure(self.result, 0, widget=True)
        self._render_text()
        self.mode.observe(self._mode_changed, names="value")
        self._lay_out(
            scenario.title,
            [self.speed, self.damping, self.soil, self.mounts, self.frame, self.units],
            [self.interference_fig, self.findings_html, self.modes_html, self.mode, self.shape_fig, self.response_fig],
        )

    def edited_scenario(self) -> SpaceScenario:
        """The scenario with the panel's speed range, damping and unit system."""
        speed = slider_range(self.speed, self.original.speed)
        return self.original.replace(speed=speed, damping_ratio=float(self.damping.value), units=self.system)

    def compute(self) -> SpaceStudyResult:
        """Re-run the study for the controls (no drawing)."""
        self.scenario = self.edited_scenario()
        return run_space_study(
            self.scenario, float(self.mounts.value), float(self.soil.value), frame_factor=float(self.frame.value)
        )

    def update(self) -> None:
        """Recompute and refresh every view in place."""
        self.result = self.compute()
        update_interference_figure(self.interference_fig, self.result, self.system)
        update_space_response_figure(self.response_fig, self.result, self.system)
        update_space_shape_figure(self.shape_fig, self.result, int(self.mode.value))
        self._render_text()

    def _mode_changed(self, _change: object) -> None:
        update_space_shape_figure(self.shape_fig, self.result, int(self.mode.value))

    def _render_text(self) -> None:
        self.verdict.value = verdict_html(self.summary(), self.result.passed)
        self.findings_html.value = findings_table_html(self.result, self.system)
        self.modes_html.value = space_modes_html(self.result, self.system)
