"""Scenario files: parsing, round trips, unit handling and errors naming file and field.

Sources: unit definitions (1 lbm = 0.45359237 kg, 1 lbf = 4.4482216152605 N,
NIST SP 811 appendix B); ISO 21940-11 eq. (2) for a grade-based unbalance;
sqrt(k/m) / 2 pi for the one-mass model (Rao, Mechanical Vibrations, 6th ed.,
eq. 2.14). Scenario values are invented demo data.
"""

import math

import pytest
import tomllib
from numpy.testing import assert_allclose

import resonance as R
from resonance.kinds.support.scenario import (
    ScenarioError,
    load_scenario,
    parse_scenario,
    save_scenario,
    scenario_to_dict,
)
from resonance.kinds.support.study import run_study


def test_demo_scenarios_load(pump, foundation):
    assert pump.speed.speed_min == 900.0
    assert [e.label for e in pump.excitations] == ["1x", "2x", "vane pass (5x)"]
    assert foundation.model.labels == ("machine", "baseplate", "block")
    assert foundation.rules.flat.name == "flat 15 %"
    assert foundation.rules.lateral_1x.name == "API lateral"
    # One mass on one spring: fn = sqrt(k/m) / 2 pi (Rao eq. 2.14).
    f1 = run_study(pump).modes[0].frequency
    assert_allclose(f1, math.sqrt(115e6 / 1850.0) / (2 * math.pi), rtol=1e-9)
    # ISO 21940-11: U = G m / W with W at the maximum speed.
    assert_allclose(pump.response.unbalance, 6.3e-3 * 420.0 / (2 * math.pi * 1800 / 60), rtol=1e-12)


def test_round_trip(tmp_path, foundation):
    again = parse_scenario(scenario_to_dict(foundation), foundation.source)
    assert again == foundation
    path = save_scenario(foundation, tmp_path / "copy.toml")
    assert load_scenario(path).replace(source=foundation.source) == foundation


def test_save_never_overwrites(tmp_path, pump):
    path = save_scenario(pump, tmp_path / "mine.toml")
    before = path.read_text()
    with pytest.raises(FileExistsError, match="exists"):
        save_scenario(pump, path)
    assert path.read_text() == before


def test_us_customary_scenario_gives_the_same_result(pump_path):
    data = tomllib.loads(pump_path.read_text())
    data["model"]["masses"][0]["mass"] = f"{1850.0 / 0.45359237!r} lbm"
    data["model"]["springs"][0]["stiffness"] = f"{115e6 * 0.0254 / 4.4482216152605!r} lbf/in"
    data["speed"]["max"] = "30 Hz"  # 1800 rpm
    data["scenario"]["units"] = "US"
    us = run_study(parse_scenario(data, "us.toml"))
    si = run_study(load_scenario(pump_path))
    assert_allclose(us.modes[0].frequency, si.modes[0].frequency, rtol=1e-12)
    assert [f.margin for f in us.findings] == pytest.approx([f.margin for f in si.findings], rel=1e-10)


def _broken(pump_path, edit):
    data = tomllib.loads(pump_path.read_text())
    edit(data)
    return data


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda d: d["speed"].pop("max"), r"pump\.toml: speed\.max: missing"),
        (lambda d: d["speed"].update(max="1800 kg"), r"speed\.max: got 1800 kg, which is not a speed"),
        (lambda d: d["speed"].update(max="fast"), r"speed\.max: got 'fast'; the number is missing"),
        (lambda d: d["speed"].update(min=2000), r"speed\.max: got 1800 rpm, below speed\.min = 2000 rpm"),
        (lambda d: d["speed"].update(mni=3), r"speed\.mni: unknown field"),
        (
            lambda d: d["model"]["masses"][0].update(mass="-5 kg"),
            r"model\.masses\[0\]\.mass: got -5 kg; expected a value > 0",
        ),
        (
            lambda d: d["model"]["springs"][0].update(between=["pump", "skid"]),
            r"model\.springs\[0\]\.between: names 'skid'",
        ),
        (lambda d: d["model"].update(damping_ratio=True), r"model\.damping_ratio: got True"),
        (lambda d: d["excitations"].append({"order": 2, "frequency": 5}), r"excitations\[3\]: give exactly one of"),
        (lambda d: d["margin"].update(rule="api-617"), r"margin\.rule: got 'api-617'"),
        (lambda d: d["response"].update(force_at="motor"), r"response\.force_at: got 'motor'"),
        (
            lambda d: d["speed"].update(skip_bands=[["2000 rpm", "2100 rpm"]]),
            r"speed\.skip_bands: .*inside the operating",
        ),
        (lambda d: d["whatif"].update(tolerance=1.5), r"whatif\.tolerance: got 1\.5"),
        (lambda d: d.pop("model"), r"pump\.toml: model: missing; expected a table"),
        (lambda d: d["vibration"].update(group=3), r"vibration: got group 3"),
    ],
)
def test_malformed_scenarios_name_file_and_field(pump_path, edit, message):
    with pytest.raises(ScenarioError, match=message):
        parse_scenario(_broken(pump_path, edit), "pump.toml")


def test_file_level_errors(tmp_path):
    with pytest.raises(ScenarioError, match=r"missing\.toml: cannot be read"):
        load_scenario(tmp_path / "missing.toml")
    bad = tmp_path / "bad.toml"
    bad.write_text("[speed\nmin = 3")
    with pytest.raises(ScenarioError, match=r"bad\.toml: is not valid TOML"):
        load_scenario(bad)


def test_unconnected_mass_is_refused(pump_path):
    def edit(d):
        d["model"]["masses"].append({"name": "loose", "mass": "10 kg"})

    with pytest.raises(ScenarioError, match=r"model\.springs: leave a mass free to drift"):
        parse_scenario(_broken(pump_path, edit), "pump.toml")


def test_scenario_error_is_a_value_error():
    assert issubclass(ScenarioError, ValueError)
    assert issubclass(ScenarioError, R.InputValueError)
