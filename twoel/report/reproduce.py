"""Check a re-run of a report against its provenance file, block by block.

:func:`twoel.report.build.rebuild_from_provenance` re-runs the configuration stored in a
``provenance.json`` and hands both records to :func:`check_reproduction`, which looks at every
block of the provenance:

``numbers``        every float of every table, each within its own tolerance (rules below);
``computations``   the recorded solves must be exactly the ones the recorded configuration asks
                   for, and the re-run must define each solve the same way (basis, sizes,
                   method, options, parameters); an edited entry is a *record mismatch*;
``constants``      the CODATA edition and every value (value, unit, uncertainty) must equal the
                   ones this installation uses, else the verdict names the ones that differ;
``digests``        SHA-256 of each recorded block (written since the digests were added): a
                   block edited after the build is a record mismatch; older files: "not recorded";
``packages``, ``environment``, ``platform``
                   versions, platform, BLAS library and thread settings: information only.

Tolerance rules (mode ``tolerance``, the default)
-------------------------------------------------
Let ``E`` be the energy of a table row (Eh) and ``REL = 1e-12``.  Float64 has a unit round-off
of 1.1e-16; an energy is a sum over N² matrix elements (N ≤ a few hundred) followed by a dense
eigen-solve, and a different BLAS, CPU or thread count changes the order of those sums.  We
allow ``REL |E|`` (about 4500 round-offs) for that; measured differences between thread
settings and machines are 1e-15 to 1e-13 relative.

* A number with a recorded uncertainty uses it: ``energy_hartree`` its ``error_bar_hartree``,
  ``reference_hartree`` its ``reference_uncertainty_hartree`` (the pairs of
  :data:`twoel.report.tables.UNCERTAINTY_COLUMNS`), when that uncertainty is positive.
* Otherwise ``energy_hartree`` gets ``tE = REL |E|``; quantities derived from it inherit it:
  ``ionization_energy_hartree`` ``tE``; its eV and cm⁻¹ forms ``tE`` converted to the unit;
  ``difference_hartree`` ``tE`` plus the reference's tolerance; ``increment_hartree`` the sum
  of the two energies' tolerances; ``extrapolated_hartree`` (Aitken Δ² of three energies,
  ``E_k + d2 q/(1-q)``, ``q = d2/d1``) ``(1 + 2p)² max tE`` with ``p = q/(1-q)`` (the sum of the
  absolute partial derivatives); ``extrapolation_error_hartree`` ``tE`` plus the tolerance of
  the last extrapolated value; ``error_bar_hartree`` (a geometric tail of three nested bases)
  ``10 REL |E|``.
* ``virial_ratio`` is first order in the wave function, whose error is the square root of the
  energy's (variational principle): ``sqrt(REL) = 1e-6`` relative.
* Inputs and data read from files (``Z``, a reference without uncertainty,
  ``reference_uncertainty_hartree``) are compared bit for bit: parsing decimal text is
  correctly rounded everywhere.
* Other columns: ``REL max(|x|, |E|)``.

In ``computations``: the task and the definition of every solve (``Z, state, family, size,
n_terms, precision``, method, options, drop threshold, basis kind and powers) must be equal;
parameters and basis exponents that were not optimized must be equal bit for bit, optimized
ones within ``1e-4`` relative (the optimizer stops when the energies of its simplex agree to
1e-13 Eh, which fixes a parameter only to about ``sqrt(2e-13 / E'')``, measured 2e-6 relative
between two runs on one machine); the energy uses the ``energy_hartree`` rule.  The other fields
of a result (timings, optimizer path, condition numbers, texts) are not compared.

Mode ``strict`` compares every one of those floats bit for bit.
"""

from __future__ import annotations

import hashlib
import json
import math
import os
import platform
import sys

from twoel.errors import InputError
from twoel.report.tables import UNCERTAINTY_COLUMNS     # value column -> its uncertainty column

#: relative tolerance of an energy from float64 arithmetic (see the module docstring)
REL_ENERGY = 1e-12
#: relative tolerance of a quantity first order in the wave function (sqrt of REL_ENERGY)
REL_FIRST_ORDER = 1e-6
#: relative tolerance of an optimized parameter (set by the optimizer's stopping rule)
REL_OPTIMIZED = 1e-4
#: gain of the nested-basis error bar over the energies it combines
ERROR_BAR_GAIN = 10.0

