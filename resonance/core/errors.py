"""Exceptions raised for bad input.

Every error names the parameter (or file field), the value received and what
is allowed, so that a user can fix the input without reading the code.
"""

from __future__ import annotations

__all__ = ["InputTypeError", "InputValueError"]


class InputValueError(ValueError):
    """A value is outside what the parameter allows (sign, range, shape)."""


class InputTypeError(TypeError):
    """A value has the wrong type or the wrong physical dimension."""
