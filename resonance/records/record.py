"""The calculation record every kind writes: its head, the caution, the record and its JSON file.

The head holds the title, the scenario file and its hash, the review fields and the software versions.

A :class:`Record` carries the same content two ways: ``data`` (JSON-ready, SI values, speeds in rpm) and
``text`` (a plain-text record a reviewer can read, in the scenario's unit system). Each kind builds its record
from its results with the shared sections of :mod:`resonance.records.sections`; the offline HTML record adds
the figures (:mod:`resonance.ui.report`).
"""

from __future__ import annotations

import datetime as _dt
import json
import os
import platform
from dataclasses import dataclass
from importlib import metadata
from pathlib import Path
from typing import Any, Protocol

from .._version import __version__
from .tables import RecordSpec, atomic_write

__all__ = [
    "CAUTION",
    "Record",
    "RecordSection",
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


class RecordSection(Protocol):
    """A part of a study that adds its own section to a kind's record (field verification, uncertainty).

    The kind's record writes ``record_data()`` under the section's name and fails the verdict where the
    section did not pass; the text comes from the shared sections (:mod:`resonance.records.sections`).
    """

    @property
    def passed(self) -> bool:
        """Whether the section's own check passed."""
        ...

    def record_data(self) -> dict[str, Any]:
        """The section's JSON-ready data."""
        ...


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
        The JSON file, written whole (through :func:`~resonance.records.tables.atomic_write`).

    Raises
    ------
    OSError
        As :func:`atomic_write`.
    """
    return atomic_write(path, json.dumps(record.data, indent=2))
