"""The package's unit registry, with this trade's rpm, cpm and mil right.

Plain pint counts a revolution as 2 pi radians and a hertz as 1/s, so it turns
1 rpm into 0.1047 Hz, and it reads ``mil`` as an angle. In machinery work a
revolution is one cycle (3600 rpm = 60 Hz = 3600 cpm) and a mil is a
thousandth of an inch (25.4 um). This registry is built from an edited copy of
pint's own definition files in which the angle is a dimension of its own, a
hertz is one cycle per second and ``mil`` is a length; every edit is checked
to apply exactly once, and the finished registry is checked against the
trade's conversions at import, so a pint upgrade that moves the definitions
fails loudly instead of silently.

Inside the package everything is SI floats, except that frequencies are in Hz
and shaft speeds in rpm. Display conversion lives in :func:`display_unit`.
"""

from __future__ import annotations

import math
import re
from importlib import resources
from typing import Literal

import pint

__all__ = ["UNIT_SYSTEMS", "Quantity", "QuantityKind", "UnitSystem", "display_unit", "internal_unit", "ureg"]

# (pattern, replacement) applied to pint's default_en.txt; each must match once.
_EDITS: tuple[tuple[str, str], ...] = (
    # The angle becomes a base dimension so that rad/s -> Hz divides by 2 pi
    # and rpm -> Hz divides by 60.
    (r"^radian = \[\] = rad$", "radian = [angle] = rad"),
    (r"^\[frequency\] = 1 / \[time\]$", "[frequency] = [angle] / [time]"),
    (r"^hertz = 1 / second = Hz$", "hertz = cycle / second = Hz"),
    # Free the name "mil" for the length (thousandth of an inch).
    (r"^mil = π / 32000 \* radian$", "angular_mil = π / 32000 * radian"),
    # ... and make "mil" the symbol of the thousandth of an inch.
    (r"^    thou = 1e-3 \* inch = th = mil_length$", "    thou = 1e-3 * inch = mil = th = mil_length"),
)

_ADDITIONS = """
cycles_per_minute = cycle / minute = cpm
inch_per_second = inch / second = ips
@alias pound = lbm
"""


def _definition_lines() -> list[str]:
    root = resources.files("pint")
    text = (root / "default_en.txt").read_text(encoding="utf-8")
    constants = (root / "constants_en.txt").read_text(encoding="utf-8")
    for pattern, replacement in _EDITS:
        text, count = re.subn(pattern, replacement, text, flags=re.MULTILINE)
        if count != 1:
            raise RuntimeError(
                f"pint {pint.__version__}: the unit definition edit {pattern!r} "
                f"matched {count} times instead of once; the machinery units "
                "(rpm, cpm, mil) would be wrong. Pin a pint version this "
                "package was tested with, or update core/units.py."
            )
    text, count = re.subn(r"^@import constants_en.txt$", constants, text, flags=re.MULTILINE)
    if count != 1:
        raise RuntimeError(
            f"pint {pint.__version__}: default_en.txt no longer imports constants_en.txt; update core/units.py."
        )
    return (text + _ADDITIONS).splitlines()


def _build_registry() -> pint.UnitRegistry:
    registry: pint.UnitRegistry = pint.UnitRegistry(None, autoconvert_offset_to_baseunit=True)
    registry.load_definitions(_definition_lines())
    registry.formatter.default_format = "~P"
    # The trade's conversions; wrong values here would corrupt every result.
    checks = (
        ("3600 rpm", "Hz", 60.0),
        ("3600 cpm", "Hz", 60.0),
        ("1 rad/s", "Hz", 1.0 / (2.0 * math.pi)),
        ("2 mil", "um", 50.8),
        ("0.5 in/s", "mm/s", 12.7),
        ("1 lbm", "kg", 0.45359237),
        ("1 lbf/in", "N/m", 175.126835),
    )
    for given, unit, expected in checks:
        got = float(registry.Quantity(given).to(unit).magnitude)
        if not math.isclose(got, expected, rel_tol=1e-8):
            raise RuntimeError(
                f"unit registry check failed: {given} = {got} {unit}, expected "
                f"{expected} {unit}; pint {pint.__version__} changed its definitions"
            )
    return registry


ureg: pint.UnitRegistry = _build_registry()
Quantity = ureg.Quantity

UnitSystem = Literal["SI", "US"]
UNIT_SYSTEMS: tuple[UnitSystem, ...] = ("SI", "US")

