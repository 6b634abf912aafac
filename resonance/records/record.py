"""The calculation record: inputs, assumptions, methods, results, verdicts, cautions.

A :class:`Record` is built once from a :class:`~resonance.kinds.support.study.StudyResult`
and carries the same content two ways: ``data`` (JSON-ready, SI values,
speeds in rpm) and ``text`` (a plain-text record a reviewer can read, in the
scenario's unit system). The
offline HTML record adds the figures (:mod:`resonance.ui.report`).
"""

from __future__ import annotations

import datetime as _dt
import json
import math
import os
import platform
from collections.abc import Sequence
from dataclasses import dataclass
from importlib import metadata
from pathlib import Path
from typing import TYPE_CHECKING, Any

from .._version import __version__
from ..checks.excitations import Excitation
from ..checks.interference import FindingsTable, verdict_line
from ..kinds.support.scenario import RecordSpec, scenario_to_dict
from ..kinds.support.study import ACCEPTABLE_ZONES, StudyResult
from ..studies.uncertainty import uncertainty_lines
from .tables import atomic_write

if TYPE_CHECKING:
    from ..kinds.field.study import FieldStudyResult
    from ..kinds.support.whatif import FixOptions
    from ..studies.uncertainty import UncertaintyResult
from ..core.units import display_unit

__all__ = [
    "CAUTION",
    "METHODS",
    "Record",
    "basis_lines",
    "build_record",
    "excitation_lines",
    "excitation_rows",
    "header_lines",
    "methods_used",
    "record_head",
    "software_versions",
    "write_json",
]

CAUTION = (
    "Operating near an unverified resonance can fail shafts, bearings, couplings, welds and anchors by "
    "fatigue within hours and can throw parts. These results are engineering estimates that depend on "
    "the model and its inputs (support stiffness above all is uncertain). They do not replace the "
    "governing standard, the manufacturer's data, local codes, field verification, or review by a "
    "qualified (where required, licensed) engineer. Field tests on running machines need the site's "
    "safety procedures."
)

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

_AF_REFERENCES = {
    "half-power": "API RP 684, 2nd ed., half-power method AF = N_c / (N_2 - N_1) (from memory)",
    "1/(2 zeta)": "S. S. Rao, Mechanical Vibrations, 6th ed., 2017, sec. 3.4 (Q = 1 / (2 zeta))",
    "measured": "D. J. Ewins, Modal Testing, 2nd ed., 2000, ch. 4",
}


def methods_used(base: tuple[tuple[str, str], ...], findings: FindingsTable) -> list[dict[str, str]]:
    """The methods of a record: the fixed ones, each margin rule as applied, each AF source as used.

    Parameters
    ----------
    base : tuple of (str, str)
        The methods every record of the kind uses, with references.
    findings : FindingsTable
        The findings whose rules and AF sources are added.

    Returns
    -------
    list of dict
        ``{"method": ..., "reference": ...}`` entries.

    Raises
    ------
    Nothing
        Pure text.
    """
    out = [{"method": m, "reference": r} for m, r in base]
    for line in findings.rules_used():
        out.append({"method": f"Required separation margin: {line}", "reference": line.split(" (", 1)[1].split(")")[0]})
    for source in findings.af_sources():
        reference = next((r for key, r in _AF_REFERENCES.items() if key in source), "as stated")
        out.append({"method": f"Amplification factor: {source}", "reference": reference})
    return out


def excitation_rows(excitations: Sequence[Excitation]) -> list[dict[str, Any]]:
    """Every excitation a study checked, for the JSON record: label, kind, order or frequency, origin.

    Parameters
    ----------
    excitations : sequence of Excitation
        As checked.

    Returns
    -------
    list of dict
        ``{"label", "kind", "order", "frequency_hz", "source"}`` per excitation (order in the reference
        shaft's speed, or a fixed frequency [Hz]; the other one None).

    Raises
    ------
    Nothing
        Pure data.
    """
    return [
        {
            "label": e.label,
            "kind": e.kind,
            "order": e.order,
            "frequency_hz": e.frequency,
            "source": e.source or "given",
            **({"law_speed_rpm_frequency_hz": [list(p) for p in e.law]} if e.law else {}),
        }
        for e in excitations
    ]


def excitation_lines(excitations: Sequence[Excitation], speed_of: str = "running speed") -> list[str]:
    """Every excitation a study checked, one line each with its origin, for the text record.

    Parameters
    ----------
    excitations : sequence of Excitation
        As checked.
    speed_of : str
        What the orders are orders of, in words (``"the driver shaft's speed"``).

    Returns
    -------
    list of str
        A heading line and one indented line per excitation.

    Raises
    ------
    Nothing
        Pure text.
    """
    lines = [f"  excitations checked ({len(excitations)}; orders of {speed_of}):"]
    for e in excitations:
        value = f"{e.order:.6g}x" if e.order is not None else f"{e.frequency:.6g} Hz fixed"
        if e.law:
            value += " at the rated slip; the frequency follows the slip's law"
        lines.append(f"    - {e.label} [{e.kind}, {value}]: {e.source or 'given'}")
    return lines


@dataclass(frozen=True)
class Record:
    """A calculation record: JSON-ready ``data`` and the readable ``text`` (which ends with the caution).

    Attributes
    ----------
    data : dict
        JSON-ready values (SI; speeds in rpm), with the record's head.
    text : str
        The readable record in the scenario's units, ending with the caution.
    """

    data: dict[str, Any]
    text: str

    @property
    def body(self) -> str:
        """The text without its closing caution, for display where the caution is already shown."""
        head, _, _ = self.text.rpartition("\nCAUTION\n")
        return head.rstrip() if head else self.text


