"""Torsional trains against closed forms and an independent Holzer table.

Sources: two-inertia f = sqrt(k (J1 + J2) / (J1 J2)) / 2 pi and the three-inertia frequency equation
(Rao, Mechanical Vibrations, 6th ed., sec. 6.10, from memory); referral of a geared train by the square of
the speed ratio and Holzer's method (W. Ker Wilson, Practical Solution of Torsional Vibration Problems, from
memory); J_p = pi (D^4 - d^4) / 32 (Roark's Formulas, table 10.1, from memory); WR^2 1 lbm ft^2 =
0.0421401 kg m^2 and 1 lbf in = 0.1129848 N m (NIST SP 811). Trains are invented demo values.
"""

from __future__ import annotations

import math

import numpy as np
import pytest
import scipy.linalg
import scipy.optimize
from numpy.testing import assert_allclose

import resonance as R
from resonance.kinds.torsion.elements import Coupling, GearMesh, Station, TorsionalShaft, hollow_shaft_stiffness
from resonance.kinds.torsion.train import torsional_modes, torsional_train


def _elastic(train):
    modes = torsional_modes(train)
    return modes.frequency[modes.frequency > 1e-6]


def test_two_inertias():
    j1, j2, k = 3.2, 0.8, 2.5e5
    train = torsional_train([Station("motor", j1), Station("fan", j2)], [Coupling(("motor", "fan"), k)])
    (f,) = _elastic(train)
    assert_allclose(f, math.sqrt(k * (j1 + j2) / (j1 * j2)) / (2 * math.pi), rtol=1e-12)


def test_three_inertia_chain_frequency_equation():
    j1, j2, j3, k1, k2 = 4.0, 1.5, 2.5, 3e5, 1.2e5
    train = torsional_train(
        [Station("a", j1), Station("b", j2), Station("c", j3)],
        [TorsionalShaft(("a", "b"), k1), TorsionalShaft(("b", "c"), k2)],
    )
    # J1 J2 J3 w^4 - [k1 J3 (J1 + J2) + k2 J1 (J2 + J3)] w^2 + k1 k2 (J1 + J2 + J3) = 0
    a = j1 * j2 * j3
    b = k1 * j3 * (j1 + j2) + k2 * j1 * (j2 + j3)
    c = k1 * k2 * (j1 + j2 + j3)
    w2 = np.sort(np.roots([a, -b, c]).real)
    assert_allclose(_elastic(train), np.sqrt(w2) / (2 * math.pi), rtol=1e-10)


def test_geared_train_equals_the_train_referred_by_hand():
    # Motor --coupling-- gear ==(x3.2 increaser)== pinion --shaft-- compressor, rigid mesh.
    n, jm, jg, jp, jc, kc, ks = 3.2, 6.0, 1.1, 0.05, 0.4, 4e5, 6e4
    train = torsional_train(
        [Station("motor", jm), Station("gear", jg), Station("pinion", jp, "hs"), Station("compressor", jc, "hs")],
        [Coupling(("motor", "gear"), kc), TorsionalShaft(("pinion", "compressor"), ks)],
        [GearMesh("gear", "pinion", n)],
    )
    assert train.speed_ratio == {"driver": 1.0, "hs": n}
    mass = np.diag([jm, jg + jp * n**2, jc * n**2])
    stiffness = np.array([[kc, -kc, 0.0], [-kc, kc + ks * n**2, -ks * n**2], [0.0, -ks * n**2, ks * n**2]])
    by_hand = R.modes(mass, stiffness).frequency
    assert_allclose(torsional_modes(train).frequency, by_hand, rtol=1e-10, atol=1e-9)
    # A compliant mesh tends to the rigid one as its stiffness grows.
    stiff = torsional_train(
        train.stations,
        [Coupling(("motor", "gear"), kc), TorsionalShaft(("pinion", "compressor"), ks)],
        [GearMesh("gear", "pinion", n, stiffness=1e11)],
    )
    assert_allclose(_elastic(stiff)[:2], _elastic(train), rtol=1e-4)


