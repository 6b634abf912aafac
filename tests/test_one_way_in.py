"""One way in for every kind of study, and a start that does not pay for what it does not use.

A regression guard of the project's own design (DESIGN: one loader, one run, one panel factory; a lazy
top-level namespace): no outside source. The start-up times themselves are measured by
benchmarks/start_time.py, never by a timed test; here the guard is which modules a start imports.
"""

from __future__ import annotations

import importlib
import re
import subprocess
import sys
from pathlib import Path

import pytest

import resonance as R

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"
KINDS = {
    "cooling_water_pump.toml": ("Scenario", "support"),
    "fan_on_pedestal.toml": ("Scenario", "support"),  # with field data beside the scenario file
    "fan_rotor.toml": ("RotorScenario", "rotor"),
    "compressor_train.toml": ("TorsionScenario", "torsion"),
    "fan_skid_block.toml": ("SpaceScenario", "space"),
}


@pytest.mark.parametrize("name", sorted(KINDS))
def test_load_run_and_panel_for_every_kind(name, monkeypatch, tmp_path):
    monkeypatch.chdir(tmp_path)  # the measurement files are found beside the scenario, not in the cwd
    scenario = R.load(SCENARIOS / name)
    kind, study = KINDS[name]
    assert type(scenario).__name__ == kind
    assert scenario.sha256
    outcome = R.run(scenario)
    assert outcome.kind == study
    assert outcome.record.data["verdict"] == outcome.verdict
    assert outcome.verdict == R.run_scenario_file(SCENARIOS / name).verdict  # the same flow as check
    assert hasattr(R.panel(scenario), "widget")


def test_run_refuses_what_is_not_a_scenario():
    with pytest.raises(R.InputTypeError, match=r"scenario: got dict; expected a scenario of one of the kinds"):
        R.run({"model": {}})
    with pytest.raises(R.InputTypeError, match=r"scenario: got str"):
        R.panel("pump.toml")


def test_the_public_names_of_0_2_stay_importable():
    missing = [name for name in R.__all__ if not hasattr(R, name)]
    assert missing == []
    assert {"load", "run", "panel", "natural_frequency", "load_scenario", "run_study"} <= set(dir(R))
    with pytest.raises(AttributeError, match="has no attribute 'nothing'"):
        R.nothing  # noqa: B018


@pytest.mark.parametrize(
    "code",
    [
        "import resonance",
        "import sys; sys.argv = ['resonance', '--help']\ntry:\n import runpy; runpy.run_module('resonance', "
        "run_name='__main__')\nexcept SystemExit:\n pass",
    ],
    ids=["import", "--help"],
)
def test_a_start_imports_no_numerical_library(code):
    heavy = ["numpy", "scipy", "pint", "plotly", "ipywidgets"]
    probe = f"{code}\nimport sys\nprint([m for m in {heavy!r} if m in sys.modules])"
    out = subprocess.run([sys.executable, "-c", probe], capture_output=True, text=True, check=True).stdout
    assert out.strip().splitlines()[-1] == "[]"


def test_the_layers_are_reachable_as_attributes_in_a_fresh_interpreter():
    # The sub-packages load on first use like the public names (the flat 0.2 modules were eager attributes).
    code = "import resonance as R\nprint(R.checks.__name__, R.kinds.__name__)"
    out = subprocess.run([sys.executable, "-c", code], capture_output=True, text=True, check=True).stdout
    assert out.split() == ["resonance.checks", "resonance.kinds"]


def _moved_paths() -> list[tuple[str, str, str]]:
    text = (Path(__file__).resolve().parent.parent / "CHANGELOG.md").read_text()
    rows = re.findall(r"^\| `(resonance[\w.]*)` \| `(resonance[\w.]*)` \| (.*) \|$", text, flags=re.M)
    assert len(rows) > 40, "the CHANGELOG's table of moved module paths is missing"
    return rows


@pytest.mark.parametrize(("old", "new", "elsewhere"), _moved_paths(), ids=lambda v: v if v.startswith("res") else "")
def test_every_moved_module_path_of_the_changelog_is_where_it_says(old, new, elsewhere):
    # The CHANGELOG is the map from 0.2's module paths to the layers: each new path imports, each old one is gone
    # (or is now a layer's package), and each name the table sends elsewhere is there.
    importlib.import_module(new)
    if old != new:
        try:
            kept = importlib.import_module(old)
        except ModuleNotFoundError:
            pass
        else:  # only a layer's package may now have the old name (resonance.studies)
            assert hasattr(kept, "__path__"), f"{old} still imports as the module of 0.2"
    for names, target in re.findall(r"((?:`\w+`(?:, )?)+) -> `([\w.]+)`", elsewhere):
        there = importlib.import_module(f"resonance.{target}")
        for name in re.findall(r"`(\w+)`", names):
            assert hasattr(there, name), f"{name} is not in resonance.{target}"