def software_versions() -> dict[str, str]:
    """Versions of this package (from its one source) and of what it runs on.

    Returns
    -------
    dict of str to str
        Python, this package (from ``resonance._version``) and its main dependencies.

    Raises
    ------
    Nothing
        A package that is not installed is reported as such.
    """
    out = {"python": platform.python_version(), "resonance": __version__}
    for name in ("numpy", "scipy", "pint", "plotly", "ipywidgets"):
        try:
            out[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            out[name] = "not installed"
    return out


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
        f"Margin rules by scope: {s.rules.description}.",
        f"ISO 10816-3 group {s.vibration.group}, {result.support_note(s.units)}. The zones judge broadband "
        f"vibration measured on site: the predicted 1x value against them is an estimate, not a design margin; "
        f"zones {' and '.join(ACCEPTABLE_ZONES)} are those for unrestricted long-term operation.",
    ]


def record_head(
    record_format: str, title: str, source: str, sha256: str | None, revision: RecordSpec, created: _dt.datetime
) -> dict[str, Any]:
    """The opening fields of a record's data: format, title, time, software, scenario file and hash, revision.

    Parameters
    ----------
    record_format : str
        The record format's name and version.
    title : str
        The scenario's title.
    source : str
        The scenario file's name.
    sha256 : str or None
        The SHA-256 of the scenario file's bytes (None when edited in memory).
    revision : RecordSpec
        Preparer, checker, revision and date.
    created : datetime
        Time stamp (UTC).

    Returns
    -------
    dict
        The opening fields of the record's data.

    Raises
    ------
    Nothing
        Pure data.
    """
    return {
        "format": record_format,
        "title": title,
        "created_utc": created.replace(microsecond=0).isoformat(),
        "software": software_versions(),
        "scenario_file": source,
        "scenario_sha256": sha256,
        "revision": {
            "preparer": revision.preparer,
            "checker": revision.checker,
            "revision": revision.revision,
            "date": revision.date,
        },
    }


def header_lines(heading: str, title: str, description: str, data: dict[str, Any]) -> list[str]:
    """The opening lines of a text record: title, description, file and hash, revision, time stamp, software.

    Parameters
    ----------
    heading : str
        The record's heading.
    title, description : str
        The scenario's title and description.
    data : dict
        The record's data (its head, see :func:`record_head`).

    Returns
    -------
    list of str

    Raises
    ------
    KeyError
        Data without the head fields.
    """
    rev = data["revision"]
    return [
        f"{heading}: {title}",
        "=" * 78,
        *([description] if description else []),
        f"scenario file: {data['scenario_file']}",
        f"scenario SHA-256: {data['scenario_sha256'] or 'none (scenario edited in memory, not read from a file)'}",
        f"revision: {rev['revision'] or '-'}   date: {rev['date'] or '-'}   "
        f"prepared by: {rev['preparer'] or '-'}   checked by: {rev['checker'] or '-'}",
        f"created: {data['created_utc']}",
        "software: " + ", ".join(f"{k} {v}" for k, v in data["software"].items()),
        "",
    ]


def basis_lines(data: dict[str, Any]) -> list[str]:
    """The assumptions and the methods with their references, as text lines.

    Parameters
    ----------
    data : dict
        The record's data, with its assumptions and methods.

    Returns
    -------
    list of str

    Raises
    ------
    KeyError
        Data without assumptions or methods.
    """
    return [
        "ASSUMPTIONS",
        *(f"  - {a}" for a in data["assumptions"]),
        "",
        "METHODS AND REFERENCES",
        *(f"  - {m['method']} [{m['reference']}]" for m in data["methods"]),
        "",
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
        f"  margin rules: {s.rules.description}",
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
    field: FieldStudyResult | None = None,
    uncertainty: UncertaintyResult | None = None,
    fixes: FixOptions | None = None,
) -> Record:
    """Build the record of a study result (and of its field verification, when given).

    Parameters
    ----------
    result : StudyResult
        The study to record.
    field : FieldStudyResult, optional
        Its field verification; the verdict then needs both to pass.
    created : datetime, optional
        Time stamp to write (now, UTC, if omitted).
    uncertainty : UncertaintyResult, optional
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
        data["field"] = {
            "coastdown_file": field.spec.coastdown.name,
            "impact_file": None if field.spec.impact is None else field.spec.impact.name,
            "resonances": [
                {
                    "speed_rpm": r.speed,
                    "amplification_factor": r.amplification_factor,
                    "phase_change_deg": r.phase_change,
                    "confirmed": r.confirmed,
                    "warnings": list(r.warnings),
                }
                for r in field.resonances
            ],
            "findings": field.findings.to_records() if field.findings else [],
            "impact_modes": [
                {"frequency_hz": p.frequency, "damping_ratio": p.damping_ratio} for p in field.impact_poles
            ],
            "tuned_factors": field.tuned.factors if field.tuned else {},
            "tuned_findings": field.tuned_study.findings.to_records() if field.tuned_study else [],
            "governing_findings": field.governing.to_records(),
            "verdict_basis": field.verdict_basis,
            "passed": field.passed,
            "summary": field.summary(),
        }
        if not field.passed:
            data["verdict"] = "FAIL"
    if fixes is not None:
        data["fixes"] = fixes.record_data()
    if uncertainty is not None:
        data["uncertainty"] = uncertainty.record_data()
        if not uncertainty.passed:
            data["verdict"] = "FAIL"
    return Record(data, _text(result, data))


def write_json(record: Record, path: str | os.PathLike[str]) -> Path:
    """Write the record's data as JSON.

    Parameters
    ----------
    record : Record
        The record.
    path : path-like
        The file to write.

    Returns
    -------
    pathlib.Path
        The file written.

    Raises
    ------
    OSError
        As :func:`atomic_write`.
    """
    return atomic_write(path, json.dumps(record.data, indent=2))
