"""Reading and writing scenario tables: the parts every kind of scenario shares.

A scenario file is TOML; every kind of study (support, rotor, field verification, and those to come)
reads its own tables with a :class:`TableReader`, whose errors name the file and the field
(``pump.toml: speed.max: ...``), and shares the head (``[scenario]``), the speed range (``[speed]``), the
excitations and the motor (``[[excitations]]``, ``[motor]``: :mod:`resonance.records.excitation_tables`), the
margin rules (``[margin]``, ``[vibration]``: :mod:`resonance.records.rule_tables`) and the revision fields
(``[record]``) through the functions here. Values are numbers in the package convention
or text with a unit (:func:`resonance.core.inputs.parse_quantity`); files are only read, and written only
through :func:`write_scenario_table`, which never overwrites unless told to. Every file the package writes
(scenarios and records) goes through :func:`atomic_write`, so no partial file is ever left.
"""

from __future__ import annotations

import hashlib
import os
import re
import sys
from collections.abc import Callable, Mapping, Sequence
from dataclasses import dataclass
from pathlib import Path
from typing import Any, TypeVar

import tomli_w

from ..core.errors import InputTypeError, InputValueError
from ..core.inputs import Sign, as_si, parse_quantity
from ..core.units import UNIT_SYSTEMS, QuantityKind, UnitSystem

__all__ = [
    "scenario_loader",
    "plain_tables",
    "RecordSpec",
    "ScenarioError",
    "TableReader",
    "atomic_write",
    "parse_head",
    "parse_record",
    "read_scenario_bytes",
    "read_scenario_file",
    "write_scenario_table",
]


if sys.version_info >= (3, 11):
    import tomllib
else:  # pragma: no cover - Python 3.10
    import tomli as tomllib


class ScenarioError(InputValueError):
    """A scenario file or table is invalid; the message names the file and field."""


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
        The review fields, empty where not given.

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


_S = TypeVar("_S")


def scenario_loader(parse: Callable[[Mapping[str, Any], str], _S], what: str) -> Callable[[str | os.PathLike[str]], _S]:
    """The ``load_*_scenario`` function of a kind: read a file, parse it by ``parse``, keep the file's hash.

    Every kind's loader is this one flow (written once); :func:`resonance.load` picks the kind by the tables.

    Parameters
    ----------
    parse : callable
        The kind's parser, ``parse(tables, source)``, returning a scenario with ``replace(sha256=...)``.
    what : str
        The kind in words (``"rotor"``), for the loader's docstring.

    Returns
    -------
    callable
        ``load(path)``, named after the parser (``parse_rotor_scenario`` -> ``load_rotor_scenario``) and in its
        module.

    Raises
    ------
    Nothing
        The loader raises :class:`ScenarioError` when called on a file that cannot be read, is not TOML or has
        an invalid field.
    """

    def load(path: str | os.PathLike[str]) -> _S:
        data, sha256 = read_scenario_bytes(path)
        return parse(data, Path(os.fspath(path)).name).replace(sha256=sha256)  # type: ignore[attr-defined]

    returned = parse.__annotations__.get("return", "scenario")
    load.__name__ = load.__qualname__ = parse.__name__.replace("parse_", "load_", 1)
    load.__module__ = parse.__module__
    load.__doc__ = (
        f"Read and validate a {what} scenario file (TOML). The file is only read.\n\n"
        "Parameters\n----------\npath : path-like\n    The scenario file.\n\n"
        f"Returns\n-------\n{returned}\n    With the file's SHA-256.\n\n"
        "Raises\n------\nScenarioError\n    The file cannot be read, is not TOML, or has an invalid field.\n"
    )
    return load


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
        The new TOML file (an existing one is kept unless ``overwrite``).

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
        The file, replaced in one step: a reader never sees a partial file.

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
