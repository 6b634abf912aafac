"""What-if studies: scaled supports and masses, the smallest fix, tolerance bands.

A what-if study changes the stiffness of chosen springs and the mass of chosen
masses by factors, re-runs the margin checks, and answers two questions a
design review asks: what is the smallest change that makes every check pass,
and do the checks still pass over the whole uncertainty band of the support
stiffness (for example +/- 30 %)?
"""

from __future__ import annotations

import math
from dataclasses import dataclass
from typing import Literal

import numpy as np

from ...checks.interference import FindingsTable, interference_check
from ...core.errors import InputValueError
from ...dynamics.model import MatrixModel
from ...dynamics.modes import modal_properties
from .scenario import Scenario
from .study import study_modes
from .variants import evaluate_variants

__all__ = [
    "FixMap",
    "FixOptions",
    "fix_options",
    "combined_fix_map",
    "Parameter",
    "scaled_model",
    "check_scaled",
    "SmallestChange",
    "smallest_change",
    "ToleranceResult",
    "tolerance_check",
]

Parameter = Literal["stiffness", "mass"]


def scaled_model(
    scenario: Scenario, stiffness_scale: float = 1.0, mass_scale: float = 1.0, damping_ratio: float | None = None
) -> MatrixModel:
    """The scenario's model with the what-if springs and masses scaled.

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (not modified).
    stiffness_scale : float
        Factor on the stiffness of ``scenario.whatif.vary_springs`` (> 0).
    mass_scale : float
        Factor on the masses ``scenario.whatif.vary_masses`` (> 0).
    damping_ratio : float, optional
        Modal damping ratio instead of the scenario's.

    Returns
    -------
    MatrixModel
        The model with the factors applied.

    Raises
    ------
    InputValueError
        A factor that is not finite and > 0.
    """
    for name, value in (("stiffness_scale", stiffness_scale), ("mass_scale", mass_scale)):
        if not (math.isfinite(value) and value > 0.0):
            raise InputValueError(f"{name}: got {value!r}; expected a finite factor > 0")
    return scenario.model.build(
        dict.fromkeys(scenario.whatif.vary_springs, stiffness_scale),
        dict.fromkeys(scenario.whatif.vary_masses, mass_scale),
        damping_ratio,
    )


def check_scaled(scenario: Scenario, stiffness_scale: float = 1.0, mass_scale: float = 1.0) -> FindingsTable:
    """The margin checks of the scaled model (no forced response: fast).

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (not modified).
    stiffness_scale, mass_scale : float
        Factors on the what-if springs and masses (> 0).

    Returns
    -------
    FindingsTable
        The margin findings of the scaled model.

    Raises
    ------
    InputValueError
        A factor that is not finite and > 0.
    """
    model = scaled_model(scenario, stiffness_scale, mass_scale)
    modes = study_modes(modal_properties(model), model.labels)
    return interference_check(modes, scenario.excitations, scenario.speed, scenario.rules)


@dataclass(frozen=True)
class SmallestChange:
    """The smallest change of one parameter that makes every margin check pass.

    Attributes
    ----------
    parameter : {"stiffness", "mass"}
    scale : float or None
        The factor to apply (1.0 when nothing needs to change); None when no
        factor within the searched bounds passes.
    bounds : tuple of float
        The factors searched.
    """

    parameter: Parameter
    scale: float | None
    bounds: tuple[float, float]

    @property
    def percent(self) -> float | None:
        """The change in percent (+ stiffen or add mass, - soften or remove)."""
        return None if self.scale is None else 100.0 * (self.scale - 1.0)

    def describe(self, targets: tuple[str, ...]) -> str:
        """One sentence for a reader."""
        what = " and ".join(targets)
        if self.scale is None:
            return (
                f"No {self.parameter} change of {what} between x{self.bounds[0]:g} and x{self.bounds[1]:g} "
                "makes every check pass; change the speed range, add skip bands or change another parameter."
            )
        if self.scale == 1.0:
            return f"Every check passes without a {self.parameter} change."
        verb = {"stiffness": ("stiffen", "soften"), "mass": ("add mass to", "remove mass from")}[self.parameter]
        action = verb[0] if self.scale > 1.0 else verb[1]
        return (
            f"Smallest {self.parameter} fix: {action} {what} by {abs(self.percent or 0.0):.1f} % (x{self.scale:.3f})."
        )


