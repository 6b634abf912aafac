"""Fleets: several scenario files in one check, one summary, exit codes, the same rows on every executor.

Exit codes and the summary are the project's own contract (README); the machines are the invented demos.
"""

from __future__ import annotations

import csv
import hashlib
import io
import shutil
from pathlib import Path

import pytest

from resonance.cli import main
from resonance.core.executors import DaskExecutor, ProcessExecutor
from resonance.fleet import run_fleet

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


@pytest.fixture
def plant(tmp_path):
    folder = tmp_path / "plant"
    folder.mkdir()
    shutil.copy(SCENARIOS / "fan_rotor.toml", folder)  # passes
    shutil.copy(SCENARIOS / "cooling_water_pump.toml", folder)  # fails
    (folder / "typo.toml").write_text('[scenario]\ntitle = "typo"\n[speed]\nmin = "1,200 rpm"\n')  # bad input
    return folder


def _digest(folder: Path) -> dict[str, str]:
    return {p.name: hashlib.sha256(p.read_bytes()).hexdigest() for p in folder.iterdir()}


def test_a_fleet_with_a_failing_and_a_malformed_file_exits_2_and_checks_the_rest(plant, tmp_path, capsys):
    before = _digest(plant)
    out = tmp_path / "out"
    assert main(["check", str(plant), "--summary", str(out)]) == 2
    captured = capsys.readouterr()
    assert "typo.toml" in captured.err  # the bad file is named with its error
    assert "FLEET: 3 machines; 1 PASS, 1 FAIL, 1 BAD INPUT" in captured.out
    rows = list(csv.DictReader(io.StringIO((out / "summary.csv").read_text())))
    assert {r["verdict"] for r in rows} == {"PASS", "FAIL", "BAD INPUT"}
    passing = next(r for r in rows if r["verdict"] == "PASS")
    assert (out / passing["record"]).exists()
    assert (out / passing["record"].replace(".html", ".json")).exists()
    page = (out / "summary.html").read_text()
    assert f'href="{passing["record"]}"' in page
    assert "Caution." in page
    assert _digest(plant) == before  # the inputs are only read


def test_fleet_exit_codes_for_pass_and_fail(plant, tmp_path):
    assert (
        main(["check", str(plant / "fan_rotor.toml"), str(plant / "fan_rotor.toml"), "--summary", str(tmp_path / "a")])
        == 0
    )
    assert main(["check", str(plant / "fan_rotor.toml"), str(plant / "cooling_water_pump.toml")]) == 1


def test_a_fleet_refuses_single_record_options(plant, tmp_path, capsys):
    assert main(["check", str(plant), "--html", str(tmp_path / "x.html")]) == 2
    assert "--summary" in capsys.readouterr().err


def test_the_same_rows_on_every_executor(plant, tmp_path):
    serial = run_fleet([plant])
    local = run_fleet([plant], executor=ProcessExecutor(2))
    assert serial == local
    from distributed import Client, LocalCluster

    with (
        LocalCluster(n_workers=2, threads_per_worker=1, host="127.0.0.1", dashboard_address=None) as cluster,
        Client(cluster) as client,
    ):
        remote = run_fleet([plant], executor=DaskExecutor(client))
    assert serial == remote


def test_a_missing_path_is_bad_input(tmp_path, capsys):
    assert main(["check", str(tmp_path / "nowhere.toml"), str(tmp_path / "also.toml")]) == 2
    assert "does not exist" in capsys.readouterr().err


def test_long_work_shows_progress_bars(plant, capsys):
    # tqdm writes its bar to stderr in a terminal (an ipywidgets bar in a notebook).
    run_fleet([plant / "fan_rotor.toml"], progress=True)
    assert "fleet: 100%" in capsys.readouterr().err
    from resonance.kinds.rotor.scenario import load_rotor_scenario
    from resonance.kinds.rotor.study import run_rotor_study

    run_rotor_study(load_rotor_scenario(plant / "fan_rotor.toml"), progress=True)
    assert "Campbell sweep: 100%" in capsys.readouterr().err
