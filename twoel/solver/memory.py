"""A memory estimate of a solve, checked before any matrix is built.

The matrices of a basis of ``N`` functions take ``N²`` entries each, and a solve keeps many of
them at once (overlap, kinetic, nuclear and repulsion parts, the Hamiltonian, the eigensolver's
copies and vectors, the double-double matrices of the mixed refinement, the smaller bases of the
error bar).  :func:`solve_bytes` counts the memory per ``N²`` entry as measured for the whole
process (peak resident size less that of the imports, He 1^1S, exponential family):

* float64 (with its mixed-precision refinement and error bar): about 340 bytes per entry at
  N = 800 and 390 at N = 1600, so :data:`FLOAT64_BYTES_PER_ENTRY` = 400 (50 float64 matrices);
* extended precision (exact fixed-point assembly and arb matrices at ~200 bits): about 890 bytes
  per entry at N = 300 and 1350 at N = 600, so :data:`EXTENDED_BYTES_PER_ENTRY` = 1500.

:func:`available_bytes` reads ``MemAvailable`` of ``/proc/meminfo`` (Linux), else the free
physical pages from :func:`os.sysconf`; where neither exists the check is skipped.
"""

from __future__ import annotations

import os

from twoel.errors import ResourceError

#: bytes per N² entry of a float64 solve (measured; see the module docstring)
FLOAT64_BYTES_PER_ENTRY = 400
#: bytes per N² entry of an extended-precision solve, in addition (measured; module docstring)
EXTENDED_BYTES_PER_ENTRY = 1500
#: where Linux says how much memory a new process can take without swapping
MEMINFO = "/proc/meminfo"


def matrix_bytes(n: int, count: int = 1, bytes_per_entry: int = 8) -> int:
    """Bytes of ``count`` ``n × n`` matrices of ``bytes_per_entry`` bytes each entry."""
    return int(count) * int(n) * int(n) * int(bytes_per_entry)


def solve_bytes(n_functions: int, precision: str = "float64") -> int:
    """Estimated peak memory (bytes) of a solve with ``n_functions`` basis functions."""
    total = matrix_bytes(n_functions, bytes_per_entry=FLOAT64_BYTES_PER_ENTRY)
    if precision == "extended":
        total += matrix_bytes(n_functions, bytes_per_entry=EXTENDED_BYTES_PER_ENTRY)
    return total


def available_bytes(meminfo: str = MEMINFO) -> int | None:
    """Memory available to this process now (bytes), or ``None`` where the system does not say."""
    try:
        with open(meminfo, encoding="ascii", errors="replace") as handle:
            for line in handle:
                if line.startswith("MemAvailable:"):
                    fields = line.split()
                    return int(fields[1]) * (1024 if fields[2:3] == ["kB"] else 1)
    except (OSError, ValueError, IndexError):
        pass
    try:
        return int(os.sysconf("SC_AVPHYS_PAGES")) * int(os.sysconf("SC_PAGE_SIZE"))
    except (AttributeError, ValueError, OSError):
        return None


def _gib(n: int) -> str:
    return f"{n / 2**30:.2g} GiB" if n >= 2**28 else f"{n / 2**20:.3g} MiB"


def check_memory(n_functions: int, precision: str = "float64", available: int | None = None) -> None:
    """Raise :class:`~twoel.errors.ResourceError` (exit status 2 on the command line) when the
    estimate of :func:`solve_bytes` exceeds the available memory (``available`` bytes; default
    :func:`available_bytes`; unknown: no check)."""
    available = available_bytes() if available is None else available
    if available is None:
        return
    need = solve_bytes(n_functions, precision)
    if need > available:
        raise ResourceError(f"a {precision} solve with {n_functions} basis functions needs about "
                            f"{_gib(need)} of memory (estimate), but only {_gib(available)} is "
                            "available; use a smaller size")
