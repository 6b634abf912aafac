"""The margin checks of many variants of one support scenario at once (uncertainty studies, fix maps).

Each variant scales named springs and masses, the modal damping ratio and the ends of the speed range by
its own factors. The modes come from one batched eigen-solve (:mod:`resonance.dynamics.batch`) and the margins from
the same vectorized arithmetic the interference check uses (:func:`resonance.checks.margins.range_margins`), so a
variant's findings are those of :func:`~resonance.kinds.support.whatif.check_scaled` /
:func:`~resonance.kinds.support.study.run_study`
on the same scaled scenario (``tests/test_uncertainty.py`` compares them).
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence

import numpy as np

from ...checks.margins import range_margins
from ...checks.rules import is_flat
from ...checks.variant_findings import VariantFindings
from ...core.errors import InputValueError
from ...dynamics.batch import lumped_modes_batch
from ...dynamics.modes import model_modes
from .scenario import Scenario
from .study import study_modes

__all__ = [
    "evaluate_variants",
    "run_study_labels",
    "uncertain_targets",
    "variant_findings",
]


def evaluate_variants(
    scenario: Scenario,
    samples: int,
    stiffness: Mapping[str, object] | None = None,
    mass: Mapping[str, object] | None = None,
    damping: object | None = None,
    speed_min: object | None = None,
    speed_max: object | None = None,
) -> VariantFindings:
    """The margin findings of ``samples`` variants of a support scenario.

    Parameters
    ----------
    scenario : Scenario
        The nominal support scenario (flat rules: every pair of a support scenario has one).
    samples : int
        Number of variants.
    stiffness, mass : mapping of name to array_like, optional
        Factors on named springs' stiffness and named masses, one per variant.
    damping : array_like, optional
        Factor on the modal damping ratio per variant.
    speed_min, speed_max : array_like, optional
        Factors on the lowest and highest speed of continuous operation per variant (skip bands stay).

    Returns
    -------
    VariantFindings
        Margins and required margins of every variant, mode and excitation.

    Raises
    ------
    InputValueError
        Unknown names, factors that are not finite and > 0, a damping ratio reaching 1, speeds that cross a
        skip band, a rule that is not flat.
    """
    zeta = None if damping is None else scenario.model.damping_ratio * np.asarray(damping, dtype=float)
    modes = lumped_modes_batch(scenario.model, samples, stiffness, mass, zeta)
    intervals = np.array(scenario.speed.intervals, dtype=float)  # k x 2
    lows = np.broadcast_to(intervals[:, 0], (samples, len(intervals))).copy()
    highs = np.broadcast_to(intervals[:, 1], (samples, len(intervals))).copy()
    for name, factor, column, edge in (("speed_min", speed_min, 0, lows), ("speed_max", speed_max, -1, highs)):
        if factor is None:
            continue
        values = np.broadcast_to(np.asarray(factor, dtype=float), (samples,))
        if not np.all(np.isfinite(values) & (values > 0.0)):
            raise InputValueError(f"{name}: expected finite factors > 0")
        base = scenario.speed.speed_min if name == "speed_min" else scenario.speed.speed_max
        edge[:, column] = base * values
    if np.any(lows > highs):  # equal: a fixed-speed machine
        raise InputValueError(
            "speed_min/speed_max: the [uncertainty] factors put a minimum speed above a maximum or across a skip "
            "band; narrow their bounds"
        )
    required = []
    for e in scenario.excitations:
        rule = scenario.rules.rule_for("structural", e.kind).rule  # type: ignore[arg-type]
        if not is_flat(rule):
            raise InputValueError(f"rules: {rule.name} governs {e.label}; variant studies take flat margins only")
        required.append(rule.required(1.0, "below"))
    margin = np.empty((samples, modes.frequency.shape[1], len(scenario.excitations)))
    for j, e in enumerate(scenario.excitations):
        if e.order is not None:
            # The same arithmetic as the interference check: the coincidence speed's margin from the range.
            critical = e.coincidence_speeds(modes.frequency)
            margin[:, :, j] = range_margins(critical, lows[:, None, :], highs[:, None, :])[0]
        else:
            fe = float(e.frequency)  # type: ignore[arg-type]
            margin[:, :, j] = 100.0 * np.abs(modes.frequency - fe) / fe
    nominal = run_study_labels(scenario)
    labels = tuple(nominal[i] if i < len(nominal) else f"mode {i + 1}" for i in range(modes.frequency.shape[1]))
    return VariantFindings(
        margin, np.array(required), labels, tuple(e.label for e in scenario.excitations), modes.frequency
    )


def run_study_labels(scenario: Scenario) -> tuple[str, ...]:
    """The nominal scenario's mode labels by ascending frequency (``mode 1 (machine moves most)``...).

    Parameters
    ----------
    scenario : Scenario
        The nominal scenario.

    Returns
    -------
    tuple of str

    Raises
    ------
    Nothing
        The scenario is validated.
    """
    model = scenario.model.build()
    return tuple(m.label for m in study_modes(model_modes(model), model.labels))


def uncertain_targets(scenario: Scenario) -> list[str]:
    """What an ``[uncertainty]`` table may vary in a support scenario.

    Parameters
    ----------
    scenario : Scenario
        The scenario.

    Returns
    -------
    list of str
        ``spring:<label>`` for every spring, ``mass:<name>`` for every mass, ``damping_ratio``, ``speed_min``
        and ``speed_max``.

    Raises
    ------
    Nothing
        The scenario is already validated.
    """
    return [
        *(f"spring:{s.label}" for s in scenario.model.springs),
        *(f"mass:{m}" for m in scenario.model.labels),
        "damping_ratio",
        "speed_min",
        "speed_max",
    ]


def variant_findings(scenario: Scenario, varies: Sequence[str], values: np.ndarray) -> VariantFindings:
    """The findings of a block of variants of a support scenario, in one batched solve.

    Parameters
    ----------
    scenario : Scenario
        The nominal support scenario; each variant scales its springs, masses, damping and speed limits.
    varies : sequence of str
        ``spring:<label>``, ``mass:<name>``, ``damping_ratio``, ``speed_min`` or ``speed_max``, one per column of
        ``values`` (from :func:`uncertain_targets`).
    values : numpy.ndarray
        Factors on those nominal values, ``variants x inputs``.

    Returns
    -------
    VariantFindings
        Margins and required margins of each variant, from one batched eigen-solve.

    Raises
    ------
    InputValueError
        Factors that make an invalid variant (see :func:`evaluate_variants`).
    """
    stiffness: dict[str, np.ndarray] = {}
    mass: dict[str, np.ndarray] = {}
    other: dict[str, np.ndarray] = {}
    for j, vary in enumerate(varies):
        kind, _, name = vary.partition(":")
        {"spring": stiffness, "mass": mass}.get(kind, other)[name or kind] = values[:, j]
    return evaluate_variants(
        scenario,
        values.shape[0],
        stiffness,
        mass,
        other.get("damping_ratio"),
        other.get("speed_min"),
        other.get("speed_max"),
    )
