"""Variants of a rotor scenario for uncertainty studies: bearings and speed limits scaled by factors.

Each variant runs the whole rotor study (about 0.2 s for the demo fan); its findings are keyed by excitation and
by the critical's rank (by speed) for that excitation, so variants whose criticals move line up.
"""

from __future__ import annotations

from collections.abc import Sequence
from typing import Any

import numpy as np

from ...checks.speed_range import operating_range
from ...checks.variant_findings import VariantFindings
from ...core.errors import InputValueError
from .scenario import RotorScenario, scale_bearing
from .study import run_rotor_study

__all__ = ["rotor_variant", "uncertain_targets", "variant_findings"]


def uncertain_targets(scenario: RotorScenario) -> list[str]:
    """What an ``[uncertainty]`` table may vary in a rotor scenario.

    Parameters
    ----------
    scenario : RotorScenario
        The scenario.

    Returns
    -------
    list of str
        ``bearing:<label>:stiffness`` and ``bearing:<label>:damping`` for every bearing (every coefficient of
        that bearing, every table value), ``speed_min`` and ``speed_max``.

    Raises
    ------
    Nothing
        The scenario is already validated.
    """
    labels = [b.label for b in scenario.bearings]
    return [*(f"bearing:{b}:{c}" for b in labels for c in ("stiffness", "damping")), "speed_min", "speed_max"]


def rotor_variant(scenario: RotorScenario, varies: Sequence[str], row: np.ndarray) -> RotorScenario:
    """One rotor variant: each bearing's coefficients and the speed limits scaled by the row's factors.

    Parameters
    ----------
    scenario : RotorScenario
        The nominal scenario.
    varies : sequence of str
        What each factor varies (from :func:`uncertain_targets`).
    row : numpy.ndarray
        One factor per entry of ``varies``.

    Returns
    -------
    RotorScenario
        The scenario with its bearings and speed limits scaled.

    Raises
    ------
    InputValueError
        Factors that put the minimum speed above the maximum, across a skip band, or at the sweep's end.
    """
    factor = {vary: float(v) for vary, v in zip(varies, row, strict=True)}
    bearings = tuple(
        scale_bearing(b, factor.get(f"bearing:{b.label}:stiffness", 1.0), factor.get(f"bearing:{b.label}:damping", 1.0))
        for b in scenario.bearings
    )
    speed = scenario.speed
    low = speed.speed_min * factor.get("speed_min", 1.0)
    high = speed.speed_max * factor.get("speed_max", 1.0)
    if not low <= high or (speed.skip_bands and not (low < speed.skip_bands[0][0] and speed.skip_bands[-1][1] < high)):
        raise InputValueError(
            "speed_min/speed_max: the [uncertainty] factors put the minimum speed above the maximum or across a "
            "skip band; narrow their bounds"
        )
    if high >= scenario.sweep_max:
        raise InputValueError(f"speed_max: the factors reach the rotor's sweep_max {scenario.sweep_max:g} rpm")
    return scenario.replace(bearings=bearings, speed=operating_range(low, high, speed.skip_bands))


def variant_findings(scenario: RotorScenario, varies: Sequence[str], values: np.ndarray) -> VariantFindings:
    """The findings of a block of rotor variants: each runs the whole rotor study.

    Parameters
    ----------
    scenario : RotorScenario
        The nominal rotor scenario; each variant is it with scaled bearings and speed limits.
    varies : sequence of str
        ``bearing:<label>:stiffness``, ``bearing:<label>:damping``, ``speed_min`` or ``speed_max``, one per column
        of ``values`` (from :func:`uncertain_targets`).
    values : numpy.ndarray
        Factors on those nominal values, ``variants x inputs``.

    Returns
    -------
    VariantFindings
        Keyed by excitation and by the critical's rank by speed for that excitation.

    Raises
    ------
    InputValueError
        Factors that make an invalid variant (see :func:`rotor_variant`).
    """
    # Each variant runs the whole rotor study; its findings are keyed by excitation and the critical's rank
    # (by speed) for that excitation. Exempt findings require no margin: NaN, neither failing nor worst.
    tables = [run_rotor_study(rotor_variant(scenario, varies, row)).findings for row in values]
    labels = tuple(e.label for e in scenario.excitations)
    ranked = []
    for table in tables:
        per: dict[str, list[Any]] = {label: [] for label in labels}
        for f in sorted(table, key=lambda f: f.coincidence_speed or 0.0):
            per.setdefault(f.excitation.label, []).append(f)
        ranked.append(per)
    depth = max((len(v) for per in ranked for v in per.values()), default=0)
    margin = np.full((len(tables), depth, len(labels)), np.nan)
    required = np.full_like(margin, np.nan)
    for s, per in enumerate(ranked):
        for j, label in enumerate(labels):
            for i, f in enumerate(per.get(label, [])):
                if not f.exempt:
                    margin[s, i, j], required[s, i, j] = f.margin, f.required_margin
    modes = tuple(f"critical {i + 1} (by speed)" for i in range(depth))
    return VariantFindings(margin, required, modes, labels, np.full((len(tables), depth), np.nan))
