"""The package's shape: imports only go down the layers, and no module uses another's private names.

The layers are those of DEVELOPERS.md (units < physics < checks < field data < scenario and record <
presentation < commands); a module may import its own layer and those below. A regression guard of the project's
own design, no outside source.
"""

from __future__ import annotations

import ast
from pathlib import Path

import pytest

PACKAGE = Path(__file__).resolve().parent.parent / "resonance"

LAYERS = {
    1: ("core.errors", "core.units", "core.inputs", "_version", "core.threads", "core.executors"),
    2: (
        "dynamics.sdof",
        "dynamics.harmonic",
        "dynamics.damping",
        "dynamics.model",
        "dynamics.lumped",
        "dynamics.modes",
        "dynamics.frf",
        "kinds.torsion.train",
        "dynamics.batch",
        "kinds.space.frame",
        "kinds.space.bodies",
        "kinds.space.soil",
        "kinds.rotor.elements",
        "kinds.rotor.model",
        "kinds.rotor.analysis",
    ),
    3: (
        "checks.excitations",
        "checks.speed_range",
        "checks.margins",
        "checks.rules",
        "checks.interference",
        "checks.limits",
    ),
    4: ("kinds.field.readers", "kinds.field.impact", "kinds.field.coastdown", "kinds.field.tuning"),
    5: (
        "records.tables",
        "kinds.support.scenario",
        "kinds.support.study",
        "studies.registry",
        "kinds.torsion.study",
        "kinds.space.study",
        "kinds.support.variants",
        "studies.uncertainty",
        "kinds.support.whatif",
        "records.record",
        "records.compare",
        "kinds.rotor.scenario",
        "kinds.rotor.study",
        "kinds.rotor.record",
        "kinds.field.study",
    ),
    7: (
        "cli",
        "__main__",
        "studies.fleet",
    ),  # the commands sit on top: the HTML record comes from the presentation layer
    6: (
        "ui.plots",
        "ui.rotor_plots",
        "ui.field_plots",
        "ui.torsion_plots",
        "ui.uncertainty_plots",
        "ui.space_plots",
        "ui.widgets",
        "ui.panels",
        "ui.rotor_panel",
        "ui.field_panel",
        "ui.torsion_panel",
        "ui.uncertainty_panel",
        "ui.space_panel",
        "ui.report",
    ),
}
RANK = {name: rank for rank, names in LAYERS.items() for name in names}


def _modules() -> list[tuple[str, Path]]:
    out = []
    for path in sorted(PACKAGE.rglob("*.py")):
        parts = path.relative_to(PACKAGE).with_suffix("").parts
        if parts[-1] == "__init__":
            continue
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


def test_every_module_has_a_layer():
    assert {name for name, _ in _modules()} - set(RANK) == set()


@pytest.mark.parametrize(("name", "path"), _modules(), ids=[n for n, _ in _modules()])
def test_imports_go_down_the_layers_and_use_public_names(name, path):
    for target, names in _imports(name, path):
        if target not in RANK:
            continue  # a package __init__
        assert RANK[target] <= RANK[name], f"{name} (layer {RANK[name]}) imports {target} (layer {RANK[target]})"
        private = [n for n in names if n.startswith("_") and not n.startswith("__")]
        assert not private, f"{name} imports private names {private} from {target}"
