"""Excitation sources: orders of running speed, fixed frequencies and unbalance.

An :class:`Excitation` is either an order of the running speed (1x unbalance,
2x misalignment, blade or vane pass, gear mesh; frequency ``n N / 60`` Hz at
``N`` rpm) or a fixed frequency independent of speed (twice line frequency in
motors, a neighbouring machine). Unbalance amounts follow ISO 21940-11 balance
grades and the API rotor standards' design unbalance.

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
from dataclasses import dataclass
from typing import Literal

import numpy as np

from .errors import InputValueError
from .inputs import as_si, as_si_array

__all__ = [
    "Excitation",
    "api_design_unbalance",
    "blade_pass",
    "fixed_frequency",
    "gear_mesh",
    "permissible_unbalance",
    "running_speed_order",
    "twice_line_frequency",
    "unbalance_force",
]


@dataclass(frozen=True)
class Excitation:
    """An excitation: an order of running speed or a fixed frequency.

    Attributes
    ----------
    label : str
        Name shown in tables (for example ``"1x"``, ``"vane pass (7x)"``).
    order : float or None
        Multiple of the running speed [-], for speed-dependent sources.
    frequency : float or None
        Fixed frequency [Hz], for speed-independent sources.
    """

    label: str
    order: float | None = None
    frequency: float | None = None

    def __post_init__(self) -> None:
        if (self.order is None) == (self.frequency is None):
            raise InputValueError(f"excitation {self.label!r}: give exactly one of order or frequency")
        value = self.order if self.order is not None else self.frequency
        if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
            what = "order" if self.order is not None else "frequency"
            raise InputValueError(f"excitation {self.label!r}: {what} {value!r}; expected a finite number > 0")

    @property
    def kind(self) -> Literal["order", "fixed"]:
        """``"order"`` for speed-dependent sources, ``"fixed"`` otherwise."""
        return "order" if self.order is not None else "fixed"

    def frequency_at(self, speed: object) -> np.ndarray:
        """Excitation frequency [Hz] at running speeds [rpm]."""
        n = as_si_array(speed, "speed", "speed", "nonnegative")
        if self.order is not None:
            return self.order * n / 60.0
        assert self.frequency is not None  # exactly one of order, frequency is set
        return np.full(n.shape, self.frequency)

    def coincidence_speed(self, natural_frequency: float) -> float | None:
        """Running speed [rpm] at which this order excites ``natural_frequency`` [Hz].

        None for a fixed-frequency source, which does not depend on speed.
        """
        if self.order is None:
            return None
        return 60.0 * natural_frequency / self.order


def _count(value: object, name: str) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise InputValueError(f"{name}: got {value!r}; expected a whole number >= 1")
    return int(value)


def running_speed_order(order: float, label: str | None = None) -> Excitation:
    """An order of running speed (1x unbalance, 2x misalignment, 0.45x whirl...).

    Examples
    --------
    >>> running_speed_order(2).frequency_at(1800.0)
    array([60.])
    """
    order = as_si(order, "order", "ratio", "positive")
    return Excitation(label if label is not None else f"{order:g}x", order=order)


def blade_pass(blades: int, label: str | None = None) -> Excitation:
    """Blade or vane pass: ``blades`` x running speed."""
    z = _count(blades, "blades")
    return Excitation(label if label is not None else f"blade pass ({z}x)", order=float(z))


def gear_mesh(teeth: int, label: str | None = None) -> Excitation:
    """Gear mesh: ``teeth`` x the speed of the shaft that carries the gear."""
    z = _count(teeth, "teeth")
    return Excitation(label if label is not None else f"gear mesh ({z}x)", order=float(z))


def fixed_frequency(frequency: object, label: str) -> Excitation:
    """A source at a fixed frequency [Hz], independent of the running speed."""
    f = as_si(frequency, "frequency", "frequency", "positive")
    return Excitation(label, frequency=f)


def twice_line_frequency(line_frequency: object = 50.0) -> Excitation:
    """Twice line frequency, the electromagnetic excitation of AC motors.

    Parameters
    ----------
    line_frequency : float or pint.Quantity
        Supply frequency [Hz]; 50 or 60 in practice.

    Examples
    --------
    >>> twice_line_frequency(60.0).frequency
    120.0
    """
    f = as_si(line_frequency, "line_frequency", "frequency", "positive")
    return Excitation(f"2x line ({2.0 * f:g} Hz)", frequency=2.0 * f)


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
    """
    u = as_si(unbalance, "unbalance", "unbalance", "nonnegative")
    w = 2.0 * math.pi * as_si_array(speed, "speed", "speed", "nonnegative") / 60.0
    return u * w**2
