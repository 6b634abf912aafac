"""The calculation record of a support study (text and JSON).

Inputs, assumptions, methods, modes, findings, vibration, and the field verification, fixes and uncertainty
sections when given.
"""

from __future__ import annotations

import datetime as _dt
import math
from typing import TYPE_CHECKING, Any

from ...checks.interference import verdict_line
from ...records.sections import finding_pairs, uncertainty_lines
from .scenario import scenario_to_dict
from .study import ACCEPTABLE_ZONES, StudyResult

if TYPE_CHECKING:
    from .whatif import FixOptions
from ...core.units import display_unit
from ...records.record import CAUTION, Record, RecordSection, record_head
from ...records.sections import basis_lines, excitation_lines, excitation_rows, header_lines, methods_used

__all__ = [
    "METHODS",
    "build_record",
]


METHODS: tuple[tuple[str, str], ...] = (
    (
        "Natural frequencies and modes: K phi = w^2 M phi; complex modes of the first-order form for "
        "non-proportional damping",
        "S. S. Rao, Mechanical Vibrations, 6th ed., 2017, ch. 6; Friswell et al., Dynamics of Rotating "
        "Machines, 2010, sec. 2.5",
    ),
    (
        "Forced response: receptance (K - w^2 M + i w C)^-1 by modal expansion, unbalance force U w^2",
        "D. J. Ewins, Modal Testing, 2nd ed., 2000, ch. 2",
    ),
    (
        "Modal damping matrix C = M Phi diag(2 zeta w) Phi^T M",
        "R. W. Clough and J. Penzien, Dynamics of Structures, 2nd ed., 1993, sec. 12-5",
    ),
    ("Separation margin from the operating speed range", "API RP 684, 2nd ed. (from memory)"),
    ("Residual unbalance U = G m / W", "ISO 21940-11:2016, eq. (2)"),
    ("Casing velocity zones A/B/C/D", "ISO 10816-3:2009 Table A.1 (now ISO 20816-3; from memory)"),
    ("Support class from the lowest natural frequency", "ISO 10816-3:2009 sec. 3.3 (from memory)"),
)


def _assumptions(result: StudyResult) -> list[str]:
    s = result.scenario
    u_unit, u_factor = display_unit("unbalance", s.units)
    motor = ""
    if s.motor is not None:
        motor = (
            f"Motor on a drive ({s.motor.poles} poles, slip {s.motor.slip:g} taken constant): its electrical "
            "frequencies follow the speed."
            if s.motor.supply == "drive"
            else f"Motor on the line at {s.motor.line_frequency:g} Hz: its electrical frequencies are fixed."
        )
    return [
        "Linear model, small vibration, viscous damping; lumped masses with one translational degree of freedom each.",
        f"Modal damping ratio {s.model.damping_ratio:g} on every mode (assumed), plus the discrete dashpots of the "
        "springs; the AF of each structural mode is 1/(2 zeta) of that damping and is shown for information (the "
        "flat rule does not use it).",
        "Support stiffness as given; it is the most uncertain input (see the what-if tolerance band).",
        f"Unbalance {s.response.unbalance * u_factor:.4g} {u_unit} at 1x ({s.response.basis}), "
        f"acting at '{s.response.force_at}'; response read at '{s.response.measure_at}'.",
        "Predicted vibration is the 1x unbalance response only (not a broadband overall value); "
        "velocity RMS = w X / sqrt(2).",
        *([motor] if motor else []),
        f"Margin rules by scope (those applied): {s.rules.applied_description(finding_pairs(result.findings))}.",
        f"ISO 10816-3 group {s.vibration.group}, {result.support_note(s.units)}. The zones judge broadband "
        f"vibration measured on site: the predicted 1x value against them is an estimate, not a design margin; "
        f"zones {' and '.join(ACCEPTABLE_ZONES)} are those for unrestricted long-term operation.",
    ]


