"""The uncertainty panel: how likely a margin fails, which inputs drive it, which two changes fix it."""

from __future__ import annotations

import dataclasses
import html

import ipywidgets as w

from ..kinds.support.scenario import Scenario
from ..kinds.support.whatif import FixMap, combined_fix_map
from ..studies.uncertainty import UncertaintyResult, UncertaintySpec, run_uncertainty, uncertainty_spec
from .uncertainty_plots import (
    failure_probability_figure,
    fix_map_figure,
    sensitivity_figure,
    update_fix_map_figure,
    update_uncertainty_figures,
    worst_margin_figure,
)
from .widgets import Panel, caution_banner, verdict_html

__all__ = ["UncertaintyPanel"]

_STYLE = {"description_width": "150px"}


class UncertaintyPanel(Panel):
    """An uncertainty study and a combined-fix map of a support scenario with an ``[uncertainty]`` table.

    Controls: the number of samples, the sampler and its seed (the inputs' distributions are the scenario's),
    and the span of the fix map's factors. Views: the probability of failure, the distribution of the worst
    margin, the probability of failure per finding, the sensitivity of the worst margin to each input, and
    the worst margin over stiffness x mass with the passing region outlined and the smallest combined fix.

    Parameters
    ----------
    scenario : Scenario
        A support scenario with an ``[uncertainty]`` table.
    """

    units = None

    def __init__(self, scenario: Scenario):
        if not scenario.uncertainty:
            raise ValueError("scenario: has no [uncertainty] table; add one (see resonance.studies.uncertainty)")
        self.scenario = scenario
        self.base: UncertaintySpec = uncertainty_spec(scenario.uncertainty, scenario, scenario.source)
        self.samples = w.Dropdown(
            options=[1024, 4096, 16384], value=min((1024, 4096, 16384), key=lambda n: abs(n - self.base.samples))
        )
        self.samples.description, self.samples.style = "samples", _STYLE
        self.sampling = w.ToggleButtons(options=["lhs", "sobol"], value=self.base.sampling, description="sampling")
        self.sampling.style = {"description_width": "150px", "button_width": "70px"}
        self.seed = w.BoundedIntText(value=self.base.seed, min=0, max=2**31 - 1, description="seed", style=_STYLE)
        self.span = w.FloatSlider(
            value=2.0,
            min=1.2,
            max=4.0,
            step=0.1,
            description="fix map: factors x1/",
            readout_format=".1f",
            continuous_update=False,
            style=_STYLE,
            layout=w.Layout(width="520px"),
        )
        self.bar = w.IntProgress(value=0, min=0, max=1, description="sampling", style=_STYLE)
        self.verdict = w.HTML()
        self.message = w.HTML()
        self.fix_text = w.HTML()
        self.result: UncertaintyResult = self.compute()
        self.fixes: FixMap = self.compute_fixes()
        self.histogram = worst_margin_figure(self.result, widget=True)
        self.probability = failure_probability_figure(self.result, widget=True)
        self.sensitivity = sensitivity_figure(self.result, widget=True)
        self.map = fix_map_figure(self.fixes, widget=True)
        self._render_text()
        for control in (self.samples, self.sampling, self.seed):
            control.observe(self._changed, names="value")
        self.span.observe(self._span_changed, names="value")
        self.widget = w.VBox(
            [
                caution_banner(),
                w.HTML(f"<h3>Uncertainty and combined fixes: {html.escape(scenario.title)}</h3>"),
                w.HTML(
                    "<small>Inputs (factors on the nominal values): "
                    + html.escape("; ".join(f"{x.vary}: {x.words}" for x in self.base.inputs))
                    + "</small>"
                ),
                w.HBox([self.samples, self.sampling]),
                self.seed,
                self.bar,
                self.verdict,
                self.message,
                self.histogram,
                self.probability,
                self.sensitivity,
                self.span,
                self.fix_text,
                self.map,
            ]
        )

    def spec(self) -> UncertaintySpec:
        """The scenario's study with the panel's number of samples, sampler and seed."""
        samples = int(self.samples.value)
        return dataclasses.replace(self.base, samples=samples, sampling=self.sampling.value, seed=int(self.seed.value))

    def compute(self) -> UncertaintyResult:
        """Re-run the uncertainty study for the controls (no drawing)."""
        self.bar.value, self.bar.max = 0, 1

        def advance(done: int, total: int) -> None:
            self.bar.max, self.bar.value = total, done

        return run_uncertainty(self.scenario, self.spec(), on_progress=advance)

    def compute_fixes(self) -> FixMap:
        """Re-map the combined fixes for the span (no drawing)."""
        span = float(self.span.value)
        return combined_fix_map(self.scenario, (1.0 / span, span), (1.0 / span, span), 41)

    def update(self) -> None:
        """Recompute the study and refresh its views in place."""
        self.result = self.compute()
        update_uncertainty_figures(self.result, self.histogram, self.probability, self.sensitivity)
        self._render_text()

    def _span_changed(self, _change: object) -> None:
        self.fixes = self.compute_fixes()
        update_fix_map_figure(self.map, self.fixes)
        self._render_text()

    def summary(self) -> str:
        """What the panel says, as plain text."""
        springs, masses = self.scenario.whatif.vary_springs, self.scenario.whatif.vary_masses
        return f"{self.result.summary()}\n{self.fixes.describe(springs, masses)}"

    def _render_text(self) -> None:
        self.verdict.value = verdict_html(self.result.summary(), self.result.probability_any == 0.0)
        springs, masses = self.scenario.whatif.vary_springs, self.scenario.whatif.vary_masses
        self.fix_text.value = html.escape(self.fixes.describe(springs, masses))
