"""Conversion of user input to the package's internal SI floats, with checks.

Every public function passes its arguments through :func:`as_si` (scalars) or
:func:`as_si_array` (arrays), which accept a pint quantity of the package
registry in any unit of the right dimension, or a plain number in the package
convention (SI base units; frequencies in Hz; shaft speeds in rpm). Errors
name the parameter, the value and what is allowed.
"""

from __future__ import annotations

from typing import Literal

import numpy as np
import pint

from .errors import InputTypeError, InputValueError
from .units import internal_unit, ureg

__all__ = ["Sign", "as_matrix", "as_si", "as_si_array"]

Sign = Literal["positive", "nonnegative", "any"]


def _magnitude(value: object, name: str, kind: str) -> np.ndarray:
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
                f"{name}: got {value:~P}, which is not a {kind}; expected a "
                f"quantity convertible to {unit} or a plain number in {unit}"
            )
        value = value.to(unit).magnitude
    if isinstance(value, (str, bytes)):
        raise InputTypeError(
            f"{name}: got the text {value!r}; expected a number in {unit} or a resonance.ureg quantity"
        )
    try:
        array = np.asarray(value, dtype=float)
    except (TypeError, ValueError):
        raise InputTypeError(
            f"{name}: got {value!r} of type {type(value).__name__}; expected a "
            f"number in {unit} or a resonance.ureg quantity"
        ) from None
    return array


def _check(array: np.ndarray, name: str, kind: str, sign: Sign) -> None:
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


def as_si(value: object, name: str, kind: str, sign: Sign = "any") -> float:
    """Convert one scalar input to a float in the package convention.

    Parameters
    ----------
    value : float or pint.Quantity
        The user's value: a plain number in the package convention or a
        quantity of :data:`resonance.ureg`.
    name : str
        The parameter's name, used in error messages.
    kind : str
        The quantity kind (see :func:`resonance.units.internal_unit`).
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


def as_si_array(value: object, name: str, kind: str, sign: Sign = "any") -> np.ndarray:
    """Convert a scalar or array input to a float array (at least 1-D).

    Same parameters, conversion and checks as :func:`as_si`; an empty array
    is an error.
    """
    array = np.atleast_1d(_magnitude(value, name, kind))
    if array.size == 0:
        raise InputValueError(f"{name}: got an empty array; expected at least one value")
    if array.ndim != 1:
        raise InputTypeError(f"{name}: got an array of shape {array.shape}; expected 1-D")
    _check(array, name, kind, sign)
    return array


def as_matrix(value: object, name: str, kind: str, size: int | None = None) -> np.ndarray:
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
