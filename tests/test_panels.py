"""Panels driven headless: set a control, check verdicts, margins and plot data.

Expected values come from the engine's own published formulas, computed here
independently of the panel: separation margin and the API lateral required
margin (API RP 684 / API Std 617, from memory); the unbalance peak
X = U / (2 zeta m) at w = wn for one mass (Rao, Mechanical Vibrations, 6th ed.,
sec. 3.7); 1 mil = 25.4 um (NIST SP 811). Scenarios are invented demo data.
"""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

import resonance as R
from resonance.kinds.support.scenario import load_scenario
from resonance.kinds.support.whatif import smallest_change
from resonance.ui import RecordPanel, WhatIfPanel, multi_mode_panel, single_mode_panel


def test_single_mode_speed_range_changes_verdict(pump):
    panel = single_mode_panel(pump)
    assert panel.result.verdict == "FAIL"
    assert "Verdict: FAIL" in panel.verdict.value
    panel.speed.value = (1450, 1800)
    f_n = panel.result.modes[0].frequency
    zeta = panel.result.modes[0].damping_ratio
    two_x = next(f for f in panel.result.findings if f.excitation.label == "2x")
    # The 2x coincidence 60 f_n / 2 lies below 1450 rpm: SM per API RP 684 (from memory); a structural mode
    # against 2x takes the scenario's flat 15 % (common practice), whatever its damping (zeta is not used).
    assert zeta > 0.0
    assert_allclose(two_x.margin, R.separation_margin(60 * f_n / 2, 1450, 1800), rtol=1e-12)
    assert two_x.required_margin == 15.0
    assert two_x.rule == "flat 15 %"
    assert panel.result.verdict == "PASS"
    assert "Verdict: PASS" in panel.verdict.value
    # The operating band drawn in the response figure moved with the slider.
    bands = [s for s in panel.response_fig.layout.shapes if s.fillcolor.startswith("rgba(60, 120, 216")]
    assert (bands[0].x0, bands[0].x1) == (1450.0, 1800.0)


def test_single_mode_damping_moves_peak_and_af(pump):
    panel = single_mode_panel(pump)
    m = pump.model.masses[0].mass
    for zeta in (0.02, 0.1):
        panel.damping.value = zeta
        # Peak of U w^2 / |k - m w^2 + i c w| is U / (2 zeta m sqrt(1 - zeta^2)) for one mass (Rao sec. 3.7).
        peak = 1e6 * 2 * panel.scenario.response.unbalance / (2 * zeta * m * math.sqrt(1 - zeta**2))
        plotted = np.max(panel.response_fig.data[0].y)  # um pk-pk
        assert_allclose(plotted, peak, rtol=2e-3)
        assert f"{1 / (2 * zeta):.1f}" in panel.af_label.value
        # AF = 1 / (2 zeta) holds for light damping (API RP 684, from memory): within 5 % up to zeta = 0.1.
        assert_allclose(panel.result.half_power.amplification_factor, 1 / (2 * zeta), rtol=0.05)


def test_units_switch_relabels_and_rescales(pump):
    panel = single_mode_panel(pump)
    si = np.array(panel.response_fig.data[0].y)
    panel.units.value = "US"
    assert "mil pk-pk" in panel.response_fig.layout.yaxis.title.text
    assert_allclose(np.array(panel.response_fig.data[0].y), si / 25.4, rtol=1e-12)


def test_multi_mode_point_and_interference_markers(foundation):
    panel = multi_mode_panel(foundation)
    machine = np.array(panel.response_fig.data[2].y)
    panel.point.value = "block"
    block = np.array(panel.response_fig.data[2].y)
    # Receptance at another mass is another column of H (engine's receptance, not the panel's).
    h = R.model_receptance(panel.result.model, panel.result.speed / 60, 0)[:, 2]
    assert_allclose(block, np.abs(h) * 1e6, rtol=1e-12)
    assert not np.allclose(block, machine)
    markers = panel.interference_fig.data[-1]
    failing = [f for f in panel.result.findings if not f.passed and f.coincidence_speed is not None]
    assert list(markers.marker.color).count("#d62828") == len(failing) >= 1
    assert "mode 1 (machine with baseplate and block)" in panel.modes_html.value


def test_what_if_stiffness_and_solver(foundation):
    panel = WhatIfPanel(foundation)
    assert panel.result.verdict == "FAIL"
    text = panel.solve("stiffness")
    assert text.startswith("Smallest stiffness fix: soften mounting by")
    assert panel.result.passed  # the slider was set to the fix
    assert_allclose(panel.stiffness.value, smallest_change(foundation, "stiffness").scale, rtol=1e-3)
    assert len(panel.band.frequency_bands) == len(panel.result.modes)
    greys = [s for s in panel.figure.layout.shapes if s.fillcolor.startswith("rgba(120, 120, 120")]
    assert len(greys) == len(panel.result.modes)


