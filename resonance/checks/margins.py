"""Amplification factor, separation margin and the margin a rule requires.

* :func:`half_power_points` / :func:`amplification_factor`: AF of a response
  peak by the half-power (-3 dB) method, ``AF = N_c / (N_2 - N_1)``, with the
  peak and the half-power points interpolated so that a coarse sweep still
  gives a good value.
* :func:`separation_margin`: the margin of a critical speed from the operating
  speed range, in percent of the nearest range limit (negative inside it).
* :func:`required_separation_margin` and the rule classes: the margin a rule
  requires for a given AF: the API 617 / API 684 lateral rule, flat
  percentage rules (common practice), and tables of your own.

References
----------
.. [1] API RP 684, *API Standard Paragraphs Rotordynamic Tutorial*, 2nd ed.,
   2005 (half-power AF, separation margin; from memory).
.. [2] API Std 617, *Axial and Centrifugal Compressors and Expander-compressors*,
   8th ed., 2014, sec. 2.6 (required separation margin; from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal, Protocol

import numpy as np
import pint

from ..core.errors import InputValueError
from ..core.inputs import as_si, as_si_array
from .speed_range import OperatingRange, operating_range

__all__ = [
    "range_margins",
    "RULE_NAMES",
    "ApiLateralRule",
    "FlatRule",
    "HalfPower",
    "Location",
    "MarginRule",
    "Side",
    "TableRule",
    "amplification_factor",
    "half_power_points",
    "range_margin",
    "required_separation_margin",
    "rule_by_name",
    "separation_margin",
]

Side = Literal["below", "above"]
Location = Literal["below", "inside", "above"]
_SIDES = ("below", "above")


@dataclass(frozen=True)
class HalfPower:
    """A response peak and its half-power points.

    All frequencies are in the unit of the input axis (Hz for quantities).

    Attributes
    ----------
    peak_frequency : float
        Interpolated frequency (or speed) of the peak, ``N_c``.
    peak_amplitude : float
        Interpolated peak amplitude, in the input's unit.
    lower, upper : float
        Half-power points ``N_1 < N_c < N_2``, where the amplitude is
        ``peak / sqrt(2)``.
    """

    peak_frequency: float
    peak_amplitude: float
    lower: float
    upper: float

    @property
    def amplification_factor(self) -> float:
        """``AF = N_c / (N_2 - N_1)`` [-]."""
        return self.peak_frequency / (self.upper - self.lower)

    @property
    def damping_ratio(self) -> float:
        """Equivalent damping ratio ``1 / (2 AF)`` [-] (light damping)."""
        return 0.5 / self.amplification_factor


def _vertex(x: np.ndarray, y: np.ndarray) -> tuple[float, float] | None:
    """Vertex of the parabola through three points, or None if it opens downward."""
    a, b, c = np.polyfit(x, y, 2)
    if not a > 0.0:
        return None
    x0 = -b / (2.0 * a)
    if not x[0] <= x0 <= x[-1]:
        return None
    return float(x0), float(c - b * b / (4.0 * a))


def _crossing(
    x: np.ndarray, y: np.ndarray, level: float, inner: tuple[float, float], outer: tuple[float, float], start: int
) -> float:
    """Where the curve crosses ``level`` between an inner point (nearer the peak) and an outer sample.

    The parabola through samples ``start .. start + 2`` is used when it crosses inside the bracket
    (for brackets next to the peak that is the peak's own parabola, so the crossing and the peak stay
    consistent on a coarse sweep); otherwise linear interpolation between the two points.
    """
    lo, hi = sorted((inner[0], outer[0]))
    if 0 <= start <= x.size - 3:
        window = slice(start, start + 3)
        a, b, c = np.polyfit(x[window], y[window], 2)
        roots = np.roots([a, b, c - level])
        inside = [r.real for r in roots if abs(r.imag) <= 1e-9 * abs(r) and lo <= r.real <= hi]
        if len(inside) == 1:
            return float(inside[0])
    (xa, ya), (xb, yb) = inner, outer
    return float(xa + (level - ya) * (xb - xa) / (yb - ya))


def _flank_crossing(x: np.ndarray, y: np.ndarray, level: float, i: int, x0: float, y0: float, step: int) -> float:
    """The half-power crossing on one flank (``step`` -1: below the peak, +1: above)."""
    inner = (x0, y0)
    j = i if (x[i] - x0) * step > 0 else i + step  # the first sample beyond the vertex on this flank
    while 0 <= j < x.size:
        if y[j] >= level:
            # Next to the peak: the peak's own parabola; further out: three samples centred on j.
            start = i - 1 if abs(j - i) <= 1 else min(max(j - 1, 0), x.size - 3)
            return _crossing(x, y, level, inner, (x[j], y[j]), start)
        inner = (x[j], y[j])
        j += step
    side = "below the first" if step < 0 else "above the last"
    edge = "lower" if step < 0 else "higher"
    end = 0 if step < 0 else x.size - 1
    raise InputValueError(
        f"amplitude: the {'lower' if step < 0 else 'upper'} half-power point lies {side} point "
        f"({math.sqrt(x[end]):g}); extend the sweep to {edge} frequencies"
    )


def half_power_points(frequency: object, amplitude: object, near: object | None = None) -> HalfPower:
    """Locate a response peak and its half-power points by interpolation.

    Parameters
    ----------
    frequency : array_like or pint.Quantity
        Strictly increasing frequencies or speeds. Plain numbers may be in any
        one unit (Hz, rpm, cpm); the results are in the same unit.
    amplitude : array_like or pint.Quantity
        Response amplitudes (> 0, any unit and convention; pk-pk, peak or RMS
        give the same AF).
    near : float, optional
        Pick the local maximum nearest this frequency (same unit) rather than
        the highest one.

    Returns
    -------
    HalfPower

    Raises
    ------
    InputValueError
        Mismatched lengths, fewer than 3 points, an axis that does not increase,
        non-positive amplitudes, no interior peak, or a half-power point outside
        the data.

    Notes
    -----
    The interpolation works on ``y = 1 / A^2`` against ``x = f^2``, which is an
    exact parabola for a single-degree-of-freedom force response
    (``1 / |X|^2 = (k - m w^2)^2 + (c w)^2``) and close to one near any
    isolated peak. The peak is the vertex of the parabola through the three
    samples around the largest; each half-power point is where the parabola
    through the three samples nearest the crossing meets ``y = 2 y_peak``.

    References
    ----------
    API RP 684, 2nd ed., 2005, half-power method (from memory); D. J. Ewins,
    *Modal Testing*, 2nd ed., 2000, sec. 4.3.
    """
    f = as_si_array(frequency, "frequency", "frequency", "nonnegative")
    if isinstance(amplitude, pint.Quantity):
        amplitude = amplitude.magnitude  # any unit: AF is a ratio
    a = np.atleast_1d(as_si_array(amplitude, "amplitude", "ratio"))
    if a.shape != f.shape:
        raise InputValueError(f"amplitude: got {a.size} values for {f.size} frequencies; expected one per frequency")
    if f.size < 3:
        raise InputValueError(f"frequency: got {f.size} points; expected at least 3")
    if not np.all(np.isfinite(a)) or np.any(a <= 0.0):
        raise InputValueError("amplitude: expected finite values > 0 (a magnitude curve)")
    if np.any(np.diff(f) <= 0.0):
        raise InputValueError("frequency: expected strictly increasing values")
    interior = np.flatnonzero((a[1:-1] >= a[:-2]) & (a[1:-1] >= a[2:])) + 1
    if interior.size == 0:
        raise InputValueError(
            "amplitude: has no peak inside the data (the largest value is at an end); "
            "extend the sweep past the resonance"
        )
    if near is None:
        i = int(interior[np.argmax(a[interior])])
    else:
        target = as_si(near, "near", "frequency", "positive")
        i = int(interior[np.argmin(np.abs(f[interior] - target))])
    x, y = f**2, 1.0 / a**2
    vertex = _vertex(x[i - 1 : i + 2], y[i - 1 : i + 2])
    x0, y0 = vertex if vertex is not None else (x[i], y[i])
    if not (x0 > 0.0 and y0 > 0.0):
        # The parabola's vertex has no finite amplitude: a peak far sharper than the sampling (almost no
        # damping). No AF can be read from these samples; refuse rather than guess.
        raise InputValueError(
            f"amplitude: the peak near {math.sqrt(max(x[i], 0.0)):g} is too sharp for the sampling to resolve "
            "(almost no damping); sample more finely around it"
        )
    level = 2.0 * y0
    x1 = _flank_crossing(x, y, level, i, x0, y0, -1)
    x2 = _flank_crossing(x, y, level, i, x0, y0, +1)
    return HalfPower(math.sqrt(x0), 1.0 / math.sqrt(y0), math.sqrt(x1), math.sqrt(x2))


def amplification_factor(frequency: object, amplitude: object, near: object | None = None) -> float:
    """Amplification factor of a response peak by the half-power method.

    ``AF = N_c / (N_2 - N_1)``; see :func:`half_power_points` for the
    parameters, the interpolation and the errors.

    Parameters
    ----------
    frequency : array_like or pint.Quantity
        Strictly increasing frequencies or speeds (any one unit).
    amplitude : array_like or pint.Quantity
        Response amplitudes (> 0).
    near : float, optional
        Pick the local maximum nearest this frequency.

    Returns
    -------
    float
        AF [-].

    Raises
    ------
    InputValueError
        As :func:`half_power_points`.

    References
    ----------
    API RP 684, 2nd ed., 2005 (from memory).

    Examples
    --------
    >>> import numpy as np
    >>> from resonance.dynamics.sdof import harmonic_response
    >>> f = np.linspace(5.0, 15.0, 41)
    >>> x, _ = harmonic_response(1.0, (2 * np.pi * 10.0) ** 2, 2 * 0.05 * 2 * np.pi * 10.0, 1.0, f)
    >>> round(amplification_factor(f, x), 2)
    9.95
    """
    return half_power_points(frequency, amplitude, near).amplification_factor


def range_margins(
    critical_speed: np.ndarray, lows: np.ndarray, highs: np.ndarray
) -> tuple[np.ndarray, np.ndarray, np.ndarray]:
    """Separation margins of many critical speeds from many ranges at once (vectorized :func:`range_margin`).

    Parameters
    ----------
    critical_speed : numpy.ndarray
        Critical speeds [rpm] (> 0), any shape ``S``.
    lows, highs : numpy.ndarray
        The allowed intervals' edges [rpm], shape broadcastable to ``S + (k,)`` (``k`` intervals, ascending).

    Returns
    -------
    margin : numpy.ndarray
        Percent, shape ``S`` (as :func:`range_margin`).
    location : numpy.ndarray of int
        -1 below, 0 inside, 1 above the allowed speeds.
    above : numpy.ndarray of bool
        True where the side whose requirement applies is ``"above"``.

    Raises
    ------
    Nothing
        Plain arithmetic (NaN critical speeds give NaN margins).
    """
    c = np.asarray(critical_speed, dtype=float)[..., None]
    below = 100.0 * (lows - c) / lows  # > 0 when the critical is below an interval
    above = 100.0 * (c - highs) / highs  # > 0 when above
    inside = (below <= 0.0) & (above <= 0.0)
    candidate = np.where(inside, np.maximum(below, above), np.where(below > 0.0, below, above))
    side_above = np.where(inside, -below > -above, ~(below > 0.0))
    location = np.where(inside, 0, np.where(below > 0.0, -1, 1))
    # The nearest interval (the first of equals, as a scan would keep it).
    best = np.argmin(np.where(np.isnan(candidate), np.inf, candidate), axis=-1)[..., None]

    def pick(a: np.ndarray) -> np.ndarray:
        return np.take_along_axis(np.broadcast_to(a, candidate.shape), best, axis=-1)[..., 0]

    return pick(candidate), pick(location), pick(side_above)


def range_margin(critical_speed: float, speed_range: OperatingRange) -> tuple[float, Location, Side]:
    """Separation margin of a critical speed from a range with skip bands.

    Parameters
    ----------
    critical_speed : float
        [rpm] (> 0).
    speed_range : OperatingRange
        The speeds of continuous operation.

    Returns
    -------
    margin : float
        Percent; ``100 (N_lo - N_c) / N_lo`` to the nearest lower edge of an
        allowed interval above the critical, ``100 (N_c - N_hi) / N_hi`` to the
        nearest upper edge below it; negative inside an interval (the smaller
        distance to its edges).
    location : {"below", "inside", "above"}
        Where the critical lies relative to the allowed speeds; ``"below"`` /
        ``"above"`` also for a critical inside a skip band (nearest edge).
    side : {"below", "above"}
        The side of the nearest edge, which selects the required margin.

    Raises
    ------
    Nothing
        An :class:`OperatingRange` always has an interval.
    """
    lows, highs = np.array(speed_range.intervals, dtype=float).T
    margin, location, above = range_margins(np.array(critical_speed, dtype=float), lows, highs)
    where: Location = ("below", "inside", "above")[int(location) + 1]
    return float(margin), where, "above" if bool(above) else "below"


def separation_margin(critical_speed: object, speed_min: object, speed_max: object) -> float:
    """Separation margin of a critical speed from the operating speed range.

    Parameters
    ----------
    critical_speed, speed_min, speed_max : float or pint.Quantity
        Speeds (or frequencies), all in any one unit; quantities in any speed
        or frequency unit.

    Returns
    -------
    float
        Percent: ``100 (N_min - N_c) / N_min`` below the range,
        ``100 (N_c - N_max) / N_max`` above it, negative inside it (the
        distance to the nearer limit).

    Raises
    ------
    InputValueError, InputTypeError
        A speed that is not finite and > 0, or min above max.

    References
    ----------
    API RP 684, 2nd ed., 2005 (from memory).

    Examples
    --------
    >>> round(separation_margin(1500.0, 1800.0, 3600.0), 4)
    16.6667
    >>> round(separation_margin(4500.0, 1800.0, 3600.0), 4)
    25.0
    """
    nc = as_si(critical_speed, "critical_speed", "speed", "positive")
    speed_range = operating_range(speed_min, speed_max)
    return range_margin(nc, speed_range)[0]


def _check_af(amplification_factor: float) -> float:
    # inf is allowed (an undamped mode); as_si refuses non-finite values, so it is taken first.
    if isinstance(amplification_factor, (int, float)) and amplification_factor == math.inf:
        return math.inf
    af = as_si(amplification_factor, "amplification_factor", "ratio")
    if af < 1.0:
        raise InputValueError(f"amplification_factor: got {af:g}; expected a value >= 1 (inf allowed)")
    return af


def _check_side(side: str) -> Side:
    if side not in _SIDES:
        raise InputValueError(f"side: got {side!r}; expected 'below' or 'above'")
    return side  # type: ignore[return-value]


def required_separation_margin(amplification_factor: float, side: Side) -> float:
    """Separation margin required by the API lateral rule [percent].

    Parameters
    ----------
    amplification_factor : float
        AF of the mode [-] (>= 1; ``inf`` for an undamped mode).
    side : {"below", "above"}
        Whether the critical speed is below or above the operating range.

    Returns
    -------
    float
        0 for ``AF < 2.5`` (critically damped); below the range
        ``min(16, 17 (1 - 1 / (AF - 1.5)))``; above the range
        ``min(26, 10 + 17 (1 - 1 / (AF - 1.5)))``.

    Raises
    ------
    InputValueError
        An AF below 1, or a side other than below or above.

    References
    ----------
    API Std 617, 8th ed., 2014; API RP 684, 2nd ed., 2005 (from memory).

    Examples
    --------
    >>> round(required_separation_margin(10.0, "below"), 3)
    15.0
    >>> required_separation_margin(2.0, "above")
    0.0
    """
    af = _check_af(amplification_factor)
    side = _check_side(side)
    if af < 2.5:
        return 0.0
    term = 17.0 * (1.0 - 1.0 / (af - 1.5)) if math.isfinite(af) else 17.0
    return min(16.0, term) if side == "below" else min(26.0, 10.0 + term)


class MarginRule(Protocol):
    """A rule giving the required separation margin for a mode."""

    @property
    def name(self) -> str:
        """Short name shown in findings."""

    @property
    def source(self) -> str:
        """The standard or practice the rule comes from."""

    def required(self, amplification_factor: float, side: Side) -> float:
        """Required margin [percent] for a mode of this AF on this side."""


@dataclass(frozen=True)
class ApiLateralRule:
    """The AF-based lateral rule of API 617 / API 684 (from memory).

    Attributes
    ----------
    name : str
        Shown in findings.
    source : str
        The standards it comes from.
    """

    name: str = "API lateral"
    source: str = "API Std 617 8th ed. / API RP 684 2nd ed. (from memory)"

    def required(self, amplification_factor: float, side: Side) -> float:
        """See :func:`required_separation_margin`."""
        return required_separation_margin(amplification_factor, side)


@dataclass(frozen=True)
class FlatRule:
    """A flat margin whatever the damping (common practice, e.g. 10-20 % for supports).

    Attributes
    ----------
    percent : float
        Required margin on both sides [percent] (> 0).
    """

    percent: float
    name: str = ""
    source: str = "common practice, no single source"

    def __post_init__(self) -> None:
        object.__setattr__(self, "percent", as_si(self.percent, "percent", "ratio", "positive"))
        if not self.name:
            object.__setattr__(self, "name", f"flat {self.percent:g} %")

    def required(self, amplification_factor: float, side: Side) -> float:
        """The flat margin, after checking the arguments."""
        _check_af(amplification_factor)
        _check_side(side)
        return self.percent


@dataclass(frozen=True)
class TableRule:
    """A user-defined rule: required margin against AF, interpolated linearly.

    Attributes
    ----------
    amplification_factors : tuple of float
        Strictly increasing AF values (>= 1).
    below, above : tuple of float
        Required margin [percent] at each AF, below and above the range;
        constant beyond the ends of the table.
    name, source : str
        Shown in findings; say where the table comes from.
    """

    amplification_factors: tuple[float, ...]
    below: tuple[float, ...]
    above: tuple[float, ...]
    name: str = "user table"
    source: str = "user-defined"

    def __post_init__(self) -> None:
        af = np.asarray(self.amplification_factors, dtype=float)
        for label, values in (("below", self.below), ("above", self.above)):
            v = np.asarray(values, dtype=float)
            if v.shape != af.shape:
                raise InputValueError(f"{label}: got {v.size} margins for {af.size} AF values; expected one per AF")
            if not np.all(np.isfinite(v)) or np.any(v < 0.0):
                raise InputValueError(f"{label}: expected finite margins >= 0 percent")
        if af.size < 1 or np.any(~np.isfinite(af)) or np.any(af < 1.0) or np.any(np.diff(af) <= 0.0):
            raise InputValueError(
                f"amplification_factors: got {af.tolist()}; expected strictly increasing finite values >= 1"
            )

    def required(self, amplification_factor: float, side: Side) -> float:
        """Interpolated required margin [percent]."""
        af = _check_af(amplification_factor)
        table = self.below if _check_side(side) == "below" else self.above
        return float(np.interp(min(af, 1e300), self.amplification_factors, table))


RULE_NAMES: tuple[str, ...] = ("api-lateral", "flat-10", "flat-15", "flat-20")


def rule_by_name(name: str) -> MarginRule:
    """A built-in rule by name: ``api-lateral`` or ``flat-P`` (P percent).

    Parameters
    ----------
    name : str
        ``"api-lateral"`` or ``"flat-P"`` with P a percentage.

    Returns
    -------
    MarginRule
        The rule.

    Raises
    ------
    InputValueError
        An unknown name.

    Examples
    --------
    >>> rule_by_name("flat-15").required(5.0, "below")
    15.0
    """
    if name == "api-lateral":
        return ApiLateralRule()
    if isinstance(name, str) and name.startswith("flat-"):
        try:
            percent = float(name[5:])
        except ValueError:
            percent = math.nan
        if math.isfinite(percent) and percent > 0.0:
            return FlatRule(percent)
    raise InputValueError(
        f"rule: got {name!r}; expected 'api-lateral' or 'flat-P' with P a percentage (e.g. {', '.join(RULE_NAMES[1:])})"
    )


def clear_band(coincidence_speed: float, rule: MarginRule, amplification_factor: float) -> tuple[float, float]:
    """Speeds the operating range must keep clear of around a coincidence [rpm].

    With the margins the rule requires below (``SM_b``) and above (``SM_a``) for
    this AF, in percent, a range below the coincidence may not end above
    ``N_c / (1 + SM_a / 100)`` and a range above it may not start below
    ``N_c / (1 - SM_b / 100)``: the band between the two.

    Examples
    --------
    >>> low, high = clear_band(2000.0, FlatRule(20.0), 10.0)
    >>> round(low, 1), round(high, 1)
    (1666.7, 2500.0)
    """
    af = max(amplification_factor, 1.0)
    below, above = rule.required(af, "below"), rule.required(af, "above")
    if not below < 100.0:
        raise InputValueError(f"rule: requires {below:g} % below the range; expected less than 100 %")
    return coincidence_speed / (1.0 + above / 100.0), coincidence_speed / (1.0 - below / 100.0)
