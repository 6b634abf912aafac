"""The rotor flow: scenario file -> study -> findings, records, panel and check command.

Expected values are recomputed here with the engine's published formulas, not
copied from its output: separation margin (API RP 684, from memory), required
margin from the AF (API Std 617 / API RP 684, from memory), AF by the
half-power method on the unbalance response (API RP 684, from memory), the
API shaft vibration limit (API Std 617, from memory). The demo rotor is an
invented fan.
"""

import json

import numpy as np
import pytest
import tomli_w
import tomllib
from numpy.testing import assert_allclose

import resonance as R
from resonance.cli import main
from resonance.kinds.rotor import critical_speeds, load_rotor_scenario, parse_rotor_scenario, run_rotor_study
from resonance.kinds.rotor.scenario import rotor_scenario_to_dict
from resonance.kinds.support.scenario import ScenarioError
from resonance.ui import RotorPanel


@pytest.fixture
def fan_path(pump_path):
    return pump_path.parent / "fan_rotor.toml"


@pytest.fixture
def fan(fan_path):
    return load_rotor_scenario(fan_path)


def test_rotor_scenario_round_trip(fan):
    assert parse_rotor_scenario(rotor_scenario_to_dict(fan), fan.source) == fan
    assert fan.bearings[0].speeds == (0.0, 3600.0)
    assert fan.unbalance[0].amount == pytest.approx(3e-3)


def test_study_findings_follow_the_published_rules(fan):
    result = run_rotor_study(fan)
    again = critical_speeds(result.rotor, result.campbell, orders=(1.0,))
    assert [c.speed for c in result.criticals] == [c.speed for c in again]
    (finding,) = result.findings
    critical = result.criticals[0]
    assert_allclose(finding.margin, R.separation_margin(critical.speed, 900.0, 1800.0), rtol=1e-12)
    probe = int(np.argmax(result.response.major_pk_pk.max(axis=0)))
    af = R.amplification_factor(result.response.speed, result.response.major_pk_pk[:, probe], near=critical.speed)
    assert_allclose(finding.mode.amplification_factor, af, rtol=1e-12)
    assert_allclose(finding.required_margin, R.required_separation_margin(af, "above"), rtol=1e-12)
    assert_allclose(result.vibration_limit, R.api_shaft_vibration_limit(1800.0), rtol=1e-15)
    assert result.stable
    assert result.verdict == "PASS"


def test_cross_coupled_bearing_makes_the_rotor_unstable(fan_path):
    # A large destabilizing cross-coupled stiffness (k_xy = -k_yx > c w) drives a forward mode's log
    # decrement negative (Friswell et al. 2010, from memory; threshold derived in tests/test_rotor.py).
    data = tomllib.loads(fan_path.read_text())
    for bearing in data["rotor"]["bearings"]:
        bearing["kxy"] = ["60 kN/mm", "60 kN/mm"]
        bearing["kyx"] = ["-60 kN/mm", "-60 kN/mm"]
        bearing["cxx"] = bearing["cyy"] = "20 kN*s/m"
    result = run_rotor_study(parse_rotor_scenario(data, "unstable.toml"))
    assert not result.stable
    assert result.verdict == "FAIL"
    assert "UNSTABLE" in result.summary()


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda d: d["rotor"].pop("bearings"), r"fan\.toml: rotor\.bearings: missing"),
        (
            lambda d: d["rotor"]["bearings"][0].update(station=9),
            r"fan\.toml: rotor\.bearings\[0\]\.station: station 9 does not exist",
        ),
        (
            lambda d: d["rotor"]["bearings"][0].update(speeds=["0 rpm", "2000 rpm"]),
            r"rotor: NDE bearing: its coefficient table covers 0-2000 rpm",
        ),
        (lambda d: d["rotor"]["bearings"][0].pop("speeds"), r"rotor\.bearings\[0\]\.kxx: got a list; give `speeds`"),
        (
            lambda d: d["rotor"]["sections"][0].update(outer_diameter="12 kg"),
            r"rotor\.sections\[0\]\.outer_diameter: got 12 kg, which is not a length",
        ),
        (
            lambda d: d["rotor"]["sections"][0].update(inner_diameter="130 mm"),
            r"rotor\.sections\[0\]\.inner_diameter: got 0\.13 m, not less than",
        ),
        (
            lambda d: d["rotor"]["unbalance"][0].update(balance_grade=2.5),
            r"rotor\.unbalance\[0\]: give exactly one of amount or balance_grade",
        ),
        (
            lambda d: d["rotor"].update(sweep_max="1000 rpm"),
            r"rotor\.sweep_max: got 1000 rpm; expected above speed\.max",
        ),
        (lambda d: d["rotor"].update(probes=[7]), r"rotor\.probes\[0\]: got station 7; expected 0 to 4"),
    ],
)
def test_malformed_rotor_scenarios(fan_path, edit, message):
    data = tomllib.loads(fan_path.read_text())
    edit(data)
    with pytest.raises(ScenarioError, match=message):
        parse_rotor_scenario(data, "fan.toml")


