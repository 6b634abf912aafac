"""Torsional scenarios check every source they declare, on the driver's shaft, from an exact train.

Sources: the two-inertia frequency f = sqrt(k (J1 + J2) / (J1 J2)) / 2 pi (Rao, Mechanical Vibrations, 6th
ed., sec. 6.10, from memory); a drive-fed motor's electrical frequency f_e = p n_s / 120, n_s = n / (1 - s)
(Fitzgerald, Kingsley and Umans, Electric Machinery, 6th ed., ch. 6); torsional margin 10 % from every
excitation and 1x and 2x line frequency checked for a motor-driven train (API 617 / RP 684, from memory);
springs in series add their compliances (Rao sec. 1.7); 1 lbf in = 0.1129848 N m (NIST SP 811). The trains
are invented test data.
"""

from __future__ import annotations

import copy
import math
from pathlib import Path

import pytest
from numpy.testing import assert_allclose

from resonance.cli import main
from resonance.kinds.torsion.elements import hollow_shaft_stiffness, stepped_shaft_stiffness
from resonance.kinds.torsion.scenario import parse_torsion_scenario
from resonance.kinds.torsion.study import run_torsion_study
from resonance.records.tables import ScenarioError, read_scenario_file

DEMO = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
J1, J2 = 6.0, 2.0  # motor and load inertia [kg m^2]


def _k_for(f_n: float) -> float:
    # The coupling stiffness that puts the two-inertia train's mode at f_n [Hz] (closed form inverted).
    return (2 * math.pi * f_n) ** 2 * J1 * J2 / (J1 + J2)


def _two_inertia(f_n: float, motor: dict) -> dict:
    return {
        "scenario": {"title": "two inertias", "units": "SI"},
        "speed": {"min": "1200 rpm", "max": "1500 rpm"},
        "motor": motor,
        "torsion": {
            "stations": [{"name": "motor", "inertia": f"{J1} kg*m**2"}, {"name": "load", "inertia": f"{J2} kg*m**2"}],
            "couplings": [{"between": ["motor", "load"], "stiffness": f"{_k_for(f_n)!r} N*m/rad", "label": "c"}],
        },
    }


def test_a_motor_table_alone_checks_twice_the_electrical_frequency_of_a_drive():
    # 4 poles, no slip: 2 f_e = 4 n / 60 Hz crosses a 108 Hz mode at 1620 rpm, 8 % above 1500 rpm (< 10 %).
    tables = _two_inertia(108.0, {"supply": "drive", "poles": 4, "slip": 0.0})
    result = run_torsion_study(parse_torsion_scenario(tables, "t.toml"))
    assert_allclose(result.modes[0].frequency, 108.0, rtol=1e-9)  # the closed form
    worst = result.findings[0]
    assert worst.excitation.label == "2 f_e (drive, 4 poles)"
    assert_allclose(worst.coincidence_speed, 60 * 108.0 / 4, rtol=1e-9)
    assert_allclose(worst.margin, 100 * (1620 - 1500) / 1500, rtol=1e-9)  # API 684 form, from memory
    assert result.verdict == "FAIL"
    assert {e.label for e in result.scenario.excitations} >= {
        "f_e (drive, 4 poles)",
        "2 f_e (drive, 4 poles)",
        "6 f_e (drive, 4 poles)",
        "12 f_e (drive, 4 poles)",
    }
    sources = {e.label: e.source for e in result.scenario.excitations}
    assert sources["2 f_e (drive, 4 poles)"] == (
        "[motor] (drive): checked by default for a drive-fed motor; constant slip 0 (its value at the load of interest)"
    )


def test_the_multiples_listed_in_the_motor_table_are_the_ones_checked():
    tables = _two_inertia(108.0, {"supply": "drive", "poles": 4, "slip": 0.0, "electrical": [1]})
    result = run_torsion_study(parse_torsion_scenario(tables, "t.toml"))
    electrical = [e for e in result.scenario.excitations if e.kind == "electrical"]
    assert [e.label for e in electrical] == ["f_e (drive, 4 poles)"]
    assert electrical[0].source.startswith("[motor] (drive): listed in [motor] electrical; constant slip 0")
    assert result.verdict == "PASS"  # f_e = 2 n / 60 meets 108 Hz at 3240 rpm, far above the range


def test_a_motor_on_the_line_checks_line_frequency_and_twice_it():
    tables = _two_inertia(104.0, {"supply": "line", "line_frequency": "50 Hz"})
    result = run_torsion_study(parse_torsion_scenario(tables, "t.toml"))
    labels = {r.excitation.label: r for r in result.findings}
    assert "line frequency (50 Hz)" in labels
    assert labels["twice line frequency (100 Hz)"].verdict == "FAIL"  # 4 % from a fixed 100 Hz


