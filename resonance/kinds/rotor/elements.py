"""Element matrices of a rotating shaft and a rigid disc, one plane at a time.

Each shaft element has two nodes with a translation and a slope per plane,
ordered ``[w1, s1, w2, s2]`` (``s = dw/dz`` for a slender shaft). The two
lateral planes use the same matrices; the gyroscopic matrix couples them.

Timoshenko beam with shear parameter ``Phi = 12 E I / (kappa G A L^2)``
(``Phi = 0``: Euler-Bernoulli with rotary inertia).

References
----------
.. [1] H. D. Nelson and J. M. McVaugh, "The dynamics of rotor-bearing systems
   using finite elements", J. Eng. Ind. 98(2), 593-600, 1976.
.. [2] H. D. Nelson, "A finite rotating shaft element using Timoshenko beam
   theory", J. Mech. Des. 102(4), 793-803, 1980.
.. [3] J. S. Przemieniecki, *Theory of Matrix Structural Analysis*, McGraw-Hill,
   1968, sec. 11.6 (Timoshenko mass matrices; from memory).
.. [4] G. R. Cowper, "The shear coefficient in Timoshenko's beam theory",
   J. Appl. Mech. 33, 335-340, 1966 (shear coefficient of a tube).
"""

from __future__ import annotations

import numpy as np

__all__ = ["shear_coefficient", "beam_stiffness", "beam_translational_mass", "beam_rotary_mass"]


def shear_coefficient(outer_diameter: float, inner_diameter: float, poisson_ratio: float) -> float:
    """Cowper's shear coefficient of a circular tube (solid when ``inner_diameter = 0``).

    ``kappa = 6 (1 + nu) (1 + m^2)^2 / ((7 + 6 nu) (1 + m^2)^2 + (20 + 12 nu) m^2)``, ``m = di / do``.

    Parameters
    ----------
    outer_diameter, inner_diameter : float
        [m].
    poisson_ratio : float
        [-].

    Returns
    -------
    float
        kappa [-].

    Raises
    ------
    ZeroDivisionError
        A zero outer diameter (the model layer refuses it first).
    """
    m2 = (inner_diameter / outer_diameter) ** 2
    nu = poisson_ratio
    return 6.0 * (1.0 + nu) * (1.0 + m2) ** 2 / ((7.0 + 6.0 * nu) * (1.0 + m2) ** 2 + (20.0 + 12.0 * nu) * m2)


def beam_stiffness(ei: float, length: float, phi: float) -> np.ndarray:
    """Bending stiffness of a Timoshenko element in one plane [N/m, N, N m].

    Parameters
    ----------
    ei : float
        Bending stiffness E I [N m^2].
    length : float
        [m].
    phi : float
        Shear parameter ``12 E I / (kappa G A L^2)`` [-].

    Returns
    -------
    numpy.ndarray
        4 x 4 over (translation, slope, translation, slope).

    Raises
    ------
    ZeroDivisionError
        A zero length (the model layer refuses it first).
    """
    L = length
    return (ei / ((1.0 + phi) * L**3)) * np.array(
        [
            [12.0, 6.0 * L, -12.0, 6.0 * L],
            [6.0 * L, (4.0 + phi) * L**2, -6.0 * L, (2.0 - phi) * L**2],
            [-12.0, -6.0 * L, 12.0, -6.0 * L],
            [6.0 * L, (2.0 - phi) * L**2, -6.0 * L, (4.0 + phi) * L**2],
        ]
    )


def beam_translational_mass(mass_per_length: float, length: float, phi: float) -> np.ndarray:
    """Consistent translational mass of a Timoshenko element in one plane [kg, kg m, kg m^2].

    Parameters
    ----------
    mass_per_length : float
        [kg/m].
    length : float
        [m].
    phi : float
        Shear parameter [-].

    Returns
    -------
    numpy.ndarray
        4 x 4.

    Raises
    ------
    Nothing
        Pure arithmetic.
    """
    L, p = length, phi
    a = 13.0 / 35.0 + 7.0 * p / 10.0 + p**2 / 3.0
    b = (11.0 / 210.0 + 11.0 * p / 120.0 + p**2 / 24.0) * L
    c = 9.0 / 70.0 + 3.0 * p / 10.0 + p**2 / 6.0
    d = (13.0 / 420.0 + 3.0 * p / 40.0 + p**2 / 24.0) * L
    e = (1.0 / 105.0 + p / 60.0 + p**2 / 120.0) * L**2
    f = (1.0 / 140.0 + p / 60.0 + p**2 / 120.0) * L**2
    return (mass_per_length * L / (1.0 + p) ** 2) * np.array(
        [[a, b, c, -d], [b, e, d, -f], [c, d, a, -b], [-d, -f, -b, e]]
    )


def beam_rotary_mass(rotary_inertia_per_length: float, length: float, phi: float) -> np.ndarray:
    """Consistent rotary (diametral) inertia of a Timoshenko element in one plane.

    ``rotary_inertia_per_length`` is ``rho I`` [kg m]; the polar inertia of a
    shaft is twice that, so the element's gyroscopic matrix is twice this
    matrix, placed between the planes.

    Parameters
    ----------
    rotary_inertia_per_length : float
        rho I [kg m].
    length : float
        [m].
    phi : float
        Shear parameter [-].

    Returns
    -------
    numpy.ndarray
        4 x 4.

    Raises
    ------
    ZeroDivisionError
        A zero length (the model layer refuses it first).
    """
    L, p = length, phi
    a = 6.0 / 5.0
    b = (1.0 / 10.0 - p / 2.0) * L
    c = (2.0 / 15.0 + p / 6.0 + p**2 / 3.0) * L**2
    d = (1.0 / 30.0 + p / 6.0 - p**2 / 6.0) * L**2
    return (rotary_inertia_per_length / ((1.0 + p) ** 2 * L)) * np.array(
        [[a, b, -a, b], [b, c, -b, -d], [-a, -b, a, -b], [b, -d, -b, c]]
    )
