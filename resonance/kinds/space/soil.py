"""Soil under a rigid block: stiffness and radiation damping of a footing on an elastic half-space.

The lumped-parameter (equivalent circular footing) method: a rigid footing of radius ``r0`` on a
homogeneous elastic half-space of shear modulus ``G``, Poisson's ratio ``nu`` and density ``rho`` has, for
each motion, a static stiffness and a radiation damping ratio that depends on the machine-and-block mass (or
mass moment) through a mass ratio ``B``. A rectangular footing ``B x L`` is replaced by circles of equal area
(translations), equal second moment of area (rocking) or equal polar moment (torsion). Embedment raises the
stiffness by the factors given.

* vertical: ``k = 4 G r0 / (1 - nu)``, ``B = (1 - nu) m / (4 rho r0^3)``, ``D = 0.425 / sqrt(B)``;
* horizontal: ``k = 32 (1 - nu) G r0 / (7 - 8 nu)``, ``B = (7 - 8 nu) m / (32 (1 - nu) rho r0^3)``,
  ``D = 0.288 / sqrt(B)``;
* rocking: ``k = 8 G r0^3 / (3 (1 - nu))``, ``B = 3 (1 - nu) I / (8 rho r0^5)``, ``D = 0.15 / ((1 + B) sqrt(B))``;
* torsion: ``k = 16 G r0^3 / 3``, ``B = I / (rho r0^5)``, ``D = 0.5 / (1 + 2 B)``.

(Richart, Hall & Woods 1970, ch. 7 and 10; Arya, O'Neill & Pincus 1979, ch. 4; written down from memory:
check them against the edition you use.) The dashpot of each motion is ``c = 2 D sqrt(k M)``. A rectangle's
two sliding stiffnesses, along and across its long side, follow Gazetas (1991) instead of the one circle
(:func:`rectangular_sliding_stiffness`); its other motions keep the equivalent circles.

Soil properties govern the answer and are the least certain input of a foundation model: put them in the
tolerance band (what-if) or the uncertainty study, and defer to a geotechnical engineer's values.

References
----------
.. [1] F. E. Richart, J. R. Hall and R. D. Woods, *Vibrations of Soils and Foundations*, Prentice-Hall, 1970
   (from memory).
.. [2] S. C. Arya, M. W. O'Neill and G. Pincus, *Design of Structures and Foundations for Vibrating
   Machines*, Gulf, 1979 (embedment factors; from memory).
.. [4] G. Gazetas, Formulas and charts for impedances of surface and embedded foundations, J. Geotech. Eng.
   ASCE 117(9), 1991 (rectangular sliding stiffness; from memory).
.. [3] J. Lysmer and F. E. Richart, Dynamic response of footings to vertical loading, J. Soil Mech. Found.
   Div. ASCE 92, 1966 (the vertical dashpot ``3.4 r0^2 sqrt(rho G) / (1 - nu)``; from memory).
"""

from __future__ import annotations

import math
from dataclasses import dataclass

import numpy as np

from ...core.errors import InputValueError
from ...core.inputs import as_si
from .bodies import Mount

__all__ = ["FootingImpedance", "FootingMotion", "footing_impedance", "rectangular_sliding_stiffness", "soil_mount"]


@dataclass(frozen=True)
class FootingMotion:
    """One motion of a footing on the half-space.

    Attributes
    ----------
    radius : float
        Equivalent radius [m].
    stiffness : float
        [N/m] (translations) or [N m/rad] (rotations), embedment included.
    mass_ratio : float
        ``B`` [-].
    damping_ratio : float
        Radiation damping ratio ``D`` [-].
    damping : float
        Dashpot ``2 D sqrt(k M)`` [N s/m] or [N m s/rad].
    """

    radius: float
    stiffness: float
    mass_ratio: float
    damping_ratio: float
    damping: float


@dataclass(frozen=True)
class FootingImpedance:
    """The footing's six motions (global axes, z up).

    Sliding in x and y, vertical, rocking about x and y, torsion about z.

    Attributes
    ----------
    x, y, z, rx, ry, rz : FootingMotion
        Each motion.
    """

    x: FootingMotion
    y: FootingMotion
    z: FootingMotion
    rx: FootingMotion
    ry: FootingMotion
    rz: FootingMotion