def smallest_change(
    scenario: Scenario,
    parameter: Parameter,
    bounds: tuple[float, float] = (0.25, 4.0),
    points: int = 161,
) -> SmallestChange:
    """Find the factor closest to 1 (in ratio) that makes every margin check pass.

    The factors in ``bounds`` are scanned on a logarithmic grid, outwards from 1; the pass/fail
    edge nearest to 1 is then refined by bisection to 0.01 %.

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (not modified).
    parameter : {"stiffness", "mass"}
        Scale ``whatif.vary_springs`` or ``whatif.vary_masses``.
    bounds : tuple of float
        Smallest and largest factor searched (``0 < low < 1 < high``).
    points : int
        Grid size of the scan.

    Returns
    -------
    SmallestChange
        The factor (None when no factor within the bounds passes) and how it was found.

    Raises
    ------
    InputValueError
        An unknown parameter, or bounds that do not bracket 1.
    """
    if parameter not in ("stiffness", "mass"):
        raise InputValueError(f"parameter: got {parameter!r}; expected 'stiffness' or 'mass'")
    low, high = bounds
    if not (0.0 < low < 1.0 < high and math.isfinite(high)):
        raise InputValueError(f"bounds: got {bounds!r}; expected 0 < low < 1 < high")

    def passes(scale: float) -> bool:
        kwargs = {"stiffness_scale": scale} if parameter == "stiffness" else {"mass_scale": scale}
        return check_scaled(scenario, **kwargs).passed

    if passes(1.0):
        return SmallestChange(parameter, 1.0, bounds)
    grid = np.geomspace(low, high, points)
    # The passing grid factor nearest 1 in ratio (ties: the smaller factor): scanned outwards from 1, so the
    # scan stops at the first that passes instead of checking every factor of the grid.
    order = np.argsort(np.abs(np.log(grid)), kind="stable")
    best_index = next((int(i) for i in order if passes(float(grid[i]))), None)
    if best_index is None:
        return SmallestChange(parameter, None, bounds)
    best = float(grid[best_index])
    # Bisect between the best passing factor and its failing neighbour towards 1.
    fail_side = (
        float(grid[np.searchsorted(grid, best) - 1]) if best > 1.0 else float(grid[np.searchsorted(grid, best) + 1])
    )
    good, bad = best, fail_side
    while abs(math.log(good / bad)) > 1e-4:
        middle = math.sqrt(good * bad)
        good, bad = (middle, bad) if passes(middle) else (good, middle)
    return SmallestChange(parameter, good, bounds)


@dataclass(frozen=True)
class ToleranceResult:
    """Margin checks over a stiffness uncertainty band.

    Attributes
    ----------
    tolerance : float
        Relative band, e.g. 0.3 for +/- 30 %.
    scales : numpy.ndarray
        Stiffness factors evaluated.
    frequency_bands : tuple of (float, float)
        Lowest and highest natural frequency of each mode over the band [Hz].
    tables : tuple of FindingsTable
        The checks at each factor.
    """

    tolerance: float
    scales: np.ndarray
    frequency_bands: tuple[tuple[float, float], ...]
    tables: tuple[FindingsTable, ...]

    @property
    def passed(self) -> bool:
        """True when every check passes at every factor in the band."""
        return all(t.passed for t in self.tables)

    def summary(self) -> str:
        """One line for a reader."""
        failing = [s for s, t in zip(self.scales, self.tables, strict=True) if not t.passed]
        band = f"stiffness +/- {100 * self.tolerance:.0f} %"
        if not failing:
            return f"PASS over the {band}: every check passes at all {self.scales.size} factors."
        return (
            f"FAIL over the {band}: checks fail at {len(failing)} of {self.scales.size} factors "
            f"(x{min(failing):.2f} to x{max(failing):.2f})."
        )


