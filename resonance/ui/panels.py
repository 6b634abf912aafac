"""Widget panels: a scenario, a few controls, live figures and verdicts.

A panel holds a scenario, lets the user edit the speed range, the damping and
the unit system (and, in the what-if panel, support stiffness, mass, a drive
skip band and the tolerance band), re-runs the one flow
(:func:`resonance.kinds.support.study.run_study`) on every change and updates its figures'
traces in place. Panels can be driven without a browser: set a control's
``.value`` and the result, the text and the figure data change at once.
"""

from __future__ import annotations

import dataclasses
import html
import os
from pathlib import Path

import ipywidgets as w

from ..checks.speed_range import operating_range
from ..core.errors import InputValueError
from ..core.units import display_unit
from ..dynamics.damping import amplification_factor_from_damping_ratio, log_decrement
from ..kinds.support.record import build_record
from ..kinds.support.scenario import Scenario, load_scenario, save_scenario
from ..kinds.support.study import StudyResult, run_study
from ..kinds.support.whatif import (
    FixMap,
    ToleranceResult,
    combined_fix_map,
    scaled_model,
    smallest_change,
    tolerance_check,
)
from ..records.record import Record, write_json
from .plots import (
    findings_table_html,
    interference_figure,
    modes_table_html,
    response_figure,
    update_interference_figure,
    update_response_figure,
)
from .report import write_html
from .uncertainty_plots import fix_map_figure
from .widgets import Panel, caution_banner, factor_slider, slider_range, speed_slider, units_toggle, verdict_html

__all__ = ["DesignPanel", "single_mode_panel", "multi_mode_panel", "WhatIfPanel", "RecordPanel"]


def _damping_slider(scenario: Scenario) -> w.FloatSlider:
    return w.FloatSlider(
        value=scenario.model.damping_ratio,
        min=0.005,
        max=0.3,
        step=0.005,
        readout_format=".3f",
        description="damping ratio",
        continuous_update=False,
        style={"description_width": "110px"},
        layout=w.Layout(width="520px"),
    )


def _af_text(zeta: float) -> str:
    af = float(amplification_factor_from_damping_ratio(zeta)[0])
    return f"AF = 1/(2 zeta) = {af:.1f}; log dec. {float(log_decrement(zeta)[0]):.3f}"


