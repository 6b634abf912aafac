"""Electrical excitation sources: line frequency, a motor's electrical frequencies and its slip.

A motor on the line excites at fixed multiples of the line frequency; a motor on a variable-frequency drive at
multiples of its electrical frequency, which follows the speed through the pole count and the slip. The slip
is constant or follows the load (``"constant torque"``, ``"quadratic torque"``).

References
----------
.. [1] A. E. Fitzgerald, C. Kingsley and S. D. Umans, *Electric Machinery*,
   6th ed., 2003, ch. 4 and 6 (synchronous speed ``n_s = 120 f / p``, slip
   ``s = (n_s - n) / n_s``).
"""

from __future__ import annotations

from typing import Literal

import numpy as np

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array
from .excitations import Excitation

__all__ = [
    "SLIP_LOADS",
    "SlipLoad",
    "drive_electrical",
    "drive_electrical_law",
    "induction_slip",
    "electrical_order",
    "line_frequency",
    "twice_line_frequency",
]


def line_frequency(supply_frequency: object = 50.0, multiple: float = 1.0) -> Excitation:
    """An electrical excitation of a motor on the line: a multiple of the supply frequency, fixed.

    Parameters
    ----------
    supply_frequency : float or pint.Quantity
        Line frequency [Hz]; 50 or 60 in practice.
    multiple : float
        Multiple of the line frequency [-] (2: twice line frequency, the
        electromagnetic pull of AC motors).

    Returns
    -------
    Excitation
        Kind ``"electrical"``, at the fixed frequency ``multiple x f_line``.

    Raises
    ------
    InputValueError, InputTypeError
        A supply frequency or multiple that is not finite and > 0.

    Examples
    --------
    >>> line_frequency(60.0, 2).frequency
    120.0
    >>> line_frequency(50.0, 2).label
    'twice line frequency (100 Hz)'
    """
    f = as_si(supply_frequency, "supply_frequency", "frequency", "positive")
    n = as_si(multiple, "multiple", "ratio", "positive")
    words = {1.0: "line frequency", 2.0: "twice line frequency"}.get(n, f"{n:g} x line frequency")
    return Excitation(f"{words} ({n * f:g} Hz)", frequency=n * f, kind="electrical")


def twice_line_frequency(supply_frequency: object = 50.0) -> Excitation:
    """Twice line frequency of a motor on the line (see :func:`line_frequency`).

    Parameters
    ----------
    supply_frequency : float or pint.Quantity
        Line frequency [Hz].

    Returns
    -------
    Excitation
        Kind ``"electrical"``, at ``2 f_line``.

    Raises
    ------
    InputValueError, InputTypeError
        A supply frequency that is not finite and > 0.

    Examples
    --------
    >>> twice_line_frequency(60.0).frequency
    120.0
    """
    return line_frequency(supply_frequency, 2.0)


def electrical_order(poles: int, slip: object = 0.0, multiple: float = 1.0) -> float:
    """The electrical frequency of a drive-fed motor as an order of its shaft speed [-].

    Parameters
    ----------
    poles : int
        Number of poles ``p`` (2, 4, 6...; even).
    slip : float
        Slip ``s = (n_s - n) / n_s`` [-] at the load considered, in [0, 1);
        0 for a synchronous motor.
    multiple : float
        Multiple of the electrical frequency [-] (1: ``f_e``, 2: twice
        electrical frequency, 6 and 12: six-pulse drive harmonics).

    Returns
    -------
    float
        ``multiple x p / (2 (1 - s))``: the frequency [Hz] is this order times
        the shaft speed [rpm] / 60.

    Raises
    ------
    InputValueError
        Poles not an even whole number >= 2, a slip outside [0, 1), a multiple not > 0.

    Notes
    -----
    The drive's output frequency is ``f_e = p n_s / 120`` with the
    synchronous speed ``n_s = n / (1 - s)``, so
    ``f_e = p n / (120 (1 - s))``: an order ``p / (2 (1 - s))`` of the shaft
    speed. The slip is taken constant over the range (its value at the
    load of interest); at light load it falls towards 0.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley and S. D. Umans, *Electric Machinery*, 6th
    ed., 2003, ch. 6 (induction machines: synchronous speed and slip).

    Examples
    --------
    >>> electrical_order(4)          # a 4-pole motor: f_e = 2 x shaft speed
    2.0
    >>> round(electrical_order(4, 0.013, 2) * 1480.0 / 60.0, 4)  # 2 f_e at 1480 rpm [Hz]
    99.9662
    """
    if isinstance(poles, bool) or not isinstance(poles, (int, np.integer)) or poles < 2 or poles % 2:
        raise InputValueError(f"poles: got {poles!r}; expected an even whole number >= 2")
    s = as_si(slip, "slip", "ratio", "nonnegative")
    if not s < 1.0:
        raise InputValueError(f"slip: got {s:g}; expected a fraction in [0, 1) (1.3 % slip is 0.013)")
    n = as_si(multiple, "multiple", "ratio", "positive")
    return n * int(poles) / (2.0 * (1.0 - s))


