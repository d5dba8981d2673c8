"""Tune the exponent boxes of the exponential family and store them (developer tool).

**Not part of the runtime package API**: nothing in twoel imports :mod:`twoel.tools`; this
module is run by a developer to re-make the shipped ``data/exponential_boxes*.json`` files.

Usage (from the repository root)::

    python -m twoel.tools.tune_boxes --Z 1:10 --state 1^1S --size 120 --out data/exponential_boxes.json
    python -m twoel.tools.tune_boxes --Z 2 --state 2^3S --size 200 --evaluations 400 \\
        --out data/exponential_boxes_excited.json [--checkpoint best.json] [--shares]
    python -m twoel.tools.tune_boxes --Z 2 --state 2^1P --size 40 --evaluations 50   # prints the set
    python -m twoel.tools.tune_boxes --merge best1.json best2.json --out data/exponential_boxes_excited.json

For each ``(Z, state)`` (ground, excited S or P) the box edges, and with ``--shares`` the box
fractions, are optimized on a log scale by :func:`twoel.solver.optimize.minimize_energy`
(Nelder–Mead) at the basis size ``--size``, minimizing the variational energy of the requested
root (float64, or with ``--objective mixed`` the refined energy of
:func:`twoel.solver.refine.mixed_refine`, every L).  The start is the stored set
(:func:`twoel.basis.exponential_boxes.box_set_for`: the stored set, else the nearest stored Z
scaled, else the generic guess), or ``--from-state`` / ``--start FILE``.  Energies below the
bare-nucleus bound ``-Z²`` are numerical collapse and rejected.

The result is printed (without ``--out``) or merged into ``--out`` in the one schema that
:mod:`twoel.basis.exponential_boxes` loads (``twoel-exponential-boxes/1``), written atomically
through :func:`twoel.io.atomic_write_text`, with method, size, energy and date beside the edges;
a ``recommended_size`` already stored for the set is kept.  ``--checkpoint FILE`` keeps the best
set so far (same schema, every 20 s and at the end); ``--merge`` adds sets of other box files
(also old single-set checkpoint files) to ``--out``.
"""

from __future__ import annotations

import argparse
import datetime
import json
import math
import sys
import time
from dataclasses import replace
from pathlib import Path

from twoel import __version__
from twoel.basis import exponential_boxes as stored
from twoel.basis.base import Parameter
from twoel.basis.exponential import basis_from_boxes
from twoel.errors import InputError, LinearDependenceError, TwoelError
from twoel.io import atomic_write_text
from twoel.solver.eigen import solve_generalized
from twoel.solver.optimize import minimize_energy
from twoel.system import Ion, State, parse_charge_range

OBJECTIVES = ("float64", "mixed")
#: smallest box fraction tried with ``--shares``
SHARE_FLOOR = 1e-3


def box_energy(boxes, ion: Ion, state: State, size: int, objective: str = "float64") -> float:
    """Variational energy (Eh) of root ``state.root`` in the basis of ``size`` terms from ``boxes``.

    Raises
    ------
    LinearDependenceError
        If the energy lies below ``-Z²`` (numerical collapse of a nearly dependent basis).
    """
    basis = basis_from_boxes(boxes, state, size)
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(ion.Z), m.overlap)
    if objective == "mixed":
        from twoel.integrals.precise import angular_arguments
        from twoel.solver.refine import mixed_refine

        energy = float(mixed_refine(basis.exponents, state.exchange_sign, ion.Z, eig,
                                    state.root, angular=angular_arguments(basis)).energy_hartree)
    else:
        energy = float(eig.values[state.root])
    if energy < -ion.Z**2:
        raise LinearDependenceError(f"energy {energy:.6g} Eh below -Z² = {-ion.Z**2:g} Eh")
    return energy


def _parameters(start: stored.BoxSet, shares: bool) -> list[Parameter]:
    params = start.parameters()
    if shares:
        params += [Parameter(f"box{k}_fraction", min(max(b.fraction, SHARE_FLOOR), 1.0),
                             SHARE_FLOOR, 1.0, "share")
                   for k, b in enumerate(start.boxes, start=1)]
    return params


def _apply(start: stored.BoxSet, values: dict) -> stored.BoxSet:
    """``start`` with edges (and fractions, where given) from ``values``."""
    result = start.with_values(values)
    boxes = tuple(replace(b, fraction=float(values.get(f"box{k}_fraction", b.fraction)))
                  for k, b in enumerate(result.boxes, start=1))
    # the loader normalizes the shares of the usual boxes; store them normalized (sum 1)
    total = sum(b.fraction for b in boxes if b.from_size == 0)
    if total > 0:
        boxes = tuple(replace(b, fraction=b.fraction / total) if b.from_size == 0 else b for b in boxes)
    return replace(result, boxes=boxes)


