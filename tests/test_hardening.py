"""No bad input becomes a number: quantity text, magnitudes, output paths, field and rotor fields, edge cases.

The accepted number grammar is the package's own (documented in resonance.core.inputs and the README); the
cases below are the kinds of mistakes a test engineer made in copies of the demo scenarios. Machines are
invented demo values; "common practice" marks what no source pins.
"""

from __future__ import annotations

import copy
import os
import re
from pathlib import Path

import pytest
from numpy.testing import assert_allclose

import resonance as R
from resonance.cli import main
from resonance.core.inputs import parse_quantity
from resonance.kinds.field.readers import DataFileError, read_coastdown
from resonance.kinds.rotor.scenario import parse_rotor_scenario, rotor_scenario_to_dict
from resonance.kinds.rotor.study import run_rotor_study
from resonance.kinds.support.scenario import ScenarioError, load_scenario, parse_scenario, scenario_to_dict

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


@pytest.mark.parametrize(
    ("text", "unit", "value"),
    [
        ("4200 kg", "kg", 4200.0),
        ("1.5 kN/mm", "N/m", 1.5e6),
        ("2.5e5 lbf/in", "N/m", 2.5e5 * 4.4482216152605 / 0.0254),  # NIST SP 811: 1 lbf = 4.4482216152605 N
        ("-3e-2 N*s/m", "N*s/m", -0.03),
        ("62 kg*m**2", "kg*m**2", 62.0),
        (".5 m", "m", 0.5),
        ("9.81 m/s^2", "m/s**2", 9.81),
        ("100 g·mm", "kg*m", 1e-4),
    ],
)
def test_quantity_text_that_is_read(text, unit, value):
    assert_allclose(parse_quantity(text, "x").to(unit).magnitude, value, rtol=1e-12)


@pytest.mark.parametrize(
    ("text", "message"),
    [
        ("4 200 kg", "digit groups are not allowed: write 4200 kg"),
        ("4,200 kg", "digit groups are not allowed"),
        ("4'200 kg", "digit groups are not allowed"),
        ("4_200 kg", "digit groups are not allowed"),
        ("1,5 kN/mm", "a decimal comma is not allowed: write 1.5 kN/mm"),
        ("kg", "the number is missing"),
        ("", "the number is missing"),
        ("2 3 kg", "write one number and a unit"),
        ("2*3 kg", "write one number and a unit"),
        ("2+3 kg", "write one number and a unit"),
        ("10**10**10 kg", "write one number and a unit"),
        ("9" * 400 + " kg", "a number too large for this tool"),
        ("1e999 kg", "a number too large for this tool"),
        ("3 furlongs_per_fortnight", "is not a known unit"),
    ],
)
def test_quantity_text_that_is_refused_in_a_scenario(pump, text, message):
    table = scenario_to_dict(pump)
    table["model"]["masses"][0]["mass"] = text
    with pytest.raises(ScenarioError, match=rf"^pump\.toml: model\.masses\[0\]\.mass: got .*{message}"):
        parse_scenario(table, "pump.toml")


@pytest.mark.parametrize(
    ("where", "value", "message"),
    [
        (("model", "springs", 0, "stiffness"), 1e-300, r"outside the range this tool accepts for a stiffness"),
        (("model", "springs", 0, "stiffness"), 10**400, r"a number too large for this tool"),
        (("model", "springs", 0, "stiffness"), float("nan"), r"expected a finite number"),
        (("response", "balance_grade"), 1e-300, r"outside the range this tool accepts for a balance grade"),
        (("model", "masses", 0, "mass"), "kg", r"the number is missing"),
        (("speed", "max"), True, r"expected a number or a value with a unit"),
    ],
)
def test_meaningless_numbers_are_refused_naming_the_field(pump, where, value, message):
    table = scenario_to_dict(pump)
    node = table
    for key in where[:-1]:
        node = node[key]
    node[where[-1]] = value
    field = ".".join(f"[{k}]" if isinstance(k, int) else k for k in where).replace(".[", "[")
    pattern = "^pump\\.toml: " + re.escape(field) + ": .*" + message
    with pytest.raises(ScenarioError, match=pattern):
        parse_scenario(table, "pump.toml")


