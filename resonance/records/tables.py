"""Reading and writing scenario tables: the parts every kind of scenario shares.

A scenario file is TOML; every kind of study (support, rotor, field verification, and those to come)
reads its own tables with a :class:`TableReader`, whose errors name the file and the field
(``pump.toml: speed.max: ...``), and shares the head (``[scenario]``), the speed range (``[speed]``), the
excitations and the motor (``[[excitations]]``, ``[motor]``), the margin rules (``[margin]``) and the
revision fields (``[record]``) through the functions here. Values are numbers in the package convention
or text with a unit (:func:`resonance.core.inputs.parse_quantity`); files are only read, and written only
through :func:`write_scenario_table`, which never overwrites unless told to. Every file the package writes
(scenarios and records) goes through :func:`atomic_write`, so no partial file is ever left.
"""

from __future__ import annotations

import dataclasses
import hashlib
import os
import re
import sys
from collections.abc import Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any

import numpy as np
import tomli_w

from ..checks.electrical import SLIP_LOADS, drive_electrical, drive_electrical_law, induction_slip, line_frequency
from ..checks.excitations import EXCITATION_KINDS, Excitation
from ..checks.margins import ApiLateralRule, FlatRule, MarginRule, TableRule, rule_by_name
from ..checks.rules import TORSIONAL_RULE, DampedModeRule, RuleSet, is_flat
from ..checks.speed_range import OperatingRange, operating_range
from ..core.errors import InputTypeError, InputValueError
from ..core.inputs import Sign, as_si, parse_quantity
from ..core.units import UNIT_SYSTEMS, QuantityKind, UnitSystem
from ..dynamics.modes import MODE_KINDS

if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - Python 3.10
    import tomli as tomllib

__all__ = [
    "MOTOR_MULTIPLES",
    "parse_vibration",
    "plain_tables",
    "MotorSpec",
    "RecordSpec",
    "ScenarioError",
    "TableReader",
    "atomic_write",
    "excitation_table",
    "motor_table",
    "parse_excitations",
    "parse_head",
    "parse_motor",
    "parse_percent",
    "parse_record",
    "parse_rule",
    "parse_rules",
    "parse_speed",
    "read_scenario_bytes",
    "read_scenario_file",
    "rule_table",
    "rules_table",
    "speed_table",
    "write_scenario_table",
]


class ScenarioError(InputValueError):
    """A scenario file or table is invalid; the message names the file and field."""


@dataclass(frozen=True)
class MotorSpec:
    """The driving motor, for its electrical excitations.

    Attributes
    ----------
    supply : {"drive", "line"}
        On a variable-speed drive (electrical frequency follows the speed) or
        on the line (fixed at ``line_frequency``).
    poles : int or None
        Number of poles (drive supply).
    slip : float
        Slip at the load of interest [-] (drive supply; 0 for a synchronous motor).
    line_frequency : float or None
        Supply frequency [Hz] (line supply).
    multiples : tuple of float
        The multiples of the electrical frequency the checks include (``[motor] electrical``, or the study
        kind's default for the supply: :data:`MOTOR_MULTIPLES`).
    multiples_given : bool
        True when the scenario listed them.
    """

    supply: str
    poles: int | None
    slip: float
    line_frequency: float | None
    multiples: tuple[float, ...] = ()
    multiples_given: bool = False
    load: str = "constant slip"
    rated_speed: float | None = None
    slip_table: tuple[tuple[float, float], ...] = ()

    @property
    def slip_words(self) -> str:
        """How the slip is taken, in words, for the record."""
        if self.supply != "drive":
            return "on the line: fixed frequencies"
        if self.slip_table:
            return (
                "slip from [motor] slip_table against speed ("
                + ", ".join(f"{s:g} at {n:g} rpm" for n, s in self.slip_table)
                + "), held at its end values beyond it"
            )
        if self.load == "constant slip":
            return f"constant slip {self.slip:g} (its value at the load of interest)"
        return f"slip {self.slip:g} at {self.rated_speed:g} rpm, following a {self.load} load"

    def excitation(self, multiple: float, label: str | None = None) -> Excitation:
        """The electrical excitation at ``multiple`` x the electrical frequency."""
        if self.supply == "drive":
            assert self.poles is not None  # validated with the supply
            if self.load == "constant slip" and not self.slip_table:
                return drive_electrical(self.poles, self.slip, multiple, label)
            name = "f_e" if multiple == 1.0 else f"{multiple:g} f_e"
            speeds = np.geomspace(1.0, 1e5, 401)  # wide enough for any machine; the law extends beyond it
            if self.slip_table:
                table = np.array(self.slip_table)
                slips = np.interp(speeds, table[:, 0], table[:, 1])
                detail, nominal = "slip from the table", float(table[-1, 1])
            else:
                assert self.rated_speed is not None  # validated with the load
                slips = induction_slip(speeds, self.rated_speed, self.slip, self.load)  # type: ignore[arg-type]
                detail, nominal = f"slip {self.slip:g} at {self.rated_speed:g} rpm, {self.load}", self.slip
            text = label if label is not None else f"{name} (drive, {self.poles} poles, {detail})"
            return drive_electrical_law(self.poles, multiple, speeds, slips, nominal, text)
        assert self.line_frequency is not None
        e = line_frequency(self.line_frequency, multiple)
        return e if label is None else dataclasses.replace(e, label=label)

    def sources(self) -> tuple[Excitation, ...]:
        """The electrical excitations the motor declares: ``multiples`` x its electrical frequency.

        Returns
        -------
        tuple of Excitation
            One per multiple, each with its origin in ``source``.

        Raises
        ------
        Nothing
            The motor is validated.
        """
        why = "listed in [motor] electrical"
        if not self.multiples_given:
            why = f"checked by default for a {self.supply}-fed motor"
        if self.supply == "drive":
            why += f"; {self.slip_words}"
        return tuple(
            dataclasses.replace(self.excitation(m), source=f"[motor] ({self.supply}): {why}") for m in self.multiples
        )