MODES = ("tolerance", "strict")
THREAD_VARIABLES = ("OPENBLAS_NUM_THREADS", "OMP_NUM_THREADS", "MKL_NUM_THREADS")
#: blocks whose SHA-256 digest is recorded
DIGEST_BLOCKS = ("config", "computations", "constants", "numbers", "packages", "environment")
NOT_RECORDED = "not recorded"


_EXACT_COLUMNS = frozenset({"Z", "reference_uncertainty_hartree"})

#: result fields that define a solve (compared exactly)
_DEFINITION_PATHS = (
    ("Z",), ("state",), ("family",), ("size",), ("n_terms",), ("precision",),
    ("provenance", "method"), ("provenance", "family"), ("provenance", "size"),
    ("provenance", "state"), ("provenance", "Z"), ("provenance", "options"),
    ("provenance", "precision"), ("provenance", "drop_threshold"), ("provenance", "optimized"),
    ("provenance", "basis", "kind"), ("provenance", "basis", "sign"),
    ("provenance", "basis", "powers"), ("provenance", "basis", "contraction"),
    ("reference_energy_hartree",),
)
_MISSING = object()


# --------------------------------------------------------------------------- environment

def _blas() -> dict:
    """BLAS/LAPACK library numpy was built with (``numpy.show_config``), or "not recorded"."""
    try:
        import numpy

        info = numpy.show_config(mode="dicts")["Build Dependencies"]
        return {key: {k: info[key].get(k) for k in ("name", "version", "openblas configuration")
                      if info[key].get(k) is not None}
                for key in ("blas", "lapack") if key in info}
    except Exception:  # noqa: BLE001 - information only: older numpy has no mode="dicts"
        return {"blas": NOT_RECORDED}


def _thread_pools():
    """``threadpoolctl.threadpool_info()`` when threadpoolctl is installed (not a dependency)."""
    try:
        from threadpoolctl import threadpool_info
    except ImportError:
        return "threadpoolctl not installed"
    return [{k: pool.get(k) for k in ("user_api", "internal_api", "version", "num_threads")}
            for pool in threadpool_info()]


def environment() -> dict:
    """Platform, BLAS library and thread settings of this process (recorded as information)."""
    return {"platform": platform.platform(), "machine": platform.machine(),
            "python": sys.version.split()[0], "cpu_count": os.cpu_count(),
            "blas": _blas(),
            "threads": {name: os.environ.get(name) for name in THREAD_VARIABLES},
            "thread_pools": _thread_pools()}


def _canonical(block) -> str:
    return json.dumps(block, sort_keys=True, separators=(",", ":"), ensure_ascii=False)


def block_digests(provenance: dict) -> dict:
    """SHA-256 of the canonical JSON of each recorded block (of the record as written)."""
    return {name: hashlib.sha256(_canonical(provenance[name]).encode("utf-8")).hexdigest()
            for name in DIGEST_BLOCKS if name in provenance}


# --------------------------------------------------------------------------- structure

def _is_number(x) -> bool:
    return isinstance(x, (int, float)) and not isinstance(x, bool)


def check_structure(data: dict, where: str = "the provenance file") -> None:
    """Raise :class:`InputError` (one line) if a provenance record has the wrong shape."""
    if not isinstance(data.get("config"), dict):
        raise InputError(f"{where} has no 'config' table")
    if not isinstance(data["config"].get("name", ""), str):
        raise InputError(f"{where}: config.name must be text")
    numbers = data.get("numbers")
    if not isinstance(numbers, dict):
        raise InputError(f"{where} has no 'numbers' table")
    for table, columns in numbers.items():
        if not isinstance(columns, dict):
            raise InputError(f"{where}: numbers.{table} must be a table of columns")
        for column, values in columns.items():
            if not isinstance(values, list) or not all(v is None or _is_number(v) for v in values):
                raise InputError(f"{where}: numbers.{table}.{column} must be a list of numbers")
    computations = data.get("computations", {})
    if not isinstance(computations, dict):
        raise InputError(f"{where}: 'computations' must be a table of sections")
    for section, records in computations.items():
        if not isinstance(records, list) or not all(
                isinstance(r, dict) and isinstance(r.get("task"), dict) and isinstance(r.get("result"), dict)
                for r in records):
            raise InputError(f"{where}: computations.{section} must be a list of {{task, result}} entries")
    constants = data.get("constants")
    if constants is not None:
        if not isinstance(constants, dict) or not isinstance(constants.get("values", {}), dict):
            raise InputError(f"{where}: 'constants' must be a table with an edition and values")
    for name in ("packages", "digests", "environment"):
        if name in data and not isinstance(data[name], dict):
            raise InputError(f"{where}: '{name}' must be a table")


