"""Published reference values, read from the CSV tables in ``data/`` with schema checks.

Every table has the columns ``key, Z, state, quantity, value, unit, uncertainty, method,
source, note``.  ``value`` is kept as text too, so that digits beyond float64 survive for
extended-precision comparisons.  A row without a source is an error.  ``note`` says
"from memory" where the value was recalled rather than read from the cited table.
"""

from __future__ import annotations

import csv
import io
from dataclasses import dataclass
from functools import lru_cache
from importlib import resources
from pathlib import Path

from twoel.errors import InputError
from twoel.system import State

REQUIRED_COLUMNS = ("key", "Z", "state", "quantity", "value", "unit", "uncertainty", "method",
                    "source", "note")

#: quantity name of nonrelativistic, infinite-nuclear-mass total energies
NONREL_ENERGY = "nonrelativistic_energy_infinite_mass"


@dataclass(frozen=True)
class ReferenceValue:
    """One published value with its provenance."""

    key: str
    Z: float
    state: str
    quantity: str
    value: float
    value_text: str
    unit: str
    uncertainty: float | None
    method: str
    source: str
    note: str
    table: str

    def to_dict(self) -> dict:
        return {"key": self.key, "Z": self.Z, "state": self.state, "quantity": self.quantity,
                "value": self.value, "value_text": self.value_text, "unit": self.unit,
                "uncertainty": self.uncertainty, "method": self.method, "source": self.source,
                "note": self.note, "table": self.table}


def data_root():
    """The folder of shipped data: ``data/`` beside the package in a checkout, else ``twoel.data``."""
    checkout = Path(__file__).resolve().parent.parent / "data"
    if (checkout / "reference_energies.csv").is_file():
        return checkout
    return resources.files("twoel.data")


def data_files() -> list[str]:
    """Names of the CSV tables shipped in ``twoel.data``."""
    return sorted(p.name for p in data_root().iterdir() if p.name.endswith(".csv"))


def read_data_text(name: str) -> str:
    """Text of a file shipped in ``twoel.data`` (works after a non-editable install)."""
    path = data_root().joinpath(name)
    if not path.is_file():
        raise InputError(f"no data file {name!r} in twoel.data")
    return path.read_text(encoding="utf-8")


def parse_reference_csv(text: str, table: str = "<text>") -> list[ReferenceValue]:
    """Parse and validate one reference table."""
    reader = csv.DictReader(io.StringIO(text))
    missing = [c for c in REQUIRED_COLUMNS if c not in (reader.fieldnames or [])]
    if missing:
        raise InputError(f"{table}: missing column(s) {', '.join(missing)}")
    rows = []
    for line, row in enumerate(reader, start=2):
        if not (row.get("source") or "").strip():
            raise InputError(f"{table} line {line}: a reference value needs a source")
        try:
            z = float(row["Z"])
            value = float(row["value"])
            unc = float(row["uncertainty"]) if row["uncertainty"].strip() else None
        except ValueError as exc:
            raise InputError(f"{table} line {line}: non-numeric Z, value or uncertainty ({exc})")
        state = State.parse(row["state"]).label if row["state"].strip() else ""
        rows.append(ReferenceValue(row["key"].strip(), z, state, row["quantity"].strip(), value,
                                   row["value"].strip(), row["unit"].strip(), unc,
                                   row["method"].strip(), row["source"].strip(),
                                   row["note"].strip(), table))
    return rows


@lru_cache(maxsize=None)
def _table(name: str) -> tuple[ReferenceValue, ...]:
    return tuple(parse_reference_csv(read_data_text(name), name))


def all_references(table: str | None = None) -> list[ReferenceValue]:
    """Every reference row, from one table or from all of them."""
    names = [table] if table else [n for n in data_files() if _has_reference_schema(n)]
    out: list[ReferenceValue] = []
    for name in names:
        out.extend(_table(name))
    return out


@lru_cache(maxsize=None)
def _has_reference_schema(name: str) -> bool:
    header = read_data_text(name).splitlines()[0].split(",")
    return all(c in header for c in REQUIRED_COLUMNS)


def lookup(Z: float, state: str | State = "1^1S", quantity: str = NONREL_ENERGY) -> ReferenceValue | None:
    """The reference value for ``(Z, state, quantity)``, or ``None`` if none is tabulated.

    Where several sources give the value, the one with the smallest uncertainty wins.
    """
    label = State.parse(state).label
    matches = [r for r in all_references() if r.Z == float(Z) and r.state == label and r.quantity == quantity]
    if not matches:
        return None
    return min(matches, key=lambda r: r.uncertainty if r.uncertainty is not None else float("inf"))
