"""Readers of measured data: coast-down / run-up (speed, amplitude, phase) and impact records.

Both are plain delimited text (comma, semicolon or tab) with optional
``# key = value`` metadata lines before the header row. A coast-down file::

    # amplitude_unit = um
    # amplitude_convention = peak-to-peak
    # phase_convention = lag
    speed_rpm,NDE-X_amplitude,NDE-X_phase,DE-X_amplitude,DE-X_phase
    1800,42.1,231.5,35.0,118.2
    ...

Channels are pairs ``<name>_amplitude`` / ``<name>_phase`` (phase in degrees).
A file whose channels use different units says so per channel
(``# amplitude_unit.<name> = mil``); units are never guessed.
An impact file::

    # force_unit = N
    # response_unit = m/s**2
    time_s,force,<name>,...

Every problem is an error naming the file, line and column, except repairs
that are safe and are logged in ``repairs``: rows sorted by speed (a
coast-down is recorded from high to low), phase unwrapped. The file is only
read.
"""

from __future__ import annotations

import csv
import io
import math
import os
from collections.abc import Mapping
from dataclasses import dataclass
from pathlib import Path
from typing import Literal

import numpy as np

from ...core.errors import InputTypeError, InputValueError
from ...core.inputs import NUMBER_TEXT, as_si, parse_unit
from ...core.units import QuantityKind, ureg
from ...dynamics.harmonic import convert_amplitude

__all__ = ["DataFileError", "CoastDown", "ImpactRecord", "read_coastdown", "read_impact"]

_CONVENTIONS = ("peak", "peak-to-peak", "rms")


class DataFileError(InputValueError):
    """A measured-data file is invalid; the message names the file, line and column."""


@dataclass(frozen=True)
class CoastDown:
    """A coast-down or run-up: complex 1x response per channel over speed.

    Attributes
    ----------
    speed : numpy.ndarray
        Speeds [rpm], strictly increasing.
    channels : dict of str to numpy.ndarray
        Complex 0-peak displacement [m]: ``|X|`` the amplitude, ``-angle(X)`` the phase lag.
    source : str
        The file name.
    repairs : tuple of str
        Safe repairs made while reading (sorting, phase unwrapping).
    """

    speed: np.ndarray
    channels: dict[str, np.ndarray]
    source: str
    repairs: tuple[str, ...]

    def amplitude(self, channel: str) -> np.ndarray:
        """0-peak amplitude [m] of a channel."""
        return np.abs(self.channel(channel))

    def phase_lag(self, channel: str) -> np.ndarray:
        """Phase lag [rad], unwrapped (continuous over speed)."""
        return np.unwrap(-np.angle(self.channel(channel)))

    def channel(self, name: str) -> np.ndarray:
        """The complex response of a channel."""
        if name not in self.channels:
            raise InputValueError(f"channel: got {name!r}; expected one of {sorted(self.channels)}")
        return self.channels[name]


@dataclass(frozen=True)
class ImpactRecord:
    """A time history of an impact test: force and responses sampled at a fixed rate.

    Attributes
    ----------
    sample_rate : float
        [Hz].
    force : numpy.ndarray
        [N].
    responses : dict of str to numpy.ndarray
        In SI units of ``quantity``.
    quantity : {"displacement", "velocity", "acceleration"}
    source : str
    """

    sample_rate: float
    force: np.ndarray
    responses: dict[str, np.ndarray]
    quantity: Literal["displacement", "velocity", "acceleration"]
    source: str


def _split(path: str | os.PathLike[str]) -> tuple[str, dict[str, str], list[str], list[tuple[int, list[str]]]]:
    name = Path(os.fspath(path)).name
    try:
        text = Path(path).read_text(encoding="utf-8-sig")
    except OSError as error:
        raise DataFileError(f"{name}: cannot be read ({error.strerror})") from None
    except UnicodeDecodeError:
        raise DataFileError(f"{name}: is not UTF-8 text") from None
    meta: dict[str, str] = {}
    lines = text.splitlines()
    body_start = None
    for number, line in enumerate(lines, start=1):
        stripped = line.strip()
        if not stripped:
            continue
        if stripped.startswith("#"):
            if "=" in stripped:
                key, value = stripped[1:].split("=", 1)
                meta[key.strip().lower()] = value.strip()
            continue
        body_start = number
        break
    if body_start is None:
        raise DataFileError(f"{name}: has no header row and no data")
    sample = "\n".join(lines[body_start - 1 : body_start + 5])
    try:
        dialect = csv.Sniffer().sniff(sample, delimiters=",;\t")
    except csv.Error:
        dialect = csv.excel
    reader = csv.reader(io.StringIO("\n".join(lines[body_start - 1 :])), dialect)
    rows = [
        (body_start + i, [cell.strip() for cell in row]) for i, row in enumerate(reader) if any(c.strip() for c in row)
    ]
    if not rows:
        raise DataFileError(f"{name}: line {body_start}: holds only separators; expected a header row and data")
    header = rows[0][1]
    data = rows[1:]
    if not data:
        raise DataFileError(f"{name}: line {rows[0][0]}: a header with no data rows after it")
    return name, meta, header, data


