"""Units at the boundary: the trade's rpm, cpm and mil, and conversion errors.

Sources: the definitions of the units themselves (1 in = 25.4 mm exactly and
1 lbm = 0.45359237 kg exactly, NIST SP 811 (2008) appendix B; 1 Hz = one
cycle per second = 60 cycles per minute; one revolution per minute is one
cycle per minute, common practice of the trade).
"""

import math

import numpy as np
import pint
import pytest
from hypothesis import assume, given
from hypothesis import strategies as st
from numpy.testing import assert_allclose

import resonance as R
from resonance.core.inputs import PLAUSIBLE, as_matrix, as_si, as_si_array
from resonance.core.units import display_unit, internal_unit


def test_rpm_is_one_cycle_per_minute():
    # 3600 rpm = 60 Hz = 3600 cpm (common practice; plain pint says 377 Hz*rad).
    assert_allclose(R.ureg("3600 rpm").to("Hz").magnitude, 60.0, rtol=1e-15)
    assert_allclose(R.ureg("3600 cpm").to("Hz").magnitude, 60.0, rtol=1e-15)
    assert_allclose(R.ureg("3600 rpm").to("cpm").magnitude, 3600.0, rtol=1e-15)


def test_radian_per_second_is_one_over_two_pi_hertz():
    # w = 2 pi f (definition of angular frequency).
    assert_allclose(R.ureg("1 rad/s").to("Hz").magnitude, 1.0 / (2.0 * math.pi), rtol=1e-15)
    assert_allclose(R.ureg("1800 rpm").to("rad/s").magnitude, 60.0 * math.pi, rtol=1e-15)


def test_mil_is_a_thousandth_of_an_inch():
    # 1 in = 25.4 mm exactly (NIST SP 811, appendix B).
    assert_allclose(R.ureg("2 mil").to("um").magnitude, 50.8, rtol=1e-15)
    assert_allclose(R.ureg("0.5 in/s").to("mm/s").magnitude, 12.7, rtol=1e-15)
    assert_allclose(R.ureg("1 ips").to("mm/s").magnitude, 25.4, rtol=1e-15)


def test_us_customary_mass_stiffness_damping():
    # NIST SP 811 appendix B: 1 lbm = 0.45359237 kg; 1 lbf = 4.4482216152605 N.
    assert_allclose(R.ureg("1 lbm").to("kg").magnitude, 0.45359237, rtol=1e-15)
    assert_allclose(R.ureg("1 lbf/in").to("N/m").magnitude, 4.4482216152605 / 0.0254, rtol=1e-12)
    assert_allclose(R.ureg("1 lbf*s/in").to("N*s/m").magnitude, 4.4482216152605 / 0.0254, rtol=1e-12)


def test_plain_pint_has_the_trap_this_registry_avoids():
    # Regression guard documenting why the package builds its own registry:
    # plain pint turns 1 rpm into 2 pi / 60 = 0.1047 Hz and reads mil as an angle.
    plain = pint.UnitRegistry()
    assert_allclose(plain("1 rpm").to("Hz").magnitude, 2.0 * math.pi / 60.0, rtol=1e-12)
    assert plain("1 mil").dimensionless


def test_quantities_accepted_at_public_boundary():
    # Same natural frequency from SI and US customary inputs (sqrt(k/m)/2pi).
    si = R.natural_frequency(907.18474, 1.0e5 * 4.4482216152605 / 0.0254)
    us = R.natural_frequency(R.ureg("2000 lbm"), R.ureg("1e5 lbf/in"))
    assert_allclose(us, si, rtol=1e-12)
    assert_allclose(us, math.sqrt(1.0e5 * 4.4482216152605 / 0.0254 / 907.18474) / (2 * math.pi), rtol=1e-12)


def test_speed_quantity_in_frequency_slot():
    x_hz = R.harmonic_response(10.0, 1e6, 100.0, 1.0, [30.0]).amplitude
    x_rpm = R.harmonic_response(10.0, 1e6, 100.0, 1.0, R.ureg.Quantity([1800.0], "rpm")).amplitude
    assert_allclose(x_rpm, x_hz, rtol=1e-14)


