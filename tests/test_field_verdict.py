"""One field verdict where the measurement and the tuned model disagree: a measured mode governs where it
was measured, the tuned model covers the modes and speeds not measured.

Sources: common practice (the measured resonance is the fact, the tuned model the interpolation between
facts: Ewins, Modal Testing, 2nd ed., 2000, ch. 7 on model updating, from memory; Friswell and Mottershead,
Finite Element Model Updating in Structural Dynamics, 1995, ch. 1). The demo data are invented.
"""

from __future__ import annotations

import dataclasses
from pathlib import Path

from resonance.checks.interference import interference_check
from resonance.checks.margins import FlatRule
from resonance.checks.rules import RuleSet
from resonance.kinds.field.study import SAME_MODE, run_field_study
from resonance.kinds.support.scenario import load_scenario

DEMO = Path(__file__).resolve().parent.parent / "notebooks" / "scenarios" / "fan_on_pedestal.toml"


def _demo():
    scenario = load_scenario(DEMO)
    return scenario, run_field_study(scenario, DEMO.parent)


def test_the_measured_failure_governs_the_passing_tuned_model():
    _, field = _demo()
    assert not field.findings.passed
    assert field.tuned_study.findings.passed
    assert not field.passed
    assert field.verdict_basis.startswith("measured margins FAIL and govern the modes measured")
    text = field.summary()
    assert text.splitlines()[0].startswith("Field verdict: FAIL (measured margins FAIL")
    measured = [f.mode.frequency for f in field.findings]
    for f in field.governing:
        if f.mode.source != "measured":
            assert all(abs(f.mode.frequency - m) > SAME_MODE * m for m in measured)


def test_a_tuned_failure_of_a_measured_mode_is_superseded_by_the_measurement():
    scenario, field = _demo()
    passing = RuleSet(flat=FlatRule(10.0))
    strict = RuleSet(flat=FlatRule(30.0))
    measured = interference_check([f.mode for f in field.findings], list(scenario.excitations), scenario.speed, passing)
    tuned = field.tuned_study
    modes = [f.mode for f in tuned.findings]
    tuned = dataclasses.replace(
        tuned, findings=interference_check(modes, list(scenario.excitations), scenario.speed, strict)
    )
    assert not tuned.findings.passed  # the model's mode next to the measured one fails 30 %
    judged = dataclasses.replace(field, findings=measured, tuned_study=tuned)
    assert measured.passed
    # Only the model's mode next to the measured one fails, and the measurement that governs it passes.
    failing = [f.mode.frequency for f in tuned.findings if not f.passed]
    assert failing
    for x in failing:
        assert any(abs(x - m.mode.frequency) <= SAME_MODE * m.mode.frequency for m in measured)
    assert judged.passed
    assert "measured margins pass and govern the modes measured" in judged.verdict_basis