# Display units per quantity kind and unit system. Internal values are in the
# package convention (first column is what a plain float means).
QuantityKind = Literal[
    "mass",
    "stiffness",
    "damping",
    "force",
    "frequency",
    "speed",
    "displacement",
    "velocity",
    "acceleration",
    "unbalance",
    "length",
    "receptance",
    "angle",
    "ratio",
    "balance_grade",
    "inertia",
    "density",
    "pressure",
    "stress",
    "moment_stiffness",
    "moment_damping",
    "area",
    "second_moment",
    "torque",
    "time",
]

_DISPLAY: dict[str, tuple[str, str, str]] = {
    # kind: (internal unit, SI display, US customary display)
    "mass": ("kg", "kg", "lbm"),
    "stiffness": ("N/m", "kN/mm", "lbf/in"),
    "damping": ("N*s/m", "N*s/m", "lbf*s/in"),
    "force": ("N", "N", "lbf"),
    "frequency": ("Hz", "Hz", "cpm"),
    "speed": ("rpm", "rpm", "rpm"),
    "displacement": ("m", "um", "mil"),
    "velocity": ("m/s", "mm/s", "in/s"),
    "acceleration": ("m/s**2", "m/s**2", "g0"),
    "unbalance": ("kg*m", "g*mm", "oz*in"),
    "length": ("m", "mm", "in"),
    "receptance": ("m/N", "um/N", "mil/lbf"),
    "angle": ("rad", "deg", "deg"),
    "ratio": ("dimensionless", "dimensionless", "dimensionless"),
    "balance_grade": ("mm/s", "mm/s", "mm/s"),
    "inertia": ("kg*m**2", "kg*m**2", "lbm*in**2"),
    "density": ("kg/m**3", "kg/m**3", "lbm/in**3"),
    "pressure": ("Pa", "GPa", "psi"),
    "stress": ("Pa", "MPa", "psi"),
    "moment_stiffness": ("N*m/rad", "kN*m/rad", "lbf*in/rad"),
    "moment_damping": ("N*m*s/rad", "N*m*s/rad", "lbf*in*s/rad"),
    "area": ("m**2", "cm**2", "in**2"),
    "second_moment": ("m**4", "cm**4", "in**4"),
    "torque": ("N*m", "N*m", "lbf*ft"),
    "time": ("s", "s", "s"),
}


# How a display unit is written (pint's own short symbols are not the trade's:
# it writes a mil as "th").
_LABELS: dict[str, str] = {
    "um": "µm",
    "um/N": "µm/N",
    "g0": "g",
    "N*s/m": "N·s/m",
    "lbf*s/in": "lbf·s/in",
    "g*mm": "g·mm",
    "oz*in": "oz·in",
    "m/s**2": "m/s²",
    "N*m*s/rad": "N·m·s/rad",
    "lbf*in*s/rad": "lbf·in·s/rad",
    "cm**2": "cm²",
    "in**2": "in²",
    "cm**4": "cm⁴",
    "in**4": "in⁴",
    "dimensionless": "",
}


def internal_unit(kind: QuantityKind) -> str:
    """Return the unit a plain float of this quantity kind is taken to be in.

    Parameters
    ----------
    kind : QuantityKind
        The quantity kind.

    Returns
    -------
    str
        The pint spelling of the unit a plain number of this kind is taken to be in.

    Raises
    ------
    ValueError
        An unknown kind.

    Examples
    --------
    >>> internal_unit("speed"), internal_unit("frequency"), internal_unit("stiffness")
    ('rpm', 'Hz', 'N/m')
    """
    if kind not in _DISPLAY:
        raise ValueError(f"kind: got {kind!r}; expected one of {sorted(_DISPLAY)}")
    return _DISPLAY[kind][0]


def display_unit(kind: QuantityKind, system: UnitSystem = "SI") -> tuple[str, float]:
    """Return the display unit of a quantity kind and the factor to reach it.

    Parameters
    ----------
    kind : str
        Any :data:`QuantityKind` (``mass``, ``stiffness``, ``frequency``,
        ``stress``, ``torque``...).
    system : {"SI", "US"}
        SI (metric) or US customary display.

    Returns
    -------
    unit : str
        The display unit's label (``"µm"``, ``"mil"``, ``"lbf/in"``...).
    factor : float
        Multiply a value in the package's internal unit by this to display it.

    Raises
    ------
    ValueError
        An unknown kind or unit system.

    Examples
    --------
    >>> display_unit("displacement", "US")[0]
    'mil'
    >>> round(display_unit("displacement", "US")[1], 3)
    39370.079
    """
    internal = internal_unit(kind)
    if system not in UNIT_SYSTEMS:
        raise ValueError(f"system: got {system!r}; expected 'SI' or 'US'")
    _, si, us = _DISPLAY[kind]
    unit = si if system == "SI" else us
    factor = float(ureg.Quantity(1.0, internal).to(unit).magnitude)
    return _LABELS.get(unit, unit), factor
