"""Read rows of energies to check from CSV or JSON (the edge before :mod:`twoel.checking.verdicts`).

A row has the columns ``Z``, ``energy`` and ``unit`` (required) and ``state`` and ``label``
(optional; ``state`` defaults to ``1^1S``).  Column names are case-insensitive.  Other columns
are kept, unchanged, in :attr:`EnergyRow.extra`, so nothing is silently dropped.

CSV: one header line, then one row per line; whole lines starting with ``#`` are comments and
blank lines are skipped (both are counted in :class:`EnergyRows`).  JSON: a list of objects, or
an object with a ``"rows"`` list.  Energies may be numbers or text such as ``-2.9033``,
``-2.9033D+00`` (Fortran exponent) or ``−2.9033`` (Unicode minus); nothing is evaluated.

Units are read by :func:`read_unit`: where the case of a letter changes the unit it is
significant (``mEh`` is millihartree, ``MEh`` is refused; ``MHz`` is megahertz, ``mHz`` is
refused), and ``cm⁻¹`` as twoel prints it is accepted.

Line ends may be LF, CRLF or CR alone.  A field longer than :data:`MAX_FIELD_BYTES`, JSON nested
deeper than :data:`MAX_JSON_DEPTH`, an integer too large for a float, an unreadable or non-UTF-8
file each raise one :class:`InputError` line.

Every problem is reported with its row (1-based data row, plus the file line for CSV) and
column, in one :class:`InputError` listing up to :data:`MAX_REPORTED` of them.  Files larger
than :data:`MAX_BYTES` or with more than :data:`MAX_ROWS` rows raise :class:`ResourceError`.
"""

from __future__ import annotations

import csv
import io
import json
import math
import re
from dataclasses import dataclass, field
from pathlib import Path

from twoel.errors import InputError, ResourceError
from twoel.system import Ion, State, parse_charge
from twoel.units import ENERGY_UNITS, canonical_unit

REQUIRED = ("z", "energy", "unit")
OPTIONAL = ("state", "label")
#: how the known columns are printed in messages
DISPLAY = {"z": "Z", "energy": "energy", "unit": "unit", "state": "state", "label": "label"}

#: largest input accepted
MAX_BYTES = 20 * 1024 * 1024
MAX_ROWS = 100_000
#: problems listed in one error message
MAX_REPORTED = 10
#: the longest field (characters of one CSV cell or JSON string) accepted
MAX_FIELD_BYTES = 128 * 1024
#: the deepest nesting of JSON lists/objects accepted (a row file needs 3)
MAX_JSON_DEPTH = 32

#: spellings whose letter case decides the unit: lower-case key -> (canonical, accepted first
#: letters, what the refused case would mean)
_CASE_SENSITIVE = {
    "meh": ("mhartree", "m", "MEh would be mega-hartree; write mEh for millihartree"),
    "mha": ("mhartree", "m", "MHa would be mega-hartree; write mEh for millihartree"),
    "mhartree": ("mhartree", "m", "'M' is mega; write mEh or millihartree for millihartree"),
    "mhartrees": ("mhartree", "m", "'M' is mega; write mEh or millihartree for millihartree"),
    "mhz": ("mhz", "M", "mHz is millihertz, which twoel does not take; write MHz for megahertz"),
    "thz": ("thz", "T", "write THz for terahertz"),
}
#: spellings of cm⁻¹ beyond those of :mod:`twoel.units` (as twoel prints it, Unicode minus)
_WAVENUMBER = {"cm⁻¹", "cm\u207b\u00b9", "cm−1", "cm^−1", "cm^-1", "cm**-1", "1/cm"}

_NUMBER = re.compile(r"[+-]?(\d+(\.\d*)?|\.\d+)([eEdD][+-]?\d+)?")


@dataclass(frozen=True)
class EnergyRow:
    """One energy to check, as read (``energy`` is in ``unit``, not yet converted)."""

    row: int
    Z: float
    energy: float
    unit: str
    state: str = "1^1S"
    label: str = ""
    energy_text: str = ""
    line: int | None = None
    extra: dict = field(default_factory=dict)

    @property
    def where(self) -> str:
        return f"row {self.row}" + ("" if self.line is None else f" (line {self.line})")


