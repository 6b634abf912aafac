"""Units everywhere in the rotor part: the same rotor in SI floats, SI quantities and US quantities.

Conversions (NIST SP 811, 2008, appendix B): 1 in = 25.4 mm, 1 lbm = 0.45359237 kg, 1 lbf = 4.4482216152605 N,
1 psi = 6894.757 Pa, 1 oz in = 7.0615518e-3 N m / g... (unbalance 1 oz in = 28.349523 g x 25.4 mm). The rotor
is an invented demo; each analysis must give the same answer whatever units its inputs came in.
"""

from __future__ import annotations

import numpy as np
import pytest
from numpy.testing import assert_allclose

import resonance as R
from resonance.kinds.rotor import (
    Bearing,
    Disc,
    Material,
    Pedestal,
    ShaftSection,
    Unbalance,
    campbell,
    critical_speed_map,
    critical_speeds,
    rotor_model,
    rotor_modes,
    unbalance_response_rotor,
)
from resonance.kinds.rotor.analysis import deflected_shape

u = R.ureg
IN, LBM, LBF = 0.0254, 0.45359237, 4.4482216152605


def si_floats():
    steel = Material(7850.0, 2.05e11, 0.29, "steel")
    sections = [ShaftSection(0.3, 0.08, 0.0, steel, 3), ShaftSection(0.9, 0.1, 0.02, steel, 6)]
    discs = [Disc(1, 120.0, 1.8, 0.95, "wheel")]
    bearings = [
        Bearing(0, 3.0e7, 2.0e7, cxx=2.0e4, cyy=2.0e4, label="NDE", pedestal=Pedestal(80.0, 5.0e8, 5.0e8)),
        Bearing(2, (3.0e7, 4.0e7), (2.0e7, 3.0e7), cxx=2.0e4, cyy=2.0e4, speeds=(0.0, 6000.0), label="DE"),
    ]
    return rotor_model(sections, discs, bearings), [Unbalance(1, 5e-4, 30.0)]


def si_quantities():
    steel = Material(u("7850 kg/m**3"), u("205 GPa"), 0.29, "steel")
    sections = [
        ShaftSection(u("300 mm"), u("80 mm"), u("0 mm"), steel, 3),
        ShaftSection(u("0.9 m"), u("100 mm"), u("20 mm"), steel, 6),
    ]
    discs = [Disc(1, u("120 kg"), u("1.8 kg*m**2"), u("0.95 kg*m**2"), "wheel")]
    bearings = [
        Bearing(
            0,
            u("30 kN/mm"),
            u("20 kN/mm"),
            cxx=u("20 kN*s/m"),
            cyy=u("20 kN*s/m"),
            label="NDE",
            pedestal=Pedestal(u("80 kg"), u("500 kN/mm"), u("500 kN/mm")),
        ),
        Bearing(
            2,
            u.Quantity([30.0, 40.0], "kN/mm"),
            u.Quantity([20.0, 30.0], "kN/mm"),
            cxx=u("20 kN*s/m"),
            cyy=u("20 kN*s/m"),
            speeds=u.Quantity([0.0, 6000.0], "rpm"),
            label="DE",
        ),
    ]
    return rotor_model(sections, discs, bearings), [Unbalance(1, u("500 g*mm"), u("30 deg"))]


def us_quantities():
    steel = Material(
        u.Quantity(7850.0 / LBM * IN**3, "lbm/in**3"), u.Quantity(2.05e11 / 6894.757293168361, "psi"), 0.29
    )
    k = lambda si: u.Quantity(si * IN / LBF, "lbf/in")  # noqa: E731
    c = lambda si: u.Quantity(si * IN / LBF, "lbf*s/in")  # noqa: E731
    sections = [
        ShaftSection(u.Quantity(0.3 / IN, "in"), u.Quantity(0.08 / IN, "in"), 0.0, steel, 3),
        ShaftSection(u.Quantity(0.9 / IN, "in"), u.Quantity(0.1 / IN, "in"), u.Quantity(0.02 / IN, "in"), steel, 6),
    ]
    discs = [
        Disc(
            1,
            u.Quantity(120.0 / LBM, "lbm"),
            u.Quantity(1.8 / (LBM * IN**2), "lbm*in**2"),
            u.Quantity(0.95 / (LBM * IN**2), "lbm*in**2"),
            "wheel",
        )
    ]
    bearings = [
        Bearing(
            0,
            k(3.0e7),
            k(2.0e7),
            cxx=c(2.0e4),
            cyy=c(2.0e4),
            label="NDE",
            pedestal=Pedestal(u.Quantity(80.0 / LBM, "lbm"), k(5.0e8), k(5.0e8)),
        ),
        Bearing(
            2,
            k(np.array([3.0e7, 4.0e7])),
            k(np.array([2.0e7, 3.0e7])),
            cxx=c(2.0e4),
            cyy=c(2.0e4),
            speeds=u.Quantity([0.0, 6000.0], "rpm"),
            label="DE",
        ),
    ]
    # 500 g mm = 0.5 kg mm = 0.5 / (28.349523e-3 * 25.4) oz in
    return rotor_model(sections, discs, bearings), [
        Unbalance(1, u.Quantity(0.5 / (28.349523 * 25.4) * 1e3, "oz*in"), 30.0)
    ]


