"""Single degree of freedom: natural frequencies, damping and steady-state response.

A mass ``m`` on a spring ``k`` with a viscous damper ``c``. All response
functions are vectorized over the frequency axis and return arrays of the same
length as ``frequency``. Plain numbers follow the package convention (SI base
units, frequencies in Hz); pint quantities of :data:`resonance.ureg` are
accepted everywhere. Amplitudes are 0-peak unless a name says otherwise.

References
----------
.. [1] S. S. Rao, *Mechanical Vibrations*, 6th ed., Pearson, 2017, ch. 2-3.
.. [2] D. J. Inman, *Engineering Vibration*, 4th ed., Pearson, 2014, ch. 1-2.
"""

from __future__ import annotations

import math
from typing import NamedTuple

import numpy as np

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array

__all__ = [
    "SteadyState",
    "base_excitation_response",
    "damped_natural_frequency",
    "damping_coefficient",
    "damping_ratio",
    "harmonic_response",
    "natural_frequency",
    "peak_frequency",
    "sdof_receptance",
    "transmissibility",
    "unbalance_response",
]

TWO_PI = 2.0 * math.pi


class SteadyState(NamedTuple):
    """Steady-state harmonic response; a named tuple ``(amplitude, phase_lag)`` (unpacks, indexes, has a length).

    Attributes
    ----------
    amplitude : numpy.ndarray
        Response amplitude, 0-peak [m] (or [-] for ratios).
    phase_lag : numpy.ndarray
        Lag of the response behind the excitation [rad], within [0, pi].
    """

    amplitude: np.ndarray
    phase_lag: np.ndarray


def _mkc(mass: object, stiffness: object, damping: object) -> tuple[float, float, float]:
    m = as_si(mass, "mass", "mass", "positive")
    k = as_si(stiffness, "stiffness", "stiffness", "positive")
    c = as_si(damping, "damping", "damping", "nonnegative")
    return m, k, c


def natural_frequency(mass: object, stiffness: object) -> float:
    """Undamped natural frequency ``fn = sqrt(k / m) / (2 pi)``.

    Parameters
    ----------
    mass : float or pint.Quantity
        Modal mass [kg] (> 0).
    stiffness : float or pint.Quantity
        Stiffness [N/m] (> 0).

    Returns
    -------
    float
        Natural frequency [Hz].

    Raises
    ------
    InputValueError, InputTypeError
        A mass or stiffness that is not finite and > 0, or of the wrong kind.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 2.2.

    Examples
    --------
    >>> round(natural_frequency(1000.0, 4.0e7), 3)
    31.831
    """
    m = as_si(mass, "mass", "mass", "positive")
    k = as_si(stiffness, "stiffness", "stiffness", "positive")
    return math.sqrt(k / m) / TWO_PI


def damping_ratio(mass: object, stiffness: object, damping: object) -> float:
    """Damping ratio ``zeta = c / (2 sqrt(k m))``.

    Parameters
    ----------
    mass, stiffness, damping : float or pint.Quantity
        [kg] (> 0), [N/m] (> 0), viscous coefficient [N s/m] (>= 0).

    Returns
    -------
    float
        Damping ratio [-].

    Raises
    ------
    InputValueError, InputTypeError
        A non-positive mass or stiffness, a negative damping, a quantity of the wrong kind.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 2.6.
    """
    m, k, c = _mkc(mass, stiffness, damping)
    return c / (2.0 * math.sqrt(k * m))