def tolerance_check(
    scenario: Scenario,
    tolerance: float | None = None,
    samples: int = 13,
    stiffness_scale: float = 1.0,
    mass_scale: float = 1.0,
) -> ToleranceResult:
    """Evaluate the checks with the what-if springs over ``1 +/- tolerance``.

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (not modified).
    tolerance : float, optional
        Relative band (0 <= tolerance < 1); the scenario's if omitted.
    samples : int
        Factors evaluated across the band (>= 2), evenly spaced.
    stiffness_scale, mass_scale : float
        The nominal what-if factors the band is centred on.

    Returns
    -------
    ToleranceResult
        The findings at every factor of the band.

    Raises
    ------
    InputValueError
        A tolerance outside [0, 1), fewer than 2 samples, a bad factor.
    """
    tol = scenario.whatif.tolerance if tolerance is None else tolerance
    if not (0.0 <= tol < 1.0):
        raise InputValueError(f"tolerance: got {tol!r}; expected 0 <= tolerance < 1")
    if samples < 2:
        raise InputValueError(f"samples: got {samples!r}; expected at least 2")
    scales = stiffness_scale * np.linspace(1.0 - tol, 1.0 + tol, samples)
    tables, frequencies = [], []
    for s in scales:
        model = scaled_model(scenario, float(s), mass_scale)
        modes = study_modes(modal_properties(model), model.labels)
        frequencies.append([m.frequency for m in modes])
        tables.append(interference_check(modes, scenario.excitations, scenario.speed, scenario.rules))
    f = np.asarray(frequencies)
    bands = tuple((float(lo), float(hi)) for lo, hi in zip(f.min(axis=0), f.max(axis=0), strict=True))
    return ToleranceResult(tol, scales, bands, tuple(tables))


@dataclass(frozen=True)
class FixMap:
    """The worst margin over two combined changes: a stiffness factor and a mass factor.

    Attributes
    ----------
    stiffness, mass : numpy.ndarray
        Factors on ``whatif.vary_springs`` and ``whatif.vary_masses`` (logarithmic grids through 1).
    worst_excess : numpy.ndarray
        Smallest margin minus required [percent points], ``len(mass) x len(stiffness)``; >= 0 passes.
    smallest : tuple of float or None
        ``(stiffness factor, mass factor)`` of the smallest combined change that passes (the passing point
        nearest to no change, distance measured in log-factors), refined along its direction; ``(1, 1)`` when
        nothing needs to change; None when no point of the map passes.
    """

    stiffness: np.ndarray
    mass: np.ndarray
    worst_excess: np.ndarray
    smallest: tuple[float, float] | None

    @property
    def passing(self) -> np.ndarray:
        """True where every check passes, ``len(mass) x len(stiffness)``."""
        return self.worst_excess >= 0.0

    def describe(self, springs: tuple[str, ...], masses: tuple[str, ...]) -> str:
        """One sentence for a reader.

        Parameters
        ----------
        springs, masses : tuple of str
            What the factors scale.

        Returns
        -------
        str
            The smallest combined change that passes, or why there is none, as a sentence.

        Raises
        ------
        Nothing
            Pure text.
        """
        if self.smallest is None:
            return (
                f"No combination of stiffness x{self.stiffness[0]:.2f}-x{self.stiffness[-1]:.2f} and mass "
                f"x{self.mass[0]:.2f}-x{self.mass[-1]:.2f} passes every check."
            )
        ks, km = self.smallest
        if ks == 1.0 and km == 1.0:
            return "Every check passes without a change."
        return (
            f"Smallest combined fix: stiffness of {' and '.join(springs)} x{ks:.3f} with mass of "
            f"{' and '.join(masses)} x{km:.3f}."
        )


