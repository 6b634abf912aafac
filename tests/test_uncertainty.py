"""Uncertainty studies, batched variants, the combined-fix map and the executors.

References named beside each check: the batched solve against this package's per-model solve (itself checked
against closed forms in test_mdof.py), the probability of failure of a one-mode model against its closed form,
first-order indices of a linear function against their analytic values (Saltelli et al., Global Sensitivity
Analysis: The Primer, Wiley, 2008, sec. 1.2: S_i = a_i^2 V_i / sum a_j^2 V_j), the fix map's axes against the
one-parameter solver.
"""

from __future__ import annotations

import math
from pathlib import Path

import numpy as np
import pytest
from numpy.testing import assert_allclose

from resonance.core.executors import DaskExecutor, ProcessExecutor, SerialExecutor, executor_for
from resonance.dynamics.batch import lumped_modes_batch
from resonance.dynamics.modes import model_modes
from resonance.kinds.support.scenario import load_scenario, parse_scenario
from resonance.kinds.support.study import study_modes
from resonance.kinds.support.variants import evaluate_variants
from resonance.kinds.support.whatif import check_scaled, combined_fix_map, smallest_change
from resonance.records.tables import ScenarioError
from resonance.studies.uncertainty import (
    UncertainInput,
    UncertaintySpec,
    run_uncertainty,
    sample_inputs,
    sensitivity_indices,
    uncertainty_spec,
)

SCENARIOS = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios"


@pytest.fixture(scope="module")
def booster():
    return load_scenario(SCENARIOS / "feed_pump_foundation.toml")


@pytest.mark.parametrize("dashpots", [True, False])
def test_batched_modes_equal_the_per_model_solve(booster, dashpots):
    spec = booster.model
    if not dashpots:
        import dataclasses

        spec = dataclasses.replace(spec, springs=tuple(dataclasses.replace(s, damping=0.0) for s in spec.springs))
    rng = np.random.default_rng(7)
    n = 64
    kf = {"soil": rng.uniform(0.3, 3.0, n), "grout": rng.uniform(0.5, 1.5, n)}
    mf = {"machine": rng.uniform(0.5, 2.0, n)}
    zeta = rng.uniform(0.005, 0.2, n)
    batch = lumped_modes_batch(spec, n, kf, mf, zeta)
    for i in range(n):
        model = spec.build({k: v[i] for k, v in kf.items()}, {k: v[i] for k, v in mf.items()}, zeta[i])
        modes = study_modes(model_modes(model), model.labels)
        assert_allclose(batch.frequency[i], [m.frequency for m in modes], rtol=1e-10)
        assert_allclose(batch.damping_ratio[i], [m.damping_ratio for m in modes], rtol=1e-8)


def test_variant_findings_equal_the_interference_check(booster):
    rng = np.random.default_rng(3)
    n = 200
    ks, ms = rng.uniform(0.5, 2.0, n), rng.uniform(0.6, 1.6, n)
    found = evaluate_variants(
        booster,
        n,
        dict.fromkeys(booster.whatif.vary_springs, ks),
        dict.fromkeys(booster.whatif.vary_masses, ms),
    )
    for i in range(n):
        table = check_scaled(booster, ks[i], ms[i])
        assert found.worst_excess[i] == pytest.approx(min(f.margin - f.required_margin for f in table), abs=1e-9)
        assert bool(found.worst_excess[i] >= 0.0) == table.passed


def _one_mode(low: float, high: float, samples: int, sampling: str = "lhs"):
    # One mass of 1000 kg on a spring of nominal 4e7 N/m (f = 31.8 Hz) between two bounds, 1x over
    # 1500-1800 rpm, flat 10 % (test data, not a machine).
    tables = {
        "scenario": {"title": "one mode"},
        "speed": {"min": "1500 rpm", "max": "1800 rpm"},
        "excitations": [{"order": 1, "label": "1x"}],
        "margin": {"flat": 10},
        "model": {
            "damping_ratio": 0.02,
            "masses": [{"name": "m", "mass": "1000 kg"}],
            "springs": [{"between": ["m", "ground"], "stiffness": "4e7 N/m", "label": "k"}],
        },
        "response": {"unbalance": "100 g*mm", "force_at": "m", "measure_at": "m"},
        "uncertainty": {
            "samples": samples,
            "sampling": sampling,
            "seed": 5,
            "inputs": [{"vary": "spring:k", "distribution": "uniform", "low": low, "high": high}],
        },
    }
    scenario = parse_scenario(tables, "one.toml")
    return scenario, uncertainty_spec(scenario.uncertainty, scenario, "one.toml")


