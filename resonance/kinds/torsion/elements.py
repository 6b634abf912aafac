"""The elements of a torsional train: stations, shafts, couplings and gear meshes.

Stations carry inertias, shafts and couplings stiffness and damping; the stiffness of plain, hollow and stepped
shafts is computed here (each function names its source).
"""

from __future__ import annotations

import math
from collections.abc import Sequence
from dataclasses import dataclass

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import as_si

__all__ = [
    "Coupling",
    "GearMesh",
    "Station",
    "TorsionalShaft",
    "hollow_shaft_stiffness",
    "stepped_shaft_stiffness",
]


def hollow_shaft_stiffness(
    shear_modulus: object, length: object, outer_diameter: object, inner_diameter: object = 0.0
) -> float:
    """Torsional stiffness of a uniform round shaft, ``k = G J_p / L`` with ``J_p = pi (D^4 - d^4) / 32``.

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        G [Pa] (> 0); steel about 79-81 GPa (from memory).
    length : float or pint.Quantity
        [m] (> 0).
    outer_diameter, inner_diameter : float or pint.Quantity
        D and d [m] (0 <= d < D).

    Returns
    -------
    float
        [N m/rad].

    Raises
    ------
    InputValueError, InputTypeError
        Non-positive or non-finite values, an inner diameter not below the outer, quantities of another kind.

    References
    ----------
    W. C. Young and R. G. Budynas, *Roark's Formulas for Stress and Strain*, 7th ed., 2002, table 10.1
    (circular and hollow circular sections) (from memory).

    Examples
    --------
    >>> round(hollow_shaft_stiffness(80e9, 1.0, 0.1) / 1e6, 3)  # MN m/rad
    0.785
    """
    g = as_si(shear_modulus, "shear_modulus", "pressure", "positive")
    length_m = as_si(length, "length", "length", "positive")
    d_out = as_si(outer_diameter, "outer_diameter", "length", "positive")
    d_in = as_si(inner_diameter, "inner_diameter", "length", "nonnegative")
    if not d_in < d_out:
        raise InputValueError(f"inner_diameter: got {d_in:g} m, not below the outer diameter {d_out:g} m")
    return g * math.pi * (d_out**4 - d_in**4) / 32.0 / length_m


def stepped_shaft_stiffness(shear_modulus: object, sections: Sequence[tuple[object, object, object]]) -> float:
    """Torsional stiffness of a stepped round shaft: its sections in series, ``1/k = sum L_i / (G J_i)``.

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        G [Pa] (> 0), the same for every section.
    sections : sequence of (length, outer_diameter, inner_diameter)
        Each uniform section's length and diameters [m] (0 <= d < D), from one station to the other.

    Returns
    -------
    float
        [N m/rad].

    Raises
    ------
    InputValueError, InputTypeError
        No section, or a section as :func:`hollow_shaft_stiffness` refuses it (named by its index).

    Notes
    -----
    Sections joined end to end carry the same torque and their twists add, so their compliances add
    (springs in series). The inertia of the sections belongs to the stations, as for a uniform shaft.

    References
    ----------
    S. S. Rao, *Mechanical Vibrations*, 6th ed., 2017, sec. 1.7 (springs in series); W. Ker Wilson,
    *Practical Solution of Torsional Vibration Problems*, vol. 1 (equivalent length of stepped shafts;
    from memory).

    Examples
    --------
    >>> k1 = hollow_shaft_stiffness(80e9, 0.3, 0.1)
    >>> k2 = hollow_shaft_stiffness(80e9, 0.2, 0.08)
    >>> round(stepped_shaft_stiffness(80e9, [(0.3, 0.1, 0.0), (0.2, 0.08, 0.0)]) / (k1 * k2 / (k1 + k2)), 12)
    1.0
    """
    if isinstance(sections, (str, bytes)) or not isinstance(sections, Sequence) or not sections:
        raise InputValueError(f"sections: got {sections!r}; expected one or more (length, outer, inner) sections")
    g = as_si(shear_modulus, "shear_modulus", "pressure", "positive")
    compliance = 0.0
    for i, section in enumerate(sections):
        if not isinstance(section, (tuple, list)) or len(section) != 3:
            raise InputValueError(f"sections[{i}]: got {section!r}; expected (length, outer_diameter, inner_diameter)")
        try:
            compliance += 1.0 / hollow_shaft_stiffness(g, *section)
        except (InputValueError, InputTypeError) as error:
            raise type(error)(f"sections[{i}]: {error}") from None
    return 1.0 / compliance


