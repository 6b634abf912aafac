"""Forced torsional response: the dynamic torque in every element of a train under harmonic torques.

The referred equations are solved by modal superposition (see :func:`torque_response`).
"""

from __future__ import annotations

import math
from collections.abc import Mapping
from dataclasses import dataclass

import numpy as np
import scipy.linalg

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si, as_si_array
from ...core.threads import blas_threads_for
from ...dynamics.modes import undamped_modes
from .train import TorsionalTrain

__all__ = [
    "TorqueResponse",
    "torque_response",
]


@dataclass(frozen=True)
class TorqueResponse:
    """Steady response of a train to harmonic torques.

    Attributes
    ----------
    frequency : numpy.ndarray
        Excitation frequencies [Hz].
    element_torque : dict of str to numpy.ndarray
        Dynamic torque amplitude in each shaft and coupling, on its own shaft [N m] (spring and damper).
    shear_stress : dict of str to numpy.ndarray
        Shear stress amplitude ``T / Z_p`` [Pa] in each shaft section given with its diameters.
    station_angle : dict of str to numpy.ndarray
        Angle amplitude of each station in its own shaft's rotation [rad].
    """

    frequency: np.ndarray
    element_torque: dict[str, np.ndarray]
    shear_stress: dict[str, np.ndarray]
    station_angle: dict[str, np.ndarray]


def torque_response(
    train: TorsionalTrain, torques: dict[str, object], frequency: object, damping_ratio: object | None = None
) -> TorqueResponse:
    """Steady dynamic torques and stresses under harmonic torques at stations, at many frequencies at once.

    Parameters
    ----------
    train : TorsionalTrain
        From :func:`torsional_train`.
    torques : dict of str to float or pint.Quantity
        Torque amplitude at each excited station, on its own shaft [N m] (a pulsating air-gap torque, a gear
        mesh torque), all in phase at one frequency.
    frequency : array_like or pint.Quantity
        Excitation frequencies [Hz] (> 0: a free train has no steady response to a static torque).
    damping_ratio : float, optional
        A modal damping ratio for every mode [-], replacing the element dampers (as in
        :func:`torsional_mode_list`); element torques are then the springs' torques. The element dampers if
        omitted (their torque included).

    Returns
    -------
    TorqueResponse

    Raises
    ------
    InputValueError, InputTypeError
        Not a train, an unknown station, a torque or frequency that is not finite, a frequency <= 0, a damping
        ratio that is not finite and >= 0.

    Notes
    -----
    The referred equations ``(K - w^2 J + i w C) theta = T_ref`` are solved by modal superposition: the
    undamped modes once, then each elastic mode's coordinate at every frequency (real modes for modal or
    proportional damping, complex modes of the first-order form for element dampers; both exact). The free
    rotation carries no twist, so it enters the station angles only. A torque on a shaft turning ``n``
    times the reference speed is referred as ``n T`` (virtual work) and an element's referred torque is
    taken back to its own shaft as ``T_ref / n``. Fatigue design belongs to the governing code and a
    qualified engineer: compare the stresses with an allowable you are given, not with a guess.

    References
    ----------
    Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 6.10 and 5.6; Ewins, *Modal Testing*, 2nd ed., 2000,
    sec. 2.3-2.6 (modal superposition); Roark's Formulas, table 10.1 (``Z_p``) (from memory).
    """
    if not isinstance(train, TorsionalTrain):
        raise InputTypeError(f"train: got {type(train).__name__}; expected a TorsionalTrain")
    f = as_si_array(frequency, "frequency", "frequency", "positive")
    zeta = None if damping_ratio is None else as_si(damping_ratio, "damping_ratio", "ratio", "nonnegative")
    shaft_of = {s.name: s.shaft for s in train.stations}
    load = np.zeros(train.model.size)
    if not isinstance(torques, Mapping) or not torques:
        raise InputTypeError(f"torques: got {torques!r}; expected a mapping of station names to torques")
    for name, torque in torques.items():
        if name not in shaft_of:
            raise InputValueError(
                f"torques: names {name!r}, which is not a station; expected one of {sorted(shaft_of)}"
            )
        load[train.dof[name]] += as_si(torque, f"torques[{name!r}]", "torque") * train.speed_ratio[shaft_of[name]]
    w = 2.0 * math.pi * f
    with blas_threads_for(2 * train.model.size):
        parts = _modal_parts(train, zeta)
        q = parts.coordinates(load, w)
    theta = q @ parts.pe.T + (w[:, None] ** -2) * -(parts.p0 @ (parts.p0.T @ load))[None, :]
    angles = {s.name: np.abs(theta[:, train.dof[s.name]]) * train.speed_ratio[s.shaft] for s in train.stations}
    # Every element's twist from the elastic coordinates (the free rotation does not twist).
    incidence = np.zeros((len(train.elements), train.model.size))
    for row, (_label, a, b, _kr) in enumerate(train.elements):
        incidence[row, train.dof[a]] += 1.0
        incidence[row, train.dof[b]] -= 1.0
    twist = q @ (incidence @ parts.pe).T
    dampers = {s.label: s.damping for s in train.springs}
    torque_out: dict[str, np.ndarray] = {}
    stress: dict[str, np.ndarray] = {}
    sections = {s.label: s.section_modulus for s in train.springs}
    for row, (label, a, b, kr) in enumerate(train.elements):
        # Springs on their own shaft; compliant meshes on the pinion's shaft.
        n = train.speed_ratio[shaft_of[a] if label in dampers else shaft_of[b]]
        c = dampers.get(label, 0.0) * n**2 if zeta is None else 0.0
        torque_out[label] = np.abs((kr + 1j * w * c) * twist[:, row]) / n
        z_p = sections.get(label)
        if z_p is not None:
            stress[label] = torque_out[label] / z_p
    return TorqueResponse(f, torque_out, stress, angles)