@pytest.mark.parametrize("sampling", ["lhs", "sobol"])
def test_failure_probability_of_one_mode_against_its_closed_form(sampling):
    # f = sqrt(k X / m) / 2 pi fails the flat 10 % when 0.9 f_lo < f < 1.1 f_hi (f_lo = 25 Hz, f_hi = 30 Hz at 1x),
    # i.e. for X in ((2 pi 0.9 f_lo)^2 m / k, (2 pi 1.1 f_hi)^2 m / k); with X uniform on [a, b] the probability is
    # the length of that interval inside [a, b] over b - a (common practice; closed form).
    a, b = 0.3, 1.6
    scenario, spec = _one_mode(a, b, 16384, sampling)
    result = run_uncertainty(scenario, spec)
    m, k = 1000.0, 4e7
    x1 = (2 * math.pi * 0.9 * 25.0) ** 2 * m / k
    x2 = (2 * math.pi * 1.1 * 30.0) ** 2 * m / k
    expected = (min(b, x2) - max(a, x1)) / (b - a)
    assert result.probability_any == pytest.approx(expected, abs=2e-3)
    assert result.failure_probability[0, 0] == pytest.approx(expected, abs=2e-3)


def test_first_order_indices_of_a_linear_function():
    # Y = sum a_i X_i, X_i independent uniform on [-1, 1]: S_i = a_i^2 / sum a_j^2 (Saltelli et al. 2008, sec 1.2).
    spec = UncertaintySpec(tuple(UncertainInput(f"x{i}", "uniform", 0.5, 1.5) for i in range(3)), samples=8192, seed=11)
    values = sample_inputs(spec)
    a = np.array([1.0, 2.0, 3.0])
    rows = {name: s1 for name, s1, _ in sensitivity_indices(["x0", "x1", "x2"], values, values @ a, seed=1)}
    assert_allclose([rows["x0"], rows["x1"], rows["x2"]], a**2 / np.sum(a**2), atol=0.02)


def test_the_demo_study_is_seeded_and_ranks_its_inputs(booster):
    spec = uncertainty_spec(booster.uncertainty, booster, booster.source)
    first = run_uncertainty(booster, spec)
    again = run_uncertainty(booster, spec)
    assert np.array_equal(first.values, again.values)
    assert np.array_equal(first.findings.margin, again.findings.margin, equal_nan=True)
    assert 0.0 < first.probability_any < 1.0
    assert {name for name, *_ in first.sensitivity} == {x.vary for x in spec.inputs}
    assert first.sensitivity[0][1] >= first.sensitivity[-1][1]
    assert "Probability that a margin fails" in first.summary()


def test_results_are_identical_on_every_executor(booster):
    import dataclasses

    spec = dataclasses.replace(uncertainty_spec(booster.uncertainty, booster, booster.source), samples=6000)
    serial = run_uncertainty(booster, spec, SerialExecutor())
    local = run_uncertainty(booster, spec, ProcessExecutor(2))
    assert np.array_equal(serial.findings.margin, local.findings.margin, equal_nan=True)
    assert serial.sensitivity == local.sensitivity
    from distributed import Client, LocalCluster

    with (
        LocalCluster(n_workers=2, threads_per_worker=1, host="127.0.0.1", dashboard_address=None) as cluster,
        Client(cluster) as client,
    ):
        remote = run_uncertainty(booster, spec, DaskExecutor(client))
    assert np.array_equal(serial.findings.margin, remote.findings.margin, equal_nan=True)
    assert serial.probability_any == remote.probability_any


def test_executor_choices_and_refusals():
    assert isinstance(executor_for(None), SerialExecutor)
    assert isinstance(executor_for(2), ProcessExecutor)
    with pytest.raises(Exception, match="workers"):
        executor_for(-1)
    with pytest.raises(Exception, match="scheduler: cannot reach"):
        executor_for("tcp://127.0.0.1:1")


