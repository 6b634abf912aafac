"""A fixed-speed machine (speed.min = speed.max) runs through every kind, with its what-if sections.

Sources: the separation margin from a single operating speed N, SM = 100 |N - N_c| / N, the API RP 684
form with N_min = N_max (from memory); the natural frequency of one mass on a spring f = sqrt(k / m) / 2 pi
(Rao, Mechanical Vibrations, 6th ed., sec. 2.2). The scenarios are the invented demos at one speed.
"""

from __future__ import annotations

import json
import math
import re
from pathlib import Path

import pytest
from numpy.testing import assert_allclose

from resonance.cli import main

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


def _fixed(name: str, tmp_path: Path, speed: float | None = None) -> Path:
    text = (SCENARIOS / name).read_text()
    top = float(re.search(r'^max = "([0-9.]+) rpm"', text, re.MULTILINE).group(1))  # type: ignore[union-attr]
    n = top if speed is None else speed
    text = re.sub(r'^(min|max) = "[0-9.]+ rpm"', lambda m: f'{m.group(1)} = "{n:g} rpm"', text, flags=re.MULTILINE)
    text = text.replace('"data/', f'"{(SCENARIOS.parent / "data").as_posix()}/')
    path = tmp_path / name
    path.write_text(text)
    return path


@pytest.mark.parametrize(
    "name",
    [
        "cooling_water_pump.toml",
        "feed_pump_foundation.toml",  # a tolerance band and an [uncertainty] table
        "fan_rotor.toml",
        "compressor_train.toml",
        "fan_skid_block.toml",
    ],
)
def test_every_kind_checks_a_fixed_speed_machine(tmp_path, capsys, name):
    path = _fixed(name, tmp_path)
    code = main(["check", str(path), "--json", str(tmp_path / "r.json")])
    captured = capsys.readouterr()
    assert code in (0, 1), captured.err
    assert "fixed speed" in captured.out
    assert json.loads((tmp_path / "r.json").read_text())["verdict"] in ("PASS", "FAIL", "PASS WITH EXEMPTION")


def test_a_fixed_speed_margin_and_its_fixes(tmp_path, capsys):
    # The pump's one mode on its skid, 2x at a fixed 1200 rpm.
    path = _fixed("cooling_water_pump.toml", tmp_path, 1200.0)
    assert main(["check", str(path), "--json", str(tmp_path / "r.json")]) == 1
    out = capsys.readouterr().out
    data = json.loads((tmp_path / "r.json").read_text())
    m, k = 1850.0, 115e6  # the scenario's pump mass [kg] and skid stiffness [N/m]
    f_n = math.sqrt(k / m) / (2 * math.pi)
    row = next(r for r in data["findings"] if r["excitation"] == "2x")
    assert_allclose(row["coincidence_speed_rpm"], 60 * f_n / 2, rtol=1e-9)
    assert_allclose(row["margin_percent"], 100 * abs(1200 - 60 * f_n / 2) / 1200, rtol=1e-9)
    assert row["verdict"] == "FAIL"
    assert "WHAT WOULD FIX IT" in out
    assert "Smallest stiffness fix" in out


def test_a_fixed_speed_panel_opens(tmp_path):
    from resonance.kinds.support.scenario import load_scenario
    from resonance.ui.panels import WhatIfPanel, single_mode_panel

    scenario = load_scenario(_fixed("cooling_water_pump.toml", tmp_path, 1200.0))
    panel = single_mode_panel(scenario)
    assert "FAIL" in panel.verdict.value
    assert WhatIfPanel(scenario).result.verdict == "FAIL"


def test_a_fixed_speed_is_drawn_as_a_line_on_the_diagrams(tmp_path):
    # Common practice: a fixed-speed machine's operating "range" is one speed; a band of no width would vanish.
    from resonance.kinds.support.scenario import load_scenario
    from resonance.kinds.support.study import run_study
    from resonance.ui.plots import interference_figure

    result = run_study(load_scenario(_fixed("cooling_water_pump.toml", tmp_path, 1200.0)))
    shapes = [s for s in interference_figure(result).layout.shapes if s.x0 == s.x1 == 1200.0]
    assert shapes
    assert shapes[0].line.width == 2