def _holzer_frequencies(inertias, stiffnesses, f_max, points=4000):
    # Holzer's table for a free-free chain: unit twist at the first station, carry the inertia torque along;
    # natural frequencies make the torque left over at the free end zero.
    def remainder(w):
        theta, torque = 1.0, 0.0
        for i, j in enumerate(inertias):
            torque += j * w * w * theta
            if i < len(stiffnesses):
                theta -= torque / stiffnesses[i]
        return torque

    grid = np.linspace(1.0, 2 * math.pi * f_max, points)
    values = [remainder(w) for w in grid]
    roots = [
        scipy.optimize.brentq(remainder, grid[i], grid[i + 1], xtol=1e-12)
        for i in range(points - 1)
        if values[i] * values[i + 1] < 0
    ]
    return np.array(roots) / (2 * math.pi)


def test_five_inertia_chain_against_holzer():
    inertias = [5.0, 0.6, 1.4, 0.3, 2.2]
    stiffnesses = [2.0e5, 8.0e4, 1.5e5, 5.0e4]
    names = "abcde"
    train = torsional_train(
        [Station(n, j) for n, j in zip(names, inertias, strict=True)],
        [TorsionalShaft((names[i], names[i + 1]), k) for i, k in enumerate(stiffnesses)],
    )
    model = _elastic(train)
    holzer = _holzer_frequencies(inertias, stiffnesses, 1.2 * model.max())
    assert_allclose(model, holzer, rtol=1e-9)


def test_hollow_shaft_stiffness():
    # G J_p / L with J_p = pi (D^4 - d^4) / 32 (Roark, from memory): D 100 mm, d 60 mm, L 1.5 m, G 80 GPa.
    jp = math.pi * (0.1**4 - 0.06**4) / 32
    assert_allclose(hollow_shaft_stiffness(80e9, 1.5, 0.1, 0.06), 80e9 * jp / 1.5, rtol=1e-14)
    assert_allclose(
        hollow_shaft_stiffness(R.ureg("80 GPa"), R.ureg("1500 mm"), R.ureg("100 mm"), R.ureg("60 mm")),
        80e9 * jp / 1.5,
        rtol=1e-12,
    )


def test_us_and_si_inputs_agree():
    # WR^2 in lb ft^2 and stiffness in lbf in/rad (NIST SP 811 factors).
    si = torsional_train([Station("m", 2.0), Station("f", 0.5)], [Coupling(("m", "f"), 1.0e5)])
    us = torsional_train(
        [
            Station("m", R.ureg.Quantity(2.0 / 0.0421401, "lbm*ft**2")),
            Station("f", R.ureg.Quantity(0.5 / 0.0421401, "lbm*ft**2")),
        ],
        [Coupling(("m", "f"), R.ureg.Quantity(1.0e5 / 0.1129848, "lbf*in/rad"))],
    )
    assert_allclose(_elastic(us), _elastic(si), rtol=1e-6)


@pytest.mark.parametrize(
    ("build", "message"),
    [
        (lambda: Station("m", 0.0), r"m: inertia: got 0 kg\*m\*\*2; expected a value > 0"),
        (lambda: GearMesh("g", "p", 0.0), r"g-p: ratio: got 0; expected a value > 0"),
        (
            lambda: torsional_train([Station("m", 1.0), Station("f", 1.0, "other")], [], []),
            r"shaft 'other' is not geared to the reference shaft 'driver'",
        ),
        (
            lambda: torsional_train([Station("m", 1.0)], [Coupling(("m", "nowhere"), 1e5)]),
            r"springs\[0\] \(m-nowhere\): names 'nowhere', which is not a station",
        ),
        (
            lambda: torsional_train(
                [Station("m", 1.0), Station("f", 1.0, "hs")], [Coupling(("m", "f"), 1e5)], [GearMesh("m", "f", 2.0)]
            ),
            r"springs\[0\] \(m-f\): joins two shafts",
        ),
        (lambda: torsional_train([], []), r"stations: got none"),
    ],
)
def test_bad_trains_are_refused(build, message):
    with pytest.raises(R.InputValueError, match=message):
        build()


