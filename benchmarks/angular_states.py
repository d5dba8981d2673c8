"""Accuracy, error bar and time of every state (S, P, D, F) with the stored boxes.

Usage: ``OPENBLAS_NUM_THREADS=1 python3 benchmarks/angular_states.py [--sizes 600 1000]
[--states 2^1P 3^3D ...] [--Z 2]`` (``--sizes 0`` takes the size twoel chooses for the state).
Per state and size: the refined energy of ``twoel.solve`` (with its nested-basis error bar), the
difference to the tabulated reference, the ratio bar / |difference| and whether the bar covers
it, the significant digits that agree with the reference, and the wall and CPU time of the whole
solve (four nested bases, each refined beyond float64).
"""

from __future__ import annotations

import argparse
import sys
import time
import warnings
from pathlib import Path

sys.path.insert(0, str(Path(__file__).resolve().parent.parent))

import twoel  # noqa: E402

STATES = ["2^1P", "2^3P", "3^1P", "3^3P", "4^1P", "4^3P", "5^1P", "3^1D", "3^3D", "4^1D", "4^3D",
          "5^1D", "5^3D"]


def main(argv=None) -> None:
    p = argparse.ArgumentParser(description=__doc__.splitlines()[0])
    p.add_argument("--Z", type=float, default=2.0)
    p.add_argument("--sizes", type=int, nargs="+", default=[0])
    p.add_argument("--states", nargs="+", default=STATES)
    args = p.parse_args(argv)
    warnings.simplefilter("ignore")
    print(f"{'state':6s} {'N':>5s} {'energy (Eh)':>24s} {'bar (Eh)':>9s} {'E - ref':>10s} "
          f"{'bar/err':>7s} {'covered':>7s} {'reliable':>8s} {'digits':>6s} {'wall s':>7s} {'cpu s':>7s}")
    for label in args.states:
        for size in args.sizes:
            wall, cpu = time.perf_counter(), time.process_time()
            r = twoel.solve(args.Z, label, size=size or None)
            wall, cpu = time.perf_counter() - wall, time.process_time() - cpu
            diff = r.difference_hartree if r.reference is not None else None
            bar = r.error_bar_hartree
            covered = "" if diff is None or bar is None else ("yes" if abs(diff) <= bar else "NO")
            ratio = "" if not diff or bar is None else f"{bar / abs(diff):7.1f}"
            digits = "" if r.reference is None else r.agreeing_digits
            print(f"{label:6s} {r.size:5d} {r.energy_full_text[:24]:>24s} {bar or float('nan'):9.1e} "
                  f"{'' if diff is None else format(diff, '10.2e'):>10s} {ratio:>7s} {covered:>7s} "
                  f"{str(r.reliable):>8s} {digits:>6} {wall:7.1f} {cpu:7.1f}", flush=True)


if __name__ == "__main__":
    main()