@pytest.mark.parametrize("build", [si_quantities, us_quantities])
def test_every_rotor_function_gives_the_same_answer_in_any_units(build):
    reference, ref_unbalance = si_floats()
    rotor, unbalance = build()
    assert_allclose(rotor.mass, reference.mass, rtol=1e-9)
    assert_allclose(
        rotor.shaft_stiffness, reference.shaft_stiffness, rtol=1e-9, atol=1e-9 * np.abs(reference.shaft_stiffness).max()
    )
    speed = u("3000 rpm") if build is si_quantities else u("50 Hz")
    modes, ref_modes = rotor_modes(rotor, speed, 6), rotor_modes(reference, 3000.0, 6)
    assert_allclose(modes.frequency, ref_modes.frequency, rtol=1e-8)
    assert_allclose(modes.damping_ratio, ref_modes.damping_ratio, rtol=1e-6, atol=1e-9)
    sweep = u.Quantity(np.linspace(0.0, 6000.0, 13), "rpm")
    data, ref_data = campbell(rotor, sweep, 4), campbell(reference, np.linspace(0.0, 6000.0, 13), 4)
    assert_allclose(data.frequency, ref_data.frequency, rtol=1e-8)
    assert_allclose(
        [c.speed for c in critical_speeds(rotor, data)],
        [c.speed for c in critical_speeds(reference, ref_data)],
        rtol=1e-7,
    )
    stiffness = u.Quantity(np.geomspace(1e5, 1e7, 5), "lbf/in")
    assert_allclose(
        critical_speed_map(rotor, stiffness).speed,
        critical_speed_map(reference, np.geomspace(1e5, 1e7, 5) * LBF / IN).speed,
        rtol=1e-8,
    )
    response = unbalance_response_rotor(rotor, unbalance, u.Quantity([1000.0, 2500.0], "rpm"), [1])
    ref_response = unbalance_response_rotor(reference, ref_unbalance, [1000.0, 2500.0], [1])
    assert_allclose(response.x, ref_response.x, rtol=1e-7)
    assert_allclose(deflected_shape(rotor, modes, 0)[1], deflected_shape(reference, ref_modes, 0)[1], rtol=1e-6)


def test_a_stiffness_in_lbf_per_inch_is_never_read_as_newtons_per_metre():
    rotor, _ = si_floats()
    k_us = u("1e5 lbf/in")  # 1.75e7 N/m
    assert_allclose(
        critical_speed_map(rotor, [k_us.to("N/m").magnitude]).speed,
        critical_speed_map(rotor, u.Quantity([1e5], "lbf/in")).speed,
        rtol=1e-12,
    )
    assert Bearing(0, k_us, k_us).kxx == pytest.approx(1e5 * LBF / IN, rel=1e-12)


@pytest.mark.parametrize(
    ("call", "error", "message"),
    [
        (lambda: ShaftSection(u("1 kg"), 0.1), R.InputTypeError, r"length: got 1 kg, which is not a length"),
        (
            lambda: Material(7850.0, 2e11, 0.7),
            R.InputValueError,
            r"poisson_ratio: got 0\.7; expected a value in \(-1, 0\.5\)",
        ),
        (lambda: Material(-1.0, 2e11, 0.3), R.InputValueError, r"density: got -1 kg/m\*\*3"),
        (lambda: Bearing(0, u("1 kg"), 1e7, label="NDE"), R.InputTypeError, r"NDE: kxx: got 1 kg"),
        (lambda: Bearing(0, 1e7, 1e7, tilt_stiffness=u("1 m")), R.InputTypeError, r"bearing: tilt_stiffness: got 1 m"),
        (lambda: Unbalance(1, u("2 kg")), R.InputTypeError, r"amount: got 2 kg"),
        (lambda: Unbalance(1.5, 1e-3), R.InputTypeError, r"station: got 1\.5; expected a whole number"),
        (lambda: rotor_modes("rotor", 100.0), R.InputTypeError, r"rotor: got str; expected a Rotor"),
        (lambda: rotor_modes(si_floats()[0], u("3 m")), R.InputTypeError, r"speed: got 3 m"),
        (lambda: campbell(si_floats()[0], [0.0, 100.0], 0), R.InputValueError, r"count: got 0"),
    ],
)
def test_rotor_inputs_are_refused_by_the_package(call, error, message):
    with pytest.raises(error, match=message):
        call()


def test_steady_state_is_a_named_tuple():
    state = R.harmonic_response(1.0, 1e4, 10.0, 1.0, [5.0, 10.0])
    amplitude, lag = state
    assert len(state) == 2
    assert state[0] is amplitude
    assert state[1] is lag
    assert state.phase_lag is lag
