"""The operating speed range of a machine, with drive skip bands.

A variable-speed drive runs continuously between a minimum and a maximum
speed, except inside skip (lock-out) bands it passes through but never dwells
in. Separation margins are measured from the nearest speed of continuous
operation.
"""

from __future__ import annotations

from collections.abc import Sequence
from dataclasses import dataclass

from ..core.errors import InputTypeError, InputValueError
from ..core.inputs import as_si

__all__ = ["OperatingRange", "operating_range"]


@dataclass(frozen=True)
class OperatingRange:
    """Speeds of continuous operation [rpm].

    Attributes
    ----------
    speed_min, speed_max : float
        Minimum and maximum continuous speed [rpm], ``0 < min <= max``.
    skip_bands : tuple of (float, float)
        Speed bands excluded from continuous operation [rpm], inside the range.
    """

    speed_min: float
    speed_max: float
    skip_bands: tuple[tuple[float, float], ...] = ()

    @property
    def intervals(self) -> tuple[tuple[float, float], ...]:
        """The allowed speed intervals [rpm], ascending, skip bands removed."""
        out = []
        start = self.speed_min
        for low, high in sorted(self.skip_bands):
            if low > start:
                out.append((start, low))
            start = max(start, high)
        if start < self.speed_max or self.speed_min == self.speed_max:
            out.append((start, self.speed_max))
        return tuple(out)

    @property
    def fixed(self) -> bool:
        """True for a fixed-speed machine (``speed_min == speed_max``)."""
        return self.speed_min == self.speed_max

    def describe(self) -> str:
        """The range in words for records: ``"fixed speed 1480 rpm"`` or ``"980 to 1480 rpm; skip bands ..."``."""
        if self.fixed:
            return f"fixed speed {self.speed_min:g} rpm"
        skips = ", ".join(f"{a:g}-{b:g}" for a, b in self.skip_bands)
        return f"{self.speed_min:g} to {self.speed_max:g} rpm" + (f"; skip bands {skips} rpm" if skips else "")

    def contains(self, speed: float) -> bool:
        """True when ``speed`` [rpm] is a speed of continuous operation."""
        return any(low <= speed <= high for low, high in self.intervals)


def operating_range(
    speed_min: object, speed_max: object, skip_bands: Sequence[tuple[object, object]] = ()
) -> OperatingRange:
    """Validate a speed range and its skip bands.

    Parameters
    ----------
    speed_min, speed_max : float or pint.Quantity
        [rpm], ``0 < speed_min <= speed_max`` (equal for a fixed-speed machine).
    skip_bands : sequence of (low, high)
        [rpm], each ``low < high``, within the range, not covering all of it.

    Returns
    -------
    OperatingRange
        Speeds [rpm].

    Raises
    ------
    InputValueError
        A reversed or empty range, or a skip band that is reversed, outside
        the range or leaves no speed to run at.

    Examples
    --------
    >>> operating_range(900.0, 1800.0, [(1150.0, 1250.0)]).intervals
    ((900.0, 1150.0), (1250.0, 1800.0))
    """
    low = as_si(speed_min, "speed_min", "speed", "positive")
    high = as_si(speed_max, "speed_max", "speed", "positive")
    if low > high:
        raise InputValueError(
            f"speed_max: got {high:g} rpm, below speed_min = {low:g} rpm; expected speed_min <= speed_max"
        )
    if isinstance(skip_bands, (str, bytes)) or not isinstance(skip_bands, Sequence):
        raise InputTypeError(
            f"skip_bands: got {skip_bands!r}; expected a list of (low, high) speed pairs, e.g. [(1150, 1250)]"
        )
    bands = []
    for i, band in enumerate(skip_bands):
        if isinstance(band, (str, bytes)) or not isinstance(band, Sequence) or len(band) != 2:
            raise InputValueError(f"skip_bands[{i}]: got {band!r}; expected a pair (low, high)")
        a = as_si(band[0], f"skip_bands[{i}] low", "speed", "positive")
        b = as_si(band[1], f"skip_bands[{i}] high", "speed", "positive")
        if not a < b:
            raise InputValueError(f"skip_bands[{i}]: got ({a:g}, {b:g}) rpm; expected low < high")
        if a < low or b > high:
            raise InputValueError(
                f"skip_bands[{i}]: got ({a:g}, {b:g}) rpm; expected a band inside the "
                f"operating range {low:g}-{high:g} rpm"
            )
        bands.append((a, b))
    result = OperatingRange(low, high, tuple(sorted(bands)))
    if not result.intervals:
        raise InputValueError("skip_bands: cover the whole operating range; no speed is left to run at")
    return result
