"""Regenerate, or check, the SymPy-derived kernel modules in :mod:`twoel.integrals.generated`.

``python -m twoel.integrals.generate [TARGET ...]``
    Derive the targets (default: all) and write them atomically (:func:`twoel.io.atomic_write_text`).
``python -m twoel.integrals.generate --check [TARGET ...]``
    Derive them in memory and compare with the files; write nothing.  Exit 0 if every file is
    identical, 1 with a one-line message naming the stale (or missing) files otherwise.

``TARGET`` is a key of :data:`TARGETS` (``kinetic_terms``, ``zero_power_kernels``,
``state_terms``, ``angular_zero_power``).  ``--folder DIR`` points at another copy of the
generated files (default: the package folder).  Bad input (unknown target, missing folder) exits 2 with one line on stderr.
"""

from __future__ import annotations

import argparse
import sys
import time
from pathlib import Path

from twoel.errors import InputError, TwoelError
from twoel.integrals.symbolic import kinetic_source, zero_power_source
from twoel.integrals.symbolic_states import generated_source, zero_power_angular_source
from twoel.io import atomic_write_text

GENERATED_FOLDER = Path(__file__).parent / "generated"

#: target name -> function returning the module source; cheapest first
TARGETS = {
    "kinetic_terms": kinetic_source,
    "zero_power_kernels": zero_power_source,
    "state_terms": generated_source,
    "angular_zero_power": zero_power_angular_source,
}

KINETIC_PATH = GENERATED_FOLDER / "kinetic_terms.py"
ZERO_POWER_PATH = GENERATED_FOLDER / "zero_power_kernels.py"
STATE_TERMS_PATH = GENERATED_FOLDER / "state_terms.py"


def _selected(names) -> list[str]:
    names = list(names) if names else list(TARGETS)
    unknown = [name for name in names if name not in TARGETS]
    if unknown:
        raise InputError(f"unknown target {unknown[0]!r}; choose from {', '.join(TARGETS)}")
    return list(dict.fromkeys(names))


def _folder(folder) -> Path:
    folder = Path(GENERATED_FOLDER if folder is None else folder)
    if not folder.is_dir():
        raise InputError(f"folder {str(folder)!r} does not exist")
    return folder


def stale_targets(names=None, folder=None) -> list[str]:
    """Targets whose file in ``folder`` differs from a fresh in-memory regeneration.

    Parameters
    ----------
    names : iterable of str, optional
        Keys of :data:`TARGETS` (default: all).
    folder : path-like, optional
        Folder holding the generated files (default: :data:`GENERATED_FOLDER`).

    Returns
    -------
    list of str
        The stale or missing targets, in :data:`TARGETS` order of the request; nothing is written.
    """
    folder = _folder(folder)
    stale = []
    for name in _selected(names):
        path = folder / f"{name}.py"
        shipped = path.read_text(encoding="utf-8") if path.is_file() else None
        if shipped != TARGETS[name]():
            stale.append(name)
    return stale


def write_targets(names=None, folder=None) -> list[tuple[Path, float]]:
    """Regenerate the targets and write them atomically; returns ``(path, seconds)`` per file."""
    folder = _folder(folder)
    written = []
    for name in _selected(names):
        start = time.perf_counter()
        source = TARGETS[name]()
        path = atomic_write_text(folder / f"{name}.py", source)
        written.append((path, time.perf_counter() - start))
    return written


def main(argv=None) -> int:
    """Command line of the generator; returns the exit code (0, 1 stale with ``--check``, 2 bad input)."""
    parser = argparse.ArgumentParser(prog="python -m twoel.integrals.generate",
                                     description="Regenerate (or check) twoel/integrals/generated/.")
    parser.add_argument("targets", nargs="*", metavar="TARGET",
                        help=f"what to generate: {', '.join(TARGETS)} (default: all)")
    parser.add_argument("--check", action="store_true",
                        help="compare a fresh regeneration with the files; write nothing")
    parser.add_argument("--folder", default=None,
                        help="folder of the generated files (default: the package's generated/)")
    args = parser.parse_args(argv)
    try:
        if args.check:
            names = _selected(args.targets)
            stale = stale_targets(names, args.folder)
            folder = _folder(args.folder)
            if stale:
                files = ", ".join(f"{name}.py" for name in stale)
                where = "" if args.folder is None else f" --folder {folder}"
                print(f"stale generated file(s) in {folder}: {files}; regenerate with "
                      f"python -m twoel.integrals.generate {' '.join(stale)}{where}", file=sys.stderr)
                return 1
            print(f"up to date in {folder}: {', '.join(f'{name}.py' for name in names)}")
            return 0
        for path, seconds in write_targets(args.targets, args.folder):
            print(f"wrote {path} ({seconds:.1f} s)")
        return 0
    except (TwoelError, OSError) as error:
        print(f"error: {error}", file=sys.stderr)
        return 2


if __name__ == "__main__":
    sys.exit(main())
