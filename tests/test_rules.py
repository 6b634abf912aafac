"""Verdicts a reviewer can sign: each rule within its scope, electrical sources that follow the drive,
the support class from the model, the zones labelled as an estimate, the AF source, records under
revision control.

Sources: API Std 617 8th ed. / API RP 684 2nd ed. (AF rule and its AF < 2.5 exemption for rotor lateral
criticals at 1x; separation margin; torsional 10 %; from memory); flat 10-20 % margins for structures and
other excitations (common practice, no single source); synchronous speed n_s = 120 f / p and slip
s = (n_s - n) / n_s (Fitzgerald, Kingsley & Umans, Electric Machinery, 6th ed., ch. 6); support class
(ISO 10816-3:2009 sec. 3.3, lowest natural frequency at least 25 % above the main excitation, from memory).
Machines and numbers are invented demo values.
"""

from __future__ import annotations

import hashlib
import json
import math

import pytest
from conftest import SCENARIOS
from numpy.testing import assert_allclose

import resonance as R
from resonance.checks.interference import verdict_line
from resonance.cli import main
from resonance.kinds.support.record import build_record
from resonance.kinds.support.scenario import ScenarioError, load_scenario, parse_scenario, scenario_to_dict
from resonance.kinds.support.study import run_study

FLAT = R.FlatRule(15.0)
RULES = R.RuleSet(flat=FLAT)

# Mode kind x excitation kind -> the rule the trade applies (API 617 / RP 684 from memory; common practice).
EXPECTED = {
    ("rotor-lateral", "synchronous"): "API lateral",
    ("rotor-lateral", "order"): "flat 15 %",
    ("rotor-lateral", "electrical"): "flat 15 %",
    ("rotor-lateral", "fixed"): "flat 15 %",
    ("structural", "synchronous"): "flat 15 %",
    ("structural", "order"): "flat 15 %",
    ("structural", "electrical"): "flat 15 %",
    ("structural", "fixed"): "flat 15 %",
    ("torsional", "synchronous"): "torsional 10 %",
    ("torsional", "order"): "torsional 10 %",
    ("torsional", "electrical"): "torsional 10 %",
    ("torsional", "fixed"): "torsional 10 %",
}

EXCITATIONS = {
    "synchronous": R.running_speed_order(1),
    "order": R.running_speed_order(2),
    "electrical": R.drive_electrical(4, 0.0, 2),
    "fixed": R.fixed_frequency(29.6, "cooling tower fan"),
}


@pytest.mark.parametrize(("pair", "rule"), sorted(EXPECTED.items()))
def test_rule_by_mode_kind_and_excitation_kind(pair, rule):
    mode_kind, excitation_kind = pair
    assert RULES.rule_for(mode_kind, excitation_kind).rule.name == rule
    mode = R.Mode(40.0, 0.05, "m", kind=mode_kind)
    (finding,) = R.interference_check([mode], [EXCITATIONS[excitation_kind]], R.operating_range(900, 1800), RULES)
    assert finding.rule == rule  # the record names the rule actually used on this row
    assert finding.as_record()["rule"] == rule
    assert finding.as_record()["mode_kind"] == mode_kind
    assert finding.as_record()["excitation_kind"] == excitation_kind


def test_the_damped_skid_inside_the_range_fails():
    # A skid mode, damping ratio 0.22 (AF 2.27), with its 1x coincidence at 1479 rpm inside 1450-1490 rpm: the
    # API exemption does not reach structural modes, so the flat rule fails it (it passed before).
    skid = R.Mode(1479.0 / 60.0, 0.22, "skid lateral")
    table = R.interference_check([skid], [R.running_speed_order(1)], R.operating_range(1450, 1490), RULES)
    (finding,) = table
    assert finding.location == "inside"
    assert finding.verdict == "FAIL"
    assert finding.required_margin == 15.0
    assert table.verdict == "FAIL"
    # The same coincidence on a rotor lateral mode is exempt (API, from memory): never a plain PASS.
    rotor = R.Mode(1479.0 / 60.0, 0.22, "rotor 1st", kind="rotor-lateral")
    exempt = R.interference_check([rotor], [R.running_speed_order(1)], R.operating_range(1450, 1490), RULES)
    assert exempt[0].verdict == "EXEMPT"
    assert exempt.verdict == "PASS WITH EXEMPTION"
    line = verdict_line(exempt.verdict, exempt)
    assert line.startswith("Verdict: PASS WITH EXEMPTION (rotor 1st x 1x inside the operating range, exempt: ")