# --------------------------------------------------------------------------- numbers

def _abs(x):
    return abs(x) if _is_number(x) and math.isfinite(x) else None


def _uncertainty(columns: dict, column: str, i: int):
    name = UNCERTAINTY_COLUMNS.get(column)
    values = columns.get(name) if name else None
    u = _abs(values[i]) if values is not None and i < len(values) else None
    return u if u else None


def _energy_tolerances(columns: dict) -> list:
    energies = columns.get("energy_hartree") or []
    out = []
    for i, e in enumerate(energies):
        u = _uncertainty(columns, "energy_hartree", i)
        out.append((u, "uncertainty") if u else ((REL_ENERGY * abs(e), "arithmetic") if _abs(e) is not None
                                                 else (None, "arithmetic")))
    return out


def _aitken_gain(energies: list, k: int):
    if k < 2 or any(_abs(energies[j]) is None for j in (k - 2, k - 1, k)):
        return None
    d1, d2 = energies[k - 1] - energies[k - 2], energies[k] - energies[k - 1]
    if d1 == 0:
        return None
    q = d2 / d1
    if not 0 < q < 1:
        return None
    p = q / (1 - q)
    return (1 + 2 * p) ** 2


class _Rows:
    """Per-row tolerances of the energy and the reference of one recorded table."""

    def __init__(self, columns: dict):
        self.columns = columns
        self.energies = columns.get("energy_hartree") or []
        self.ionization = columns.get("ionization_energy_hartree") or []
        self.tE = _energy_tolerances(columns)
        self.ref = []
        for i, _ in enumerate(columns.get("reference_hartree") or []):
            u = _uncertainty(columns, "reference_hartree", i)
            self.ref.append((u, "uncertainty") if u else (0.0, "exact"))
        extrapolated = columns.get("extrapolated_hartree") or []
        self.last_extrapolated = max((k for k, v in enumerate(extrapolated) if _abs(v) is not None),
                                     default=None)

    def t_e(self, i):
        return self.tE[i][0] if i < len(self.tE) else None

    def energy(self, i):
        return self.energies[i] if i < len(self.energies) and _abs(self.energies[i]) is not None else None

    def extrapolated(self, k):
        if k is None or k < 2:
            return None
        gain = _aitken_gain(self.energies, k)
        worst = [self.t_e(j) for j in (k - 2, k - 1, k)]
        return None if gain is None or None in worst else gain * max(worst)


def _derived_tolerance(rows: _Rows, column: str, i: int, x):
    """Tolerance of a computed column from the row energy's (None: the default rule)."""
    t_e = rows.t_e(i)
    if column == "ionization_energy_hartree":
        return t_e
    if column.startswith("ionization_energy_"):
        ih = _abs(rows.ionization[i]) if i < len(rows.ionization) else None
        return abs(x) * (t_e / ih + REL_ENERGY) if ih and t_e is not None and _abs(x) is not None else None
    if column == "difference_hartree":
        return None if t_e is None else t_e + (rows.ref[i][0] if i < len(rows.ref) else 0.0)
    if column == "increment_hartree":
        return t_e + rows.t_e(i - 1) if i >= 1 and t_e is not None and rows.t_e(i - 1) is not None else None
    if column == "extrapolated_hartree":
        return rows.extrapolated(i)
    if column == "extrapolation_error_hartree":
        last = rows.extrapolated(rows.last_extrapolated)
        return None if t_e is None or last is None else t_e + last
    if column == "error_bar_hartree":
        e = rows.energy(i)
        return None if e is None else ERROR_BAR_GAIN * REL_ENERGY * abs(e)
    if column == "virial_ratio":
        return REL_FIRST_ORDER * abs(x) if _abs(x) is not None else None
    return None


def _tolerance(rows: _Rows, column: str, i: int, x) -> tuple:
    if column in _EXACT_COLUMNS:
        return 0.0, "exact"
    if column == "reference_hartree":
        return rows.ref[i]
    if column == "energy_hartree":
        return rows.tE[i]
    inherits = i < len(rows.tE) and column not in ("virial_ratio", "error_bar_hartree")
    source = rows.tE[i][1] if inherits else "arithmetic"
    tol = _derived_tolerance(rows, column, i, x)
    if tol is None:
        e = rows.energy(i)
        tol, source = REL_ENERGY * max(_abs(x) or 0.0, abs(e) if e is not None else 0.0), "arithmetic"
    return tol, source


