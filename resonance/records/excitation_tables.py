"""The speed range, the excitations and the motor of a scenario, read and written back.

The ``[speed]``, ``[[excitations]]`` and ``[motor]`` tables every kind shares.
"""

from __future__ import annotations

import dataclasses
from collections.abc import Mapping
from dataclasses import dataclass
from typing import Any

import numpy as np

from ..checks.electrical import SLIP_LOADS, drive_electrical, drive_electrical_law, induction_slip, line_frequency
from ..checks.excitations import Excitation
from ..checks.speed_range import OperatingRange, operating_range
from ..core.errors import InputValueError
from .tables import TableReader

__all__ = [
    "MOTOR_MULTIPLES",
    "MotorSpec",
    "excitation_table",
    "motor_table",
    "parse_excitations",
    "parse_motor",
    "parse_speed",
    "speed_table",
]


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