@dataclass(frozen=True)
class RecordSpec:
    """Revision control of the record: who prepared and checked it, which revision, when (text as given).

    Attributes
    ----------
    preparer, checker, revision, date : str
        As written (a TOML date as its ISO text).
    """

    preparer: str = ""
    checker: str = ""
    revision: str = ""
    date: str = ""


class TableReader:
    """Reads the tables of one scenario source; every error names the source and the field.

    Parameters
    ----------
    source : str
        The file name (or ``"<scenario>"``) errors start with.
    """

    def __init__(self, source: str) -> None:
        self.source = source

    def fail(self, field: str, message: str) -> ScenarioError:
        """A :class:`ScenarioError` naming the source and ``field``."""
        return ScenarioError(f"{self.source}: {field}: {message}")

    def table(self, data: Mapping[str, Any], key: str, field: str, required: bool = True) -> Mapping[str, Any]:
        """The sub-table ``key`` (an empty one when optional and absent)."""
        if key not in data:
            if required:
                raise self.fail(field, "missing; expected a table")
            return {}
        value = data[key]
        if not isinstance(value, Mapping):
            raise self.fail(field, f"got {value!r}; expected a table")
        return value

    def known(self, data: Mapping[str, Any], allowed: Sequence[str], field: str) -> None:
        """Refuse keys other than ``allowed``, naming the first unknown field."""
        unknown = sorted(set(data) - set(allowed))
        if unknown:
            raise self.fail(
                f"{field}.{unknown[0]}" if field else unknown[0], f"unknown field; expected one of {sorted(allowed)}"
            )

    def text(self, data: Mapping[str, Any], key: str, field: str, default: str | None = None) -> str:
        """A text field (``default`` when absent, or an error if there is none)."""
        if key not in data:
            if default is None:
                raise self.fail(field, "missing; expected text")
            return default
        value = data[key]
        if not isinstance(value, str):
            raise self.fail(field, f"got {value!r}; expected text")
        return value

    def quantity(self, data: Mapping[str, Any], key: str, field: str, kind: QuantityKind, sign: Sign = "any") -> float:
        """A required value of ``kind`` in the package convention (see :meth:`value`)."""
        if key not in data:
            raise self.fail(field, f"missing; expected a {kind.replace('_', ' ')}")
        return self.value(data[key], field, kind, sign)

    def value(self, raw: Any, field: str, kind: QuantityKind, sign: Sign = "any") -> float:
        """A number or text with a unit, converted to the package convention of ``kind`` and checked for ``sign``."""
        if isinstance(raw, bool):
            raise self.fail(field, f"got {raw!r}; expected a number or a value with a unit")
        try:
            if isinstance(raw, str):
                raw = parse_quantity(raw, "value")  # exactly one number and a unit, or refused
            return as_si(raw, "value", kind, sign)
        except (InputTypeError, InputValueError) as error:
            raise self.fail(field, str(error).removeprefix("value: ")) from None

    def integer(self, data: Mapping[str, Any], key: str, field: str, default: int | None = None) -> int:
        """A whole number (``default`` when absent)."""
        if key not in data:
            if default is None:
                raise self.fail(field, "missing; expected a whole number")
            return default
        value = data[key]
        if isinstance(value, bool) or not isinstance(value, int):
            raise self.fail(field, f"got {value!r}; expected a whole number")
        return value

    def array(self, data: Mapping[str, Any], key: str, field: str, required: bool = True) -> list[Any]:
        """A list (empty when optional and absent)."""
        if key not in data:
            if required:
                raise self.fail(field, "missing; expected a list")
            return []
        value = data[key]
        if not isinstance(value, list):
            raise self.fail(field, f"got {value!r}; expected a list")
        return value


