"""The calculation record: inputs, assumptions, methods, results, verdicts, cautions.

A :class:`Record` is built once from a :class:`~resonance.study.StudyResult`
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
from dataclasses import dataclass
from importlib import metadata
from pathlib import Path
from typing import TYPE_CHECKING, Any

from .margins import ApiLateralRule
from .scenario import scenario_to_dict
from .study import ACCEPTABLE_ZONES, StudyResult

if TYPE_CHECKING:
    from .field.study import FieldStudyResult
from .units import display_unit

__all__ = ["CAUTION", "METHODS", "Record", "build_record", "write_json", "atomic_write"]

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
    ("Amplification factor by the half-power method, AF = N_c / (N_2 - N_1)", "API RP 684, 2nd ed. (from memory)"),
    ("Separation margin from the operating speed range", "API RP 684, 2nd ed. (from memory)"),
    ("Residual unbalance U = G m / W", "ISO 21940-11:2016, eq. (2)"),
    ("Casing velocity zones A/B/C/D", "ISO 10816-3:2009 Table A.1 (now ISO 20816-3; from memory)"),
)


@dataclass(frozen=True)
class Record:
    """A calculation record: JSON-ready ``data`` and the readable ``text``."""

    data: dict[str, Any]
    text: str


def _versions() -> dict[str, str]:
    out = {"python": platform.python_version()}
    for name in ("resonance", "numpy", "scipy", "pint", "plotly", "ipywidgets"):
        try:
            out[name] = metadata.version(name)
        except metadata.PackageNotFoundError:
            out[name] = "not installed"
    return out


def _assumptions(result: StudyResult) -> list[str]:
    s = result.scenario
    rule_note = (
        "the API lateral rule: margin from the amplification factor, none needed for AF < 2.5"
        if isinstance(s.rule, ApiLateralRule)
        else f"{s.rule.name} ({s.rule.source})"
    )
    return [
        "Linear model, small vibration, viscous damping; lumped masses with one translational degree of freedom each.",
        f"Modal damping ratio {s.model.damping_ratio:g} on every mode, plus the discrete dashpots of the springs.",
        "Support stiffness as given; it is the most uncertain input (see the what-if tolerance band).",
        f"Unbalance {result.scenario.response.unbalance * 1e6:.4g} g mm at 1x ({s.response.basis}), "
        f"acting at '{s.response.force_at}'; response read at '{s.response.measure_at}'.",
        "Predicted vibration is the 1x unbalance response only (not a broadband overall value); "
        "velocity RMS = w X / sqrt(2).",
        f"Required separation margin by {rule_note}.",
        f"ISO 10816-3 group {s.vibration.group}, {s.vibration.support} support; zones "
        f"{' and '.join(ACCEPTABLE_ZONES)} are taken as acceptable for long-term operation.",
    ]


def header_lines(heading: str, title: str, description: str, data: dict[str, Any]) -> list[str]:
    """The opening lines of a text record: title, description, file, time stamp, software."""
    return [
        f"{heading}: {title}",
        "=" * 78,
        *([description] if description else []),
        f"scenario file: {data['scenario_file']}",
        f"created: {data['created_utc']}",
        "software: " + ", ".join(f"{k} {v}" for k, v in data["software"].items()),
        "",
    ]


def basis_lines(data: dict[str, Any]) -> list[str]:
    """The assumptions and the methods with their references, as text lines."""
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
    v_unit, v_factor = display_unit("velocity", s.units)
    lines = header_lines("CALCULATION RECORD", s.title, s.description, data)
    lines += [
        "INPUTS",
        f"  operating speed: {s.speed.speed_min:g} to {s.speed.speed_max:g} rpm"
        + (
            f"; skip bands {', '.join(f'{a:g}-{b:g}' for a, b in s.speed.skip_bands)} rpm" if s.speed.skip_bands else ""
        ),
        "  excitations: " + ", ".join(e.label for e in s.excitations),
        "  masses: " + ", ".join(f"{m.name} {m.mass:g} kg" for m in s.model.masses),
        "  springs: "
        + ", ".join(
            f"{x.label} ({x.node_a}-{x.node_b}) {x.stiffness / 1e6:g} kN/mm"
            + (f", {x.damping:g} N s/m" if x.damping else "")
            for x in s.model.springs
        ),
        f"  margin rule: {s.rule.name} ({s.rule.source})",
        "",
        *basis_lines(data),
        "MODES",
        *(
            f"  {m['label']}: {m['frequency_hz']:.2f} Hz ({m['frequency_hz'] * 60:.0f} cpm), damping ratio "
            f"{m['damping_ratio']:.4f}, log dec. {m['log_decrement']:.3f}, AF {m['amplification_factor_text']}"
            for m in data["modes"]
        ),
        "",
        "FINDINGS (worst first)",
        result.findings.to_text(system=s.units),
        "",
        "VIBRATION",
        f"  peak 1x casing velocity {result.peak_velocity_rms * v_factor:.{3 if s.units == 'US' else 2}f} "
        f"{v_unit} RMS at {result.peak_velocity_speed:.0f} rpm: ISO zone {result.zone}",
        "",
        *(
            ["FIELD VERIFICATION", *(f"  {line}" for line in data["field"]["summary"].splitlines()), ""]
            if "field" in data
            else []
        ),
        f"VERDICT: {data['verdict']}",
        "",
        "CAUTION",
        f"  {CAUTION}",
    ]
    return "\n".join(lines)


def build_record(
    result: StudyResult, created: _dt.datetime | None = None, field: FieldStudyResult | None = None
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
            }
        )
    data: dict[str, Any] = {
        "format": "resonance-record/1",
        "title": result.scenario.title,
        "created_utc": created.replace(microsecond=0).isoformat(),
        "software": _versions(),
        "scenario_file": result.scenario.source,
        "scenario": scenario_to_dict(result.scenario),
        "assumptions": _assumptions(result),
        "methods": [{"method": m, "reference": r} for m, r in METHODS],
        "modes": modes,
        "findings": result.findings.to_records(),
        "vibration": {
            "peak_velocity_rms_mm_s": result.peak_velocity_rms * 1e3,
            "at_speed_rpm": result.peak_velocity_speed,
            "zone": result.zone,
            "group": result.scenario.vibration.group,
            "support": result.scenario.vibration.support,
            "passed": result.vibration_passed,
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
            "passed": field.passed,
            "summary": field.summary(),
        }
        data["verdict"] = "PASS" if result.passed and field.passed else "FAIL"
    return Record(data, _text(result, data))


def atomic_write(path: str | os.PathLike[str], text: str) -> Path:
    """Write text through a temporary file and a rename, so no partial file is left."""
    target = Path(path)
    temporary = target.with_name(f".{target.name}.partial")
    temporary.write_text(text, encoding="utf-8")
    os.replace(temporary, target)
    return target


def write_json(record: Record, path: str | os.PathLike[str]) -> Path:
    """Write the record's data as JSON."""
    return atomic_write(path, json.dumps(record.data, indent=2))
