"""Accuracy, error bar and time of D (and other natural-parity) states with the stored boxes.

Usage: ``OPENBLAS_NUM_THREADS=1 python3 benchmarks/angular_states.py [--sizes 300 424 600]
[--states 3^1D 3^3D ...] [--Z 2]``.  Per state and size: the energy of ``twoel.solve`` (with its
nested-basis error bar), the difference to the tabulated reference, whether the bar covers it,
the dropped overlap directions and the wall and CPU time of the whole solve (three nested bases).
"""

from __future__ import annotations

import argparse
import sys
import time
import warnings
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

import twoel  # noqa: E402


def main(argv=None) -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--Z", type=float, default=2.0)
    p.add_argument("--sizes", type=int, nargs="+", default=[300, 424, 600])
    p.add_argument("--states", nargs="+", default=["3^1D", "3^3D", "4^1D", "4^3D", "5^1D", "5^3D"])
    args = p.parse_args(argv)
    warnings.simplefilter("ignore")
    print(f"{'state':6s} {'N':>5s} {'energy (Eh)':>20s} {'bar (Eh)':>9s} {'E - ref':>10s} "
          f"{'covered':>7s} {'dropped':>7s} {'wall s':>7s} {'cpu s':>7s}")
    for label in args.states:
        for size in args.sizes:
            wall, cpu = time.perf_counter(), time.process_time()
            r = twoel.solve(args.Z, label, size=size)
            wall, cpu = time.perf_counter() - wall, time.process_time() - cpu
            diff = r.difference_hartree if r.reference is not None else None
            bar = r.error_bar_hartree
            covered = "" if diff is None or bar is None else ("yes" if abs(diff) <= bar else "NO")
            print(f"{label:6s} {size:5d} {r.energy_hartree:20.14f} {bar or float('nan'):9.1e} "
                  f"{'' if diff is None else format(diff, '10.2e'):>10s} {covered:>7s} "
                  f"{r.n_dropped:7d} {wall:7.1f} {cpu:7.1f}", flush=True)


if __name__ == "__main__":
    main()