def parse_head(r: TableReader, data: Mapping[str, Any]) -> tuple[str, str, UnitSystem]:
    """The ``[scenario]`` table: title, description and unit system.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The scenario's top-level tables.

    Returns
    -------
    title, description : str
    units : {"SI", "US"}

    Raises
    ------
    ScenarioError
        A missing title, a field of the wrong type, an unknown field, an unknown unit system.
    """
    head = r.table(data, "scenario", "scenario")
    r.known(head, ("title", "description", "units"), "scenario")
    units = r.text(head, "units", "scenario.units", "SI")
    if units not in UNIT_SYSTEMS:
        raise r.fail("scenario.units", f"got {units!r}; expected 'SI' or 'US'")
    return r.text(head, "title", "scenario.title"), r.text(head, "description", "scenario.description", ""), units


def parse_speed(r: TableReader, speed: Mapping[str, Any]) -> OperatingRange:
    """The ``[speed]`` table: the operating range with its skip bands [rpm].

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    speed : mapping
        The ``[speed]`` table.

    Returns
    -------
    OperatingRange
        Speeds [rpm].

    Raises
    ------
    ScenarioError
        Missing or bad values, ``min`` above ``max``, skip bands that do not fit.
    """
    r.known(speed, ("min", "max", "skip_bands"), "speed")
    low = r.quantity(speed, "min", "speed.min", "speed", "positive")
    high = r.quantity(speed, "max", "speed.max", "speed", "positive")
    if low > high:
        raise r.fail("speed.max", f"got {high:g} rpm, below speed.min = {low:g} rpm; expected min <= max")
    bands = []
    for i, band in enumerate(r.array(speed, "skip_bands", "speed.skip_bands", required=False)):
        if not isinstance(band, list) or len(band) != 2:
            raise r.fail(f"speed.skip_bands[{i}]", f"got {band!r}; expected [low, high]")
        bands.append(tuple(r.value(b, f"speed.skip_bands[{i}]", "speed", "positive") for b in band))
    try:
        return operating_range(low, high, bands)  # type: ignore[arg-type]
    except InputValueError as error:
        raise r.fail("speed.skip_bands", str(error)) from None


def speed_table(speed: OperatingRange) -> dict[str, Any]:
    """An operating range as a ``[speed]`` table.

    Parameters
    ----------
    speed : OperatingRange
        The range to write.

    Returns
    -------
    dict
        The ``[speed]`` table, values as text in rpm.

    Raises
    ------
    Nothing
        Any operating range is written.
    """
    return {
        "min": f"{speed.speed_min!r} rpm",
        "max": f"{speed.speed_max!r} rpm",
        "skip_bands": [[f"{a!r} rpm", f"{b!r} rpm"] for a, b in speed.skip_bands],
    }


def excitation_table(e: Excitation, motor: MotorSpec | None = None) -> dict[str, Any]:
    """An excitation as an ``[[excitations]]`` entry (electrical ones as multiples of the motor's ``f_e``).

    Parameters
    ----------
    e : Excitation
        The excitation to write.
    motor : MotorSpec, optional
        The scenario's motor, for electrical excitations.

    Returns
    -------
    dict
        One ``[[excitations]]`` entry.

    Raises
    ------
    Nothing
        Any excitation is written.
    """
    if e.kind == "electrical" and motor is not None:
        base = motor.excitation(1.0)
        multiple = (e.order / base.order) if e.order is not None else (e.frequency / base.frequency)  # type: ignore[operator]
        if motor.excitation(multiple).label == e.label:
            return {"electrical": multiple}
        return {"electrical": multiple, "label": e.label}
    key = {"order": e.order} if e.order is not None else {"frequency": f"{e.frequency!r} Hz"}
    return {**key, "label": e.label}


#: The multiples of the motor's electrical frequency checked when ``[motor]`` does not list them
#: (``electrical = [...]``), by the kind of mode checked and the supply. Lateral and structural modes: twice
#: the electrical frequency, the magnetic pull of an AC motor (common practice). Torsional modes: the
#: electrical frequency and twice it on either supply (API 617, from memory), and on a drive also the
#: six-pulse torque harmonics at 6 and 12 f_e (common practice, from memory).
MOTOR_MULTIPLES: dict[str, dict[str, tuple[float, ...]]] = {
    "lateral": {"drive": (2.0,), "line": (2.0,)},
    "torsional": {"drive": (1.0, 2.0, 6.0, 12.0), "line": (1.0, 2.0)},
}


