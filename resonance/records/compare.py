"""Compare two JSON calculation records: what changed in the inputs, the findings and the verdict.

A reviewer signing revision B of a record wants to know what moved since
revision A: :func:`compare_records` lists the scenario inputs that changed
(by their path in the scenario, e.g. ``model.springs[2].stiffness``), the
findings that appeared, disappeared or changed verdict or margin, and the
verdict of each. The ``compare`` command prints this and exits 0 when the
verdict is the same, 1 when it changed.
"""

from __future__ import annotations

import json
import math
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Any

from ..core.errors import InputValueError

__all__ = ["RecordComparison", "compare_records", "load_record"]

_FORMATS = ("resonance-record/2", "resonance-rotor-record/2")


def load_record(path: str | os.PathLike[str]) -> dict[str, Any]:
    """Read a JSON record written by ``check --json`` (only read).

    Parameters
    ----------
    path : path-like
        A JSON record written by ``check --json``.

    Returns
    -------
    dict
        The record's data.

    Raises
    ------
    InputValueError
        The file cannot be read, is not JSON, or is not a record of a format this version writes.
    """
    name = os.fspath(path)
    try:
        text = Path(path).read_text(encoding="utf-8")
    except (OSError, UnicodeDecodeError) as error:
        raise InputValueError(f"{name}: cannot be read ({getattr(error, 'strerror', None) or error})") from None
    try:
        data = json.loads(text)
    except json.JSONDecodeError as error:
        raise InputValueError(f"{name}: is not JSON ({error.msg} at line {error.lineno})") from None
    if not isinstance(data, dict) or data.get("format") not in _FORMATS:
        found = data.get("format") if isinstance(data, dict) else type(data).__name__
        raise InputValueError(f"{name}: format: got {found!r}; expected a record of format {' or '.join(_FORMATS)}")
    for key in ("scenario", "findings", "verdict"):
        if key not in data:
            raise InputValueError(f"{name}: {key}: missing; expected a complete record")
    return data


def _flatten(value: Any, prefix: str = "") -> dict[str, Any]:
    if isinstance(value, Mapping):
        out: dict[str, Any] = {}
        for key, item in value.items():
            out.update(_flatten(item, f"{prefix}.{key}" if prefix else str(key)))
        return out
    if isinstance(value, list):
        out = {}
        for i, item in enumerate(value):
            out.update(_flatten(item, f"{prefix}[{i}]"))
        return out
    return {prefix: value}


def _key(finding: Mapping[str, Any]) -> str:
    return f"{finding.get('mode')} x {finding.get('excitation')}"


def _same(a: Any, b: Any) -> bool:
    if isinstance(a, float) and isinstance(b, float):
        return math.isclose(a, b, rel_tol=1e-9, abs_tol=1e-12)
    return bool(a == b)


@dataclass(frozen=True)
class RecordComparison:
    """What changed between two records.

    Attributes
    ----------
    inputs : tuple of (str, object, object)
        Changed scenario fields: path, old value, new value (``None`` where absent).
    findings : tuple of str
        Findings added, removed, or with a changed verdict or margin, in words.
    old_verdict, new_verdict : str
        The verdict of each record.
    """

    inputs: tuple[tuple[str, Any, Any], ...]
    findings: tuple[str, ...]
    old_verdict: str
    new_verdict: str

    @property
    def verdict_changed(self) -> bool:
        """True when the verdicts differ."""
        return self.old_verdict != self.new_verdict

    def to_text(self) -> str:
        """The comparison as plain text."""
        lines = [f"verdict: {self.old_verdict} -> {self.new_verdict}" + (" (CHANGED)" if self.verdict_changed else "")]
        lines.append(f"inputs changed: {len(self.inputs)}")
        lines += [f"  {path}: {old!r} -> {new!r}" for path, old, new in self.inputs]
        lines.append(f"findings changed: {len(self.findings)}")
        lines += [f"  {line}" for line in self.findings]
        return "\n".join(lines)


def compare_records(old: Mapping[str, Any], new: Mapping[str, Any]) -> RecordComparison:
    """Compare two records' data (see :func:`load_record`).

    Parameters
    ----------
    old, new : mapping
        Two records' data (see :func:`load_record`).

    Returns
    -------
    RecordComparison
        Changed inputs, changed findings and both verdicts.

    Raises
    ------
    KeyError
        A record without scenario, findings or verdict (:func:`load_record` refuses those first).

    Examples
    --------
    >>> a = {"scenario": {"speed": {"max": "1800 rpm"}}, "findings": [], "verdict": "PASS"}
    >>> b = {"scenario": {"speed": {"max": "1900 rpm"}}, "findings": [], "verdict": "FAIL"}
    >>> print(compare_records(a, b).to_text())
    verdict: PASS -> FAIL (CHANGED)
    inputs changed: 1
      speed.max: '1800 rpm' -> '1900 rpm'
    findings changed: 0
    """
    a, b = _flatten(old["scenario"]), _flatten(new["scenario"])
    inputs = tuple(
        (path, a.get(path), b.get(path)) for path in sorted(set(a) | set(b)) if not _same(a.get(path), b.get(path))
    )
    old_f = {_key(f): f for f in old["findings"]}
    new_f = {_key(f): f for f in new["findings"]}
    lines = []
    for key in sorted(set(old_f) | set(new_f)):
        if key not in new_f:
            lines.append(f"removed: {key} (was {old_f[key].get('verdict')})")
        elif key not in old_f:
            lines.append(f"added: {key}: {new_f[key].get('verdict')}, SM {new_f[key].get('margin_percent'):.1f} %")
        else:
            o, n = old_f[key], new_f[key]
            if o.get("verdict") != n.get("verdict") or not _same(o.get("margin_percent"), n.get("margin_percent")):
                lines.append(
                    f"changed: {key}: {o.get('verdict')} -> {n.get('verdict')}, SM {o.get('margin_percent'):.1f} % "
                    f"-> {n.get('margin_percent'):.1f} % (required {n.get('required_margin_percent'):.1f} %, "
                    f"{n.get('rule')})"
                )
    return RecordComparison(inputs, tuple(lines), str(old["verdict"]), str(new["verdict"]))