def _geared():
    # Motor --soft coupling-- gear ==(x3.2)== pinion --stiff shaft-- compressor (invented).
    return torsional_train(
        [Station("motor", 6.0), Station("gear", 1.1), Station("pinion", 0.05, "hs"), Station("compressor", 0.4, "hs")],
        [
            Coupling(("motor", "gear"), 4e4, label="coupling"),
            TorsionalShaft(("pinion", "compressor"), 6e6, label="hs shaft"),
        ],
        [GearMesh("gear", "pinion", 3.2)],
    )


def test_shapes_name_the_element_that_twists_most():
    from resonance.kinds.torsion.train import torsional_shapes

    (shape,) = torsional_shapes(_geared())[:1]
    assert_allclose(sum(shape.twist_share.values()), 1.0, rtol=1e-12)
    # The soft coupling takes nearly all the strain energy of the first mode (a two-mass-like mode).
    assert shape.twists_most.startswith("coupling takes")
    assert shape.twist_share["coupling"] > 0.95
    assert max(abs(v) for v in shape.angles.values()) == pytest.approx(1.0)
    # Angles in each shaft's own rotation: the compressor turns 3.2 times the referred angle.
    train = _geared()
    assert train.ratio("compressor") == pytest.approx(3.2)


def test_torsional_modes_meet_the_torsional_rule_through_the_interference_check():
    from resonance.kinds.torsion.train import shaft_order, torsional_mode_list

    train = _geared()
    modes = torsional_mode_list(train, damping_ratio=0.02)
    assert all(m.kind == "torsional" for m in modes)
    assert modes[0].label == "torsional mode 1 (coupling twists most)"
    hs_1x = shaft_order(train, "hs", 1.0)
    assert hs_1x.order == pytest.approx(3.2)  # 1x of the high-speed shaft, in driver orders
    assert shaft_order(train, "driver", 1.0).kind == "synchronous"
    table = R.interference_check(
        modes, [shaft_order(train, "driver"), hs_1x], R.operating_range(1200, 1500), R.RuleSet()
    )
    assert {f.rule for f in table} == {"torsional 10 %"}  # API 617 / RP 684, from memory
    first = next(f for f in table if f.excitation is hs_1x and f.mode is modes[0])
    # The coincidence in driver rpm: f_n = 3.2 N / 60 -> N = 60 f_n / 3.2.
    assert_allclose(first.coincidence_speed, 60 * modes[0].frequency / 3.2, rtol=1e-12)


def test_torque_response_against_a_direct_solve_of_the_hand_referred_train():
    from resonance.kinds.torsion.response import torque_response

    n, jm, jg, jp, jc = 3.2, 6.0, 1.1, 0.05, 0.4
    kc, cc, ks = 4e4, 30.0, 6e6
    shaft = TorsionalShaft(("pinion", "compressor"), ks, label="hs shaft", outer_diameter=0.06, inner_diameter=0.02)
    train = torsional_train(
        [Station("motor", jm), Station("gear", jg), Station("pinion", jp, "hs"), Station("compressor", jc, "hs")],
        [Coupling(("motor", "gear"), kc, damping=cc, label="coupling"), shaft],
        [GearMesh("gear", "pinion", n)],
    )
    f = np.array([1.0, 5.0, 12.0, 40.0])
    out = torque_response(train, {"motor": 500.0, "compressor": R.ureg("20 N*m")}, f)
    # The same train referred by hand (Wilson/Rao): J n^2, k n^2, c n^2; a torque on the fast shaft n T.
    mass = np.diag([jm, jg + jp * n**2, jc * n**2])
    k = np.array([[kc, -kc, 0.0], [-kc, kc + ks * n**2, -ks * n**2], [0.0, -ks * n**2, ks * n**2]])
    c = np.array([[cc, -cc, 0.0], [-cc, cc, 0.0], [0.0, 0.0, 0.0]])
    load = np.array([500.0, 0.0, 20.0 * n])
    for i, fi in enumerate(f):
        w = 2 * math.pi * fi
        theta = np.linalg.solve(k - w**2 * mass + 1j * w * c, load)
        assert_allclose(out.element_torque["coupling"][i], abs((kc + 1j * w * cc) * (theta[0] - theta[1])), rtol=1e-9)
        hs = abs(ks * n**2 * (theta[1] - theta[2])) / n  # back on the high-speed shaft
        assert_allclose(out.element_torque["hs shaft"][i], hs, rtol=1e-9)
        assert_allclose(out.station_angle["compressor"][i], abs(theta[2]) * n, rtol=1e-9)
    # Shear stress T / Z_p, Z_p = pi (D^4 - d^4) / (16 D) (Roark, from memory).
    zp = math.pi * (0.06**4 - 0.02**4) / (16 * 0.06)
    assert_allclose(out.shear_stress["hs shaft"], out.element_torque["hs shaft"] / zp, rtol=1e-12)
    assert "coupling" not in out.shear_stress  # no diameters given: no stress claimed