def combined_fix_map(
    scenario: Scenario,
    stiffness_bounds: tuple[float, float] = (0.5, 2.0),
    mass_bounds: tuple[float, float] = (0.5, 2.0),
    points: int = 41,
) -> FixMap:
    """Map the worst margin over a stiffness factor and a mass factor and find the smallest combined fix.

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (not modified).
    stiffness_bounds, mass_bounds : tuple of float
        Smallest and largest factor (``0 < low < 1 < high``).
    points : int
        Grid points per axis (odd, >= 5; the grids are logarithmic and pass through 1).

    Returns
    -------
    FixMap
        The grid of worst margins and the smallest combined change that passes.

    Raises
    ------
    InputValueError
        Bounds that do not bracket 1, an even or too small number of points.

    Notes
    -----
    Every grid point is one variant of one batched solve (:func:`~.variants.evaluate_variants`). The
    nearest passing grid point fixes a direction in the plane of log-factors; the boundary along it is then
    found by a scan and a bisection to 1e-4 in log-factor.
    """
    for name, (low, high) in (("stiffness_bounds", stiffness_bounds), ("mass_bounds", mass_bounds)):
        if not (0.0 < low < 1.0 < high and math.isfinite(high)):
            raise InputValueError(f"{name}: got {(low, high)!r}; expected 0 < low < 1 < high")
    if not (isinstance(points, int) and points >= 5 and points % 2):
        raise InputValueError(f"points: got {points!r}; expected an odd whole number >= 5")

    def grid(bounds: tuple[float, float]) -> np.ndarray:
        # Each half of the axis spaced evenly in log, 1 exactly in the middle.
        half = points // 2
        return np.concatenate(
            [np.geomspace(bounds[0], 1.0, half + 1)[:-1], [1.0], np.geomspace(1.0, bounds[1], half + 1)[1:]]
        )

    ks, km = grid(stiffness_bounds), grid(mass_bounds)
    kk, mm = np.meshgrid(ks, km)

    def worst(k: np.ndarray, m: np.ndarray) -> np.ndarray:
        found = evaluate_variants(
            scenario,
            k.size,
            dict.fromkeys(scenario.whatif.vary_springs, k.ravel()),
            dict.fromkeys(scenario.whatif.vary_masses, m.ravel()),
        )
        return found.worst_excess.reshape(k.shape)

    excess = worst(kk, mm)
    if not np.any(excess >= 0.0):
        return FixMap(ks, km, excess, None)
    if excess[points // 2, points // 2] >= 0.0:
        return FixMap(ks, km, excess, (1.0, 1.0))
    distance = np.where(excess >= 0.0, np.hypot(np.log(kk), np.log(mm)), np.inf)
    i, j = np.unravel_index(np.argmin(distance), distance.shape)
    direction = np.array([math.log(kk[i, j]), math.log(mm[i, j])])
    # Along that direction: the first passing step of a scan, then bisection towards no change.
    steps = np.linspace(0.0, 1.0, 65)[1:]
    along = worst(np.exp(steps * direction[0]), np.exp(steps * direction[1]))
    first = int(np.argmax(along >= 0.0))
    good, bad = steps[first], (steps[first - 1] if first else 0.0)
    while good - bad > 1e-4:
        middle = 0.5 * (good + bad)
        point = np.exp(middle * direction)
        passes = worst(np.array([point[0]]), np.array([point[1]]))[0] >= 0.0
        good, bad = (middle, bad) if passes else (good, middle)
    best = np.exp(good * direction)
    return FixMap(ks, km, excess, (float(best[0]), float(best[1])))


@dataclass(frozen=True)
class FixOptions:
    """What change fixes a failing support scenario: each parameter alone, and both combined.

    Attributes
    ----------
    stiffness, mass : SmallestChange
        The smallest change of the what-if springs' stiffness alone and of the what-if masses alone.
    combined : FixMap
        The map over both, with the smallest combined change.
    springs, masses : tuple of str
        What the factors scale.
    """

    stiffness: SmallestChange
    mass: SmallestChange
    combined: FixMap
    springs: tuple[str, ...]
    masses: tuple[str, ...]

    def lines(self) -> list[str]:
        """The options in words, one per line.

        Returns
        -------
        list of str

        Raises
        ------
        Nothing
            Pure text.
        """
        return [
            self.stiffness.describe(self.springs),
            self.mass.describe(self.masses),
            self.combined.describe(self.springs, self.masses),
        ]

    def record_data(self) -> dict[str, object]:
        """The options for a JSON record.

        Returns
        -------
        dict

        Raises
        ------
        Nothing
            Plain values.
        """
        return {
            "stiffness_factor": self.stiffness.scale,
            "mass_factor": self.mass.scale,
            "combined_factors": list(self.combined.smallest) if self.combined.smallest else None,
            "springs": list(self.springs),
            "masses": list(self.masses),
            "words": self.lines(),
            "note": "what-if changes that make every margin check pass; a fix is confirmed by a new design and "
            "field verification, not by this screening",
        }


def fix_options(scenario: Scenario) -> FixOptions:
    """The smallest stiffness, mass and combined changes that make every margin check pass.

    Parameters
    ----------
    scenario : Scenario
        The validated scenario (its what-if springs and masses are varied).

    Returns
    -------
    FixOptions

    Raises
    ------
    InputValueError
        Never for a validated scenario.
    """
    return FixOptions(
        smallest_change(scenario, "stiffness"),
        smallest_change(scenario, "mass"),
        combined_fix_map(scenario, (0.25, 4.0), (0.25, 4.0), 41),
        scenario.whatif.vary_springs,
        scenario.whatif.vary_masses,
    )
