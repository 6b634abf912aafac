"""Amplitude conventions and derivatives of a harmonic (sinusoidal) motion.

For a sinusoid of 0-peak amplitude ``A``: peak-to-peak is ``2 A`` and RMS is
``A / sqrt(2)``; velocity is ``w A`` and acceleration ``w^2 A``. The trade
reports shaft displacement pk-pk, casing velocity RMS (ISO) or peak (US) and
acceleration peak, so every amplitude here states its convention.

References
----------
ISO 2041:2018, *Mechanical vibration, shock and condition monitoring -
Vocabulary* (peak, peak-to-peak, RMS).
"""

from __future__ import annotations

import math
from typing import Literal

import numpy as np
import pint

from ..core.errors import InputTypeError, InputValueError
from ..core.inputs import as_si_array

__all__ = ["AmplitudeConvention", "acceleration_amplitude", "convert_amplitude", "velocity_amplitude"]

AmplitudeConvention = Literal["peak", "peak-to-peak", "rms"]

# Factor from 0-peak to each convention, for a pure sinusoid.
_FROM_PEAK: dict[str, float] = {"peak": 1.0, "peak-to-peak": 2.0, "rms": 1.0 / math.sqrt(2.0)}


def _factor(convention: str, name: str) -> float:
    if convention not in _FROM_PEAK:
        raise InputValueError(f"{name}: got {convention!r}; expected one of 'peak', 'peak-to-peak', 'rms'")
    return _FROM_PEAK[convention]


def convert_amplitude(
    amplitude: object, from_convention: AmplitudeConvention, to_convention: AmplitudeConvention
) -> np.ndarray:
    """Convert a sinusoid's amplitude between peak, peak-to-peak and RMS.

    Parameters
    ----------
    amplitude : array_like
        Amplitudes in any one unit (plain numbers; the unit is kept).
    from_convention, to_convention : {"peak", "peak-to-peak", "rms"}
        The convention of ``amplitude`` and of the result.

    Returns
    -------
    numpy.ndarray
        The amplitudes in ``to_convention``, same unit.

    Raises
    ------
    InputValueError, InputTypeError
        An unknown convention, a negative or non-finite amplitude, or a pint quantity.

    Examples
    --------
    >>> convert_amplitude([1.0], "peak", "peak-to-peak")
    array([2.])
    """
    if isinstance(amplitude, pint.Quantity):
        raise InputTypeError(
            "amplitude: got a pint quantity; pass its magnitude (the unit is unchanged by the conversion)"
        )
    values = as_si_array(amplitude, "amplitude", "ratio", "nonnegative")
    scale = _factor(to_convention, "to_convention") / _factor(from_convention, "from_convention")
    return values * scale


def velocity_amplitude(displacement: object, frequency: object) -> np.ndarray:
    """Velocity amplitude ``w X`` of a harmonic displacement ``X`` [m] at [Hz].

    The convention (peak, pk-pk, RMS) of the result is that of the input.

    Parameters
    ----------
    displacement : array_like or pint.Quantity
        Displacement amplitude(s) [m] (>= 0).
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0), one per amplitude or one for all.

    Returns
    -------
    numpy.ndarray
        Velocity amplitude [m/s].

    Raises
    ------
    InputValueError, InputTypeError
        Negative or non-finite values, or quantities of the wrong kind.
    """
    x = as_si_array(displacement, "displacement", "displacement", "nonnegative")
    f = as_si_array(frequency, "frequency", "frequency", "nonnegative")
    return 2.0 * math.pi * f * x


def acceleration_amplitude(displacement: object, frequency: object) -> np.ndarray:
    """Acceleration amplitude ``w^2 X`` of a harmonic displacement ``X`` [m] at [Hz].

    Parameters
    ----------
    displacement : array_like or pint.Quantity
        Displacement amplitude(s) [m] (>= 0).
    frequency : array_like or pint.Quantity
        Frequencies [Hz] (>= 0), one per amplitude or one for all.

    Returns
    -------
    numpy.ndarray
        Acceleration amplitude [m/s^2], same convention as the input.

    Raises
    ------
    InputValueError, InputTypeError
        Negative or non-finite values, or quantities of the wrong kind.
    """
    x = as_si_array(displacement, "displacement", "displacement", "nonnegative")
    f = as_si_array(frequency, "frequency", "frequency", "nonnegative")
    return (2.0 * math.pi * f) ** 2 * x