def test_torque_response_quasi_static_limit():
    # Far below the first mode a torque T0 on J1 accelerates both inertias together: the coupling passes the
    # share J2 / (J1 + J2) of it (rigid-body dynamics).
    from resonance.kinds.torsion.response import torque_response

    train = torsional_train([Station("a", 3.0), Station("b", 1.0)], [Coupling(("a", "b"), 1e6, label="c")])
    out = torque_response(train, {"a": 100.0}, [0.01])
    assert_allclose(out.element_torque["c"][0], 100.0 * 1.0 / 4.0, rtol=1e-6)
    with pytest.raises(R.InputValueError, match=r"torques: names 'z', which is not a station"):
        torque_response(train, {"z": 1.0}, [1.0])


def test_torque_response_with_modal_damping_against_a_direct_solve():
    # A modal damping ratio on every mode is the damping matrix C = J Phi diag(2 zeta w_r) Phi^T J
    # (mass-normalized Phi; Ewins, Modal Testing, 2nd ed., sec. 2.3); a direct complex solve with that matrix
    # is the reference, and the element torque is then the spring's torque.
    from resonance.kinds.torsion.response import torque_response

    train = torsional_train(
        [Station("a", 2.0), Station("b", 0.5), Station("c", 1.5)],
        [Coupling(("a", "b"), 2e5, damping=80.0, label="ab"), TorsionalShaft(("b", "c"), 5e5, label="bc")],
    )
    zeta = 0.03
    mass, k = train.model.mass, train.model.stiffness
    lam, phi = scipy.linalg.eigh(k, mass)
    wr = np.sqrt(np.clip(lam, 0.0, None))
    c = mass @ phi @ np.diag(2 * zeta * wr) @ phi.T @ mass
    f = np.linspace(5.0, 200.0, 57)
    out = torque_response(train, {"b": 300.0}, f, damping_ratio=zeta)
    for i, fi in enumerate(f):
        w = 2 * math.pi * fi
        theta = np.linalg.solve(k - w**2 * mass + 1j * w * c, np.array([0.0, 300.0, 0.0]))
        assert_allclose(out.element_torque["ab"][i], abs(2e5 * (theta[0] - theta[1])), rtol=1e-8)
        assert_allclose(out.element_torque["bc"][i], abs(5e5 * (theta[1] - theta[2])), rtol=1e-8)
        assert_allclose(out.station_angle["c"][i], abs(theta[2]), rtol=1e-8)


def test_torque_response_refuses_a_static_torque_and_bad_damping():
    from resonance.kinds.torsion.response import torque_response

    train = torsional_train([Station("a", 3.0), Station("b", 1.0)], [Coupling(("a", "b"), 1e6, label="c")])
    with pytest.raises(R.InputValueError, match="frequency"):
        torque_response(train, {"a": 1.0}, [0.0, 1.0])
    with pytest.raises(R.InputValueError, match="damping_ratio"):
        torque_response(train, {"a": 1.0}, [1.0], damping_ratio=-0.1)


# --- the torsional flow: scenario, study, record, check ------------------------------------------------------


def _train_tables():
    from pathlib import Path

    from resonance.records.tables import read_scenario_file

    return read_scenario_file(
        Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
    )


