"""The margin checks of many variants of one support scenario at once (uncertainty studies, fix maps).

Each variant scales named springs and masses, the modal damping ratio and the ends of the speed range by
its own factors. The modes come from one batched eigen-solve (:mod:`resonance.dynamics.batch`) and the margins from
the same vectorized arithmetic the interference check uses (:func:`resonance.checks.margins.range_margins`), so a
variant's findings are those of :func:`~resonance.kinds.support.whatif.check_scaled` /
:func:`~resonance.kinds.support.study.run_study`
on the same scaled scenario (``tests/test_uncertainty.py`` compares them).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np

from ...checks.margins import range_margins
from ...checks.rules import is_flat
from ...core.errors import InputValueError
from ...dynamics.batch import lumped_modes_batch
from ...dynamics.modes import model_modes
from .scenario import Scenario
from .study import study_modes

__all__ = ["VariantFindings", "evaluate_variants", "run_study_labels"]


@dataclass(frozen=True)
class VariantFindings:
    """Every mode against every excitation, for every variant.

    Attributes
    ----------
    margin : numpy.ndarray
        Separation margin [percent], ``variants x modes x excitations`` (NaN where a variant lacks the mode).
    required : numpy.ndarray
        Required margin [percent]: per excitation (flat rules, the same for every variant) or
        ``variants x modes x excitations`` (rules that depend on each variant's AF); NaN where no margin is
        required (an exemption).
    mode_labels, excitation_labels : tuple of str
        Modes numbered by ascending frequency (labelled as in the nominal scenario) and the excitations.
    frequency : numpy.ndarray
        Natural frequencies [Hz], ``variants x modes``.
    """

    margin: np.ndarray
    required: np.ndarray
    mode_labels: tuple[str, ...]
    excitation_labels: tuple[str, ...]
    frequency: np.ndarray

    @property
    def excess(self) -> np.ndarray:
        """Margin minus required [percent points], ``variants x modes x excitations``; < 0 fails."""
        required = self.required if self.required.ndim == 3 else self.required[None, None, :]
        return self.margin - required

    @property
    def failed(self) -> np.ndarray:
        """True where a finding fails (NaN margins do not fail), ``variants x modes x excitations``."""
        return self.excess < 0.0

    @property
    def worst_excess(self) -> np.ndarray:
        """Each variant's smallest margin minus required [percent points]; < 0 means it fails."""
        return np.nanmin(self.excess.reshape(self.excess.shape[0], -1), axis=1)

    @property
    def worst_margin(self) -> np.ndarray:
        """Each variant's margin [percent] at its worst finding (the one with the smallest excess)."""
        flat = self.excess.reshape(self.excess.shape[0], -1)
        worst = np.nanargmin(flat, axis=1)
        return self.margin.reshape(flat.shape)[np.arange(flat.shape[0]), worst]


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