@dataclass(frozen=True)
class EnergyRows:
    """All rows of one input, with what was skipped and why."""

    rows: tuple
    source: str
    format: str
    comment_lines: int = 0
    blank_lines: int = 0


#: the longest text of one problem in an error message (characters; a longer one is cut)
MAX_PROBLEM_TEXT = 240


class _Problems:
    def __init__(self, source: str):
        self.source = source
        self.items: list[str] = []

    def add(self, text: str) -> None:
        # one problem stays short even when it quotes a huge cell (the message is one line)
        text = " ".join(text.split())
        self.items.append(text if len(text) <= MAX_PROBLEM_TEXT
                          else f"{text[:MAX_PROBLEM_TEXT - 80]} ... {text[-60:]}")

    def raise_if_any(self) -> None:
        if not self.items:
            return
        shown = self.items[:MAX_REPORTED]
        more = len(self.items) - len(shown)
        tail = f"; and {more} more problem(s)" if more else ""
        count = len(self.items)
        raise InputError(f"{self.source}: {count} problem(s): " + "; ".join(shown) + tail)


def read_unit(name) -> str:
    """Canonical unit name of ``name`` as a person wrote it (see the module docstring).

    The canonical names of :data:`twoel.units.ENERGY_UNITS` are accepted as they are; other
    spellings whose case changes the meaning must use the right case.

    Raises
    ------
    InputError
        Unknown or ambiguous unit.
    """
    if not isinstance(name, str):
        raise InputError(f"unit must be a string, got {name!r}")
    text = name.strip()
    if text in ENERGY_UNITS:
        return text
    if text in _WAVENUMBER:
        return "cm-1"
    rule = _CASE_SENSITIVE.get(text.lower())
    if rule is not None:
        canonical, first, meaning = rule
        if text[0] != first:
            raise InputError(f"ambiguous energy unit {text!r}: {meaning}")
        return canonical
    return canonical_unit(text)


def parse_number(text) -> float:
    """Parse an energy written as a number (no evaluation); raise ``ValueError`` otherwise."""
    if isinstance(text, bool):
        raise ValueError("true/false is not a number")
    if isinstance(text, int):
        if abs(text) > 10**308:         # a float could not hold it (float() would overflow)
            raise ValueError(f"an integer of {len(str(abs(text)))} digits is too large for an energy")
        value = float(text)
    elif isinstance(text, float):
        value = float(text)
    elif isinstance(text, str):
        word = text.strip().replace("\u2212", "-")
        if len(word) > 400:
            raise ValueError(f"a number of {len(word)} characters is not an energy")
        if not _NUMBER.fullmatch(word):
            raise ValueError(f"{text!r} is not a number")
        value = float(word.replace("D", "e").replace("d", "e"))
    else:
        raise ValueError(f"{text!r} is not a number")
    if not math.isfinite(value):
        raise ValueError(f"{text!r} is not a finite number")
    return value


def _cell_text(value) -> str:
    if value is None:
        return ""
    if isinstance(value, float):
        return repr(value)
    return str(value).strip()