@dataclass(frozen=True)
class Station:
    """An inertia on a shaft.

    Attributes
    ----------
    name : str
        Unique name (``"motor"``, ``"impeller"``...).
    inertia : float
        Polar moment of inertia [kg m^2] (> 0); a quantity of ``R.ureg`` is converted (``"lb*ft**2"`` for WR^2).
    shaft : str
        The shaft it turns with (all stations of a shaft share its speed).
    """

    name: str
    inertia: float
    shaft: str = "driver"

    def __post_init__(self) -> None:
        object.__setattr__(self, "inertia", as_si(self.inertia, f"{self.name}: inertia", "inertia", "positive"))


@dataclass(frozen=True)
class TorsionalShaft:
    """A torsional spring (and damper) between two stations on the same shaft.

    Attributes
    ----------
    between : tuple of str
        The two stations.
    stiffness : float
        [N m/rad] (> 0); see :func:`hollow_shaft_stiffness`.
    damping : float
        [N m s/rad] (>= 0).
    label : str
        Name in tables (the element that twists most is named by it).
    outer_diameter, inner_diameter : float
        The section's diameters [m], when shear stresses are wanted (see :func:`torque_response`).
    """

    between: tuple[str, str]
    stiffness: float
    damping: float = 0.0
    label: str = ""
    outer_diameter: float | None = None
    inner_diameter: float = 0.0

    def __post_init__(self) -> None:
        where = self.label or "-".join(self.between)
        object.__setattr__(
            self, "stiffness", as_si(self.stiffness, f"{where}: stiffness", "moment_stiffness", "positive")
        )
        object.__setattr__(self, "damping", as_si(self.damping, f"{where}: damping", "moment_damping", "nonnegative"))
        if not self.label:
            object.__setattr__(self, "label", where)
        if self.outer_diameter is not None:
            d_out = as_si(self.outer_diameter, f"{where}: outer_diameter", "length", "positive")
            d_in = as_si(self.inner_diameter, f"{where}: inner_diameter", "length", "nonnegative")
            if not d_in < d_out:
                raise InputValueError(f"{where}: inner_diameter: got {d_in:g} m, not below the outer {d_out:g} m")
            object.__setattr__(self, "outer_diameter", d_out)
            object.__setattr__(self, "inner_diameter", d_in)

    @property
    def section_modulus(self) -> float | None:
        """Polar section modulus ``Z_p = pi (D^4 - d^4) / (16 D)`` [m^3], or None without diameters."""
        if self.outer_diameter is None:
            return None
        d_out, d_in = float(self.outer_diameter), float(self.inner_diameter)
        return math.pi * (d_out**4 - d_in**4) / (16.0 * d_out)


class Coupling(TorsionalShaft):
    """A flexible coupling: a torsional spring and damper from the maker's data.

    Attributes
    ----------
    between : tuple of str
        The two hubs' stations (on one shaft).
    stiffness : float
        Dynamic torsional stiffness [N m/rad] (> 0).
    damping : float
        [N m s/rad] (>= 0).
    label : str
        Name in tables.
    """


@dataclass(frozen=True)
class GearMesh:
    """A gear mesh: the pinion's shaft turns ``ratio`` times as fast as the gear's.

    Attributes
    ----------
    gear, pinion : str
        The stations of the two wheels (on different shafts).
    ratio : float
        Speed of the pinion's shaft over the gear's [-] (> 0; > 1 for a speed increaser).
    stiffness : float or None
        Mesh stiffness referred to the pinion's shaft [N m/rad]; None for a rigid mesh (gear and pinion
        then move as one referred degree of freedom).
    """

    gear: str
    pinion: str
    ratio: float
    stiffness: float | None = None

    def __post_init__(self) -> None:
        where = f"{self.gear}-{self.pinion}"
        ratio = as_si(self.ratio, f"{where}: ratio", "ratio", "positive")
        if not 1e-3 <= ratio <= 1e3:
            # Far wider than any gearbox; beyond it the referral (ratio squared) loses all meaning.
            raise InputValueError(f"{where}: ratio: got {ratio:g}; expected a speed ratio between 0.001 and 1000")
        object.__setattr__(self, "ratio", ratio)
        if self.stiffness is not None:
            k = as_si(self.stiffness, f"{where}: stiffness", "moment_stiffness", "positive")
            object.__setattr__(self, "stiffness", k)