def number_tolerances(numbers: dict) -> dict:
    """``{table: {column: [(tolerance, source)]}}`` for a recorded ``numbers`` block.

    ``tolerance`` is absolute, in the column's unit (0: bit for bit); ``source`` is
    ``"uncertainty"``, ``"arithmetic"`` or ``"exact"`` (rules in the module docstring).
    """
    out = {}
    for table, columns in numbers.items():
        rows = _Rows(columns)
        out[table] = {column: [_tolerance(rows, column, i, x) for i, x in enumerate(values)]
                      for column, values in columns.items()}
    return out


def _same_bits(x, y) -> bool:
    if x is None or y is None:
        return x is None and y is None
    return float(x).hex() == float(y).hex()


def bit_differences(old: dict, new: dict) -> list[str]:
    """Differences between two ``numbers`` records (empty list: identical bit for bit)."""
    diffs = []
    for where, va, vb in _paired_columns(old, new):
        if va is None or vb is None or len(va) != len(vb):
            diffs.append(f"{where}: present in only one run or of different length")
            continue
        diffs.extend(f"{where}[{i}]: {x!r} then {y!r}" for i, (x, y) in enumerate(zip(va, vb))
                     if not _same_bits(x, y))
    return diffs


def _paired_columns(old: dict, new: dict):
    """``("table.column", old values, new values)`` for every column of either record."""
    for table in sorted(set(old) | set(new)):
        a, b = old.get(table, {}), new.get(table, {})
        for column in sorted(set(a) | set(b)):
            yield f"{table}.{column}", a.get(column), b.get(column)


def compare_within(old: dict, new: dict, mode: str = "tolerance") -> dict:
    """Compare two ``numbers`` blocks, each recorded number within its tolerance.

    Returns ``{"compared", "beyond": [lines], "largest": (ratio, where) or None,
    "bit_differences", "within_uncertainty_only"}``; ``ratio`` is ``|difference| / tolerance``
    (``inf`` for a change of a bit-for-bit number or of a missing value).
    """
    tolerances = number_tolerances(old)
    compared, bits, within_u = 0, 0, 0
    beyond, largest = [], None
    for name, va, vb in _paired_columns(old, new):
        table, column = name.split(".", 1)
        if va is None or vb is None or len(va) != len(vb):
            beyond.append(f"{name}: present in only one run or of different length")
            compared += len(va or vb or [])
            continue
        for i, (x, y) in enumerate(zip(va, vb)):
            compared += 1
            where = f"{name}[{i}]"
            if _same_bits(x, y):
                ratio = 0.0
            else:
                bits += 1
                tol, source = tolerances[table][column][i]
                if x is None or y is None:
                    ratio = math.inf
                else:
                    d = abs(float(x) - float(y))
                    if mode == "strict" or not tol:
                        ratio = math.inf
                    else:
                        ratio = d / tol
                        if (source == "uncertainty" and column in UNCERTAINTY_COLUMNS
                                and d > REL_ENERGY * max(abs(x), abs(y)) and ratio <= 1):
                            within_u += 1
                if ratio > 1:
                    shown = "bit for bit" if (mode == "strict" or not tol) else f"tolerance {tol:.3g}"
                    beyond.append(f"{where}: {x!r} then {y!r} ({shown})")
            if largest is None or ratio > largest[0]:
                largest = (ratio, where)
    return {"compared": compared, "beyond": beyond, "largest": largest, "bit_differences": bits,
            "within_uncertainty_only": within_u}


# --------------------------------------------------------------------------- other blocks

