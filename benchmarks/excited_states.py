"""Accuracy and timing of excited S and P states with the stored boxes.

Usage: ``python3 benchmarks/excited_states.py [--sizes 300 600] [--states 2^3S 2^1S ...]``.
Prints, per state and size, the energy, the difference to the tabulated reference (if any),
the number of dropped overlap directions and the wall time of one solve (build + eigen), plus
the time of the expectation values at the largest size.
"""

from __future__ import annotations

import argparse
import sys
import time
import warnings
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

from twoel.properties.expectation import expectation_values  # noqa: E402
from twoel.analysis.transitions import solve_state  # noqa: E402


def main(argv=None) -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--Z", type=float, default=2.0)
    p.add_argument("--sizes", type=int, nargs="+", default=[300, 600])
    p.add_argument("--states", nargs="+", default=["2^3S", "2^1S", "2^3P", "2^1P", "3^3P", "3^1P"])
    p.add_argument("--properties", action="store_true", help="also time the expectation values")
    args = p.parse_args(argv)
    warnings.simplefilter("ignore")
    print(f"{'state':6s} {'N':>5s} {'energy (Eh)':>20s} {'E - ref (Eh)':>12s} {'dropped':>7s} {'time s':>7s}")
    for label in args.states:
        result = None
        for size in args.sizes:
            started = time.perf_counter()
            result = solve_state(args.Z, label, size=size)
            elapsed = time.perf_counter() - started
            diff = "" if result.reference is None else f"{result.difference_hartree:12.2e}"
            print(f"{label:6s} {size:5d} {result.energy_hartree:20.12f} {diff:>12s} "
                  f"{result.n_dropped:7d} {elapsed:7.2f}", flush=True)
        if args.properties and result is not None:
            started = time.perf_counter()
            v = expectation_values(result)
            print(f"       properties at N={result.n_terms}: {time.perf_counter() - started:.2f} s "
                  f"(virial {v.virial_ratio:.10f}, <δ(r1)> reg {v.delta_r1_regularized:.9f})", flush=True)


if __name__ == "__main__":
    main()
