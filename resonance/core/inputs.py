"""Conversion of user input to the package's internal SI floats, with checks.

Every public function passes its arguments through :func:`as_si` (scalars) or
:func:`as_si_array` (arrays), which accept a pint quantity of the package
registry in any unit of the right dimension, or a plain number in the package
convention (SI base units; frequencies in Hz; shaft speeds in rpm). Errors
name the parameter, the value and what is allowed. Values outside the range
this tool accepts for their kind (``PLAUSIBLE``: a stiffness of 1e-300 N/m is
a typing error, not a support) are refused too.

Text with a unit, as scenario and measurement files carry it, is read by
:func:`parse_quantity` exactly or refused. The grammar (no expression is
evaluated)::

    value   = number [space] unit | number
    number  = [+|-] digits [. digits] [(e|E) [+|-] digits]     (also .5 and 5.)
    unit    = factor { ("*" | "/" | "·" | " ") factor }
    factor  = name [("**" | "^") [-] digits]
    name    = letters (and µ, °, %, _), starting with a letter, µ, ° or %

so ``"4200 kg"``, ``"1.5 kN/mm"``, ``"-3e-2 lbf*s/in"``, ``"62 kg*m**2"`` are read,
and ``"4 200 kg"``, ``"4,200 kg"``, ``"1,5 kN/mm"``, ``"4_200 kg"``, ``"kg"``,
``"2 3 kg"``, ``"2*3 kg"`` and ``"10**10**10 kg"`` are refused.
"""

from __future__ import annotations

import math
import re
from collections.abc import Sequence
from typing import Literal

import numpy as np
import pint

from .errors import InputTypeError, InputValueError
from .units import QuantityKind, internal_unit, ureg

__all__ = [
    "NUMBER_TEXT",
    "PLAUSIBLE",
    "Sign",
    "as_matrix",
    "as_si",
    "as_si_array",
    "check_parts",
    "parse_quantity",
    "parse_unit",
]

Sign = Literal["positive", "nonnegative", "any"]

#: The magnitudes this tool accepts for each kind of input, in its internal unit (values of 0 are left to the
#: sign check). Far wider than any machine, they catch typing errors (1e-300, 1e300) before the linear algebra.
PLAUSIBLE: dict[str, tuple[float, float]] = {
    "mass": (1e-9, 1e10),
    "stiffness": (1e-3, 1e16),
    "damping": (1e-9, 1e14),
    "frequency": (1e-6, 1e7),
    "speed": (1e-3, 1e7),
    "length": (1e-9, 1e5),
    "balance_grade": (1e-3, 1e5),
    "unbalance": (1e-15, 1e4),
    "inertia": (1e-12, 1e12),
    "density": (1e-9, 1e6),
    "pressure": (1.0, 1e13),
    "stress": (1e-3, 1e13),
    "moment_stiffness": (1e-6, 1e14),
    "moment_damping": (1e-9, 1e12),
    "area": (1e-12, 1e4),
    "second_moment": (1e-24, 1e6),
    "force": (1e-12, 1e12),
}

_NUMBER = r"[+-]?(?:\d+(?:\.\d*)?|\.\d+)(?:[eE][+-]?\d+)?"
_NAME = r"[A-Za-zµμ°%][A-Za-z_µμ°%]*"
_FACTOR = rf"{_NAME}(?:\s*(?:\*\*|\^)\s*-?\d+)?"
_UNIT = rf"{_FACTOR}(?:\s*[*/·]\s*{_FACTOR}|\s+{_FACTOR})*"
#: One plain number as the grammar above writes it (for measurement files).
NUMBER_TEXT = re.compile(_NUMBER, re.ASCII)  # ASCII digits only: float() also reads other scripts' digits
_VALUE = re.compile(rf"\s*(?P<number>{_NUMBER})\s*(?P<unit>{_UNIT})?\s*", re.ASCII)
_UNIT_ONLY = re.compile(rf"\s*{_UNIT}\s*", re.ASCII)


def _text_hint(text: str) -> str:
    if re.search(r"\d[ ,'_]\d{3}(?!\d)", text):
        return "digit groups are not allowed: write 4200 kg, not 4 200 kg or 4,200 kg"
    if re.search(r"\d,\d", text):
        return "a decimal comma is not allowed: write 1.5 kN/mm, not 1,5 kN/mm"
    if not re.match(rf"\s*{_NUMBER}", text):
        return "the number is missing: write a number and a unit, e.g. 4200 kg"
    return "write one number and a unit, e.g. 4200 kg or 1.5 kN/mm (no arithmetic, no second number)"