@pytest.mark.parametrize(
    ("edit", "message"),
    [
        (
            lambda u: u["inputs"][0].update(vary="spring:nothing"),
            r"uncertainty\.inputs\[0\]\.vary: got 'spring:nothing'",
        ),
        (lambda u: u["inputs"][0].update(distribution="beta"), r"uncertainty\.inputs\[0\]\.distribution: got 'beta'"),
        (lambda u: u.update(sampling="sobol", samples=1000), r"uncertainty\.samples: got 1000; Sobol' sampling"),
        (lambda u: u["inputs"][1].update(low=1.3, high=0.7), r"uncertainty\.inputs\[1\]: low 1\.3 is not below"),
        (
            lambda u: u["inputs"][5].update(low=0.5, high=40.0),
            r"uncertainty\.inputs: damping_ratio: expected ratios >= 0 and below 1",
        ),
        (lambda u: u["inputs"][0].update(median="1,0"), r"uncertainty\.inputs\[0\]\.median"),
        (
            lambda u: u["inputs"].append({"vary": "mass:machine", "distribution": "uniform", "low": 0.9, "high": 1.1}),
            r"uncertainty\.inputs: .* names an input twice",
        ),
        # A typing error of a factor (1e300) used to end in the eigen-solver's LinAlgError.
        (
            lambda u: u["inputs"][1].update(low=1.0, high=1e300),
            r"uncertainty\.inputs\[1\]: spring:\w+: its factors reach .* expected factors from 0\.001 to 1000",
        ),
        (lambda u: u.update(inputs=[]), r"uncertainty\.inputs: empty; expected at least one uncertain input"),
        (lambda u: u.update(sampling="mc"), r"uncertainty\.sampling: got 'mc'; expected 'lhs' or 'sobol'"),
        (lambda u: u["inputs"][0].update(distribution="gamma"), r"uncertainty\.inputs\[0\]\.distribution: got 'gamma'"),
    ],
)
def test_bad_uncertainty_tables_name_the_file_and_field(booster, edit, message):
    import copy

    table = copy.deepcopy(dict(booster.uncertainty))
    edit(table)
    with pytest.raises(ScenarioError, match=rf"^b\.toml: {message}"):
        uncertainty_spec(table, booster, "b.toml")


def test_fix_map_axes_agree_with_the_one_parameter_solver(booster):
    fixes = combined_fix_map(booster, points=81)
    middle = fixes.stiffness.size // 2
    for parameter, axis, row in (
        ("stiffness", fixes.stiffness, fixes.worst_excess[middle, :]),
        ("mass", fixes.mass, fixes.worst_excess[:, middle]),
    ):
        single = smallest_change(booster, parameter, bounds=(0.5, 2.0))  # type: ignore[arg-type]
        assert single.scale is not None
        # The map's pass/fail edge nearest to 1 on this axis, by linear interpolation in log-factor.
        x = np.log(axis)
        side = 1 if single.scale > 1.0 else -1
        start = middle
        while row[start + side] < 0.0:
            start += side
        x0, x1, y0, y1 = x[start], x[start + side], row[start], row[start + side]
        edge = math.exp(x0 + (0.0 - y0) * (x1 - x0) / (y1 - y0))
        assert edge == pytest.approx(single.scale, rel=0.005)  # within a grid step of 1.7 %
    # The smallest combined fix is no farther from no change than the better one-parameter fix.
    ks, km = fixes.smallest
    best_single = min(abs(math.log(smallest_change(booster, p).scale)) for p in ("stiffness", "mass"))
    assert math.hypot(math.log(ks), math.log(km)) <= best_single + 1e-3
    assert check_scaled(booster, ks, km).passed


def test_uncertainty_panel_follows_its_controls(booster):
    from resonance.ui import UncertaintyPanel

    panel = UncertaintyPanel(booster)
    assert "Caution." in panel.widget.children[0].value
    first = panel.result.probability_any
    panel.seed.value = 7
    assert panel.result.spec.seed == 7
    assert panel.bar.value == panel.bar.max == 2  # 4096 samples in chunks of 2048
    assert panel.result.probability_any == pytest.approx(first, abs=0.05)  # another sample, the same answer
    assert panel.histogram.data[0].x.size == 4096
    panel.span.value = 3.0
    assert panel.fixes.stiffness[-1] == pytest.approx(3.0)
    assert list(panel.map.data[0].x) == pytest.approx(list(panel.fixes.stiffness))
    assert "Smallest combined fix" in panel.summary()


def test_what_if_panel_maps_combined_fixes_and_moves_both_sliders(booster):
    from resonance.ui import WhatIfPanel

    panel = WhatIfPanel(booster)
    assert not panel.result.passed
    text = panel.map_fixes()
    assert "Smallest combined fix" in text
    assert (panel.stiffness.value, panel.mass.value) == pytest.approx(panel.fix_map.smallest, rel=1e-3)
    assert panel.result.passed
    assert len(panel.fix_box.children) == 1


def test_check_reports_the_uncertainty_study_and_its_record(booster, tmp_path, capsys):
    import json

    from resonance.cli import main

    out = tmp_path / "b.json"
    assert main(["check", str(SCENARIOS / "feed_pump_foundation.toml"), "--json", str(out), "--workers", "2"]) == 1
    text = capsys.readouterr().out
    assert "UNCERTAINTY" in text
    assert "Probability that a margin fails: 68.5 %" in text
    data = json.loads(out.read_text())
    assert data["uncertainty"]["samples"] == 4096
    assert data["uncertainty"]["sensitivity"][0]["input"] == "spring:grout"