def _text(result: StudyResult, data: dict[str, Any]) -> str:
    s = result.scenario
    m_unit, m_factor = display_unit("mass", s.units)
    k_unit, k_factor = display_unit("stiffness", s.units)
    c_unit, c_factor = display_unit("damping", s.units)
    f_unit, f_factor = display_unit("frequency", s.units)
    lines = header_lines("CALCULATION RECORD", s.title, s.description, data)
    lines += [
        "INPUTS",
        f"  operating speed: {s.speed.describe()}",
        *excitation_lines(s.excitations),
        "  masses: " + ", ".join(f"{m.name} {m.mass * m_factor:.5g} {m_unit}" for m in s.model.masses),
        "  springs: "
        + ", ".join(
            f"{x.label} ({x.node_a}-{x.node_b}) {x.stiffness * k_factor:.5g} {k_unit}"
            + (f", {x.damping * c_factor:.5g} {c_unit}" if x.damping else "")
            for x in s.model.springs
        ),
        f"  margin rules (those applied): {s.rules.applied_description(finding_pairs(result.findings))}",
        "",
        *basis_lines(data),
        "MODES",
        *(
            f"  {m['label']}: {m['frequency_hz'] * f_factor:.{2 if s.units == 'SI' else 0}f} {f_unit}, damping ratio "
            f"{m['damping_ratio']:.4f}, log dec. {m['log_decrement']:.3f}, AF {m['amplification_factor_text']} "
            f"({m['amplification_factor_source']})"
            for m in data["modes"]
        ),
        "",
        "FINDINGS (worst first)",
        result.findings.to_text(system=s.units),
        "",
        "VIBRATION (an estimate against a field acceptance criterion)",
        f"  {result.vibration_line(s.units)}",
        "",
        *(
            ["FIELD VERIFICATION", *(f"  {line}" for line in data["field"]["summary"].splitlines()), ""]
            if "field" in data
            else []
        ),
        *(
            ["WHAT WOULD FIX IT (what-if screening)", *(f"  {line}" for line in data["fixes"]["words"]), ""]
            if "fixes" in data
            else []
        ),
        *(uncertainty_lines(data["uncertainty"]) if "uncertainty" in data else []),
        verdict_line(data["verdict"], result.findings, heading="VERDICT"),
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return "\n".join(lines)


def build_record(
    result: StudyResult,
    created: _dt.datetime | None = None,
    field: RecordSection | None = None,
    uncertainty: RecordSection | None = None,
    fixes: FixOptions | None = None,
) -> Record:
    """Build the record of a study result (and of its field verification, when given).

    Parameters
    ----------
    result : StudyResult
        The study to record.
    field : RecordSection, optional
        Its field verification; the verdict then needs both to pass.
    created : datetime, optional
        Time stamp to write (now, UTC, if omitted).
    uncertainty : RecordSection, optional
        Its uncertainty study; it fails the verdict only when a ``max_failure_probability`` is exceeded.
    fixes : FixOptions, optional
        The smallest changes that make every margin check pass (for a failing scenario).

    Returns
    -------
    Record
        Data (JSON-ready, SI) and text (in the scenario's units).

    Raises
    ------
    Nothing
        The study result is already validated.
    """
    created = created or _dt.datetime.now(_dt.timezone.utc)
    modes = []
    for m in result.modes:
        af = m.amplification_factor
        modes.append(
            {
                "label": m.label,
                "frequency_hz": m.frequency,
                "damping_ratio": m.damping_ratio,
                "log_decrement": m.log_decrement,
                "amplification_factor": af if math.isfinite(af) else None,
                "amplification_factor_text": "inf" if math.isinf(af) else f"{af:.1f}",
                "amplification_factor_source": m.af_source,
                "kind": m.kind,
            }
        )
    s = result.scenario
    data: dict[str, Any] = {
        **record_head("resonance-record/2", s.title, s.source, s.sha256, s.record, created),
        "scenario": scenario_to_dict(s),
        "excitations": excitation_rows(s.excitations),
        "assumptions": _assumptions(result),
        "methods": methods_used(METHODS, result.findings),
        "modes": modes,
        "findings": result.findings.to_records(),
        "vibration": {
            "peak_velocity_rms_mm_s": result.peak_velocity_rms * 1e3,
            "at_speed_rpm": result.peak_velocity_speed,
            "zone": result.zone,
            "group": result.scenario.vibration.group,
            "support_declared": result.scenario.vibration.support,
            "support_computed": result.support_computed,
            "support_used": result.support_used,
            "passed": result.vibration_passed,
            "note": "predicted 1x against the zone boundaries: a field acceptance criterion, not a design margin",
        },
        "verdict": result.verdict,
        "cautions": CAUTION,
    }
    if field is not None:
        data["field"] = field.record_data()
        if not field.passed:
            data["verdict"] = "FAIL"
    if fixes is not None:
        data["fixes"] = fixes.record_data()
    if uncertainty is not None:
        data["uncertainty"] = uncertainty.record_data()
        if not uncertainty.passed:
            data["verdict"] = "FAIL"
    return Record(data, _text(result, data))
