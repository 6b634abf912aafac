"""Every TOML example the docstrings document is valid TOML 1.0 (an inline table stays on one line).

Source: the TOML 1.0.0 specification (toml.io, "Inline Table": inline tables are intended to appear on a
single line), as Python's tomllib reads it; the README's examples are checked in tests/test_readme.py.
"""

from __future__ import annotations

import importlib
import re

import pytest
import tomllib

#: Each kind's scenario module documents its tables; so do the uncertainty and field tables.
MODULES = [
    *(f"resonance.kinds.{kind}.scenario" for kind in ("support", "rotor", "torsion", "space")),
    "resonance.studies.uncertainty",
    "resonance.kinds.field.study",
]


def _blocks(module: str) -> list[str]:
    doc = importlib.import_module(module).__doc__ or ""
    return ["\n".join(line[4:] for line in b.splitlines()) for b in re.findall(r"::\n\n((?:    .*\n|\n)+)", doc)]


@pytest.mark.parametrize("module", MODULES)
def test_docstring_examples_are_toml(module):
    blocks = _blocks(module)
    assert blocks, f"{module} documents no example"
    for text in blocks:
        tomllib.loads(text)


def test_a_multiline_inline_table_is_refused_saying_why(tmp_path):
    from resonance.records.tables import ScenarioError, read_scenario_file

    path = tmp_path / "wrapped.toml"
    path.write_text('[torsion]\nstations = [\n  { name = "a",\n    inertia = "1 kg*m**2" },\n]\n')
    with pytest.raises(ScenarioError, match=r"TOML 1\.0 keeps an inline table \{ \.\.\. \} on one line"):
        read_scenario_file(path)


def test_a_number_too_long_to_read_is_refused(tmp_path):
    from resonance.records.tables import ScenarioError, read_scenario_file

    path = tmp_path / "long.toml"
    path.write_text("[speed]\nmin = " + "1" * 5000 + "\n")
    with pytest.raises(ScenarioError, match=r"long\.toml: holds a number too long to read"):
        read_scenario_file(path)


def test_the_torsional_docstring_example_is_a_train_the_parser_accepts():
    from resonance.kinds.torsion.scenario import parse_torsion_scenario

    tables = tomllib.loads(_blocks("resonance.kinds.torsion.scenario")[0])
    tables["scenario"] = {"title": "documented train"}
    scenario = parse_torsion_scenario(tables, "doc.toml")
    assert scenario.train.speed_ratio == {"driver": 1.0, "hs": 3.2}  # 96 / 30 teeth
    assert "lobe pass" in {e.label for e in scenario.excitations}
