"""The torsional panel: speed range, coupling stiffness and damping; live interference, shapes and torques."""

from __future__ import annotations

import ipywidgets as w

from ..kinds.torsion.scenario import TorsionScenario
from ..kinds.torsion.study import TorsionStudyResult, run_torsion_study
from ..kinds.torsion.train import scale_couplings, scale_dampers
from .plots import findings_table_html, interference_figure, update_interference_figure
from .torsion_plots import (
    torque_figure,
    torque_table_html,
    torsion_modes_html,
    torsion_shape_figure,
    update_torque_figure,
    update_torsion_shape_figure,
)
from .widgets import (
    KindPanel,
    factor_slider,
    modal_damping_slider,
    slider_range,
    verdict_html,
)

__all__ = ["TorsionPanel"]


class TorsionPanel(KindPanel):
    """Live torsional check of a drive train.

    Controls: the driver's operating speed range, a factor on every coupling's stiffness (the maker's data
    carry a tolerance, and a change of coupling is the usual fix), the damping (the modal ratio when the
    scenario gives one, else a factor on the element dampers) and the unit system. Views: verdict, interference
    diagram, findings, modes, mode shapes, dynamic torque against speed and the torque table.

    Parameters
    ----------
    scenario : TorsionScenario
        The torsional scenario studied.
    """

    def __init__(self, scenario: TorsionScenario):
        self._start(scenario, "170px")
        self.coupling = factor_slider("coupling stiffness x")
        if scenario.damping_ratio is not None:
            self.damping: w.FloatSlider | w.FloatLogSlider = modal_damping_slider(scenario.damping_ratio)
        else:
            self.damping = factor_slider("element dampers x")
        self.modes_html = w.HTML()
        self.torque_html = w.HTML()
        self.result: TorsionStudyResult = self.compute()
        self.interference_fig = interference_figure(self.result, self.system, widget=True, log_frequency=True)
        self.shape_fig = torsion_shape_figure(self.result, widget=True)
        self.torque_fig = torque_figure(self.result, self.system, widget=True)
        self._render_text()
        self._lay_out(
            scenario.title,
            [self.speed, self.coupling, self.damping, self.units],
            [
                self.interference_fig,
                self.findings_html,
                self.modes_html,
                self.shape_fig,
                self.torque_fig,
                self.torque_html,
            ],
        )

    def edited_scenario(self) -> TorsionScenario:
        """The scenario with the panel's speed range, coupling stiffness, damping and unit system."""
        train = scale_couplings(self.original.train, float(self.coupling.value))
        zeta = self.original.damping_ratio
        if zeta is None:
            train = scale_dampers(train, float(self.damping.value))
        else:
            zeta = float(self.damping.value)
        return self.original.replace(
            speed=slider_range(self.speed, self.original.speed), train=train, damping_ratio=zeta, units=self.system
        )

    def compute(self) -> TorsionStudyResult:
        """Re-run the torsional study for the controls (no drawing)."""
        self.scenario = self.edited_scenario()
        return run_torsion_study(self.scenario)

    def update(self) -> None:
        """Recompute and refresh every view in place."""
        self.result = self.compute()
        update_interference_figure(self.interference_fig, self.result, self.system)
        update_torsion_shape_figure(self.shape_fig, self.result)
        update_torque_figure(self.torque_fig, self.result, self.system)
        self._render_text()

    def _render_text(self) -> None:
        self.verdict.value = verdict_html(self.summary(), self.result.passed)
        self.findings_html.value = findings_table_html(self.result, self.system)
        self.modes_html.value = torsion_modes_html(self.result, self.system)
        self.torque_html.value = torque_table_html(self.result, self.system)
