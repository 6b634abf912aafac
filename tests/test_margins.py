"""Amplification factor, separation margin and required margin.

Sources: half-power points of a viscous single-degree-of-freedom system,
r_{1,2}^2 = 1 - 2 zeta^2 -/+ 2 zeta sqrt(1 - zeta^2), peak at r^2 = 1 - 2 zeta^2
(Rao, *Mechanical Vibrations*, 6th ed., sec. 3.4, derived from the amplitude
formula); AF = N_c / (N_2 - N_1) and the separation-margin definitions (API RP
684, 2nd ed., from memory); the required-margin rule SM = min(16, 17 (1 -
1 / (AF - 1.5))) below and min(26, 10 + 17 (1 - 1 / (AF - 1.5))) above,
none for AF < 2.5 (API Std 617 8th ed. / API RP 684, from memory).
"""

import math

import numpy as np
import pytest
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose

import resonance as R
from resonance.checks.margins import range_margin


def exact_half_power(zeta, fn):
    s = 2 * zeta * math.sqrt(1 - zeta**2)
    return fn * math.sqrt(1 - 2 * zeta**2), fn * math.sqrt(1 - 2 * zeta**2 - s), fn * math.sqrt(1 - 2 * zeta**2 + s)


def sdof_curve(zeta, f, fn=12.0, kind="force"):
    m = 1.0
    k = (2 * math.pi * fn) ** 2
    c = 2 * zeta * math.sqrt(k * m)
    if kind == "force":
        return R.harmonic_response(m, k, c, 1.0, f).amplitude
    return R.unbalance_response(m, k, c, 1.0, f).amplitude


@pytest.mark.parametrize("zeta", [0.01, 0.03, 0.1, 0.25])
@pytest.mark.parametrize("points", [9, 15, 60])
def test_half_power_points_exact_on_coarse_sweeps(zeta, points):
    # Rao sec. 3.4 closed form; even 9 points across 0.5-1.5 fn (spacing far wider than the
    # half-power band for zeta = 0.01) give the exact points, because 1/A^2 is a parabola in f^2.
    fn = 12.0
    f = np.linspace(0.5, 1.5, points) * fn
    hp = R.half_power_points(f, sdof_curve(zeta, f, fn))
    peak, lower, upper = exact_half_power(zeta, fn)
    assert_allclose([hp.peak_frequency, hp.lower, hp.upper], [peak, lower, upper], rtol=1e-9)
    assert_allclose(hp.amplification_factor, peak / (upper - lower), rtol=1e-9)


def test_af_equals_one_over_two_zeta_for_light_damping():
    # AF = Q = 1 / (2 zeta) for light damping (API RP 684, from memory): within 1 % at zeta = 0.02
    # on an unbalance response sampled at 1/4 of the half-power bandwidth.
    zeta, fn = 0.02, 40.0
    f = np.arange(0.8 * fn, 1.2 * fn, 0.5 * zeta * fn)
    af = R.amplification_factor(f, sdof_curve(zeta, f, fn, "unbalance"))
    assert_allclose(af, 1 / (2 * zeta), rtol=1e-2)


def test_af_in_rpm_and_with_quantities():
    f = np.linspace(6.0, 18.0, 31)
    x = sdof_curve(0.05, f)
    af_hz = R.amplification_factor(f, x)
    assert_allclose(R.amplification_factor(60 * f, x), af_hz, rtol=1e-12)
    assert_allclose(R.amplification_factor(R.ureg.Quantity(60 * f, "rpm"), x), af_hz, rtol=1e-12)


def test_af_of_the_peak_nearest_a_frequency():
    # Two well-separated SDOF peaks (superposed); `near` picks the second.
    f = np.linspace(5.0, 60.0, 2000)
    # The second peak stands 200 times above the first mode's tail there, so its AF is that of
    # its own SDOF curve, 1 / (2 zeta) (Rao sec. 3.4), within 2 %.
    x = sdof_curve(0.05, f, 12.0) + 10.0 * sdof_curve(0.02, f, 40.0)
    assert_allclose(R.amplification_factor(f, x, near=40.0), 1 / (2 * 0.02), rtol=0.02)
    assert R.amplification_factor(f, x) == R.amplification_factor(f, x, near=40.0)  # the highest
    assert R.half_power_points(f, x, near=15.0).peak_frequency < 13.0


@pytest.mark.parametrize(
    ("f", "x", "message"),
    [
        (np.linspace(1, 10, 10), np.linspace(1, 10, 10), r"has no peak inside the data"),
        (np.linspace(11.6, 14, 20), None, r"lower half-power point lies below the first point"),
        (np.linspace(10, 12.4, 20), None, r"upper half-power point lies above the last point"),
        (np.array([1.0, 3.0, 2.0]), np.array([1.0, 2.0, 1.0]), r"frequency: expected strictly increasing"),
        (np.array([1.0, 2.0]), np.array([1.0, 2.0]), r"frequency: got 2 points; expected at least 3"),
        (np.array([1.0, 2.0, 3.0]), np.array([1.0, 2.0]), r"amplitude: got 2 values for 3 frequencies"),
        (np.array([1.0, 2.0, 3.0]), np.array([1.0, math.nan, 1.0]), r"amplitude: got nan; expected a finite number"),
    ],
)
def test_half_power_bad_curves(f, x, message):
    x = sdof_curve(0.05, f) if x is None else x
    with pytest.raises(R.InputValueError, match=message):
        R.amplification_factor(f, x)