def _parse_record(record: dict, row: int, line: int | None, problems: _Problems,
                  columns: dict) -> EnergyRow | None:
    """Validate one record whose keys are normalized column names."""
    where = f"row {row}" + ("" if line is None else f" (line {line})")
    before = len(problems.items)

    def missing(name: str) -> bool:
        value = record.get(name)
        if value is None or (isinstance(value, str) and not value.strip()):
            problems.add(f"{where}, column '{columns.get(name, DISPLAY[name])}': missing value")
            return True
        return False

    Z = energy = unit = None
    if not missing("z"):
        raw = record["z"]
        try:
            if isinstance(raw, bool):
                raise InputError("true/false is not a nuclear charge")
            Z = Ion(parse_charge(raw if not isinstance(raw, str) else raw.strip())).Z
        except InputError as exc:
            problems.add(f"{where}, column '{columns.get('z', 'Z')}': {exc}")
    if not missing("energy"):
        try:
            energy = parse_number(record["energy"])
        except ValueError as exc:
            problems.add(f"{where}, column '{columns.get('energy', 'energy')}': {exc}")
    if not missing("unit"):
        raw = record["unit"]
        try:
            unit = read_unit(raw if isinstance(raw, str) else str(raw))
        except InputError as exc:
            problems.add(f"{where}, column '{columns.get('unit', 'unit')}': {exc}")
    state = "1^1S"
    raw_state = record.get("state")
    if raw_state is not None and str(raw_state).strip():
        try:
            state = State.parse(str(raw_state)).label
        except InputError as exc:
            problems.add(f"{where}, column '{columns.get('state', 'state')}': {exc}")
    label = _cell_text(record.get("label")) or f"row {row}"
    if len(problems.items) > before:
        return None
    extra = {columns.get(k, k): v for k, v in record.items() if k not in REQUIRED + OPTIONAL}
    return EnergyRow(row=row, Z=Z, energy=energy, unit=unit, state=state, label=label,
                     energy_text=_cell_text(record["energy"]), line=line, extra=extra)


def _normalize_header(names, problems: _Problems, where: str) -> tuple[list[str], dict]:
    keys, display = [], {}
    for position, name in enumerate(names, start=1):
        text = (name or "").strip()
        if not text:
            problems.add(f"{where}: column {position} has no name")
        key = text.lower()
        if key in display:
            problems.add(f"{where}: column '{text}' appears twice")
        keys.append(key)
        display[key] = text
    return keys, display


def _csv_records(reader, source: str):
    """The records of ``reader``; a malformed or oversized field is one :class:`InputError`."""
    previous = csv.field_size_limit(MAX_FIELD_BYTES)
    try:
        while True:
            try:
                fields = next(reader)
            except StopIteration:
                return
            except csv.Error as exc:
                text = str(exc)
                if "field larger" in text:
                    text = f"a field is longer than {MAX_FIELD_BYTES // 1024} KiB"
                raise InputError(f"{source}: line {reader.line_num}: {text}") from None
            yield fields
    finally:
        csv.field_size_limit(previous)


def parse_csv_text(text: str, source: str = "<csv>") -> EnergyRows:
    """Parse CSV text into checked :class:`EnergyRow` objects (see the module docstring)."""
    problems = _Problems(source)
    if not text.strip():
        raise InputError(f"{source}: the file is empty (expected a header line "
                         "'Z,state,energy,unit,label' and at least one row)")
    comments = blanks = 0
    header = None
    rows: list[EnergyRow] = []
    count = 0
    reader = csv.reader(io.StringIO(text, newline=None))   # LF, CRLF and CR-only line ends
    for fields in _csv_records(reader, source):
        line = reader.line_num
        if not fields or all(not f.strip() for f in fields):
            blanks += 1
            continue
        if fields[0].lstrip().startswith("#"):
            comments += 1
            continue
        if header is None:
            keys, display = _normalize_header(fields, problems, f"header (line {line})")
            absent = [DISPLAY[c] for c in REQUIRED if c not in keys]
            if absent:
                problems.add(f"header (line {line}): missing column(s) {', '.join(absent)} "
                             f"(found: {', '.join(f.strip() for f in fields)})")
            problems.raise_if_any()
            header = keys
            continue
        count += 1
        if count > MAX_ROWS:
            raise ResourceError(f"{source}: more than {MAX_ROWS} rows; split the file")
        where = f"row {count} (line {line})"
        if len(fields) != len(header):
            problems.add(f"{where}: has {len(fields)} fields but the header has {len(header)}")
            continue
        record = dict(zip(header, fields))
        parsed = _parse_record(record, count, line, problems, display)
        if parsed is not None:
            rows.append(parsed)
        if len(problems.items) > 10 * MAX_REPORTED:
            break
    if header is None:
        raise InputError(f"{source}: no header line (only comments or blank lines)")
    problems.raise_if_any()
    if not rows:
        raise InputError(f"{source}: the header is there but there are no data rows")
    return EnergyRows(tuple(rows), source, "csv", comments, blanks)