def test_demo_train_runs_through_check(tmp_path, capsys):
    import json
    from pathlib import Path

    from resonance.cli import main

    path = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
    out = tmp_path / "train.json"
    assert main(["check", str(path), "--json", str(out), "--html", str(tmp_path / "train.html")]) == 1
    text = capsys.readouterr().out
    assert "TORSIONAL MODES" in text
    assert "flexible coupling takes" in text
    data = json.loads(out.read_text())
    assert data["format"] == "resonance-torsion-record/1"
    assert {f["rule"] for f in data["findings"]} == {"torsional 10 %"}
    # The coupling mode lies below the range against the driver's 1x: SM = 100 (N_min - N_c) / N_min (API 684).
    worst = data["findings"][0]
    assert worst["verdict"] == "FAIL"
    assert_allclose(worst["margin_percent"], 100 * (1200 - worst["coincidence_speed_rpm"]) / 1200, rtol=1e-12)


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda t: t["torsion"]["stations"][0].update(inertia="0 kg*m**2"), r"torsion\.stations\[0\]\.inertia: got 0"),
        (lambda t: t["torsion"]["meshes"][0].update(ratio=0), r"torsion\.meshes\[0\]\.ratio: got 0"),
        (  # found by the fuzz test: the referral squared the ratio past a float
            lambda t: t["torsion"]["meshes"][0].update(ratio=1e300),
            r"torsion\.meshes\[0\]\.ratio: bull gear-pinion: ratio: got 1e\+300; expected a speed ratio between",
        ),
        (
            lambda t: t["torsion"]["stations"][4].update(shaft="island"),
            r"torsion\.(shafts/couplings|meshes): .*(joins two shafts|not geared)",
        ),
        (
            lambda t: t["torsion"]["couplings"][0].update(between=["hub", "nowhere"]),
            r"torsion\.shafts/couplings: springs\[2\] \(flexible coupling\): names 'nowhere'",
        ),
        (lambda t: t["torsion"].update(damping_ratio=1.5), r"torsion\.damping_ratio: got 1\.5"),
        (lambda t: t["torsion"]["meshes"][0].update(gear_teeth=0), r"torsion\.meshes\[0\]\.gear_teeth: got 0"),
        (
            lambda t: t["torsion"]["forcing"][0].update(excitation="3x"),
            r"torsion\.forcing\[0\]\.excitation: got '3x'; expected the label of a checked excitation",
        ),
        (
            lambda t: t["torsion"]["forcing"][0].update(station="rotor"),
            r"torsion\.forcing\[0\]\.station: got 'rotor'",
        ),
        (
            lambda t: t["torsion"]["forcing"][1].update(fraction_of_rated=0.1),
            r"torsion\.forcing\[1\]: expected exactly one of torque or fraction_of_rated",
        ),
        (
            lambda t: t["torsion"].pop("rated_torque"),
            r"torsion\.forcing\[0\]\.fraction_of_rated: needs torsion\.rated_torque",
        ),
        (
            lambda t: t["torsion"]["couplings"][0].update(allowable_stress="40 MPa"),
            r"torsion\.couplings\[0\]\.allowable_stress: unknown field",
        ),
        (
            lambda t: (
                t["torsion"]["shafts"][0].update(outer_diameter=None) or t["torsion"]["shafts"][0].pop("outer_diameter")
            ),
            r"torsion\.shafts\[0\]\.stiffness: missing",
        ),
        (
            lambda t: (
                t["torsion"]["shafts"][1].update(stiffness="170 kN*m/rad")
                or [t["torsion"]["shafts"][1].pop(k) for k in ("outer_diameter", "inner_diameter", "length")]
            ),
            r"torsion\.shafts\[1\]\.allowable_stress: needs the section's outer_diameter",
        ),
        (
            lambda t: t["torsion"]["couplings"][0].update(allowable_torque="-1 kN*m"),
            r"torsion\.couplings\[0\]\.allowable_torque: got -1",
        ),
    ],
)
def test_bad_trains_name_the_file_and_field(edit, message):
    from resonance.kinds.torsion.scenario import parse_torsion_scenario
    from resonance.records.tables import ScenarioError

    tables = _train_tables()
    edit(tables)
    with pytest.raises(ScenarioError, match=rf"^train\.toml: {message}"):
        parse_torsion_scenario(tables, "train.toml")


