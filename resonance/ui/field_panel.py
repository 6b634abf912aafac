"""The field-verification panel: measured coast-down, identified resonances, margins and the tuned model."""

from __future__ import annotations

import os
from pathlib import Path

import ipywidgets as w

from ..kinds.field.study import FieldStudyResult, run_field_study
from ..kinds.support.scenario import Scenario
from .field_plots import (
    bode_figure,
    impact_figure,
    polar_figure,
    update_bode_figure,
    update_impact_figure,
    update_polar_figure,
)
from .widgets import KindPanel, slider_range, verdict_html

__all__ = ["FieldPanel"]


class FieldPanel(KindPanel):
    """Field verification of a scenario with a ``[field]`` table.

    Controls: the operating speed range, the coast-down channel, the fitting band and the units.
    Views: verdict, Bode and polar plots with the fitted model, measured findings, tuned model.

    Parameters
    ----------
    scenario : Scenario
        A support scenario with a ``[field]`` table.
    base_dir : path-like
        Folder its measurement files are relative to.
    """

    def __init__(self, scenario: Scenario, base_dir: str | os.PathLike[str] = "."):
        self._start(scenario, "110px")
        self.base_dir = Path(base_dir)
        first = run_field_study(scenario, self.base_dir)
        channels = sorted(first.coastdown.channels)
        speeds = first.coastdown.speed
        band = first.spec.band or (float(speeds[0]), float(speeds[-1]))
        self.channel = w.Dropdown(
            options=channels, value=first.spec.channel, description="channel", style={"description_width": "110px"}
        )
        self.band = w.IntRangeSlider(
            value=(int(band[0]), int(band[1])),
            min=int(speeds[0]),
            max=int(speeds[-1]),
            step=10,
            description="fit band [rpm]",
            continuous_update=False,
            style={"description_width": "110px"},
            layout=w.Layout(width="520px"),
        )
        self.tuned_html = w.HTML()
        self.result: FieldStudyResult = first
        self.bode = bode_figure(first, scenario, self.channel.value, self.system, widget=True)
        self.polar = polar_figure(first, self.channel.value, self.system, widget=True)
        self.impact = impact_figure(first, widget=True)
        self._render_text()
        self._lay_out(
            f"Field verification: {scenario.title}",
            [self.speed, self.channel, self.band, self.units],
            [
                self.bode,
                self.polar,
                self.impact,
                w.HTML("<h4>Measured modes against the rules</h4>"),
                self.findings_html,
                w.HTML("<h4>Tuned model</h4>"),
                self.tuned_html,
            ],
        )

    def compute(self) -> FieldStudyResult:
        """Re-run the field study for the controls (no drawing)."""
        self.scenario = self.original.with_speed(slider_range(self.speed, self.original.speed))
        band_low, band_high = self.band.value
        return run_field_study(self.scenario, self.base_dir, self.channel.value, (float(band_low), float(band_high)))

    def update(self) -> None:
        """Recompute and refresh the views in place."""
        self.result = self.compute()
        update_bode_figure(self.bode, self.result, self.scenario, self.channel.value, self.system)
        update_polar_figure(self.polar, self.result, self.channel.value, self.system)
        update_impact_figure(self.impact, self.result)
        self._render_text()

    def summary(self) -> str:
        """What the panel says, as plain text."""
        return self.result.summary()

    def _render_text(self) -> None:
        self.verdict.value = verdict_html(self.summary(), self.result.passed)
        self.findings_html.value = self.result.findings.to_html(system=self.system) if self.result.findings else ""
        tuned = self.result.tuned_study
        self.tuned_html.value = tuned.findings.to_html(system=self.system) if tuned is not None else "no tuning asked"