def damping_coefficient(mass: object, stiffness: object, damping_ratio: object) -> float:
    """Viscous coefficient from a damping ratio, ``c = 2 zeta sqrt(k m)``.

    The inverse of :func:`damping_ratio`.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping_ratio : float
        [-] (>= 0).

    Returns
    -------
    float
        Viscous damping coefficient [N s/m].

    Raises
    ------
    InputValueError, InputTypeError
        A non-positive mass or stiffness, a negative damping ratio, a quantity of the wrong kind.
    """
    m = as_si(mass, "mass", "mass", "positive")
    k = as_si(stiffness, "stiffness", "stiffness", "positive")
    zeta = as_si(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    return 2.0 * zeta * math.sqrt(k * m)


def damped_natural_frequency(mass: object, stiffness: object, damping: object) -> float:
    """Damped natural frequency ``fd = fn sqrt(1 - zeta^2)``.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping : float or pint.Quantity
        Viscous damping [N s/m] (>= 0).

    Returns
    -------
    float
        ``f_d = f_n sqrt(1 - zeta^2)`` [Hz].

    Raises
    ------
    InputValueError
        If the system is critically damped or overdamped (``zeta >= 1``): it
        does not oscillate freely.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, eq. 2.72.
    """
    zeta = damping_ratio(mass, stiffness, damping)
    if zeta >= 1.0:
        raise InputValueError(
            f"damping: gives a damping ratio of {zeta:.4g}; a damped natural "
            "frequency exists only below critical damping (ratio < 1)"
        )
    return natural_frequency(mass, stiffness) * math.sqrt(1.0 - zeta**2)


def peak_frequency(mass: object, stiffness: object, damping: object) -> float:
    """Frequency of the displacement peak under a constant harmonic force.

    ``f_peak = fn sqrt(1 - 2 zeta^2)``.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping : float or pint.Quantity
        Viscous damping [N s/m] (>= 0).

    Returns
    -------
    float
        Frequency of the displacement peak under a constant force, ``f_n sqrt(1 - 2 zeta^2)`` [Hz].

    Raises
    ------
    InputValueError
        If ``zeta >= 1 / sqrt(2)``: the displacement then has no peak.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 3.4.
    """
    zeta = damping_ratio(mass, stiffness, damping)
    if zeta >= 1.0 / math.sqrt(2.0):
        raise InputValueError(
            f"damping: gives a damping ratio of {zeta:.4g}; the displacement "
            "response has a peak only for ratios below 1/sqrt(2) = 0.7071"
        )
    return natural_frequency(mass, stiffness) * math.sqrt(1.0 - 2.0 * zeta**2)


def sdof_receptance(mass: object, stiffness: object, damping: object, frequency: object) -> np.ndarray:
    """Complex receptance ``H = 1 / (k - m w^2 + i c w)``.

    Convention: force ``F e^{i w t}``, response ``x = H F e^{i w t}``; the phase
    lag of the response is ``-angle(H)``.

    Parameters
    ----------
    mass, stiffness, damping : float or pint.Quantity
        [kg], [N/m], [N s/m].
    frequency : array_like or pint.Quantity
        Excitation frequencies [Hz] (>= 0).

    Returns
    -------
    numpy.ndarray of complex
        Receptance [m/N], one value per frequency.

    Raises
    ------
    InputValueError, InputTypeError
        Bad mass, stiffness, damping or frequencies (see :func:`harmonic_response`).
    """
    m, k, c = _mkc(mass, stiffness, damping)
    w = TWO_PI * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    return 1.0 / (k - m * w**2 + 1j * c * w)


def harmonic_response(
    mass: object, stiffness: object, damping: object, force: object, frequency: object
) -> SteadyState:
    """Steady-state amplitude and phase lag under a harmonic force ``F0 cos(w t)``.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping : float or pint.Quantity
        Viscous coefficient c [N s/m] (>= 0).
    force : float or pint.Quantity
        Force amplitude F0, 0-peak [N] (>= 0).
    frequency : array_like or pint.Quantity
        Excitation frequencies [Hz] (>= 0).

    Returns
    -------
    SteadyState
        ``amplitude`` 0-peak [m] and ``phase_lag`` [rad] in [0, pi].

    Raises
    ------
    InputValueError, InputTypeError
        A non-positive mass or stiffness, negative damping or frequencies, non-finite values, a quantity
        of the wrong kind.

    Notes
    -----
    ``X = F0 / sqrt((k - m w^2)^2 + (c w)^2)``, ``phi = atan2(c w, k - m w^2)``.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, eqs. 3.25-3.26.

    Examples
    --------
    >>> x, lag = harmonic_response(1.0, 1.0e4, 20.0, 100.0, [0.0])
    >>> float(x[0]), float(lag[0])
    (0.01, 0.0)
    """
    f0 = as_si(force, "force", "force", "nonnegative")
    h = sdof_receptance(mass, stiffness, damping, frequency)
    return _phase_lag_result(h, f0)


def _phase_lag_result(h: np.ndarray, scale: np.ndarray | float) -> SteadyState:
    lag = np.arctan2(-h.imag, h.real)  # = atan2(c w, k - m w^2) for an SDOF
    return SteadyState(np.abs(h) * scale, np.clip(lag, 0.0, np.pi) + 0.0)  # + 0.0 drops -0.0


def unbalance_response(
    mass: object, stiffness: object, damping: object, unbalance: object, frequency: object
) -> SteadyState:
    """Steady-state response to a rotating unbalance, force ``U w^2``.

    Parameters
    ----------
    mass, stiffness, damping : float or pint.Quantity
        [kg], [N/m], [N s/m]; ``mass`` is the whole vibrating mass.
    unbalance : float or pint.Quantity
        Unbalance ``U = m_u e`` [kg m] (>= 0).
    frequency : array_like or pint.Quantity
        Rotation frequencies [Hz] (1x; a speed in rpm as a quantity works).

    Returns
    -------
    SteadyState
        ``amplitude`` 0-peak [m], tending to ``U / m`` well above resonance,
        and ``phase_lag`` [rad] behind the unbalance force, in [0, pi].

    Raises
    ------
    InputValueError, InputTypeError
        As :func:`harmonic_response`, or a negative unbalance.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 3.7.
    """
    u = as_si(unbalance, "unbalance", "unbalance", "nonnegative")
    h = sdof_receptance(mass, stiffness, damping, frequency)
    w = TWO_PI * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    return _phase_lag_result(h, u * w**2)


def base_excitation_response(
    mass: object, stiffness: object, damping: object, base_amplitude: object, frequency: object
) -> SteadyState:
    """Absolute motion of the mass when its base moves ``Y cos(w t)``.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping : float or pint.Quantity
        Viscous damping [N s/m] (>= 0).
    base_amplitude : float or pint.Quantity
        Amplitude of the base motion [m].
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0).

    Returns
    -------
    SteadyState
        ``amplitude`` 0-peak [m] (``Y`` times the motion transmissibility) and
        ``phase_lag`` [rad] of the mass behind the base motion, in [0, pi].

    Raises
    ------
    InputValueError, InputTypeError
        As :func:`harmonic_response`.

    Notes
    -----
    ``X / Y = sqrt(k^2 + (c w)^2) / sqrt((k - m w^2)^2 + (c w)^2)``, lag
    ``atan2(m c w^3, k (k - m w^2) + (c w)^2)``.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, eqs. 3.68-3.69.
    """
    m, k, c = _mkc(mass, stiffness, damping)
    y = as_si(base_amplitude, "base_amplitude", "displacement", "nonnegative")
    w = TWO_PI * as_si_array(frequency, "frequency", "frequency", "nonnegative")
    ratio = (k + 1j * c * w) / (k - m * w**2 + 1j * c * w)
    return _phase_lag_result(ratio, y)


def transmissibility(mass: object, stiffness: object, damping: object, frequency: object) -> np.ndarray:
    """Force (and motion) transmissibility of a spring-damper mount.

    The ratio of the force passed to the ground to the applied force, which
    equals the ratio of mass to base motion:
    ``T = sqrt(1 + (2 zeta r)^2) / sqrt((1 - r^2)^2 + (2 zeta r)^2)``,
    ``r = f / fn``.

    Parameters
    ----------
    mass : float or pint.Quantity
        [kg] (> 0).
    stiffness : float or pint.Quantity
        [N/m] (> 0).
    damping : float or pint.Quantity
        Viscous damping [N s/m] (>= 0).
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0).

    Returns
    -------
    numpy.ndarray
        Transmissibility [-], one value per frequency; below 1 only above
        ``r = sqrt(2)``.

    Raises
    ------
    InputValueError, InputTypeError
        As :func:`harmonic_response`.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, eqs. 3.68 and 3.74.
    """
    return base_excitation_response(mass, stiffness, damping, 1.0, frequency).amplitude
