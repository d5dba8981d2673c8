"""Optimize box edges of the exponential family and store them in ``data/``.

``python -m twoel.tools.tune_ground_boxes --Z 1:10 --state 1^1S --size 120 --out data/exponential_boxes.json``

For each ``(Z, state)`` the 6·(number of boxes) edges are optimized with Nelder–Mead on a log
scale (:func:`twoel.solver.optimize.minimize_energy`) at a small basis size, minimizing the float64
variational energy of the requested root; the starting point is the stored set of the nearest
Z scaled by ``Z/Z_stored`` (or the generic guess).  The result is merged into the output file
(written atomically), with the method, size, energy and date recorded beside the edges.
"""

from __future__ import annotations

import argparse
import datetime
import json
import os
import sys
import tempfile
from dataclasses import replace

import numpy as np

from twoel import __version__
from twoel.solver.eigen import solve_generalized
from twoel.basis.correlated import CorrelatedBasis
from twoel.errors import TwoelError
from twoel.solver.optimize import minimize_energy
from twoel.system import Ion, State, parse_charge_range
from twoel.basis import exponential_boxes as stored
from twoel.basis.exponential import box_exponents


def tune(ion: Ion, state: State, size: int, start: stored.BoxSet | None = None,
         max_evaluations: int = 3000, progress=None, objective: str = "float64") -> stored.BoxSet:
    """Optimize the box edges of ``(ion, state)`` at basis size ``size``; returns the new set.

    ``objective="float64"`` minimizes the plain float64 energy (fast, but blind to the
    near-dependent directions that float64 drops); ``"mixed"`` minimizes the refined energy of
    :func:`twoel.solver.refine.mixed_refine` (about 10x slower per evaluation, sees the whole basis).
    """
    start = start or stored.box_set_for(ion, state)
    params = start.parameters()

    def energy(values):
        boxes = start.with_values(values).boxes
        exps = box_exponents(boxes, size, state.exchange_sign)
        basis = CorrelatedBasis(np.zeros_like(exps, dtype=int), exps, sign=state.exchange_sign)
        m = basis.matrices()
        eig = solve_generalized(m.hamiltonian(ion.Z), m.overlap)
        if objective == "mixed":
            from twoel.solver.refine import mixed_refine

            return mixed_refine(exps, state.exchange_sign, ion.Z, eig, state.root).energy_hartree
        return float(eig.values[state.root])

    values, best, record = minimize_energy(energy, params, progress=progress,
                                           max_evaluations=max_evaluations)
    result = start.with_values(values)
    kind = "float64" if objective == "float64" else "mixed-precision (double-double + 128-bit)"
    method = (f"Nelder-Mead on the log box edges ({record.n_evaluations} evaluations), {kind} "
              f"energy of root {state.root} at N = {size}, start: {start.origin}; twoel {__version__}")
    return replace(result, Z=ion.Z, state=state.label, optimized_size=size, energy_hartree=best,
                   method=method, date=datetime.date.today().isoformat(), origin="stored")


def write_sets(path: str, sets: list[stored.BoxSet], description: str) -> None:
    """Merge ``sets`` into the JSON file at ``path`` (atomic replace)."""
    existing = []
    if os.path.exists(path):
        with open(path, encoding="utf-8") as handle:
            existing = stored.parse_box_file(handle.read(), path)
    table = {(s.Z, s.state): s for s in existing}
    for s in sets:
        table[(s.Z, s.state)] = s
    doc = {"schema": stored.SCHEMA, "description": description,
           "sets": [table[k].to_dict() for k in sorted(table)]}
    folder = os.path.dirname(os.path.abspath(path))
    fd, tmp = tempfile.mkstemp(dir=folder, suffix=".tmp")
    with os.fdopen(fd, "w", encoding="utf-8") as handle:
        json.dump(doc, handle, indent=1)
        handle.write("\n")
    os.replace(tmp, path)


def main(argv=None) -> int:
    parser = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    parser.add_argument("--Z", required=True, help="charges, e.g. 2 or 1:10")
    parser.add_argument("--state", default="1^1S")
    parser.add_argument("--size", type=int, default=120)
    parser.add_argument("--evaluations", type=int, default=3000)
    parser.add_argument("--objective", choices=("float64", "mixed"), default="float64")
    parser.add_argument("--out", required=True)
    parser.add_argument("--description", default="optimized box edges of the exponential family")
    args = parser.parse_args(argv)
    try:
        state = State.parse(args.state)
        for Z in parse_charge_range(args.Z):
            ion = Ion(Z)
            stored.stored_sets.cache_clear()
            result = tune(ion, state, args.size, max_evaluations=args.evaluations,
                          objective=args.objective)
            write_sets(args.out, [result], args.description)
            print(f"Z = {Z:g} {state.label}: E(N={args.size}) = {result.energy_hartree!r}", flush=True)
    except TwoelError as exc:
        sys.stderr.write(f"error: {exc}\n")
        return 2
    return 0


if __name__ == "__main__":
    sys.exit(main())