def tune(ion: Ion, state: State, size: int, start: stored.BoxSet | None = None,
         max_evaluations: int = 3000, progress=None, objective: str = "float64",
         shares: bool = False, checkpoint=None, checkpoint_seconds: float = 20.0) -> stored.BoxSet:
    """Optimize the boxes of ``(ion, state)`` at basis size ``size``; returns the new set.

    Parameters
    ----------
    ion, state : Ion, State
    size : int
        Basis size of the optimization.
    start : BoxSet, optional
        Starting boxes (default :func:`twoel.basis.exponential_boxes.box_set_for`).
    max_evaluations : int
        Largest number of energy evaluations of the Nelder–Mead search.
    progress : callable, optional
        ``progress(n_evaluations, best_energy)`` after every evaluation (Eh).
    objective : {"float64", "mixed"}
        ``"float64"`` minimizes the plain float64 energy (fast, but blind to near-dependent
        directions that float64 drops); ``"mixed"`` the refined energy (about 10x slower).
    shares : bool
        Also optimize the box fractions.
    checkpoint : callable, optional
        ``checkpoint(box_set)`` with the best set so far, at most every ``checkpoint_seconds``.
    """
    if objective not in OBJECTIVES:
        raise InputError(f"objective must be one of {', '.join(OBJECTIVES)}, got {objective!r}")
    if isinstance(size, bool) or not isinstance(size, int) or size < state.root + 1:
        raise InputError(f"--size must be an integer >= {state.root + 1}, got {size!r}")
    start = start or stored.box_set_for(ion, state)
    best = {"energy": math.inf, "values": None, "written": time.monotonic()}

    def energy(values):
        e = box_energy(_apply(start, values).boxes, ion, state, size, objective)
        if e < best["energy"]:
            best.update(energy=e, values=dict(values))
            if checkpoint is not None and time.monotonic() - best["written"] > checkpoint_seconds:
                best["written"] = time.monotonic()
                checkpoint(_finish(start, values, e, ion, state, size, objective, None))
        return e

    values, energy_best, record = minimize_energy(energy, _parameters(start, shares),
                                                  progress=progress, max_evaluations=max_evaluations)
    return _finish(start, values, energy_best, ion, state, size, objective, record.n_evaluations)


def _finish(start, values, energy, ion, state, size, objective, evaluations) -> stored.BoxSet:
    kind = "float64" if objective == "float64" else "mixed-precision (double-double + 128-bit)"
    count = "so far" if evaluations is None else f"{evaluations} evaluations"
    method = (f"Nelder-Mead on the log box edges ({count}), {kind} energy of root {state.root} "
              f"at N = {size}, start: {start.origin}; twoel {__version__}")
    return replace(_apply(start, values), Z=ion.Z, state=state.label, optimized_size=size,
                   energy_hartree=energy, method=method, date=datetime.date.today().isoformat(),
                   origin="stored", extra={**start.extra, "objective": objective})


# --------------------------------------------------------------------------- box files

def read_sets(path) -> list[stored.BoxSet]:
    """Box sets of a file in the box schema, or of an old single-set checkpoint file."""
    path = Path(path)
    try:
        text = path.read_text(encoding="utf-8")
    except OSError as exc:
        raise InputError(f"cannot read {str(path)!r}: {exc.strerror or exc}")
    try:
        doc = json.loads(text)
    except json.JSONDecodeError as exc:
        raise InputError(f"{path}: not valid JSON ({exc})")
    if isinstance(doc, dict) and "schema" not in doc and "boxes" in doc:
        text = json.dumps({"schema": stored.SCHEMA, "sets": [doc]})
    return stored.parse_box_file(text, str(path))


def write_sets(path, sets, description: str | None = None) -> Path:
    """Merge ``sets`` into the box file ``path`` (created if missing; atomic replace).

    A set replaces the stored one of the same ``(Z, state)``; a ``recommended_size`` of the old
    set is kept unless the new one has its own.  Returns the path written.
    """
    path = Path(path)
    if path.exists() and not path.is_file():
        raise InputError(f"{str(path)!r} is not a regular file")
    existing, old_description = [], None
    if path.exists():
        existing = read_sets(path)
        try:
            old_description = json.loads(path.read_text(encoding="utf-8")).get("description")
        except (ValueError, AttributeError):
            old_description = None
    table = {(s.Z, s.state): s for s in existing}
    for s in sets:
        old = table.get((s.Z, s.state))
        if old is not None and "recommended_size" in old.extra and "recommended_size" not in s.extra:
            s = replace(s, extra={**s.extra, "recommended_size": old.extra["recommended_size"]})
        table[(s.Z, s.state)] = s
    doc = {"schema": stored.SCHEMA}
    description = description if description is not None else old_description
    if description:
        doc["description"] = description
    doc["sets"] = [table[k].to_dict() for k in sorted(table)]
    return atomic_write_text(path, json.dumps(doc, indent=1) + "\n")