def _json_depth_and_longest(data) -> tuple[int, int]:
    """Deepest nesting of lists/objects and the longest string (key or value), without recursion."""
    depth = longest = 0
    stack = [(data, 1)]
    while stack:
        item, level = stack.pop()
        if isinstance(item, str):
            longest = max(longest, len(item))
        elif isinstance(item, (list, dict)):
            depth = max(depth, level)
            if depth > MAX_JSON_DEPTH:
                break
            values = item.items() if isinstance(item, dict) else ((None, v) for v in item)
            for key, value in values:
                if isinstance(key, str):
                    longest = max(longest, len(key))
                stack.append((value, level + 1))
    return depth, longest


def _load_json(text: str, source: str):
    """Decode JSON text, refusing (one line) bad syntax, deep nesting, huge numbers and fields."""
    try:
        data = json.loads(text, parse_constant=lambda name: name)  # NaN/Infinity stay text
    except json.JSONDecodeError as exc:
        raise InputError(f"{source}: not valid JSON (line {exc.lineno}, column {exc.colno}: "
                         f"{exc.msg})") from None
    except RecursionError:
        raise InputError(f"{source}: JSON nested too deeply (a row file needs {MAX_JSON_DEPTH} "
                         "levels at most)") from None
    except ValueError as exc:           # e.g. an integer beyond Python's digit limit
        raise InputError(f"{source}: not valid JSON: {str(exc).splitlines()[0]}") from None
    depth, longest = _json_depth_and_longest(data)
    if depth > MAX_JSON_DEPTH:
        raise InputError(f"{source}: JSON nested more than {MAX_JSON_DEPTH} levels deep")
    if longest > MAX_FIELD_BYTES:
        raise InputError(f"{source}: a JSON string is longer than {MAX_FIELD_BYTES // 1024} KiB")
    return data


def parse_json_text(text: str, source: str = "<json>") -> EnergyRows:
    """Parse JSON text (a list of row objects, or ``{"rows": [...]}``)."""
    if not text.strip():
        raise InputError(f"{source}: the file is empty (expected a JSON list of rows)")
    data = _load_json(text, source)
    if isinstance(data, dict):
        if "rows" not in data:
            raise InputError(f"{source}: a JSON object must have a 'rows' list")
        data = data["rows"]
    if not isinstance(data, list):
        raise InputError(f"{source}: expected a JSON list of row objects")
    if not data:
        raise InputError(f"{source}: the list of rows is empty")
    if len(data) > MAX_ROWS:
        raise ResourceError(f"{source}: more than {MAX_ROWS} rows; split the file")
    problems = _Problems(source)
    rows = []
    for count, item in enumerate(data, start=1):
        where = f"row {count}"
        if not isinstance(item, dict):
            problems.add(f"{where}: expected an object with Z, energy and unit, got {type(item).__name__}")
            continue
        record, display = {}, {}
        for name, value in item.items():
            key = str(name).strip().lower()
            if key in record:
                problems.add(f"{where}: column '{name}' appears twice")
            record[key] = value
            display[key] = str(name)
        for c in REQUIRED:
            if c not in record:
                problems.add(f"{where}: missing column '{DISPLAY[c]}'")
        if any(c not in record for c in REQUIRED):
            continue
        parsed = _parse_record(record, count, None, problems, display)
        if parsed is not None:
            rows.append(parsed)
        if len(problems.items) > 10 * MAX_REPORTED:
            break
    problems.raise_if_any()
    return EnergyRows(tuple(rows), source, "json")


def read_rows(path) -> EnergyRows:
    """Read a CSV or JSON file of energies (format from the suffix, else from the content)."""
    from twoel.io import read_input_bytes

    path = Path(path)
    raw = read_input_bytes(path, "file", MAX_BYTES)
    try:
        text = raw.decode("utf-8-sig")
    except UnicodeDecodeError as exc:
        raise InputError(f"{path.name}: not UTF-8 text (byte {exc.start}); save it as UTF-8") from None
    suffix = path.suffix.lower()
    if suffix == ".json" or (suffix != ".csv" and text.lstrip()[:1] in ("[", "{")):
        return parse_json_text(text, path.name)
    return parse_csv_text(text, path.name)