def drive_electrical(poles: int, slip: object = 0.0, multiple: float = 1.0, label: str | None = None) -> Excitation:
    """An electrical excitation of a drive-fed motor, following the speed (see :func:`electrical_order`).

    Parameters
    ----------
    poles : int
        Number of poles (even, >= 2).
    slip : float
        Slip at the load of interest [-], in [0, 1).
    multiple : float
        Multiple of the electrical frequency [-] (> 0).
    label : str, optional
        Name shown in tables.

    Returns
    -------
    Excitation
        Kind ``"electrical"``, an order of the shaft speed.

    Raises
    ------
    InputValueError
        As :func:`electrical_order`.

    Examples
    --------
    >>> e = drive_electrical(4, 0.0, 2)
    >>> e.label, e.frequency_at(1500.0)
    ('2 f_e (drive, 4 poles)', array([100.]))
    """
    order = electrical_order(poles, slip, multiple)
    n = as_si(multiple, "multiple", "ratio", "positive")
    s = as_si(slip, "slip", "ratio", "nonnegative")
    name = "f_e" if n == 1.0 else f"{n:g} f_e"
    detail = f"drive, {int(poles)} poles" + (f", slip {s:g}" if s else "")
    return Excitation(label if label is not None else f"{name} ({detail})", order=order, kind="electrical")


SlipLoad = Literal["constant torque", "quadratic torque"]


SLIP_LOADS: tuple[SlipLoad, ...] = ("constant torque", "quadratic torque")


def induction_slip(speed: object, rated_speed: object, rated_slip: object, load: SlipLoad) -> np.ndarray:
    """The slip of a drive-fed induction motor at each speed, from its slip at rated speed and the load's law.

    Parameters
    ----------
    speed : array_like or pint.Quantity
        Shaft speeds [rpm] (> 0).
    rated_speed : float or pint.Quantity
        The speed at which ``rated_slip`` holds [rpm] (> 0).
    rated_slip : float
        Slip there [-], in [0, 0.2).
    load : {"constant torque", "quadratic torque"}
        The load's torque against speed: constant (conveyors, reciprocating compressors), or growing with the
        square of the speed (fans, centrifugal pumps and compressors: the affinity laws).

    Returns
    -------
    numpy.ndarray
        ``s = D / (n + D)`` [-], ``D`` the slip speed ``n_s - n`` [rpm]: ``D_r`` for a constant torque,
        ``D_r (n / n_r)^2`` for a quadratic one, ``D_r = s_r n_r / (1 - s_r)``.

    Raises
    ------
    InputValueError, InputTypeError
        Speeds not > 0, a slip outside [0, 0.2), an unknown load.

    Notes
    -----
    On a drive that keeps the flux constant (V/f), the torque near synchronous speed is proportional to the
    slip speed, whatever the supply frequency; so the slip speed follows the load torque.

    References
    ----------
    A. E. Fitzgerald, C. Kingsley and S. D. Umans, *Electric Machinery*, 6th ed., 2003, ch. 6 and 11 (the
    linear torque-slip region; constant volts per hertz; from memory). The affinity laws for fans and pumps:
    common practice.

    Examples
    --------
    >>> s = induction_slip([750.0, 1500.0], 1500.0, 0.01, "quadratic torque")
    >>> [round(float(x), 5) for x in s]
    [0.00503, 0.01]
    """
    n = as_si_array(speed, "speed", "speed", "positive")
    n_r = as_si(rated_speed, "rated_speed", "speed", "positive")
    s_r = as_si(rated_slip, "rated_slip", "ratio", "nonnegative")
    if not s_r < 0.2:
        raise InputValueError(f"rated_slip: got {s_r:g}; expected a fraction below 0.2 (1.3 % slip is 0.013)")
    if load not in SLIP_LOADS:
        raise InputValueError(f"load: got {load!r}; expected one of {list(SLIP_LOADS)}")
    d_r = s_r * n_r / (1.0 - s_r)
    d = np.full(n.shape, d_r) if load == "constant torque" else d_r * (n / n_r) ** 2
    return d / (n + d)


def drive_electrical_law(
    poles: int, multiple: float, speed: object, slip: object, nominal_slip: float, label: str
) -> Excitation:
    """An electrical excitation of a drive-fed motor whose slip changes with speed (see :func:`induction_slip`).

    Parameters
    ----------
    poles : int
        Number of poles (even, >= 2).
    multiple : float
        Multiple of the electrical frequency [-] (> 0).
    speed : array_like
        Shaft speeds [rpm] (> 0, increasing) at which the slip is known.
    slip : array_like
        The slip at each [-], in [0, 1).
    nominal_slip : float
        The slip whose order is shown beside the label (at rated speed).
    label : str
        Name shown in tables.

    Returns
    -------
    Excitation
        Kind ``"electrical"`` with the ``law`` ``f = multiple p n / (120 (1 - s(n)))``.

    Raises
    ------
    InputValueError
        Poles, slips or speeds out of range, or a law whose frequency does not rise with the speed.

    Examples
    --------
    >>> e = drive_electrical_law(4, 2, [1000.0, 1500.0], [0.005, 0.01], 0.01, "2 f_e")
    >>> round(float(e.frequency_at(1500.0)[0]), 4), round(e.coincidence_speed(e.frequency_at(1000.0)[0]), 6)
    (101.0101, 1000.0)
    """
    n = as_si_array(speed, "speed", "speed", "positive")
    s = as_si_array(slip, "slip", "ratio", "nonnegative")
    if n.shape != s.shape or np.any(s >= 1.0):
        raise InputValueError("slip: expected one slip in [0, 1) per speed")
    order = electrical_order(poles, nominal_slip, multiple)
    m = as_si(multiple, "multiple", "ratio", "positive")
    frequency = m * int(poles) * n / (120.0 * (1.0 - s))
    return Excitation(
        label, order=order, kind="electrical", law=tuple(zip(n.tolist(), frequency.tolist(), strict=True))
    )