def test_separation_margin_definitions():
    # API RP 684 (from memory): below 100 (N_min - N_c) / N_min, above 100 (N_c - N_max) / N_max.
    assert_allclose(R.separation_margin(1500.0, 1800.0, 3600.0), 100 * 300 / 1800, rtol=1e-15)
    assert_allclose(R.separation_margin(4500.0, 1800.0, 3600.0), 100 * 900 / 3600, rtol=1e-15)
    # Inside: negative, the distance to the nearer limit.
    assert_allclose(R.separation_margin(2000.0, 1800.0, 3600.0), -100 * 200 / 1800, rtol=1e-15)
    assert_allclose(R.separation_margin(R.ureg("25 Hz"), R.ureg("1800 rpm"), R.ureg("3600 rpm")), 100 * 300 / 1800)


def test_separation_margin_with_skip_band():
    # A critical inside a drive skip band is measured from the nearer edge of the band.
    speeds = R.operating_range(900.0, 1800.0, [(1150.0, 1300.0)])
    margin, location, side = range_margin(1180.0, speeds)
    assert (location, side) == ("above", "above")
    assert_allclose(margin, 100 * (1180 - 1150) / 1150, rtol=1e-15)
    margin, location, side = range_margin(1290.0, speeds)
    assert (location, side) == ("below", "below")
    assert_allclose(margin, 100 * (1300 - 1290) / 1300, rtol=1e-15)


def test_required_margin_api_rule_values():
    # API 617 / 684 (from memory): AF < 2.5 none; AF = 10 -> 17 (1 - 1/8.5) = 15.0 below, 25.0 above;
    # the caps 16 / 26 reached at AF = 18.5; an undamped mode (AF = inf) needs the caps.
    assert R.required_separation_margin(2.49, "below") == 0.0
    assert_allclose(R.required_separation_margin(2.5, "below"), 0.0, atol=1e-15)
    assert_allclose(R.required_separation_margin(10.0, "below"), 17 * (1 - 1 / 8.5), rtol=1e-15)
    assert_allclose(R.required_separation_margin(10.0, "above"), 10 + 17 * (1 - 1 / 8.5), rtol=1e-15)
    assert_allclose(R.required_separation_margin(18.5, "below"), 16.0, rtol=1e-15)
    assert R.required_separation_margin(100.0, "above") == 26.0
    assert R.required_separation_margin(math.inf, "below") == 16.0


@given(a=st.floats(1.0, 1e6), b=st.floats(1.0, 1e6), side=st.sampled_from(["below", "above"]))
def test_required_margin_monotonic_in_af(a, b, side):
    # Property: more amplification never asks for less margin.
    lo, hi = sorted((a, b))
    assert R.required_separation_margin(lo, side) <= R.required_separation_margin(hi, side)


def test_rules():
    assert R.rule_by_name("api-lateral").required(10.0, "below") == R.required_separation_margin(10.0, "below")
    assert R.rule_by_name("flat-20").required(3.0, "above") == 20.0
    table = R.TableRule((2.5, 5.0, 10.0), (0.0, 10.0, 15.0), (0.0, 15.0, 20.0), "owner spec", "client standard")
    assert table.required(7.5, "below") == 12.5
    assert table.required(50.0, "above") == 20.0


@pytest.mark.parametrize(
    ("call", "message"),
    [
        (lambda: R.required_separation_margin(0.8, "below"), r"amplification_factor: got 0\.8; expected a value >= 1"),
        (lambda: R.required_separation_margin(5.0, "left"), r"side: got 'left'; expected 'below' or 'above'"),
        (lambda: R.rule_by_name("api-torsional"), r"rule: got 'api-torsional'"),
        (lambda: R.rule_by_name("flat-x"), r"rule: got 'flat-x'"),
        (lambda: R.FlatRule(-5.0), r"percent: got -5; expected a value > 0"),
        (lambda: R.TableRule((3.0, 2.0), (1.0, 2.0), (1.0, 2.0)), r"amplification_factors: got \[3\.0, 2\.0\]"),
        (lambda: R.separation_margin(2000.0, 3600.0, 1800.0), r"speed_max: got 1800 rpm, below speed_min"),
        (lambda: R.operating_range(900.0, 1800.0, [(1300.0, 1200.0)]), r"skip_bands\[0\]: got \(1300, 1200\)"),
        (lambda: R.operating_range(900.0, 1800.0, [(800.0, 1000.0)]), r"expected a band inside the operating"),
        (lambda: R.operating_range(900.0, 1800.0, [(900.0, 1800.0)]), r"skip_bands: cover the whole operating"),
        (lambda: R.separation_margin(-5.0, 1.0, 2.0), r"critical_speed: got -5 rpm; expected a value > 0"),
    ],
)
def test_bad_margin_inputs(call, message):
    with pytest.raises(R.InputValueError, match=message):
        call()


def test_a_peak_sharper_than_the_sampling_is_refused_not_guessed():
    # Found by the fuzz test: an almost undamped peak between samples makes the interpolating parabola's vertex
    # reach 1/A^2 <= 0 (an infinite amplitude); the half-power method then has no answer from these samples.
    import numpy as np

    import resonance as R

    w = np.linspace(0.5, 1.5, 11)
    zeta = 1e-7
    amplitude = 1.0 / np.abs(1.0 - w**2 + 2j * zeta * w)  # SDOF receptance (closed form), peak at w = 1
    with pytest.raises(R.InputValueError, match="too sharp for the sampling"):
        R.half_power_points(w + 0.003, amplitude)