def test_af_rules_are_refused_outside_their_scope():
    with pytest.raises(R.InputValueError, match=r"only to rotor lateral modes against 1x, not to a structural mode"):
        R.RuleSet(flat=FLAT, overrides=(("structural", "synchronous", R.ApiLateralRule()),))
    # A bare API rule cannot judge a structural mode: the check asks for the flat margin instead of guessing.
    with pytest.raises(R.InputValueError, match=r"flat: missing; a structural mode against 1x needs a flat"):
        R.interference_check([R.Mode(40.0, 0.05)], [R.running_speed_order(1)], R.operating_range(900, 1800))


def test_flat_margin_is_symmetric_in_frequency():
    # A fixed 100 Hz source: 86.96 Hz is 13.04 % below, 113.04 Hz is 13.04 % above (common practice: the same
    # requirement both sides, margin relative to the excitation frequency).
    source = R.fixed_frequency(100.0, "neighbour")
    low, high = (
        R.interference_check([R.Mode(f, 0.02)], [source], R.operating_range(900, 1800), RULES)[0]
        for f in (86.96, 113.04)
    )
    assert_allclose([low.margin, high.margin], [13.04, 13.04], rtol=1e-9)
    assert low.required_margin == high.required_margin == 15.0
    # For an order the speed margin equals the frequency margin of f_n from the band n N / 60 sweeps.
    two_x = R.interference_check([R.Mode(25.0, 0.02)], [R.running_speed_order(2)], R.operating_range(900, 1800), RULES)
    band_low = 2 * 900 / 60
    assert_allclose(two_x[0].margin, 100 * (band_low - 25.0) / band_low, rtol=1e-12)


def test_electrical_frequencies_follow_the_drive():
    # A 4-pole motor at 1500 rpm synchronous: f_e = p n_s / 120 = 50 Hz, 2 f_e = 100 Hz (Fitzgerald et al.).
    assert_allclose(R.drive_electrical(4, 0.0, 2).frequency_at(1500.0), [100.0], rtol=1e-15)
    # With 1.3 % slip at 1480 rpm: n_s = n / (1 - s), 2 f_e = 2 p n_s / 120 exactly.
    exact = 2 * 4 * (1480.0 / (1 - 0.013)) / 120.0
    assert_allclose(R.drive_electrical(4, 0.013, 2).frequency_at(1480.0), [exact], rtol=1e-15)
    assert_allclose(R.electrical_order(4, 0.013, 2), 4 / (1 - 0.013), rtol=1e-15)
    # A motor on the line: fixed frequencies, kind electrical; never labelled like the 2x order.
    line = R.line_frequency(60.0, 2)
    assert (line.frequency, line.kind, line.label) == (120.0, "electrical", "twice line frequency (120 Hz)")
    assert "2x" not in line.label
    assert "line" not in R.running_speed_order(2).label
    with pytest.raises(R.InputValueError, match=r"poles: got 3; expected an even whole number"):
        R.electrical_order(3)
    with pytest.raises(R.InputValueError, match=r"slip: got 1; expected a fraction in \[0, 1\)"):
        R.electrical_order(4, 1.0)


def test_feed_pump_demo_checks_twice_electrical_frequency_on_the_drive(foundation):
    result = run_study(foundation)
    (electrical,) = [e for e in foundation.excitations if e.kind == "electrical"]
    assert_allclose(electrical.order, 2 * 2 / (2 * (1 - 0.01)), rtol=1e-15)  # 2 f_e of a 2-pole motor, slip 1 %
    finding = next(f for f in result.findings if f.excitation is electrical and f.mode.label.startswith("mode 2"))
    # The 2 f_e band starts at order x 2400 rpm / 60; the machine mode lies below it (separation margin, API RP 684).
    band_low = electrical.order * 2400.0 / 60.0
    assert_allclose(finding.margin, 100 * (band_low - finding.mode.frequency) / band_low, rtol=1e-12)
    assert 13.0 < finding.margin < 14.0  # regression guard: about 13 % (a fixed 100 Hz claimed about 30 %)
    assert finding.verdict == "FAIL"


