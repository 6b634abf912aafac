"""Excitation sources: orders of running speed, electrical sources, fixed frequencies and unbalance.

An :class:`Excitation` is either an order of the running speed (1x unbalance,
2x misalignment, blade or vane pass, gear mesh; frequency ``n N / 60`` Hz at
``N`` rpm) or a fixed frequency independent of speed (a neighbouring machine).
Each has a kind, which decides the margin rule that applies to it
(:mod:`resonance.checks.rules`): ``"synchronous"`` (1x), ``"order"`` (any other order
of running speed), ``"electrical"`` (the motor's electrical frequencies: fixed
for a motor on the line, following the speed for a motor on a drive) and
``"fixed"``. Unbalance amounts follow ISO 21940-11 balance grades and the API
rotor standards' design unbalance.

References
----------
.. [1] ISO 21940-11:2016, *Mechanical vibration - Rotor balancing - Part 11:
   Procedures and tolerances for rotors with rigid behaviour* (formerly
   ISO 1940-1), sec. 6.
.. [2] API Std 617, *Axial and Centrifugal Compressors and Expander-compressors*,
   8th ed., 2014, and API RP 684, 2nd ed., 2005 (design unbalance; from memory).
.. [3] A. E. Fitzgerald, C. Kingsley and S. D. Umans, *Electric Machinery*,
   6th ed., 2003, ch. 4 and 6 (synchronous speed ``n_s = 120 f / p``, slip
   ``s = (n_s - n) / n_s``).
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array
from ..kinds.torsion.train import TorsionalTrain

__all__ = [
    "EXCITATION_KINDS",
    "Excitation",
    "ExcitationKind",
    "api_design_unbalance",
    "blade_pass",
    "SLIP_LOADS",
    "SlipLoad",
    "drive_electrical",
    "drive_electrical_law",
    "induction_slip",
    "electrical_order",
    "fixed_frequency",
    "gear_mesh",
    "line_frequency",
    "permissible_unbalance",
    "running_speed_order",
    "shaft_order",
    "twice_line_frequency",
    "unbalance_force",
]

ExcitationKind = Literal["synchronous", "order", "electrical", "fixed"]
EXCITATION_KINDS: tuple[ExcitationKind, ...] = ("synchronous", "order", "electrical", "fixed")


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
    kind : {"synchronous", "order", "electrical", "fixed"}, optional
        What the source is; it selects the margin rule. If omitted: order 1
        is ``"synchronous"``, any other order ``"order"``, a fixed frequency
        ``"fixed"``. ``"electrical"`` must be given (see :func:`line_frequency`,
        :func:`drive_electrical`).
    source : str, optional
        Where the excitation came from, in words, for the record (``"[[excitations]] entry 1"``,
        ``"[motor]: checked by default for a drive-fed motor"``); not part of its identity.
    law : tuple of (float, float), optional
        For a source whose frequency is not proportional to the speed (a drive-fed induction motor whose
        slip follows the load): ``(speed [rpm], frequency [Hz])`` points, both increasing, interpolated
        linearly and extended by the end slopes. ``order`` is then its order at the rated speed, for display.
    """

    label: str
    order: float | None = None
    frequency: float | None = None
    kind: ExcitationKind | None = None
    source: str = field(default="", compare=False)
    law: tuple[tuple[float, float], ...] = ()

    def __post_init__(self) -> None:
        if (self.order is None) == (self.frequency is None):
            raise InputValueError(f"excitation {self.label!r}: give exactly one of order or frequency")
        value = self.order if self.order is not None else self.frequency
        if not (isinstance(value, (int, float)) and math.isfinite(value) and value > 0):
            what = "order" if self.order is not None else "frequency"
            raise InputValueError(f"excitation {self.label!r}: {what} {value!r}; expected a finite number > 0")
        if self.kind is None:
            implied = "fixed" if self.order is None else ("synchronous" if self.order == 1.0 else "order")
            object.__setattr__(self, "kind", implied)
        elif self.kind not in EXCITATION_KINDS:
            raise InputValueError(f"excitation {self.label!r}: kind {self.kind!r}; expected one of {EXCITATION_KINDS}")
        elif self.kind == "synchronous" and self.order != 1.0:
            raise InputValueError(f"excitation {self.label!r}: kind 'synchronous' needs order 1; got {value!r}")
        elif self.kind in ("order", "synchronous") and self.order is None:
            raise InputValueError(f"excitation {self.label!r}: kind {self.kind!r} needs an order, not a frequency")
        elif self.kind == "fixed" and self.order is not None:
            raise InputValueError(f"excitation {self.label!r}: kind 'fixed' needs a frequency, not an order")
        if self.law:
            points = np.asarray(self.law, dtype=float)
            if (
                self.order is None
                or points.ndim != 2
                or points.shape[1] != 2
                or len(points) < 2
                or not np.all(np.isfinite(points))
                or not np.all(points > 0.0)
                or not (np.all(np.diff(points[:, 0]) > 0.0) and np.all(np.diff(points[:, 1]) > 0.0))
            ):
                raise InputValueError(
                    f"excitation {self.label!r}: law: expected two or more (speed, frequency) points > 0, both "
                    "increasing, beside a nominal order"
                )
            object.__setattr__(self, "law", tuple((float(a), float(b)) for a, b in points))

    @property
    def tracks_speed(self) -> bool:
        """True for sources whose frequency follows the running speed."""
        return self.order is not None

    def frequency_at(self, speed: object) -> np.ndarray:
        """Excitation frequency [Hz] at running speeds [rpm]."""
        n = as_si_array(speed, "speed", "speed", "nonnegative")
        if self.law:
            speeds, frequencies = np.array(self.law).T
            return _extended_interp(n, speeds, frequencies)
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
        return float(self.coincidence_speeds(np.array([natural_frequency]))[0])

    def coincidence_speeds(self, natural_frequency: np.ndarray) -> np.ndarray:
        """Running speeds [rpm] at which this speed-following source excites each frequency [Hz] (vectorized).

        Parameters
        ----------
        natural_frequency : numpy.ndarray
            Frequencies [Hz], any shape.

        Returns
        -------
        numpy.ndarray
            ``60 f / order``, or the speed at which the ``law`` reaches ``f``.

        Raises
        ------
        InputValueError
            A fixed-frequency source (it does not follow the speed).
        """
        if self.order is None:
            raise InputValueError(f"excitation {self.label!r}: a fixed frequency has no coincidence speed")
        f = np.asarray(natural_frequency, dtype=float)
        if self.law:
            speeds, frequencies = np.array(self.law).T
            return _extended_interp(f, frequencies, speeds)
        return 60.0 * f / self.order


