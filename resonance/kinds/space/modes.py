"""Modes of rigid bodies in space, in words.

Each mode's frequency, its shape and the share of each body's motion in each direction, named the way an
engineer says it (``fan: rocking about y``).
"""

from __future__ import annotations

from dataclasses import dataclass

import numpy as np

from ...core.errors import InputTypeError
from ...dynamics.modes import ModeSet, model_modes
from .bodies import MOTION_WORDS, SpaceModel

__all__ = [
    "SpaceMode",
    "space_modes",
]


@dataclass(frozen=True)
class SpaceMode:
    """One mode of a body model, with the share of each body's coordinate in its kinetic energy.

    Attributes
    ----------
    frequency : float
        [Hz].
    damping_ratio : float
        [-].
    shape : numpy.ndarray
        Mode shape (complex when the damping is not proportional), scaled to a largest entry of 1.
    shares : dict of str to float
        Each coordinate's share of the mode's kinetic energy (``"block.ry"``: 0.71); they add up to 1.
    words : str
        What moves, in words (``"block: rocking about y with sliding in x"``).
    """

    frequency: float
    damping_ratio: float
    shape: np.ndarray
    shares: dict[str, float]
    words: str


def _mode_words(shares: dict[str, float]) -> str:
    # The body with the most energy and its two largest motions (a second one only above 15 %).
    by_body: dict[str, float] = {}
    for label, share in shares.items():
        by_body[label.rsplit(".", 1)[0]] = by_body.get(label.rsplit(".", 1)[0], 0.0) + share
    body = max(by_body, key=by_body.__getitem__)
    own = sorted(((s, lab.rsplit(".", 1)[1]) for lab, s in shares.items() if lab.startswith(body + ".")), reverse=True)
    text = f"{body}: {MOTION_WORDS[own[0][1]]}"
    if len(own) > 1 and own[1][0] > 0.15:
        text += f" with {MOTION_WORDS[own[1][1]]}"
    others = [b for b, s in sorted(by_body.items(), key=lambda kv: -kv[1]) if b != body and s > 0.15]
    if others:
        text += f" (and {', '.join(others)})"
    return text


def space_modes(model: SpaceModel) -> list[SpaceMode]:
    """The modes of a body model, each with its kinetic-energy shares and what moves in words.

    Parameters
    ----------
    model : SpaceModel
        From :func:`space_model`.

    Returns
    -------
    list of SpaceMode
        By ascending frequency.

    Raises
    ------
    InputTypeError
        Not a SpaceModel.
    """
    if not isinstance(model, SpaceModel):
        raise InputTypeError(f"model: got {type(model).__name__}; expected a SpaceModel")
    modes: ModeSet = model_modes(model.model)
    out = []
    labels = model.model.labels
    for i, f in enumerate(modes.frequency):
        shape = modes.shapes[:, i]
        energy = np.real(np.conj(shape) * (model.model.mass @ shape))
        total = float(energy.sum()) or 1.0
        shares = {lab: float(e / total) for lab, e in zip(labels, energy, strict=True)}
        scale = shape[np.argmax(np.abs(shape))]
        # A node that carries an attached body is named by the body in words.
        riders = {node: body for body, node in model.attached.items()}
        named = {
            f"{riders.get(lab.rsplit('.', 1)[0], lab.rsplit('.', 1)[0])}.{lab.rsplit('.', 1)[1]}": v
            for lab, v in shares.items()
        }
        out.append(SpaceMode(float(f), float(modes.damping_ratio[i]), shape / scale, shares, _mode_words(named)))
    return out