# --------------------------------------------------------------------------- command line

def _start_set(args, ion: Ion, state: State) -> stored.BoxSet | None:
    if args.start:
        sets = read_sets(args.start)
        same = [s for s in sets if s.Z == ion.Z and s.state == state.label]
        chosen = (same or sets)[0]
        return replace(chosen, origin=f"file {args.start}")
    if args.from_state:
        other = State.parse(args.from_state)
        return replace(stored.box_set_for(ion, other), state=state.label,
                       origin=f"stored boxes of {other.label}")
    return None


def build_parser() -> argparse.ArgumentParser:
    p = argparse.ArgumentParser(prog="python -m twoel.tools.tune_boxes",
                                description=__doc__.splitlines()[0])
    p.add_argument("--Z", help="charges, e.g. 2 or 1:10")
    p.add_argument("--state", default="1^1S", help="state label, e.g. 1^1S, 2^3S, 2^1P")
    p.add_argument("--size", type=int, default=120, help="basis size of the optimization")
    p.add_argument("--evaluations", type=int, default=3000, help="largest number of evaluations")
    p.add_argument("--objective", choices=OBJECTIVES, default="float64")
    p.add_argument("--shares", action="store_true", help="also optimize the box fractions")
    p.add_argument("--from-state", default=None, help="start from the stored boxes of another state")
    p.add_argument("--start", default=None, help="start from the set in this box file")
    p.add_argument("--out", default=None,
                   help="box file to merge the result into (default: print the box file to stdout)")
    p.add_argument("--checkpoint", default=None, help="box file of the best set so far")
    p.add_argument("--merge", nargs="+", default=None, help="merge these box files into --out")
    p.add_argument("--description", default=None, help="description stored in --out")
    p.add_argument("--quiet", action="store_true", help="no progress on stderr")
    return p


def _check_target(path) -> None:
    """Refuse, before any work, a target that cannot be written (missing folder, not a file)."""
    if path is None:
        return
    target = Path(path)
    folder = target.parent if str(target.parent) else Path(".")
    if not folder.is_dir():
        raise InputError(f"cannot write {str(target)!r}: folder {str(folder)!r} does not exist")
    if target.exists() and not target.is_file():
        raise InputError(f"{str(target)!r} is not a regular file")


def main(argv=None) -> int:
    args = build_parser().parse_args(argv)
    try:
        _check_target(args.out)
        _check_target(args.checkpoint)
        if args.merge:
            if not args.out:
                raise InputError("--merge needs --out, the box file to merge into")
            sets = [s for name in args.merge for s in read_sets(name)]
            write_sets(args.out, sets, args.description)
            print(f"wrote {args.out} ({len(sets)} sets merged)", file=sys.stderr)
            return 0
        if args.Z is None:
            raise InputError("give --Z (or --merge FILES)")
        state = State.parse(args.state)
        for Z in parse_charge_range(args.Z):
            ion = Ion(Z)
            stored.stored_sets.cache_clear()
            t0 = time.monotonic()
            shown = {"energy": math.inf}

            def progress(count, energy):
                if not args.quiet and energy < shown["energy"]:
                    shown["energy"] = energy
                    print(f"{count:5d} {time.monotonic() - t0:7.1f}s E = {energy:.12f}",
                          file=sys.stderr, flush=True)

            def checkpoint(box_set):
                write_sets(args.checkpoint, [box_set])

            result = tune(ion, state, args.size, start=_start_set(args, ion, state),
                          max_evaluations=args.evaluations, progress=progress,
                          objective=args.objective, shares=args.shares,
                          checkpoint=checkpoint if args.checkpoint else None)
            if args.checkpoint:
                write_sets(args.checkpoint, [result])
            if args.out:
                write_sets(args.out, [result], args.description)
            else:
                print(json.dumps({"schema": stored.SCHEMA, "sets": [result.to_dict()]}, indent=1))
            print(f"Z = {Z:g} {state.label}: E(N={args.size}) = {result.energy_hartree!r}",
                  file=sys.stdout if args.out else sys.stderr, flush=True)
    except TwoelError as exc:
        sys.stderr.write(f"error: {exc}\n")
        return 2
    return 0


if __name__ == "__main__":
    sys.exit(main())