def test_a_limit_on_the_failure_probability_fails_the_study(booster):
    import copy

    import resonance as R

    table = copy.deepcopy(dict(booster.uncertainty))
    table["max_failure_probability"] = 0.05
    outcome = R.run(booster.replace(uncertainty=table), SCENARIOS)
    assert not outcome.uncertainty.passed
    assert "EXCEEDS the allowed 5.0 %" in outcome.summary
    assert outcome.record.data["verdict"] == "FAIL"


def _rotor_with_uncertainty(samples: int = 24) -> dict:
    from resonance.records.tables import read_scenario_file

    tables = read_scenario_file(SCENARIOS / "fan_rotor.toml")
    tables["uncertainty"] = {
        "samples": samples,
        "seed": 3,
        "inputs": [
            {"vary": "bearing:NDE bearing:stiffness", "distribution": "lognormal", "median": 1.0, "cov": 0.3},
            {"vary": "bearing:DE bearing:stiffness", "distribution": "lognormal", "median": 1.0, "cov": 0.3},
            {"vary": "bearing:DE bearing:damping", "distribution": "uniform", "low": 0.5, "high": 1.5},
            {"vary": "speed_max", "distribution": "uniform", "low": 1.0, "high": 1.2},
        ],
    }
    return tables


def test_rotor_bearing_coefficients_as_uncertain_inputs():
    # Each variant is the whole rotor study of the scenario with its bearings scaled: a variant's findings are
    # those of run_rotor_study on that scaled scenario (the reference), keyed by excitation and critical rank.
    from resonance.checks.speed_range import operating_range
    from resonance.kinds.rotor.scenario import parse_rotor_scenario, scale_bearing
    from resonance.kinds.rotor.study import run_rotor_study

    rotor = parse_rotor_scenario(_rotor_with_uncertainty(), "fan.toml")
    spec = uncertainty_spec(rotor.uncertainty, rotor, "fan.toml")
    result = run_uncertainty(rotor, spec, ProcessExecutor(2))
    row = result.values[5]
    nde, de = rotor.bearings
    variant = rotor.replace(
        bearings=(scale_bearing(nde, row[0], 1.0), scale_bearing(de, row[1], row[2])),
        speed=operating_range(rotor.speed.speed_min, rotor.speed.speed_max * row[3]),
    )
    table = run_rotor_study(variant).findings
    worst = min(f.margin - f.required_margin for f in table if not f.exempt)
    assert result.findings.worst_excess[5] == pytest.approx(worst, abs=1e-9)
    assert {name for name, *_ in result.sensitivity} == {x.vary for x in spec.inputs}
    assert 0.0 <= result.probability_any <= 1.0


def test_check_runs_a_rotor_uncertainty_study(tmp_path, capsys):
    import json

    import tomli_w

    from resonance.cli import main

    path = tmp_path / "fan.toml"
    path.write_bytes(tomli_w.dumps(_rotor_with_uncertainty(16)).encode())
    out = tmp_path / "fan.json"
    assert main(["check", str(path), "--json", str(out)]) in (0, 1)
    assert "UNCERTAINTY" in capsys.readouterr().out
    assert json.loads(out.read_text())["uncertainty"]["samples"] == 16
    bad = _rotor_with_uncertainty()
    bad["uncertainty"]["inputs"][0]["vary"] = "bearing:NDE bearing:kxx"
    path.write_bytes(tomli_w.dumps(bad).encode())
    assert main(["check", str(path)]) == 2
    assert "uncertainty.inputs[0].vary: got 'bearing:NDE bearing:kxx'" in capsys.readouterr().err


def test_a_failing_support_record_says_what_would_fix_it():
    # The record's fixes are the what-if solvers' own answers (single parameters, and the combined map's).
    from resonance.studies.registry import run_scenario_file

    outcome = run_scenario_file(SCENARIOS / "feed_pump_foundation.toml")
    fixes = outcome.record.data["fixes"]
    booster = load_scenario(SCENARIOS / "feed_pump_foundation.toml")
    assert fixes["mass_factor"] == pytest.approx(smallest_change(booster, "mass").scale)
    ks, km = fixes["combined_factors"]
    assert check_scaled(booster, ks, km).passed
    assert "WHAT WOULD FIX IT" in outcome.record.text
    assert "fixes" not in run_scenario_file(SCENARIOS / "fan_rotor.toml").record.data  # passes: nothing to fix


def test_an_empty_uncertainty_table_is_refused_not_skipped():
    from pathlib import Path

    from resonance.kinds.support.scenario import parse_scenario
    from resonance.records.tables import read_scenario_file

    tables = read_scenario_file(
        Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "feed_pump_foundation.toml"
    )
    tables["uncertainty"] = {}
    with pytest.raises(ScenarioError, match=r"^b\.toml: uncertainty: empty; give its inputs"):
        parse_scenario(tables, "b.toml")
