"""The findings of many variants of one scenario at once: margins and required margins as arrays.

Every kind's variants (a support's batched solve, a rotor's study per variant) end in a
:class:`VariantFindings`, which the uncertainty study and the fix maps read the same way.
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

__all__ = [
    "VariantFindings",
]


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
