"""Every public name is documented the numpydoc way, checked with numpydoc's own parser.

Functions: Parameters (when they take any), Returns (when they return something) and Raises. Classes
with fields or constructor arguments: Attributes or Parameters. A regression guard of the project's style
(STYLE.md: numpydoc docstrings with units); no outside source.
"""

from __future__ import annotations

import dataclasses
import importlib
import inspect
import pkgutil

import pytest
from numpydoc.docscrape import ClassDoc, FunctionDoc

import resonance


def _public() -> list[tuple[str, object]]:
    out = []
    for info in pkgutil.walk_packages(resonance.__path__, "resonance."):
        if info.name.endswith("__main__"):
            continue
        module = importlib.import_module(info.name)
        for name in getattr(module, "__all__", []):
            obj = getattr(module, name)
            if getattr(obj, "__module__", None) != module.__name__ or getattr(obj, "__name__", name) != name:
                continue  # re-exports and aliases are checked where they are defined
            if inspect.isfunction(obj) or (inspect.isclass(obj) and not issubclass(obj, Exception)):
                out.append((f"{module.__name__}.{name}", obj))
    return out


PUBLIC = _public()


def _lacks(obj: object) -> list[str]:
    if inspect.isclass(obj):
        fields = dataclasses.fields(obj) if dataclasses.is_dataclass(obj) else ()
        init = obj.__init__ is not object.__init__ and [
            p for p in inspect.signature(obj.__init__).parameters if p not in ("self", "args", "kwargs")
        ]
        if hasattr(obj, "_fields") or inspect.isabstract(obj) or getattr(obj, "_is_protocol", False):
            return []  # named tuples and protocols document their members
        doc = ClassDoc(obj, config={"show_class_members": False})
        return ["Attributes or Parameters"] if (fields or init) and not (doc["Attributes"] or doc["Parameters"]) else []
    doc = FunctionDoc(obj)
    signature = inspect.signature(obj)
    lacks = []
    if [p for p in signature.parameters if p != "self"] and not doc["Parameters"]:
        lacks.append("Parameters")
    if signature.return_annotation not in (None, "None", inspect.Signature.empty) and not doc["Returns"]:
        lacks.append("Returns")
    if not doc["Raises"]:
        lacks.append("Raises")
    return lacks


def test_there_are_public_names_to_check():
    assert len(PUBLIC) > 150


@pytest.mark.parametrize(("name", "obj"), PUBLIC, ids=[name for name, _ in PUBLIC])
def test_public_name_is_documented(name, obj):
    assert _lacks(obj) == [], f"{name} lacks numpydoc sections"
