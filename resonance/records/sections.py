"""The record's shared sections, written once and fed by every kind.

The header, the basis of the check, the excitations with their sources, the methods with their sources, and
the uncertainty study.
"""

from __future__ import annotations

from collections.abc import Mapping, Sequence
from typing import TYPE_CHECKING, Any, cast

from ..checks.excitations import Excitation, ExcitationKind
from ..checks.interference import FindingsTable
from ..dynamics.modes import ModeKind

if TYPE_CHECKING:
    pass

__all__ = [
    "finding_pairs",
    "uncertainty_lines",
    "basis_lines",
    "excitation_lines",
    "excitation_rows",
    "header_lines",
    "methods_used",
]


_AF_REFERENCES = {
    "half-power": "API RP 684, 2nd ed., half-power method AF = N_c / (N_2 - N_1) (from memory)",
    "1/(2 zeta)": "S. S. Rao, Mechanical Vibrations, 6th ed., 2017, sec. 3.4 (Q = 1 / (2 zeta))",
    "measured": "D. J. Ewins, Modal Testing, 2nd ed., 2000, ch. 4",
}


def finding_pairs(findings: FindingsTable) -> list[tuple[ModeKind, ExcitationKind]]:
    """The (mode kind, excitation kind) of each finding: the pairs whose rules a record lists.

    Parameters
    ----------
    findings : FindingsTable
        A study's findings.

    Returns
    -------
    list of (str, str)
        One pair per finding, in the table's order.

    Raises
    ------
    Nothing
        The findings are already validated.
    """
    # An excitation's kind is always set once it is built (None only before its __post_init__).
    return [(f.mode.kind, cast("ExcitationKind", f.excitation.kind)) for f in findings]


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
        The heading block of the record, ending with a blank line.

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
        The assumptions and the methods with their references, ending with a blank line.

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


def uncertainty_lines(data: Mapping[str, Any]) -> list[str]:
    """The uncertainty study in a text record, from ``UncertaintyResult.record_data`` (studies layer).

    Parameters
    ----------
    data : mapping
        The record data of the study.

    Returns
    -------
    list of str
        Lines, ending with a blank one.

    Raises
    ------
    KeyError
        Data not made by :meth:`~resonance.studies.uncertainty.UncertaintyResult.record_data`.
    """
    return [
        "UNCERTAINTY (each input's factor on its nominal value)",
        *(f"  {x['vary']}: {x['distribution']}" for x in data["inputs"]),
        *(f"  {line}" for line in data["summary"].splitlines()),
        *(
            f"  P(fail) {100 * row['probability']:.1f} %: {row['mode']} x {row['excitation']}"
            for row in data["failure_probability"][:8]
        ),
        f"  Method: {data['method']}.",
        "  The distributions are judgements (soil and supports above all); the probability is only as good as they"
        " are.",
        "",
    ]