class DesignPanel(Panel):
    """Live check of one scenario: speed range, damping and units as controls.

    Parameters
    ----------
    scenario : Scenario
        The starting input (never modified; the panel keeps its own edited copy
        in :attr:`scenario`).
    views : tuple of str
        Which views to show: ``"response"``, ``"interference"``, ``"modes"``,
        ``"findings"``.

    Attributes
    ----------
    scenario : Scenario
        The scenario as currently edited.
    result : StudyResult
        The result of the current scenario.
    widget : ipywidgets.VBox
        The panel (a notebook shows it when the panel is a cell's last value).
    """

    def __init__(self, scenario: Scenario, views: tuple[str, ...] = ("response", "interference", "modes", "findings")):
        self.original = scenario
        self.scenario = scenario
        self.views = views
        self.speed = speed_slider(scenario.speed)
        self.damping = _damping_slider(scenario)
        self.af_label = w.HTML()
        self.units = units_toggle(scenario.units, "110px")
        self.point = w.Dropdown(
            options=list(scenario.model.labels),
            value=scenario.response.measure_at,
            description="response at",
            style={"description_width": "110px"},
        )
        self.verdict = w.HTML()
        self.findings_html = w.HTML()
        self.modes_html = w.HTML()
        self.message = w.HTML()
        self.save_name = w.Text(
            placeholder="new-scenario.toml", description="save as", style={"description_width": "110px"}
        )
        self.save_button = w.Button(description="Save scenario", icon="save")
        self.result: StudyResult = self.compute()
        self.response_fig = response_figure(self.result, self.system, widget=True) if "response" in views else None
        self.interference_fig = (
            interference_figure(self.result, self.system, widget=True) if "interference" in views else None
        )
        self._render_text()
        for control in (self.speed, self.damping, self.units, self.point):
            control.observe(self._changed, names="value")
        self.save_button.on_click(lambda _: self.save(self.save_name.value))
        self.widget = w.VBox(self._children())

    # -- state ------------------------------------------------------------
    def edited_scenario(self) -> Scenario:
        """The scenario with the controls' values applied."""
        edited = self.original.with_speed(slider_range(self.speed, self.original.speed))
        model = dataclasses.replace(edited.model, damping_ratio=float(self.damping.value))
        response = dataclasses.replace(edited.response, measure_at=self.point.value)
        return edited.replace(model=model, response=response, units=self.system)

    def compute(self) -> StudyResult:
        """Re-run the study for the controls' values (no drawing)."""
        self.scenario = self.edited_scenario()
        return run_study(self.scenario)

    def update(self) -> None:
        """Recompute and refresh every view in place."""
        self.result = self.compute()
        if self.response_fig is not None:
            update_response_figure(self.response_fig, self.result, self.system)
        if self.interference_fig is not None:
            update_interference_figure(self.interference_fig, self.result, self.system)
        self._render_text()

    def save(self, path: str | os.PathLike[str]) -> Path | None:
        """Save the edited scenario; an existing file is never overwritten."""
        if not str(path).strip():
            self._error("save as: give a file name")
            return None
        try:
            target = save_scenario(self.scenario, path)
        except FileExistsError as error:
            self._error(str(error))
            return None
        except OSError as error:  # a missing or read-only folder, a name too long: say so, write nothing
            self._error(f"save as: cannot write {path} ({error.strerror or error})")
            return None
        self.message.value = f"saved {html.escape(str(target))}"
        return target

    # -- text ---------------------------------------------------------------
    def summary(self) -> str:
        """What the panel says, as plain text (the verdict, AF and margins)."""
        r = self.result
        lines = [r.summary(self.system)]
        hp = r.half_power
        if hp is not None and r.modes:
            mode = min(r.modes, key=lambda m: abs(m.speed - hp.peak_frequency))
            lines.append(
                f"Response peak at {hp.peak_frequency:.0f} rpm: AF {hp.amplification_factor:.1f} by half-power; "
                f"{mode.label}: 1/(2 zeta) = {mode.amplification_factor:.1f}"
            )
        return "\n".join(lines)

    def _render_text(self) -> None:
        self.af_label.value = _af_text(float(self.damping.value))
        self.verdict.value = verdict_html(self.summary(), self.result.passed)
        self.findings_html.value = findings_table_html(self.result, self.system)
        self.modes_html.value = modes_table_html(self.result, self.system)

    def _children(self) -> list[w.Widget]:
        controls = [self.speed, w.HBox([self.damping, self.af_label]), self.units]
        if len(self.scenario.model.labels) > 1:
            controls.append(self.point)
        children: list[w.Widget] = [
            caution_banner(),
            w.HTML(f"<h3>{html.escape(self.scenario.title)}</h3>"),
            *controls,
            self.verdict,
            self.message,
        ]
        if self.response_fig is not None:
            children.append(self.response_fig)
        if "modes" in self.views:
            children.append(self.modes_html)
        if self.interference_fig is not None:
            children.append(self.interference_fig)
        if "findings" in self.views:
            children.append(self.findings_html)
        children.append(w.HBox([self.save_name, self.save_button]))
        return children


def single_mode_panel(scenario: Scenario) -> DesignPanel:
    """A one-mode check: response and phase against speed, AF, margins, verdict.

    Parameters
    ----------
    scenario : Scenario
        The scenario: its operating range is shaded (and, for a panel, what it runs).

    Returns
    -------
    DesignPanel
        Its ``widget`` shows the controls and the views.

    Raises
    ------
    InputValueError
        A scenario whose study cannot run.
    """
    return DesignPanel(scenario, views=("response", "findings"))