def _forced_train(allowable: str) -> dict:
    # Two inertias and a coupling, a torque on the first following 1x (test data, not a machine).
    return {
        "scenario": {"title": "two-inertia forced"},
        "speed": {"min": "900 rpm", "max": "1100 rpm"},
        "margin": {"torsional": 10},
        "torsion": {
            "damping_ratio": 0.05,
            "shaft_orders": [1],
            "stations": [{"name": "a", "inertia": "3 kg*m**2"}, {"name": "b", "inertia": "1 kg*m**2"}],
            "couplings": [
                {"between": ["a", "b"], "stiffness": "8.2 kN*m/rad", "label": "c", "allowable_torque": allowable}
            ],
            "forcing": [{"station": "a", "excitation": "1x driver shaft", "torque": "100 N*m"}],
        },
    }


def test_forced_torque_peak_against_the_two_inertia_closed_form():
    # Two inertias J1, J2, coupling k, modal damping zeta, torque T on J1 at w: the coupling torque is
    # T J2 w_n^2 / |w_n^2 - w^2 + 2 i zeta w_n w| (modal superposition of the one elastic mode; Rao, Mechanical
    # Vibrations, 6th ed., sec. 6.10: w_n^2 = k (J1 + J2) / (J1 J2)); at 1x through 900-1100 rpm.
    from resonance.kinds.torsion.scenario import parse_torsion_scenario
    from resonance.kinds.torsion.study import run_torsion_study

    result = run_torsion_study(parse_torsion_scenario(_forced_train("1 kN*m"), "t.toml"))
    sweep = result.torque
    j1, j2, k, zeta = 3.0, 1.0, 8.2e3, 0.05
    wn = math.sqrt(k * (j1 + j2) / (j1 * j2))
    w = 2 * math.pi * sweep.speed / 60
    expected = 100.0 * j2 / (j1 + j2) * wn**2 / np.abs(wn**2 - w**2 + 2j * zeta * wn * w)
    assert_allclose(sweep.element_torque["c"][0], expected, rtol=1e-9)
    # f_n = 16.64 Hz, 998 rpm at 1x: inside the range, so it is on the grid and the peak is near it.
    row = sweep.rows[0]
    assert row.speed == pytest.approx(60 * wn / (2 * math.pi) * math.sqrt(1 - 2 * zeta**2), rel=5e-3)
    assert row.peak_torque == pytest.approx(expected.max(), rel=1e-12)
    assert row.status == "within allowable"
    assert result.verdict == "FAIL"  # the separation rule still fails: a coincidence inside the range


def test_an_exceeded_allowable_fails_the_study_and_is_named():
    from resonance.kinds.torsion.record import build_torsion_record
    from resonance.kinds.torsion.scenario import parse_torsion_scenario
    from resonance.kinds.torsion.study import run_torsion_study

    result = run_torsion_study(parse_torsion_scenario(_forced_train("100 N*m"), "t.toml"))
    assert result.torque.rows[0].status == "EXCEEDS ALLOWABLE"
    assert not result.torque.passed
    assert not result.passed
    assert "an element EXCEEDS its allowable; largest: c" in result.summary()
    record = build_torsion_record(result)
    assert record.data["forced_response"]["elements"][0]["status"] == "EXCEEDS ALLOWABLE"
    assert "FORCED TORQUE" in record.text
    assert "EXCEEDS ALLOWABLE" in record.text


def test_allowable_exceeded_fails_even_when_every_margin_passes():
    # Separation passes (the mode sits far above 1x), yet a large torque exceeds the allowable: FAIL.
    from resonance.kinds.torsion.scenario import parse_torsion_scenario
    from resonance.kinds.torsion.study import run_torsion_study

    tables = _forced_train("50 N*m")
    tables["torsion"]["couplings"][0]["stiffness"] = "3000 kN*m/rad"
    tables["torsion"]["forcing"][0]["torque"] = "1000 N*m"
    result = run_torsion_study(parse_torsion_scenario(tables, "t.toml"))
    assert result.findings.passed
    assert result.verdict == "FAIL"
    # Quasi-static: the coupling passes J2 / (J1 + J2) of the torque = 250 N m (rigid-body dynamics).
    assert result.torque.rows[0].peak_torque == pytest.approx(250.0, rel=0.01)