def test_model_size_is_limited_up_front(pump, fan):
    from resonance.kinds.rotor.scenario import MAX_ELEMENTS
    from resonance.kinds.support.scenario import MAX_MASSES

    table = scenario_to_dict(pump)
    n = MAX_MASSES + 1
    table["model"]["masses"] = [{"name": f"m{i}", "mass": "100 kg"} for i in range(n)]
    table["model"]["springs"] = [
        {"between": [f"m{i}", f"m{i + 1}" if i + 1 < n else "ground"], "stiffness": "1 kN/mm", "label": f"s{i}"}
        for i in range(n)
    ]
    with pytest.raises(ScenarioError, match=rf"model\.masses: {n} masses; this tool solves lumped models of up to 500"):
        parse_scenario(table)
    rotor = rotor_scenario_to_dict(fan)
    rotor["rotor"]["sections"][1]["elements"] = MAX_ELEMENTS
    with pytest.raises(
        ScenarioError, match=r"rotor\.sections: .* shaft elements in all; this tool solves rotors of up"
    ):
        parse_rotor_scenario(rotor)


# --- output paths --------------------------------------------------------------------------------------------


def _run(args, capsys):
    code = main([str(a) for a in args])
    return code, capsys.readouterr().err


def _listing(folder: Path) -> list[str]:
    return sorted(p.name for p in folder.iterdir())


@pytest.mark.parametrize(
    ("make", "message"),
    [
        (lambda d: ["--json", d / "missing" / "r.json"], r"--json: the folder .*missing does not exist"),
        (lambda d: ["--html", d], r"--html: .* is a folder; expected a file name"),
        (lambda d: ["--json", d / ("x" * 300 + ".json")], r"--json: the file name is longer than this file system"),
        (
            lambda d: ["--json", d / "same", "--html", d / "same"],
            r"--(json|html): .*same is also the path of --(html|json)",
        ),
        (lambda d: ["--json", d / "case.toml"], r"--json: .*case\.toml is an input file"),
    ],
)
def test_bad_output_paths_fail_before_work(tmp_path, pump_path, capsys, make, message):
    scenario = tmp_path / "case.toml"
    scenario.write_bytes(pump_path.read_bytes())
    before = _listing(tmp_path)
    code, err = _run(["check", scenario, *make(tmp_path)], capsys)
    assert code == 2
    assert len(err.strip().splitlines()) == 1
    assert "Traceback" not in err
    assert re.search(message, err), err
    assert _listing(tmp_path) == before  # nothing written, nothing left
    assert scenario.read_bytes() == pump_path.read_bytes()


def test_unwritable_folder_fails_before_work(tmp_path, pump_path, capsys):
    if os.geteuid() == 0:
        target = Path("/proc/resonance-record.json")  # no one may create files there, root included
    else:
        locked = tmp_path / "locked"
        locked.mkdir()
        locked.chmod(0o555)
        target = locked / "r.json"
    code, err = _run(["check", pump_path, "--json", target], capsys)
    assert code == 2
    assert "--json: cannot write in the folder" in err
    assert not target.exists()


def test_output_over_a_measurement_file_is_refused(tmp_path, capsys):
    data = SCENARIOS.parent / "data" / "coastdown_fan.csv"
    before = data.read_bytes()
    code, err = _run(["check", SCENARIOS / "fan_on_pedestal.toml", "--json", data], capsys)
    assert code == 2
    assert "coastdown_fan.csv is an input file" in err
    assert data.read_bytes() == before


# --- field and rotor fields -------------------------------------------------------------------------------------


@pytest.fixture
def fan_field():
    return load_scenario(SCENARIOS / "fan_on_pedestal.toml")


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda f: f.update(channel="casing-Y"), r"field\.channel: got 'casing-Y'; coastdown_fan\.csv has channels"),
        (lambda f: f.update(band=["100 rpm", "110 rpm"]), r"field\.band: \(100\.0, 110\.0\) holds 0 readings"),
        (lambda f: f.update(impact_channel="nowhere"), r"field\.impact_channel: got 'nowhere'"),
        (lambda f: f.update(tune=[{"spring": "nowhere"}]), r"field\.tune\[0\]\.spring: got 'nowhere', which is not in"),
        (lambda f: f.update(record_length="100 s"), r"field\.record_length: .*no complete hit of 100 s"),
        (lambda f: f.update(coastdown=""), r"field\.coastdown: is empty; expected the path of a measurement file"),
        (lambda f: f.update(impact=" "), r"field\.impact: is empty"),
    ],
)
def test_field_errors_name_the_scenario_file_and_field(fan_field, edit, message):
    from resonance.kinds.field.study import run_field_study

    table = dict(fan_field.field)
    edit(table)
    scenario = fan_field.replace(field=table)
    with pytest.raises(ScenarioError, match=rf"^fan_on_pedestal\.toml: {message}"):
        run_field_study(scenario, SCENARIOS)


