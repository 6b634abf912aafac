"""The interference check: modes x excitations x speed range -> findings.

Sources: coincidence speed N_c = 60 f_n / n for order n (common practice);
separation margin and the API lateral required margin (API RP 684 2nd ed. /
API Std 617 8th ed., from memory); flat 15 % rule (common practice). Modes
and ranges below are invented demo values.
"""

import json

import pytest
from numpy.testing import assert_allclose

import resonance as R

SPEEDS = R.operating_range(1800.0, 3600.0)


def test_single_finding_below_range_passes():
    # 25 Hz mode: 1x coincidence 1500 rpm, SM = 100 (1800 - 1500) / 1800 = 16.7 %;
    # AF 10 requires 17 (1 - 1/8.5) = 15.0 % below (API 617/684, from memory) -> pass.
    mode = R.Mode(25.0, 0.05, "rotor 1st lateral", kind="rotor-lateral")
    table = R.interference_check([mode], [R.running_speed_order(1)], SPEEDS)
    (finding,) = table
    assert finding.coincidence_speed == 1500.0
    assert finding.location == "below"
    assert_allclose(finding.margin, 100 * 300 / 1800, rtol=1e-15)
    assert_allclose(finding.required_margin, 17 * (1 - 1 / 8.5), rtol=1e-12)
    assert finding.passed
    assert table.passed


def test_inside_range_fails_and_is_worst_first():
    modes = [R.Mode(25.0, 0.05, "mode A", kind="rotor-lateral"), R.Mode(45.0, 0.02, "mode B", kind="rotor-lateral")]
    table = R.interference_check(
        modes, [R.running_speed_order(1), R.running_speed_order(2)], SPEEDS, R.RuleSet(flat=R.FlatRule(15.0))
    )
    assert not table.passed
    worst = table[0]
    # Mode B at 45 Hz: 1x coincidence 2700 rpm, mid-range: margin -100 * 900 / 3600 = -25 %.
    assert (worst.mode.label, worst.excitation.label, worst.location) == ("mode B", "1x", "inside")
    assert_allclose(worst.margin, -25.0, rtol=1e-15)
    shortfalls = [f.shortfall for f in table]
    failed = [f for f in table if not f.passed]
    assert shortfalls[: len(failed)] == sorted(shortfalls[: len(failed)], reverse=True)
    assert all(not f.passed for f in table[: len(failed)])


def test_critically_damped_mode_needs_no_margin_but_is_never_a_plain_pass():
    # AF < 2.5: "critically damped", no margin required (API RP 684, from memory); inside the range the
    # finding shows as exempt and the verdict names it.
    table = R.interference_check(
        [R.Mode(40.0, 0.3, "damped", kind="rotor-lateral")], [R.running_speed_order(1)], SPEEDS
    )
    assert table[0].location == "inside"
    assert table[0].required_margin == 0.0
    assert table[0].verdict == "EXEMPT"
    assert "requires no separation margin for AF 1.67" in table[0].exemption
    assert table.passed
    assert table.verdict == "PASS WITH EXEMPTION"
    assert table.summary().startswith("PASS WITH EXEMPTION: 0 of 1 checks meet the required margin; 1 by exemption")
    record = table.to_records()[0]
    assert record["verdict"] == "EXEMPT"
    assert record["exemption"].startswith("API lateral requires no separation margin")


def test_fixed_frequency_source_and_flat_rule():
    # 95 Hz mode vs 100 Hz (twice 50 Hz line): 5 % below; flat 15 % rule (common practice) fails.
    table = R.interference_check(
        [R.Mode(95.0, 0.02, "frame")], [R.twice_line_frequency(50.0)], SPEEDS, R.FlatRule(15.0)
    )
    finding = table[0]
    assert finding.coincidence_speed is None
    assert (finding.location, finding.side) == ("below", "below")
    assert_allclose(finding.margin, 5.0, rtol=1e-13)
    assert finding.required_margin == 15.0
    assert finding.verdict == "FAIL"


def test_skip_band_changes_the_verdict():
    # A 20 Hz mode's 1x coincidence (1200 rpm) sits inside a 900-1800 rpm drive range; a skip band
    # 1100-1300 rpm puts it 100 (1300 - 1200) / 1300 = 7.7 % below the upper interval (nearer than
    # 9.1 % above the lower one).
    mode = [R.Mode(20.0, 0.1, "skid")]
    order = [R.running_speed_order(1)]
    plain = R.interference_check(mode, order, R.operating_range(900.0, 1800.0), R.FlatRule(5.0))
    skipped = R.interference_check(mode, order, R.operating_range(900.0, 1800.0, [(1100.0, 1300.0)]), R.FlatRule(5.0))
    assert not plain.passed
    assert skipped.passed
    assert_allclose(skipped[0].margin, 100 * 100 / 1300, rtol=1e-13)
    assert skipped[0].side == "below"


def test_renderings_agree():
    modes = [R.Mode(25.0, 0.05, "mode A", kind="rotor-lateral"), R.Mode(45.0, 0.02, "mode B", kind="rotor-lateral")]
    table = R.interference_check(modes, [R.running_speed_order(1)], SPEEDS)
    text = table.to_text()
    assert text.splitlines()[0].startswith("mode")
    assert "FAIL: 1 of 2 checks" in text.splitlines()[-1]
    records = json.loads(table.to_json())
    assert [r["verdict"] for r in records] == ["FAIL", "PASS"]
    assert records[0]["coincidence_speed_rpm"] == 2700.0
    assert table.to_html().count("<tr") == 3


def test_undamped_mode_has_infinite_af_and_max_requirement():
    # zeta = 0 -> AF = inf -> caps of 16 % below / 26 % above (API 617/684, from memory).
    table = R.interference_check(
        [R.Mode(100.0, 0.0, "undamped", kind="rotor-lateral")], [R.running_speed_order(1)], SPEEDS
    )
    assert table[0].required_margin == 26.0
    assert table[0].as_record()["amplification_factor"] is None


@pytest.mark.parametrize(
    ("call", "error", "message"),
    [
        (lambda: R.interference_check([], [R.running_speed_order(1)], SPEEDS), ValueError, r"modes: got none"),
        (lambda: R.interference_check([R.Mode(5.0, 0.1)], [], SPEEDS), ValueError, r"excitations: got none"),
        (lambda: R.interference_check([25.0], [R.running_speed_order(1)], SPEEDS), TypeError, r"modes\[0\]: got float"),
        (
            lambda: R.interference_check([R.Mode(5.0, 0.1)], [R.running_speed_order(1)], (1800, 3600)),
            TypeError,
            r"speed_range: got tuple",
        ),
        (lambda: R.Mode(-5.0, 0.1, "bad"), ValueError, r"bad: frequency -5\.0 Hz"),
        (
            lambda: R.Mode(5.0, 0.1, "bad", amplification_factor_override=0.5),
            ValueError,
            r"bad: amplification factor 0\.5",
        ),
    ],
)
def test_bad_check_inputs(call, error, message):
    with pytest.raises(error, match=message):
        call()


def test_mode_accepts_quantities():
    # 2400 cpm = 40 Hz (1 Hz = 60 cpm, common practice).
    assert R.Mode(R.ureg("2400 cpm"), 0.04, "q").frequency == 40.0
    with pytest.raises(R.InputTypeError, match=r"q: frequency: got 3 m"):
        R.Mode(R.ureg("3 m"), 0.04, "q")