def parse_unit(text: str, name: str) -> pint.Unit:
    """A unit written as text, read by the grammar of :func:`parse_quantity` or refused.

    Parameters
    ----------
    text : str
        A unit as written, e.g. ``"um"``, ``"lbf/in"``, ``"m/s**2"``.
    name : str
        The field, for error messages.

    Returns
    -------
    pint.Unit
        A unit of the package registry.

    Raises
    ------
    InputValueError
        The text is not a unit of the package registry.
    """
    if not isinstance(text, str) or not _UNIT_ONLY.fullmatch(text):
        raise InputValueError(f"{name}: got {text!r}, which is not a unit; write e.g. um, mm/s, m/s**2 or lbf/in")
    try:
        return ureg.Unit(text.strip().replace("·", "*").replace("^", "**"))
    except (pint.errors.UndefinedUnitError, pint.errors.DefinitionSyntaxError, AttributeError, TypeError, ValueError):
        raise InputValueError(f"{name}: got {text!r}, which is not a known unit") from None


def parse_quantity(text: str, name: str) -> pint.Quantity | float:
    """Read a value written as text: one number and a unit, exactly, or refuse it.

    Parameters
    ----------
    text : str
        For example ``"4200 kg"``, ``"1.5 kN/mm"``, ``"1800 rpm"``, ``"2 mil"``.
    name : str
        The field, for error messages.

    Returns
    -------
    pint.Quantity or float
        A quantity of the package registry; a plain float when no unit is written.

    Raises
    ------
    InputValueError
        Digit groups, a decimal comma, no number, two numbers, arithmetic, an
        unknown unit, or a number too large for a float; the message shows the
        text and how to write it.

    Examples
    --------
    >>> parse_quantity("1.5 kN/mm", "k").to("N/m").magnitude
    1500000.0
    >>> parse_quantity("1,5 kN/mm", "k")
    Traceback (most recent call last):
    ...
    resonance.core.errors.InputValueError: k: got '1,5 kN/mm'; a decimal comma is not allowed: write 1.5 kN/mm, ...
    """
    if not isinstance(text, str):
        raise InputTypeError(f"{name}: got {text!r}; expected text with a number and a unit")
    match = _VALUE.fullmatch(text)
    if match is None:
        raise InputValueError(f"{name}: got {text!r}; {_text_hint(text)}")
    text_number = match["number"]
    # Whole numbers stay whole, so messages echo them as written ("900 kg", not "900.0 kg").
    number: float = int(text_number) if re.fullmatch(r"[+-]?\d{1,15}", text_number) else float(text_number)
    if not math.isfinite(number):
        raise InputValueError(f"{name}: got {text!r}, a number too large for this tool; expected a finite value")
    if match["unit"] is None:
        return number
    try:
        unit = parse_unit(match["unit"], name)
    except InputValueError:
        raise InputValueError(f"{name}: got {text!r}, whose unit {match['unit']!r} is not a known unit") from None
    return ureg.Quantity(number, unit)


def _magnitude(value: object, name: str, kind: QuantityKind) -> np.ndarray:
    unit = internal_unit(kind)
    if isinstance(value, pint.Quantity):
        if value._REGISTRY is not ureg:
            raise InputTypeError(
                f"{name}: got a quantity from another pint registry ({value!r}); "
                "build quantities with resonance.ureg, whose rpm, cpm and mil are "
                "the machinery units"
            )
        if value.dimensionality != ureg.Unit(unit).dimensionality:
            raise InputTypeError(
                f"{name}: got {value:~P}, which is not a {kind.replace('_', ' ')}; expected a "
                f"quantity convertible to {unit} or a plain number in {unit}"
            )
        value = value.to(unit).magnitude
    if isinstance(value, (str, bytes)):
        raise InputTypeError(
            f"{name}: got the text {value!r}; expected a number in {unit} or a resonance.ureg quantity"
        )
    try:
        array = np.asarray(value, dtype=float)
    except OverflowError:
        raise InputValueError(f"{name}: got a number too large for this tool; expected a finite value") from None
    except (TypeError, ValueError):
        raise InputTypeError(
            f"{name}: got {value!r} of type {type(value).__name__}; expected a "
            f"number in {unit} or a resonance.ureg quantity"
        ) from None
    return array


def _check(array: np.ndarray, name: str, kind: QuantityKind, sign: Sign, plausible: bool = True) -> None:
    unit = internal_unit(kind)
    unit = "" if unit == "dimensionless" else f" {unit}"
    if not np.all(np.isfinite(array)):
        bad = array[~np.isfinite(array)].flat[0]
        raise InputValueError(f"{name}: got {bad}{unit}; expected a finite number")
    if sign == "positive" and np.any(array <= 0.0):
        bad = array[array <= 0.0].flat[0]
        raise InputValueError(f"{name}: got {bad:g}{unit}; expected a value > 0")
    if sign == "nonnegative" and np.any(array < 0.0):
        bad = array[array < 0.0].flat[0]
        raise InputValueError(f"{name}: got {bad:g}{unit}; expected a value >= 0")
    if plausible and kind in PLAUSIBLE:
        low, high = PLAUSIBLE[kind]
        size = np.abs(array)
        outside = (size != 0.0) & ((size < low) | (size > high))
        if np.any(outside):
            bad = array[outside].flat[0]
            raise InputValueError(
                f"{name}: got {bad:g}{unit}, outside the range this tool accepts for a {kind.replace('_', ' ')} "
                f"({low:g} to {high:g}{unit} in magnitude)"
            )


