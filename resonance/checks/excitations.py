"""Excitation sources: orders of running speed, blade pass, gear mesh and fixed frequencies.

An :class:`Excitation` is either an order of the running speed (1x unbalance,
2x misalignment, blade or vane pass, gear mesh; frequency ``n N / 60`` Hz at
``N`` rpm) or a fixed frequency independent of speed (a neighbouring machine).
Each has a kind, which decides the margin rule that applies to it
(:mod:`resonance.checks.rules`): ``"synchronous"`` (1x), ``"order"`` (any other order
of running speed), ``"electrical"`` (the motor's electrical frequencies: fixed
for a motor on the line, following the speed for a motor on a drive, see
:mod:`resonance.checks.electrical`) and ``"fixed"``. Unbalance amounts are in
:mod:`resonance.checks.unbalance`.
"""

from __future__ import annotations

import math
from dataclasses import dataclass, field
from typing import Literal

import numpy as np

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array

__all__ = [
    "EXCITATION_KINDS",
    "Excitation",
    "ExcitationKind",
    "blade_pass",
    "fixed_frequency",
    "gear_mesh",
    "running_speed_order",
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