def multi_mode_panel(scenario: Scenario) -> DesignPanel:
    """A machine-on-support check: modes, receptance, interference diagram, findings, ISO zone.

    Parameters
    ----------
    scenario : Scenario
        The scenario: its operating range is shaded (and, for a panel, what it runs).

    Returns
    -------
    DesignPanel
        Its ``widget`` shows the controls and the views.

    Raises
    ------
    InputValueError
        A scenario whose study cannot run.
    """
    return DesignPanel(scenario, views=("response", "modes", "interference", "findings"))


class WhatIfPanel(Panel):
    """What-if study: scale support stiffness and mass, move the range, add a skip band.

    Also finds the smallest stiffness or mass change that makes every check
    pass, and evaluates the checks over the stiffness tolerance band.

    Parameters
    ----------
    scenario : Scenario
        The support scenario studied.
    """

    def __init__(self, scenario: Scenario):
        self.original = scenario
        self.scenario = scenario
        style = {"description_width": "130px"}
        wide = w.Layout(width="520px")
        # Factors from x0.25 to x4 on a logarithmic scale.
        self.stiffness, self.mass = (
            factor_slider(label, 0.6, 0.002, "130px", "520px") for label in ("stiffness x", "mass x")
        )
        self.damping = _damping_slider(scenario)
        self.af_label = w.HTML(_af_text(scenario.model.damping_ratio))
        self.speed = speed_slider(scenario.speed)
        low, high = scenario.speed.speed_min, scenario.speed.speed_max
        band = (
            scenario.speed.skip_bands[0]
            if scenario.speed.skip_bands
            else (low + 0.4 * (high - low), low + 0.5 * (high - low))
        )
        self.skip_on = w.Checkbox(value=bool(scenario.speed.skip_bands), description="drive skip band", indent=False)
        self.skip = w.IntRangeSlider(
            value=(int(band[0]), int(band[1])),
            min=self.speed.min,
            max=self.speed.max,
            step=self.speed.step,
            description="skip [rpm]",
            continuous_update=False,
            style=style,
            layout=wide,
        )
        self.tolerance = w.FloatSlider(
            value=scenario.whatif.tolerance,
            min=0.0,
            max=0.6,
            step=0.05,
            description="stiffness +/-",
            readout_format=".0%",
            continuous_update=False,
            style=style,
            layout=wide,
        )
        self.units = units_toggle(scenario.units, "130px")
        self.find_stiffness = w.Button(description="Smallest stiffness fix")
        self.find_mass = w.Button(description="Smallest mass fix")
        self.find_both = w.Button(description="Map combined fixes", layout=w.Layout(width="180px"))
        self.fix_map: FixMap | None = None
        self.fix_box = w.VBox([])
        self.values = w.HTML()
        self.verdict = w.HTML()
        self.tolerance_text = w.HTML()
        self.fix_text = w.HTML()
        self.message = w.HTML()
        self.findings_html = w.HTML()
        self.result, self.band = self.compute()
        self.figure = interference_figure(self.result, self.system, self.band, widget=True)
        self._render_text()
        controls = (self.stiffness, self.mass, self.damping, self.speed, self.skip_on, self.skip, self.tolerance)
        for control in (*controls, self.units):
            control.observe(self._changed, names="value")
        self.find_stiffness.on_click(lambda _: self.solve("stiffness"))
        self.find_mass.on_click(lambda _: self.solve("mass"))
        self.find_both.on_click(lambda _: self.map_fixes())
        self.widget = w.VBox(
            [
                caution_banner(),
                w.HTML(f"<h3>What-if: {html.escape(scenario.title)}</h3>"),
                self.stiffness,
                self.mass,
                self.values,
                w.HBox([self.damping, self.af_label]),
                self.speed,
                w.HBox([self.skip_on, self.skip]),
                self.tolerance,
                self.units,
                self.verdict,
                self.tolerance_text,
                w.HBox([self.find_stiffness, self.find_mass, self.find_both]),
                self.fix_text,
                self.fix_box,
                self.message,
                self.figure,
                self.findings_html,
            ]
        )

    def edited_scenario(self) -> Scenario:
        """The scenario with the range, skip band, damping and tolerance of the controls."""
        low, high = self.speed.value
        bands = []
        if self.skip_on.value:
            a, b = self.skip.value
            a, b = max(a, low), min(b, high)
            if a < b and not (a <= low and b >= high):
                bands.append((float(a), float(b)))
        whatif = dataclasses.replace(self.original.whatif, tolerance=float(self.tolerance.value))
        edited = self.original.with_speed(operating_range(float(low), float(high), bands))
        model = dataclasses.replace(edited.model, damping_ratio=float(self.damping.value))
        return edited.replace(model=model, whatif=whatif, units=self.system)

    def compute(self) -> tuple[StudyResult, ToleranceResult]:
        """Re-run the study and the tolerance band for the controls (no drawing)."""
        self.scenario = self.edited_scenario()
        model = scaled_model(self.scenario, float(self.stiffness.value), float(self.mass.value))
        result = run_study(self.scenario, model=model)
        band = tolerance_check(
            self.scenario, stiffness_scale=float(self.stiffness.value), mass_scale=float(self.mass.value)
        )
        return result, band

    def update(self) -> None:
        """Recompute and refresh in place."""
        self.result, self.band = self.compute()
        update_interference_figure(self.figure, self.result, self.system, self.band)
        self._render_text()

    def solve(self, parameter: str) -> str:
        """Find the smallest fix of one parameter, show it and set its slider.

        The other factor is taken at 1 (the solver changes one parameter of the
        scenario at a time); the range, skip band and damping are the panel's.
        """
        change = smallest_change(self.edited_scenario(), parameter)  # type: ignore[arg-type]
        targets = self.scenario.whatif.vary_springs if parameter == "stiffness" else self.scenario.whatif.vary_masses
        text = change.describe(targets)
        if change.scale is not None:
            slider = self.stiffness if parameter == "stiffness" else self.mass
            slider.value = change.scale
        self.fix_text.value = html.escape(text)
        return text

    def map_fixes(self) -> str:
        """Map the worst margin over stiffness x mass and move both sliders to the smallest combined fix.

        The range, skip band and damping are the panel's.

        Returns
        -------
        str
            The smallest combined fix in words.

        Raises
        ------
        InputValueError
            Never for a validated scenario.
        """
        span = (10.0**self.stiffness.min, 10.0**self.stiffness.max)  # the sliders' own range
        self.fix_map = combined_fix_map(self.edited_scenario(), span, span, 41)
        figure = fix_map_figure(self.fix_map, widget=True)
        self.fix_box.children = (figure,)
        text = self.fix_map.describe(self.scenario.whatif.vary_springs, self.scenario.whatif.vary_masses)
        if self.fix_map.smallest is not None:
            with self.stiffness.hold_trait_notifications(), self.mass.hold_trait_notifications():
                self.stiffness.value, self.mass.value = self.fix_map.smallest
        self.fix_text.value = html.escape(text)
        return text

    def summary(self) -> str:
        """What the panel says, as plain text."""
        return f"{self.result.summary(self.system)}\n{self.band.summary()}"

    def _render_text(self) -> None:
        k_unit, k_factor = display_unit("stiffness", self.system)
        m_unit, m_factor = display_unit("mass", self.system)
        springs = {s.label: s for s in self.original.model.springs}
        masses = {m.name: m for m in self.original.model.masses}
        parts = [
            f"{name}: {springs[name].stiffness * self.stiffness.value * k_factor:.4g} {k_unit}"
            for name in self.original.whatif.vary_springs
        ] + [
            f"{name}: {masses[name].mass * self.mass.value * m_factor:.4g} {m_unit}"
            for name in self.original.whatif.vary_masses
        ]
        self.values.value = "<small>" + html.escape("; ".join(parts)) + "</small>"
        self.af_label.value = _af_text(float(self.damping.value))
        self.verdict.value = verdict_html(self.result.summary(self.system), self.result.passed)
        self.tolerance_text.value = verdict_html(self.band.summary(), self.band.passed)
        self.findings_html.value = findings_table_html(self.result, self.system)