def test_scenario_margin_table_and_its_errors(foundation):
    table = scenario_to_dict(foundation)
    assert table["margin"] == {"rule": "api-lateral", "flat": 15.0}
    assert table["excitations"][-1] == {"electrical": 2.0}
    assert parse_scenario(table) == foundation.replace(source="<scenario>")
    old = scenario_to_dict(foundation)
    old["margin"] = {"rule": "api-lateral"}
    with pytest.raises(ScenarioError, match=r"<scenario>: margin\.flat: missing; the modes of a machine"):
        parse_scenario(old)
    for value, message in (("15 %", r"expected a plain number of percent"), (150, r"between 0 and 100")):
        bad = scenario_to_dict(foundation)
        bad["margin"]["flat"] = value
        with pytest.raises(ScenarioError, match=rf"margin\.flat: got .*{message}"):
            parse_scenario(bad)
    bad = scenario_to_dict(foundation)
    bad["margin"]["pairs"] = [{"mode": "structural", "excitation": "synchronous", "rule": "api-lateral"}]
    with pytest.raises(ScenarioError, match=r"margin\.pairs: .*only to rotor lateral modes against 1x"):
        parse_scenario(bad)
    bad = scenario_to_dict(foundation)
    del bad["motor"]
    with pytest.raises(ScenarioError, match=r"excitations\[3\]\.electrical: needs a \[motor\] table"):
        parse_scenario(bad)
    bad = scenario_to_dict(foundation)
    del bad["motor"]["slip"]
    with pytest.raises(ScenarioError, match=r"motor\.slip: missing"):
        parse_scenario(bad)
    override = scenario_to_dict(foundation)
    override["margin"]["pairs"] = [{"mode": "structural", "excitation": "electrical", "rule": "flat-20"}]
    rules = parse_scenario(override).rules
    assert rules.rule_for("structural", "electrical").rule.name == "flat 20 %"
    assert rules.rule_for("structural", "order").rule.name == "flat 15 %"


def test_support_class_from_the_model(pump, foundation):
    # Cooling-water demo: 39.7 Hz mode against 30 Hz running is 1.32 x (>= 1.25: rigid, ISO 10816-3 from memory);
    # declared flexible, so the more conservative rigid boundaries are used and the text says so.
    assert R.support_class(39.7, 1800.0) == "rigid"
    assert R.support_class(37.4, 1800.0) == "flexible"
    pump_result = run_study(pump)
    assert (pump_result.support_computed, pump_result.support_used) == ("rigid", "rigid")
    assert "declared flexible, computed rigid" in pump_result.summary()
    # Feed-pump demo: 19 Hz against 50 Hz is flexible; declared rigid, which stays (the more conservative).
    result = run_study(foundation)
    assert (result.support_computed, result.support_used) == ("flexible", "rigid")
    assert "declared rigid, computed flexible" in result.summary()


def test_zones_are_an_estimate_and_never_acceptable_beside_a_failure(pump):
    result = run_study(pump)
    assert not result.findings.passed
    text = result.summary()
    assert "a field acceptance criterion for broadband vibration, not a design margin" in text
    assert "acceptable for long-term operation" not in text
    assert "not a finding of acceptability" in text
    clear = run_study(pump.with_speed(R.operating_range(1450, 1800)))
    assert clear.verdict == "PASS"
    assert "within the zones for long-term operation, to be confirmed by measurement" in clear.summary()


def test_every_finding_states_its_af_source(pump, fan):
    from resonance.kinds.rotor.study import run_rotor_study

    support = run_study(pump)
    assert {f.mode.af_source for f in support.findings} == {"1/(2 zeta) of the assumed damping"}
    rotor = run_rotor_study(fan)
    assert rotor.findings[0].mode.af_source == "half-power of the computed unbalance response"
    assert rotor.findings[0].as_record()["amplification_factor_source"] == rotor.findings[0].mode.af_source
    methods = " ".join(m["method"] for m in build_record(support).data["methods"])
    assert "1/(2 zeta) of the assumed damping" in methods
    assert "half-power" not in methods  # the support record claims no method it did not use


