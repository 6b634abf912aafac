"""Single degree of freedom against closed forms and scipy.signal.

Closed forms: S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, ch. 2-3
(equation numbers from memory). Reference library: scipy.signal.freqresp of
the transfer function X/F = 1 / (m s^2 + c s + k).
"""

import math

import numpy as np
import pytest
import scipy.signal
from hypothesis import given
from hypothesis import strategies as st
from numpy.testing import assert_allclose

import resonance as R

M, K = 250.0, 4.0e7  # invented demo values [kg], [N/m]
WN = math.sqrt(K / M)
FN = WN / (2 * math.pi)


def c_for(zeta):
    return 2.0 * zeta * math.sqrt(K * M)


def test_natural_frequency_closed_form():
    # fn = sqrt(k/m) / 2 pi (Rao eq. 2.14).
    assert_allclose(R.natural_frequency(M, K), FN, rtol=1e-15)


def test_damping_ratio_and_back():
    # zeta = c / (2 sqrt(k m)) (Rao eq. 2.60); damping_coefficient is its inverse.
    c = 1234.5
    zeta = R.damping_ratio(M, K, c)
    assert_allclose(zeta, c / (2 * math.sqrt(K * M)), rtol=1e-15)
    assert_allclose(R.damping_coefficient(M, K, zeta), c, rtol=1e-14)


def test_damped_and_peak_frequency():
    # fd = fn sqrt(1 - zeta^2) (Rao eq. 2.72); displacement peak at fn sqrt(1 - 2 zeta^2) (Rao sec. 3.4).
    zeta = 0.2
    assert_allclose(R.damped_natural_frequency(M, K, c_for(zeta)), FN * math.sqrt(1 - zeta**2), rtol=1e-14)
    assert_allclose(R.peak_frequency(M, K, c_for(zeta)), FN * math.sqrt(1 - 2 * zeta**2), rtol=1e-14)
    # The peak of a fine sweep is there (independent numerical check).
    f = np.linspace(0.5 * FN, 1.5 * FN, 200001)
    x = R.harmonic_response(M, K, c_for(zeta), 1.0, f).amplitude
    assert_allclose(f[np.argmax(x)], R.peak_frequency(M, K, c_for(zeta)), rtol=1e-5)


def test_no_damped_frequency_or_peak_when_overdamped():
    with pytest.raises(R.InputValueError, match=r"damping: gives a damping ratio of 1\.5"):
        R.damped_natural_frequency(M, K, c_for(1.5))
    with pytest.raises(R.InputValueError, match=r"peak only for ratios below 1/sqrt\(2\)"):
        R.peak_frequency(M, K, c_for(0.8))


@pytest.mark.parametrize("zeta", [0.0, 0.01, 0.1, 0.5, 2.0])
def test_harmonic_response_matches_scipy_freqresp(zeta):
    # scipy.signal.freqresp of 1/(m s^2 + c s + k); lag = -angle.
    c = c_for(zeta)
    f = np.linspace(0.0, 3 * FN, 301)
    f = f[np.abs(f - FN) > 1e-9] if zeta == 0.0 else f
    _, h = scipy.signal.freqresp(([1.0], [M, c, K]), w=2 * np.pi * f)
    amplitude, lag = R.harmonic_response(M, K, c, 500.0, f)
    assert_allclose(amplitude, 500.0 * np.abs(h), rtol=1e-12)
    assert_allclose(lag, np.mod(-np.angle(h), 2 * np.pi) % (2 * np.pi), atol=1e-12)


def test_harmonic_response_closed_form_and_phase_at_resonance():
    # X = F0 / sqrt((k - m w^2)^2 + (c w)^2), phi = atan2(c w, k - m w^2) (Rao eqs. 3.25-3.26);
    # 90 deg lag at w = wn for any viscous damping (Rao sec. 3.4).
    zeta, f0 = 0.05, 1000.0
    amplitude, lag = R.harmonic_response(M, K, c_for(zeta), f0, [FN])
    assert_allclose(amplitude, f0 / (c_for(zeta) * WN), rtol=1e-13)
    assert_allclose(lag, math.pi / 2, rtol=1e-13)
    static = R.harmonic_response(M, K, c_for(zeta), f0, [0.0]).amplitude
    assert_allclose(static, f0 / K, rtol=1e-15)


def test_unbalance_response_limits():
    # X = U w^2 / sqrt(...); X -> U/m far above resonance; X = U/(2 zeta m) at w = wn (Rao sec. 3.7).
    zeta, u = 0.05, 0.002
    x = R.unbalance_response(M, K, c_for(zeta), u, [FN, 1000 * FN]).amplitude
    assert_allclose(x[0], u / (2 * zeta * M), rtol=1e-13)
    assert_allclose(x[1], u / M, rtol=1e-5)
    lag = R.unbalance_response(M, K, c_for(zeta), u, [1000 * FN]).phase_lag
    assert_allclose(lag, math.pi, atol=1e-4)


