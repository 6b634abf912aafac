"""Lazy namespaces (PEP 562): a package's public names, each loaded from its module on first use.

The top-level ``resonance`` namespace and the rotor kind's use it, so that importing them (and
``python -m resonance --help``) loads nothing heavy. Imports only the standard library.
"""

from __future__ import annotations

import importlib
import importlib.util
from collections.abc import Callable, Mapping
from typing import Any

__all__ = ["lazy_names"]


def lazy_names(
    package: str, names: Mapping[str, str], namespace: dict[str, Any], layers: bool = False
) -> tuple[Callable[[str], Any], Callable[[], list[str]]]:
    """A package's ``__getattr__`` and ``__dir__`` that load each name from its module when first asked for.

    Parameters
    ----------
    package : str
        The package's ``__name__``.
    names : mapping of str to str
        Each public name and the module (relative to the package) it lives in.
    namespace : dict
        The package's ``globals()``: a name once loaded is kept there, so later look-ups skip ``__getattr__``.
    layers : bool
        Also give the package's sub-packages and modules as attributes (``resonance.checks``).

    Returns
    -------
    (callable, callable)
        The module's ``__getattr__`` and ``__dir__``.

    Raises
    ------
    Nothing
        The returned ``__getattr__`` raises ``AttributeError`` for a name neither in ``names`` nor a submodule.
    """

    def load(name: str) -> Any:
        module = names.get(name)
        if module is None:
            if layers and not name.startswith("_") and importlib.util.find_spec(f"{package}.{name}") is not None:
                return importlib.import_module(f".{name}", package)
            raise AttributeError(f"module {package!r} has no attribute {name!r}")
        value = getattr(importlib.import_module(f".{module}", package), name)
        namespace[name] = value
        return value

    def listing() -> list[str]:
        return sorted({*namespace, *names})

    return load, listing
