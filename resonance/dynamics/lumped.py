"""Lumped models described by names: masses, springs with dashpots, and modal damping.

A :class:`ModelSpec` is the model layer's description of a machine on its support, as a scenario or a
what-if study gives it; :meth:`ModelSpec.build` turns it into a :class:`~resonance.dynamics.model.MatrixModel`,
optionally with scaled springs and masses and another damping ratio (what-if, tuning, tolerance bands).
"""

from __future__ import annotations

from collections.abc import Mapping
from dataclasses import dataclass

from .damping import modal_damping
from .model import MatrixModel, Spring, lumped_model, matrix_model

__all__ = ["MassSpec", "ModelSpec", "SpringSpec"]


@dataclass(frozen=True)
class MassSpec:
    """A lumped mass: ``name`` and ``mass`` [kg].

    Attributes
    ----------
    name : str
        The mass's name.
    mass : float
        [kg].
    """

    name: str
    mass: float


@dataclass(frozen=True)
class SpringSpec:
    """A spring (with optional dashpot) between two masses or a mass and ground.

    ``stiffness`` [N/m], ``damping`` [N s/m]; ``label`` names it in what-if studies.

    Attributes
    ----------
    node_a, node_b : str
        The joined masses (``"ground"`` for a fixed point).
    stiffness : float
        [N/m].
    damping : float
        Dashpot [N s/m].
    label : str
        Name in what-if studies and tuning.
    """

    node_a: str
    node_b: str
    stiffness: float
    damping: float
    label: str


@dataclass(frozen=True)
class ModelSpec:
    """A lumped model with modal damping plus optional discrete dashpots.

    Attributes
    ----------
    masses, springs
        The lumped masses and their connections.
    damping_ratio : float
        Modal damping ratio given to every mode [-]; the dashpots of the
        springs add (non-proportional) damping on top.
    """

    masses: tuple[MassSpec, ...]
    springs: tuple[SpringSpec, ...]
    damping_ratio: float

    @property
    def labels(self) -> tuple[str, ...]:
        """Mass names in degree-of-freedom order."""
        return tuple(m.name for m in self.masses)

    def build(
        self,
        stiffness_scale: Mapping[str, float] | None = None,
        mass_scale: Mapping[str, float] | None = None,
        damping_ratio: float | None = None,
    ) -> MatrixModel:
        """The :class:`MatrixModel`, optionally with scaled springs and masses.

        Parameters
        ----------
        stiffness_scale : mapping of spring label to factor, optional
            Factors on the stiffness (and dashpot) of the named springs.
        mass_scale : mapping of mass name to factor, optional
            Factors on the named masses.
        damping_ratio : float, optional
            Modal damping ratio to use instead of the scenario's.
        """
        ks = stiffness_scale or {}
        ms = mass_scale or {}
        undamped = lumped_model(
            {m.name: m.mass * ms.get(m.name, 1.0) for m in self.masses},
            [Spring(s.node_a, s.node_b, s.stiffness * ks.get(s.label, 1.0), s.damping) for s in self.springs],
        )
        zeta = self.damping_ratio if damping_ratio is None else damping_ratio
        modal = modal_damping(undamped.mass, undamped.stiffness, zeta) if zeta > 0.0 else 0.0
        return matrix_model(undamped.mass, undamped.stiffness, undamped.damping + modal, undamped.labels)