def parse_motor(r: TableReader, data: Mapping[str, Any], checks: str = "lateral") -> MotorSpec | None:
    """The ``[motor]`` table: supply, poles and slip, or line frequency, and the multiples checked.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[motor]`` table (empty when absent).
    checks : {"lateral", "torsional"}
        The modes the study checks, which chooses the default multiples (:data:`MOTOR_MULTIPLES`).

    Returns
    -------
    MotorSpec or None
        None when the table is absent.

    Raises
    ------
    ScenarioError
        An unknown supply, poles that are not even (2 to 96), a missing or too large slip, a field that
        does not belong to the supply, an ``electrical`` list that is empty, repeats or is not positive.
    """
    if not data:
        return None
    r.known(
        data, ("supply", "poles", "slip", "line_frequency", "electrical", "load", "rated_speed", "slip_table"), "motor"
    )
    supply = r.text(data, "supply", "motor.supply")
    if supply not in ("drive", "line"):
        raise r.fail("motor.supply", f"got {supply!r}; expected 'drive' or 'line'")
    given = "electrical" in data
    multiples = MOTOR_MULTIPLES[checks][supply]
    if given:
        raw = r.array(data, "electrical", "motor.electrical")
        if not raw:
            raise r.fail("motor.electrical", "empty; list the multiples of the electrical frequency to check, e.g. [2]")
        multiples = tuple(r.value(m, f"motor.electrical[{i}]", "ratio", "positive") for i, m in enumerate(raw))
        if len(set(multiples)) != len(multiples):
            raise r.fail("motor.electrical", f"got {raw!r}; a multiple is listed twice")
    if supply == "drive":
        if "line_frequency" in data:
            raise r.fail("motor.line_frequency", "a drive-fed motor's frequency follows the speed; remove it")
        poles = r.integer(data, "poles", "motor.poles")
        if not 2 <= poles <= 96 or poles % 2:
            raise r.fail("motor.poles", f"got {poles!r}; expected an even whole number from 2 to 96")
        if "slip_table" in data:
            for key in ("slip", "load", "rated_speed"):
                if key in data:
                    raise r.fail(f"motor.{key}", "the slip_table gives the slip at every speed; remove it")
            table = _slip_table(r, r.array(data, "slip_table", "motor.slip_table"))
            return MotorSpec("drive", poles, table[-1][1], None, multiples, given, "table", None, table)
        if "slip" not in data:
            raise r.fail("motor.slip", "missing; expected the slip at the load of interest (0 for a synchronous motor)")
        slip = r.value(data["slip"], "motor.slip", "ratio", "nonnegative")
        if not slip < 0.2:
            raise r.fail("motor.slip", f"got {slip:g}; expected a fraction below 0.2 (1.3 % slip is 0.013)")
        load = r.text(data, "load", "motor.load", "constant slip")
        if load not in ("constant slip", *SLIP_LOADS):
            raise r.fail("motor.load", f"got {load!r}; expected one of {['constant slip', *SLIP_LOADS]}")
        rated = None
        if load != "constant slip":
            rated = r.quantity(data, "rated_speed", "motor.rated_speed", "speed", "positive")
        elif "rated_speed" in data:
            raise r.fail("motor.rated_speed", "a constant slip needs no rated speed; give load too, or remove it")
        return MotorSpec("drive", poles, slip, None, multiples, given, load, rated)
    for key in ("poles", "slip", "load", "rated_speed", "slip_table"):
        if key in data:
            raise r.fail(f"motor.{key}", "not used for a motor on the line; remove it")
    f = r.quantity(data, "line_frequency", "motor.line_frequency", "frequency", "positive")
    return MotorSpec("line", None, 0.0, f, multiples, given)


def _slip_table(r: TableReader, raw: list[Any]) -> tuple[tuple[float, float], ...]:
    # [[speed, slip], ...]: speeds increasing, slips in [0, 0.2).
    rows: list[tuple[float, float]] = []
    for i, row in enumerate(raw):
        field = f"motor.slip_table[{i}]"
        if not isinstance(row, list) or len(row) != 2:
            raise r.fail(field, f'got {row!r}; expected [speed, slip], e.g. ["1500 rpm", 0.012]')
        n = r.value(row[0], f"{field}[0]", "speed", "positive")
        s = r.value(row[1], f"{field}[1]", "ratio", "nonnegative")
        if not s < 0.2:
            raise r.fail(f"{field}[1]", f"got {s:g}; expected a fraction below 0.2")
        if rows and not n > rows[-1][0]:
            raise r.fail(f"{field}[0]", f"got {n:g} rpm; expected speeds in increasing order")
        rows.append((n, s))
    if len(rows) < 2:
        raise r.fail("motor.slip_table", "expected two or more [speed, slip] rows")
    return tuple(rows)