def _extended_interp(x: np.ndarray, xp: np.ndarray, fp: np.ndarray) -> np.ndarray:
    # Linear interpolation, extended beyond the table by its end slopes (a law is tabulated over a wide span).
    y = np.interp(x, xp, fp)
    low = (fp[1] - fp[0]) / (xp[1] - xp[0])
    high = (fp[-1] - fp[-2]) / (xp[-1] - xp[-2])
    y = np.where(x < xp[0], fp[0] + (x - xp[0]) * low, y)
    return np.where(x > xp[-1], fp[-1] + (x - xp[-1]) * high, y)


def _count(value: object, name: str) -> int:
    if isinstance(value, bool) or not isinstance(value, (int, np.integer)) or value < 1:
        raise InputValueError(f"{name}: got {value!r}; expected a whole number >= 1")
    return int(value)


def running_speed_order(order: float, label: str | None = None) -> Excitation:
    """An order of running speed (1x unbalance, 2x misalignment, 0.45x whirl...).

    Parameters
    ----------
    order : float or pint.Quantity
        Multiple of the running speed [-] (> 0).
    label : str, optional
        Name shown in tables; ``"<order>x"`` if omitted.

    Returns
    -------
    Excitation
        Kind ``"synchronous"`` for order 1, ``"order"`` otherwise.

    Raises
    ------
    InputValueError, InputTypeError
        An order that is not a finite number > 0.

    Examples
    --------
    >>> running_speed_order(2).frequency_at(1800.0)
    array([60.])
    """
    order = as_si(order, "order", "ratio", "positive")
    return Excitation(label if label is not None else f"{order:g}x", order=order)


def blade_pass(blades: int, label: str | None = None) -> Excitation:
    """Blade or vane pass: ``blades`` x running speed.

    Parameters
    ----------
    blades : int
        Number of blades or vanes (>= 1).
    label : str, optional
        Name shown in tables.

    Returns
    -------
    Excitation
        The order ``blades`` [-], kind ``"order"``.

    Raises
    ------
    InputValueError
        A count that is not a whole number >= 1.
    """
    z = _count(blades, "blades")
    return Excitation(label if label is not None else f"blade pass ({z}x)", order=float(z))


def gear_mesh(teeth: int, label: str | None = None) -> Excitation:
    """Gear mesh: ``teeth`` x the speed of the shaft that carries the gear.

    Parameters
    ----------
    teeth : int
        Number of teeth of the gear on the shaft (>= 1).
    label : str, optional
        Name shown in tables.

    Returns
    -------
    Excitation
        The order ``teeth`` [-] of that shaft's speed, kind ``"order"``.

    Raises
    ------
    InputValueError
        A count that is not a whole number >= 1.
    """
    z = _count(teeth, "teeth")
    return Excitation(label if label is not None else f"gear mesh ({z}x)", order=float(z))


def fixed_frequency(frequency: object, label: str) -> Excitation:
    """A source at a fixed frequency [Hz], independent of the running speed.

    Parameters
    ----------
    frequency : float or pint.Quantity
        [Hz] (> 0).
    label : str
        Name shown in tables.

    Returns
    -------
    Excitation
        Kind ``"fixed"``.

    Raises
    ------
    InputValueError, InputTypeError
        A frequency that is not finite and > 0, or not a frequency.
    """
    f = as_si(frequency, "frequency", "frequency", "positive")
    return Excitation(label, frequency=f)


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


def shaft_order(train: TorsionalTrain, shaft: str, order: float = 1.0, label: str | None = None) -> Excitation:
    """An order of one shaft's speed as an excitation of the train, referred to the reference shaft's speed.

    Parameters
    ----------
    train : TorsionalTrain
        The train.
    shaft : str
        The shaft whose speed excites (its 1x, 2x, or a gear mesh: teeth x that shaft's speed).
    order : float
        Multiple of that shaft's speed [-] (> 0).
    label : str, optional
        Name in tables.

    Returns
    -------
    Excitation
        Order ``order x n`` of the reference shaft's speed (``n`` the shaft's speed ratio); kind
        ``"synchronous"`` only for 1x of the reference shaft.

    Raises
    ------
    InputValueError
        An unknown shaft or an order that is not > 0.
    """
    if shaft not in train.speed_ratio:
        raise InputValueError(f"shaft: got {shaft!r}; expected one of {sorted(train.speed_ratio)}")
    n = as_si(order, "order", "ratio", "positive")
    referred = n * train.speed_ratio[shaft]
    text = label if label is not None else f"{n:g}x {shaft}"
    return Excitation(text, order=referred, kind="synchronous" if referred == 1.0 else "order")