def test_mode_labels_are_unique_and_say_what_moves(foundation):
    labels = [m.label for m in run_study(foundation).modes]
    assert len(set(labels)) == len(labels)
    assert labels[0] == "mode 1 (machine with baseplate and block)"


def test_records_in_us_units_show_us_units(pump):
    record = build_record(run_study(pump.replace(units="US")))
    inputs = record.text.split("INPUTS", 1)[1].split("ASSUMPTIONS", 1)[0]
    assert "lbm" in inputs
    assert "lbf/in" in inputs
    assert " kg" not in inputs
    assert "kN/mm" not in inputs
    assert "oz·in" in record.text
    assert "g·mm" not in record.text
    assert record.data["modes"][0]["frequency_hz"] == run_study(pump).modes[0].frequency  # the JSON stays SI


def test_record_revision_fields_hash_and_version(tmp_path, foundation_path):
    out = tmp_path / "r.json"
    assert main(["check", str(foundation_path), "--json", str(out)]) == 1
    data = json.loads(out.read_text())
    assert data["scenario_sha256"] == hashlib.sha256(foundation_path.read_bytes()).hexdigest()
    assert data["revision"] == {"preparer": "demo", "checker": "-", "revision": "A", "date": "2026-12-03"}
    assert data["software"]["resonance"] == R.__version__
    assert load_scenario(foundation_path).sha256 == data["scenario_sha256"]


def test_compare_records(tmp_path, pump_path, capsys):
    a, b, c = (tmp_path / n for n in ("a.json", "b.json", "c.json"))
    assert main(["check", str(pump_path), "--json", str(a)]) == 1
    assert main(["check", str(pump_path), "--json", str(b)]) == 1
    edited = tmp_path / "edited.toml"
    edited.write_text(pump_path.read_text().replace('min = "900 rpm"', 'min = "1450 rpm"'))
    assert main(["check", str(edited), "--json", str(c)]) == 0
    capsys.readouterr()
    assert main(["compare", str(a), str(b)]) == 0
    assert "inputs changed: 0" in capsys.readouterr().out
    assert main(["compare", str(a), str(c)]) == 1
    out = capsys.readouterr().out
    assert "verdict: FAIL -> PASS (CHANGED)" in out
    assert "speed.min: '900.0 rpm' -> '1450.0 rpm'" in out
    assert "changed: mode 1 (pump) x 2x: FAIL -> PASS" in out
    bad = tmp_path / "bad.json"
    bad.write_text("{}")
    assert main(["compare", str(a), str(bad)]) == 2
    assert "bad.json: format: got None" in capsys.readouterr().err


def test_html_record_prints_cleanly_and_shows_the_revision(tmp_path, foundation_path):
    out = tmp_path / "r.html"
    main(["check", str(foundation_path), "--html", str(out)])
    page = out.read_text()
    assert "@media print" in page
    assert "@page" in page
    assert '<table class="revision">' in page
    assert hashlib.sha256(foundation_path.read_bytes()).hexdigest() in page


def test_rotor_flow_refuses_fixed_sources_and_needs_flat_for_other_orders(fan):
    from resonance.kinds.rotor.scenario import parse_rotor_scenario, rotor_scenario_to_dict

    table = rotor_scenario_to_dict(fan)
    table["excitations"].append({"order": 2, "label": "2x"})
    with pytest.raises(ScenarioError, match=r"margin\.flat: missing; '2x' is not 1x"):
        parse_rotor_scenario(table)
    table["margin"]["flat"] = 15
    assert parse_rotor_scenario(table).rules.flat.percent == 15.0
    table["excitations"].append({"frequency": "29.6 Hz", "label": "tower fan"})
    from resonance.kinds.rotor.study import run_rotor_study

    with pytest.raises(R.InputValueError, match=r"'tower fan' has a fixed frequency"):
        run_rotor_study(parse_rotor_scenario(table))
    assert math.isclose(fan.rules.lateral_1x.required(10.0, "below"), 15.0)
    # A motor on the line declares twice line frequency (fixed): refused naming [motor], never dropped.
    table["excitations"].pop()
    table["motor"] = {"supply": "line", "line_frequency": "50 Hz"}
    with pytest.raises(ScenarioError, match=r"motor: 'twice line frequency \(100 Hz\)' has a fixed frequency"):
        parse_rotor_scenario(table)


