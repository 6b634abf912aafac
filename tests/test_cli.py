"""The check command: exit codes, records, and bad input that never leaves a partial record.

Sources: the expected verdicts follow from the separation-margin definitions
and the flat 15 % rule (API RP 684 definitions, from memory; flat rule common
practice): the demo foundation's mode 2 (69.8 Hz) sits 12.7 % below the 2x
band, so it fails; softening the mounting by 10 % lowers that mode enough to
clear 15 % (the pass is confirmed through the engine in the test, not assumed).
Scenario data are invented demo values.
"""

import json
import re
import subprocess
import sys
from pathlib import Path

import pytest
import tomli_w
import tomllib

from resonance.cli import main
from resonance.kinds.support.scenario import load_scenario
from resonance.kinds.support.study import run_study


def _write(tmp_path: Path, data: dict, name: str = "case.toml") -> Path:
    path = tmp_path / name
    path.write_text(tomli_w.dumps(data))
    return path


def test_failing_scenario_exits_1_and_writes_both_records(tmp_path, foundation_path, capsys):
    html, js = tmp_path / "r.html", tmp_path / "r.json"
    assert main(["check", str(foundation_path), "--html", str(html), "--json", str(js)]) == 1
    out = capsys.readouterr().out
    assert "VERDICT: FAIL" in out
    record = json.loads(js.read_text())
    expected = run_study(load_scenario(foundation_path)).findings.to_records()
    assert record["findings"] == expected
    assert record["verdict"] == "FAIL"
    assert record["scenario"]["speed"]["min"] == "2400.0 rpm"
    page = html.read_text()
    # Self-contained: plotly.js inline, no script fetched from anywhere.
    assert "<script src=" not in page
    assert "Plotly.newPlot" in page
    assert len(page) > 1_000_000
    for text in ("Caution.", "Findings (worst first)", "Assumptions", "Methods and references", "numpy"):
        assert text in page


def test_passing_scenario_exits_0(tmp_path, foundation_path):
    data = tomllib.loads(foundation_path.read_text())
    data["model"]["springs"][0]["stiffness"] = "990 kN/mm"  # softened by 10 %
    path = _write(tmp_path, data)
    assert run_study(load_scenario(path)).passed  # the engine's verdict, independently
    assert main(["check", str(path)]) == 0


def test_record_reproduces_from_its_own_scenario(tmp_path, foundation_path):
    first, second = tmp_path / "a.json", tmp_path / "b.json"
    main(["check", str(foundation_path), "--json", str(first)])
    saved = json.loads(first.read_text())
    path = _write(tmp_path, saved["scenario"], "from_record.toml")
    main(["check", str(path), "--json", str(second)])
    again = json.loads(second.read_text())
    assert again["findings"] == saved["findings"]
    assert again["modes"] == saved["modes"]


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (lambda d: d["speed"].pop("min"), r"case\.toml: speed\.min: missing"),
        (
            lambda d: d["model"]["springs"][0].update(stiffness="900 kg"),
            r"case\.toml: model\.springs\[0\]\.stiffness: got 900 kg, which is not a stiffness",
        ),
        (lambda d: d["model"]["masses"][0].update(mass="heavy"), r"case\.toml: model\.masses\[0\]\.mass: got 'heavy'"),
        (
            lambda d: d["speed"].update(min="3000 rpm", max="2400 rpm"),
            r"case\.toml: speed\.max: got 2400 rpm, below speed\.min",
        ),
    ],
)
def test_bad_scenario_exits_2_without_partial_record(tmp_path, foundation_path, capsys, edit, message):
    data = tomllib.loads(foundation_path.read_text())
    edit(data)
    path = _write(tmp_path, data)
    before = path.read_bytes()
    html, js = tmp_path / "r.html", tmp_path / "r.json"
    assert main(["check", str(path), "--html", str(html), "--json", str(js)]) == 2
    err = capsys.readouterr().err
    assert err.startswith("error: ")
    assert re.search(message, err), err
    assert not html.exists()
    assert not js.exists()
    assert list(tmp_path.glob(".*partial")) == []
    assert path.read_bytes() == before  # the user's file is untouched


def test_output_over_the_scenario_is_refused(tmp_path, foundation_path, capsys):
    path = tmp_path / "s.toml"
    path.write_bytes(foundation_path.read_bytes())
    assert main(["check", str(path), "--json", str(path)]) == 2
    assert "is an input file" in capsys.readouterr().err
    assert path.read_bytes() == foundation_path.read_bytes()


def test_module_entry_point(foundation_path):
    done = subprocess.run(
        [sys.executable, "-m", "resonance", "check", str(foundation_path)], capture_output=True, text=True
    )
    assert done.returncode == 1
    assert "CALCULATION RECORD" in done.stdout