def test_rotor_panel_headless(fan):
    panel = RotorPanel(fan)
    assert "Verdict: PASS" in panel.verdict.value
    branch0 = np.array(panel.campbell_fig.data[0].y)
    panel.speed.value = (900, 2200)
    critical = panel.result.criticals[0].speed
    assert_allclose(panel.result.findings[0].margin, R.separation_margin(critical, 900.0, 2200.0), rtol=1e-9)
    assert "Verdict: FAIL" in panel.verdict.value
    panel.stiffness.value = 0.5
    assert not np.allclose(np.array(panel.campbell_fig.data[0].y), branch0)
    panel.units.value = "US"
    assert "mil pk-pk" in panel.response_fig.layout.yaxis.title.text
    assert "[cpm]" in panel.campbell_fig.layout.yaxis.title.text


def test_check_command_runs_rotor_scenarios(tmp_path, fan_path, capsys):
    html, js = tmp_path / "rotor.html", tmp_path / "rotor.json"
    assert main(["check", str(fan_path), "--html", str(html), "--json", str(js)]) == 0
    assert "CALCULATION RECORD (ROTOR)" in capsys.readouterr().out
    record = json.loads(js.read_text())
    assert record["verdict"] == "PASS"
    assert record["critical_speeds"][0]["whirl"] == "forward"
    page = html.read_text()
    assert "Campbell diagram" in page
    assert "<script src=" not in page
    data = tomllib.loads(fan_path.read_text())
    data["speed"]["max"] = "2200 rpm"
    failing = tmp_path / "fast.toml"
    failing.write_text(tomli_w.dumps(data))
    assert main(["check", str(failing)]) == 1
    data["rotor"]["sections"][0]["length"] = "-1 m"
    broken = tmp_path / "broken.toml"
    broken.write_text(tomli_w.dumps(data))
    assert main(["check", str(broken), "--json", str(tmp_path / "b.json")]) == 2
    assert "broken.toml: rotor.sections[0].length: got -1 m" in capsys.readouterr().err
    assert not (tmp_path / "b.json").exists()


def test_mode_shapes_at_a_chosen_speed(fan):
    # The first bending mode of a between-bearings rotor bows between the bearings: the impeller station
    # moves more than the bearing stations (common practice; the shape comes from the engine's modes).
    panel = RotorPanel(fan)
    panel.shape_speed.value = 1200
    assert panel.result.shape_speed == 1200.0
    assert "1200 rpm" in panel.shape_fig.layout.title.text
    z, shape = panel.result.shapes_at_max[0]
    rotor = panel.result.rotor
    impeller = rotor.station_nodes[2]
    bearings = [rotor.station_nodes[b.station] for b in rotor.bearings]
    assert shape.max() == 1.0
    assert shape[impeller] > max(shape[b] for b in bearings)
    assert_allclose(np.array(panel.shape_fig.data[0].x), z)


def test_reduced_unbalance_response_matches_the_full_model(fan):
    # The Ritz basis (modes, static bearing shapes, static shapes of the unbalance loads) against the full
    # model's direct solve at every speed (regression of the reduction; Craig & Kurdila sec. 14.4).
    from resonance.kinds.rotor.response import unbalance_response_rotor

    rotor = fan.build(1.3, 0.7)
    speeds = np.linspace(20.0, fan.sweep_max, 240)
    full = unbalance_response_rotor(rotor, fan.unbalances(rotor), speeds, fan.probes)
    reduced = unbalance_response_rotor(rotor, fan.unbalances(rotor), speeds, fan.probes, reduced=True)
    peak = full.major_pk_pk.max()
    assert np.max(np.abs(reduced.major_pk_pk - full.major_pk_pk)) < 2e-3 * peak


def test_a_study_reusing_the_last_result_is_the_same_as_a_fresh_one(fan):
    first = R.run_rotor_study(fan)
    moved = fan.replace(speed=R.operating_range(900, 2200))
    reused = R.run_rotor_study(moved, previous=first)
    fresh = R.run_rotor_study(moved)
    assert reused.campbell is first.campbell  # the speed range does not touch the dynamics
    assert reused.findings.to_records() == fresh.findings.to_records()
    assert reused.summary() == fresh.summary()
    stiffer = R.run_rotor_study(moved, 1.2, previous=reused)
    assert stiffer.campbell is not reused.campbell
    assert stiffer.summary() == R.run_rotor_study(moved, 1.2).summary()