def compare_constants(recorded) -> dict:
    """Recorded CODATA edition and values against this installation's (exact equality)."""
    from twoel import constants

    now = constants.provenance()
    if recorded is None:
        return {"status": NOT_RECORDED, "differences": [], "edition": now["edition"], "info": []}
    diffs = []
    if recorded.get("edition") != now["edition"]:
        diffs.append(f"edition {recorded.get('edition')!r} recorded, {now['edition']!r} now")
    old, new = recorded.get("values", {}), now["values"]
    for name in sorted(set(old) | set(new)):
        if name not in old:
            diffs.append(f"{name!r} not recorded")
        elif name not in new:
            diffs.append(f"{name!r} recorded but no longer used")
        elif list(old[name]) != list(new[name]):
            diffs.append(f"{name!r} {old[name]!r} recorded, {new[name]!r} now")
    info = []
    if recorded.get("scipy") != now["scipy"]:
        info.append(f"constants read from scipy {recorded.get('scipy')}, now scipy {now['scipy']}")
    return {"status": "equal" if not diffs else "differ", "differences": diffs,
            "edition": now["edition"], "count": len(new), "info": info}


def _get(mapping, path):
    for key in path:
        if not isinstance(mapping, dict) or key not in mapping:
            return _MISSING
        mapping = mapping[key]
    return mapping


def _floats_close(a, b, rel: float, strict: bool, path: str, out: list) -> None:
    """Compare nested lists/dicts of floats within ``rel`` relative (exact structure)."""
    if isinstance(a, dict) and isinstance(b, dict):
        if set(a) != set(b):
            out.append(f"{path}: keys {sorted(a)} recorded, {sorted(b)} in the re-run")
            return
        for k in a:
            _floats_close(a[k], b[k], rel, strict, f"{path}.{k}", out)
    elif isinstance(a, list) and isinstance(b, list):
        if len(a) != len(b):
            out.append(f"{path}: {len(a)} entries recorded, {len(b)} in the re-run")
            return
        for i, (x, y) in enumerate(zip(a, b)):
            _floats_close(x, y, rel, strict, f"{path}[{i}]", out)
    elif _is_number(a) and _is_number(b):
        if strict or rel == 0:
            if not _same_bits(a, b):
                out.append(f"{path}: {a!r} recorded, {b!r} in the re-run (bit for bit)")
        elif abs(a - b) > rel * max(abs(a), abs(b)):
            out.append(f"{path}: {a!r} recorded, {b!r} in the re-run (tolerance {rel:g} relative)")
    elif a != b:
        out.append(f"{path}: {a!r} recorded, {b!r} in the re-run")


def compare_computations(recorded, expected: dict, rerun: dict, mode: str = "tolerance") -> dict:
    """Check the recorded solves against the tasks the configuration asks for and the re-run.

    ``expected`` is :func:`twoel.report.build.report_tasks` of the recorded configuration.
    Returns ``{"status", "records", "mismatches": [lines]}``.
    """
    if recorded is None:
        return {"status": NOT_RECORDED, "records": 0, "mismatches": []}
    strict = mode == "strict"
    mismatches = []
    records = 0
    for section in sorted(set(recorded) | set(expected)):
        entries, asked = recorded.get(section, []), expected.get(section, [])
        again = rerun.get(section, [])
        if len(entries) != len(asked):
            mismatches.append(f"computations.{section}: {len(entries)} solve(s) recorded, the "
                              f"configuration asks for {len(asked)}")
        for i, entry in enumerate(entries):
            records += 1
            where = f"computations.{section}[{i}]"
            if i < len(asked) and _canonical(entry["task"]) != _canonical(asked[i]):
                mismatches.append(f"{where}.task: {_canonical(entry['task'])} recorded, the "
                                  f"configuration asks {_canonical(asked[i])}")
            if i >= len(again):
                continue
            old, new = entry["result"], again[i]["result"]
            for path in _DEFINITION_PATHS:
                a, b = _get(old, path), _get(new, path)
                if a is _MISSING and b is _MISSING:
                    continue
                name = where + ".result." + ".".join(path)
                if a is _MISSING or b is _MISSING:
                    mismatches.append(f"{name}: {'missing' if a is _MISSING else _canonical(a)} "
                                      f"recorded, {'missing' if b is _MISSING else _canonical(b)} in the re-run")
                elif _canonical(a) != _canonical(b):
                    mismatches.append(f"{name}: {_canonical(a)[:80]} recorded, {_canonical(b)[:80]} in the re-run")
            optimized = _get(old, ("provenance", "optimized")) is True
            rel = REL_OPTIMIZED if optimized else 0.0
            for path in (("parameters",), ("provenance", "parameters"), ("provenance", "basis", "exponents")):
                a, b = _get(old, path), _get(new, path)
                if a is _MISSING and b is _MISSING:
                    continue
                _floats_close(None if a is _MISSING else a, None if b is _MISSING else b, rel, strict,
                              where + ".result." + ".".join(path), mismatches)
            e_old, e_new = old.get("energy_hartree"), new.get("energy_hartree")
            if _is_number(e_old) and _is_number(e_new):
                u = _abs(old.get("error_bar_hartree"))
                tol = u if u else REL_ENERGY * abs(e_old)
                if (strict and not _same_bits(e_old, e_new)) or (not strict and abs(e_old - e_new) > tol):
                    mismatches.append(f"{where}.result.energy_hartree: {e_old!r} recorded, {e_new!r} in "
                                      f"the re-run ({'bit for bit' if strict else f'tolerance {tol:.3g}'})")
            elif e_old != e_new:
                mismatches.append(f"{where}.result.energy_hartree: {e_old!r} recorded, {e_new!r} in the re-run")
    return {"status": "match" if not mismatches else "mismatch", "records": records,
            "mismatches": mismatches}