def test_a_user_table_exemption_is_named_without_the_api_words():
    table = R.TableRule((1.0, 3.0, 10.0), (0.0, 0.0, 15.0), (0.0, 0.0, 25.0), name="owner's table")
    rules = R.RuleSet(lateral_1x=table, flat=FLAT)
    mode = R.Mode(25.0, 0.25, "rotor 1st", kind="rotor-lateral")  # AF 2.0: the table asks 0 %
    (finding,) = R.interference_check([mode], [R.running_speed_order(1)], R.operating_range(1400, 1600), rules)
    assert finding.verdict == "EXEMPT"
    assert finding.exemption == "owner's table requires no separation margin for AF 2.00"


@pytest.mark.parametrize(
    ("scenario", "listed", "absent"),
    [
        ("compressor_train.toml", ["torsional modes: torsional"], ["rotor lateral modes", "structural modes"]),
        ("cooling_water_pump.toml", ["structural modes, other orders"], ["rotor lateral modes", "torsional modes"]),
        ("fan_rotor.toml", ["rotor lateral modes against 1x"], ["torsional modes"]),
        ("fan_skid_block.toml", ["structural modes, other orders"], ["rotor lateral modes", "torsional modes"]),
    ],
)
def test_a_record_lists_only_the_rules_it_applied(scenario, listed, absent):
    # A reviewer reads the rules a record was judged by; a rule whose scope held no mode is not one of them
    # (the project's own record requirement, issue 21; no outside source).
    text = R.run(R.load(SCENARIOS / scenario)).record.text
    lines = [x for x in text.splitlines() if "margin rules" in x.lower()]  # the inputs and the assumptions
    assert any("Margin rules by scope" in x for x in lines)
    for line in lines:
        assert all(words in line for words in listed), line
        assert not any(words in line for words in absent), line


def test_the_applied_rules_name_no_rule_when_nothing_was_checked():
    # A rule set with no pair checked says so instead of listing every rule (the project's own requirement).
    assert R.RuleSet().applied_description([]) == "none applied (no mode met an excitation to check)"
    both = R.RuleSet(flat=R.FlatRule(15.0)).applied_description([("structural", "order"), ("torsional", "order")])
    assert "torsional modes" in both
    assert "structural modes" in both
    assert "rotor lateral" not in both


def test_a_failing_verdict_names_what_fails_before_its_exemptions():
    # The space demo fails on a skid mode while its radiation-damped block modes are exempt: the verdict line
    # must not read as if the exemptions were the cause (the project's own record requirement, issue 21).
    line = R.run(R.load(SCENARIOS / "fan_skid_block.toml")).summary.splitlines()[0]
    assert line.startswith("Verdict: FAIL (governed by mode 6 (fan and motor: rocking about x (and skid)) x 1x; ")
    assert "5 exempt coincidences inside the operating range, not the cause, reasons in the findings: " in line
    assert "mode 12 (block: rocking about x) x 2x; mode 7 (block: sliding in x) x 1x" in line


def test_one_rule_in_two_scopes_is_listed_only_for_the_scope_it_was_applied_in():
    # A flat rule given alone governs rotor lateral 1x and every other pair; a rotor checked at 1x only applied
    # it as the lateral rule (the project's own record requirement, issue 21).
    from resonance.checks.rules import as_rule_set

    rules = as_rule_set(R.FlatRule(15.0))
    assert rules.lateral_1x is rules.flat
    assert rules.applied_description([("rotor-lateral", "synchronous")]) == (
        "rotor lateral modes against 1x: flat 15 % (common practice, no single source)"
    )