def test_what_if_skip_band_changes_margins(foundation):
    panel = WhatIfPanel(foundation)
    panel.speed.value = (2000, 3000)
    before = {(f.mode.label, f.excitation.label): f.margin for f in panel.result.findings}
    panel.skip.value = (2050, 2150)
    panel.skip_on.value = True
    assert panel.scenario.speed.skip_bands == ((2050.0, 2150.0),)
    after = {(f.mode.label, f.excitation.label): f.margin for f in panel.result.findings}
    assert before != after


def test_design_panel_save_keeps_existing_files(tmp_path, pump):
    panel = single_mode_panel(pump)
    target = tmp_path / "edited.toml"
    panel.speed.value = (1000, 1700)
    assert panel.save(target) == target
    assert load_scenario(target).speed.speed_min == 1000.0
    target.write_text("# mine")
    assert panel.save(target) is None
    assert target.read_text() == "# mine"
    assert "exists" in panel.message.value


def test_record_panel(tmp_path, foundation_path):
    panel = RecordPanel(foundation_path, output_dir=tmp_path)
    assert "VERDICT: FAIL" in panel.text.value
    html_path, json_path = panel.export()
    assert html_path.exists()
    assert json_path.exists()
    panel.path.value = str(tmp_path / "nope.toml")
    assert not panel.load()
    assert panel.record is None
    assert "cannot be read" in panel.message.value
    assert panel.export() is None


@pytest.mark.parametrize("factory", [single_mode_panel, multi_mode_panel, WhatIfPanel])
def test_every_panel_shows_the_caution(pump, factory):
    panel = factory(pump)
    assert "Caution." in panel.widget.children[0].value


def test_record_panel_shows_the_caution_once_at_the_end_of_its_record(tmp_path, foundation_path):
    panel = RecordPanel(foundation_path, output_dir=tmp_path)
    shown = panel.text.value
    assert shown.count("CAUTION") == 1
    assert "Operating near an unverified resonance" in shown
    assert "CAUTION" not in panel.record.body
    assert panel.record.text.startswith(panel.record.body)


def test_record_panel_sensitivity_controls(tmp_path, foundation_path):
    # Raising the minimum speed to 2600 rpm moves the 2x band up: mode 2's 2x coincidence (about
    # 2095 rpm) is then 100 (2600 - 2095) / 2600 = 19 % below, above the flat 15 % (common practice).
    panel = RecordPanel(foundation_path, output_dir=tmp_path)
    assert panel.record.data["verdict"] == "FAIL"
    panel.speed.value = (2600, 3000)
    assert panel.record.data["verdict"] == "PASS"
    assert panel.record.data["scenario"]["speed"]["min"] == "2600.0 rpm"
    two_x = next(f for f in panel.result.findings if f.excitation.label == "2x" and f.mode.label.startswith("mode 2"))
    assert_allclose(two_x.margin, R.separation_margin(two_x.coincidence_speed, 2600, 3000), rtol=1e-12)


def test_record_panel_units(tmp_path, foundation_path):
    # US customary: frequencies in cpm (1 Hz = 60 cpm), velocity in in/s (1 in = 25.4 mm).
    panel = RecordPanel(foundation_path, output_dir=tmp_path)
    mm_s = panel.result.peak_velocity_rms * 1e3
    panel.units.value = "US"
    assert "f_n [cpm]" in panel.record.text
    assert f"{mm_s / 25.4:.3f} in/s RMS" in panel.record.text
    assert panel.record.data["scenario"]["scenario"]["units"] == "US"


def test_record_panel_takes_a_scenario_like_every_panel_and_keeps_its_hash(tmp_path, foundation_path, foundation):
    panel = RecordPanel(foundation, output_dir=tmp_path)
    assert panel.record.data["scenario_sha256"] == foundation.sha256 is not None  # untouched: the file's hash
    panel.speed.value = (2600, 3000)
    assert panel.record.data["scenario_sha256"] is None  # edited in memory: no file hash to claim
    from_path = RecordPanel(foundation_path, output_dir=tmp_path)
    assert from_path.record.data["scenario_sha256"] == foundation.sha256


def test_saving_into_a_missing_folder_is_refused_in_words(pump, tmp_path):
    panel = single_mode_panel(pump)
    assert panel.save(tmp_path / "missing" / "new.toml") is None
    assert "save as: cannot write" in panel.message.value
    assert not (tmp_path / "missing").exists()