def compare_digests(data: dict) -> dict:
    """Recorded block digests against the blocks as read (an edit after the build shows here)."""
    recorded = data.get("digests")
    if recorded is None:
        return {"status": NOT_RECORDED, "mismatches": []}
    now = block_digests(data)
    mismatches = [f"the {name} block was edited after the build (its SHA-256 digest differs)"
                  for name in sorted(set(recorded) | set(now)) if recorded.get(name) != now.get(name)]
    return {"status": "match" if not mismatches else "mismatch", "mismatches": mismatches}


def compare_packages(recorded, now: dict) -> dict:
    """``{package: [recorded, now]}`` for every package whose version changed (information)."""
    return {k: [v, now.get(k)] for k, v in (recorded or {}).items() if now.get(k) != v}


def _describe_environment(env) -> dict:
    if not isinstance(env, dict):
        return {"platform": NOT_RECORDED, "blas": NOT_RECORDED, "threads": NOT_RECORDED}
    blas = env.get("blas", NOT_RECORDED)
    if isinstance(blas, dict) and isinstance(blas.get("blas"), dict):
        b = blas["blas"]
        blas = " ".join(str(b[k]) for k in ("name", "version") if b.get(k))
    threads = env.get("threads", NOT_RECORDED)
    if isinstance(threads, dict):
        threads = ", ".join(f"{k}={v if v is not None else 'unset'}" for k, v in sorted(threads.items()))
    pools = env.get("thread_pools")
    if isinstance(pools, list):
        threads += "; pools: " + ", ".join(f"{p.get('internal_api')} {p.get('num_threads')}" for p in pools)
    return {"platform": env.get("platform", NOT_RECORDED), "blas": str(blas), "threads": str(threads)}


def compare_environment(data: dict) -> list[str]:
    """Information lines: platform, BLAS library and thread settings, recorded and now."""
    old = _describe_environment(data.get("environment"))
    if old["platform"] == NOT_RECORDED and isinstance(data.get("platform"), str):
        old["platform"] = data["platform"]
    new = _describe_environment(environment())
    lines = []
    for key in ("platform", "blas", "threads"):
        if old[key] == new[key]:
            lines.append(f"{key}: {new[key]} (same as recorded)")
        else:
            lines.append(f"{key}: {new[key]} now, recorded: {old[key]}")
    return lines


# --------------------------------------------------------------------------- verdict

def check_reproduction(data: dict, rerun: dict, mode: str = "tolerance", *, expected_tasks: dict,
                       packages_now: dict) -> dict:
    """Compare a provenance record ``data`` with the provenance of its re-run ``rerun``.

    ``expected_tasks``: the solves the recorded configuration asks for
    (:func:`twoel.report.build.report_tasks`); ``packages_now``: this installation's versions
    (:func:`twoel.report.build.package_versions`).

    Returns the ``reproduction`` dict of :class:`twoel.report.build.ReportResult`: the old keys
    ``identical`` (every number bit for bit), ``compared``, ``differences`` (the numbers that
    differ in any bit) and ``package_changes``, plus ``reproduced``, ``mode``, ``beyond``,
    ``largest``, ``computations``, ``constants``, ``digests``, ``environment`` and ``verdict``.
    """
    if mode not in MODES:
        raise InputError(f"reproduction mode must be one of {', '.join(MODES)}, got {mode!r}")
    numbers = compare_within(data["numbers"], rerun["numbers"], mode)
    computations = compare_computations(data.get("computations"), expected_tasks,
                                        rerun.get("computations", {}), mode)
    constants_check = compare_constants(data.get("constants"))
    digests = compare_digests(data)
    reproduced = (not numbers["beyond"] and computations["status"] != "mismatch"
                  and constants_check["status"] != "differ" and digests["status"] != "mismatch")
    differences = bit_differences(data["numbers"], rerun["numbers"])
    check = {
        "identical": not differences, "compared": numbers["compared"], "differences": differences,
        "package_changes": compare_packages(data.get("packages"), packages_now),
        "reproduced": reproduced, "mode": mode, "beyond": numbers["beyond"],
        "largest": list(numbers["largest"]) if numbers["largest"] else None,
        "bit_differences": numbers["bit_differences"],
        "within_uncertainty_only": numbers["within_uncertainty_only"],
        "computations": computations, "constants": constants_check, "digests": digests,
        "environment": compare_environment(data),
    }
    check["verdict"] = verdict_lines(check)
    return check


