"""Model tuning: adjust chosen stiffnesses and masses so the model's modes match measured ones.

The factors on the chosen springs and masses are found by bounded least
squares on ``f_model / f_measured - 1`` (in log factors, so that stiffening
and softening are alike); each measured frequency is paired with the model
mode nearest to it before tuning. The result names the adjusted values, the
mismatch left, and the tuned model; the field flow puts it back into its
scenario and runs the same checks (:mod:`resonance.kinds.field.study`).

References
----------
M. I. Friswell and J. E. Mottershead, *Finite Element Model Updating in
Structural Dynamics*, Kluwer, 1995, ch. 5 (sensitivity-based updating).
"""

from __future__ import annotations

import dataclasses
import math
from collections.abc import Sequence
from dataclasses import dataclass
from typing import Literal

import numpy as np
import scipy.optimize

from ...core.errors import InputValueError
from ...dynamics.lumped import ModelSpec
from ...dynamics.modes import modal_properties

__all__ = ["TuningParameter", "TunedModel", "apply_factors", "tune_model"]


@dataclass(frozen=True)
class TuningParameter:
    """A spring (by label) or mass (by name) to adjust, with the allowed factor range.

    Attributes
    ----------
    kind : {"spring", "mass"}
        What is adjusted.
    name : str
        The spring's label or the mass's name.
    low, high : float
        Allowed factor range [-] (``0 < low < 1 < high``).
    """

    kind: Literal["spring", "mass"]
    name: str
    low: float = 0.25
    high: float = 4.0


@dataclass(frozen=True)
class TunedModel:
    """The tuned model and how well it matches.

    Attributes
    ----------
    model : ModelSpec
        The model with the adjusted values (the original is untouched).
    factors : dict of str to float
        Factor applied to each parameter.
    measured, before, after : tuple of float
        Measured frequencies and the paired model frequencies before and after [Hz].
    """

    model: ModelSpec
    factors: dict[str, float]
    measured: tuple[float, ...]
    before: tuple[float, ...]
    after: tuple[float, ...]

    @property
    def mismatch_before(self) -> float:
        """Largest |f_model / f_measured - 1| before tuning [percent]."""
        return 100.0 * max(abs(b / m - 1.0) for b, m in zip(self.before, self.measured, strict=True))

    @property
    def mismatch_after(self) -> float:
        """Largest |f_model / f_measured - 1| after tuning [percent]."""
        return 100.0 * max(abs(a / m - 1.0) for a, m in zip(self.after, self.measured, strict=True))

    @property
    def rms_mismatch_before(self) -> float:
        """RMS of f_model / f_measured - 1 before tuning [percent] (what the tuning minimizes)."""
        return 100.0 * float(np.sqrt(np.mean((np.array(self.before) / np.array(self.measured) - 1.0) ** 2)))

    @property
    def rms_mismatch_after(self) -> float:
        """RMS of f_model / f_measured - 1 after tuning [percent]."""
        return 100.0 * float(np.sqrt(np.mean((np.array(self.after) / np.array(self.measured) - 1.0) ** 2)))

    def summary(self) -> str:
        """A few lines for a reader."""
        changes = ", ".join(f"{name} x{factor:.3f}" for name, factor in self.factors.items())
        pairs = "; ".join(
            f"{m:.2f} Hz measured, {b:.2f} -> {a:.2f} Hz model"
            for m, b, a in zip(self.measured, self.before, self.after, strict=True)
        )
        return (
            f"Tuned: {changes}\n{pairs}\n"
            f"largest mismatch {self.mismatch_before:.2f} % before, {self.mismatch_after:.2f} % after "
            f"(RMS {self.rms_mismatch_before:.2f} % -> {self.rms_mismatch_after:.2f} %)"
        )


def apply_factors(model: ModelSpec, parameters: Sequence[TuningParameter], factors: Sequence[float]) -> ModelSpec:
    """A copy of the model with each parameter's spring stiffness or mass multiplied by its factor.

    Parameters
    ----------
    model : ModelSpec
        The model (not modified).
    parameters : sequence of TuningParameter
        The springs and masses.
    factors : sequence of float
        One factor per parameter [-].

    Returns
    -------
    ModelSpec

    Raises
    ------
    ValueError
        Parameters and factors of different lengths.
    """
    springs = {p.name: f for p, f in zip(parameters, factors, strict=True) if p.kind == "spring"}
    masses = {p.name: f for p, f in zip(parameters, factors, strict=True) if p.kind == "mass"}
    new_springs = tuple(
        dataclasses.replace(s, stiffness=s.stiffness * springs.get(s.label, 1.0)) for s in model.springs
    )
    new_masses = tuple(dataclasses.replace(m, mass=m.mass * masses.get(m.name, 1.0)) for m in model.masses)
    return dataclasses.replace(model, springs=new_springs, masses=new_masses)


def _frequencies(model: ModelSpec) -> np.ndarray:
    return modal_properties(model.build()).frequency


def tune_model(model: ModelSpec, measured: Sequence[float], parameters: Sequence[TuningParameter]) -> TunedModel:
    """Adjust stiffnesses and masses within bounds so the model's modes match the measured frequencies.

    Parameters
    ----------
    model : ModelSpec
        The model to tune (not modified).
    measured : sequence of float
        Measured natural frequencies [Hz], each paired with the nearest model mode.
    parameters : sequence of TuningParameter
        What may change, and within which factors.

    Returns
    -------
    TunedModel

    Raises
    ------
    InputValueError
        No measured frequency or parameter, an unknown spring or mass, bad bounds, or two
        measured frequencies paired with the same model mode.
    """
    target = np.asarray(measured, dtype=float)
    if target.size == 0 or np.any(~np.isfinite(target)) or np.any(target <= 0):
        raise InputValueError("measured: expected one or more frequencies > 0 Hz")
    if not parameters:
        raise InputValueError("parameters: got none; expected at least one spring or mass to adjust")
    labels = {s.label for s in model.springs}
    names = set(model.labels)
    for p in parameters:
        known = labels if p.kind == "spring" else names
        if p.kind not in ("spring", "mass") or p.name not in known:
            raise InputValueError(
                f"parameters: {p.kind} {p.name!r} is not in the model; expected one of {sorted(known)}"
            )
        if not (0.0 < p.low < 1.0 < p.high and math.isfinite(p.high)):
            raise InputValueError(f"parameters: {p.name!r} bounds ({p.low}, {p.high}); expected 0 < low < 1 < high")
    start = _frequencies(model)
    pairing = [int(np.argmin(np.abs(np.log(start / f)))) for f in target]
    if len(set(pairing)) != len(pairing):
        raise InputValueError("measured: two frequencies pair with the same model mode; give one per mode")

    def residual(log_factors: np.ndarray) -> np.ndarray:
        f = _frequencies(apply_factors(model, parameters, np.exp(log_factors)))
        return f[pairing] / target - 1.0

    lower = np.log([p.low for p in parameters])
    upper = np.log([p.high for p in parameters])
    solution = scipy.optimize.least_squares(
        residual, np.zeros(len(parameters)), bounds=(lower, upper), xtol=1e-12, ftol=1e-12
    )
    factors = np.exp(solution.x)
    tuned = apply_factors(model, parameters, factors)
    after = _frequencies(tuned)[pairing]
    return TunedModel(
        tuned,
        {p.name: float(f) for p, f in zip(parameters, factors, strict=True)},
        tuple(float(v) for v in target),
        tuple(float(v) for v in start[pairing]),
        tuple(float(v) for v in after),
    )
