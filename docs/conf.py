"""Sphinx configuration: the API reference (autodoc, autosummary, numpydoc) and the notebooks as pages.

Build offline, warnings as errors (CI does): ``python -m sphinx -W -b html docs docs/_build``.
"""

from __future__ import annotations

import shutil
import sys
from pathlib import Path

ROOT = Path(__file__).resolve().parent.parent
sys.path.insert(0, str(ROOT))

from resonance import __version__  # noqa: E402

project = "resonance"
author = "the resonance developers"
release = version = __version__
extensions = ["sphinx.ext.autodoc", "sphinx.ext.autosummary", "numpydoc", "myst_nb"]
autosummary_generate = True
autodoc_typehints = "none"  # numpydoc's Parameters sections carry types and units
numpydoc_show_class_members = False
numpydoc_class_members_toctree = False
numpydoc_xref_param_type = False
nb_execution_mode = "off"  # nbval runs the notebooks; the pages show their committed outputs
html_theme = "pydata_sphinx_theme"
html_theme_options = {"navigation_with_keys": False}
exclude_patterns = ["_build", "screenshots", "jupyter_execute"]
# Module notes list their sources under References without in-text markers (a deliberate style);
# widget views render only in a live kernel.
suppress_warnings = ["ref.citation", "mystnb.unknown_mime_type"]

# The notebooks live in notebooks/ (the suite users open); the pages use a copy made at each build.
pages = Path(__file__).resolve().parent / "notebooks"
shutil.rmtree(pages, ignore_errors=True)
pages.mkdir()
for notebook in sorted((ROOT / "notebooks").glob("*.ipynb")):
    shutil.copy(notebook, pages / notebook.name)