def test_check_exits_1_for_a_drive_fed_motor_given_only_by_its_motor_table(tmp_path, capsys):
    import tomli_w

    path = tmp_path / "drive.toml"
    path.write_text(tomli_w.dumps(_two_inertia(108.0, {"supply": "drive", "poles": 4, "slip": 0.0})))
    assert main(["check", str(path)]) == 1
    out = capsys.readouterr().out
    assert "2 f_e (drive, 4 poles) [electrical, 4x]: [motor] (drive): checked by default" in out
    assert "VERDICT: FAIL" in out


def test_the_order_of_the_stations_does_not_move_the_speed_to_another_shaft():
    tables = read_scenario_file(DEMO)
    reordered = copy.deepcopy(tables)
    stations = reordered["torsion"]["stations"]
    reordered["torsion"]["stations"] = stations[::-1]  # the compressor (high-speed shaft) first
    a = run_torsion_study(parse_torsion_scenario(tables, "a.toml"))
    b = run_torsion_study(parse_torsion_scenario(reordered, "b.toml"))
    assert b.scenario.train.reference == "driver"
    assert_allclose([m.frequency for m in b.modes], [m.frequency for m in a.modes], rtol=1e-9)
    rows_a = {(r.mode.frequency.__round__(6), r.excitation.label): r.margin for r in a.findings}
    rows_b = {(r.mode.frequency.__round__(6), r.excitation.label): r.margin for r in b.findings}
    assert rows_a.keys() == rows_b.keys()
    for key, margin in rows_a.items():
        assert_allclose(rows_b[key], margin, rtol=1e-9)


def test_the_driver_shaft_is_named_when_no_shaft_is_called_driver():
    tables = read_scenario_file(DEMO)
    tables["torsion"].pop("forcing")  # it names the driver shaft's 1x
    for st in tables["torsion"]["stations"]:
        st.setdefault("shaft", "motor side")
    with pytest.raises(ScenarioError, match=r"^t\.toml: torsion\.driver_shaft: missing; the stations are on shafts"):
        parse_torsion_scenario(tables, "t.toml")
    tables["torsion"]["driver_shaft"] = "motor side"
    assert parse_torsion_scenario(tables, "t.toml").train.reference == "motor side"
    tables["torsion"]["driver_shaft"] = "nowhere"
    with pytest.raises(ScenarioError, match=r"torsion\.driver_shaft: got 'nowhere', a shaft no station is on"):
        parse_torsion_scenario(tables, "t.toml")


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        # A coupling from a station to itself would vanish with its mode (the demo's FAIL became PASS).
        (
            lambda t: t["torsion"]["couplings"][0].update(between=["hub", "hub"]),
            r"torsion\.couplings\[0\]\.between: got \['hub', 'hub'\]; expected two different stations",
        ),
        # Inertias joined by nothing have no mode to check.
        (
            lambda t: [t["torsion"].pop(k) for k in ("shafts", "couplings", "forcing")],
            r"torsion\.stations: stations: 'hub', 'bull gear', 'pinion', 'compressor' joined to nothing",
        ),
        (
            lambda t: t["torsion"]["stations"].append({"name": "spare", "inertia": "1 kg*m**2"}),
            r"torsion\.stations: stations: 'spare' joined to nothing that reaches 'motor'",
        ),
        (
            lambda t: t["torsion"]["couplings"].append(dict(t["torsion"]["couplings"][0], between=["motor", "hub"])),
            r"torsion\.couplings\[1\]\.label: got 'flexible coupling', used by another element",
        ),
        (
            lambda t: t["torsion"]["couplings"][0].update(label="motor shaft end"),
            r"torsion\.couplings\[0\]\.label: got 'motor shaft end', used by another element",
        ),
        # A percentage is a ratio, not a damping coefficient.
        (
            lambda t: t["torsion"]["couplings"][0].update(damping="3 %"),
            r"torsion\.couplings\[0\]\.damping: got 3 %, which is not a moment damping",
        ),
        (
            lambda t: t["torsion"]["meshes"][0].update(pinion_teeth=31),
            r"torsion\.meshes\[0\]\.ratio: got 3\.2, but 97 / 31 teeth give 3\.12903",
        ),
        (
            lambda t: t["torsion"]["meshes"][0].update(gear_teeth=10**400),
            r"torsion\.meshes\[0\]\.gear_teeth: got 1000000000000000000.*; expected a whole number from 1 to 10000",
        ),
        # Every mesh's gear mesh frequency is checked: a mesh without its teeth is refused, not skipped.
        (
            lambda t: t["torsion"]["meshes"][0].pop("gear_teeth"),
            r"torsion\.meshes\[0\]\.gear_teeth: missing; the gear mesh frequency",
        ),
        (
            lambda t: t["torsion"]["forcing"][0].update(fraction_of_rated=1e300),
            r"torsion\.forcing\[0\]\.fraction_of_rated: got 1e\+300; expected a fraction of the rated torque up to 10",
        ),
        (
            lambda t: t["torsion"]["shafts"][0].update(stiffness="1 MN*m/rad"),
            r"torsion\.shafts\[0\]: gives stiffness and length; expected one of",
        ),
        (
            lambda t: t["torsion"].update(shaft_excitations=[{"shaft": "slow", "order": 4}]),
            r"torsion\.shaft_excitations\[0\]\.shaft: got 'slow'",
        ),
    ],
)
def test_trains_that_would_lose_an_element_or_misread_a_value_are_refused(edit, message):
    tables = read_scenario_file(DEMO)
    edit(tables)
    with pytest.raises(ScenarioError, match=rf"^t\.toml: {message}"):
        parse_torsion_scenario(tables, "t.toml")


