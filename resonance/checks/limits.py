"""Vibration acceptance limits: ISO casing velocity zones and the API shaft limit.

References
----------
.. [1] ISO 10816-3:2009, *Mechanical vibration - Evaluation of machine
   vibration by measurements on non-rotating parts - Part 3: Industrial
   machines with nominal power above 15 kW*, Table A.1 (now ISO 20816-3:2022;
   values from memory).
.. [2] API Std 617, 8th ed., 2014, unbalance response verification (shaft
   vibration limit; from memory).
"""

from __future__ import annotations

import math
from typing import Literal

import numpy as np

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array

__all__ = [
    "MachineGroup",
    "SupportClass",
    "RIGID_SUPPORT_RATIO",
    "api_shaft_vibration_limit",
    "iso_velocity_zone",
    "iso_velocity_zone_limits",
    "support_class",
    "zone_criterion",
]

#: A support is rigid when its lowest natural frequency is at least this multiple of the main
#: excitation frequency (ISO 10816-3:2009 sec. 3.3, 25 % above; from memory).
RIGID_SUPPORT_RATIO = 1.25

MachineGroup = Literal[1, 2]
SupportClass = Literal["rigid", "flexible"]

# Zone boundaries A/B, B/C, C/D in mm/s RMS (ISO 10816-3 Table A.1, from memory).
_ZONES_MM_S: dict[tuple[int, str], tuple[float, float, float]] = {
    (1, "rigid"): (2.3, 4.5, 7.1),
    (1, "flexible"): (3.5, 7.1, 11.0),
    (2, "rigid"): (1.4, 2.8, 4.5),
    (2, "flexible"): (2.3, 4.5, 7.1),
}


def iso_velocity_zone_limits(group: MachineGroup, support: SupportClass) -> tuple[float, float, float]:
    """Zone boundaries A/B, B/C and C/D of broadband casing velocity [m/s RMS].

    Parameters
    ----------
    group : {1, 2}
        1: large machines (300 kW to 50 MW); 2: medium machines (15 to 300 kW).
    support : {"rigid", "flexible"}
        Support class of the machine on its foundation.

    Returns
    -------
    tuple of float
        The three boundaries [m/s], RMS.

    Raises
    ------
    InputValueError
        A group other than 1 or 2, or a support other than rigid or flexible.

    References
    ----------
    ISO 10816-3:2009, Table A.1 (from memory).
    """
    key = (group, support)
    if key not in _ZONES_MM_S:
        raise InputValueError(
            f"group/support: got ({group!r}, {support!r}); expected group 1 or 2 and support 'rigid' or 'flexible'"
        )
    return tuple(v * 1e-3 for v in _ZONES_MM_S[key])  # type: ignore[return-value]


def zone_criterion(
    velocity_rms: float, speed: float, where: str, group: MachineGroup, support: SupportClass
) -> tuple[str, bool]:
    """The predicted vibration against the long-term limit (ISO zone B/C boundary), in words and as a pass.

    The criterion a heavily damped support mode is judged by (:class:`~resonance.checks.rules.DampedModeRule`):
    zones A and B allow unrestricted long-term operation (ISO 10816-3 sec. 5.3.1, from memory).

    Parameters
    ----------
    velocity_rms : float
        The largest predicted velocity over the speeds of continuous operation [m/s RMS].
    speed : float
        Where it occurs [rpm].
    where : str
        The point it is read at, in words.
    group : {1, 2}
        ISO machine group.
    support : {"rigid", "flexible"}
        The support class whose boundaries are used.

    Returns
    -------
    text : str
        The criterion with its values (mm/s RMS, the ISO unit).
    passed : bool
        True in zone A or B.

    Raises
    ------
    InputValueError
        A bad group, support or velocity.

    Examples
    --------
    >>> zone_criterion(1.9e-3, 1480.0, "'fan DE bearing'", 2, "rigid")[1]
    True
    """
    limit = iso_velocity_zone_limits(group, support)[1]
    zone = iso_velocity_zone(velocity_rms, group, support)[0]
    passed = zone in ("A", "B")
    return (
        f"predicted 1x {velocity_rms * 1e3:.3g} mm/s RMS at {speed:.0f} rpm at {where} "
        f"{'within' if passed else 'ABOVE'} the ISO 10816-3 B/C boundary {limit * 1e3:.3g} mm/s (group {group}, "
        f"{support} support; an estimate): zone {zone}",
        passed,
    )


def iso_velocity_zone(velocity_rms: object, group: MachineGroup, support: SupportClass) -> list[str]:
    """ISO evaluation zone (A, B, C, D) of casing velocities, RMS.

    Parameters
    ----------
    velocity_rms : array_like or pint.Quantity
        Broadband casing velocity, RMS [m/s] (>= 0).
    group, support
        See :func:`iso_velocity_zone_limits`.

    Returns
    -------
    list of str
        ``"A"`` (new machines), ``"B"`` (unrestricted long-term operation),
        ``"C"`` (restricted), ``"D"`` (damage possible), one per value.

    Raises
    ------
    InputValueError, InputTypeError
        A negative or non-finite velocity, or a bad group or support.
    """
    v = as_si_array(velocity_rms, "velocity_rms", "velocity", "nonnegative")
    limits = np.asarray(iso_velocity_zone_limits(group, support))
    return ["ABCD"[int(i)] for i in np.searchsorted(limits, v, side="right")]


def support_class(lowest_natural_frequency: object, running_speed: object) -> SupportClass:
    """Support class for the ISO vibration zones, from the model's own lowest mode.

    Parameters
    ----------
    lowest_natural_frequency : float or pint.Quantity
        Lowest natural frequency of the machine on its support in the direction
        considered [Hz] (> 0).
    running_speed : float or pint.Quantity
        The highest running speed of continuous operation [rpm] (> 0): the main
        excitation is 1x, and over a speed range the support must stay rigid
        up to its top.

    Returns
    -------
    {"rigid", "flexible"}
        ``"rigid"`` when ``f_1 >= 1.25 N / 60``, ``"flexible"`` otherwise.

    Raises
    ------
    InputValueError, InputTypeError
        A value that is not finite and > 0, or of the wrong kind.

    References
    ----------
    ISO 10816-3:2009, sec. 3.3 (support flexibility; now ISO 20816-3; from memory).

    Examples
    --------
    >>> support_class(39.7, 1800.0), support_class(19.0, 3000.0)
    ('rigid', 'flexible')
    """
    f1 = as_si(lowest_natural_frequency, "lowest_natural_frequency", "frequency", "positive")
    n = as_si(running_speed, "running_speed", "speed", "positive")
    return "rigid" if f1 >= RIGID_SUPPORT_RATIO * n / 60.0 else "flexible"


def api_shaft_vibration_limit(speed: object) -> float:
    """Allowable shaft vibration of the API unbalance response test.

    ``L = 25.4 sqrt(12000 / N)`` um pk-pk, and not above 25.4 um.

    Parameters
    ----------
    speed : float or pint.Quantity
        Maximum continuous speed [rpm] (> 0).

    Returns
    -------
    float
        Limit [m], peak-to-peak.

    Raises
    ------
    InputValueError, InputTypeError
        A speed that is not finite and > 0.

    References
    ----------
    API Std 617, 8th ed., 2014 (from memory).

    Examples
    --------
    >>> round(api_shaft_vibration_limit(12000.0) * 1e6, 3)
    25.4
    """
    n = as_si(speed, "speed", "speed", "positive")
    return min(25.4, 25.4 * math.sqrt(12000.0 / n)) * 1e-6
