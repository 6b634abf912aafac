"""Every public function documents Parameters, Returns and Raises (numpydoc), checked with numpydoc's parser.

The names still short of it in this version are listed in ``tests/docstring_debt.txt`` with the sections
they lack; the list may only shrink: a new public name without the sections fails, and so does a listed
name that has been documented but not struck from the list. A regression guard of the project's style.
"""

from __future__ import annotations

import importlib
import inspect
import pkgutil
from pathlib import Path

from numpydoc.docscrape import FunctionDoc

import resonance

DEBT = Path(__file__).resolve().parent / "docstring_debt.txt"


def missing_sections() -> dict[str, list[str]]:
    out: dict[str, list[str]] = {}
    for info in pkgutil.walk_packages(resonance.__path__, "resonance."):
        if info.name.endswith("__main__"):
            continue
        module = importlib.import_module(info.name)
        for name in getattr(module, "__all__", []):
            obj = getattr(module, name)
            if not inspect.isfunction(obj) or obj.__module__ != module.__name__ or obj.__name__ != name:
                continue  # classes are documented by their attributes; aliases by their target
            doc = FunctionDoc(obj)
            signature = inspect.signature(obj)
            lacks = []
            if [p for p in signature.parameters if p != "self"] and not doc["Parameters"]:
                lacks.append("Parameters")
            if signature.return_annotation not in (None, "None", inspect.Signature.empty) and not doc["Returns"]:
                lacks.append("Returns")
            if not doc["Raises"]:
                lacks.append("Raises")
            if lacks:
                out[f"{module.__name__}.{name}"] = lacks
    return out


def _debt() -> dict[str, list[str]]:
    lines = [line.split() for line in DEBT.read_text().splitlines() if line.strip() and not line.startswith("#")]
    return {parts[0]: parts[1:] for parts in lines}


def test_no_new_public_function_without_parameters_returns_and_raises():
    new = {k: v for k, v in missing_sections().items() if k not in _debt() or set(v) - set(_debt()[k])}
    assert new == {}, "document these (numpydoc sections)"


def test_the_debt_list_only_shrinks():
    paid = {k for k, v in _debt().items() if missing_sections().get(k, []) != v}
    assert paid == set(), "these are documented now: strike or update them in tests/docstring_debt.txt"