class RecordPanel(Panel):
    """Load a scenario file, run every check, show the record and export it.

    After loading, the speed range and damping can be changed for a
    sensitivity look; the record then states the edited scenario it was made
    from, so the exported JSON re-runs with the ``check`` command.

    Parameters
    ----------
    scenario : Scenario or path-like
        A loaded scenario, or the path of a scenario file (empty: enter it in the panel).
    output_dir : path-like
        Folder the export writes to.
    """

    def __init__(
        self, scenario: Scenario | str | os.PathLike[str] = "", output_dir: str | os.PathLike[str] = "records"
    ):
        # Like every panel, the first argument is the scenario: a loaded one, or the path of its file.
        path = scenario.source if isinstance(scenario, Scenario) else str(scenario)
        self.path = w.Text(value=path, description="scenario", layout=w.Layout(width="520px"))
        self.output_dir = w.Text(value=str(output_dir), description="export to", layout=w.Layout(width="520px"))
        self.load_button = w.Button(description="Load and run", icon="play")
        self.export_button = w.Button(description="Export HTML + JSON", icon="download")
        self.controls = w.VBox()
        self.text = w.HTML()
        self.message = w.HTML()
        self.original: Scenario | None = None
        self.speed: w.IntRangeSlider | None = None
        self.damping: w.FloatSlider | None = None
        self.units: w.ToggleButtons | None = None
        self.record: Record | None = None
        self.result: StudyResult | None = None
        self.load_button.on_click(lambda _: self.load())
        self.export_button.on_click(lambda _: self.export())
        # No banner here: the record shown below ends with its caution, once.
        self.widget = w.VBox(
            [
                w.HBox([self.path, self.load_button]),
                self.controls,
                self.message,
                self.text,
                w.HBox([self.output_dir, self.export_button]),
            ]
        )
        if isinstance(scenario, Scenario):
            self.show(scenario)
        elif self.path.value:
            self.load()

    def load(self) -> bool:
        """Load and run the scenario in the path field; show errors, never a partial record."""
        try:
            scenario = load_scenario(self.path.value)
        except InputValueError as error:
            self.original = self.record = self.result = None
            self.controls.children = ()
            self.text.value = ""
            self._error(str(error))
            return False
        self.show(scenario)
        return True

    def show(self, scenario: Scenario) -> None:
        """Run a scenario and show its record, with the sensitivity controls set from it."""
        self.original = scenario
        self.speed, self.damping = speed_slider(scenario.speed), _damping_slider(scenario)
        self.units = units_toggle(scenario.units, "110px")
        for control in (self.speed, self.damping, self.units):
            control.observe(self._changed, names="value")
        self.controls.children = (self.speed, self.damping, self.units)
        self.update()

    def edited_scenario(self) -> Scenario:
        """The loaded scenario with the panel's speed range, damping and unit system."""
        if self.original is None or self.speed is None or self.damping is None or self.units is None:
            raise InputValueError("scenario: none loaded; load a scenario file first")
        edited = self.original.with_speed(slider_range(self.speed, self.original.speed))
        model = dataclasses.replace(edited.model, damping_ratio=float(self.damping.value))
        edited = edited.replace(model=model, units=self.units.value)
        # Untouched controls: the scenario as loaded, whose file hash the record then carries.
        return self.original if edited == self.original else edited

    def update(self) -> None:
        """Run every check of the (edited) scenario and rebuild the record."""
        result = run_study(self.edited_scenario())
        self.result, self.record = result, build_record(result)
        self.text.value = f"<pre style='font-size:85%'>{html.escape(self.record.text)}</pre>"
        self.message.value = verdict_html(result.summary(result.scenario.units), result.passed)

    def export(self) -> tuple[Path, Path] | None:
        """Write the HTML and JSON records to the export folder."""
        if self.record is None or self.result is None:
            self._error("nothing to export: load a scenario first")
            return None
        folder = Path(self.output_dir.value)
        folder.mkdir(parents=True, exist_ok=True)
        stem = Path(self.path.value).stem
        html_path = write_html(self.result, self.record, folder / f"{stem}.html")
        json_path = write_json(self.record, folder / f"{stem}.json")
        self.message.value += f"<p>exported {html.escape(str(html_path))} and {html.escape(str(json_path))}</p>"
        return html_path, json_path