def test_unbalance_accepts_shop_units_and_rpm():
    u_si = R.unbalance_response(M, K, c_for(0.05), 2.0e-3, [25.0]).amplitude
    u_q = R.unbalance_response(M, K, c_for(0.05), R.ureg("2000 g*mm"), R.ureg.Quantity([1500.0], "rpm"))
    assert_allclose(u_q.amplitude, u_si, rtol=1e-14)


def test_transmissibility_closed_form():
    # T = sqrt(1 + (2 zeta r)^2) / sqrt((1 - r^2)^2 + (2 zeta r)^2) (Rao eq. 3.74);
    # T = 1 at r = sqrt(2) for every damping ratio (Rao fig. 3.23).
    for zeta in (0.0, 0.05, 0.3, 1.0):
        r = np.array([0.0, 0.5, math.sqrt(2.0), 3.0])
        t = R.transmissibility(M, K, c_for(zeta), r * FN)
        expected = np.sqrt(1 + (2 * zeta * r) ** 2) / np.sqrt((1 - r**2) ** 2 + (2 * zeta * r) ** 2)
        assert_allclose(t, expected, rtol=1e-12)
        assert_allclose(t[2], 1.0, rtol=1e-12)


def test_base_excitation_phase():
    # Lag of the mass behind the base: atan2(m c w^3, k (k - m w^2) + (c w)^2) (Rao eq. 3.69).
    zeta, r = 0.1, 1.7
    c, w = c_for(zeta), r * WN
    lag = R.base_excitation_response(M, K, c, 1e-3, [r * FN]).phase_lag
    assert_allclose(lag, math.atan2(M * c * w**3, K * (K - M * w**2) + (c * w) ** 2), rtol=1e-12)


def test_velocity_and_acceleration():
    # v = w x, a = w^2 x for a sinusoid (ISO 2041 definitions); 1 pk = 2 pk-pk / 2 = sqrt(2) RMS.
    x = R.harmonic_response(M, K, c_for(0.05), 1000.0, [10.0, 50.0]).amplitude
    assert_allclose(R.velocity_amplitude(x, [10.0, 50.0]), 2 * np.pi * np.array([10.0, 50.0]) * x, rtol=1e-15)
    assert_allclose(R.acceleration_amplitude(x, [10.0, 50.0]), (2 * np.pi * np.array([10.0, 50.0])) ** 2 * x)
    assert_allclose(R.convert_amplitude([1.0], "rms", "peak-to-peak"), [2 * math.sqrt(2)], rtol=1e-15)
    with pytest.raises(R.InputValueError, match=r"to_convention: got 'pp'"):
        R.convert_amplitude([1.0], "peak", "pp")  # type: ignore[arg-type]


@given(
    zeta=st.floats(1e-3, 3.0),
    r=st.lists(st.floats(0.0, 10.0), min_size=1, max_size=20),
)
def test_phase_in_range_and_amplitude_below_peak(zeta, r):
    # Properties: lag in [0, pi]; amplitude never above the resonant peak
    # F0 / (2 k zeta sqrt(1 - zeta^2)) for zeta < 1/sqrt(2), else F0 / k (Rao sec. 3.4).
    f = np.asarray(r) * FN
    amplitude, lag = R.harmonic_response(M, K, c_for(zeta), 1.0, f)
    assert np.all((lag >= 0.0) & (lag <= math.pi))
    bound = 1 / (2 * K * zeta * math.sqrt(1 - zeta**2)) if zeta < 1 / math.sqrt(2) else 1 / K
    assert np.all(amplitude <= bound * (1 + 1e-12))


@pytest.mark.parametrize(
    ("args", "message"),
    [
        ((0.0, K, 1.0, 1.0, [1.0]), r"mass: got 0 kg; expected a value > 0"),
        ((M, -K, 1.0, 1.0, [1.0]), r"stiffness: got -4e\+07 N/m; expected a value > 0"),
        ((M, K, -1.0, 1.0, [1.0]), r"damping: got -1 N\*s/m; expected a value >= 0"),
        ((M, K, 1.0, 1.0, [-5.0]), r"frequency: got -5 Hz; expected a value >= 0"),
        ((M, K, 1.0, math.nan, [1.0]), r"force: got nan N; expected a finite number"),
        ((M, K, 1.0, 1.0, [1.0, math.inf]), r"frequency: got inf Hz; expected a finite number"),
    ],
)
def test_bad_input(args, message):
    with pytest.raises(R.InputValueError, match=message):
        R.harmonic_response(*args)