def _numbers(name: str, header: list[str], data: list[tuple[int, list[str]]]) -> np.ndarray:
    table = np.empty((len(data), len(header)))
    for i, (number, row) in enumerate(data):
        if len(row) != len(header):
            raise DataFileError(f"{name}: line {number}: has {len(row)} columns; the header has {len(header)}")
        for j, cell in enumerate(row):
            try:
                # Exactly one plain number: Python's float() would also take "1_000" and other spellings.
                if not NUMBER_TEXT.fullmatch(cell) and cell.lower().lstrip("+-") not in ("inf", "nan", "infinity"):
                    raise ValueError(cell)
                value = float(cell)
            except ValueError:
                raise DataFileError(
                    f"{name}: line {number}, column {header[j]!r}: got {cell!r}; expected a number"
                ) from None
            if not math.isfinite(value):
                raise DataFileError(
                    f"{name}: line {number}, column {header[j]!r}: got {cell!r}; expected a finite number "
                    "(a gap in the data cannot be repaired safely: remove the row)"
                )
            table[i, j] = value
    return table


def _option(
    meta: Mapping[str, str], key: str, given: str | None, default: str, allowed: tuple[str, ...] | None, name: str
) -> str:
    value = given if given is not None else meta.get(key, default)
    if allowed is not None and value not in allowed:
        raise DataFileError(f"{name}: {key}: got {value!r}; expected one of {list(allowed)}")
    return value


def _unit_factor(unit: str, kind: QuantityKind, field: str, name: str) -> float:
    try:
        return as_si(ureg.Quantity(1.0, parse_unit(unit, field)), field, kind)
    except (InputTypeError, InputValueError) as error:
        raise DataFileError(f"{name}: {field}: got {unit!r}; expected a {kind} unit ({error})") from None


def read_coastdown(
    path: str | os.PathLike[str],
    *,
    amplitude_unit: str | None = None,
    amplitude_convention: str | None = None,
    phase_convention: str | None = None,
) -> CoastDown:
    """Read a coast-down or run-up file (speed, amplitude and phase per channel).

    Parameters
    ----------
    path : path-like
        The file (only read).
    amplitude_unit, amplitude_convention, phase_convention : str, optional
        Override the file's metadata: a length unit (``um``, ``mil``...),
        ``peak``/``peak-to-peak``/``rms``, and ``lag``/``lead``. Without them
        and without metadata the file is refused (units are never guessed).

    Returns
    -------
    CoastDown
        The validated channels, with the safe repairs logged.

    Raises
    ------
    DataFileError
        Missing or extra columns, text in a numeric column, an empty file,
        gaps, duplicated speeds, unknown units or conventions.
    """
    name, meta, header, data = _split(path)
    speed_columns = [c for c in header if c.lower() in ("speed", "speed_rpm")]
    if len(speed_columns) != 1:
        raise DataFileError(f"{name}: header {header}: expected exactly one 'speed_rpm' (or 'speed') column")
    channels: dict[str, tuple[int, int]] = {}
    for j, column in enumerate(header):
        if column in speed_columns:
            continue
        base, _, kind = column.rpartition("_")
        if kind not in ("amplitude", "phase") or not base:
            raise DataFileError(
                f"{name}: column {column!r}: expected '<channel>_amplitude' or '<channel>_phase' (or the speed)"
            )
        pair = channels.setdefault(base, (-1, -1))
        channels[base] = (j, pair[1]) if kind == "amplitude" else (pair[0], j)
    for base, (a, p) in channels.items():
        if a < 0 or p < 0:
            raise DataFileError(f"{name}: channel {base!r}: needs both '{base}_amplitude' and '{base}_phase' columns")
    if not channels:
        raise DataFileError(f"{name}: no channel columns; expected '<channel>_amplitude' and '<channel>_phase'")
    unit = _option(meta, "amplitude_unit", amplitude_unit, "", None, name)
    if not unit:
        raise DataFileError(f"{name}: amplitude_unit: not given; declare it ('# amplitude_unit = um') or pass it")
    convention = _option(meta, "amplitude_convention", amplitude_convention, "", _CONVENTIONS, name)
    phase = _option(meta, "phase_convention", phase_convention, "lag", ("lag", "lead"), name)
    speed_unit = meta.get("speed_unit", "rpm")
    factor = _unit_factor(unit, "displacement", "amplitude_unit", name)
    # Channels recorded in other units say so: '# amplitude_unit.<channel> = mil'.
    factors = dict.fromkeys(channels, factor)
    for key, value in meta.items():
        if key.startswith("amplitude_unit."):
            named = next((b for b in channels if b.lower() == key.split(".", 1)[1]), None)
            if named is None:
                raise DataFileError(f"{name}: {key}: names no channel of the file; expected one of {sorted(channels)}")
            factors[named] = _unit_factor(value, "displacement", key, name)
    speed_factor = _unit_factor(speed_unit, "speed", "speed_unit", name)
    table = _numbers(name, header, data)
    lines = np.array([number for number, _ in data])
    speed = table[:, header.index(speed_columns[0])] * speed_factor
    repairs = []
    if np.any(np.diff(speed) <= 0):
        order = np.argsort(speed, kind="stable")
        sorted_speed = speed[order]
        duplicate = np.flatnonzero(np.diff(sorted_speed) == 0)
        if duplicate.size:
            a, b = lines[order[duplicate[0]]], lines[order[duplicate[0] + 1]]
            raise DataFileError(
                f"{name}: lines {min(a, b)} and {max(a, b)}: the same speed {sorted_speed[duplicate[0]]:g} rpm twice; "
                "expected one reading per speed"
            )
        descending = bool(np.all(np.diff(speed) < 0))
        repairs.append("rows sorted by increasing speed" + (" (recorded as a coast-down)" if descending else ""))
        table, speed = table[order], sorted_speed
    if np.any(speed <= 0):
        raise DataFileError(f"{name}: column {speed_columns[0]!r}: expected speeds > 0")
    out = {}
    for base, (a, p) in channels.items():
        amplitude = table[:, a]
        if np.any(amplitude < 0):
            raise DataFileError(f"{name}: column {header[a]!r}: expected amplitudes >= 0")
        peak = convert_amplitude(amplitude * factors[base], convention, "peak")  # type: ignore[arg-type]
        angle = np.radians(table[:, p]) * (1.0 if phase == "lag" else -1.0)
        unwrapped = np.unwrap(angle)
        if np.any(np.abs(unwrapped - angle) > 1e-9):
            repairs.append(f"phase of {base!r} unwrapped (jumps of 360 deg removed)")
        out[base] = peak * np.exp(-1j * unwrapped)
    return CoastDown(speed, out, name, tuple(repairs))