def footing_impedance(
    shear_modulus: object,
    poisson_ratio: object,
    density: object,
    mass: object,
    rocking_inertia_x: object,
    rocking_inertia_y: object,
    torsion_inertia: object,
    radius: object | None = None,
    width_x: object | None = None,
    width_y: object | None = None,
    embedment: object = 0.0,
) -> FootingImpedance:
    """Stiffness and radiation damping of a rigid circular or rectangular footing on an elastic half-space.

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        ``G`` [Pa] (> 0): the soil's dynamic shear modulus at the strain of interest.
    poisson_ratio : float
        ``nu`` [-], 0 to below 0.5.
    density : float or pint.Quantity
        ``rho`` [kg/m^3] (> 0).
    mass : float or pint.Quantity
        Machine, block and footing mass [kg] (> 0).
    rocking_inertia_x, rocking_inertia_y : float or pint.Quantity
        Mass moments of inertia about horizontal axes through the footing's base centre, parallel to x and to
        y [kg m^2] (> 0).
    torsion_inertia : float or pint.Quantity
        About the vertical axis [kg m^2] (> 0).
    radius : float or pint.Quantity, optional
        A circular footing's radius [m].
    width_x, width_y : float or pint.Quantity, optional
        A rectangular footing's sides along x and y [m] (instead of ``radius``).
    embedment : float or pint.Quantity
        Depth of the footing's base below grade [m] (>= 0); raises the stiffness (Arya et al., from memory).

    Returns
    -------
    FootingImpedance

    Raises
    ------
    InputValueError, InputTypeError
        A value out of range, neither or both of a radius and two sides.

    Notes
    -----
    Rocking about x moves the footing in the y-z plane, so its equivalent radius takes the second moment of
    area about x: ``r0 = (a_x a_y^3 / (3 pi))^(1/4)`` for sides ``a_x``, ``a_y``; torsion ``r0 = (a_x a_y (a_x^2
    + a_y^2) / (6 pi))^(1/4)``; translations ``r0 = sqrt(a_x a_y / pi)``.
    """
    g, nu = _elastic_soil(shear_modulus, poisson_ratio)
    rho = as_si(density, "density", "density", "positive")
    m = as_si(mass, "mass", "mass", "positive")
    i_x = as_si(rocking_inertia_x, "rocking_inertia_x", "inertia", "positive")
    i_y = as_si(rocking_inertia_y, "rocking_inertia_y", "inertia", "positive")
    i_z = as_si(torsion_inertia, "torsion_inertia", "inertia", "positive")
    depth = as_si(embedment, "embedment", "length", "nonnegative")
    if (radius is None) == (width_x is None or width_y is None):
        raise InputValueError("footing: give either radius or both width_x and width_y")
    if radius is not None:
        r = as_si(radius, "radius", "length", "positive")
        r_t = r_rx = r_ry = r_z = r
    else:
        ax = as_si(width_x, "width_x", "length", "positive")
        ay = as_si(width_y, "width_y", "length", "positive")
        r_t = math.sqrt(ax * ay / math.pi)
        r_rx = (ax * ay**3 / (3.0 * math.pi)) ** 0.25
        r_ry = (ay * ax**3 / (3.0 * math.pi)) ** 0.25
        r_z = (ax * ay * (ax**2 + ay**2) / (6.0 * math.pi)) ** 0.25

    def motion(r0: float, k: float, b: float, d: float, inertia: float) -> FootingMotion:
        return FootingMotion(r0, k, b, d, 2.0 * d * math.sqrt(k * inertia))

    # Embedment factors (Arya, O'Neill & Pincus 1979, from memory), h / r0 of each motion.
    def vertical_factor(r0: float) -> float:
        return 1.0 + 0.6 * (1.0 - nu) * depth / r0

    def horizontal_factor(r0: float) -> float:
        return 1.0 + 0.55 * (2.0 - nu) * depth / r0

    def rocking_factor(r0: float) -> float:
        return 1.0 + 1.2 * (1.0 - nu) * depth / r0 + 0.2 * (2.0 - nu) * (depth / r0) ** 3

    kz = 4.0 * g * r_t / (1.0 - nu) * vertical_factor(r_t)
    bz = (1.0 - nu) * m / (4.0 * rho * r_t**3)
    kx = ky = 32.0 * (1.0 - nu) * g * r_t / (7.0 - 8.0 * nu) * horizontal_factor(r_t)
    if radius is None:  # a rectangle slides more stiffly across its long side than along it (Gazetas 1991)
        kx, ky = (k * horizontal_factor(r_t) for k in rectangular_sliding_stiffness(g, nu, ax, ay))
    bx = (7.0 - 8.0 * nu) * m / (32.0 * (1.0 - nu) * rho * r_t**3)
    rocking = []
    for r0, inertia in ((r_rx, i_x), (r_ry, i_y)):
        k = 8.0 * g * r0**3 / (3.0 * (1.0 - nu)) * rocking_factor(r0)
        b = 3.0 * (1.0 - nu) * inertia / (8.0 * rho * r0**5)
        rocking.append(motion(r0, k, b, 0.15 / ((1.0 + b) * math.sqrt(b)), inertia))
    kt = 16.0 * g * r_z**3 / 3.0
    bt = i_z / (rho * r_z**5)
    return FootingImpedance(
        motion(r_t, kx, bx, 0.288 / math.sqrt(bx), m),
        motion(r_t, ky, bx, 0.288 / math.sqrt(bx), m),
        motion(r_t, kz, bz, 0.425 / math.sqrt(bz), m),
        rocking[0],
        rocking[1],
        motion(r_z, kt, bt, 0.5 / (1.0 + 2.0 * bt), i_z),
    )


