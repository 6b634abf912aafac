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

from .errors import InputValueError
from .interference import FindingsTable, interference_check
from .model import MatrixModel
from .modes import modal_properties
from .scenario import Scenario
from .study import study_modes

__all__ = [
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

    The factors in ``bounds`` are scanned on a logarithmic grid; the pass/fail
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
    ok = np.array([passes(float(s)) for s in grid])
    if not ok.any():
        return SmallestChange(parameter, None, bounds)
    candidates = grid[ok]
    best = float(candidates[np.argmin(np.abs(np.log(candidates)))])
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