@pytest.mark.parametrize(
    ("value", "kind", "message"),
    [
        (R.ureg("3 kg"), "stiffness", r"stiffness: got 3 kg, which is not a stiffness"),
        (R.ureg("1 mil"), "frequency", r"frequency: got 1 mil, which is not a frequency"),
        ("12", "mass", r"mass: got the text '12'"),
        (object(), "mass", r"mass: got <object"),
    ],
)
def test_wrong_dimension_or_type_names_the_parameter(value, kind, message):
    with pytest.raises(R.InputTypeError, match=message):
        as_si(value, kind, kind)


def test_quantity_from_another_registry_is_refused():
    with pytest.raises(R.InputTypeError, match=r"speed: got a quantity from another pint registry"):
        as_si(pint.UnitRegistry()("3600 rpm"), "speed", "speed")


@pytest.mark.parametrize(
    ("value", "sign", "message"),
    [
        (math.nan, "any", r"mass: got nan kg; expected a finite number"),
        (math.inf, "any", r"mass: got inf kg; expected a finite number"),
        (0.0, "positive", r"mass: got 0 kg; expected a value > 0"),
        (-1.0, "nonnegative", r"mass: got -1 kg; expected a value >= 0"),
    ],
)
def test_bad_values_name_the_parameter(value, sign, message):
    with pytest.raises(R.InputValueError, match=message):
        as_si(value, "mass", "mass", sign)


def test_array_checks():
    with pytest.raises(R.InputValueError, match="frequency: got an empty array"):
        as_si_array([], "frequency", "frequency")
    with pytest.raises(R.InputValueError, match=r"frequency: got -1 Hz; expected a value >= 0"):
        as_si_array([1.0, -1.0], "frequency", "frequency", "nonnegative")
    with pytest.raises(R.InputTypeError, match=r"speed: got an array of shape \(2,\); expected a scalar"):
        as_si([1.0, 2.0], "speed", "speed")


def test_matrix_checks():
    with pytest.raises(R.InputValueError, match=r"stiffness_matrix: the matrix is not symmetric"):
        as_matrix([[1.0, 2.0], [0.0, 1.0]], "stiffness_matrix", "stiffness")
    with pytest.raises(R.InputValueError, match=r"damping_matrix: got shape \(2, 3\); expected a square"):
        as_matrix(np.ones((2, 3)), "damping_matrix", "damping")
    with pytest.raises(R.InputValueError, match=r"expected \(3, 3\) to match the mass matrix"):
        as_matrix(np.eye(2), "stiffness_matrix", "stiffness", 3)


def test_display_units():
    # 1 m = 39370.0787 mil (1 in = 25.4 mm); 1 Hz = 60 cpm.
    assert display_unit("displacement", "US") == ("mil", pytest.approx(1 / 25.4e-6, rel=1e-12))
    assert display_unit("frequency", "US") == ("cpm", pytest.approx(60.0, rel=1e-15))
    assert display_unit("stiffness", "SI") == ("kN/mm", pytest.approx(1e-6, rel=1e-15))
    assert internal_unit("speed") == "rpm"
    with pytest.raises(ValueError, match="system: got 'metric'"):
        display_unit("mass", "metric")  # type: ignore[arg-type]


kinds = st.sampled_from(["mass", "stiffness", "damping", "force", "displacement", "velocity", "unbalance"])


@given(value=st.floats(1e-6, 1e9), kind=kinds, system=st.sampled_from(["SI", "US"]))
def test_display_round_trip(value, kind, system):
    # Property: a value shown in a display unit and typed back gives the same SI value (within the magnitudes
    # the input layer accepts for the kind; a hair inside, so rounding at the edge does not leave the range).
    low, high = PLAUSIBLE.get(kind, (0.0, math.inf))
    assume(1.001 * low <= value <= high / 1.001)
    unit, factor = display_unit(kind, system)
    back = as_si(R.ureg.Quantity(value * factor, _pint_spelling(unit)), kind, kind)
    assert_allclose(back, value, rtol=1e-12)


def _pint_spelling(label: str) -> str:
    return {"µm": "um", "g": "g0", "N·s/m": "N*s/m", "lbf·s/in": "lbf*s/in", "g·mm": "g*mm", "oz·in": "oz*in"}.get(
        label, label
    )