def test_a_file_of_separators_names_its_line(tmp_path):
    path = tmp_path / "cd.csv"
    path.write_text("# amplitude_unit = um\n,,,\n,,\n")
    with pytest.raises(DataFileError, match=r"cd\.csv: line 2: holds only separators"):
        read_coastdown(path)
    path.write_text("speed_rpm,ch_amplitude,ch_phase\n1_000,1,2\n")
    with pytest.raises(DataFileError, match=r"line 2, column 'speed_rpm': got '1_000'; expected a number"):
        read_coastdown(path, amplitude_unit="um", amplitude_convention="peak")


@pytest.mark.parametrize(
    ("edit", "field"),
    [
        (lambda t: t["rotor"].update(probes=[1, 9]), r"rotor\.probes\[1\]: got station 9"),
        (lambda t: t["rotor"]["unbalance"][0].update(station=7), r"rotor\.unbalance\[0\]\.station: got station 7"),
        (lambda t: t["rotor"]["discs"][0].update(station=9), r"rotor\.discs\[0\]\.station: station 9 does not exist"),
        (lambda t: t["rotor"]["bearings"][1].update(station=8), r"rotor\.bearings\[1\]\.station: station 8"),
        (lambda t: t["rotor"]["probes"].__setitem__(0, 1.5), r"rotor\.probes\[0\]: got 1\.5; expected a whole"),
    ],
)
def test_rotor_errors_name_the_field_of_the_station(fan, edit, field):
    table = rotor_scenario_to_dict(fan)
    edit(table)
    with pytest.raises(ScenarioError, match=rf"^fan\.toml: {field}"):
        parse_rotor_scenario(table, "fan.toml")


# --- valid edges ------------------------------------------------------------------------------------------------


def test_rotor_sweep_below_the_first_critical_is_valid(fan):
    table = rotor_scenario_to_dict(fan)
    table["speed"] = {"min": "300 rpm", "max": "600 rpm", "skip_bands": []}
    table["rotor"]["sweep_max"] = "900 rpm"
    for bearing in table["rotor"]["bearings"]:
        bearing["speeds"] = ["0 rpm", "900 rpm"]
    result = run_rotor_study(parse_rotor_scenario(table))
    assert result.criticals == ()
    assert "Forward critical speeds: none in the sweep" in result.summary()
    assert "no critical speed to check" in result.summary()
    from resonance.kinds.rotor.record import build_rotor_record

    assert "none within the sweep" in build_rotor_record(result).text


@pytest.mark.parametrize(
    "edit",
    [
        lambda t: t["speed"].update(min="1500 rpm", max="1500 rpm"),  # a zero-width range (fixed speed)
        lambda t: t.update(excitations=[{"order": 1}]),  # a single excitation
        lambda t: t["speed"].update(min="10 rpm", max="20 rpm"),  # no mode near the range
        lambda t: t.update(excitations=[{"frequency": "100 Hz", "label": "neighbour"}]),  # fixed sources only
    ],
)
def test_valid_support_edges_run_to_a_full_record(pump, edit):
    from resonance.kinds.support.record import build_record
    from resonance.kinds.support.study import run_study
    from resonance.kinds.support.whatif import smallest_change, tolerance_check

    table = copy.deepcopy(scenario_to_dict(pump))
    edit(table)
    scenario = parse_scenario(table, "edge.toml")
    record = build_record(run_study(scenario))
    assert record.data["verdict"] in ("PASS", "FAIL", "PASS WITH EXEMPTION")
    smallest_change(scenario, "stiffness")
    tolerance_check(scenario)


def test_big_models_are_refused_up_front_with_the_limit():
    from resonance.dynamics.model import MAX_DOF
    from resonance.kinds.rotor import Bearing, ShaftSection, rotor_model

    with pytest.raises(R.InputValueError, match=r"mass_matrix: 1001 degrees of freedom; this tool's dense solvers"):
        R.chain_model([1.0] * (MAX_DOF + 1), [1e3] * (MAX_DOF + 1))
    # A typo asking for 1e12 elements is refused before any list is built.
    with pytest.raises(R.InputValueError, match=r"sections: 1000000000000 shaft elements in all"):
        rotor_model([ShaftSection(1.0, 0.1, elements=10**12)], [], [Bearing(0, 1e8, 1e8)])