@pytest.mark.parametrize(
    ("text", "expected"),
    [("30 N*m*s/rad", 30.0), ("350 lbf*in*s/rad", 350 * 0.1129848), ("0.04 kN*m*s/rad", 40.0), (30, 30.0)],
)
def test_damping_takes_units(text, expected):
    tables = read_scenario_file(DEMO)
    tables["torsion"]["couplings"][0]["damping"] = text
    spring = next(s for s in parse_torsion_scenario(tables, "t.toml").train.springs if s.label == "flexible coupling")
    assert_allclose(spring.damping, expected, rtol=5e-7)  # NIST SP 811 for lbf in (7 figures)


def test_a_stepped_shaft_is_its_sections_in_series():
    g = 80e9
    sections = [(0.30, 0.110, 0.0), (0.10, 0.095, 0.0), (0.05, 0.110, 0.040)]
    expected = 1.0 / sum(1.0 / hollow_shaft_stiffness(g, *s) for s in sections)  # compliances add (Rao 1.7)
    assert_allclose(stepped_shaft_stiffness(g, sections), expected, rtol=1e-12)
    tables = read_scenario_file(DEMO)
    shaft = tables["torsion"]["shafts"][0]
    for key in ("length", "outer_diameter"):
        shaft.pop(key)
    shaft["sections"] = [
        {"length": f"{a} m", "outer_diameter": f"{d} m", "inner_diameter": f"{b} m"} for a, d, b in sections
    ]
    scenario = parse_torsion_scenario(tables, "t.toml")
    element = next(s for s in scenario.train.springs if s.label == "motor shaft end")
    assert_allclose(element.stiffness, expected, rtol=1e-12)
    assert element.outer_diameter == pytest.approx(0.095)  # stress at the section of least modulus
    assert len(scenario.train.stations) == 5  # no inertia invented at the steps


def test_gear_teeth_give_the_ratio_and_orders_of_any_shaft_are_checked():
    tables = read_scenario_file(DEMO)
    mesh = tables["torsion"]["meshes"][0]
    mesh.pop("ratio")
    mesh.update(gear_teeth=96, pinion_teeth=30)
    tables["torsion"]["shaft_excitations"] = [{"shaft": "high speed", "order": 4, "label": "lobe pass"}]
    scenario = parse_torsion_scenario(tables, "t.toml")
    assert_allclose(scenario.train.speed_ratio["high speed"], 3.2, rtol=1e-12)
    lobe = next(e for e in scenario.excitations if e.label == "lobe pass")
    assert_allclose(lobe.order, 4 * 3.2, rtol=1e-12)  # 4x the high-speed shaft, in driver orders
    assert lobe.source.startswith("torsion.shaft_excitations[0]")


def test_the_torque_record_gives_curves_coincidences_and_the_shaft_of_each_torque(tmp_path):
    # A two-inertia train whose mode sits inside the range against 1x: the record gives every element's torque
    # at that coincidence, equal to the closed-form steady torque of the coupling there (Rao sec. 6.10: a
    # torque T on J1 at w gives the spring torque k |theta1 - theta2| with the modal damping as given).
    import json

    from resonance.kinds.torsion.record import build_torsion_record

    f_n = 22.0  # Hz: 1x at 1320 rpm, inside 1200-1500 rpm
    tables = _two_inertia(f_n, {"supply": "drive", "poles": 4, "slip": 0.0, "electrical": [2]})
    tables["torsion"]["damping_ratio"] = 0.05
    tables["torsion"]["forcing"] = [
        {"label": "runout", "station": "motor", "excitation": "1x driver shaft", "torque": "10 N*m"}
    ]
    result = run_torsion_study(parse_torsion_scenario(tables, "t.toml"))
    data = json.loads(json.dumps(build_torsion_record(result).data))
    forced = data["forced_response"]
    curves = forced["curves"]
    assert curves["element_torque_n_m"]["c"]["shaft"] == "shaft 'driver'"
    assert forced["elements"][0]["shaft"] == "shaft 'driver'"
    peak = max(curves["element_torque_n_m"]["c"]["per_case"][0])
    assert_allclose(peak, forced["elements"][0]["peak_torque_n_m"], rtol=1e-9)
    (at,) = forced["at_coincidences"]
    assert_allclose(at["speed_rpm"], 60 * f_n, rtol=1e-12)
    # Closed form at resonance: the modal coordinate's amplification 1 / (2 zeta) on the static twist of the
    # free-free pair under T on J1: spring torque T J2 / (J1 + J2) / (2 zeta).
    assert_allclose(at["element_torque_n_m"]["c"], 10.0 * J2 / (J1 + J2) / (2 * 0.05), rtol=1e-6)