def test_fraction_of_rated_torque_is_taken_to_the_stations_shaft():
    # A fraction of the driver's rated torque at a station on a shaft n times faster is fraction * rated / n
    # (the same power on every shaft; common practice).
    from resonance.kinds.torsion.scenario import parse_torsion_scenario

    tables = _train_tables()
    tables["torsion"]["forcing"] = [
        {"station": "compressor", "excitation": "1x high speed shaft", "fraction_of_rated": 0.02}
    ]
    scenario = parse_torsion_scenario(tables, "train.toml")
    assert_allclose(scenario.forcing[0].torque, 0.02 * 7600.0 / 3.2, rtol=1e-12)


def test_scaled_couplings_move_the_coupling_mode_by_the_square_root():
    # A train whose first mode is almost all coupling: scaling the coupling stiffness by 2 raises it by about
    # sqrt(2) (Rayleigh quotient; exact for the two-inertia train).
    from resonance.kinds.torsion.train import scale_couplings

    train = torsional_train([Station("a", 3.0), Station("b", 1.0)], [Coupling(("a", "b"), 1e5, label="c")])
    f1 = torsional_modes(train).frequency[1]
    f2 = torsional_modes(scale_couplings(train, 2.0)).frequency[1]
    assert_allclose(f2 / f1, math.sqrt(2.0), rtol=1e-12)
    with pytest.raises(R.InputValueError, match="factor"):
        scale_couplings(train, 0.0)


# --- the torsional panel and the HTML record ------------------------------------------------------------------


def _demo():
    from pathlib import Path

    from resonance.kinds.torsion.scenario import load_torsion_scenario

    return load_torsion_scenario(
        Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
    )


def test_panel_coupling_slider_moves_the_coupling_mode_and_the_verdict():
    from resonance.ui import TorsionPanel

    panel = TorsionPanel(_demo())
    assert "Caution." in panel.widget.children[0].value
    assert panel.result.verdict == "FAIL"
    f0 = panel.result.modes[0].frequency
    panel.coupling.value = 0.8
    # The coupling takes 97 % of the first mode's twist: its frequency moves by nearly sqrt(0.8) (Rayleigh).
    assert panel.result.modes[0].frequency / f0 == pytest.approx(math.sqrt(0.8), rel=0.02)
    assert panel.result.verdict == "PASS"
    assert "Verdict: PASS" in panel.verdict.value
    # The interference diagram's mode line and the torque traces follow in place.
    line = next(t for t in panel.interference_fig.data if t.name == panel.result.modes[0].label)
    assert line.y[0] == pytest.approx(panel.result.modes[0].frequency)
    # A log frequency axis (15 Hz to 2 kHz on one diagram): order lines drawn through positive speeds only.
    assert panel.interference_fig.layout.yaxis.type == "log"
    order = next(t for t in panel.interference_fig.data if t.name == "1x driver shaft")
    assert min(order.x) > 0
    assert_allclose(order.y, np.asarray(order.x) / 60.0, rtol=1e-12)
    coupling = next(t for t in panel.torque_fig.data if t.name == "flexible coupling")
    assert max(coupling.y) == pytest.approx(panel.result.torque.rows[2].peak_torque)


def test_panel_damping_slider_sets_the_modal_ratio_and_units_switch():
    from resonance.ui import TorsionPanel

    panel = TorsionPanel(_demo())
    peak = panel.result.torque.rows[2].peak_torque
    panel.damping.value = 0.1
    assert panel.result.modes[0].amplification_factor == pytest.approx(1 / (2 * 0.1))  # AF = 1/(2 zeta)
    assert panel.result.torque.rows[2].peak_torque < peak
    panel.units.value = "US"
    assert "cpm" in panel.summary()
    assert "lbf*ft" in panel.torque_html.value


