"""Unbalance: the permissible residual unbalance of a balance grade, the API design unbalance, the force.

References
----------
.. [1] ISO 21940-11:2016, *Mechanical vibration - Rotor balancing - Part 11:
   Procedures and tolerances for rotors with rigid behaviour* (formerly
   ISO 1940-1), sec. 6.
.. [2] API Std 617, *Axial and Centrifugal Compressors and Expander-compressors*,
   8th ed., 2014, and API RP 684, 2nd ed., 2005 (design unbalance; from memory).
"""

from __future__ import annotations

import math

import numpy as np

from ..core.inputs import as_si, as_si_array

__all__ = [
    "api_design_unbalance",
    "permissible_unbalance",
    "unbalance_force",
]


def permissible_unbalance(grade: object, rotor_mass: object, speed: object) -> float:
    """Permissible residual unbalance for a balance grade, ``U = G m / W``.

    Parameters
    ----------
    grade : float or pint.Quantity
        Balance grade G [mm/s] (G2.5 is 2.5), > 0.
    rotor_mass : float or pint.Quantity
        Rotor mass [kg], > 0.
    speed : float or pint.Quantity
        Maximum service speed [rpm], > 0.

    Returns
    -------
    float
        Permissible residual unbalance [kg m] for the whole rotor.

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not finite and > 0, or of the wrong kind.

    Notes
    -----
    ``U_per = G m / W`` with ``W`` the angular speed [rad/s]; in shop units
    ``U_per [g mm] = 9549 G [mm/s] m [kg] / n [rpm]``.

    References
    ----------
    ISO 21940-11:2016, eq. (2).

    Examples
    --------
    >>> round(permissible_unbalance(6.3, 100.0, 3000.0) * 1e6, 1)  # g mm
    2005.4
    """
    g = as_si(grade, "grade", "balance_grade", "positive") * 1e-3  # mm/s -> m/s
    m = as_si(rotor_mass, "rotor_mass", "mass", "positive")
    omega = 2.0 * math.pi * as_si(speed, "speed", "speed", "positive") / 60.0
    return g * m / omega


def api_design_unbalance(journal_mass: object, speed: object) -> float:
    """Design unbalance of the API rotor standards, ``U = 6350 W / N`` g mm.

    Parameters
    ----------
    journal_mass : float or pint.Quantity
        Static load on the journal nearest the unbalance, as a mass [kg].
    speed : float or pint.Quantity
        Maximum continuous speed [rpm].

    Returns
    -------
    float
        Unbalance [kg m] (``4 W / N`` oz in with W in lbm).

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not finite and > 0, or of the wrong kind.

    References
    ----------
    API Std 617, 8th ed., 2014, and API RP 684, 2nd ed., 2005 (from memory).
    """
    w = as_si(journal_mass, "journal_mass", "mass", "positive")
    n = as_si(speed, "speed", "speed", "positive")
    return 6350.0 * w / n * 1e-6  # g mm -> kg m


def unbalance_force(unbalance: object, speed: object) -> np.ndarray:
    """Rotating force of an unbalance at speed, ``F = U w^2`` [N].

    Parameters
    ----------
    unbalance : float or pint.Quantity
        [kg m].
    speed : array_like or pint.Quantity
        Running speeds [rpm].

    Returns
    -------
    numpy.ndarray
        Force amplitude [N] at each speed.

    Raises
    ------
    InputValueError, InputTypeError
        A negative or non-finite value, or a quantity of the wrong kind.
    """
    u = as_si(unbalance, "unbalance", "unbalance", "nonnegative")
    w = 2.0 * math.pi * as_si_array(speed, "speed", "speed", "nonnegative") / 60.0
    return u * w**2