@pytest.mark.parametrize("load", ["constant torque", "quadratic torque"])
def test_a_slip_that_follows_the_load_moves_the_coincidence_speed(load):
    # f_e = p n / (120 (1 - s(n))) with the slip speed D = n_s - n constant (constant torque) or growing as n^2
    # (fans and pumps) from D_r = s_r n_r / (1 - s_r) (Fitzgerald et al., Electric Machinery, 6th ed., ch. 6
    # and 11: torque proportional to slip speed at constant V/f, from memory). The coincidence of 2 f_e with
    # the mode is solved here independently by Brent's method on that closed form.
    import scipy.optimize

    s_r, n_r, p, f_n = 0.02, 1500.0, 4, 108.0
    d_r = s_r * n_r / (1 - s_r)

    def two_fe(n: float) -> float:
        d = d_r if load == "constant torque" else d_r * (n / n_r) ** 2
        return 2 * p * (n + d) / 120.0

    n_c = scipy.optimize.brentq(lambda n: two_fe(n) - f_n, 100.0, 5000.0, xtol=1e-10)
    motor = {"supply": "drive", "poles": p, "slip": s_r, "load": load, "rated_speed": f"{n_r:g} rpm", "electrical": [2]}
    result = run_torsion_study(parse_torsion_scenario(_two_inertia(f_n, motor), "t.toml"))
    row = next(r for r in result.findings if r.excitation.kind == "electrical")
    assert_allclose(row.coincidence_speed, n_c, rtol=1e-6)
    assert_allclose(row.margin, 100 * (n_c - 1500.0) / 1500.0, rtol=1e-5)  # API 684 form, from memory
    assert f"slip {s_r:g} at 1500 rpm, following a {load} load" in row.excitation.source
    constant_slip = {"supply": "drive", "poles": p, "slip": s_r, "electrical": [2]}
    constant = run_torsion_study(parse_torsion_scenario(_two_inertia(f_n, constant_slip), "t.toml"))
    fixed_slip = next(r for r in constant.findings if r.excitation.kind == "electrical")
    assert_allclose(fixed_slip.coincidence_speed, 60 * f_n * (1 - s_r) / (2 * p / 2), rtol=1e-9)
    assert fixed_slip.coincidence_speed != pytest.approx(row.coincidence_speed, rel=1e-4)


def test_a_slip_table_gives_the_slip_at_each_speed():
    table = [["1200 rpm", 0.006], ["1500 rpm", 0.012]]
    motor = {"supply": "drive", "poles": 4, "slip_table": table, "electrical": [2]}
    scenario = parse_torsion_scenario(_two_inertia(108.0, motor), "t.toml")
    e = next(x for x in scenario.excitations if x.kind == "electrical")
    for n, s in ((1200.0, 0.006), (1350.0, 0.009), (1500.0, 0.012)):
        assert_allclose(e.frequency_at(n)[0], 2 * 4 * n / (120 * (1 - s)), rtol=2e-4)  # interpolated slip
    assert "slip from [motor] slip_table against speed" in e.source


@pytest.mark.parametrize(
    ("motor", "message"),
    [
        ({"load": "constant torque"}, r"motor\.rated_speed: missing"),
        ({"load": "fan law", "rated_speed": "1500 rpm"}, r"motor\.load: got 'fan law'"),
        ({"rated_speed": "1500 rpm"}, r"motor\.rated_speed: a constant slip needs no rated speed"),
        ({"slip_table": [["1500 rpm", 0.01], ["1200 rpm", 0.006]]}, r"motor\.slip_table\[1\]\[0\]: got 1200 rpm"),
        ({"slip_table": [["1500 rpm", 0.01]]}, r"motor\.slip_table: expected two or more"),
    ],
)
def test_bad_slip_laws_are_refused(motor, message):
    base = {"supply": "drive", "poles": 4, "slip": 0.01}
    if "slip_table" in motor:
        base.pop("slip")
    with pytest.raises(ScenarioError, match=rf"^t\.toml: {message}"):
        parse_torsion_scenario(_two_inertia(108.0, {**base, **motor}), "t.toml")
