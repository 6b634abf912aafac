"""Field verification flow: a scenario's [field] table -> measured findings, tuned model, panel, check command.

The demo files in notebooks/data/ are synthesized by tools/make_field_data.py from an invented machine
whose floor stiffness is 60 kN/mm; the design scenario says 80 kN/mm, so tuning must find about x0.75
(the known truth of the synthetic data). Margins are recomputed with the engine's published formulas
(API RP 684 separation margin; API Std 617 / RP 684 required margin; both from memory).
"""

import json

import numpy as np
import pytest
import tomli_w
import tomllib
from numpy.testing import assert_allclose

import resonance as R
from resonance.cli import main
from resonance.kinds.field.study import field_spec, run_field_study
from resonance.kinds.support.scenario import ScenarioError, load_scenario, parse_scenario
from resonance.kinds.support.study import run_study
from resonance.ui import FieldPanel


@pytest.fixture
def field_path(pump_path):
    return pump_path.parent / "fan_on_pedestal.toml"


@pytest.fixture
def field_scenario(field_path):
    return load_scenario(field_path)


def test_field_study_against_the_truth(field_scenario, field_path):
    result = run_field_study(field_scenario, field_path.parent)
    (resonance,) = [r for r in result.resonances if r.confirmed]
    (finding,) = result.findings
    assert_allclose(finding.margin, R.separation_margin(resonance.speed, 1000.0, 1500.0), rtol=1e-12)
    assert finding.required_margin == 15.0  # a measured support mode takes the scenario's flat margin
    assert finding.mode.af_source.startswith("measured")
    assert_allclose(result.tuned.factors["floor"], 0.75, rtol=0.01)  # truth of the synthetic data
    assert result.tuned.mismatch_after < 0.5
    assert result.consistent_poles >= 1  # the consistency check across model orders confirms the 97 Hz mode
    assert not result.passed  # the field contradicts the design model, which passed
    assert R.interference_check(
        list(run_study(field_scenario).modes),
        list(field_scenario.excitations),
        field_scenario.speed,
        field_scenario.rules,
    ).passed


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda d: d["field"].pop("channel"), r"fan_on_pedestal\.toml: field\.channel: missing"),
        (lambda d: d["field"].update(colour="red"), r"field\.colour: unknown field"),
        (lambda d: d["field"].update(band=["3000 rpm", "800 rpm"]), r"field\.band: got .*; expected low < high"),
        (
            lambda d: d["field"].update(tune=[{"spring": "floor", "mass": "housing"}]),
            r"field\.tune\[0\]: expected a table with exactly one",
        ),
        (lambda d: d["field"].update(impact_modes=0), r"field\.impact_modes: got 0"),
    ],
)
def test_field_table_errors(field_path, edit, message):
    data = tomllib.loads(field_path.read_text())
    edit(data)
    with pytest.raises(ScenarioError, match=message):
        field_spec(parse_scenario(data, "fan_on_pedestal.toml"), field_path.parent)


def test_field_panel_headless(field_scenario, field_path):
    panel = FieldPanel(field_scenario, field_path.parent)
    assert "Field verdict: FAIL" in panel.verdict.value
    panel.speed.value = (1000, 1300)  # the measured critical is then 100 (1725 - 1300) / 1300 = 33 % above
    assert "Field verdict: PASS" in panel.verdict.value
    speed = panel.result.resonances[0].speed
    assert_allclose(panel.result.findings[0].margin, R.separation_margin(speed, 1000.0, 1300.0), rtol=1e-12)
    before = np.array(panel.bode.data[1].x)
    panel.band.value = (1200, 2400)
    assert not np.allclose(np.array(panel.bode.data[1].x)[[0, -1]], before[[0, -1]])
    panel.units.value = "US"
    assert "mil pk-pk" in panel.bode.layout.yaxis.title.text


def test_check_command_includes_the_field_verification(tmp_path, field_path, capsys):
    # Copy scenario and data so the relative paths resolve from the copy's folder.
    (tmp_path / "scenarios").mkdir()
    (tmp_path / "data").mkdir()
    for name in ("coastdown_fan.csv", "impact_fan.csv"):
        (tmp_path / "data" / name).write_bytes((field_path.parent.parent / "data" / name).read_bytes())
    scenario = tmp_path / "scenarios" / "fan.toml"
    scenario.write_bytes(field_path.read_bytes())
    js, page = tmp_path / "r.json", tmp_path / "r.html"
    assert main(["check", str(scenario), "--json", str(js), "--html", str(page)]) == 1
    record = json.loads(js.read_text())
    assert record["verdict"] == "FAIL"
    assert record["field"]["passed"] is False
    assert "FIELD VERIFICATION" in capsys.readouterr().out
    assert "Polar view" in page.read_text()
    data = tomllib.loads(scenario.read_text())
    data["field"]["coastdown"] = "../data/missing.csv"
    scenario.write_text(tomli_w.dumps(data))
    assert main(["check", str(scenario)]) == 2
    assert "missing.csv: cannot be read" in capsys.readouterr().err


def test_field_panel_impact_view(field_scenario, field_path):
    # The impact view shows H1 as receptance and marks the RFP modes at their frequencies.
    panel = FieldPanel(field_scenario, field_path.parent)
    marks = np.array(panel.impact.data[1].x)
    assert_allclose(marks, [p.frequency for p in panel.result.impact_poles])
    assert np.max(panel.impact.data[2].y) <= 1.0 + 1e-12