def read_impact(
    path: str | os.PathLike[str], *, response_unit: str | None = None, force_unit: str | None = None
) -> ImpactRecord:
    """Read an impact-test time history (time, force and one or more responses).

    Parameters
    ----------
    path : path-like
        The measurement file.
    response_unit, force_unit : str, optional
        Units when the file does not declare them.

    Returns
    -------
    ImpactRecord
        Force [N] and responses in SI, the sample rate and the response quantity.

    Raises
    ------
    DataFileError
        A missing time or force column, uneven sampling, text in a numeric
        column, gaps, or undeclared units.
    """
    name, meta, header, data = _split(path)
    lower = [c.lower() for c in header]
    if "time_s" not in lower and "time" not in lower:
        raise DataFileError(f"{name}: header {header}: expected a 'time_s' column")
    if "force" not in lower:
        raise DataFileError(f"{name}: header {header}: expected a 'force' column")
    t_col = lower.index("time_s") if "time_s" in lower else lower.index("time")
    f_col = lower.index("force")
    response_columns = [j for j in range(len(header)) if j not in (t_col, f_col)]
    if not response_columns:
        raise DataFileError(f"{name}: header {header}: expected at least one response column")
    r_unit = _option(meta, "response_unit", response_unit, "", None, name)
    if not r_unit:
        raise DataFileError(f"{name}: response_unit: not given; declare it ('# response_unit = m/s**2') or pass it")
    f_unit = _option(meta, "force_unit", force_unit, "N", None, name)
    quantity: Literal["displacement", "velocity", "acceleration"] | None = None
    try:
        parsed = parse_unit(r_unit, "response_unit")
    except InputValueError as error:
        raise DataFileError(f"{name}: {error}") from None
    for kind in ("acceleration", "velocity", "displacement"):
        try:
            r_factor = as_si(ureg.Quantity(1.0, parsed), "response_unit", kind)
            quantity = kind
            break
        except InputTypeError:
            continue
    if quantity is None:
        raise DataFileError(
            f"{name}: response_unit: got {r_unit!r}; expected a displacement, velocity or acceleration unit"
        )
    force_factor = _unit_factor(f_unit, "force", "force_unit", name)
    table = _numbers(name, header, data)
    time = table[:, t_col]
    step = np.diff(time)
    # Times are written rounded; sampling is even when every step is within 1 % of the typical (median) step.
    if step.size == 0:
        raise DataFileError(f"{name}: column {header[t_col]!r}: expected at least two samples")
    typical = float(np.median(step))
    broken = np.flatnonzero((step <= 0) | (np.abs(step - typical) > 0.01 * abs(typical)))
    if typical <= 0 or broken.size:
        i = int(broken[0]) if broken.size else 0
        raise DataFileError(
            f"{name}: line {data[i + 1][0]}, column {header[t_col]!r}: the time step breaks here "
            f"({time[i]:g} s -> {time[i + 1]:g} s, against {typical:g} s elsewhere: a dropped or repeated sample?); "
            "expected evenly spaced, increasing times"
        )
    return ImpactRecord(
        1.0 / float(step.mean()),
        table[:, f_col] * force_factor,
        {header[j]: table[:, j] * r_factor for j in response_columns},
        quantity,
        name,
    )
