"""One study layer: the registry picks the kind, every kind gives the same outcome shape, a new kind plugs in.

A regression guard of the project's design (no outside source): the ``check`` command, the records and the
HTML report go through :mod:`resonance.studies.registry`, so a kind registered there runs end to end without any
other change.
"""

from __future__ import annotations

import html
import json
import re
from dataclasses import dataclass, replace
from datetime import datetime, timezone
from pathlib import Path

import pytest

import resonance as R
from resonance.checks.interference import FindingsTable
from resonance.cli import main
from resonance.records.outcome import StudyOutcome
from resonance.records.record import Record, record_head
from resonance.records.tables import RecordSpec, ScenarioError, TableReader, parse_head
from resonance.studies.registry import STUDY_KINDS, register_study_kind, run_scenario_file, study_kind_for
from resonance.ui.report import VIEWS, render_outcome_html

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


@pytest.mark.parametrize(
    ("name", "kind", "verdict"),
    [
        ("cooling_water_pump.toml", "support", "FAIL"),
        ("feed_pump_foundation.toml", "support", "FAIL"),
        ("fan_on_pedestal.toml", "support", "FAIL"),
        ("fan_rotor.toml", "rotor", "PASS"),
        ("compressor_train.toml", "torsion", "FAIL"),
    ],
)
def test_every_demo_runs_through_the_registry(name, kind, verdict):
    outcome = run_scenario_file(SCENARIOS / name)
    assert outcome.kind == kind
    assert outcome.verdict == verdict
    assert outcome.record.data["verdict"] == verdict
    assert outcome.summary.startswith(f"Verdict: {verdict}")
    assert outcome.record.data["scenario_sha256"] is not None
    page = render_outcome_html(outcome)
    assert f"Verdict: {verdict}" in page
    assert page.count("plotly-graph-div") >= len(VIEWS.get(kind, lambda _: ([], []))(outcome)[1])  # torsion: none yet
    if kind == "support":  # the check command's HTML record keeps the modes table
        assert "<h2>Modes</h2>" in page
    if name == "fan_on_pedestal.toml":  # the field verification is part of the support kind's outcome
        assert outcome.field is not None
        assert next(heading for heading, _ in outcome.tables).startswith("Field verification")


def test_a_file_of_no_kind_is_named():
    with pytest.raises(ScenarioError, match=r"odd\.toml: no \[model\], \[rotor\], \[torsion\] or \[space\] table"):
        study_kind_for({"scenario": {"title": "x"}}, "odd.toml")


@dataclass(frozen=True)
class _ToyScenario:
    title: str
    units: str
    sha256: str | None = None

    def replace(self, **changes):
        return replace(self, **changes)


class _ToyStudy:
    """A kind of study that only reads its head and passes: enough to show the plumbing carries any kind."""

    name = "toy"
    scenario_type = _ToyScenario

    def claims(self, tables):
        return "toy" in tables

    def parse(self, tables, source):
        title, _, units = parse_head(TableReader(source), tables)
        return _ToyScenario(title, units)

    def inputs(self, scenario, base_dir):
        return []

    def run(self, scenario, base_dir, uncertainty=None, progress=False):
        data = record_head(
            "toy/1", scenario.title, "toy.toml", scenario.sha256, RecordSpec(), datetime.now(timezone.utc)
        )
        data.update(verdict="PASS", scenario={}, findings=[], assumptions=[], methods=[])
        record = Record(data, f"TOY RECORD: {scenario.title}\nVERDICT: PASS")
        return StudyOutcome(
            "toy", scenario.title, scenario.units, None, True, "Verdict: PASS", FindingsTable(()), (), record
        )


def test_a_new_kind_plugs_in_without_touching_the_command(tmp_path, capsys):
    path = tmp_path / "toy.toml"
    path.write_text('[scenario]\ntitle = "a toy"\n[toy]\n')
    register_study_kind(_ToyStudy())
    try:
        assert (
            main(["check", str(path), "--json", str(tmp_path / "toy.json"), "--html", str(tmp_path / "toy.html")]) == 0
        )
        assert "TOY RECORD: a toy" in capsys.readouterr().out
        assert json.loads((tmp_path / "toy.json").read_text())["scenario_sha256"] is not None
        assert "Verdict: PASS" in (tmp_path / "toy.html").read_text()
        with pytest.raises(ScenarioError, match=r"a study kind named 'toy' is registered already"):
            register_study_kind(_ToyStudy())
    finally:
        STUDY_KINDS[:] = [k for k in STUDY_KINDS if k.name != "toy"]
    assert [k.name for k in STUDY_KINDS] == ["space", "torsion", "rotor", "support"]


def test_the_flows_are_exported_at_the_top_level():
    for name in (
        "load_scenario",
        "run_study",
        "load_rotor_scenario",
        "run_rotor_study",
        "run_field_study",
        "run_scenario_file",
        "build_record",
        "StudyOutcome",
    ):
        assert name in R.__all__
        assert callable(getattr(R, name)) or isinstance(getattr(R, name), type)


def test_one_naming_convention_keeps_the_pinned_names():
    # Functions on a MatrixModel are model_*, on a Rotor rotor_*; the 0.1 names are the same functions.
    import resonance.kinds.rotor as rotor_api

    assert R.modal_properties is R.model_modes
    assert rotor_api.unbalance_response_rotor is rotor_api.rotor_unbalance_response


@pytest.mark.parametrize(
    "scenario",
    [
        "cooling_water_pump.toml",
        "fan_on_pedestal.toml",
        "fan_rotor.toml",
        "compressor_train.toml",
        "fan_skid_block.toml",
    ],
)
def test_the_html_record_has_one_heading_one_verdict_and_one_caution(scenario):
    # What a reviewer signs reads once at the top (the project's own record requirement, issue 21).
    from resonance.records.record import CAUTION
    from resonance.ui.report import render_outcome_html

    outcome = R.run(R.load(SCENARIOS / scenario))
    page = render_outcome_html(outcome)
    text = re.sub(r"<script.*?</script>", "", page, flags=re.S)
    assert text.count("<h1>") == 1
    assert text.count(html.escape(CAUTION)) == 1
    top = text.split("<h2>Findings")[0]
    assert len(re.findall(r"Verdict: ", top)) == 1
    assert f"Verdict: {outcome.verdict}" in top