def _modal_parts(train: TorsionalTrain, damping_ratio: float | None) -> _ModalParts:
    # The undamped modes once; the free rotation (0 Hz) kept apart: it carries no twist and no damping, so the
    # elastic modes alone give every element's torque, exactly, at every frequency (Ewins sec. 2.3-2.6).
    wr, phi = undamped_modes(train.model)
    rigid = wr <= 2.0 * math.pi * 1e-6
    we, pe, p0 = wr[~rigid], phi[:, ~rigid], phi[:, rigid]
    if damping_ratio is not None:
        return _ModalParts(we, pe, p0, None, 2.0 * damping_ratio * we)
    if we.size == 0:
        return _ModalParts(we, pe, p0, None, np.zeros(0))
    d = pe.T @ train.model.damping @ pe  # 2 zeta_r w_r on the diagonal when proportional
    off = d - np.diag(np.diag(d))
    if not np.any(np.abs(off) > 1e-9 * max(float(np.abs(d).max()), 1e-300)):
        return _ModalParts(we, pe, p0, None, np.diag(d).copy())
    # General (element) damping: complex modes of the balanced first-order form in elastic modal
    # coordinates, state z = [W q; q'], A = [[0, W], [-W, -D]] (as in resonance.dynamics.frf).
    m = we.size
    a = np.block([[np.zeros((m, m)), np.diag(we)], [-np.diag(we), -d]])
    lam, vectors = scipy.linalg.eig(a)
    return _ModalParts(we, pe, p0, (lam, vectors), None)


@dataclass(frozen=True)
class _ModalParts:
    we: np.ndarray  # elastic natural frequencies [rad/s]
    pe: np.ndarray  # their mass-normalized shapes (n x m)
    p0: np.ndarray  # the free rotation's shape(s) (n x r)
    state: tuple[np.ndarray, np.ndarray] | None  # complex modes of the first-order form (general damping)
    cr: np.ndarray | None  # 2 zeta_r w_r (proportional or given modal damping)

    def coordinates(self, load: np.ndarray, w: np.ndarray) -> np.ndarray:
        # Elastic modal coordinates q (len(w) x m) under a load vector.
        p = self.pe.T @ load
        if self.cr is not None:
            return p[None, :] / (self.we[None, :] ** 2 - w[:, None] ** 2 + 1j * w[:, None] * self.cr[None, :])
        lam, vectors = self.state  # type: ignore[misc]
        m = self.we.size
        participation = scipy.linalg.solve(vectors, np.concatenate([np.zeros(m), p]))
        rows = vectors[:m] / self.we[:, None]
        return (participation[None, :] / (1j * w[:, None] - lam[None, :])) @ rows.T
