"""Optimize the exponent boxes of an excited S or a P state and store them.

Usage (from the repository root)::

    python3 -m twoel.tools.tune_excited_boxes --Z 2 --state 2^3S --size 200 --evaluations 400 \
        [--out best.json] [--write]
    python3 -m twoel.tools.tune_excited_boxes --merge best1.json best2.json ...

The energy of the requested root is minimized over the box bounds (log scale, Nelder-Mead),
starting from the stored boxes (or the generic guess).  ``--write`` merges the result into
``data/exponential_boxes_excited.json`` (written atomically), recording the size, energy,
and date of the optimization; ``--out`` keeps the best entry so far in a file (checkpoint) and
``--merge`` adds such files to the data file.
"""

from __future__ import annotations

import argparse
import datetime
import json
import os
import sys
import tempfile
import time
from pathlib import Path

import numpy as np
from scipy.optimize import minimize

ROOT = Path(__file__).resolve().parent.parent.parent  # the checkout (data/ lives there)

from twoel.basis import excited_boxes as xb
from twoel.basis.exponential_excited import basis_from_boxes
from twoel.solver.eigen import solve_generalized
from twoel.errors import TwoelError
from twoel.system import Ion, State


def energy_of(boxes, ion, state, size):
    basis = basis_from_boxes(boxes, state, size)
    m = basis.matrices()
    eig = solve_generalized(m.hamiltonian(ion.Z), m.overlap)
    return float(eig.values[state.root]), eig


def _entry(boxes, ion, state, size, evaluations):
    r6 = lambda pair: tuple(round(float(v), 6) for v in pair)  # noqa: E731
    total = sum(b.fraction for b in boxes)
    boxes = [xb.Box(alpha=r6(b.alpha), beta=r6(b.beta), gamma=r6(b.gamma), fraction=round(b.fraction / total, 6)) for b in boxes]
    e, _eig = energy_of(boxes, ion, state, size)
    return {"Z": ion.Z, "state": state.label, "optimized_size": size, "energy_hartree": e,
            "method": f"Nelder-Mead on log box edges ({evaluations} evaluations max), "
                      "tools/optimize_boxes_excited.py",
            "date": datetime.date.today().isoformat(),
            "boxes": [b.to_dict() for b in boxes]}


def _atomic_json(path: Path, data) -> None:
    fd, tmp = tempfile.mkstemp(dir=path.parent, suffix=".tmp")
    with os.fdopen(fd, "w") as handle:
        json.dump(data, handle, indent=1)
        handle.write("\n")
    os.replace(tmp, path)


def merge(entries) -> None:
    path = ROOT / "data" / xb.DATA_FILE
    data = json.loads(path.read_text()) if path.exists() else {"schema": xb.SCHEMA, "sets": []}
    for entry in entries:
        old = [x for x in data["sets"] if float(x["Z"]) == float(entry["Z"]) and x["state"] == entry["state"]]
        if old and "recommended_size" in old[0] and "recommended_size" not in entry:
            entry = dict(entry, recommended_size=old[0]["recommended_size"])
        data["sets"] = [x for x in data["sets"]
                        if not (float(x["Z"]) == float(entry["Z"]) and x["state"] == entry["state"])] + [entry]
    data["sets"].sort(key=lambda x: (x["Z"], x["state"]))
    _atomic_json(path, data)
    print(f"wrote {path}", file=sys.stderr)


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--merge", nargs="+", default=None, help="merge checkpoint files into the data file")
    p.add_argument("--out", default=None, help="checkpoint file of the best entry so far")
    p.add_argument("--Z", type=float)
    p.add_argument("--state")
    p.add_argument("--size", type=int, default=200)
    p.add_argument("--evaluations", type=int, default=300)
    p.add_argument("--write", action="store_true")
    p.add_argument("--from-state", default=None, help="start from the stored boxes of another state")
    p.add_argument("--start", default=None, help="start from the boxes of a JSON set (a checkpoint)")
    args = p.parse_args(argv)
    if args.merge:
        merge([json.loads(Path(f).read_text()) for f in args.merge])
        return
    ion, state = Ion(args.Z), State.parse(args.state)
    if args.start:
        start, origin = xb.boxes_from_entry(json.loads(Path(args.start).read_text())), args.start
    elif args.from_state:
        start, origin = xb.default_boxes(ion, State.parse(args.from_state))
    else:
        start, origin = xb.default_boxes(ion, state)
    shares = [b.fraction for b in start]
    nb = len(start)

    # shares enter as log-log to stay positive; keep it simple
    x0 = np.concatenate([np.log(np.concatenate([np.maximum(b.edges(), 1e-3) for b in start])),
                         np.log(np.log(np.array(shares) + 1.0))])

    def unpack(x):
        bounds = np.exp(x[: 6 * nb]).reshape(nb, 6)
        sh = np.exp(np.exp(x[6 * nb:])) - 1.0
        return [xb.Box(alpha=tuple(sorted(b[0:2])), beta=tuple(sorted(b[2:4])), gamma=tuple(sorted(b[4:6])),
                       fraction=float(max(s, 1e-3)))
                for b, s in zip(bounds, sh)]

    best = [np.inf, None]
    count = [0]
    last = [0.0]
    t0 = time.time()

    def f(x):
        count[0] += 1
        try:
            e, _ = energy_of(unpack(x), ion, state, args.size)
        except (TwoelError, np.linalg.LinAlgError):
            return 0.0
        if e < -ion.Z**2:  # below the bare-nucleus bound: numerical collapse, reject
            return 0.0
        if e < best[0]:
            best[0], best[1] = e, x.copy()
            print(f"{count[0]:5d} {time.time() - t0:7.1f}s E = {e:.12f}", file=sys.stderr, flush=True)
            if args.out and time.time() - last[0] > 20:
                last[0] = time.time()
                _atomic_json(Path(args.out), _entry(unpack(x), ion, state, args.size, args.evaluations))
        return e

    e0 = f(x0)
    print(f"start ({origin}): {e0:.12f}", file=sys.stderr)
    minimize(f, x0, method="Nelder-Mead",
             options={"maxfev": args.evaluations, "xatol": 1e-4, "fatol": 1e-13, "adaptive": True})
    entry = _entry(unpack(best[1]), ion, state, args.size, args.evaluations)
    print(json.dumps(entry, indent=1))
    if args.out:
        _atomic_json(Path(args.out), entry)
    if args.write:
        merge([entry])


if __name__ == "__main__":
    main()
