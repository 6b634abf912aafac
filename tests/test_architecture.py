"""The package's shape: imports go down the layers, kinds stay apart, no private names cross, modules stay small.

The layers are those of DEVELOPERS.md, one sub-package each: core < dynamics < checks < records < kinds <
studies < ui < the commands (fleet, cli). A module may import its own layer and those below. Inside ``kinds`` a
kind imports only itself (field verification also imports the support kind it verifies), and a kind's model
modules import only core, dynamics, checks and the kind's other model modules. The studies layer reaches a kind
only through its ``kind`` module (the registry entry and the protocol), never its internals. A regression guard
of the project's own design, no outside source.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "resonance"

#: The layers, lowest first: a module's layer is its sub-package (or, at the top, its own name).
LAYERS = ("_version", "core", "dynamics", "checks", "records", "kinds", "studies", "ui", "fleet", "cli", "__main__")
RANK = {layer: rank for rank, layer in enumerate(LAYERS)}
#: Each kind's model: the physics of that kind, below its scenario, study and record.
MODELS = {
    "support": (),  # its model is the lumped model of the dynamics layer
    "rotor": ("elements", "model", "analysis", "criticals", "response"),
    "torsion": ("train", "elements", "response"),
    "space": ("bodies", "frame", "soil", "modes", "response"),
    "field": ("readers", "impact", "coastdown", "tuning"),
}
#: A kind may import another only where it verifies it; a kind's entry (its ``kind`` module) also runs the
#: verification that sits beside it.
VERIFIES = {"field": ("support",)}
VERIFIED_BY = {"support": ("field",)}
MAX_LINES = 600
#: Modules still being split in this series of commits (empty when the series ends).
TO_SPLIT = {
    "kinds.rotor.analysis",
    "kinds.space.bodies",
    "kinds.space.scenario",
    "records.tables",
    "studies.uncertainty",
}
#: Arrows still being removed in this series of commits (empty when the series ends).
TO_REMOVE = {("fleet", "ui.report")}


def _modules() -> list[tuple[str, Path]]:
    out = []
    for path in sorted(PACKAGE.rglob("*.py")):
        parts = path.relative_to(PACKAGE).with_suffix("").parts
        out.append((".".join(parts), path))
    return out


def _imports(name: str, path: Path) -> list[tuple[str, list[str]]]:
    """(imported module inside the package, names imported) for each relative import."""
    package = name.split(".")[:-1]
    out = []
    for node in ast.walk(ast.parse(path.read_text())):
        if isinstance(node, ast.ImportFrom) and node.level > 0:
            base = package[: len(package) - (node.level - 1)]
            target = ".".join([*base, *(node.module.split(".") if node.module else [])])
            names = [a.name for a in node.names]
            if node.module is None:  # from . import x: x is a module
                out += [(f"{target}.{n}" if target else n, []) for n in names]
            else:
                out.append((target, names))
    return out


def _layer(name: str) -> str:
    return name.split(".")[0]


def _kind(name: str) -> tuple[str, str] | None:
    parts = name.split(".")
    return (parts[1], parts[-1]) if parts[0] == "kinds" and len(parts) > 2 else None


def test_every_module_has_a_layer():
    assert {_layer(name) for name, _ in _modules()} - set(RANK) == {"__init__"}
    kinds = {k[0] for name, _ in _modules() if (k := _kind(name))}
    assert kinds == set(MODELS)


@pytest.mark.parametrize(("name", "path"), _modules(), ids=[n for n, _ in _modules()])
def test_imports_go_down_the_layers_and_use_public_names(name, path):
    if name == "__init__":
        return  # the lazy namespace names every layer's modules by string
    for target, names in _imports(name, path):
        layer = _layer(target)
        assert RANK[layer] <= RANK[_layer(name)], f"{name} ({_layer(name)}) imports {target} ({layer}), a layer above"
        private = [n for n in names if n.startswith("_") and not n.startswith("__")]
        assert not private, f"{name} imports private names {private} from {target}"


@pytest.mark.parametrize(("name", "path"), [m for m in _modules() if _kind(m[0])], ids=lambda v: str(v))
def test_kinds_stay_apart_and_their_models_import_only_physics(name, path):
    kind, module = _kind(name)  # type: ignore[misc]
    for target, _ in _imports(name, path):
        other = _kind(target)
        if other is not None:
            allowed = (*VERIFIES.get(kind, ()), *(VERIFIED_BY.get(kind, ()) if module == "kind" else ()))
            assert other[0] == kind or other[0] in allowed, f"{name} imports {target}, another kind"
        if module in MODELS[kind]:
            allowed = other is not None and other[0] == kind and other[1] in MODELS[kind]
            assert allowed or _layer(target) in ("core", "dynamics", "checks"), f"the model {name} imports {target}"


@pytest.mark.parametrize(("name", "path"), _modules(), ids=[n for n, _ in _modules()])
def test_every_module_is_under_the_line_limit(name, path):
    lines = len(path.read_text().splitlines())
    assert lines <= MAX_LINES, f"{name}: {lines} lines (limit {MAX_LINES}: split it by concept)"


@pytest.mark.parametrize(("name", "path"), [m for m in _modules() if _layer(m[0]) == "studies"], ids=lambda v: str(v))
def test_the_studies_layer_asks_each_kind_through_its_entry(name, path):
    for target, _ in _imports(name, path):
        kind = _kind(target)
        assert kind is None or kind[1] == "kind", f"{name} imports {target}: ask the kind through its kind module"