def as_si(value: object, name: str, kind: QuantityKind, sign: Sign = "any") -> float:
    """Convert one scalar input to a float in the package convention.

    Parameters
    ----------
    value : float or pint.Quantity
        The user's value: a plain number in the package convention or a
        quantity of :data:`resonance.ureg`.
    name : str
        The parameter's name, used in error messages.
    kind : str
        The quantity kind (see :func:`resonance.core.units.internal_unit`).
    sign : {"positive", "nonnegative", "any"}
        The allowed sign.

    Returns
    -------
    float
        The value in the internal unit of ``kind``.

    Raises
    ------
    InputTypeError
        Wrong type, wrong dimension, or not a scalar.
    InputValueError
        NaN, infinite, or of the wrong sign.

    Examples
    --------
    >>> as_si(ureg("3600 rpm"), "speed", "frequency")
    60.0
    """
    array = _magnitude(value, name, kind)
    if array.ndim != 0:
        raise InputTypeError(f"{name}: got an array of shape {array.shape}; expected a scalar")
    _check(array, name, kind, sign)
    return float(array)


def as_si_array(value: object, name: str, kind: QuantityKind, sign: Sign = "any") -> np.ndarray:
    """Convert a scalar or array input to a float array (at least 1-D).

    Same parameters, conversion and checks as :func:`as_si`; an empty array
    is an error.

    Parameters
    ----------
    value : array_like or pint.Quantity
        One value or a 1-D sequence, plain numbers in the package convention or a quantity.
    name : str
        The parameter's name, for error messages.
    kind : QuantityKind
        The quantity kind (see :func:`resonance.core.units.internal_unit`).
    sign : {"positive", "nonnegative", "any"}
        The allowed sign.

    Returns
    -------
    numpy.ndarray
        The values in the internal unit of ``kind``, at least 1-D.

    Raises
    ------
    InputValueError
        Empty, non-finite, of the wrong sign, or implausible for the kind (speeds and frequencies excepted:
        they are sweep axes).
    InputTypeError
        Text, a quantity of another dimension or registry, or more than one dimension.
    """
    array = np.atleast_1d(_magnitude(value, name, kind))
    if array.size == 0:
        raise InputValueError(f"{name}: got an empty array; expected at least one value")
    if array.ndim != 1:
        raise InputTypeError(f"{name}: got an array of shape {array.shape}; expected 1-D")
    # Frequency and speed arrays are axes of a sweep, which may pass close to 0; parameters are checked.
    _check(array, name, kind, sign, plausible=kind not in ("frequency", "speed"))
    return array


def as_matrix(value: object, name: str, kind: QuantityKind, size: int | None = None) -> np.ndarray:
    """Convert a square matrix input (plain or pint) to a float array.

    Parameters
    ----------
    value : array_like or pint.Quantity
        The matrix.
    name : str
        The parameter's name, used in error messages.
    kind : str
        The quantity kind of its entries.
    size : int, optional
        The required number of rows and columns.

    Returns
    -------
    numpy.ndarray
        The symmetric matrix (symmetrized to round-off) in the internal unit of ``kind``.

    Raises
    ------
    InputValueError
        Not square, wrong size, non-finite entries, or not symmetric.
    """
    array = _magnitude(value, name, kind)
    if array.ndim != 2 or array.shape[0] != array.shape[1]:
        raise InputValueError(f"{name}: got shape {array.shape}; expected a square matrix")
    if size is not None and array.shape[0] != size:
        raise InputValueError(f"{name}: got shape {array.shape}; expected ({size}, {size}) to match the mass matrix")
    _check(array, name, kind, "any")
    scale = max(float(np.abs(array).max()), np.finfo(float).tiny)
    asymmetry = float(np.abs(array - array.T).max()) / scale
    if asymmetry > 1e-10:
        raise InputValueError(
            f"{name}: the matrix is not symmetric (largest |A - A.T| / max|A| = "
            f"{asymmetry:.3g}); expected a symmetric matrix"
        )
    return 0.5 * (array + array.T)


def check_parts(**parts: tuple[object, type]) -> None:
    """Refuse a model's parts that are not a list of the expected class (``name=(items, Class)``).

    Parameters
    ----------
    **parts : tuple of (object, type)
        Each parameter's value and the class its items must be.

    Returns
    -------
    None

    Raises
    ------
    InputTypeError
        Text or a non-sequence where a list is expected, or an item of another class, naming the parameter
        (and the item's index).

    Examples
    --------
    >>> check_parts(stations=([1.0], float))
    """
    for name, (items, kind) in parts.items():
        if isinstance(items, (str, bytes)) or not isinstance(items, Sequence):
            raise InputTypeError(f"{name}: got {items!r}; expected a list of {kind.__name__}")
        for i, item in enumerate(items):
            if not isinstance(item, kind):
                raise InputTypeError(f"{name}[{i}]: got {item!r}; expected a {kind.__name__}")