def test_panel_with_element_dampers_scales_them():
    from resonance.ui import TorsionPanel

    scenario = _demo().replace(damping_ratio=None)
    panel = TorsionPanel(scenario)
    assert panel.damping.description == "element dampers x"
    zeta = panel.result.modes[0].damping_ratio
    panel.damping.value = 2.0
    # The coupling's damper dominates the first mode's damping: doubling the dampers nearly doubles zeta.
    assert panel.result.modes[0].damping_ratio / zeta == pytest.approx(2.0, rel=0.05)


def test_html_record_of_a_train_has_its_tables_and_figures():
    from pathlib import Path

    from resonance.studies.registry import run_scenario_file
    from resonance.ui.report import render_outcome_html

    outcome = run_scenario_file(
        Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
    )
    page = render_outcome_html(outcome)
    for heading in ("Torsional modes", "Forced torque", "Natural frequencies against excitations"):
        assert heading in page
    assert "Torsional mode shapes" in page
    assert "Dynamic torque per element" in page
    assert page.count("within allowable") >= 3


def test_a_train_written_in_us_units_gives_the_si_answers():
    # WR^2 in lb ft^2 and stiffness in lbf in/rad against the SI demo (NIST SP 811: 1 lb ft^2 = 0.0421401 kg m^2,
    # 1 lbf in = 0.1129848 N m).
    from resonance.kinds.torsion.scenario import parse_torsion_scenario
    from resonance.kinds.torsion.study import run_torsion_study

    tables = _train_tables()
    us = _train_tables()
    us["scenario"]["units"] = "US"
    for station in us["torsion"]["stations"]:
        value = float(station["inertia"].split()[0])
        station["inertia"] = f"{value / 0.0421401!r} lb*ft**2"
    coupling = us["torsion"]["couplings"][0]
    coupling["stiffness"] = f"{40e3 / 0.1129848!r} lbf*in/rad"
    coupling["allowable_torque"] = f"{1900 / 1.3558179!r} lbf*ft"
    si_result = run_torsion_study(parse_torsion_scenario(tables, "si.toml"))
    us_result = run_torsion_study(parse_torsion_scenario(us, "us.toml"))
    assert_allclose([m.frequency for m in us_result.modes], [m.frequency for m in si_result.modes], rtol=1e-6)
    assert us_result.verdict == si_result.verdict
    assert_allclose(
        [r.peak_torque for r in us_result.torque.rows], [r.peak_torque for r in si_result.torque.rows], rtol=1e-6
    )
    assert "lbf*ft" in us_result.summary("US")


@pytest.mark.parametrize(
    ("edit", "field"),
    [
        (lambda t: t.replace('inertia = "6.0 kg*m**2"', 'inertia = "0 kg*m**2"'), "torsion.stations[0].inertia"),
        (lambda t: t.replace("ratio = 3.2", "ratio = 0"), "torsion.meshes[0].ratio"),
        (lambda t: t.replace('shaft = "high speed" },\n]', 'shaft = "island" },\n]'), "torsion."),
        (
            lambda t: t.replace('between = ["hub", "bull gear"]', 'between = ["hub", "gone"]'),
            "torsion.shafts/couplings",
        ),
        # A coupling from a station to itself once vanished with its mode (FAIL became PASS, exit 0).
        (
            lambda t: t.replace('between = ["hub", "bull gear"]', 'between = ["hub", "hub"]'),
            "torsion.couplings[0].between: got ['hub', 'hub']; expected two different stations",
        ),
        (lambda t: t.replace('label = "flexible coupling"', 'label = "motor shaft end"'), "torsion.couplings[0].label"),
        (lambda t: t.replace('damping = "30 N*m*s/rad"', 'damping = "3 %"'), "torsion.couplings[0].damping"),
        (lambda t: t.replace("poles = 4", "poles = 4\nload = 'fan law'"), "motor.load: got 'fan law'"),
    ],
)
def test_check_exits_2_on_a_bad_train_naming_file_and_field(tmp_path, capsys, edit, field):
    from pathlib import Path

    from resonance.cli import main

    demo = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "compressor_train.toml"
    text = demo.read_text()
    bad = edit(text)
    assert bad != text  # the edit applied
    path = tmp_path / "bad_train.toml"
    path.write_text(bad)
    assert main(["check", str(path)]) == 2
    err = capsys.readouterr().err
    assert "bad_train.toml" in err
    assert field in err
