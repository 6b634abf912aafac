"""The committed notebooks are what the notebook builder writes: the builder is their one source.

Compares each committed notebook's cells (type and source, in order) with ``tools/build_notebooks.py``;
outputs are left to nbval, which re-runs the notebooks. A regression guard of the project's own process.
"""

from __future__ import annotations

import importlib.util
from pathlib import Path

import nbformat
import pytest

ROOT = Path(__file__).resolve().parent.parent
spec = importlib.util.spec_from_file_location("build_notebooks", ROOT / "tools" / "build_notebooks.py")
builder = importlib.util.module_from_spec(spec)
spec.loader.exec_module(builder)


@pytest.mark.parametrize("name", sorted(builder.NOTEBOOKS))
def test_committed_notebook_matches_the_builder(name):
    committed = nbformat.read(ROOT / "notebooks" / name, as_version=4)
    expected = [(c["cell_type"], c["source"].rstrip()) for c in builder.NOTEBOOKS[name]]
    assert [(c["cell_type"], c["source"]) for c in committed.cells] == expected


def test_every_notebook_comes_from_the_builder():
    assert sorted(p.name for p in (ROOT / "notebooks").glob("*.ipynb")) == sorted(builder.NOTEBOOKS)