def parse_excitations(
    r: TableReader, items: list[Any], motor: MotorSpec | None = None, required: bool = True
) -> tuple[Excitation, ...]:
    """The ``[[excitations]]`` list and the motor's declared sources, with distinct labels.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    items : list
        The ``[[excitations]]`` entries: orders, fixed frequencies and electrical multiples.
    motor : MotorSpec, optional
        The motor: electrical entries refer to it, and each of its ``multiples`` that no entry already gives
        is added (:meth:`MotorSpec.sources`), so a ``[motor]`` table alone is checked.
    required : bool
        Refuse a scenario with no excitation at all.

    Returns
    -------
    tuple of Excitation
        The entries in order, then the motor's sources, each with its origin in ``source``.

    Raises
    ------
    ScenarioError
        None given (when required), an entry with not exactly one of order, frequency or electrical, an
        electrical excitation without a motor, bad values, a label used twice.
    """
    out = []
    keys = ("order", "frequency", "electrical")
    for i, item in enumerate(items):
        field = f"excitations[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with order, frequency or electrical")
        r.known(item, (*keys, "label"), field)
        if sum(k in item for k in keys) != 1:
            raise r.fail(
                field,
                "give exactly one of order (multiple of running speed), frequency (fixed) or electrical "
                "(multiple of the motor's electrical frequency)",
            )
        label = r.text(item, "label", f"{field}.label", "") or None
        if "order" in item:
            order = r.value(item["order"], f"{field}.order", "ratio", "positive")
            e = Excitation(label or f"{order:g}x", order=order)
        elif "frequency" in item:
            frequency = r.value(item["frequency"], f"{field}.frequency", "frequency", "positive")
            e = Excitation(label or f"{frequency:g} Hz", frequency=frequency)
        else:
            if motor is None:
                raise r.fail(f"{field}.electrical", "needs a [motor] table (supply, poles and slip, or line_frequency)")
            multiple = r.value(item["electrical"], f"{field}.electrical", "ratio", "positive")
            e = motor.excitation(multiple, label)
        out.append(dataclasses.replace(e, source=f"[[excitations]] entry {i + 1}"))
    if motor is not None:
        given = {(e.order, e.frequency) for e in out if e.kind == "electrical"}
        out += [e for e in motor.sources() if (e.order, e.frequency) not in given]
    if not out and required:
        raise r.fail("excitations", "empty; expected at least one excitation")
    labels = [e.label for e in out]
    repeated = sorted({x for x in labels if labels.count(x) > 1})
    if repeated:
        raise r.fail("excitations", f"label {repeated[0]!r} is used twice; expected distinct labels")
    return tuple(out)


def parse_percent(r: TableReader, raw: Any, field: str) -> float:
    """A percentage written as a plain number in (0, 100).

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    raw : object
        The value as read.
    field : str
        The field, for the error.

    Returns
    -------
    float
        Percent.

    Raises
    ------
    ScenarioError
        Text (``"15 %"`` would read as 0.15), a boolean, or a value outside (0, 100).
    """
    # A percentage is a plain number: "15 %" text would be read by pint as 0.15.
    if isinstance(raw, bool) or not isinstance(raw, (int, float)):
        raise r.fail(field, f"got {raw!r}; expected a plain number of percent (for 15 % write 15)")
    if not 0 < raw < 100:  # compared as given: a huge integer must not overflow a float
        raise r.fail(field, f"got {raw!r}; expected a percentage between 0 and 100")
    return float(raw)