def _ratio_text(largest) -> str:
    if not largest:
        return "no numbers"
    ratio, where = largest
    if ratio == 0:
        return "none (all equal bit for bit)"
    if math.isinf(ratio):
        return f"{where} (a bit-for-bit number or a missing value)"
    return f"{ratio:.2g} of its tolerance ({where})"


def verdict_lines(check: dict) -> list[str]:
    """The human verdict: details first, the one-line conclusion last."""
    lines = []
    mode_text = ("strict (every number bit for bit)" if check["mode"] == "strict" else
                 "tolerance (each number within its recorded uncertainty, else within the float64 "
                 "rule of twoel.report.reproduce)")
    lines.append(f"mode: {mode_text}")
    lines.append(f"numbers: {check['compared']} compared, {len(check['beyond'])} beyond tolerance, "
                 f"{check['bit_differences']} differ in some bit; largest difference: "
                 f"{_ratio_text(check['largest'])}")
    if check["within_uncertainty_only"]:
        lines.append(f"  {check['within_uncertainty_only']} number(s) differ beyond float64 rounding "
                     "but within their recorded uncertainty")
    lines.extend(f"  {line}" for line in check["beyond"][:20])
    comp = check["computations"]
    if comp["status"] == NOT_RECORDED:
        lines.append("computations: not recorded")
    else:
        lines.append(f"computations: {comp['records']} recorded solve(s), "
                     + ("all match the configuration and the re-run" if comp["status"] == "match"
                        else f"{len(comp['mismatches'])} record mismatch(es)"))
        lines.extend(f"  {line}" for line in comp["mismatches"][:20])
    digests = check["digests"]
    lines.append("record digests: " + {"match": "every block as written", "mismatch": "MISMATCH"}.get(
        digests["status"], NOT_RECORDED))
    lines.extend(f"  {line}" for line in digests["mismatches"])
    const = check["constants"]
    if const["status"] == NOT_RECORDED:
        lines.append(f"constants: not recorded (now {const['edition']})")
    elif const["status"] == "equal":
        lines.append(f"constants: {const['edition']}, all {const['count']} values equal")
    else:
        lines.append(f"constants: DIFFER from the current {const['edition']}")
        lines.extend(f"  {line}" for line in const["differences"])
    lines.extend(f"note: {line}" for line in const.get("info", []))
    for package, (old, new) in check["package_changes"].items():
        lines.append(f"note: {package} was {old}, now {new}")
    lines.extend(f"environment: {line}" for line in check["environment"])
    failed = []
    if check["beyond"]:
        failed.append(f"{len(check['beyond'])} of {check['compared']} numbers beyond tolerance")
    if comp["status"] == "mismatch":
        failed.append(f"{len(comp['mismatches'])} computations record mismatch(es)")
    if const["status"] == "differ":
        failed.append(f"constants differ ({len(const['differences'])})")
    if digests["status"] == "mismatch":
        failed.append("blocks edited after the build")
    if check["reproduced"]:
        if check["mode"] == "strict":
            lines.append(f"reproduced all {check['compared']} numbers bit for bit (strict mode)")
        else:
            lines.append(f"reproduced within tolerance (tolerance mode): {check['compared']} numbers "
                         f"compared, largest difference {_ratio_text(check['largest'])}")
    else:
        lines.append(f"NOT reproduced ({check['mode']} mode): " + "; ".join(failed)
                     + f"; largest difference {_ratio_text(check['largest'])}")
    return lines
