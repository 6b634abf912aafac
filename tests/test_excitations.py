"""Excitations and unbalance against the ISO and API formulas.

Sources: ISO 21940-11:2016 eq. (2), U_per = G m / W, and its shop-unit form
U_per [g mm] = 9549 G [mm/s] m [kg] / n [rpm]; API Std 617 8th ed. / API RP 684
design unbalance U = 6350 W / N g mm = 4 W / N oz in (from memory); order
frequency n N / 60 (common practice).
"""

import math

import numpy as np
import pytest
from numpy.testing import assert_allclose

import resonance as R


def test_iso_permissible_unbalance_shop_formula():
    # ISO 21940-11: 9549 G m / n g mm (the constant 9549 = 60000 / (2 pi), 4 figures).
    for grade, mass, speed in [(6.3, 450.0, 1780.0), (2.5, 1200.0, 9000.0), (1.0, 5.0, 30000.0)]:
        u_gmm = R.permissible_unbalance(grade, mass, speed) * 1e6
        assert_allclose(u_gmm, 9549.0 * grade * mass / speed, rtol=5e-4)


def test_iso_permissible_unbalance_quantities():
    # Same value with US customary inputs (lbm) and a grade given as a velocity.
    u_si = R.permissible_unbalance(6.3, 45.359237, 3600.0)
    u_us = R.permissible_unbalance(R.ureg("6.3 mm/s"), R.ureg("100 lbm"), R.ureg("60 Hz"))
    assert_allclose(u_us, u_si, rtol=1e-14)


def test_api_design_unbalance_metric_and_us_forms_agree():
    # 6350 W/N g mm with W in kg equals 4 W/N oz in with W in lbm (API 617 / 684, from memory):
    # 4 oz in / lbm = 4 x 28.3495 g x 25.4 mm / 0.45359 kg = 6350.3 g mm / kg.
    w_lbm, n = 1000.0, 10000.0
    u = R.api_design_unbalance(R.ureg.Quantity(w_lbm, "lbm"), n)
    assert_allclose(R.ureg.Quantity(u, "kg*m").to("oz*in").magnitude, 4.0 * w_lbm / n, rtol=1e-4)


def test_orders_and_fixed_sources():
    # f = n N / 60 (common practice); twice line frequency 2 x 50 Hz (common practice).
    vane = R.blade_pass(7)
    assert vane.label == "blade pass (7x)"
    assert_allclose(vane.frequency_at([900.0, 1800.0]), [105.0, 210.0], rtol=1e-15)
    assert_allclose(R.gear_mesh(31).frequency_at(R.ureg("3 Hz")), [93.0], rtol=1e-15)
    assert R.twice_line_frequency().frequency == 100.0
    assert_allclose(R.twice_line_frequency(60.0).frequency_at([1.0, 2.0]), [120.0, 120.0])
    assert R.running_speed_order(1).coincidence_speed(25.0) == 1500.0
    assert R.fixed_frequency(100.0, "2x line").coincidence_speed(25.0) is None


def test_unbalance_force():
    # F = U w^2 (Rao sec. 3.7): 1 kg m at 60/pi Hz -> 1 kg m x (120 rad/s)^2... at 1800 rpm w = 60 pi.
    assert_allclose(R.unbalance_force(1e-3, [1800.0]), [1e-3 * (60 * math.pi) ** 2], rtol=1e-15)


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (lambda: R.blade_pass(0), r"blades: got 0; expected a whole number >= 1"),
        (lambda: R.gear_mesh(2.5), r"teeth: got 2\.5; expected a whole number >= 1"),
        (lambda: R.running_speed_order(-1.0), r"order: got -1; expected a value > 0"),
        (lambda: R.permissible_unbalance(0.0, 10.0, 3000.0), r"grade: got 0 mm/s; expected a value > 0"),
        (lambda: R.permissible_unbalance(2.5, 10.0, -1.0), r"speed: got -1 rpm; expected a value > 0"),
        (lambda: R.Excitation("odd", order=1.0, frequency=5.0), r"give exactly one of order or frequency"),
        (lambda: R.fixed_frequency(np.nan, "x"), r"frequency: got nan Hz"),
    ],
)
def test_bad_excitations(call, message):
    with pytest.raises(R.InputValueError, match=message):
        call()