def parse_rules(r: TableReader, data: Mapping[str, Any], judges_amplitude: bool = False) -> RuleSet:
    """The ``[margin]`` table as a :class:`~resonance.checks.rules.RuleSet` (see the support scenario).

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[margin]`` table (empty when absent).
    judges_amplitude : bool
        The study predicts vibration against a limit, so heavily damped structural modes are judged by it
        (:class:`~resonance.checks.rules.DampedModeRule`, on by default; ``heavily_damped = false`` turns it off,
        ``damped_af_below`` sets its AF). Elsewhere those two fields are refused.

    Returns
    -------
    RuleSet

    Raises
    ------
    ScenarioError
        An unknown field or rule, a bad percentage, a pair of unknown kinds, an AF rule outside its scope, a
        heavily damped field in a study that does not judge amplitude.
    """
    damped_keys = ("heavily_damped", "damped_af_below")
    r.known(data, ("rule", "table", "name", "source", "flat", "torsional", "pairs", *damped_keys), "margin")
    damped: DampedModeRule | None = None
    if judges_amplitude:
        on = data.get("heavily_damped", True)
        if not isinstance(on, bool):
            raise r.fail("margin.heavily_damped", f"got {on!r}; expected true or false")
        if on:
            af = r.value(data.get("damped_af_below", 2.5), "margin.damped_af_below", "ratio", "positive")
            try:
                damped = DampedModeRule(af)
            except InputValueError as error:
                raise r.fail("margin.damped_af_below", str(error).split(": ", 1)[1]) from None
        elif "damped_af_below" in data:
            raise r.fail("margin.damped_af_below", "heavily_damped is false; remove one of the two")
    else:
        for key in damped_keys:
            if key in data:
                raise r.fail(
                    f"margin.{key}",
                    "this kind of study does not predict vibration against a limit, so no mode is judged by "
                    "amplitude here; remove it",
                )
    lateral = parse_rule(r, data)
    flat: FlatRule | None = None
    if "flat" in data:
        flat = FlatRule(parse_percent(r, data["flat"], "margin.flat"))
    elif is_flat(lateral):
        flat = lateral  # type: ignore[assignment]  # rule = "flat-P": P % for every pair
    torsional = TORSIONAL_RULE
    if "torsional" in data:
        percent = parse_percent(r, data["torsional"], "margin.torsional")
        torsional = FlatRule(percent, name=f"torsional {percent:g} %", source=f"given in {r.source}")
    overrides = []
    for i, item in enumerate(r.array(data, "pairs", "margin.pairs", required=False)):
        field = f"margin.pairs[{i}]"
        if not isinstance(item, Mapping):
            raise r.fail(field, f"got {item!r}; expected a table with mode, excitation and rule")
        r.known(item, ("mode", "excitation", "rule"), field)
        mode = r.text(item, "mode", f"{field}.mode")
        if mode not in MODE_KINDS:
            raise r.fail(f"{field}.mode", f"got {mode!r}; expected one of {list(MODE_KINDS)}")
        excitation = r.text(item, "excitation", f"{field}.excitation")
        if excitation not in EXCITATION_KINDS:
            raise r.fail(f"{field}.excitation", f"got {excitation!r}; expected one of {list(EXCITATION_KINDS)}")
        try:
            rule = rule_by_name(r.text(item, "rule", f"{field}.rule"))
        except InputValueError as error:
            raise r.fail(f"{field}.rule", str(error).removeprefix("rule: ")) from None
        overrides.append((mode, excitation, rule))
    try:
        return RuleSet(lateral, flat, torsional, tuple(overrides), damped)
    except InputValueError as error:
        raise r.fail("margin.pairs", str(error).split(": ", 1)[1]) from None


def parse_rule(r: TableReader, data: Mapping[str, Any]) -> MarginRule:
    """The rotor lateral 1x rule of a ``[margin]`` table: a name or an AF table.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[margin]`` table.

    Returns
    -------
    MarginRule
        ``margin.rule`` by name, or the ``margin.table`` rule.

    Raises
    ------
    ScenarioError
        An unknown rule name or a bad table.
    """
    if "table" in data:
        table = r.table(data, "table", "margin.table")
        r.known(table, ("amplification_factors", "below", "above"), "margin.table")
        arrays = {}
        for key in ("amplification_factors", "below", "above"):
            values = r.array(table, key, f"margin.table.{key}")
            arrays[key] = tuple(r.value(v, f"margin.table.{key}[{j}]", "ratio") for j, v in enumerate(values))
        try:
            return TableRule(
                arrays["amplification_factors"],
                arrays["below"],
                arrays["above"],
                r.text(data, "name", "margin.name", "user table"),
                r.text(data, "source", "margin.source", f"user-defined in {r.source}"),
            )
        except InputValueError as error:
            raise r.fail("margin.table", str(error)) from None
    name = r.text(data, "rule", "margin.rule", "api-lateral")
    try:
        return rule_by_name(name)
    except InputValueError as error:
        raise r.fail("margin.rule", str(error).removeprefix("rule: ")) from None