def rectangular_sliding_stiffness(
    shear_modulus: object, poisson_ratio: object, width_x: object, width_y: object
) -> tuple[float, float]:
    """Static sliding stiffness of a rigid rectangular surface footing along x and along y (Gazetas 1991).

    Parameters
    ----------
    shear_modulus : float or pint.Quantity
        ``G`` [Pa] (> 0).
    poisson_ratio : float
        ``nu`` [-], in [0, 0.5).
    width_x, width_y : float or pint.Quantity
        The footing's sides along x and y [m] (> 0).

    Returns
    -------
    kx, ky : float
        [N/m]. Across the long side (the lateral motion): ``K = 2 G L (2 + 2.5 chi^0.85) / (2 - nu)``; along
        it (longitudinal): ``K - 0.2 G L (1 - B / L) / (0.75 - nu)``; ``2L`` the long side, ``2B`` the short,
        ``chi = A / (4 L^2)`` with the area ``A = 4 B L``.

    Raises
    ------
    InputValueError, InputTypeError
        Values out of range.

    Notes
    -----
    A square gives one stiffness both ways, within 1 % of Gazetas' circle of equal area, ``8 G r0 / (2 - nu)``
    (a check of the reading of the formulas; Richart's ``32 (1 - nu) G r0 / (7 - 8 nu)`` lies up to 3 % above
    it). The embedment factor of the equivalent circle is applied by :func:`footing_impedance`.

    References
    ----------
    G. Gazetas, Formulas and charts for impedances of surface and embedded foundations, J. Geotech. Eng.
    ASCE 117(9), 1991, table 1 (surface footings of arbitrary shape; written down from memory).

    Examples
    --------
    >>> kx, ky = rectangular_sliding_stiffness(70e6, 0.33, 5.0, 3.6)
    >>> bool(ky > kx)   # the long side along x: stiffer across it, in y
    True
    """
    g, nu = _elastic_soil(shear_modulus, poisson_ratio)
    ax = as_si(width_x, "width_x", "length", "positive")
    ay = as_si(width_y, "width_y", "length", "positive")
    half_long, half_short = 0.5 * max(ax, ay), 0.5 * min(ax, ay)
    chi = half_short / half_long  # A / (4 L^2) for a rectangle
    across = 2.0 * g * half_long * (2.0 + 2.5 * chi**0.85) / (2.0 - nu)
    along = across - 0.2 * g * half_long * (1.0 - half_short / half_long) / (0.75 - nu)
    return (along, across) if ax >= ay else (across, along)


def _elastic_soil(shear_modulus: object, poisson_ratio: object) -> tuple[float, float]:
    # G > 0 and 0 <= nu < 0.5 (an incompressible soil has no half-space solution in these forms).
    g = as_si(shear_modulus, "shear_modulus", "pressure", "positive")
    nu = as_si(poisson_ratio, "poisson_ratio", "ratio", "nonnegative")
    if not nu < 0.5:
        raise InputValueError(f"poisson_ratio: got {nu:g}; expected 0 <= nu < 0.5")
    return g, nu


def soil_mount(footing: FootingImpedance, body: str, point: object, label: str = "soil") -> Mount:
    """The footing as a mount from a body to ground at the centre of the footing's base.

    Parameters
    ----------
    footing : FootingImpedance
        From :func:`footing_impedance`.
    body : str
        The block.
    point : array_like
        The centre of the footing's base [m].
    label : str
        The mount's name.

    Returns
    -------
    Mount
        Translational and rotational stiffness and dashpots of the six motions (global axes).

    Raises
    ------
    InputValueError
        A point that is not three coordinates.
    """
    return Mount(
        label,
        np.asarray(point, dtype=float),
        body,
        stiffness=np.array([footing.x.stiffness, footing.y.stiffness, footing.z.stiffness]),
        damping=np.array([footing.x.damping, footing.y.damping, footing.z.damping]),
        rotational_stiffness=np.array([footing.rx.stiffness, footing.ry.stiffness, footing.rz.stiffness]),
        rotational_damping=np.array([footing.rx.damping, footing.ry.damping, footing.rz.damping]),
    )