def parse_vibration(r: TableReader, data: Mapping[str, Any]) -> tuple[int, str]:
    """The ``[vibration]`` table: ISO 10816-3 machine group and declared support class.

    Parameters
    ----------
    r : TableReader
        The reader (its file name starts the errors).
    data : mapping
        The table (empty for the defaults: group 2, rigid).

    Returns
    -------
    tuple of (int, str)
        ``(group, support)``.

    Raises
    ------
    ScenarioError
        An unknown field, a group other than 1 or 2, a support other than rigid or flexible.
    """
    r.known(data, ("group", "support"), "vibration")
    group = r.integer(data, "group", "vibration.group", 2)
    support = r.text(data, "support", "vibration.support", "rigid")
    if group not in (1, 2) or support not in ("rigid", "flexible"):
        raise r.fail(
            "vibration", f"got group {group!r}, support {support!r}; expected group 1 or 2, 'rigid' or 'flexible'"
        )
    return group, support


def parse_record(r: TableReader, data: Mapping[str, Any]) -> RecordSpec:
    """The ``[record]`` table: preparer, checker, revision and date, as text.

    Parameters
    ----------
    r : TableReader
        The reader of the scenario's source.
    data : mapping
        The ``[record]`` table (empty when absent).

    Returns
    -------
    RecordSpec

    Raises
    ------
    ScenarioError
        An unknown field or a value that is not text (a TOML date is taken as its ISO text).
    """
    r.known(data, ("preparer", "checker", "revision", "date"), "record")
    values = {}
    for key in ("preparer", "checker", "revision", "date"):
        raw = data.get(key, "")
        if hasattr(raw, "isoformat"):  # a TOML date
            raw = raw.isoformat()
        if not isinstance(raw, str):
            raise r.fail(f"record.{key}", f"got {raw!r}; expected text")
        values[key] = raw
    return RecordSpec(**values)


def read_scenario_file(path: str | os.PathLike[str]) -> dict[str, Any]:
    """The tables of a scenario file (TOML), unvalidated. The file is only read.

    Parameters
    ----------
    path : path-like
        The scenario file.

    Returns
    -------
    dict
        Its tables, unvalidated.

    Raises
    ------
    ScenarioError
        The file is missing or is not valid TOML.
    """
    return read_scenario_bytes(path)[0]


def read_scenario_bytes(path: str | os.PathLike[str]) -> tuple[dict[str, Any], str]:
    """The tables of a scenario file and the SHA-256 of the very bytes they were read from.

    Parameters
    ----------
    path : path-like
        The scenario file.

    Returns
    -------
    tables : dict
        Its tables, unvalidated.
    sha256 : str
        SHA-256 of the bytes read, as hex.

    Raises
    ------
    ScenarioError
        The file is missing or is not valid TOML.
    """
    name = os.fspath(path)
    try:
        raw = Path(path).read_bytes()
    except OSError as error:
        raise ScenarioError(f"{name}: cannot be read ({error.strerror})") from None
    try:
        return tomllib.loads(raw.decode("utf-8")), hashlib.sha256(raw).hexdigest()
    except (UnicodeDecodeError, tomllib.TOMLDecodeError) as error:
        raise ScenarioError(f"{name}: is not valid TOML ({error}){_inline_hint(error, raw)}") from None
    except ValueError as error:  # an integer of thousands of digits: Python refuses to convert it
        raise ScenarioError(f"{name}: holds a number too long to read ({str(error).split(':')[0]})") from None


def _inline_hint(error: Exception, raw: bytes) -> str:
    # TOML 1.0 keeps an inline table on one line; the parser's own words do not say so. An error on a line
    # after an unclosed "{" (strings aside) is that mistake.
    found = re.search(r"at line (\d+)", str(error))
    if not found:
        return ""
    before = b"\n".join(raw.split(b"\n")[: int(found.group(1))]).decode("utf-8", "replace")
    before = re.sub(r'"(?:[^"\\\n]|\\.)*"', "", before)  # strings may hold braces
    if before.count("{") > before.count("}"):
        return "; TOML 1.0 keeps an inline table { ... } on one line: write it on one line or as a [[table]]"
    return ""


def rules_table(rules: RuleSet, judges_amplitude: bool = False) -> dict[str, Any]:
    """A rule set as a ``[margin]`` table.

    Parameters
    ----------
    rules : RuleSet
        The rules to write.
    judges_amplitude : bool
        As for :func:`parse_rules`: the heavily damped rule is on unless the table says otherwise.

    Returns
    -------
    dict
        The ``[margin]`` table.

    Raises
    ------
    InputTypeError
        A rule with no scenario spelling.
    """
    out = rule_table(rules.lateral_1x)
    if rules.flat is not None:
        out["flat"] = rules.flat.percent
    if rules.torsional != TORSIONAL_RULE:
        out["torsional"] = rules.torsional.percent
    if rules.overrides:
        out["pairs"] = [
            {"mode": m, "excitation": e, "rule": rule_table(rule)["rule"]} for m, e, rule in rules.overrides
        ]
    if judges_amplitude and rules.damped is None:
        out["heavily_damped"] = False
    elif rules.damped is not None and rules.damped.af_below != DampedModeRule().af_below:
        out["damped_af_below"] = rules.damped.af_below
    return out


def rule_table(rule: MarginRule) -> dict[str, Any]:
    """One rule as ``[margin]`` keys.

    Parameters
    ----------
    rule : MarginRule
        The rule to write.

    Returns
    -------
    dict
        ``rule`` by name, or ``name``, ``source`` and ``table``.

    Raises
    ------
    InputTypeError
        A rule with no scenario spelling.
    """
    if isinstance(rule, ApiLateralRule):
        return {"rule": "api-lateral"}
    if isinstance(rule, FlatRule):
        return {"rule": f"flat-{rule.percent:g}"}
    if isinstance(rule, TableRule):
        return {
            "name": rule.name,
            "source": rule.source,
            "table": {
                "amplification_factors": list(rule.amplification_factors),
                "below": list(rule.below),
                "above": list(rule.above),
            },
        }
    raise InputTypeError(f"rule: a {type(rule).__name__} cannot be saved to a scenario file")


def motor_table(motor: MotorSpec) -> dict[str, Any]:
    """A motor as a ``[motor]`` table.

    Parameters
    ----------
    motor : MotorSpec
        The motor to write.

    Returns
    -------
    dict
        The ``[motor]`` table.

    Raises
    ------
    Nothing
        Any motor is written.
    """
    listed: dict[str, Any] = {"electrical": list(motor.multiples)} if motor.multiples_given else {}
    if motor.supply == "drive":
        if motor.slip_table:
            table = [[f"{n!r} rpm", s] for n, s in motor.slip_table]
            return {"supply": "drive", "poles": motor.poles, "slip_table": table, **listed}
        if motor.load != "constant slip":
            listed.update(load=motor.load, rated_speed=f"{motor.rated_speed!r} rpm")
        return {"supply": "drive", "poles": motor.poles, "slip": motor.slip, **listed}
    return {"supply": "line", "line_frequency": f"{motor.line_frequency!r} Hz", **listed}


def write_scenario_table(table: Mapping[str, Any], path: str | os.PathLike[str], overwrite: bool = False) -> Path:
    """Write scenario tables as TOML through a temporary file; an existing file is kept unless ``overwrite``.

    Parameters
    ----------
    table : mapping
        Scenario tables (as :func:`resonance.kinds.support.scenario.scenario_to_dict` gives them).
    path : path-like
        Where to write.
    overwrite : bool
        Replace an existing file.

    Returns
    -------
    pathlib.Path
        The file written.

    Raises
    ------
    FileExistsError
        ``path`` exists and ``overwrite`` is False.
    OSError
        The folder cannot be written (nothing is left behind).
    """
    target = Path(path)
    if target.exists() and not overwrite:
        raise FileExistsError(f"{target}: exists; pass overwrite=True or choose another name")
    return atomic_write(target, tomli_w.dumps(table))


def atomic_write(path: str | os.PathLike[str], text: str) -> Path:
    """Write text through a temporary file and a rename, so no partial file is left.

    Parameters
    ----------
    path : path-like
        The file to write.
    text : str
        Its content (UTF-8).

    Returns
    -------
    pathlib.Path
        The file written.

    Raises
    ------
    OSError
        The folder cannot be written (no temporary file is left behind).
    """
    target = Path(path)
    temporary = target.with_name(f".{target.name}.partial")
    try:
        temporary.write_text(text, encoding="utf-8")
        os.replace(temporary, target)
    finally:
        temporary.unlink(missing_ok=True)  # never a partial file, whatever failed
    return target


def plain_tables(value: Any) -> Any:
    """A scenario's tables as JSON-ready values (a TOML date becomes its ISO text), for a record.

    Parameters
    ----------
    value : object
        Tables as read from TOML (nested mappings and lists).

    Returns
    -------
    object
        The same structure with plain values.

    Raises
    ------
    Nothing
        Any other value becomes its text.
    """
    if isinstance(value, Mapping):
        return {str(k): plain_tables(v) for k, v in value.items()}
    if isinstance(value, list):
        return [plain_tables(v) for v in value]
    if isinstance(value, (str, int, float, bool)) or value is None:
        return value
    return value.isoformat() if hasattr(value, "isoformat") else str(value)
